"""Drying of an applied preparation, the drape pocket over it, and the safe draping time.

Each volatile component leaves the film at the flux of `ignite.physics.evaporation`,
and the composition is integrated in time: the alcohol leaves first. Before draping
the far side is the room (its water vapour from RH); once drapes are on it is the drape
pocket, a well-mixed volume

    V · dc_i/dt = Σ A·N_i − Q · (c_i − c_i,room)

whose vapour, as a fraction of the LFL by Le Chatelier's rule, is compared with a
margin (`ignite.simulate.film` holds the equations). `simulate_prep` takes the
application, the room air, the drape plan and the pocket as small records, and the
rules' assumptions as `ignite.rules.bound.PrepAssumptions`.

Units: volumes [m³], areas [m²], flows [m³/s], speeds [m/s], times [s], temperatures
[K], pressures [Pa]. Fractions are 0-1.

The film's temperature comes from its heat balance (evaporative cooling against heat
from the tissue, the air and radiation; `ignite.simulate.film`), and natural convection
counts only where the gas at the film is lighter than the air above it. Where that model
simplifies it errs towards slow evaporation (heat stored in the skin, the slight mixing
over a stably layered film and a drape warmed by the patient are left out), so drying
times and the liquid left at draping and activation err high. Slow evaporation would
make the drape pocket's peak err low, so the pocket is fed by a second, bounding model:
the liquid left on the slow timeline, evaporating at the fastest rate the film could have
(held at the warmer of skin and air, with warm-film convection and the vapour's weight
left out). Each figure thus errs on its own safe side: drying time long, pocket peak
high, safe draping time late. Water taken up from humid air by a film that has none is
not modelled.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Protocol

from ignite.errors import SolveLimitError
from ignite.physics.vapour import STANDARD_PRESSURE
from ignite.rules.bound import PrepAssumptions
from ignite.simulate.film import FilmModel, film_diffusivities, film_patches
from ignite.simulate.kept import kept
from ignite.simulate.notes import Note
from ignite.simulate.preparation import PreparationAnalysis

__all__ = [
    "HORIZON",
    "DrapePlan",
    "DrapePocket",
    "Film",
    "PrepOutcome",
    "RoomAir",
    "simulate_prep",
]

HORIZON = 12 * 3600.0
"""Longest time simulated [s]; a film not dry by then counts as never dry."""


@dataclass(frozen=True)
class Film:
    """One application of a preparation: how much liquid, on how much skin, how warm."""

    volume: float  # m³ of liquid applied
    area: float  # m² of skin it covers
    temperature: float  # K, the skin's: the tissue under the film is held at it
    hair: bool = False  # applied among hair
    pooling: bool = False  # some of it pools, out of the air stream


@dataclass(frozen=True)
class RoomAir:
    """The room's air over the site before draping."""

    temperature: float  # K
    relative_humidity: float  # 0-1
    speed: float  # m/s over the site
    pressure: float = STANDARD_PRESSURE  # Pa


@dataclass(frozen=True)
class DrapePlan:
    """When the case drapes and first activates, in s from the end of prepping."""

    draping_after: float
    first_activation_after: float


@dataclass(frozen=True)
class DrapePocket:
    """The well-mixed volume of air under the drapes over the site."""

    volume: float  # m³
    exchange: float  # m³/s of room air through it


@dataclass(frozen=True)
class PrepOutcome:
    """What one application of a preparation does over time, from the end of prepping."""

    drying_time_s: float  # flammable part below the dry fraction, on the case's timeline
    flammable_left_at_draping_fraction: float  # of the flammable mass applied
    flammable_left_at_activation_fraction: float
    pocket_peak_fraction_of_lfl: float  # 0 if dry at draping
    pocket_at_activation_fraction_of_lfl: float
    safe_draping_after_s: float  # earliest draping keeping the peak <= margin
    film_curve: tuple[tuple[float, float], ...]  # (s, flammable liquid left, fraction)
    pocket_curve: tuple[tuple[float, float], ...]  # (s, pocket vapour / LFL)
    notes: tuple[Note, ...] = ()
    open_air_drying_time_s: float = math.inf  # if the site were never draped
    pocket_peak_time_s: float | None = None  # s from end of prep
    film_temperature_min_K: float | None = None  # lowest film temperature until dry
    mass_transfer_regime: str = ""  # what carries the fuel off in open air, end of prepping
    mass_transfer_regime_under_drapes: str = ""  # the same at draping ('' if dry by then)


