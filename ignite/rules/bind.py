"""Bind the rule book to one room: `bind(room, book) -> Bound`.

This is the one place that reads rule entries for a room. It resolves every value the
simulations and the findings need into the typed records of `ignite.rules.bound` (SI
floats with their source and flag where a finding quotes them), and records the id of
every entry it reads; those ids, and only those, make the worksheet's rules appendix.
"""

from __future__ import annotations

from collections.abc import Iterable

from ignite.errors import Problem, RuleFileError
from ignite.physics import floor, vapour
from ignite.room.model import Room
from ignite.rules.bound import (
    Bound,
    BoundCheck,
    BoundLimit,
    ChargeModel,
    ElectricalRules,
    FloorWindow,
    FootwearClass,
    Fuel,
    Material,
    OxygenModel,
    PrepAssumptions,
    RuleSpread,
    RuleValue,
    ShockModel,
    SourcedValue,
    UncertaintyModel,
    leakage_selector,
)
from ignite.rules.rulebook import Entry, Limit, Rulebook

DEFAULT_SATURATION_CURVE = "saturation.vinyl"
"""The humidity table used when no table's `match` words appear in the floor finish."""

DEFAULT_FOOTWEAR = "insulating"
"""The footwear class assumed for a person whose footwear is not given: the cautious side."""

_PREP_PREFIX = "prep."
_DIFFUSIVITY_PREFIX = "prep.diffusivity."


class _Reader:
    """The rule book, read through a recorder of the ids consulted."""

    def __init__(self, book: Rulebook) -> None:
        self.book = book
        self.consulted: set[str] = set()

    def entry(self, entry_id: str) -> Entry:
        self.consulted.add(entry_id)
        return self.book.entries[entry_id]

    def optional(self, entry_id: str) -> Entry | None:
        if entry_id not in self.book.entries:
            return None
        return self.entry(entry_id)

    def number(self, entry_id: str) -> float:
        return float(self.entry(entry_id).get("value"))

    def optional_number(self, entry_id: str) -> float | None:
        entry = self.optional(entry_id)
        return None if entry is None else float(entry.get("value"))

    def by_name(self, kind: str, name: str) -> Entry | None:
        """An entry of a kind by its id or any of its names, as a room file writes it."""
        entry = self.book.names_of(kind).get(name.strip().lower())
        if entry is not None:
            self.consulted.add(entry.id)
        return entry


def bind(room: Room, book: Rulebook, *, uncertain: bool | None = None) -> Bound:
    """Every rule value this room needs, read once, with the ids consulted.

    uncertain: the room is assessed over the spread of its inputs (by default when it gives
    a range): the rule values' ranges, the uncertainty settings and the checks on
    probabilities are bound too.
    """
    if uncertain is None:
        uncertain = bool(room.ranges)
    reader = _Reader(book)
    window = _window(reader, room.floor.criteria, room.room.mains.voltage)
    shock = _shock(reader)
    oxygen = OxygenModel(
        ambient=reader.number("oxygen.ambient"),
        enriched_limit=reader.number("oxygen.enriched_limit"),
        open_delivery_ceiling=reader.number("oxygen.open_delivery_ceiling"),
    )
    charge = _charge(reader, room.floor.finish)
    footwear = _footwear(reader, room)
    loi_allowance = reader.number("materials.loi_allowance")
    materials = _materials(reader, room)
    sites = {case.site: _near_airway(reader, case.site) for case in room.cases}
    fuels = {prep.id: _fuels(reader, prep.components) for prep in room.preparations}
    prep = _prep(reader) if room.preparations else None
    checks = tuple(
        _check(reader, entry, window)
        for entry in book.of_kind("checks")
        if _has_subjects(str(entry.get("reads")), room, uncertain)
    )
    _note_ignition_sources(reader, room)
    electrical = _electrical(reader, room)
    spreads = _spreads(reader, room, fuels, charge) if uncertain else ()
    uncertainty = _uncertainty(reader) if uncertain else None
    return Bound(
        rules_digest=book.digest,
        window=window,
        shock=shock,
        charge=charge,
        footwear=footwear,
        oxygen=oxygen,
        loi_allowance=loi_allowance,
        materials=materials,
        sites_near_airway=sites,
        fuels=fuels,
        prep=prep,
        checks=checks,
        consulted=frozenset(reader.consulted),
        electrical=electrical,
        spreads=spreads,
        uncertainty=uncertainty,
    )


