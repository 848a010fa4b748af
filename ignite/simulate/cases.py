"""The planned cases: oxygen at the site, MIE, materials, the prep's drying and the drape pocket, the fire triad."""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

from ignite.errors import SolveLimitError
from ignite.physics import ignition, oxygen
from ignite.records.results import (
    CaseResult,
    ComponentResult,
    PreparationResult,
    Triad,
)
from ignite.room.model import Case, Room
from ignite.rules.bound import Bound, Fuel
from ignite.simulate.drying import (
    DrapePlan,
    DrapePocket,
    Film,
    PrepOutcome,
    RoomAir,
    simulate_prep,
)
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


@dataclass(frozen=True)
class SiteOxygen:
    """Oxidant at a case's site: steady state under the drapes, and after oxygen stops."""

    steady: float  # fraction while oxygen flows
    buildup_s: float  # to the enriched limit after oxygen starts (inf: never)
    washout_s: float  # to the enriched limit after oxygen stops
    ceiling_stop_s: float  # to the open-delivery ceiling after oxygen stops
    at_activation: float  # fraction when the ignition source is first used
    curve: tuple[tuple[float, float], ...]  # (s after oxygen stops, fraction)
    notes: tuple[str, ...]


def site_oxygen(case: Case, bound: Bound, *, curve: bool = True) -> SiteOxygen:
    """The drape pocket's oxidant for a case's delivery, site and pocket (well mixed);
    `curve` False leaves the curve empty (a sampled run reads the figures alone)."""
    ambient = bound.oxygen.ambient
    enriched = bound.oxygen.enriched_limit
    ox = case.oxygen
    pocket = case.drape_pocket
    notes: list[str] = []
    near_airway = bound.sites_near_airway.get(case.site, True)
    if ox.delivery in OPEN_DELIVERY and not near_airway:
        notes.append(sentences.open_delivery_away_from_site(ox.delivery, case.site))
    if ox.delivery in OPEN_DELIVERY and near_airway:
        steady = oxygen.pocket_steady_state(
            ox.flow, ox.fraction, ox.nitrous_oxide_flow, pocket.exchange, ambient
        )
        total = ox.flow + ox.nitrous_oxide_flow + pocket.exchange
        buildup = oxygen.buildup_time(enriched, ambient, steady, pocket.volume, total)
    else:
        steady, buildup = ambient, math.inf
        if ox.delivery == "closed-airway":
            notes.append(sentences.CLOSED_AIRWAY)
    washout = oxygen.washout_time(steady, enriched, pocket.volume, pocket.exchange, ambient)
    return SiteOxygen(
        steady=steady,
        buildup_s=buildup,
        washout_s=washout,
        ceiling_stop_s=oxygen.washout_time(
            steady, bound.oxygen.open_delivery_ceiling, pocket.volume, pocket.exchange, ambient
        ),
        at_activation=oxygen.fraction_after_stop(
            steady, ox.stop_before_activation, pocket.volume, pocket.exchange, ambient
        ),
        curve=_oxygen_curve(
            steady, ox.stop_before_activation, pocket.volume, pocket.exchange, ambient, washout
        )
        if curve
        else (),
        notes=tuple(notes),
    )


def _materials(
    case: Case, bound: Bound, rh: float, oxidant: float
) -> tuple[tuple[str, ...], tuple[str, ...]]:
    """The case's materials that would keep burning at the site's oxidant, and those that
    hold charge at the room's RH (names as the room file writes them)."""
    known = [
        (name, bound.materials[name.lower()])
        for name in case.materials
        if name.lower() in bound.materials
    ]
    sustaining = ignition.materials_sustaining(
        oxidant, [(name, m.loi) for name, m in known], bound.loi_allowance
    )
    holding = tuple(name for name, m in known if ignition.holds_charge(rh, m.holds_charge_below_rh))
    return tuple(sustaining), holding


def _drying(
    case: Case, room: Room, bound: Bound, analyses: dict[str, PreparationAnalysis]
) -> tuple[PrepOutcome, bool] | None:
    """The case's prep drying on its own timeline, and whether the prep is flammable; None
    when the case has no preparation analysed."""
    if case.prep is None or case.prep.preparation not in analyses or bound.prep is None:
        return None
    assumptions = bound.prep
    analysis = analyses[case.prep.preparation]
    film_t = case.prep.skin_temperature or assumptions.skin_temperature_default
    if film_t != analysis.film_temperature_K:
        prep = next(p for p in room.preparations if p.id == case.prep.preparation)
        analysis = analyse(prep.components, prep.basis, film_t)
    try:
        outcome = simulate_prep(
            analysis,
            Film(case.prep.volume, case.prep.area, film_t, case.prep.hair, case.prep.pooling),
            RoomAir(
                room.environment.temperature, room.environment.relative_humidity, case.air_speed
            ),
            DrapePlan(case.draping_after, case.first_activation_after),
            DrapePocket(case.drape_pocket.volume, case.drape_pocket.exchange),
            assumptions,
        )
    except SolveLimitError as exc:
        raise SolveLimitError(
            sentences.solve_subject(case.id, case.prep.preparation, exc.what), exc.steps
        ) from exc
    return outcome, any(analysis.flammable)