class _Solution(Protocol):
    """What this module reads of a `scipy.integrate.solve_ivp` result."""

    t: Sequence[float]
    t_events: Sequence[Sequence[float]]
    sol: Callable[[float], Sequence[float]]


_RTOL = 1e-5

# Right-hand-side evaluations one solve may use: the sample rooms' solves take at most
# about 2000, so a solve that reaches this is stuck, and stops with a clear error rather
# than run for ever (each evaluation costs about the same, so this bounds time as well).
MAX_EVALUATIONS = 100_000


def _bounded(
    rhs: Callable[[float, Sequence[float]], list[float]], phase: str
) -> Callable[[float, Sequence[float]], list[float]]:
    """`rhs` that raises `SolveLimitError` once it has been called MAX_EVALUATIONS times."""
    calls = 0

    def counted(t: float, state: Sequence[float]) -> list[float]:
        nonlocal calls
        calls += 1
        if calls > MAX_EVALUATIONS:
            raise SolveLimitError(f"the drying solve ({phase})", MAX_EVALUATIONS)
        return rhs(t, state)

    return counted


def _max_step(model: FilmModel) -> float:
    """Longest solver step [s]: half the pocket's time constant, at most 10 min. Without
    a cap, LSODA was seen to stall over the 12 h horizon once the film was gone."""
    step = 600.0
    if model.pocket_exchange > 0.0:
        step = min(step, 0.5 * model.pocket_volume / model.pocket_exchange)
    return step


def _tolerances(model: FilmModel, covered: bool) -> list[float]:
    atol = [max(n, 1e-9) * 1e-8 for n in model.initial]
    if covered:
        atol.extend([1e-9] * model.count)
    return atol


def _open_phase(model: FilmModel, dry_fraction: float, horizon: float) -> _Solution:
    """Integrate the film in open air until far past dry, or to the horizon."""
    from scipy.integrate import solve_ivp

    def nearly_gone(_t: float, state: Sequence[float]) -> float:
        return model.flammable_left(state) - dry_fraction * 1e-2

    nearly_gone.terminal = True  # type: ignore[attr-defined]

    def dry(_t: float, state: Sequence[float]) -> float:
        return model.flammable_left(state) - dry_fraction

    solution: _Solution = solve_ivp(
        _bounded(model.rhs(covered=False), "open air"),
        (0.0, horizon),
        model.initial,
        method="LSODA",
        dense_output=True,
        events=(dry, nearly_gone),
        rtol=_RTOL,
        atol=_tolerances(model, covered=False),
        max_step=_max_step(model),
    )
    return solution


def _covered_phase(
    model: FilmModel,
    start: float,
    film_state: Sequence[float],
    dry_fraction: float,
    horizon: float,
    *,
    stop: str,
) -> _Solution:
    """Integrate film and pocket from draping on.

    stop='clear': until the film is nearly gone and the pocket has cleared;
    stop='peak': until the peak has passed, or the film is nearly gone. The peak has
    passed once the level the film's present source would hold the pocket at (S/Q) is
    below 0.9 of the pocket's own level: the pocket is then falling, and as long as the
    source does not grow again, which it does not once the alcohol is depleting, it
    cannot climb back above where it is. The test reads the state alone, as solve_ivp's
    event location requires.
    """
    from scipy.integrate import solve_ivp

    count = model.count
    npc = len(model.patches) * count
    state0 = [*film_state, *model.room]

    def film_gone(state: Sequence[float]) -> float:
        return model.flammable_left(state[:npc]) - dry_fraction * 1e-2

    def finished(_t: float, state: Sequence[float]) -> float:
        pocket = model.pocket_index(state[npc:])
        if stop == "clear":
            return max(film_gone(state), pocket - 1e-4)
        if model.pocket_exchange <= 0.0:
            return film_gone(state)
        held = model.pocket_index(model.held_concentrations(state))
        return min(film_gone(state), held - 0.9 * pocket)

    finished.terminal = True  # type: ignore[attr-defined]

    def dry(_t: float, state: Sequence[float]) -> float:
        return model.flammable_left(state[:npc]) - dry_fraction

    solution: _Solution = solve_ivp(
        _bounded(model.rhs(covered=True), "under the drapes"),
        (start, max(horizon, start + 1.0)),
        state0,
        method="LSODA",
        dense_output=True,
        events=(dry, finished),
        rtol=_RTOL,
        atol=_tolerances(model, covered=True),
        max_step=_max_step(model),
    )
    return solution