# --- floor, shock, charge ----------------------------------------------------------


def _sourced(entry: Entry, name: str) -> SourcedValue | None:
    if not entry.has(name):
        return None
    item = entry.sourced(name)
    return SourcedValue(float(item.value), item.source, item.flag)


def _window(reader: _Reader, criteria: str, supply_voltage: float) -> FloorWindow:
    entry = reader.entry(criteria)
    low = None
    if entry.has("low"):
        steps = entry.sourced("low")
        low = SourcedValue(
            floor.window_low_for_supply(supply_voltage, steps.value), steps.source, steps.flag
        )
    return FloorWindow(
        id=entry.id,
        title=entry.title,
        low=low,
        high=_sourced(entry, "high"),
        low_inclusive=bool(entry.get("low_inclusive", False)),
        high_inclusive=bool(entry.get("high_inclusive", True)),
        mean_low=_sourced(entry, "mean_low"),
        mean_min_readings=int(entry.get("mean_min_readings", 1)),
        system_high=_sourced(entry, "system_high"),
        walking_voltage_high=_sourced(entry, "walking_voltage_high"),
    )


BODY_IMPEDANCE_CURVE = "body.impedance.p{percentile}"
"""The id of the IEC 60479-1 table at a percentile (5, 50 or 95 in rules/curves.yaml)."""

SHOCK_PATH = "hand to feet"
"""The current path of a person standing on the floor and touching a live part."""


def _shock(reader: _Reader) -> ShockModel:
    """The body impedance table at the percentile in force, and the path factor to the feet."""
    percentile = reader.number("body.impedance_percentile")
    curve_id = BODY_IMPEDANCE_CURVE.format(percentile=round(percentile * 100))
    if curve_id not in reader.book.entries:
        setting = reader.book.entries["body.impedance_percentile"]
        raise RuleFileError(
            [
                Problem(
                    setting.file,
                    setting.line,
                    "body.impedance_percentile.value",
                    f"no body impedance table {curve_id} in rules/ for this percentile",
                )
            ]
        )
    return ShockModel(
        body_impedance=_points(reader.entry(curve_id)),
        let_go=reader.number("shock.let_go"),
        percentile=percentile,
        path=SHOCK_PATH,
        path_factor=reader.number("body.impedance_path_factor"),
        curve_id=curve_id,
    )


def _points(entry: Entry) -> tuple[tuple[float, float], ...]:
    return tuple((float(x), float(y)) for x, y in entry.get("points"))


def _charge(reader: _Reader, finish: str) -> ChargeModel:
    curve = reader.entry(_saturation_curve_id(reader.book, finish))
    return ChargeModel(
        generation_current=reader.number("charge.generation_current"),
        no_spark_voltage=reader.number("spark.no_spark_voltage"),
        default_capacitance=reader.number("body.capacitance"),
        saturation_curve_id=curve.id,
        saturation_points=_points(curve),
    )


def _saturation_curve_id(book: Rulebook, finish: str) -> str:
    """The humidity table whose `match` words appear in the floor finish (vinyl by default)."""
    text = finish.lower()
    for curve in book.of_kind("curves"):
        if curve.id.startswith("saturation.") and any(
            word.lower() in text for word in curve.get("match", ())
        ):
            return curve.id
    return DEFAULT_SATURATION_CURVE


def _footwear(reader: _Reader, room: Room) -> tuple[FootwearClass, ...]:
    """Every footwear class (the static mitigation names those that meet a limit)."""
    if not room.people:
        return ()
    classes = [
        FootwearClass(entry.id, float(reader.entry(entry.id).get("resistance")))
        for entry in reader.book.of_kind("footwear")
    ]
    return tuple(sorted(classes, key=lambda c: c.resistance))


