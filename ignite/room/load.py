"""Read a room file into a validated `Room` of SI floats, or say everything wrong with it.

The file's contract is the room-file guide: every key listed there is checked here for
presence, type, unit and physical range. Problems are collected across the whole file
and raised together as one `InputError`, each naming the file, line, key path, what
was expected and what was found. Readings that are possible but outside the trade's
usual range are accepted with a warning (`Room.warnings`) in the same format.

A `Vocabulary` (names defined in `rules/`) makes the loader check floor criteria,
footwear classes, materials and ignition sources by name; without one, only the
footwear classes of the guide are known and the other names are not checked.
"""

from __future__ import annotations

import datetime
import difflib
import hashlib
import math
import re
from collections.abc import Iterable, Mapping
from pathlib import Path
from typing import Any

from ignite.errors import InputError, Problem, UnitError
from ignite.room.bounds import (
    FILM_THICKNESS,
    FILM_THICKNESS_REASON,
    PEOPLE_COUNT,
    PEOPLE_COUNT_REASON,
    POCKET_TURNOVER,
    POCKET_TURNOVER_REASON,
    TEXT_LENGTH,
    TEXT_REASON,
    Bound,
    Limits,
    bound_for,
    list_limit,
)
from ignite.room.electrical import read_electrical
from ignite.room.hints import bare_number_hint, other_scale_hint
from ignite.room.model import (
    Case,
    DrapePocket,
    Environment,
    Floor,
    Footwear,
    Mains,
    Oxygen,
    Person,
    Prep,
    Preparation,
    Room,
    RoomHeader,
    Trolley,
    Vocabulary,
)
from ignite.room.ranges import Distribution, is_range, parse_range
from ignite.room.source import MAX_BYTES, item, join, line_of, parse_yaml
from ignite.room.units import BareNumberError, describe, noun, parse_quantity

FORMAT = 1
PURPOSES = ("pre-list", "recommissioning", "periodic-audit")
SYSTEMS = ("isolated", "earthed")
SITES = ("head-neck", "chest", "abdomen", "pelvis", "limb", "back")
DELIVERIES = ("none", "nasal-cannula", "face-mask", "closed-airway")
BASES = ("volume", "mass")
FOOTWEAR_CLASSES = ("conductive", "esd", "antistatic", "insulating")

# Component fractions are usually rounded to whole percent on labels: allow their sum
# to exceed 100 % by this much before calling it an error.
COMPONENT_SUM_TOLERANCE = 0.005

_ROOM_ID = re.compile(r"[A-Za-z0-9][A-Za-z0-9._-]{0,39}\Z")
_DATE = re.compile(r"\d{4}-\d{2}-\d{2}\Z")
_STARTS_LIKE_NUMBER = re.compile(r"\s*[+\-\u2212]?\.?\d")


_TOP = {
    "format": True,
    "room": True,
    "environment": True,
    "floor": True,
    "people": True,
    "trolleys": False,
    "preparations": False,
    "materials": False,
    "cases": False,
    "electrical": False,
}
_ROOM = {
    "id": True,
    "name": True,
    "purpose": True,
    "assessed_on": True,
    "assessor": True,
    "mains": True,
}
_MAINS = {"voltage": True, "frequency": True, "system": True}
_ENVIRONMENT = {"temperature": True, "relative_humidity": True, "air_changes": True, "volume": True}
_FLOOR = {
    "finish": True,
    "criteria": True,
    "test_voltage": True,
    "point_to_ground": True,
    "point_to_point": False,
}
_PERSON = {"role": True, "count": True, "footwear": True, "capacitance": False}
_TROLLEY = {"name": True, "capacitance": True, "path_to_floor": True}
_PREPARATION = {"id": True, "label": True, "basis": True, "components": True}
_CASE = {
    "id": True,
    "procedure": True,
    "site": True,
    "oxygen": True,
    "drape_pocket": True,
    "prep": True,
    "air_speed": True,
    "draping_after": True,
    "first_activation_after": True,
    "materials": True,
    "ignition_sources": True,
}
_OXYGEN = {
    "delivery": True,
    "flow": True,
    "fraction": True,
    "nitrous_oxide_flow": True,
    "stop_before_activation": True,
}
_POCKET = {"volume": True, "exchange": True}
_PREP = {
    "preparation": True,
    "volume": True,
    "area": True,
    "hair": True,
    "pooling": True,
    "skin_temperature": False,
}