def _samples(start: float, end: float, count: int, extra: Sequence[float]) -> list[float]:
    """`count` evenly spaced times from start to end, with the `extra` times that fall within."""
    if end <= start:
        return [start]
    grid = [start + (end - start) * j / (count - 1) for j in range(count)]
    return sorted({*grid, *(t for t in extra if start <= t <= end)})


def _pocket_peak(model: FilmModel, solution: _Solution) -> tuple[float, float]:
    """Largest pocket vapour / LFL along a covered-phase solution, and when."""
    npatch_count = len(model.patches) * model.count
    times = _samples(solution.t[0], solution.t[-1], 200, list(solution.t))
    best, when = 0.0, float(solution.t[0])
    for t in times:
        value = float(model.pocket_index(solution.sol(t)[npatch_count:]))
        if value > best:
            best, when = value, float(t)
    return best, when


@dataclass(frozen=True)
class _OpenAir:
    """The film dried in open air from the end of prepping: where every draping time starts."""

    solution: _Solution
    end: float  # s, when the integration stopped (film nearly gone, or the horizon)
    dry: float  # s, when the film reached the dry fraction; inf if never
    gone: bool  # the film was nearly gone before the horizon
    initial: tuple[float, ...]  # the film at the end of prepping

    def film_at(self, t: float) -> list[float]:
        if t <= 0.0:
            return list(self.initial)
        return list(self.solution.sol(min(t, self.end)))


def _open_air(model: FilmModel, dry_fraction: float) -> _OpenAir:
    solution = _open_phase(model, dry_fraction, HORIZON)
    return _OpenAir(
        solution=solution,
        end=float(solution.t[-1]),
        dry=float(solution.t_events[0][0]) if len(solution.t_events[0]) else math.inf,
        gone=len(solution.t_events[1]) > 0,
        initial=tuple(model.initial),
    )


_State = tuple[list[float], list[float]]
"""(the patches' amounts [mol], the pocket's concentrations [mol/m³]) at one time."""


@dataclass(frozen=True)
class _Planned:
    """The case as planned: draped at the plan's time."""

    peak: float  # pocket vapour / LFL
    peak_time: float | None  # s; None when the film was gone before draping
    drying: float  # s
    end: float  # s, the end of the integration
    state_at: Callable[[float], _State]
    pocket_curve: tuple[tuple[float, float], ...]


def _as_planned(
    model: FilmModel, open_air: _OpenAir, plan: DrapePlan, dry_fraction: float
) -> _Planned:
    draping = plan.draping_after
    if draping >= open_air.end:

        def open_state(t: float) -> _State:
            return open_air.film_at(t), list(model.room)

        return _Planned(0.0, None, open_air.dry, open_air.end, open_state, ((draping, 0.0),))

    covered = _covered_phase(
        model, draping, open_air.film_at(draping), dry_fraction, HORIZON, stop="clear"
    )
    npc = len(model.patches) * model.count
    peak, peak_time = _pocket_peak(model, covered)
    covered_end = float(covered.t[-1])
    drying = float(covered.t_events[0][0]) if len(covered.t_events[0]) else math.inf
    if drying == math.inf and open_air.dry <= draping:
        drying = open_air.dry

    def state_at(t: float) -> _State:
        if t < draping:
            return open_air.film_at(t), list(model.room)
        full = list(covered.sol(min(t, covered_end)))
        if t > covered_end:
            return full[:npc], list(model.room)
        return full[:npc], full[npc:]

    pocket_times = _samples(draping, covered_end, 120, [peak_time, plan.first_activation_after])
    pocket_curve = tuple((t, model.pocket_index(state_at(t)[1])) for t in pocket_times)
    return _Planned(peak, peak_time, drying, covered_end, state_at, pocket_curve)