# --- cases: materials, sites, fuels, preparations ------------------------------------


def _materials(reader: _Reader, room: Room) -> dict[str, Material]:
    found: dict[str, Material] = {}
    names = list(room.materials) + [name for case in room.cases for name in case.materials]
    for name in names:
        entry = reader.by_name("materials", name)
        if entry is not None:
            found[name.lower()] = Material(
                entry.id,
                entry.title,
                float(entry.get("loi")),
                float(entry.get("holds_charge_below_rh")),
            )
    return found


def _near_airway(reader: _Reader, site: str) -> bool:
    """Whether open oxygen at the face reaches the drape pocket of this site (rules/sites.yaml)."""
    entry = reader.book.entries.get(site)
    if entry is None or entry.kind != "sites":
        return True  # an unknown site is treated as near the airway: the cautious side
    return bool(reader.entry(site).get("near_airway"))


def _fuels(reader: _Reader, components: Iterable[tuple[str, float]]) -> tuple[Fuel, ...]:
    """The fuels-table entries of a preparation's components, by name, alias or CAS number."""
    fuels = []
    for name, _ in components:
        entry = reader.by_name("fuels", name) or _fuel_by_cas(reader, name)
        if entry is not None:
            mie_oxygen = entry.get("mie_oxygen")
            fuels.append(
                Fuel(
                    id=entry.id,
                    title=entry.title,
                    cas=str(entry.get("cas")),
                    mie_air=float(entry.get("mie_air")),
                    exponent=float(entry.get("exponent")),
                    mie_oxygen=None if mie_oxygen is None else float(mie_oxygen),
                )
            )
    return tuple(fuels)


def _fuel_by_cas(reader: _Reader, name: str) -> Entry | None:
    """A fuel named by its CAS number, or by a name the substance tables resolve to one."""
    cas = {name.strip()}
    fuels = reader.book.of_kind("fuels")
    if not any(f.get("cas") in cas for f in fuels):
        try:
            cas.add(vapour.substance(name).cas)
        except vapour.SubstanceDataError:
            return None
    for fuel in fuels:
        if fuel.get("cas") in cas:
            reader.consulted.add(fuel.id)
            return fuel
    return None


def prep_assumptions(book: Rulebook) -> PrepAssumptions:
    """The film model's assumptions from the `prep.*` parameters (raises KeyError if one is missing)."""
    return _prep(_Reader(book))


def _prep(reader: _Reader) -> PrepAssumptions:
    diffusivities = {
        entry.id.removeprefix(_DIFFUSIVITY_PREFIX): reader.number(entry.id)
        for entry in reader.book.of_kind("parameters")
        if entry.id.startswith(_DIFFUSIVITY_PREFIX)
    }
    return PrepAssumptions(
        dry_fraction=reader.number("prep.dry_fraction"),
        pocket_margin=reader.number("prep.pocket_margin"),
        under_drape_air_speed=reader.number("prep.under_drape_air_speed"),
        hair_still_layer=reader.number("prep.hair_still_layer"),
        hair_exposed_fraction=reader.number("prep.hair_exposed_fraction"),
        pooling_volume_fraction=reader.number("prep.pooling_volume_fraction"),
        pooling_area_fraction=reader.number("prep.pooling_area_fraction"),
        diffusivity_reference_temperature=reader.number("prep.diffusivity_reference_temperature"),
        diffusivities=diffusivities,
        skin_temperature_default=reader.number("prep.skin_temperature_default"),
        label_minimum_hairless=reader.optional_number("prep.label_minimum_hairless"),
        label_maximum_hair=reader.optional_number("prep.label_maximum_hair"),
        tissue_conductance=reader.number("prep.tissue_conductance"),
        film_emissivity=reader.number("prep.film_emissivity"),
    )


