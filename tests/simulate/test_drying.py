"""Tests for ignite.simulate.drying and ignite.simulate.film: film, drape pocket, safe draping."""

from __future__ import annotations

import dataclasses
import json
import math
from itertools import pairwise
from typing import Any

import pytest
from conftest import PREP_ASSUMPTIONS
from hypothesis import given, settings
from hypothesis import strategies as st

from ignite.physics.evaporation import (
    GAS_CONSTANT,
    air_kinematic_viscosity,
    diffusion_volume,
    diffusivity_fuller,
    sherwood_laminar_plate,
)
from ignite.physics.vapour import substance, vapour_pressure
from ignite.rules.bind import prep_assumptions
from ignite.rules.bound import PrepAssumptions
from ignite.simulate.drying import DrapePlan, DrapePocket, Film, RoomAir, simulate_prep
from ignite.simulate.film import film_patches
from ignite.simulate.notes import Note, worded
from ignite.simulate.preparation import analyse_preparation

P = 101325.0
LPM = 1e-3 / 60.0  # one litre per minute [m³/s]

# The values of rules/preparations.yaml; diffusivities left to the Fuller estimate.
ASSUMPTIONS = PREP_ASSUMPTIONS

CASE: dict[str, Any] = {
    "volume_m3": 10e-6,
    "area_m2": 0.04,
    "air_speed_m_s": 0.2,
    "film_temperature_K": 305.15,
    "air_temperature_K": 293.15,
    "relative_humidity": 0.3,
    "hair": False,
    "pooling": False,
    "draping_after_s": 180.0,
    "first_activation_after_s": 360.0,
    "pocket_volume_m3": 0.030,
    "pocket_exchange_m3_s": 10 * LPM,
}


