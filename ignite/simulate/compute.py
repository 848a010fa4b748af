"""Room -> Results: the one place that feeds the physics with the room and the rules.

Everything here is SI floats. The findings are added afterwards by `evaluate`.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from ignite import __version__
from ignite.physics import electrostatics, floor, ignition, oxygen, shock
from ignite.records.results import (
    CaseResult,
    ChargeResult,
    ComponentResult,
    EnvironmentResult,
    FloorResult,
    MethodRef,
    PreparationResult,
    Results,
    RoomInfo,
    Triad,
)
from ignite.room.model import Case, Person, Preparation, Room, Trolley
from ignite.rules.bound import PrepAssumptions
from ignite.rules.rulebook import Entry, Rulebook
from ignite.simulate.drying import DrapePlan, DrapePocket, Film, RoomAir, simulate_prep
from ignite.simulate.notes import worded
from ignite.simulate.preparation import PreparationAnalysis, analyse_preparation

METHODS: tuple[MethodRef, ...] = (
    MethodRef(
        "Floor window check (highest reading for static, lowest for shock)",
        "IEC 60364-7-710 / NEK 400:710; NFPA 99 (editions up to 2005); IEC 61340-5-1",
    ),
    MethodRef(
        "Shock current by Ohm's law, I = U / (R_floor,min + R_body)",
        "IEC 60479-1 (body impedance, Table 1)",
    ),
    MethodRef(
        "Leaky-capacitor charging, V = I_g·R·(1 − e^(−t/τ)), capped by the humidity saturation voltage",
        "electrostatics texts; ESD industry table of typical voltages",
    ),
    MethodRef(
        "Spark energy E = ½·C·V², charge Q = C·V; no spark below the Paschen minimum",
        "IEC 61000-4-2 body model",
    ),
    MethodRef(
        "MIE against oxidant, MIE(x) = MIE_air·(x/0.209)^(−n), bounded by MIE in O₂",
        "power law fitted to air/O₂ pairs (Lewis & von Elbe; Blanc et al. 1949)",
    ),
    MethodRef(
        "Activity coefficients by UNIFAC", "Fredenslund, Jones & Prausnitz (1975), via thermo"
    ),
    MethodRef("Mixture flash point", "Liaw et al. (2002)"),
    MethodRef("Mixture lower flammable limit", "Le Chatelier's rule"),
    MethodRef(
        "Pure-component data (vapour pressure, LFL, flash point, autoignition)",
        "IEC 60079-20-1:2010 and NFPA 497:2008 via the chemicals package",
    ),
    MethodRef(
        "Film evaporation, Sh = 0.664·Re^½·Sc^⅓ with a natural-convection floor",
        "laminar flat-plate boundary layer (Pohlhausen); diffusivities Welty–Wicks–Wilson, else Fuller–Schettler–Giddings (Poling et al. eq. 11-4.4)",
    ),
    MethodRef("Drape pocket, well mixed: V·dc/dt = source − Q·c", "continuous stirred volume"),
    MethodRef("Oxygen under drapes, C(t) = 0.209 + (C0 − 0.209)·e^(−Q·t/V)", "well-mixed washout"),
    MethodRef(
        "Materials that sustain burning: LOI less 2 points", "ISO 4589-2 / ASTM D2863; NFPA 53"
    ),
)

RH_CHART = tuple(r / 100 for r in range(5, 81, 5))
"""Relative humidities at which the worksheet's body-voltage chart is drawn."""


@dataclass(frozen=True)
class ChargeModel:
    """The rules' values the charge model needs, read once per room."""

    generation_current: float
    no_spark_voltage: float
    saturation_curve: Entry
    floor_max: float


