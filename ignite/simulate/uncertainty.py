"""Ranges in, probabilities out: the room's figures over the spread of its inputs.

Every range of the room file (`Room.ranges`) and of the rules (`Bound.spreads`) is one
dimension of a Latin hypercube (`latin_hypercube`, scipy's algorithm, seeded from the SHA-256
of the room file and of the rules, so the same inputs always give the same bytes). Each
sample is the room with those inputs set to the sampled values, computed by the very
functions the nominal run uses (`site_oxygen`, `lowest_mie`, `person_charge`, the drying
of `ignite.simulate.cases`); a sample therefore is a nominal run of other inputs, and
ranges of zero width give the nominal figures exactly.

Per case and per person this gives the 5th, 50th and 95th percentiles of the decisive
figures, the probabilities that matter (prep wet at first activation, pocket above its
margin with drapes as planned, site enriched at activation, a spark above the site's
MIE), the waits a person acts on read at the confidence percentile (drape no earlier
than, stop oxygen at least), and what drives each figure: inputs ranked by the absolute
Spearman rank correlation of input and figure over the samples.

Percentiles are order statistics (numpy's `inverted_cdf`: always a sampled value, never
interpolated), and a wait is the smallest sample at or above its percentile, so no
decision is read lower than a sample supports.

The drying is the costly part: a solve of `ignite.simulate.drying` per distinct set of
the inputs it reads (the prep, the air, the plan, the pocket and the film model's
assumptions). Samples that vary only oxygen, charge or MIE reuse one drying solve.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any

from ignite.records.results import (
    Band,
    CaseResult,
    ChargeResult,
    Driver,
    Results,
    Spread,
    SpreadInput,
    SpreadSummary,
)
from ignite.room.model import Case, Footwear, Room
from ignite.room.ranges import DEFAULT_SAMPLES, Distribution, Sampling, sampling_seed
from ignite.rules.bound import Bound, Fuel
from ignite.simulate.batch import BatchInputs, batch_supported, dry_batch
from ignite.simulate.cases import case_fuels, lowest_mie, preparations, site_oxygen
from ignite.simulate.cases import prep_drying as case_drying
from ignite.simulate.charge import Charging, person_charge, trolley_charge
from ignite.simulate.drying import PrepOutcome
from ignite.simulate.preparation import PreparationAnalysis
from ignite.wording import sentences

if TYPE_CHECKING:
    import numpy as np
    import numpy.typing as npt

    Array = npt.NDArray[np.float64]

METHOD = (
    "Latin hypercube sampling (the algorithm of scipy.stats.qmc), seeded from the room file's "
    "and the rules' SHA-256"
)
SENSITIVITY = "Spearman rank correlation of each input with each figure over the samples"

# The figures given percentiles, by record key, and whether a larger value is the worse.
CASE_FIGURES = (
    "drying_time_s",
    "safe_draping_after_s",
    "pocket_vapour_peak_fraction_of_lfl",
    "oxidant_at_activation_fraction",
    "washout_s",
)
CHARGE_FIGURES = ("body_voltage_V", "spark_energy_J")
PROBABILITIES = (
    "prep_wet_at_activation",
    "pocket_above_margin_at_draping",
    "oxidant_enriched_at_activation",
    "spark_above_site_mie",
)
DRIVERS_KEPT = 4
"""Inputs listed per figure, strongest first (the worksheet names the first one or two)."""


_DRYING_KEYS = ("prep.", "air_speed", "draping_after", "first_activation_after", "drape_pocket.")
_OXYGEN_KEYS = ("oxygen.", "drape_pocket.")
_HAIR = ("prep.hair_still_layer", "prep.hair_exposed_fraction")
_POOLING = ("prep.pooling_volume_fraction", "prep.pooling_area_fraction")


def _case_inputs(
    inputs: Sequence[_Input], index: int, case: Case, bound: Bound
) -> dict[str, list[_Input]]:
    """For each kind of case figure, the inputs that can move it (others stand idle, so a
    chance correlation over the samples never names them as a driver)."""
    own = f"cases[{index}]."
    hair = bool(case.prep and case.prep.hair)
    pooling = bool(case.prep and case.prep.pooling)

    def drying(spec: _Input) -> bool:
        if spec.rule:
            varies = next(s.varies for s in bound.spreads if s.id == spec.name)
            if varies in _HAIR:
                return hair
            if varies in _POOLING:
                return pooling
            return varies.startswith("prep.")
        if spec.name.startswith("environment."):
            return True
        return spec.name.startswith(own) and spec.name[len(own) :].startswith(_DRYING_KEYS)

    def oxygen(spec: _Input) -> bool:
        if spec.rule:
            return False
        return spec.name.startswith(own) and spec.name[len(own) :].startswith(_OXYGEN_KEYS)

    return {
        "drying": [spec if drying(spec) else _IDLE for spec in inputs],
        "oxygen": [spec if oxygen(spec) else _IDLE for spec in inputs],
    }


@dataclass(frozen=True)
class _Input:
    """One sampled dimension: its name, its spread, and how a sample sets it."""

    name: str
    label: str
    distribution: Distribution
    source: str = ""
    flag: str = ""
    rule: bool = False


_IDLE = _Input("", "", Distribution("uniform", 0.0, 0.0, 0.0))
"""Stands in for an input that cannot move a figure: never named as its driver."""


def spread_results(room: Room, bound: Bound, results: Results, sampling: Sampling) -> Results:
    """`results` with the spread of each case and person over the samples, and the summary.

    `results` is the nominal run (central values), left as it is; the spread is added in
    optional fields. Returns `results` unchanged when the run does not sample.
    """
    if not sampling.active(bool(room.ranges)) or bound.uncertainty is None:
        return results
    import numpy as np

    inputs = _inputs(room, bound)
    count = sampling.samples or DEFAULT_SAMPLES
    seed = sampling_seed(room.sha256, bound.rules_digest, str(count))
    confidence = (
        sampling.confidence
        if sampling.confidence is not None
        else bound.uncertainty.confidence.value
    )
    unit = latin_hypercube(len(inputs), count, seed) if inputs else np.full((count, 0), 0.5)
    values = (
        np.column_stack([spec.distribution.values(unit[:, k]) for k, spec in enumerate(inputs)])
        if inputs
        else unit
    )
    samples = [_sample(room, bound, inputs, values[j]) for j in range(count)]

    charges = list(results.people) + list(results.trolleys)
    charge_runs = [_charges(r, b, results) for r, b in samples]
    largest = np.array(
        [max((c.spark_energy_J for c in run), default=math.nan) for run in charge_runs]
    )
    owners = [f"people[{k}]" for k in range(len(results.people))]
    owners += [f"trolleys[{k}]" for k in range(len(results.trolleys))]
    people = tuple(
        replace(charge, spread=_charge_spread(index, charge_runs, values, inputs, owners[index]))
        for index, charge in enumerate(charges)
    )
    _, analyses = preparations(room, bound)
    cases = tuple(
        replace(
            case,
            spread=_case_spread(
                index, case, samples, bound, analyses, largest, values, inputs, confidence
            ),
        )
        for index, case in enumerate(results.cases)
    )
    worst, worst_of = _worst(cases)
    summary = SpreadSummary(
        samples=count,
        seed=seed,
        confidence=confidence,
        probability_limit=bound.uncertainty.probability_limit.value,
        method=METHOD,
        sensitivity=SENSITIVITY,
        inputs=tuple(
            SpreadInput(i.name, i.label, i.distribution.kind, i.distribution.text, i.source, i.flag)
            for i in inputs
        ),
        worst_probability=worst,
        worst_probability_of=worst_of,
    )
    return replace(
        results,
        people=people[: len(results.people)],
        trolleys=people[len(results.people) :],
        cases=cases,
        uncertainty=summary,
    )


# --- the inputs and one sample -------------------------------------------------------------


def _inputs(room: Room, bound: Bound) -> list[_Input]:
    found = [_Input(path, _label(path, room), spread) for path, spread in room.ranges]
    found += [
        _Input(
            spread.id,
            spread.title,
            spread.distribution,
            spread.source,
            spread.flag,
            rule=True,
        )
        for spread in bound.spreads
    ]
    return found


def _label(path: str, room: Room) -> str:
    parts = _parts(path)
    if len(parts) < 2 or not isinstance(parts[1], int):
        return sentences.spread_input_label("", path)
    key = path.split("].", 1)[1]
    index = parts[1]
    if parts[0] == "cases":
        subject = f"case {room.cases[index].id}"
    elif parts[0] == "people":
        subject = room.people[index].role
    else:
        subject = room.trolleys[index].name
    return sentences.spread_input_label(subject, key)


def _sample(room: Room, bound: Bound, inputs: Sequence[_Input], row: Array) -> tuple[Room, Bound]:
    """The room and the bound rules with the sampled values set."""
    for spec, value in zip(inputs, row, strict=True):
        if spec.rule:
            bound = _set_rule(bound, spec.name, float(value))
        else:
            room = _set_path(room, _parts(spec.name), float(value))
    return room, bound


def _parts(path: str) -> list[str | int]:
    """'cases[0].prep.volume' -> ['cases', 0, 'prep', 'volume']."""
    parts: list[str | int] = []
    for piece in path.split("."):
        name, _, rest = piece.partition("[")
        parts.append(name)
        if rest:
            parts.append(int(rest.rstrip("]")))
    return parts


def _set_path(node: Any, parts: Sequence[str | int], value: float) -> Any:
    head, rest = parts[0], parts[1:]
    if isinstance(head, int):
        items = list(node)
        items[head] = _set_path(items[head], rest, value)
        return tuple(items)
    if not rest:
        if head == "footwear":  # a measured sole resistance
            return replace(node, footwear=Footwear(cls=None, resistance=value))
        return replace(node, **{head: value})
    return replace(node, **{head: _set_path(getattr(node, head), rest, value)})


def _set_rule(bound: Bound, spread_id: str, value: float) -> Bound:
    spread = next(s for s in bound.spreads if s.id == spread_id)
    if spread.field == "points":
        if spread.varies != bound.charge.saturation_curve_id:
            return bound
        points = tuple((x, y * value) for x, y in bound.charge.saturation_points)
        return replace(bound, charge=replace(bound.charge, saturation_points=points))
    if spread.varies.startswith("prep.") and bound.prep is not None:
        name = spread.varies.removeprefix("prep.")
        changes: dict[str, Any] = {name: value}
        return replace(bound, prep=replace(bound.prep, **changes))

    def vary(fuel: Fuel) -> Fuel:
        changes: dict[str, Any] = {spread.field: value}
        return replace(fuel, **changes) if fuel.id == spread.varies else fuel

    fuels = {prep: tuple(vary(f) for f in found) for prep, found in bound.fuels.items()}
    return replace(bound, fuels=fuels)


# --- people and trolleys ---------------------------------------------------------------------


def _charges(room: Room, bound: Bound, nominal: Results) -> list[ChargeResult]:
    model = Charging(
        generation_current=bound.charge.generation_current,
        no_spark_voltage=bound.charge.no_spark_voltage,
        saturation_points=bound.charge.saturation_points,
        floor_max=nominal.floor.max_ohm,
    )
    rh = room.environment.relative_humidity
    default_c = bound.charge.default_capacitance
    people = [person_charge(p, model, rh, default_c, bound) for p in room.people]
    return people + [trolley_charge(t, model, rh) for t in room.trolleys]


def _charge_spread(
    index: int,
    runs: Sequence[Sequence[ChargeResult]],
    values: Array,
    inputs: Sequence[_Input],
    own: str,
) -> Spread:
    """own: the key path of this person or trolley (people[0]), whose inputs may drive it."""
    import numpy as np

    def moves(spec: _Input) -> bool:
        if spec.rule:
            return spec.name.startswith("spread.saturation.")
        return spec.name == "environment.relative_humidity" or spec.name.startswith(own + ".")

    inputs = [spec if moves(spec) else _IDLE for spec in inputs]

    figures = {
        name: np.array([float(getattr(run[index], name)) for run in runs])
        for name in CHARGE_FIGURES
    }
    return Spread(
        samples=len(runs),
        bands=tuple((name, _band(v)) for name, v in figures.items()),
        drivers=tuple((name, _drivers(v, values, inputs)) for name, v in figures.items()),
    )


# --- cases -----------------------------------------------------------------------------------


def _case_spread(
    index: int,
    nominal: CaseResult,
    samples: Sequence[tuple[Room, Bound]],
    bound: Bound,
    analyses: dict[str, Any],
    largest_spark: Array,
    values: Array,
    inputs: Sequence[_Input],
    confidence: float,
) -> Spread:
    import numpy as np

    enriched = bound.oxygen.enriched_limit
    ambient = bound.oxygen.ambient
    washout, at_activation, mie = [], [], []
    curve_times = [t for t, _ in nominal.oxygen_curve]
    oxygen_curves = []
    for room, sampled in samples:
        case = room.cases[index]
        site = site_oxygen(case, sampled, curve=False)
        washout.append(site.washout_s)
        at_activation.append(site.at_activation)
        found, _ = lowest_mie(case_fuels(case, sampled), site.at_activation, ambient)
        mie.append(math.nan if found is None else found)
        oxygen_curves.append(_oxygen_at(site.steady, case, sampled, curve_times))

    figures: dict[str, Array] = {
        "washout_s": np.array(washout),
        "oxidant_at_activation_fraction": np.array(at_activation),
    }
    probabilities = {
        "oxidant_enriched_at_activation": float(np.mean(np.array(at_activation) > enriched)),
    }
    mie_values = np.array(mie)
    if not np.all(np.isnan(mie_values)) and not np.all(np.isnan(largest_spark)):
        hit = np.where(np.isnan(mie_values), False, largest_spark >= mie_values)
        probabilities["spark_above_site_mie"] = float(np.mean(hit))
    film_band: tuple[tuple[float, float, float], ...] = ()
    dried = _dried(index, nominal, samples, bound, analyses)
    if dried is not None and bound.prep is not None:
        figures.update(
            {
                "drying_time_s": dried.drying,
                "safe_draping_after_s": dried.safe,
                "pocket_vapour_peak_fraction_of_lfl": dried.peak,
            }
        )
        probabilities["prep_wet_at_activation"] = float(
            np.mean(dried.left_at_activation > bound.prep.dry_fraction)
        )
        probabilities["pocket_above_margin_at_draping"] = float(
            np.mean(dried.peak > bound.prep.pocket_margin)
        )
        film_band = dried.film_band
    decisions = {"stop_oxygen_at_least_s": _at_least(figures["washout_s"], confidence)}
    if "safe_draping_after_s" in figures:
        decisions["drape_no_earlier_than_s"] = _at_least(
            figures["safe_draping_after_s"], confidence
        )
    ordered = [name for name in CASE_FIGURES if name in figures]
    oxygen = np.array(oxygen_curves)
    moving = _case_inputs(inputs, index, samples[0][0].cases[index], bound)
    kind = {
        "drying_time_s": "drying",
        "safe_draping_after_s": "drying",
        "pocket_vapour_peak_fraction_of_lfl": "drying",
    }
    return Spread(
        samples=len(samples),
        bands=tuple((name, _band(figures[name])) for name in ordered),
        probabilities=tuple(
            (name, probabilities[name]) for name in PROBABILITIES if name in probabilities
        ),
        drivers=tuple(
            (name, _drivers(figures[name], values, moving[kind.get(name, "oxygen")]))
            for name in ordered
        ),
        decisions=tuple(decisions.items()),
        oxygen_band=tuple(
            (t, float(lo), float(hi))
            for t, lo, hi in zip(
                curve_times,
                _quantiles(oxygen, 0.05),
                _quantiles(oxygen, 0.95),
                strict=True,
            )
        ),
        film_band=film_band,
    )


@dataclass(frozen=True)
class _Dried:
    """A case's drying figures over the samples (arrays (S,)) and the film chart's band."""

    drying: Array
    safe: Array
    peak: Array
    left_at_activation: Array
    film_band: tuple[tuple[float, float, float], ...]
    solver: str  # "scalar" | "batch"


SCALAR_SOLVES = 8
"""Up to this many distinct sets of drying inputs over the samples, each is solved by the
scalar solver (`ignite.simulate.drying`, exact: ranges of zero width give the nominal
figures); more, and the batch solver takes every sample at once."""

BATCH_MARGIN = 0.02
"""The batch solver's times (drying, safe draping) and the liquid it leaves at activation
are moved this share later and wetter, its pocket peaks this share higher: it agrees with
the scalar solver within 1 % on the cases of tests/simulate/test_batch.py, and the margin
makes any disagreement err on the safe side."""


def _dried(
    index: int,
    nominal: CaseResult,
    samples: Sequence[tuple[Room, Bound]],
    bound: Bound,
    analyses: dict[str, Any],
) -> _Dried | None:
    """The case's prep over the samples: by the scalar solver per distinct set of drying
    inputs when there are few, else by the batch solver; None without a flammable prep."""
    import numpy as np

    case0 = samples[0][0].cases[index]
    if not nominal.prep_flammable or bound.prep is None or case0.prep is None:
        return None
    analysis = analyses.get(case0.prep.preparation)
    if analysis is None:
        return None
    keys = [_drying_key(r.cases[index], r, b) for r, b in samples]
    distinct = dict.fromkeys(keys)
    if len(distinct) > SCALAR_SOLVES and batch_supported(analysis):
        return _batch(index, nominal, samples, analysis)
    found: dict[tuple[Any, ...], PrepOutcome] = {}
    for key, (room, sampled) in zip(keys, samples, strict=True):
        if key not in found:
            result = case_drying(room.cases[index], room, sampled, analyses)
            if result is None:
                return None
            found[key] = result[0]
    runs = [found[key] for key in keys]
    return _Dried(
        drying=np.array([o.drying_time_s for o in runs]),
        safe=np.array([o.safe_draping_after_s for o in runs]),
        peak=np.array([o.pocket_peak_fraction_of_lfl for o in runs]),
        left_at_activation=np.array([o.flammable_left_at_activation_fraction for o in runs]),
        film_band=_film_band(nominal.film_curve, runs),
        solver="scalar",
    )


def _batch(
    index: int,
    nominal: CaseResult,
    samples: Sequence[tuple[Room, Bound]],
    analysis: PreparationAnalysis,
) -> _Dried:
    import numpy as np

    def each(read: Any) -> Array:
        return np.array([float(read(r.cases[index], r, b)) for r, b in samples])

    first = samples[0][0].cases[index].prep
    assert first is not None
    prep0 = samples[0][1].prep
    assert prep0 is not None
    given = BatchInputs(
        volume=each(lambda c, r, b: c.prep.volume),
        area=each(lambda c, r, b: c.prep.area),
        skin_temperature=each(
            lambda c, r, b: c.prep.skin_temperature or b.prep.skin_temperature_default
        ),
        air_temperature=each(lambda c, r, b: r.environment.temperature),
        relative_humidity=each(lambda c, r, b: r.environment.relative_humidity),
        air_speed=each(lambda c, r, b: c.air_speed),
        draping_after=each(lambda c, r, b: c.draping_after),
        first_activation_after=each(lambda c, r, b: c.first_activation_after),
        pocket_volume=each(lambda c, r, b: c.drape_pocket.volume),
        pocket_exchange=each(lambda c, r, b: c.drape_pocket.exchange),
        hair_still_layer=each(lambda c, r, b: b.prep.hair_still_layer),
        hair_exposed_fraction=each(lambda c, r, b: b.prep.hair_exposed_fraction),
        pooling_volume_fraction=each(lambda c, r, b: b.prep.pooling_volume_fraction),
        pooling_area_fraction=each(lambda c, r, b: b.prep.pooling_area_fraction),
        tissue_conductance=each(lambda c, r, b: b.prep.tissue_conductance),
        hair=first.hair,
        pooling=first.pooling,
    )
    out = dry_batch(analysis, given, prep0)
    later = 1.0 + BATCH_MARGIN
    times = np.array([t for t, _ in nominal.film_curve])
    film_band: tuple[tuple[float, float, float], ...] = ()
    if len(times):
        curves = np.minimum(out.left_on(times) * later, 1.0)
        film_band = tuple(
            (float(t), float(lo), float(hi))
            for t, lo, hi in zip(
                times, _quantiles(curves, 0.05), _quantiles(curves, 0.95), strict=True
            )
        )
    return _Dried(
        drying=out.drying_time_s * later,
        safe=out.safe_draping_after_s * later,
        peak=out.pocket_peak * later,
        left_at_activation=np.minimum(out.left_at_activation * later, 1.0),
        film_band=film_band,
        solver="batch",
    )


def _oxygen_at(steady: float, case: Case, bound: Bound, times: Sequence[float]) -> list[float]:
    from ignite.physics import oxygen

    pocket = case.drape_pocket
    ambient = bound.oxygen.ambient
    return oxygen.fractions_after_stop(steady, times, pocket.volume, pocket.exchange, ambient)


def _drying_key(case: Case, room: Room, bound: Bound) -> tuple[Any, ...]:
    """What the drying of a case reads: a sample that changes none of it reuses the solve."""
    prep = bound.prep
    unused = {"diffusivities"}
    if not (case.prep and case.prep.hair):
        unused.update(name.removeprefix("prep.") for name in _HAIR)
    if not (case.prep and case.prep.pooling):
        unused.update(name.removeprefix("prep.") for name in _POOLING)
    assumptions = (
        None
        if prep is None
        else tuple((k, v) for k, v in sorted(vars(prep).items()) if k not in unused)
    )
    return (
        case.prep,
        case.air_speed,
        case.draping_after,
        case.first_activation_after,
        case.drape_pocket,
        room.environment.temperature,
        room.environment.relative_humidity,
        assumptions,
    )


def _film_band(
    nominal: Sequence[tuple[float, float]], runs: Sequence[PrepOutcome]
) -> tuple[tuple[float, float, float], ...]:
    import numpy as np

    times = [t for t, _ in nominal]
    if not times:
        return ()
    curves = []
    for run in runs:
        xs = [t for t, _ in run.film_curve]
        ys = [v for _, v in run.film_curve]
        # past the end of a run's curve its film is gone (or held at its last value)
        curves.append(np.interp(times, xs, ys, left=ys[0], right=ys[-1]))
    stack = np.array(curves)
    return tuple(
        (t, float(lo), float(hi))
        for t, lo, hi in zip(times, _quantiles(stack, 0.05), _quantiles(stack, 0.95), strict=True)
    )


# --- statistics ------------------------------------------------------------------------------


def _quantiles(values: Array, level: float) -> Array:
    import numpy as np

    return np.quantile(values, level, axis=0, method="inverted_cdf")


def _band(values: Array) -> Band:
    import numpy as np

    p5, p50, p95 = (float(v) for v in np.quantile(values, [0.05, 0.5, 0.95], method="inverted_cdf"))
    return Band(p5, p50, p95)


def _at_least(values: Array, confidence: float) -> float:
    """The smallest sample at or above the `confidence` quantile: a wait never read low."""
    import numpy as np

    return float(np.quantile(values, confidence, method="higher"))


def latin_hypercube(dimensions: int, count: int, seed: int) -> Array:
    """`count` points of a scrambled Latin hypercube in [0, 1)^dimensions: the algorithm of
    `scipy.stats.qmc.LatinHypercube` (strength 1, no optimisation) drawing from
    `numpy.random.default_rng(seed)` in the same order, so the same points to the last bit
    (tests/simulate/test_sampling_tools.py checks this), without importing scipy.stats,
    which takes about 0.8 s."""
    import numpy as np

    # scipy draws from a child of the generator it is given (spawned from its seed sequence)
    parent = np.random.default_rng(seed).bit_generator
    sequence = parent.seed_seq
    assert isinstance(sequence, np.random.SeedSequence)
    rng = np.random.Generator(type(parent)(sequence.spawn(1)[0]))
    jitter = rng.uniform(size=(count, dimensions))
    strata = np.tile(np.arange(1, count + 1), (dimensions, 1))
    for row in range(dimensions):
        rng.shuffle(strata[row, :])
    found: Array = (strata.T - jitter) / count
    return found


def ranks(values: Array) -> Array:
    """Ranks 1..n of `values`, ties given their average rank: `scipy.stats.rankdata`'s
    default (tests/simulate/test_sampling_tools.py checks this), without scipy.stats."""
    import numpy as np

    order = np.argsort(values, kind="mergesort")
    ordered = values[order]
    first = np.concatenate([[True], ordered[1:] != ordered[:-1]])
    starts = np.flatnonzero(first)
    counts = np.diff(np.concatenate([starts, [len(values)]]))
    average = starts + (counts + 1) / 2.0
    found: Array = np.empty(len(values))
    found[order] = average[np.cumsum(first) - 1]
    return found


def _drivers(figure: Array, values: Array, inputs: Sequence[_Input]) -> tuple[Driver, ...]:
    """Inputs ranked by |Spearman ρ| with the figure; none when the figure does not vary."""
    import numpy as np

    finite = ~np.isnan(figure)
    if finite.sum() < 3 or np.ptp(figure[finite]) == 0.0:
        return ()
    ranked_figure = ranks(figure[finite])
    found = []
    for k, spec in enumerate(inputs):
        column = values[finite, k]
        if np.ptp(column) == 0.0:
            continue
        rho = float(np.corrcoef(ranks(column), ranked_figure)[0, 1])
        if math.isnan(rho):
            continue
        if spec is _IDLE:
            continue
        found.append(Driver(spec.name, spec.label, round(rho, 4), measurable=not spec.rule))
    found.sort(key=lambda d: (-abs(d.rank_correlation), d.input))
    return tuple(found[:DRIVERS_KEPT])


def _worst(cases: Sequence[CaseResult]) -> tuple[float | None, str]:
    worst: float | None = None
    said = ""
    for case in cases:
        if case.spread is None:
            continue
        for name, probability in case.spread.probabilities:
            if worst is None or probability > worst:
                worst, said = probability, f"case {case.id}: {name}"
    return worst, said


__all__ = [
    "CASE_FIGURES",
    "CHARGE_FIGURES",
    "METHOD",
    "PROBABILITIES",
    "SENSITIVITY",
    "spread_results",
]
