"""The planned cases: oxygen at the site, MIE, materials, the prep's drying and the drape pocket, the fire triad."""

from __future__ import annotations

import math
from functools import lru_cache

from ignite.physics import ignition, oxygen
from ignite.records.results import (
    CaseResult,
    ComponentResult,
    PreparationResult,
    Triad,
)
from ignite.room.model import Case, Room
from ignite.rules.bound import Bound, Fuel
from ignite.simulate.drying import DrapePlan, DrapePocket, Film, RoomAir, simulate_prep
from ignite.simulate.notes import worded
from ignite.simulate.preparation import PreparationAnalysis, analyse_preparation
from ignite.wording import sentences

# --- fuels and MIE ---------------------------------------------------------------


def room_fuels(room: Room, bound: Bound) -> list[Fuel]:
    """Fuels of every preparation stocked in the room."""
    found: dict[str, Fuel] = {}
    for prep in room.preparations:
        for fuel in bound.fuels.get(prep.id, ()):
            found[fuel.id] = fuel
    return list(found.values())


def case_fuels(case: Case, bound: Bound) -> list[Fuel]:
    """Fuels of the case's own preparation: none for `prep: none` or a prep with no fuel
    (aqueous); never another case's or the room's stock."""
    if case.prep is None:
        return []
    return list(bound.fuels.get(case.prep.preparation, ()))


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


def preparations(
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


def case_result(
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

    mie, mie_fuel = lowest_mie(case_fuels(case, bound), at_activation, ambient)

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
    film_min: float | None = None
    regime = regime_draped = ""
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
        film_min = outcome.film_temperature_min_K
        regime = outcome.mass_transfer_regime
        regime_draped = outcome.mass_transfer_regime_under_drapes
        notes.extend(worded(outcome.notes))
        fuel_at_activation = (
            outcome.pocket_at_activation_fraction_of_lfl >= assumptions.pocket_margin
            or outcome.flammable_left_at_activation_fraction > assumptions.dry_fraction
        )

    nitrous_oxide = ox.nitrous_oxide_flow > 0.0
    if nitrous_oxide and at_activation <= enriched:
        notes.append(sentences.NITROUS_OXIDE_OXIDANT_SIDE)
    triad = Triad(
        # the site's oxidant above the enriched limit, or nitrous oxide (an oxidant the
        # enriched limit on oxygen does not capture) delivered at all
        oxidant=at_activation > enriched or nitrous_oxide,
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
        film_temperature_min_K=film_min,
        mass_transfer_regime=regime,
        mass_transfer_regime_under_drapes=regime_draped,
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