def compute(room: Room, book: Rulebook) -> Results:
    """Every quantity of the result record, without findings."""
    env = room.environment
    mains = room.room.mains
    floor_result = compute_floor(room, book)
    model = ChargeModel(
        generation_current=book.value("charge.generation_current"),
        no_spark_voltage=book.value("spark.no_spark_voltage"),
        saturation_curve=saturation_curve_for(room.floor.finish, book),
        floor_max=floor_result.max_ohm,
    )
    default_c = book.value("body.capacitance")
    people = tuple(_person(p, model, env.relative_humidity, default_c, book) for p in room.people)
    trolleys = tuple(_trolley(t, model, env.relative_humidity) for t in room.trolleys)
    charges = people + trolleys
    largest_spark = max((c.spark_energy_J for c in charges), default=None)
    warnings = list(room.warnings)
    _, clamped = electrostatics.saturation_voltage(
        env.relative_humidity, model.saturation_curve.get("points")
    )
    if clamped and charges:
        warnings.append(
            f"RH {env.relative_humidity:.0%} lies outside the humidity table "
            f"({model.saturation_curve.id}); its end value was used, not an extrapolation"
        )

    preparations, analyses = _preparations(room, book, warnings)
    cases = tuple(_case(case, room, book, analyses, largest_spark) for case in room.cases)
    lowest, lowest_fuel = lowest_mie(room_fuels(room, book, analyses), env_fraction(book), book)
    if lowest_fuel:
        lowest_fuel += " in room air"
    for case in cases:
        if case.mie_J is not None and (lowest is None or case.mie_J < lowest):
            lowest = case.mie_J
            lowest_fuel = f"{case.mie_fuel} at {case.oxidant_at_activation_fraction:.1%} oxidant (case {case.id})"

    rise = max(
        (
            oxygen.room_oxidant_rise(
                planned.oxygen.flow,
                planned.oxygen.fraction,
                planned.oxygen.nitrous_oxide_flow,
                env.volume,
                env.air_changes,
                book.value("oxygen.ambient"),
            )
            for planned in room.cases
            if planned.oxygen.delivery in OPEN_DELIVERY
        ),
        default=0.0,
    )
    if rise > 0.005:
        warnings.append(
            f"Open oxygen raises the whole room's oxidant by {rise:.1%} at {env.air_changes * 3600:.0f} air changes/h: "
            "not negligible; check the ventilation."
        )
    return Results(
        tool_version=__version__,
        input_sha256=room.sha256,
        input_name=Path(room.path).name,
        rules_digest=book.digest,
        room=RoomInfo(
            room.room.id,
            room.room.name,
            room.room.purpose,
            room.room.assessed_on,
            room.room.assessor,
        ),
        environment=EnvironmentResult(
            temperature_K=env.temperature,
            relative_humidity_fraction=env.relative_humidity,
            air_changes_per_s=env.air_changes,
            volume_m3=env.volume,
            mains_voltage_V=mains.voltage,
            mains_frequency_Hz=mains.frequency,
            mains_system=mains.system,
            room_oxidant_rise_fraction=rise,
        ),
        floor=floor_result,
        people=people,
        trolleys=trolleys,
        preparations=preparations,
        cases=cases,
        warnings=tuple(warnings),
        lowest_site_mie_J=lowest,
        lowest_site_mie_fuel=lowest_fuel,
        largest_spark_J=largest_spark,
        no_spark_voltage_V=model.no_spark_voltage,
        oxygen_enriched_limit_fraction=book.value("oxygen.enriched_limit"),
        voltage_vs_rh=tuple((c.label, _voltage_curve(c, model)) for c in charges),
    )


# --- floor and shock -------------------------------------------------------------


def window_limits(window: Entry, supply_voltage: float) -> tuple[float | None, float | None]:
    """(lower, upper) limits of a floor window for a supply voltage; None where unset."""
    low = None
    if window.has("low"):
        low = floor.window_low_for_supply(supply_voltage, window.get("low"))
    return low, window.get("high")