def prep_drying(
    case: Case, room: Room, bound: Bound, analyses: dict[str, PreparationAnalysis]
) -> tuple[PrepOutcome, bool] | None:
    """The case's prep drying (see `_drying`), for the sampling of `ignite.simulate.uncertainty`."""
    return _drying(case, room, bound, analyses)


def case_result(
    case: Case,
    room: Room,
    bound: Bound,
    analyses: dict[str, PreparationAnalysis],
    largest_spark: float | None,
) -> CaseResult:
    enriched = bound.oxygen.enriched_limit
    ox = case.oxygen
    site = site_oxygen(case, bound)
    notes = list(site.notes)
    at_activation = site.at_activation
    mie, mie_fuel = lowest_mie(case_fuels(case, bound), at_activation, bound.oxygen.ambient)
    sustaining, holding = _materials(case, bound, room.environment.relative_humidity, site.steady)

    dried = _drying(case, room, bound, analyses)
    outcome = dried[0] if dried else None
    prep_flammable = bool(dried and dried[1])
    fuel_at_activation = False
    if outcome is not None and bound.prep is not None:
        notes.extend(worded(outcome.notes))
        fuel_at_activation = (
            outcome.pocket_at_activation_fraction_of_lfl >= bound.prep.pocket_margin
            or outcome.flammable_left_at_activation_fraction > bound.prep.dry_fraction
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
        oxidant_fraction=site.steady,
        oxygen_enriched=site.steady > enriched,
        washout_s=site.washout_s,
        oxidant_at_activation_fraction=at_activation,
        mie_J=mie,
        drying_time_s=outcome.drying_time_s if outcome else None,
        pocket_vapour_peak_fraction_of_lfl=outcome.pocket_peak_fraction_of_lfl if outcome else None,
        safe_draping_after_s=outcome.safe_draping_after_s if outcome else None,
        materials_sustain_burning=sustaining,
        triad=triad,
        mie_fuel=mie_fuel,
        buildup_s=None if math.isinf(site.buildup_s) else site.buildup_s,
        required_stop_s=site.washout_s,
        largest_spark_J=largest_spark,
        materials_holding_charge=holding,
        ignition_sources=case.ignition_sources,
        draping_after_s=case.draping_after,
        first_activation_after_s=case.first_activation_after,
        stop_before_activation_s=ox.stop_before_activation,
        delivery=ox.delivery,
        ceiling_stop_s=site.ceiling_stop_s,
        preparation=case.prep.preparation if case.prep else "",
        prep_flammable=prep_flammable,
        hair=bool(case.prep and case.prep.hair),
        pooling=bool(case.prep and case.prep.pooling),
        flammable_left_at_draping_fraction=(
            outcome.flammable_left_at_draping_fraction if outcome else None
        ),
        flammable_left_at_activation_fraction=(
            outcome.flammable_left_at_activation_fraction if outcome else None
        ),
        pocket_at_activation_fraction_of_lfl=(
            outcome.pocket_at_activation_fraction_of_lfl if outcome else None
        ),
        open_air_drying_time_s=outcome.open_air_drying_time_s if outcome else None,
        pocket_curve=outcome.pocket_curve if outcome else (),
        pocket_margin_fraction_of_lfl=(
            bound.prep.pocket_margin if outcome and bound.prep is not None else None
        ),
        label_minimum_s=(
            bound.prep.label_minimum_hairless if prep_flammable and bound.prep is not None else None
        ),
        oxygen_curve=site.curve,
        film_curve=outcome.film_curve if outcome else (),
        notes=tuple(notes),
        film_temperature_min_K=outcome.film_temperature_min_K if outcome else None,
        mass_transfer_regime=outcome.mass_transfer_regime if outcome else "",
        mass_transfer_regime_under_drapes=(
            outcome.mass_transfer_regime_under_drapes if outcome else ""
        ),
    )


def _oxygen_curve(
    c_ss: float, stop: float, volume: float, exchange: float, ambient: float, washout: float
) -> tuple[tuple[float, float], ...]:
    """Oxidant at the site from the moment oxygen stops (t = 0) to past activation."""
    end = max(stop, washout, 60.0) * 1.3
    steps = 60
    times = [end * i / steps for i in range(steps + 1)]
    fractions = oxygen.fractions_after_stop(c_ss, times, volume, exchange, ambient)
    return tuple(zip(times, fractions, strict=True))