def _safe_draping_time(
    model: FilmModel, open_air: _OpenAir, dry_fraction: float, margin: float
) -> float:
    """Earliest draping time that keeps the pocket's peak within the margin [s].

    0 when draping at once keeps it; inf when the film is still wet at the horizon and
    draping at once does not (no draping time within the horizon is then safe).
    """
    peaks: dict[float, float] = {}

    def peak_if_draped_at(t: float) -> float:
        if t >= open_air.end:
            return 0.0  # nothing left to feed the pocket
        if t not in peaks:
            covered = _covered_phase(
                model, t, open_air.film_at(t), dry_fraction, HORIZON, stop="peak"
            )
            peaks[t] = _pocket_peak(model, covered)[0]
        return peaks[t]

    if peak_if_draped_at(0.0) <= margin:
        return 0.0
    if not open_air.gone:
        return math.inf
    from scipy.optimize import brentq

    return float(
        brentq(lambda t: peak_if_draped_at(t) - margin, 0.0, open_air.end, xtol=0.5, rtol=1e-4)
    )


def _film_model(
    analysis: PreparationAnalysis,
    film: Film,
    air: RoomAir,
    pocket: DrapePocket,
    assumptions: PrepAssumptions,
    *,
    fastest: bool = False,
) -> tuple[FilmModel, list[str]]:
    """The film and pocket equations of this application, and the components whose
    diffusivity was estimated; `fastest`: the upper bound of its evaporation
    (`FilmModel`)."""
    patches = film_patches(
        film.volume,
        film.area,
        hair=film.hair,
        pooling=film.pooling,
        hair_still_layer=assumptions.hair_still_layer,
        hair_exposed_fraction=assumptions.hair_exposed_fraction,
        pooling_volume_fraction=assumptions.pooling_volume_fraction,
        pooling_area_fraction=assumptions.pooling_area_fraction,
    )
    mean_temperature = 0.5 * (film.temperature + air.temperature)
    diffusivities, estimated = film_diffusivities(
        analysis, assumptions, mean_temperature, air.pressure
    )
    model = FilmModel(
        analysis,
        patches,
        air_speed=air.speed,
        under_drape_air_speed=assumptions.under_drape_air_speed,
        skin_temperature=film.temperature,
        air_temperature=air.temperature,
        relative_humidity=air.relative_humidity,
        pocket_volume=pocket.volume,
        pocket_exchange=pocket.exchange,
        diffusivities=diffusivities,
        pressure=air.pressure,
        tissue_conductance=assumptions.tissue_conductance,
        emissivity=assumptions.film_emissivity,
        fastest=fastest,
    )
    return model, estimated


def _application_notes(film: Film, assumptions: PrepAssumptions) -> list[Note]:
    notes = [Note.of("drying-errs-long")]
    if film.hair:
        notes.append(
            Note.of(
                "hair",
                exposed_fraction=assumptions.hair_exposed_fraction,
                still_layer=assumptions.hair_still_layer,
            )
        )
    if film.pooling:
        notes.append(
            Note.of(
                "pooling",
                volume_fraction=assumptions.pooling_volume_fraction,
                area_fraction=assumptions.pooling_area_fraction,
            )
        )
    return notes


@dataclass(frozen=True)
class _Surfaces:
    """What the film's surface did from the end of prepping until dry."""

    coldest: float | None  # K, lowest temperature of any wet patch
    open_regime: str  # the fuel's regime in open air at the end of prepping
    draped_regime: str  # the same at draping ('' when nothing is left then)
    open_regimes: frozenset[str]  # regimes seen in open air before draping