@pytest.fixture(scope="module")
def ipa70():
    return analyse_preparation([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15)


@pytest.fixture(scope="module")
def pure_ipa():
    return analyse_preparation([("isopropanol", 1.0)], "volume", 293.15)


def run(analysis, assumptions=None, **changes):
    case = {**CASE, **changes}
    return simulate_prep(
        analysis,
        Film(
            case["volume_m3"],
            case["area_m2"],
            case["film_temperature_K"],
            hair=case["hair"],
            pooling=case["pooling"],
        ),
        RoomAir(case["air_temperature_K"], case["relative_humidity"], case["air_speed_m_s"]),
        DrapePlan(case["draping_after_s"], case["first_activation_after_s"]),
        DrapePocket(case["pocket_volume_m3"], case["pocket_exchange_m3_s"]),
        assumptions or ASSUMPTIONS,
    )


# --- film patches ----------------------------------------------------------------------


def test_patches_keep_the_volume_and_split_the_area():
    patches = film_patches(
        10e-6,
        0.04,
        hair=True,
        pooling=True,
        hair_still_layer=0.005,
        hair_exposed_fraction=0.5,
        pooling_volume_fraction=0.4,
        pooling_area_fraction=0.1,
    )
    assert sum(p.volume for p in patches) == pytest.approx(10e-6)
    assert [p.sheltered for p in patches] == [False, True]
    assert [p.area for p in patches] == pytest.approx([0.036 * 0.5, 0.004 * 0.5])
    assert all(p.still_layer == 0.005 for p in patches)


def test_plain_skin_is_one_open_patch():
    (patch,) = film_patches(
        5e-6,
        0.02,
        hair=False,
        pooling=False,
        hair_still_layer=0.005,
        hair_exposed_fraction=0.5,
        pooling_volume_fraction=0.5,
        pooling_area_fraction=0.1,
    )
    assert (patch.volume, patch.area, patch.sheltered, patch.still_layer) == (
        5e-6,
        0.02,
        False,
        0.0,
    )
    assert patch.flow_length == pytest.approx(math.sqrt(0.02))


def test_empty_application_is_refused():
    with pytest.raises(ValueError):
        film_patches(
            0.0,
            0.02,
            hair=False,
            pooling=False,
            hair_still_layer=0.0,
            hair_exposed_fraction=1.0,
            pooling_volume_fraction=0.0,
            pooling_area_fraction=0.0,
        )


# --- simulate_prep against hand calculations ------------------------------------------


def _forced_coefficient(cas: str, temperature: float, speed: float, area: float) -> float:
    found = substance(cas)
    d = diffusivity_fuller(temperature, P, found.molar_mass, diffusion_volume(found.formula))
    nu = air_kinematic_viscosity(temperature)
    length = math.sqrt(area)
    return sherwood_laminar_plate(speed * length / nu, nu / d) * d / length


def test_pure_liquid_in_forced_air_dries_at_a_constant_rate(pure_ipa):
    # A pure liquid at fixed temperature keeps its surface concentration, so the time to
    # the dry fraction is (1 - f)·n0 / (A·k·c_s). A vast tissue conductance holds the
    # film at the skin's (and air's) temperature.
    t = 293.15
    held = dataclasses.replace(ASSUMPTIONS, tissue_conductance=1e9)
    out = run(
        pure_ipa,
        assumptions=held,
        air_speed_m_s=1.0,
        film_temperature_K=t,
        air_temperature_K=t,
        draping_after_s=1e5,
        first_activation_after_s=1e5,
    )
    k = _forced_coefficient("67-63-0", t, 1.0, 0.04)
    surface = vapour_pressure("67-63-0", t) / (GAS_CONSTANT * t)
    moles = 10e-6 / pure_ipa.molar_volumes[0]
    expected = 0.99 * moles / (0.04 * k * surface)
    assert out.open_air_drying_time_s == pytest.approx(expected, rel=1e-3)
    assert out.drying_time_s == out.open_air_drying_time_s  # never draped in time


def test_pocket_over_a_pure_liquid_follows_the_linear_solution(pure_ipa):
    # Drapes on at once, air kept moving under them (a forced, constant k): the pocket
    # obeys V dc/dt = kA(c_s - c) - Qc, so c(t) = c_ss (1 - exp(-t (kA + Q) / V)).
    t = 293.15
    moving = dataclasses.replace(ASSUMPTIONS, under_drape_air_speed=1.0)
    out = run(
        pure_ipa,
        assumptions=moving,
        film_temperature_K=t,
        air_temperature_K=t,
        draping_after_s=0.0,
        first_activation_after_s=60.0,
    )
    k = _forced_coefficient("67-63-0", t, 1.0, 0.04)
    surface = vapour_pressure("67-63-0", t) / (GAS_CONSTANT * t)
    q, v, area = CASE["pocket_exchange_m3_s"], CASE["pocket_volume_m3"], 0.04
    steady = k * area * surface / (k * area + q)

    def index(seconds: float) -> float:
        c = steady * (1 - math.exp(-seconds * (k * area + q) / v))
        return c * GAS_CONSTANT * t / P / 0.02

    assert out.pocket_at_activation_fraction_of_lfl == pytest.approx(index(60.0), rel=1e-3)
    for seconds, value in out.pocket_curve[1:40]:
        assert value == pytest.approx(index(seconds), rel=2e-3)


# --- simulate_prep behaviour ------------------------------------------------------------


def test_film_curve_starts_full_and_only_falls_before_draping(ipa70):
    out = run(ipa70)
    assert out.film_curve[0] == (0.0, 1.0)
    before = [left for t, left in out.film_curve if t <= CASE["draping_after_s"]]
    assert all(b <= a + 1e-9 for a, b in pairwise(before))
    assert out.flammable_left_at_draping_fraction < 1.0


def test_drying_time_is_where_the_curve_reaches_the_dry_fraction(ipa70):
    out = run(ipa70)
    assert math.isfinite(out.drying_time_s)
    before = [left for t, left in out.film_curve if t < out.drying_time_s]
    after = [left for t, left in out.film_curve if t > out.drying_time_s]
    assert min(before) > 0.01 - 1e-6
    assert max(after) < 0.01 + 1e-6


def test_draping_at_the_safe_time_meets_the_margin(ipa70):
    out = run(ipa70)
    assert out.pocket_peak_fraction_of_lfl > ASSUMPTIONS.pocket_margin
    safe = out.safe_draping_after_s
    assert 0.0 < safe < out.open_air_drying_time_s
    at_safe = run(ipa70, draping_after_s=safe)
    assert at_safe.pocket_peak_fraction_of_lfl == pytest.approx(0.25, abs=0.005)
    earlier = run(ipa70, draping_after_s=safe - 30.0)
    assert earlier.pocket_peak_fraction_of_lfl > 0.25


def test_draping_after_the_film_is_gone_leaves_the_pocket_clear(ipa70):
    out = run(ipa70, draping_after_s=5000.0, first_activation_after_s=5200.0)
    assert out.pocket_peak_fraction_of_lfl == 0.0
    assert out.pocket_at_activation_fraction_of_lfl == 0.0
    assert out.flammable_left_at_activation_fraction == pytest.approx(0.0, abs=1e-3)
    assert out.drying_time_s == out.open_air_drying_time_s


def test_activation_before_draping_sees_no_pocket(ipa70):
    out = run(ipa70, draping_after_s=400.0, first_activation_after_s=100.0)
    assert out.pocket_at_activation_fraction_of_lfl == 0.0
    assert out.flammable_left_at_activation_fraction > out.flammable_left_at_draping_fraction


def test_no_fresh_air_under_the_drapes_only_raises_the_peak(ipa70):
    ventilated = run(ipa70)
    sealed = run(ipa70, pocket_exchange_m3_s=0.0)
    assert sealed.pocket_peak_fraction_of_lfl > ventilated.pocket_peak_fraction_of_lfl


def test_wet_film_at_activation_is_stated(ipa70):
    out = run(ipa70)
    assert out.flammable_left_at_activation_fraction > 0.01
    assert "wet-at-activation" in [note.code for note in out.notes]
    assert any("still on the skin at first activation" in note for note in worded(out.notes))


def test_hair_pooling_and_estimated_diffusivities_are_noted(ipa70):
    out = run(ipa70, hair=True, pooling=True)
    assert Note.of("hair", exposed_fraction=0.5, still_layer=0.005) in out.notes
    assert Note.of("pooling", volume_fraction=0.5, area_fraction=0.1) in out.notes
    assert Note.of("diffusivity-estimated", name="isopropanol") in out.notes
    words = worded(out.notes)
    assert any(note.startswith("hair:") for note in words)
    assert any(note.startswith("pooling:") for note in words)
    assert any("Fuller-Schettler-Giddings" in note for note in words)


def test_tabulated_diffusivity_is_used_when_given(ipa70):
    faster = dataclasses.replace(
        ASSUMPTIONS,
        diffusivity_reference_temperature=298.15,
        diffusivities={"67-63-0": 2.0e-5},  # twice the Fuller estimate, to see an effect
    )
    assert run(ipa70, assumptions=faster).open_air_drying_time_s < (
        run(ipa70).open_air_drying_time_s
    )


def test_preparation_without_fuel_has_nothing_to_dry():
    water = analyse_preparation([("water", 1.0)], "volume", 305.15)
    out = run(water)
    assert out.drying_time_s == 0.0 and out.safe_draping_after_s == 0.0
    assert out.notes == (Note.of("no-flammable-component"),)
    assert worded(out.notes) == ("no flammable component",)


def test_missing_assumption_and_bad_pocket_are_refused(ipa70, book):
    without = {k: v for k, v in book.entries.items() if k != "prep.dry_fraction"}
    with pytest.raises(KeyError):
        prep_assumptions(dataclasses.replace(book, entries=without))
    with pytest.raises(ValueError):
        run(ipa70, pocket_volume_m3=0.0)
    with pytest.raises(ValueError):
        run(ipa70, pocket_exchange_m3_s=-LPM)
    fields = {field.name for field in dataclasses.fields(PrepAssumptions)}
    assert fields == set(dataclasses.asdict(ASSUMPTIONS))


def test_outcome_is_plain_json(ipa70):
    record = json.loads(json.dumps(dataclasses.asdict(run(ipa70))))
    assert record["film_curve"][0] == [0.0, 1.0]


def test_rules_file_supplies_every_assumption(book):
    values = {
        entry.id.removeprefix("prep."): entry.get("value")
        for entry in book.of_kind("parameters")
        if entry.id.startswith("prep.")
    }
    # Every field of the record is a rule id less `prep.` (the diffusivities are
    # `prep.diffusivity.<CAS>`), and the record carries the file's values.
    fields = {field.name for field in dataclasses.fields(PrepAssumptions)} - {"diffusivities"}
    assert fields <= set(values)
    record = prep_assumptions(book)
    for name in fields:
        assert getattr(record, name) == values[name]
    assert record.diffusivities == {
        key.removeprefix("diffusivity."): value
        for key, value in values.items()
        if key.startswith("diffusivity.")
    }
    assert 0.0 < values["dry_fraction"] < values["pocket_margin"] < 1.0


# --- properties -------------------------------------------------------------------------

applications = st.fixed_dictionaries(
    {
        "volume_m3": st.floats(min_value=2e-6, max_value=20e-6),
        "area_m2": st.floats(min_value=0.01, max_value=0.1),
        "air_speed_m_s": st.floats(min_value=0.0, max_value=0.5),
        "film_temperature_K": st.floats(min_value=298.0, max_value=309.0),
    }
)


@settings(max_examples=5, deadline=None)
@given(case=applications, more=st.floats(min_value=1.1, max_value=3.0))
def test_more_liquid_on_the_same_area_never_dries_faster(ipa70, case, more):
    less = run(ipa70, **case)
    bigger = run(ipa70, **{**case, "volume_m3": case["volume_m3"] * more})
    assert bigger.open_air_drying_time_s >= less.open_air_drying_time_s
    assert bigger.drying_time_s >= less.drying_time_s


@settings(max_examples=5, deadline=None)
@given(case=applications, cooler=st.floats(min_value=0.5, max_value=6.0))
def test_stiller_air_or_cooler_skin_never_dries_faster(ipa70, case, cooler):
    base = run(ipa70, **case)
    still = run(ipa70, **{**case, "air_speed_m_s": case["air_speed_m_s"] * 0.5})
    cold = run(ipa70, **{**case, "film_temperature_K": case["film_temperature_K"] - cooler})
    # within the solver's own accuracy (relative tolerance 1e-5): where diffusion alone
    # carries the vapour, air speed changes the time by less than that
    assert still.open_air_drying_time_s >= base.open_air_drying_time_s * (1 - 1e-4)
    assert cold.open_air_drying_time_s >= base.open_air_drying_time_s * (1 - 1e-4)


@settings(max_examples=5, deadline=None)
@given(case=applications, hair=st.booleans())
def test_hair_or_pooling_never_dries_faster(ipa70, case, hair):
    plain = run(ipa70, **case)
    held = run(ipa70, **case, hair=hair, pooling=not hair)
    assert held.open_air_drying_time_s >= plain.open_air_drying_time_s
    assert held.drying_time_s >= plain.drying_time_s


@settings(max_examples=5, deadline=None)
@given(
    case=applications,
    early=st.floats(min_value=0.0, max_value=300.0),
    wait=st.floats(min_value=10.0, max_value=300.0),
)
def test_draping_later_never_raises_the_peak(ipa70, case, early, wait):
    first = run(ipa70, **case, draping_after_s=early)
    later = run(ipa70, **case, draping_after_s=early + wait)
    # 1e-3: the solver's relative tolerance is 1e-5 per step over thousands of seconds.
    assert later.pocket_peak_fraction_of_lfl <= first.pocket_peak_fraction_of_lfl * (1 + 1e-3)


def test_the_tests_assumptions_are_the_rule_files(book):
    """PREP_ASSUMPTIONS (conftest) stays the rule file's values, diffusivities aside."""
    assert dataclasses.replace(prep_assumptions(book), diffusivities={}) == PREP_ASSUMPTIONS
