"""The optional `electrical` section of a room file: the supply and its insulation monitor,
the supplementary equipotential bonding, the equipment in the patient environment and,
per case, the patient's conductive paths to the heart.

Read by `ignite.room.load` through its reader (the same reporting, units and ranges as
every other key); every problem names the file, line and key path.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any, Protocol

from ignite.room.model import (
    BondingPoint,
    CardiacCase,
    Electrical,
    Equipment,
    InsulationMonitor,
    Leakage,
    Supply,
)
from ignite.room.source import item, join, line_of
from ignite.room.units import describe


class _Reader(Protocol):
    """What this module uses of the loader's reader (`ignite.room.load._Reader`)."""

    lines: dict[str, int]

    def problem(self, path: str, message: str) -> None: ...
    def warn(self, path: str, message: str) -> None: ...
    def mapping(
        self, value: Any, path: str, keys: dict[str, bool], what: str
    ) -> dict[str, Any] | None: ...
    def quantity(self, value: Any, path: str) -> float: ...
    def optional_quantity(self, section: dict[str, Any], path: str, key: str) -> float | None: ...
    def required_quantity(self, section: dict[str, Any], path: str, key: str) -> float: ...
    def text(self, value: Any, path: str, what: str = "text") -> str: ...
    def choice(self, value: Any, path: str, options: Iterable[str], what: str) -> str: ...
    def sequence(self, value: Any, path: str, what: str) -> list[Any]: ...


_NAN = float("nan")

ELECTRICAL = {"supply": False, "bonding": False, "equipment": False, "cases": False}
SUPPLY = {"system": True, "transformer_rating": False, "insulation_monitor": False}
MONITOR = {"alarm_setting": True, "tested_alarm_at": False, "insulation_reading": False}
BONDING = {"point": True, "kind": True, "resistance": True}
EQUIPMENT = {
    "id": True,
    "kind": True,
    "protection_class": True,
    "applied_part": True,
    "test": True,
    "earth_leakage": False,
    "touch_current": False,
    "patient_leakage": False,
}
LEAKAGE = {"normal": False, "single_fault": False}
CASE = {"case": True, "cardiac_path": True, "connected": False}

SUPPLY_SYSTEMS = ("isolated", "earthed")
BONDED_PARTS = ("exposed", "extraneous")
PROTECTION_CLASSES = {"i": "I", "ii": "II", "internal": "internal"}
APPLIED_PARTS = {"b": "B", "bf": "BF", "cf": "CF", "none": "none"}
TESTS = ("type", "recurrent")
CARDIAC_PATHS = ("central-line", "pacing-wires", "none")
LEAKAGE_KEYS = ("earth_leakage", "touch_current", "patient_leakage")
_WHAT = {
    "system": "a supply system",
    "kind": "the kind of bonded part",
    "protection_class": "a protection class",
    "applied_part": "an applied-part type",
    "test": "the test standard used (type: IEC 60601-1; recurrent: IEC 62353)",
    "cardiac_path": "a cardiac path",
}


def read_electrical(
    reader: _Reader, value: Any, case_ids: set[str], mains_system: str
) -> Electrical:
    """The `electrical` section; problems are reported through `reader`."""
    path = "electrical"
    if value is None:
        return Electrical()
    section = reader.mapping(value, path, ELECTRICAL, "the electrical safety section")
    if section is None:
        return Electrical()
    supply = None
    if section.get("supply") is not None:
        supply = _supply(reader, section["supply"], join(path, "supply"), mains_system)
    bonding = tuple(
        _bonding(reader, entry, item(join(path, "bonding"), index))
        for index, entry in enumerate(
            reader.sequence(section.get("bonding"), join(path, "bonding"), "bonding readings")
        )
    )
    equipment = _equipment_list(reader, section.get("equipment"), join(path, "equipment"))
    known = {device.id for device in equipment if device.id}
    cases = _cases(reader, section.get("cases"), join(path, "cases"), case_ids, known)
    return Electrical(supply=supply, bonding=bonding, equipment=equipment, cases=cases)


def _choice(reader: _Reader, section: dict[str, Any], path: str, key: str, options: Any) -> str:
    if key not in section:
        return ""
    if isinstance(options, dict):
        raw = section[key]
        text = raw.strip().lower() if isinstance(raw, str) else None
        if text in options:
            return str(options[text])
        reader.problem(
            join(path, key),
            f"expected {_WHAT.get(key, 'a ' + key)}: one of {', '.join(options.values())}; "
            f"got {describe(raw)}",
        )
        return ""
    return reader.choice(section[key], join(path, key), options, _WHAT.get(key, f"a {key}"))


def _supply(reader: _Reader, value: Any, path: str, mains_system: str) -> Supply | None:
    section = reader.mapping(value, path, SUPPLY, "the supply")
    if section is None:
        return None
    system = _choice(reader, section, path, "system", SUPPLY_SYSTEMS)
    if system and mains_system and system != mains_system:
        reader.problem(
            join(path, "system"),
            f"got '{system}', but room.mains.system says '{mains_system}'; the two describe "
            "the same supply",
        )
    monitor = None
    if section.get("insulation_monitor") is not None:
        monitor_path = join(path, "insulation_monitor")
        found = reader.mapping(
            section["insulation_monitor"], monitor_path, MONITOR, "the insulation monitor"
        )
        if found is not None:
            monitor = InsulationMonitor(
                alarm_setting=reader.required_quantity(found, monitor_path, "alarm_setting"),
                tested_alarm_at=reader.optional_quantity(found, monitor_path, "tested_alarm_at"),
                insulation_reading=reader.optional_quantity(
                    found, monitor_path, "insulation_reading"
                ),
            )
    if system == "earthed":
        for key in ("insulation_monitor", "transformer_rating"):
            if section.get(key) is not None:
                reader.problem(
                    join(path, key),
                    "an earthed supply has no isolating transformer or insulation monitor; "
                    "give system: isolated, or leave this key out",
                )
    if system == "isolated" and "insulation_monitor" not in section:
        reader.warn(
            path,
            "an isolated supply without its insulation_monitor readings: the monitor's "
            "alarm setting is not checked",
        )
    return Supply(
        system=system,
        transformer_rating=reader.optional_quantity(section, path, "transformer_rating"),
        insulation_monitor=monitor,
    )