def compute_floor(room: Room, book: Rulebook) -> FloorResult:
    readings = room.floor.point_to_ground
    stats = floor.floor_statistics(readings)
    window = book.entry(room.floor.criteria)
    mains = room.room.mains
    low, high = window_limits(window, mains.voltage)
    outside = floor.readings_outside_window(
        readings,
        low,
        high,
        low_inclusive=bool(window.get("low_inclusive", False)),
        high_inclusive=bool(window.get("high_inclusive", True)),
    )
    passed = not outside
    mean_low = window.get("mean_low")
    if (
        mean_low is not None
        and stats.count >= window.get("mean_min_readings", 1)
        and stats.mean <= mean_low
    ):
        passed = False
    body, extrapolated = shock.body_impedance(mains.voltage, book.points("body.impedance"))
    current = shock.shock_current(mains.voltage, stats.min, body)
    notes = []
    if mains.system == "isolated":
        notes.append(
            "Isolated (IT) supply: a first insulation fault does not close this path; "
            "the current shown would flow after a second fault."
        )
    if extrapolated:
        notes.append(
            f"Body impedance taken at the nearest tabulated voltage; {mains.voltage:.0f} V lies outside the table."
        )
    return FloorResult(
        readings_ohm=tuple(readings),
        min_ohm=stats.min,
        max_ohm=stats.max,
        mean_ohm=stats.mean,
        geometric_mean_ohm=stats.geometric_mean,
        criteria=room.floor.criteria,
        window_low_ohm=low,
        window_high_ohm=high,
        passed=passed,
        shock_path_ohm=stats.min + body,
        shock_current_A=current,
        test_voltage_V=room.floor.test_voltage,
        readings_outside=tuple(outside),
        point_to_point_ohm=tuple(room.floor.point_to_point),
        body_impedance_ohm=body,
        touch_voltage_V=mains.voltage,
        supply_system=mains.system,
        shock_note=" ".join(notes),
    )


# --- people and trolleys ---------------------------------------------------------


def saturation_curve_for(finish: str, book: Rulebook) -> Entry:
    """The humidity table whose `match` words appear in the floor finish (vinyl by default)."""
    text = finish.lower()
    curves = [e for e in book.of_kind("curves") if e.id.startswith("saturation.")]
    for curve in curves:
        if any(word.lower() in text for word in curve.get("match", ())):
            return curve
    return book.entry("saturation.vinyl")


def footwear_resistance(person: Person, book: Rulebook) -> tuple[float, str]:
    if person.footwear.resistance is not None:
        return person.footwear.resistance, "measured"
    cls = person.footwear.cls or "insulating"
    return book.entry(cls).get("resistance"), cls


def charge_state(
    kind: str,
    label: str,
    count: int,
    footwear: str,
    leak: float,
    capacitance: float,
    rh: float,
    model: ChargeModel,
) -> ChargeResult:
    v_sat, _ = electrostatics.saturation_voltage(rh, model.saturation_curve.get("points"))
    voltage = electrostatics.body_voltage(model.generation_current, leak, capacitance, v_sat)
    tau = electrostatics.time_constant(leak, capacitance)
    return ChargeResult(
        kind=kind,
        label=label,
        count=count,
        footwear=footwear,
        leak_resistance_ohm=leak,
        capacitance_F=capacitance,
        time_constant_s=tau,
        body_voltage_V=voltage,
        stored_charge_C=electrostatics.stored_charge(capacitance, voltage),
        spark_energy_J=electrostatics.spark_energy(capacitance, voltage),
        settle_time_s=electrostatics.settle_time(voltage, tau, model.no_spark_voltage),
        saturation_voltage_V=v_sat,
        generation_limited=model.generation_current * leak < v_sat,
    )


def _person(
    person: Person, model: ChargeModel, rh: float, default_c: float, book: Rulebook
) -> ChargeResult:
    footwear_r, footwear = footwear_resistance(person, book)
    capacitance = person.capacitance if person.capacitance is not None else default_c
    return charge_state(
        "person",
        person.role,
        person.count,
        footwear,
        footwear_r + model.floor_max,
        capacitance,
        rh,
        model,
    )


def _trolley(trolley: Trolley, model: ChargeModel, rh: float) -> ChargeResult:
    return charge_state(
        "trolley",
        trolley.name,
        1,
        "",
        trolley.path_to_floor + model.floor_max,
        trolley.capacitance,
        rh,
        model,
    )


def _voltage_curve(charge: ChargeResult, model: ChargeModel) -> tuple[tuple[float, float], ...]:
    points = []
    for rh in RH_CHART:
        v_sat, _ = electrostatics.saturation_voltage(rh, model.saturation_curve.get("points"))
        points.append(
            (
                rh,
                electrostatics.body_voltage(
                    model.generation_current,
                    charge.leak_resistance_ohm,
                    charge.capacitance_F,
                    v_sat,
                ),
            )
        )
    return tuple(points)


