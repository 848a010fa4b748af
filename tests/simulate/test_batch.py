"""The batch drying solver (ignite.simulate.batch) against the scalar solver
(ignite.simulate.drying, LSODA to rtol 1e-5), and its activity-coefficient table against
direct UNIFAC calls (thermo).

Tolerance: on the sample rooms' cases (plain skin, hair, pooling) the two agree within
0.5 % on drying time, liquid left at activation, pocket peak and safe draping time
(measured: at most 0.25 %). The figures the sampling uses are the batch's moved
`BATCH_MARGIN` (2 %) to the safe side, and those are asserted to err late (drying, safe
draping), wet and high (pocket peak) against the scalar solver's.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from conftest import ROOT

from ignite.physics.vapour import activity_model
from ignite.pipeline import bind, load_room, open_rulebook, vocabulary
from ignite.simulate import cases as simulate_cases
from ignite.simulate.batch import GAMMA_T_SPACING, BatchInputs, _gammas, dry_batch
from ignite.simulate.uncertainty import BATCH_MARGIN

AGREE = 0.005

CASES = [
    ("day-surgery-head-neck.yaml", 0),  # plain skin
    ("day-surgery-head-neck.yaml", 1),  # hair
    ("orthopaedic-periodic-audit.yaml", 0),  # pooling
]


def _inputs(name: str, index: int):  # type: ignore[no-untyped-def]
    book = open_rulebook()
    room = load_room(ROOT / "sample_rooms" / name, vocabulary(book))
    bound = bind(room, book)
    _, analyses = simulate_cases.preparations(room, bound)
    case = room.cases[index]
    assert case.prep is not None and bound.prep is not None
    outcome = simulate_cases.prep_drying(case, room, bound, analyses)
    assert outcome is not None
    a = bound.prep
    skin = case.prep.skin_temperature or a.skin_temperature_default

    def one(value: float) -> np.ndarray:
        return np.array([float(value)])

    given = BatchInputs(
        one(case.prep.volume),
        one(case.prep.area),
        one(skin),
        one(room.environment.temperature),
        one(room.environment.relative_humidity),
        one(case.air_speed),
        one(case.draping_after),
        one(case.first_activation_after),
        one(case.drape_pocket.volume),
        one(case.drape_pocket.exchange),
        one(a.hair_still_layer),
        one(a.hair_exposed_fraction),
        one(a.pooling_volume_fraction),
        one(a.pooling_area_fraction),
        one(a.tissue_conductance),
        case.prep.hair,
        case.prep.pooling,
    )
    return analyses[case.prep.preparation], given, a, outcome[0]


@pytest.mark.parametrize(("name", "index"), CASES)
def test_batch_agrees_with_the_scalar_solver(name: str, index: int) -> None:
    analysis, given, assumptions, scalar = _inputs(name, index)
    batch = dry_batch(analysis, given, assumptions)
    pairs = [
        (batch.drying_time_s[0], scalar.drying_time_s),
        (batch.left_at_activation[0], scalar.flammable_left_at_activation_fraction),
        (batch.pocket_peak[0], scalar.pocket_peak_fraction_of_lfl),
        (batch.safe_draping_after_s[0], scalar.safe_draping_after_s),
    ]
    for found, expected in pairs:
        assert found == pytest.approx(expected, rel=AGREE, abs=1.0 if expected == 0 else 0)
    later = 1.0 + BATCH_MARGIN
    # with the margin, every disagreement is on the safe side
    assert batch.drying_time_s[0] * later >= scalar.drying_time_s
    assert batch.safe_draping_after_s[0] * later >= scalar.safe_draping_after_s
    assert batch.pocket_peak[0] * later >= scalar.pocket_peak_fraction_of_lfl
    assert min(batch.left_at_activation[0] * later, 1.0) >= (
        scalar.flammable_left_at_activation_fraction
    )


@pytest.mark.parametrize(
    ("volume", "exchange"),
    [(0.005, 60e-3 / 60), (0.002, 100e-3 / 60)],  # time constants V/Q of 5 s and 1.2 s
)
def test_a_small_fast_pocket_agrees_with_the_scalar_solver(volume: float, exchange: float) -> None:
    """A pocket whose time constant is far under the batch's longest step (60 s): an
    explicit step on the pocket swung and blew up here, the exact step over the linear
    pocket equation must agree with LSODA (max step half the time constant)."""
    import dataclasses

    from ignite.simulate import drying

    analysis, given, assumptions, _ = _inputs("day-surgery-head-neck.yaml", 0)
    given = dataclasses.replace(
        given, pocket_volume=np.array([volume]), pocket_exchange=np.array([exchange])
    )
    batch = dry_batch(analysis, given, assumptions)
    scalar = drying.simulate_prep(
        analysis,
        drying.Film(float(given.volume[0]), float(given.area[0]), float(given.skin_temperature[0])),
        drying.RoomAir(
            float(given.air_temperature[0]),
            float(given.relative_humidity[0]),
            float(given.air_speed[0]),
        ),
        drying.DrapePlan(float(given.draping_after[0]), float(given.first_activation_after[0])),
        drying.DrapePocket(volume, exchange),
        assumptions,
    )
    assert scalar.pocket_peak_fraction_of_lfl > 0.1  # the pocket matters in this case
    assert batch.pocket_peak[0] == pytest.approx(scalar.pocket_peak_fraction_of_lfl, rel=AGREE)
    assert batch.drying_time_s[0] == pytest.approx(scalar.drying_time_s, rel=AGREE)


def test_many_samples_give_each_its_own_figures() -> None:
    analysis, given, assumptions, scalar = _inputs("day-surgery-head-neck.yaml", 0)
    doubled = BatchInputs(
        **{
            key: (np.concatenate([value, value * (1.5 if key == "volume" else 1.0)]))
            if isinstance(value, np.ndarray)
            else value
            for key, value in vars(given).items()
        }
    )
    batch = dry_batch(analysis, doubled, assumptions)
    assert batch.drying_time_s[0] == pytest.approx(scalar.drying_time_s, rel=AGREE)
    assert batch.drying_time_s[1] > batch.drying_time_s[0]  # more liquid dries later


@pytest.mark.parametrize("temperature", [291.3, 298.15, 305.15])
@pytest.mark.parametrize("x1", [0.013, 0.2, 0.5, 0.71, 0.98])
def test_activity_table_against_direct_unifac(temperature: float, x1: float) -> None:
    cas = ("67-63-0", "7732-18-5")  # isopropanol, water
    tabulated = _gammas(cas, np.array([temperature]), np.array([x1]))[0]
    # the table is linear in T between nodes 2 K apart, as the scalar solver
    low = np.floor(temperature / GAMMA_T_SPACING) * GAMMA_T_SPACING
    weight = (temperature - low) / GAMMA_T_SPACING
    model = activity_model(cas)
    direct = np.exp(
        (1 - weight) * np.log(model(low, [x1, 1 - x1]))
        + weight * np.log(model(low + GAMMA_T_SPACING, [x1, 1 - x1]))
    )
    np.testing.assert_allclose(tabulated, direct, rtol=2e-3)
    # and the nodes' interpolation itself stays within 1 % of UNIFAC at T
    np.testing.assert_allclose(tabulated, model(temperature, [x1, 1 - x1]), rtol=1e-2)


def test_batch_module_is_documented() -> None:
    import ignite.simulate.batch as batch

    assert batch.__doc__ and "errs" in batch.__doc__
    assert Path(batch.__file__).name == "batch.py"


@pytest.mark.parametrize("hair", [False, True])
@pytest.mark.parametrize("pooling", [False, True])
def test_wide_inputs_give_finite_figures_without_warnings(hair: bool, pooling: bool) -> None:
    """Samples far apart (1-50 mL, 10-1000 cm², still to brisk air, tiny fast-flushed to
    large still pockets) in one batch: no error, no numpy warning, no NaN or negative
    figure (a time may be infinite: not dry within the horizon)."""
    import warnings

    from conftest import PREP_ASSUMPTIONS

    from ignite.simulate.preparation import analyse_preparation

    rng = np.random.default_rng(5)
    n = 40

    def spread(low: float, high: float) -> np.ndarray:
        return rng.uniform(low, high, n)

    given = BatchInputs(
        spread(1e-6, 50e-6),
        spread(0.001, 0.1),
        spread(301.0, 309.0),
        spread(288.0, 300.0),
        spread(0.1, 0.8),
        spread(0.0, 0.6),
        spread(0.0, 900.0),
        spread(0.0, 1800.0),
        spread(0.002, 0.1),
        spread(0.0, 100e-3 / 60),
        spread(0.001, 0.01),
        spread(0.2, 0.8),
        spread(0.1, 0.9),
        spread(0.02, 0.3),
        spread(5.0, 30.0),
        hair,
        pooling,
    )
    analysis = analyse_preparation([("ethanol", 0.7), ("water", 0.3)], "volume", 305.15)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        out = dry_batch(analysis, given, PREP_ASSUMPTIONS)
    for figure in (
        out.drying_time_s,
        out.left_at_activation,
        out.pocket_peak,
        out.safe_draping_after_s,
    ):
        assert not np.isnan(figure).any()
        assert (figure >= 0.0).all()
    assert np.isfinite(out.pocket_peak).all()
    assert ((out.left_at_activation >= 0.0) & (out.left_at_activation <= 1.0)).all()


def test_a_dry_patch_keeps_a_bounded_temperature() -> None:
    """A pooled sample whose open patch is gone long before its pool: the dry patch's
    temperature is not solved, so the first guess carried from step to step (the last
    step's change) must not grow on it (it once doubled a step at a time, past 450 K,
    where the activity-coefficient table has no meaning). Regression test of our own."""
    import warnings

    from conftest import PREP_ASSUMPTIONS

    from ignite.simulate.batch import _Batch, _covered, _open_air
    from ignite.simulate.preparation import analyse_preparation

    n = 8
    given = BatchInputs(
        np.full(n, 20e-6),  # volume
        np.linspace(0.01, 0.1, n),  # area
        np.full(n, 305.0),  # skin
        np.full(n, 294.0),  # air
        np.full(n, 0.5),  # RH
        np.full(n, 0.3),  # air speed
        np.full(n, 600.0),  # draping
        np.full(n, 900.0),  # first activation
        np.full(n, 0.03),  # pocket
        np.full(n, 10e-3 / 60),  # exchange
        np.full(n, 0.005),  # hair still layer
        np.full(n, 0.5),  # hair exposed fraction
        np.full(n, 0.95),  # pooled share of the volume: the open patch is thin
        np.full(n, 0.02),  # pooled share of the area
        np.full(n, 15.0),  # tissue conductance
        False,
        True,
    )
    analysis = analyse_preparation([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15)
    dry = PREP_ASSUMPTIONS.dry_fraction
    model = _Batch(analysis, given, PREP_ASSUMPTIONS)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        history, _, _ = _open_air(model, dry)
        assert np.all((model.temperature > 250.0) & (model.temperature < 320.0))
        draped = np.full(n, 60.0)
        covered = _Batch(analysis, given, PREP_ASSUMPTIONS)
        _covered(covered, draped, history.at(draped), dry, False, until="dry")
    assert np.all((covered.temperature > 250.0) & (covered.temperature < 320.0))
