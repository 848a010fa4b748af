"""Room and bound rules -> Results: the one place that feeds the physics.

Everything here is SI floats read from the room and from `Bound` (never the rule book).
The findings are added afterwards by `ignite.findings`.
"""

from __future__ import annotations

import math
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
from ignite.room.model import Case, Person, Room, Trolley
from ignite.rules.bound import Bound, Fuel
from ignite.simulate.drying import DrapePlan, DrapePocket, Film, RoomAir, simulate_prep
from ignite.simulate.notes import worded
from ignite.simulate.preparation import PreparationAnalysis, analyse_preparation
from ignite.wording import sentences

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
class _Charging:
    """The bound charge model and the floor's highest reading, which every leak path includes."""

    generation_current: float
    no_spark_voltage: float
    saturation_points: tuple[tuple[float, float], ...]
    floor_max: float


def compute(room: Room, bound: Bound) -> Results:
    """Every quantity of the result record, without findings."""
    env = room.environment
    mains = room.room.mains
    floor_result = compute_floor(room, bound)
    model = _Charging(
        generation_current=bound.charge.generation_current,
        no_spark_voltage=bound.charge.no_spark_voltage,
        saturation_points=bound.charge.saturation_points,
        floor_max=floor_result.max_ohm,
    )
    default_c = bound.charge.default_capacitance
    people = tuple(_person(p, model, env.relative_humidity, default_c, bound) for p in room.people)
    trolleys = tuple(_trolley(t, model, env.relative_humidity) for t in room.trolleys)
    charges = people + trolleys
    largest_spark = max((c.spark_energy_J for c in charges), default=None)
    warnings = list(room.warnings)
    _, clamped = electrostatics.saturation_voltage(
        env.relative_humidity, list(model.saturation_points)
    )
    if clamped and charges:
        warnings.append(
            sentences.rh_outside_humidity_table(
                env.relative_humidity, bound.charge.saturation_curve_id
            )
        )

    preparations, analyses = _preparations(room, bound)
    ambient = bound.oxygen.ambient
    cases = tuple(_case(case, room, bound, analyses, largest_spark) for case in room.cases)
    lowest, lowest_fuel = lowest_mie(room_fuels(room, bound), ambient, ambient)
    if lowest_fuel:
        lowest_fuel = sentences.fuel_in_room_air(lowest_fuel)
    for case in cases:
        if case.mie_J is not None and (lowest is None or case.mie_J < lowest):
            lowest = case.mie_J
            lowest_fuel = sentences.fuel_at_case_oxidant(
                case.mie_fuel, case.oxidant_at_activation_fraction, case.id
            )

    rise = max(
        (
            oxygen.room_oxidant_rise(
                planned.oxygen.flow,
                planned.oxygen.fraction,
                planned.oxygen.nitrous_oxide_flow,
                env.volume,
                env.air_changes,
                ambient,
            )
            for planned in room.cases
            if planned.oxygen.delivery in OPEN_DELIVERY
        ),
        default=0.0,
    )
    if rise > ROOM_RISE_WORTH_SAYING:
        warnings.append(sentences.room_oxidant_rise(rise, env.air_changes))
    return Results(
        tool_version=__version__,
        input_sha256=room.sha256,
        input_name=Path(room.path).name,
        rules_digest=bound.rules_digest,
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
        oxygen_enriched_limit_fraction=bound.oxygen.enriched_limit,
        voltage_vs_rh=tuple((c.label, _voltage_curve(c, model)) for c in charges),
    )


ROOM_RISE_WORTH_SAYING = 0.005
"""A rise of the whole room's oxidant (fraction) worth a warning: a presentation threshold,
not a safety limit (the findings compare the site's oxidant with the enriched limit)."""


# --- floor and shock -------------------------------------------------------------


def compute_floor(room: Room, bound: Bound) -> FloorResult:
    readings = room.floor.point_to_ground
    stats = floor.floor_statistics(readings)
    window = bound.window
    mains = room.room.mains
    low = window.low.value if window.low is not None else None
    high = window.high.value if window.high is not None else None
    outside = floor.readings_outside_window(
        readings,
        low,
        high,
        low_inclusive=window.low_inclusive,
        high_inclusive=window.high_inclusive,
    )
    passed = not outside
    if (
        window.mean_low is not None
        and stats.count >= window.mean_min_readings
        and stats.mean <= window.mean_low.value
    ):
        passed = False
    body, extrapolated = shock.body_impedance(mains.voltage, list(bound.shock.body_impedance))
    current = shock.shock_current(mains.voltage, stats.min, body)
    notes = []
    if mains.system == "isolated":
        notes.append(sentences.ISOLATED_SUPPLY_SHOCK)
    if extrapolated:
        notes.append(sentences.body_impedance_outside_table(mains.voltage))
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


def footwear_resistance(person: Person, bound: Bound) -> tuple[float, str]:
    if person.footwear.resistance is not None:
        return person.footwear.resistance, "measured"
    cls = person.footwear.cls or DEFAULT_FOOTWEAR
    return bound.footwear_resistance(cls), cls


DEFAULT_FOOTWEAR = "insulating"
"""Footwear of unknown class is taken as insulating: the cautious side for static."""