# --- fuels and MIE ---------------------------------------------------------------


def env_fraction(book: Rulebook) -> float:
    return book.value("oxygen.ambient")


def fuel_for(component: str, cas: str | None, book: Rulebook) -> Entry | None:
    """The fuels-table entry for a component named by common name or CAS number."""
    names = book.names_of("fuels")
    entry = names.get(component.strip().lower())
    if entry is not None:
        return entry
    for fuel in book.of_kind("fuels"):
        if fuel.get("cas") in (component.strip(), cas):
            return fuel
    return None


def room_fuels(room: Room, book: Rulebook, analyses: dict[str, PreparationAnalysis]) -> list[Entry]:
    """Fuels of every preparation stocked in the room."""
    found: dict[str, Entry] = {}
    for prep in room.preparations:
        for fuel in _prep_fuels(prep, book, analyses.get(prep.id)):
            found[fuel.id] = fuel
    return list(found.values())


def _prep_fuels(
    prep: Preparation, book: Rulebook, analysis: PreparationAnalysis | None
) -> list[Entry]:
    cas_list: Sequence[str] = analysis.cas if analysis is not None else ()
    fuels = []
    for index, (name, _) in enumerate(prep.components):
        cas = cas_list[index] if index < len(cas_list) else None
        fuel = fuel_for(name, cas, book)
        if fuel is not None:
            fuels.append(fuel)
    return fuels


def lowest_mie(fuels: Sequence[Entry], oxidant: float, book: Rulebook) -> tuple[float | None, str]:
    """Lowest MIE among fuels at an oxidant fraction, and the fuel that sets it."""
    best: tuple[float | None, str] = (None, "")
    for fuel in fuels:
        mie = ignition.mie_at_oxidant(
            fuel.get("mie_air"),
            oxidant,
            fuel.get("exponent"),
            fuel.get("mie_oxygen"),
            air_fraction=env_fraction(book),
        )
        if best[0] is None or mie < best[0]:
            best = (mie, fuel.title)
    return best


# --- preparations ----------------------------------------------------------------


@lru_cache(maxsize=64)
def analyse(
    components: tuple[tuple[str, float], ...], basis: str, film_temperature: float
) -> PreparationAnalysis:
    """`analyse_preparation`, kept per process: an audit's rooms share their preparations."""
    return analyse_preparation(components, basis, film_temperature)


def prep_assumptions(book: Rulebook) -> dict[str, float]:
    return {
        e.id.removeprefix("prep."): float(e.get("value"))
        for e in book.of_kind("parameters")
        if e.id.startswith("prep.")
    }


def prep_assumptions_record(book: Rulebook) -> PrepAssumptions:
    """The rule book's `prep.*` parameters as the drying model's typed record (SI)."""
    values = prep_assumptions(book)
    prefix = "diffusivity."
    diffusivities = {
        key.removeprefix(prefix): value for key, value in values.items() if key.startswith(prefix)
    }
    reference = "diffusivity_reference_temperature"
    return PrepAssumptions(
        dry_fraction=values["dry_fraction"],
        pocket_margin=values["pocket_margin"],
        under_drape_air_speed=values["under_drape_air_speed"],
        hair_still_layer=values["hair_still_layer"],
        hair_exposed_fraction=values["hair_exposed_fraction"],
        pooling_volume_fraction=values["pooling_volume_fraction"],
        pooling_area_fraction=values["pooling_area_fraction"],
        # needed only to move a tabulated diffusivity to the film's temperature
        diffusivity_reference_temperature=values[reference] if diffusivities else math.nan,
        diffusivities=diffusivities,
        skin_temperature_default=values.get("skin_temperature_default", 305.15),
        label_minimum_hairless=values.get("label_minimum_hairless"),
        label_maximum_hair=values.get("label_maximum_hair"),
    )