# What a missing key should look like, for the message.
_KEY_EXAMPLES = {
    "format": "format: 1",
    "purpose": "purpose: pre-list",
    "assessed_on": "assessed_on: 2026-12-01",
    "system": "system: isolated",
    "site": "site: abdomen",
    "delivery": "delivery: nasal-cannula",
    "basis": "basis: volume",
    "hair": "hair: false",
    "pooling": "pooling: false",
    "count": "count: 1",
    "footwear": "footwear: antistatic",
    "prep": "prep: none",
}

# The keys a range is taken at: those whose spread the sampling carries to a case's or a
# person's figures (ignite.simulate.uncertainty). Elsewhere a range is refused, never ignored.
RANGED_KEYS = re.compile(
    r"(environment\.(temperature|relative_humidity)"
    r"|people\[\d+\]\.(footwear|capacitance)"
    r"|trolleys\[\d+\]\.(capacitance|path_to_floor)"
    r"|cases\[\d+\]\.(oxygen\.(flow|fraction|nitrous_oxide_flow|stop_before_activation)"
    r"|drape_pocket\.(volume|exchange)|prep\.(volume|area|skin_temperature)"
    r"|air_speed|draping_after|first_activation_after))\Z"
)
RANGE_NOT_TAKEN = (
    "a range is taken only where it changes a case's or a person's figures "
    "(see docs/ranges.md); give one value here"
)

_COMPONENT = bound_for("preparations[].components.*")

_NAN = math.nan  # placeholder for a value already reported; never leaves this module


def load_room(path: Path | str, vocabulary: Vocabulary | None = None) -> Room:
    """Read and validate the room file at `path`.

    Raises `InputError` listing every problem (unreadable, not UTF-8, too large,
    invalid YAML, missing or unknown keys, wrong units, out-of-range values).
    """
    shown = str(path)
    try:
        with open(path, "rb") as handle:
            raw = handle.read(MAX_BYTES + 1)
    except OSError as exc:
        reason = exc.strerror or str(exc)
        raise InputError([Problem(shown, None, "", f"cannot read the file: {reason}")]) from None
    if len(raw) > MAX_BYTES:
        raise InputError(
            [
                Problem(
                    shown,
                    None,
                    "",
                    f"the file is larger than the limit of {MAX_BYTES} bytes (1 MiB)",
                )
            ]
        )
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw.count(b"\n", 0, exc.start) + 1
        raise InputError(
            [
                Problem(
                    shown,
                    line,
                    "",
                    f"the file is not UTF-8 text (byte 0x{raw[exc.start]:02X} at offset "
                    f"{exc.start}); save it as UTF-8",
                )
            ]
        ) from None
    return _load(text, shown, hashlib.sha256(raw).hexdigest(), vocabulary)


def load_room_text(text: str, filename: str, vocabulary: Vocabulary | None = None) -> Room:
    """Validate room-file `text` as if read from `filename` (used in every message).

    The SHA-256 is of the text encoded as UTF-8.
    """
    digest = hashlib.sha256(text.encode("utf-8", "surrogatepass")).hexdigest()
    return _load(text, filename, digest, vocabulary)


def _load(text: str, filename: str, digest: str, vocabulary: Vocabulary | None) -> Room:
    body = text[1:] if text.startswith("\ufeff") else text
    parsed = parse_yaml(body, filename)
    if parsed.data is None:
        if not parsed.problems:
            parsed.problems.append(
                Problem(filename, 1, "", "the file is empty: `ignite new` writes a template")
            )
        raise InputError(parsed.problems)
    reader = _Reader(filename, parsed.lines, vocabulary)
    room = reader.room(parsed.data, body, digest)
    problems = list(parsed.problems)
    problems += [p for p in reader.problems if not _under(p.path, parsed.refused)]
    if problems:
        problems.sort(key=lambda problem: problem.line or 0)
        raise InputError(problems)
    return room


def _under(path: str, refused: Iterable[str]) -> bool:
    """True when `path` is, or lies inside, a refused path."""
    return any(
        path == top or path.startswith(top + ".") or path.startswith(top + "[") for top in refused
    )