def _surfaces(
    model: FilmModel, planned: _Planned, plan: DrapePlan, times: Sequence[float]
) -> _Surfaces:
    """Film temperature and mass-transfer regime along the planned timeline, up to dry.

    The regime is that of the fuel with most moles at the start, on the first patch in
    the air stream (else the first patch)."""
    fuel = max(
        (i for i in range(model.count) if model.flammable[i] and model.volatile[i]),
        key=lambda i: model.initial[i],
        default=None,
    )
    main = next((p for p, patch in enumerate(model.patches) if not patch.sheltered), 0)
    end = min(planned.drying, planned.end)
    span = sorted({0.0, *(t for t in times if t <= end)})
    coldest: float | None = None
    regimes: dict[bool, str] = {}
    seen: set[str] = set()
    for t in span:
        film, far = planned.state_at(t)
        covered = t >= plan.draping_after
        for p in range(len(model.patches)):
            moles = film[p * model.count : (p + 1) * model.count]
            surface = model.surface(p, moles, far, covered)
            if surface is None:
                continue
            if coldest is None or surface.temperature < coldest:
                coldest = surface.temperature
            if p == main and fuel is not None and surface.regimes[fuel]:
                regimes.setdefault(covered, surface.regimes[fuel])
                if not covered:
                    seen.add(surface.regimes[fuel])
    return _Surfaces(coldest, regimes.get(False, ""), regimes.get(True, ""), frozenset(seen))


def _outcome_notes(
    model: FilmModel,
    at_activation: _State,
    covered_at_activation: bool,
    drying: float,
    dry_fraction: float,
    open_regimes: frozenset[str],
) -> list[Note]:
    notes: list[Note] = []
    if open_regimes - {"forced"}:
        notes.append(Note.of("open-air-not-forced"))
    film_at_activation, far = at_activation
    left_at_activation = model.flammable_left(film_at_activation)
    if left_at_activation > dry_fraction:
        notes.append(
            Note.of(
                "wet-at-activation",
                left_fraction=left_at_activation,
                surface_fraction_of_lfl=model.surface_index(
                    film_at_activation, far, covered_at_activation
                ),
            )
        )
    if math.isinf(drying):
        notes.append(Note.of("not-dry-within-horizon", horizon=HORIZON))
    return notes


_NOTHING_TO_DRY = PrepOutcome(
    drying_time_s=0.0,
    flammable_left_at_draping_fraction=0.0,
    flammable_left_at_activation_fraction=0.0,
    pocket_peak_fraction_of_lfl=0.0,
    pocket_at_activation_fraction_of_lfl=0.0,
    safe_draping_after_s=0.0,
    film_curve=((0.0, 0.0),),
    pocket_curve=((0.0, 0.0),),
    notes=(Note.of("no-flammable-component"),),
    open_air_drying_time_s=0.0,
)


def simulate_prep(
    analysis: PreparationAnalysis,
    film: Film,
    air: RoomAir,
    plan: DrapePlan,
    pocket: DrapePocket,
    assumptions: PrepAssumptions,
) -> PrepOutcome:
    """Evaporate an applied preparation, drape it, and find the safe draping time.

    Times are from the end of prepping. Before `plan.draping_after` the film dries in
    the room's air stream; from then on it lies under the drapes, in still air
    (`assumptions.under_drape_air_speed`) against the pocket's own vapour. The pocket's
    peak vapour as a fraction of the LFL (Le Chatelier's index) is compared with
    `assumptions.pocket_margin`; `safe_draping_after_s` is the earliest draping time
    that keeps the peak at or below it (brentq on the peak, which falls as draping waits).
    Returns a PrepOutcome; times that never come within HORIZON are math.inf. A solve
    of the same inputs by the same code is read from the cache directory when kept
    there (`ignite.simulate.kept`), identical to solving it again.

    Worked example, 10 mL of 70 % v/v isopropanol on 400 cm² of skin at 32 °C,
    0.2 m/s of room air at 20 °C and 30 % RH, drapes at 3 min over a 30 L pocket
    with 10 L/min of fresh air (an invented case; assumptions as in rules/, with the
    diffusivities left to the Fuller estimate):

    >>> from ignite.simulate.preparation import analyse_preparation
    >>> a = analyse_preparation([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15)
    >>> assumptions = PrepAssumptions(dry_fraction=0.01, pocket_margin=0.25,
    ...     under_drape_air_speed=0.0, hair_still_layer=0.005, hair_exposed_fraction=0.5,
    ...     pooling_volume_fraction=0.5, pooling_area_fraction=0.1,
    ...     diffusivity_reference_temperature=298.15, diffusivities={},
    ...     skin_temperature_default=305.15, label_minimum_hairless=None,
    ...     label_maximum_hair=None, tissue_conductance=12.6, film_emissivity=0.95)
    >>> out = simulate_prep(a, Film(10e-6, 0.04, 305.15), RoomAir(293.15, 0.3, 0.2),
    ...     DrapePlan(180.0, 360.0), DrapePocket(0.030, 10e-3 / 60), assumptions)
    >>> round(out.open_air_drying_time_s), round(out.pocket_peak_fraction_of_lfl, 2)
    (1215, 0.95)
    >>> round(out.safe_draping_after_s)
    1047
    """
    if pocket.volume <= 0.0:
        raise ValueError("pocket volume must be positive")
    if pocket.exchange < 0.0 or air.speed < 0.0:
        raise ValueError("flows and speeds must not be negative")
    if not any(analysis.flammable):
        return _NOTHING_TO_DRY
    key = (analysis, film, air, plan, pocket, assumptions, HORIZON, MAX_EVALUATIONS, _RTOL)
    return kept(
        "drying",
        key,
        PrepOutcome,
        lambda: _simulate_prep(analysis, film, air, plan, pocket, assumptions),
    )