def _note_ignition_sources(reader: _Reader, room: Room) -> None:
    """The ignition-source entries that describe this room's sources (for the appendix)."""
    for name in (source for case in room.cases for source in case.ignition_sources):
        reader.by_name("ignition-sources", name)
    if room.people:
        reader.optional("static-person")
    if room.trolleys:
        reader.optional("static-trolley")
    if room.materials or any(case.materials for case in room.cases):
        reader.optional("brush-discharge")


# --- the patient environment's electrical safety ---------------------------------------

LEAKAGE_LIMITS: dict[tuple[str, str, str, str], str] = {
    ("type", "earth_leakage", "normal", ""): "iec60601.earth_leakage_normal",
    ("type", "earth_leakage", "single_fault", ""): "iec60601.earth_leakage_single_fault",
    ("type", "touch_current", "normal", ""): "iec60601.touch_current_normal",
    ("type", "touch_current", "single_fault", ""): "iec60601.touch_current_single_fault",
    ("type", "patient_leakage", "normal", "B"): "patient.leakage_b_normal",
    ("type", "patient_leakage", "normal", "BF"): "patient.leakage_b_normal",
    ("type", "patient_leakage", "normal", "CF"): "patient.leakage_cf_normal",
    ("type", "patient_leakage", "single_fault", "B"): "patient.leakage_b_single_fault",
    ("type", "patient_leakage", "single_fault", "BF"): "patient.leakage_b_single_fault",
    ("type", "patient_leakage", "single_fault", "CF"): "patient.leakage_cf_single_fault",
    ("recurrent", "earth_leakage", "normal", "I"): "iec62353.equipment_leakage_class_i",
    ("recurrent", "earth_leakage", "normal", "II"): "iec62353.equipment_leakage_class_ii",
    ("recurrent", "earth_leakage", "normal", "internal"): "iec62353.equipment_leakage_class_ii",
    ("recurrent", "touch_current", "normal", ""): "me_system.touch_current_normal",
    ("recurrent", "patient_leakage", "normal", "BF"): "iec62353.applied_part_leakage_bf",
    ("recurrent", "patient_leakage", "normal", "CF"): "iec62353.applied_part_leakage_cf",
}
"""Which rule entry limits each leakage reading: (test, quantity, condition, selector) -> id.
A recurrent test of a type B applied part has no applied-part leakage limit (IEC 62353)."""


def _rule_value(reader: _Reader, entry_id: str) -> RuleValue:
    item = reader.entry(entry_id).sourced("value")
    return RuleValue(entry_id, float(item.value), item.source, item.flag)


def _electrical(reader: _Reader, room: Room) -> ElectricalRules | None:
    """The limits of the patient environment, for a room with an `electrical` section; the
    leakage limits read are those of the tests, applied parts and classes of its equipment
    (and the type-test patient and earth leakage limits a connected device without a reading
    is counted at)."""
    if room.electrical is None:
        return None
    wanted: set[tuple[str, str, str, str]] = set()
    for device in room.electrical.equipment:
        for quantity in ("earth_leakage", "touch_current", "patient_leakage"):
            for condition in ("normal", "single_fault"):
                selector = leakage_selector(
                    quantity, device.test, device.applied_part, device.protection_class
                )
                wanted.add((device.test, quantity, condition, selector))
                assumed = leakage_selector(
                    quantity, "type", device.applied_part, device.protection_class
                )
                wanted.add(("type", quantity, condition, "BF" if assumed == "none" else assumed))
    leakage = {
        key: _rule_value(reader, LEAKAGE_LIMITS[key])
        for key in sorted(wanted)
        if key in LEAKAGE_LIMITS
    }
    return ElectricalRules(
        bonding_max=_rule_value(reader, "electrical.bonding_resistance_max"),
        imd_alarm_min=_rule_value(reader, "electrical.imd_alarm_min"),
        leakage=leakage,
        microshock_limit=_rule_value(reader, "microshock.limit"),
        microshock_single_fault_limit=_rule_value(reader, "microshock.single_fault_limit"),
        path_impedance=_rule_value(reader, "microshock.path_impedance"),
    )