def _preparations(
    room: Room, book: Rulebook, warnings: list[str]
) -> tuple[tuple[PreparationResult, ...], dict[str, PreparationAnalysis]]:
    if not room.preparations:
        return (), {}

    film_t = prep_assumptions(book).get("skin_temperature_default", 305.15)
    results = []
    analyses: dict[str, PreparationAnalysis] = {}
    for prep in room.preparations:
        analysis = analyse(prep.components, prep.basis, film_t)
        analyses[prep.id] = analysis
        components = tuple(
            ComponentResult(n, c, x, g, f)
            for n, c, x, g, f in zip(
                analysis.names,
                analysis.cas,
                analysis.mole_fractions,
                analysis.activity_coefficients,
                analysis.flammable,
                strict=True,
            )
        )
        notes = list(worded(analysis.notes))
        if not _prep_fuels(prep, book, analysis) and any(analysis.flammable):
            notes.append(
                "no MIE in rules/fuels.yaml for the flammable components; static ignition not assessed"
            )
        results.append(
            PreparationResult(
                id=prep.id,
                label=prep.label,
                flash_point_K=analysis.flash_point_K,
                lfl_fraction=analysis.lfl_fraction,
                saturated_vapour_fraction=analysis.saturated_vapour_fraction,
                film_temperature_K=film_t,
                components=components,
                methods=tuple(analysis.methods),
                notes=tuple(notes),
            )
        )
    return tuple(results), analyses


# --- cases -----------------------------------------------------------------------

OPEN_DELIVERY = ("nasal-cannula", "face-mask")