class _Reader:
    """Walks the plain data, building model objects and collecting problems.

    A value that fails is reported once and replaced by a placeholder (NaN, ""), so the
    walk can go on; `_load` raises whenever any problem was reported, so no placeholder
    ever reaches a caller.
    """

    def __init__(self, filename: str, lines: dict[str, int], vocabulary: Vocabulary | None):
        self.filename = filename
        self.lines = lines
        self.vocabulary = vocabulary
        self.problems: list[Problem] = []
        self.warnings: list[Problem] = []
        self.ranges: dict[str, Distribution] = {}

    # -- reporting ---------------------------------------------------------------

    def problem(self, path: str, message: str) -> None:
        self.problems.append(Problem(self.filename, line_of(self.lines, path), path, message))

    def warn(self, path: str, message: str) -> None:
        self.warnings.append(Problem(self.filename, line_of(self.lines, path), path, message))

    # -- generic readers ---------------------------------------------------------

    def mapping(
        self, value: Any, path: str, keys: Mapping[str, bool], what: str
    ) -> dict[str, Any] | None:
        """`value` as a mapping with the allowed `keys` (key -> required), or None."""
        if not isinstance(value, dict):
            self.problem(
                path,
                f"expected {what} (a mapping with keys {', '.join(keys)}), got {describe(value)}",
            )
            return None
        guessed: set[str] = set()
        for key in value:
            if key not in keys:
                hint = difflib.get_close_matches(key, list(keys), n=1)
                guess = f" (did you mean '{hint[0]}'?)" if hint else ""
                guessed.update(hint)
                self.problem(
                    join(path, key),
                    f"unknown key {describe(key)}{guess}; allowed here: {', '.join(keys)}",
                )
        # a misspelt key is reported once, as unknown, not again as missing
        missing = [
            key
            for key, required in keys.items()
            if required and key not in value and key not in guessed
        ]
        if len(missing) == 1:
            example = _KEY_EXAMPLES.get(missing[0])
            shown = f" (e.g. {example})" if example else ""
            self.problem(path, f"missing required key '{missing[0]}'{shown}")
        elif missing:
            self.problem(path, f"missing required keys: {', '.join(missing)}")
        return value

    def quantity(self, value: Any, path: str, bound: Bound | None = None) -> float:
        """A quantity string as an SI float, checked against its bound in `bounds.BOUNDS`.

        NaN after a reported problem. Outside the hard range is a problem, outside the
        usual range a warning; a hint is added where a likely slip is recognised.
        """
        rule = bound or bound_for(path)
        if is_range(value):
            return self.ranged(value, path, rule)
        try:
            number = parse_quantity(value, rule.dimension)
        except BareNumberError as exc:
            hint = bare_number_hint(exc.number, exc.shown, exc.example_unit, rule)
            self.problem(path, f"{exc.expected}, got a bare number {exc.shown}: {hint}")
            return _NAN
        except UnitError as exc:
            self.problem(path, exc.message)
            return _NAN
        if not rule.hard.contains(number):
            self.problem(
                path,
                f"expected {noun(rule.dimension)} {rule.hard.text}, got {describe(value)}"
                f"{other_scale_hint(value, rule)}; why: {rule.reason}",
            )
            return _NAN
        if rule.usual is not None and not rule.usual.contains(number):
            self.warn(
                path,
                f"{describe(value)} is outside the usual range ({rule.usual.text}): "
                f"accepted; check the reading and its unit{other_scale_hint(value, rule)}",
            )
        return number

    def ranged(self, value: Any, path: str, rule: Bound) -> float:
        """A range (`ignite.room.ranges`) as its central value; the spread is kept in
        `self.ranges` by key path. NaN after a reported problem."""
        if not RANGED_KEYS.match(path):
            self.problem(path, f"got the range {describe(value)}: {RANGE_NOT_TAKEN}")
            return _NAN
        low = rule.hard.low if rule.hard.low is not None else -math.inf
        high = rule.hard.high if rule.hard.high is not None else math.inf
        try:
            spread = parse_range(value, rule.dimension, low, high)
        except UnitError as exc:
            self.problem(path, exc.message)
            return _NAN
        assert spread is not None  # is_range said so
        for end in spread.ends:
            if not rule.hard.contains(end):
                self.problem(
                    path,
                    f"expected {noun(rule.dimension)} {rule.hard.text} at every point of the "
                    f"range, got {describe(spread.text)}; why: {rule.reason}",
                )
                return _NAN
        self.ranges[path] = spread
        return spread.central

    def optional_quantity(self, section: dict[str, Any], path: str, key: str) -> float | None:
        if section.get(key) is None:
            return None
        return self.quantity(section[key], join(path, key))

    def text(self, value: Any, path: str, what: str = "text") -> str:
        if isinstance(value, str) and value.strip():
            if _has_lone_surrogate(value):
                self.problem(
                    path,
                    f"expected {what}, got {describe(value)}: it holds a lone surrogate "
                    "(an escape such as \\ud800 that is no character); write the character "
                    "itself",
                )
                return ""
            if len(value.strip()) > TEXT_LENGTH:
                self.problem(
                    path,
                    f"expected {what} of at most {TEXT_LENGTH} characters, got "
                    f"{len(value.strip())}; why: {TEXT_REASON}",
                )
                return ""
            return value.strip()
        if isinstance(value, int) and not isinstance(value, bool):
            return str(value)
        if isinstance(value, str):
            self.problem(path, f"expected {what}, got an empty value")
        elif isinstance(value, (float, bool)):
            self.problem(path, f"expected {what}, got {describe(value)}: put it in quotes")
        else:
            self.problem(path, f"expected {what}, got {describe(value)}")
        return ""

    def choice(self, value: Any, path: str, options: Iterable[str], what: str) -> str:
        allowed = tuple(options)
        if isinstance(value, str) and value.strip().lower() in allowed:
            return value.strip().lower()
        self.problem(path, f"expected {what}: one of {', '.join(allowed)}; got {describe(value)}")
        return ""

    def boolean(self, value: Any, path: str) -> bool:
        if isinstance(value, bool):
            return value
        self.problem(path, f"expected true or false, got {describe(value)}")
        return False

    def sequence(self, value: Any, path: str, what: str) -> list[Any]:
        """A YAML list; a key given with no value counts as an empty list."""
        if value is None:
            return []
        if isinstance(value, list):
            limit = list_limit(path)
            if limit is not None and len(value) > limit.most:
                self.problem(
                    path,
                    f"expected at most {limit.most} {limit.what}, got {len(value)}"
                    f"; why: {limit.reason}",
                )
                return []
            return value
        self.problem(path, f"expected a list of {what}, got {describe(value)}")
        return []

    def name_in(self, value: Any, path: str, known: frozenset[str], what: str) -> str:
        """A name from `rules/`, matched case-insensitively; unchecked when `known` is empty."""
        article = "an" if what[:1] in "aeiou" else "a"
        name = self.text(value, path, f"the name of {article} {what}")
        if name and known and name.lower() not in known:
            self.problem(path, f"unknown {what} '{name}'; {_some_names(name, known)}")
        return name

    # -- sections ----------------------------------------------------------------

    def room(self, data: Any, text: str, digest: str) -> Room:
        top = self.mapping(data, "", _TOP, "a room description")
        if top is None:
            top = {}
        fmt = top.get("format")
        if "format" in top and (isinstance(fmt, bool) or fmt != FORMAT):
            self.problem(
                "format",
                f"expected format: {FORMAT} (the version this ignite reads), got {describe(fmt)}",
            )
        header = self.header(top["room"], "room") if "room" in top else None
        environment = self.environment(top["environment"]) if "environment" in top else None
        floor = self.floor(top["floor"]) if "floor" in top else None
        people = tuple(
            self.person(entry, item("people", index))
            for index, entry in enumerate(self.sequence(top.get("people"), "people", "people"))
        )
        trolleys = tuple(
            self.trolley(entry, item("trolleys", index))
            for index, entry in enumerate(
                self.sequence(top.get("trolleys"), "trolleys", "trolleys")
            )
        )
        preparations = self.preparations(top.get("preparations"))
        materials = self.materials(top.get("materials"), "materials")
        cases = self.cases(top.get("cases"), {prep.id for prep in preparations if prep.id})
        electrical = None
        if "electrical" in top:
            system = header.mains.system if header else ""
            electrical = read_electrical(self, top["electrical"], {c.id for c in cases}, system)
        return Room(
            path=self.filename,
            sha256=digest,
            text=text,
            format=FORMAT,
            room=header or _placeholder_header(),
            environment=environment or Environment(_NAN, _NAN, _NAN, _NAN),
            floor=floor or Floor("", "", _NAN, ()),
            people=people,
            trolleys=trolleys,
            preparations=preparations,
            materials=materials,
            cases=cases,
            warnings=tuple(str(warning) for warning in self.warnings),
            electrical=electrical,
            ranges=tuple(self.ranges.items()),
        )

    def header(self, value: Any, path: str) -> RoomHeader | None:
        section = self.mapping(value, path, _ROOM, "the room header")
        if section is None:
            return None
        mains = None
        if "mains" in section:
            mains = self.mains(section["mains"], join(path, "mains"))
        return RoomHeader(
            id=self.room_id(section.get("id"), join(path, "id")) if "id" in section else "",
            name=self.text(section.get("name"), join(path, "name"), "the room's name")
            if "name" in section
            else "",
            purpose=self.choice(
                section.get("purpose"), join(path, "purpose"), PURPOSES, "a purpose"
            )
            if "purpose" in section
            else "",
            assessed_on=self.date(section.get("assessed_on"), join(path, "assessed_on"))
            if "assessed_on" in section
            else "",
            assessor=self.text(
                section.get("assessor"), join(path, "assessor"), "the assessor's name"
            )
            if "assessor" in section
            else "",
            mains=mains or Mains(_NAN, _NAN, ""),
        )

    def room_id(self, value: Any, path: str) -> str:
        identifier = self.text(value, path, "a short room identifier")
        if identifier and not _ROOM_ID.match(identifier):
            self.problem(
                path,
                f"expected a short identifier (up to 40 letters, digits, '.', '_' or '-'; it is "
                f"used in output file names), got {describe(identifier)}",
            )
            return ""
        return identifier

    def date(self, value: Any, path: str) -> str:
        if isinstance(value, str) and _DATE.match(value.strip()):
            try:
                return datetime.date.fromisoformat(value.strip()).isoformat()
            except ValueError:
                self.problem(path, f"got {describe(value)}: no such date")
                return ""
        self.problem(
            path, f"expected a date as YYYY-MM-DD (e.g. 2026-12-01), got {describe(value)}"
        )
        return ""

    def mains(self, value: Any, path: str) -> Mains | None:
        section = self.mapping(value, path, _MAINS, "the mains supply")
        if section is None:
            return None
        return Mains(
            voltage=self.required_quantity(section, path, "voltage"),
            frequency=self.required_quantity(section, path, "frequency"),
            system=self.choice(section["system"], join(path, "system"), SYSTEMS, "a supply system")
            if "system" in section
            else "",
        )

    def required_quantity(self, section: dict[str, Any], path: str, key: str) -> float:
        """`section[key]` as a quantity; NaN when missing (already reported by `mapping`)."""
        if key not in section:
            return _NAN
        return self.quantity(section[key], join(path, key))

    def environment(self, value: Any) -> Environment | None:
        path = "environment"
        section = self.mapping(value, path, _ENVIRONMENT, "the room's environment")
        if section is None:
            return None
        return Environment(
            temperature=self.required_quantity(section, path, "temperature"),
            relative_humidity=self.required_quantity(section, path, "relative_humidity"),
            air_changes=self.required_quantity(section, path, "air_changes"),
            volume=self.required_quantity(section, path, "volume"),
        )

    def floor(self, value: Any) -> Floor | None:
        path = "floor"
        section = self.mapping(value, path, _FLOOR, "the floor")
        if section is None:
            return None
        criteria = ""
        if "criteria" in section:
            known = self.vocabulary.floor_criteria if self.vocabulary else frozenset()
            criteria = self.name_in(
                section["criteria"], join(path, "criteria"), known, "floor criteria"
            ).lower()
        return Floor(
            finish=self.text(section["finish"], join(path, "finish"), "the floor finish")
            if "finish" in section
            else "",
            criteria=criteria,
            test_voltage=self.required_quantity(section, path, "test_voltage"),
            point_to_ground=self.readings(section, path, "point_to_ground", required=True),
            point_to_point=self.readings(section, path, "point_to_point", required=False),
        )

    def readings(
        self, section: dict[str, Any], path: str, key: str, *, required: bool
    ) -> tuple[float, ...]:
        if key not in section:
            return ()
        list_path = join(path, key)
        entries = self.sequence(
            section[key], list_path, "resistance readings (e.g. [180 kΩ, 240 kΩ])"
        )
        if required and not entries and isinstance(section[key], (list, type(None))):
            self.problem(list_path, "expected at least one reading (e.g. [180 kΩ, 240 kΩ])")
        return tuple(
            self.quantity(entry, item(list_path, index)) for index, entry in enumerate(entries)
        )

    def person(self, value: Any, path: str) -> Person:
        section = self.mapping(value, path, _PERSON, "a group of people")
        if section is None:
            return Person("", 0, Footwear(None, None), None)
        count = 0
        if "count" in section:
            raw = section["count"]
            whole = isinstance(raw, int) and not isinstance(raw, bool)
            if whole and PEOPLE_COUNT.contains(raw):
                count = raw
            elif whole and raw > 0:
                self.problem(
                    join(path, "count"),
                    f"expected {PEOPLE_COUNT.text}, got {describe(raw)}; why: {PEOPLE_COUNT_REASON}",
                )
            else:
                self.problem(
                    join(path, "count"),
                    f"expected a whole number of people, 1 or more; got {describe(raw)}",
                )
        return Person(
            role=self.text(section["role"], join(path, "role"), "a role")
            if "role" in section
            else "",
            count=count,
            footwear=self.footwear(section["footwear"], join(path, "footwear"))
            if "footwear" in section
            else Footwear(None, None),
            capacitance=self.optional_quantity(section, path, "capacitance"),
        )

    def footwear(self, value: Any, path: str) -> Footwear:
        classes: Iterable[str] = FOOTWEAR_CLASSES
        if self.vocabulary and self.vocabulary.footwear_classes:
            classes = sorted(self.vocabulary.footwear_classes)
        classes = tuple(classes)
        if isinstance(value, dict) or (isinstance(value, str) and _STARTS_LIKE_NUMBER.match(value)):
            resistance = self.quantity(value, path)
            return Footwear(cls=None, resistance=resistance)
        if isinstance(value, str) and value.strip().lower() in classes:
            return Footwear(cls=value.strip().lower(), resistance=None)
        self.problem(
            path,
            f"expected a footwear class ({', '.join(classes)}) or a measured resistance "
            f"through the soles (e.g. '40 MΩ'), got {describe(value)}",
        )
        return Footwear(None, _NAN)

    def trolley(self, value: Any, path: str) -> Trolley:
        section = self.mapping(value, path, _TROLLEY, "a trolley")
        if section is None:
            return Trolley("", _NAN, _NAN)
        return Trolley(
            name=self.text(section["name"], join(path, "name"), "a name")
            if "name" in section
            else "",
            capacitance=self.required_quantity(section, path, "capacitance"),
            path_to_floor=self.required_quantity(section, path, "path_to_floor"),
        )

    def preparations(self, value: Any) -> tuple[Preparation, ...]:
        result: list[Preparation] = []
        first_line: dict[str, int | None] = {}
        for index, entry in enumerate(self.sequence(value, "preparations", "preparations")):
            path = item("preparations", index)
            preparation = self.preparation(entry, path)
            if preparation.id:
                if preparation.id in first_line:
                    self.problem(
                        join(path, "id"),
                        f"duplicate preparation id '{preparation.id}' "
                        f"(first at line {first_line[preparation.id]}); ids must be unique",
                    )
                else:
                    first_line[preparation.id] = line_of(self.lines, join(path, "id"))
            result.append(preparation)
        return tuple(result)

    def preparation(self, value: Any, path: str) -> Preparation:
        section = self.mapping(value, path, _PREPARATION, "a preparation")
        if section is None:
            return Preparation("", "", "", ())
        return Preparation(
            id=self.text(section["id"], join(path, "id"), "an id") if "id" in section else "",
            label=self.text(section["label"], join(path, "label"), "a label")
            if "label" in section
            else "",
            basis=self.choice(section["basis"], join(path, "basis"), BASES, "a basis")
            if "basis" in section
            else "",
            components=self.components(section["components"], join(path, "components"))
            if "components" in section
            else (),
        )

    def components(self, value: Any, path: str) -> tuple[tuple[str, float], ...]:
        if not isinstance(value, dict) or not value:
            self.problem(
                path,
                "expected substances with their fractions (e.g. isopropanol: 70 %), "
                f"got {describe(value) if value != {} else 'none'}",
            )
            return ()
        limit = list_limit(path)
        if limit is not None and len(value) > limit.most:
            self.problem(
                path,
                f"expected at most {limit.most} {limit.what}, got {len(value)}; why: {limit.reason}",
            )
            return ()
        components: list[tuple[str, float]] = []
        for name, fraction in value.items():
            component_path = join(path, name)
            if not name.strip():
                self.problem(component_path, "expected a substance name or CAS number")
            elif _has_lone_surrogate(name):
                self.problem(
                    component_path,
                    f"expected a substance name or CAS number, got {describe(name)}: it holds "
                    "a lone surrogate; write the character itself",
                )
            elif self.vocabulary is not None and self.vocabulary.substance_check is not None:
                complaint = self.vocabulary.substance_check(name.strip())
                if complaint:
                    self.problem(component_path, complaint)
            components.append(
                (
                    name.strip(),
                    self.quantity(fraction, component_path, _COMPONENT),
                )
            )
        total = sum(fraction for _, fraction in components)
        if math.isfinite(total) and total > 1.0 + COMPONENT_SUM_TOLERANCE:
            self.problem(
                path,
                f"the fractions add up to {total * 100:.4g} %; they may not exceed 100 % "
                "(non-volatile actives may be left out)",
            )
        return tuple(components)

    def materials(self, value: Any, path: str) -> tuple[str, ...]:
        known = self.vocabulary.materials if self.vocabulary else frozenset()
        return tuple(
            self.name_in(entry, item(path, index), known, "material")
            for index, entry in enumerate(self.sequence(value, path, "materials"))
        )

    def cases(self, value: Any, preparation_ids: set[str]) -> tuple[Case, ...]:
        result: list[Case] = []
        first_line: dict[str, int | None] = {}
        for index, entry in enumerate(self.sequence(value, "cases", "cases")):
            path = item("cases", index)
            case = self.case(entry, path, preparation_ids)
            if case.id:
                if case.id in first_line:
                    self.problem(
                        join(path, "id"),
                        f"duplicate case id '{case.id}' (first at line {first_line[case.id]}); "
                        "ids must be unique",
                    )
                else:
                    first_line[case.id] = line_of(self.lines, join(path, "id"))
            result.append(case)
        return tuple(result)

    def case(self, value: Any, path: str, preparation_ids: set[str]) -> Case:
        section = self.mapping(value, path, _CASE, "a case")
        if section is None:
            section = {}
        sources_known = self.vocabulary.ignition_sources if self.vocabulary else frozenset()

        def time(key: str) -> float:
            return self.required_quantity(section, path, key)

        return Case(
            id=self.text(section["id"], join(path, "id"), "a case id") if "id" in section else "",
            procedure=self.text(section["procedure"], join(path, "procedure"), "a procedure")
            if "procedure" in section
            else "",
            site=self.choice(section["site"], join(path, "site"), SITES, "an operative site")
            if "site" in section
            else "",
            oxygen=self.oxygen(section["oxygen"], join(path, "oxygen"))
            if "oxygen" in section
            else Oxygen("", _NAN, _NAN, _NAN, _NAN),
            drape_pocket=self.pocket(section["drape_pocket"], join(path, "drape_pocket"))
            if "drape_pocket" in section
            else DrapePocket(_NAN, _NAN),
            prep=self.prep(section["prep"], join(path, "prep"), preparation_ids)
            if "prep" in section
            else None,
            air_speed=self.required_quantity(section, path, "air_speed"),
            draping_after=time("draping_after"),
            first_activation_after=time("first_activation_after"),
            materials=self.materials(section.get("materials"), join(path, "materials")),
            ignition_sources=tuple(
                self.name_in(
                    entry,
                    item(join(path, "ignition_sources"), index),
                    sources_known,
                    "ignition source",
                )
                for index, entry in enumerate(
                    self.sequence(
                        section.get("ignition_sources"),
                        join(path, "ignition_sources"),
                        "ignition sources",
                    )
                )
            ),
        )

    def oxygen(self, value: Any, path: str) -> Oxygen:
        section = self.mapping(value, path, _OXYGEN, "the oxygen delivery")
        if section is None:
            return Oxygen("", _NAN, _NAN, _NAN, _NAN)
        delivery = (
            self.choice(section["delivery"], join(path, "delivery"), DELIVERIES, "a delivery")
            if "delivery" in section
            else ""
        )
        oxygen = Oxygen(
            delivery=delivery,
            flow=self.required_quantity(section, path, "flow"),
            fraction=self.required_quantity(section, path, "fraction"),
            nitrous_oxide_flow=self.required_quantity(section, path, "nitrous_oxide_flow"),
            stop_before_activation=self.required_quantity(section, path, "stop_before_activation"),
        )
        if delivery == "none":
            # flows with no delivery cannot both be right: refuse rather than guess
            for key, flow in (
                ("flow", oxygen.flow),
                ("nitrous_oxide_flow", oxygen.nitrous_oxide_flow),
            ):
                if flow > 0:
                    self.problem(
                        join(path, key),
                        f"got {describe(section[key])} with delivery: none; "
                        "give the delivery used, or a flow of 0 L/min",
                    )
        return oxygen

    def pocket(self, value: Any, path: str) -> DrapePocket:
        section = self.mapping(value, path, _POCKET, "the drape pocket")
        if section is None:
            return DrapePocket(_NAN, _NAN)
        pocket = DrapePocket(
            volume=self.required_quantity(section, path, "volume"),
            exchange=self.required_quantity(section, path, "exchange"),
        )
        turnover = pocket.volume / pocket.exchange  # NaN after a reported problem
        if not math.isnan(turnover) and not POCKET_TURNOVER.contains(turnover):
            self.problem(
                join(path, "exchange"),
                f"expected a turnover time (volume / exchange) {POCKET_TURNOVER.text}, got "
                f"{turnover:.3g} s from {describe(section['volume'])} and "
                f"{describe(section['exchange'])}; why: {POCKET_TURNOVER_REASON}",
            )
            return DrapePocket(_NAN, _NAN)
        return pocket

    def prep(self, value: Any, path: str, preparation_ids: set[str]) -> Prep | None:
        if value is None or (isinstance(value, str) and value.strip().lower() == "none"):
            return None  # said explicitly: no skin preparation for this case
        section = self.mapping(value, path, _PREP, "the skin preparation (or none)")
        if section is None:
            return None
        preparation = ""
        if "preparation" in section:
            preparation = self.text(
                section["preparation"], join(path, "preparation"), "a preparation id"
            )
            if preparation and preparation not in preparation_ids:
                defined = ", ".join(sorted(preparation_ids)) if preparation_ids else "none"
                self.problem(
                    join(path, "preparation"),
                    f"unknown preparation id '{preparation}'; the file defines: {defined}",
                )
        volume = self.required_quantity(section, path, "volume")
        area = self.required_quantity(section, path, "area")
        thickness = volume / area  # NaN after a reported problem
        if not math.isnan(thickness) and not FILM_THICKNESS.contains(thickness):
            self.problem(
                join(path, "volume"),
                f"expected a film (volume / area) {FILM_THICKNESS.text} thick, got "
                f"{thickness * 1e3:.3g} mm from {describe(section['volume'])} over "
                f"{describe(section['area'])}; why: {FILM_THICKNESS_REASON}",
            )
        return Prep(
            preparation=preparation,
            volume=volume,
            area=area,
            hair=self.boolean(section["hair"], join(path, "hair")) if "hair" in section else False,
            pooling=self.boolean(section["pooling"], join(path, "pooling"))
            if "pooling" in section
            else False,
            skin_temperature=self.optional_quantity(section, path, "skin_temperature"),
        )


def _has_lone_surrogate(text: str) -> bool:
    """True when `text` holds a UTF-16 surrogate on its own (YAML lets "\\ud800" through)."""
    return any("\ud800" <= char <= "\udfff" for char in text)


def _placeholder_header() -> RoomHeader:
    return RoomHeader("", "", "", "", "", Mains(_NAN, _NAN, ""))


def _some_names(name: str, known: frozenset[str], count: int = 5) -> str:
    """'did you mean ...' or a few known names, for an unknown-name message."""
    close = difflib.get_close_matches(name.lower(), sorted(known), n=3, cutoff=0.6)
    if close:
        return "did you mean " + " or ".join(f"'{c}'" for c in close) + "?"
    shown = sorted(known)[:count]
    more = f" and {len(known) - count} more" if len(known) > count else ""
    return f"known names include: {', '.join(shown)}{more} (see `ignite rules`)"


__all__ = [
    "BASES",
    "DELIVERIES",
    "FOOTWEAR_CLASSES",
    "PURPOSES",
    "SITES",
    "SYSTEMS",
    "Limits",
    "load_room",
    "load_room_text",
]