def _simulate_prep(
    analysis: PreparationAnalysis,
    film: Film,
    air: RoomAir,
    plan: DrapePlan,
    pocket: DrapePocket,
    assumptions: PrepAssumptions,
) -> PrepOutcome:
    """`simulate_prep`, solved (not read from the kept results)."""
    dry_fraction = assumptions.dry_fraction
    notes = _application_notes(film, assumptions)
    model, estimated = _film_model(analysis, film, air, pocket, assumptions)
    fastest = _film_model(analysis, film, air, pocket, assumptions, fastest=True)[0]
    notes.extend(Note.of("diffusivity-estimated", name=name) for name in estimated)

    # Each figure on its safe side: the film dries by its heat balance (slow side), and
    # the pocket is fed by the liquid left on that timeline evaporating at its fastest.
    open_air = _open_air(model, dry_fraction)
    planned = _as_planned(model, open_air, plan, dry_fraction)
    fed = _as_planned(fastest, open_air, plan, dry_fraction)
    film_times = _samples(
        0.0, min(planned.end, HORIZON), 120, [plan.draping_after, plan.first_activation_after]
    )
    film_curve = tuple((t, model.flammable_left(planned.state_at(t)[0])) for t in film_times)
    surfaces = _surfaces(model, planned, plan, film_times)
    at_activation = planned.state_at(plan.first_activation_after)
    safe = _safe_draping_time(fastest, open_air, dry_fraction, assumptions.pocket_margin)
    notes.extend(
        _outcome_notes(
            fastest,
            (at_activation[0], fed.state_at(plan.first_activation_after)[1]),
            plan.first_activation_after >= plan.draping_after,
            planned.drying,
            dry_fraction,
            surfaces.open_regimes,
        )
    )
    return PrepOutcome(
        drying_time_s=planned.drying,
        flammable_left_at_draping_fraction=model.flammable_left(
            planned.state_at(plan.draping_after)[0]
        ),
        flammable_left_at_activation_fraction=model.flammable_left(at_activation[0]),
        pocket_peak_fraction_of_lfl=fed.peak,
        pocket_at_activation_fraction_of_lfl=fastest.pocket_index(
            fed.state_at(plan.first_activation_after)[1]
        ),
        safe_draping_after_s=safe,
        film_curve=film_curve,
        pocket_curve=fed.pocket_curve,
        notes=tuple(notes),
        open_air_drying_time_s=open_air.dry,
        pocket_peak_time_s=fed.peak_time,
        film_temperature_min_K=surfaces.coldest,
        mass_transfer_regime=surfaces.open_regime,
        mass_transfer_regime_under_drapes=surfaces.draped_regime,
    )