def _bonding(reader: _Reader, value: Any, path: str) -> BondingPoint:
    section = reader.mapping(value, path, BONDING, "a bonding reading")
    if section is None:
        return BondingPoint("", "", _NAN)
    return BondingPoint(
        point=reader.text(section["point"], join(path, "point"), "the bonded part")
        if "point" in section
        else "",
        kind=_choice(reader, section, path, "kind", BONDED_PARTS),
        resistance=reader.required_quantity(section, path, "resistance"),
    )


def _equipment_list(reader: _Reader, value: Any, path: str) -> tuple[Equipment, ...]:
    result: list[Equipment] = []
    first_line: dict[str, int | None] = {}
    for index, entry in enumerate(reader.sequence(value, path, "equipment")):
        device = _equipment(reader, entry, item(path, index))
        if device.id:
            id_path = join(item(path, index), "id")
            if device.id in first_line:
                reader.problem(
                    id_path,
                    f"duplicate equipment id '{device.id}' (first at line "
                    f"{first_line[device.id]}); ids must be unique",
                )
            else:
                first_line[device.id] = line_of(reader.lines, id_path)
        result.append(device)
    return tuple(result)


def _equipment(reader: _Reader, value: Any, path: str) -> Equipment:
    section = reader.mapping(value, path, EQUIPMENT, "a device in the patient environment")
    empty = Leakage(None, None)
    if section is None:
        return Equipment("", "", "", "", "", empty, empty, empty)
    test = _choice(reader, section, path, "test", TESTS)
    leakages = {
        key: _leakage(reader, section[key], join(path, key), test)
        if section.get(key) is not None
        else empty
        for key in LEAKAGE_KEYS
    }
    return Equipment(
        id=reader.text(section["id"], join(path, "id"), "an equipment id")
        if "id" in section
        else "",
        kind=reader.text(section["kind"], join(path, "kind"), "the kind of device")
        if "kind" in section
        else "",
        protection_class=_choice(reader, section, path, "protection_class", PROTECTION_CLASSES),
        applied_part=_choice(reader, section, path, "applied_part", APPLIED_PARTS),
        test=test,
        earth_leakage=leakages["earth_leakage"],
        touch_current=leakages["touch_current"],
        patient_leakage=leakages["patient_leakage"],
    )


def _leakage(reader: _Reader, value: Any, path: str, test: str) -> Leakage:
    """A current in normal condition ('12 µA'), or {normal: ..., single_fault: ...}."""
    if not isinstance(value, dict):
        return Leakage(reader.quantity(value, path), None)
    section = reader.mapping(value, path, LEAKAGE, "a current in normal and single-fault condition")
    if section is None:
        return Leakage(None, None)
    if section.get("normal") is None and section.get("single_fault") is None:
        reader.problem(path, "expected a current for normal and/or single_fault, got neither")
    if test == "recurrent" and section.get("single_fault") is not None:
        reader.problem(
            join(path, "single_fault"),
            "a recurrent test (IEC 62353) gives one reading per current: give it as normal, "
            "or give test: type for a type-test report with single-fault readings",
        )
    return Leakage(
        normal=reader.optional_quantity(section, path, "normal"),
        single_fault=reader.optional_quantity(section, path, "single_fault"),
    )


def _cases(
    reader: _Reader, value: Any, path: str, case_ids: set[str], equipment_ids: set[str]
) -> tuple[CardiacCase, ...]:
    result: list[CardiacCase] = []
    seen: set[str] = set()
    for index, entry in enumerate(reader.sequence(value, path, "cases")):
        entry_path = item(path, index)
        section = reader.mapping(entry, entry_path, CASE, "a case's cardiac path")
        if section is None:
            continue
        case = ""
        if "case" in section:
            case = reader.text(section["case"], join(entry_path, "case"), "a case id")
            if case and case not in case_ids:
                listed = ", ".join(sorted(case_ids)) if case_ids else "none"
                reader.problem(
                    join(entry_path, "case"),
                    f"unknown case id '{case}'; the file's cases are: {listed}",
                )
            elif case in seen:
                reader.problem(join(entry_path, "case"), f"case '{case}' is listed twice")
            seen.add(case)
        connected_path = join(entry_path, "connected")
        connected = []
        for number, name in enumerate(
            reader.sequence(section.get("connected"), connected_path, "equipment ids")
        ):
            device = reader.text(name, item(connected_path, number), "an equipment id")
            if device and device not in equipment_ids:
                listed = ", ".join(sorted(equipment_ids)) if equipment_ids else "none"
                reader.problem(
                    item(connected_path, number),
                    f"unknown equipment id '{device}'; electrical.equipment defines: {listed}",
                )
            connected.append(device)
        result.append(
            CardiacCase(
                case=case,
                cardiac_path=_choice(reader, section, entry_path, "cardiac_path", CARDIAC_PATHS),
                connected=tuple(connected),
            )
        )
    return tuple(result)