# --- ranges of rule values -------------------------------------------------------------

PROBABILITY_PREFIX = "case.probability_"
"""Results that exist only over samples: their checks are bound only for a sampled room."""


def _spreads(
    reader: _Reader, room: Room, fuels: dict[str, tuple[Fuel, ...]], charge: ChargeModel
) -> tuple[RuleSpread, ...]:
    """The ranges of the rule values this room uses: its fuels' MIE, the film model's
    assumptions (a room with preparations), the humidity table in force (people or trolleys)."""
    used = {fuel.id for found in fuels.values() for fuel in found}
    if room.preparations:
        used.update(e.id for e in reader.book.of_kind("parameters") if e.id.startswith("prep."))
    if room.people or room.trolleys:
        used.add(charge.saturation_curve_id)
    found = []
    for entry in reader.book.of_kind("ranges"):
        if str(entry.get("varies")) not in used:
            continue
        reader.consulted.add(entry.id)
        spread = entry.sourced("range")
        found.append(
            RuleSpread(
                id=entry.id,
                title=entry.title,
                varies=str(entry.get("varies")),
                field=str(entry.get("field") or "value"),
                distribution=spread.value,
                source=spread.source,
                flag=spread.flag,
            )
        )
    return tuple(found)


def _uncertainty(reader: _Reader) -> UncertaintyModel:
    def sourced(entry_id: str) -> SourcedValue:
        item = reader.entry(entry_id).sourced("value")
        return SourcedValue(float(item.value), item.source, item.flag)

    return UncertaintyModel(
        confidence=sourced("uncertainty.confidence"),
        probability_limit=sourced("uncertainty.probability_limit"),
    )


# --- checks --------------------------------------------------------------------------


def _has_subjects(reads: str, room: Room, uncertain: bool = False) -> bool:
    """Whether the result a check reads can have a subject in this room: case results need
    cases, charge results people or trolleys, probabilities a room assessed with ranges.
    Checks that cannot apply are not bound (and so not listed among the rules consulted)."""
    if reads.startswith(PROBABILITY_PREFIX) and not uncertain:
        return False
    family = reads.split(".", 1)[0]
    if family == "electrical":
        return room.electrical is not None
    if family == "case":
        return bool(room.cases)
    if family == "charge":
        return bool(room.people or room.trolleys)
    return True


def _check(reader: _Reader, entry: Entry, window: FloorWindow) -> BoundCheck:
    reader.consulted.add(entry.id)
    limit: Limit | None = entry.get("limit")
    test = str(entry.get("test"))
    return BoundCheck(
        id=entry.id,
        title=entry.title,
        reads=str(entry.get("reads")),
        test=test,
        limit=None if limit is None else _limit(reader, limit, test, window),
        severity=str(entry.get("severity")),
        group=str(entry.get("group") or ""),
        detail=str(entry.get("detail", "")),
        mitigations=tuple(str(m) for m in entry.get("mitigations", ())),
        source=entry.source,
        flag=entry.flag,
    )


def _limit(reader: _Reader, limit: Limit, test: str, window: FloorWindow) -> BoundLimit:
    if limit.kind == "quantity" and limit.value is not None:
        return BoundLimit(float(limit.value.value), limit.value.source, limit.value.flag)
    if limit.kind == "param":
        item = reader.entry(limit.ref).sourced("value")
        return BoundLimit(float(item.value), item.source, item.flag)
    if limit.kind == "window":
        value = window.limit(limit.ref)
        if value is None:
            return BoundLimit(None)
        if limit.ref == "low":
            outside = not window.low_inclusive
        elif limit.ref == "high":
            outside = not window.high_inclusive
        else:
            outside = test in ("at-or-above", "at-or-below")
        return BoundLimit(value.value, value.source, value.flag, inclusive_outside=outside)
    return BoundLimit(result=limit.ref)