def _case(
    case: Case,
    room: Room,
    book: Rulebook,
    analyses: dict[str, PreparationAnalysis],
    largest_spark: float | None,
) -> CaseResult:
    ambient = book.value("oxygen.ambient")
    enriched = book.value("oxygen.enriched_limit")
    ox = case.oxygen
    pocket = case.drape_pocket
    notes: list[str] = []
    near_airway = _near_airway(case.site, book)
    if ox.delivery in OPEN_DELIVERY and not near_airway:
        notes.append(
            f"Open {ox.delivery} delivery at the face is taken not to reach the drape pocket at a "
            f"{case.site} site (rules/sites.yaml); the site is at room air."
        )
    if ox.delivery in OPEN_DELIVERY and near_airway:
        c_ss = oxygen.pocket_steady_state(
            ox.flow, ox.fraction, ox.nitrous_oxide_flow, pocket.exchange, ambient
        )
        total = ox.flow + ox.nitrous_oxide_flow + pocket.exchange
        buildup = oxygen.buildup_time(enriched, ambient, c_ss, pocket.volume, total)
    else:
        c_ss, buildup = ambient, math.inf
        if ox.delivery == "closed-airway":
            notes.append("Closed airway: the pocket is taken at room air (no cuff leak assumed).")
    washout = oxygen.washout_time(c_ss, enriched, pocket.volume, pocket.exchange, ambient)
    ceiling_stop = oxygen.washout_time(
        c_ss, book.value("oxygen.open_delivery_ceiling"), pocket.volume, pocket.exchange, ambient
    )
    at_activation = oxygen.fraction_after_stop(
        c_ss, ox.stop_before_activation, pocket.volume, pocket.exchange, ambient
    )
    curve = _oxygen_curve(
        c_ss, ox.stop_before_activation, pocket.volume, pocket.exchange, ambient, washout
    )

    fuels = room_fuels(room, book, analyses)
    mie, mie_fuel = lowest_mie(fuels, at_activation, book)

    materials = book.names_of("materials")
    loi = [
        (name, materials[name.lower()].get("loi"))
        for name in case.materials
        if name.lower() in materials
    ]
    allowance = book.value("materials.loi_allowance")
    sustaining = ignition.materials_sustaining(c_ss, loi, allowance)
    holding = tuple(
        name
        for name in case.materials
        if name.lower() in materials
        and ignition.holds_charge(
            room.environment.relative_humidity, materials[name.lower()].get("holds_charge_below_rh")
        )
    )

    drying = peak = safe = left_draping = left_activation = pocket_activation = None
    film_curve: tuple[tuple[float, float], ...] = ()
    fuel_at_activation = False
    prep_flammable = False
    if case.prep is not None and case.prep.preparation in analyses:
        assumptions = prep_assumptions_record(book)
        analysis = analyses[case.prep.preparation]
        film_t = case.prep.skin_temperature or assumptions.skin_temperature_default
        if film_t != analysis.film_temperature_K:
            prep = next(p for p in room.preparations if p.id == case.prep.preparation)
            analysis = analyse(prep.components, prep.basis, film_t)
        outcome = simulate_prep(
            analysis,
            Film(case.prep.volume, case.prep.area, film_t, case.prep.hair, case.prep.pooling),
            RoomAir(
                room.environment.temperature, room.environment.relative_humidity, case.air_speed
            ),
            DrapePlan(case.draping_after, case.first_activation_after),
            DrapePocket(pocket.volume, pocket.exchange),
            assumptions,
        )
        drying, peak, safe = (
            outcome.drying_time_s,
            outcome.pocket_peak_fraction_of_lfl,
            outcome.safe_draping_after_s,
        )
        left_draping = outcome.flammable_left_at_draping_fraction
        left_activation = outcome.flammable_left_at_activation_fraction
        pocket_activation = outcome.pocket_at_activation_fraction_of_lfl
        prep_flammable = any(analysis.flammable)
        film_curve = outcome.film_curve
        notes.extend(worded(outcome.notes))
        margin = assumptions.pocket_margin
        fuel_at_activation = (
            outcome.pocket_at_activation_fraction_of_lfl >= margin
            or outcome.flammable_left_at_activation_fraction > assumptions.dry_fraction
        )

    head_neck_open = ox.delivery in OPEN_DELIVERY and near_airway
    triad = Triad(
        oxidant=at_activation > enriched or head_neck_open,
        fuel=fuel_at_activation or bool(sustaining),
        ignition=bool(case.ignition_sources)
        or (largest_spark is not None and mie is not None and largest_spark >= mie),
    )
    return CaseResult(
        id=case.id,
        procedure=case.procedure,
        site=case.site,
        oxidant_fraction=c_ss,
        oxygen_enriched=c_ss > enriched,
        washout_s=washout,
        oxidant_at_activation_fraction=at_activation,
        mie_J=mie,
        drying_time_s=drying,
        pocket_vapour_peak_fraction_of_lfl=peak,
        safe_draping_after_s=safe,
        materials_sustain_burning=sustaining,
        triad=triad,
        mie_fuel=mie_fuel,
        buildup_s=None if math.isinf(buildup) else buildup,
        required_stop_s=washout,
        largest_spark_J=largest_spark,
        materials_holding_charge=holding,
        ignition_sources=case.ignition_sources,
        draping_after_s=case.draping_after,
        first_activation_after_s=case.first_activation_after,
        stop_before_activation_s=ox.stop_before_activation,
        delivery=ox.delivery,
        ceiling_stop_s=ceiling_stop,
        preparation=case.prep.preparation if case.prep else "",
        prep_flammable=prep_flammable,
        hair=bool(case.prep and case.prep.hair),
        pooling=bool(case.prep and case.prep.pooling),
        flammable_left_at_draping_fraction=left_draping,
        flammable_left_at_activation_fraction=left_activation,
        pocket_at_activation_fraction_of_lfl=pocket_activation,
        oxygen_curve=curve,
        film_curve=film_curve,
        notes=tuple(notes),
    )


def _near_airway(site: str, book: Rulebook) -> bool:
    """Whether open oxygen at the face reaches the drape pocket of this site (rules/sites.yaml)."""
    entry = book.entries.get(site)
    if entry is None or entry.kind != "sites":
        return True  # an unknown site is treated as near the airway: the cautious side
    return bool(entry.get("near_airway"))


def _oxygen_curve(
    c_ss: float, stop: float, volume: float, exchange: float, ambient: float, washout: float
) -> tuple[tuple[float, float], ...]:
    """Oxidant at the site from the moment oxygen stops (t = 0) to past activation."""
    end = max(stop, washout, 60.0) * 1.3
    steps = 60
    return tuple(
        (t, oxygen.fraction_after_stop(c_ss, t, volume, exchange, ambient))
        for t in (end * i / steps for i in range(steps + 1))
    )