def _charge_state(
    kind: str,
    label: str,
    count: int,
    footwear: str,
    leak: float,
    capacitance: float,
    rh: float,
    model: _Charging,
) -> ChargeResult:
    v_sat, _ = electrostatics.saturation_voltage(rh, list(model.saturation_points))
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
    person: Person, model: _Charging, rh: float, default_c: float, bound: Bound
) -> ChargeResult:
    footwear_r, footwear = footwear_resistance(person, bound)
    capacitance = person.capacitance if person.capacitance is not None else default_c
    return _charge_state(
        "person",
        person.role,
        person.count,
        footwear,
        footwear_r + model.floor_max,
        capacitance,
        rh,
        model,
    )


def _trolley(trolley: Trolley, model: _Charging, rh: float) -> ChargeResult:
    return _charge_state(
        "trolley",
        trolley.name,
        1,
        "",
        trolley.path_to_floor + model.floor_max,
        trolley.capacitance,
        rh,
        model,
    )


def _voltage_curve(charge: ChargeResult, model: _Charging) -> tuple[tuple[float, float], ...]:
    points = []
    for rh in RH_CHART:
        v_sat, _ = electrostatics.saturation_voltage(rh, list(model.saturation_points))
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


def room_fuels(room: Room, bound: Bound) -> list[Fuel]:
    """Fuels of every preparation stocked in the room."""
    found: dict[str, Fuel] = {}
    for prep in room.preparations:
        for fuel in bound.fuels.get(prep.id, ()):
            found[fuel.id] = fuel
    return list(found.values())


def lowest_mie(fuels: list[Fuel], oxidant: float, air_fraction: float) -> tuple[float | None, str]:
    """Lowest MIE among fuels at an oxidant fraction, and the fuel that sets it."""
    best: tuple[float | None, str] = (None, "")
    for fuel in fuels:
        mie = ignition.mie_at_oxidant(
            fuel.mie_air,
            oxidant,
            fuel.exponent,
            fuel.mie_oxygen,
            air_fraction=air_fraction,
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


def _preparations(
    room: Room, bound: Bound
) -> tuple[tuple[PreparationResult, ...], dict[str, PreparationAnalysis]]:
    if not room.preparations or bound.prep is None:
        return (), {}

    film_t = bound.prep.skin_temperature_default
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
        if not bound.fuels.get(prep.id) and any(analysis.flammable):
            notes.append(sentences.NO_MIE_FOR_FLAMMABLE_COMPONENTS)
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
    bound: Bound,
    analyses: dict[str, PreparationAnalysis],
    largest_spark: float | None,
) -> CaseResult:
    ambient = bound.oxygen.ambient
    enriched = bound.oxygen.enriched_limit
    ox = case.oxygen
    pocket = case.drape_pocket
    notes: list[str] = []
    near_airway = bound.sites_near_airway.get(case.site, True)
    if ox.delivery in OPEN_DELIVERY and not near_airway:
        notes.append(sentences.open_delivery_away_from_site(ox.delivery, case.site))
    if ox.delivery in OPEN_DELIVERY and near_airway:
        c_ss = oxygen.pocket_steady_state(
            ox.flow, ox.fraction, ox.nitrous_oxide_flow, pocket.exchange, ambient
        )
        total = ox.flow + ox.nitrous_oxide_flow + pocket.exchange
        buildup = oxygen.buildup_time(enriched, ambient, c_ss, pocket.volume, total)
    else:
        c_ss, buildup = ambient, math.inf
        if ox.delivery == "closed-airway":
            notes.append(sentences.CLOSED_AIRWAY)
    washout = oxygen.washout_time(c_ss, enriched, pocket.volume, pocket.exchange, ambient)
    ceiling_stop = oxygen.washout_time(
        c_ss, bound.oxygen.open_delivery_ceiling, pocket.volume, pocket.exchange, ambient
    )
    at_activation = oxygen.fraction_after_stop(
        c_ss, ox.stop_before_activation, pocket.volume, pocket.exchange, ambient
    )
    curve = _oxygen_curve(
        c_ss, ox.stop_before_activation, pocket.volume, pocket.exchange, ambient, washout
    )

    mie, mie_fuel = lowest_mie(room_fuels(room, bound), at_activation, ambient)

    materials = bound.materials
    loi = [
        (name, materials[name.lower()].loi) for name in case.materials if name.lower() in materials
    ]
    sustaining = ignition.materials_sustaining(c_ss, loi, bound.loi_allowance)
    holding = tuple(
        name
        for name in case.materials
        if name.lower() in materials
        and ignition.holds_charge(
            room.environment.relative_humidity, materials[name.lower()].holds_charge_below_rh
        )
    )

    drying = peak = safe = left_draping = left_activation = pocket_activation = None
    film_curve: tuple[tuple[float, float], ...] = ()
    fuel_at_activation = False
    prep_flammable = False
    if case.prep is not None and case.prep.preparation in analyses and bound.prep is not None:
        assumptions = bound.prep
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
        fuel_at_activation = (
            outcome.pocket_at_activation_fraction_of_lfl >= assumptions.pocket_margin
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
