"""Tests for ignite.simulate.preparation: a preparation's liquid, flash point and LFL."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ignite.physics.vapour import FIRE_DATA_METHODS, UnknownSubstance, activity_model
from ignite.simulate.notes import Note, worded
from ignite.simulate.preparation import analyse_preparation

ISOPROPANOL, WATER = "67-63-0", "7732-18-5"


# --- analyse_preparation ---------------------------------------------------------------


def test_analysis_of_aqueous_isopropanol():
    a = analyse_preparation([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15)
    assert a.names == ("isopropanol", "water")
    assert a.cas == (ISOPROPANOL, WATER)
    assert a.flammable == (True, False)
    assert sum(a.mole_fractions) == pytest.approx(1.0)
    assert a.lfl_fraction == pytest.approx(0.02)  # one fuel: its own LFL
    assert a.saturated_vapour_fraction > a.lfl_fraction  # a wet film is above the LFL
    assert a.film_temperature_K == 305.15
    assert any("Liaw" in m for m in a.methods)
    assert a.methods[0].startswith("modified UNIFAC (Dortmund")
    assert any("isopropanol vapour pressure: DIPPR 101" in m for m in a.methods)
    assert a.activity_coefficients == activity_model((ISOPROPANOL, WATER), "dortmund")(
        305.15, a.mole_fractions
    )


def test_non_volatile_active_is_left_out_and_named():
    with_active = analyse_preparation(
        [("chlorhexidine", 0.02), ("isopropanol", 0.7), ("water", 0.28)], "mass", 305.15
    )
    without = analyse_preparation([("isopropanol", 0.7), ("water", 0.28)], "mass", 305.15)
    assert with_active.names == ("isopropanol", "water")
    assert with_active.mole_fractions == pytest.approx(without.mole_fractions)
    assert Note.of("component-left-out", name="chlorhexidine") in with_active.notes
    assert any("chlorhexidine" in note for note in worded(with_active.notes))


def test_component_without_flammability_data_is_noted_not_guessed():
    a = analyse_preparation([("glycerol", 0.1), ("ethanol", 0.6), ("water", 0.3)], "mass", 305.15)
    assert a.flammable == (False, True, False)
    assert Note.of("component-not-fuel", name="glycerol", sources=FIRE_DATA_METHODS) in a.notes
    assert any(note.startswith("glycerol: no LFL") for note in worded(a.notes))


def test_a_liquid_with_a_component_outside_the_dortmund_table_says_which_model():
    # glycerol has no modified UNIFAC (Dortmund) groups: the liquid uses original UNIFAC
    a = analyse_preparation([("glycerol", 0.1), ("ethanol", 0.6), ("water", 0.3)], "mass", 305.15)
    assert a.methods[0].startswith("UNIFAC (original")
    assert "no modified UNIFAC (Dortmund) groups for glycerol" in a.methods[0]
    assert a.activity_coefficients == activity_model(a.cas, "original")(305.15, a.mole_fractions)


def test_a_single_component_has_no_activity_model():
    a = analyse_preparation([("isopropanol", 1.0)], "volume", 293.15)
    assert a.activity_coefficients == (1.0,)
    assert a.methods[0] == "single component: activity coefficient 1"


def test_water_alone_has_no_flammable_vapour():
    a = analyse_preparation([("water", 1.0)], "volume", 305.15)
    assert a.flash_point_K is None and a.lfl_fraction is None
    assert a.saturated_vapour_fraction is None


def test_mass_and_volume_bases_differ_as_the_densities_do():
    by_volume = analyse_preparation([("ethanol", 0.5), ("water", 0.5)], "volume", 300.0)
    by_mass = analyse_preparation([("ethanol", 0.5), ("water", 0.5)], "mass", 300.0)
    # Ethanol is lighter than water: half by volume is less ethanol than half by mass.
    assert by_volume.mole_fractions[0] < by_mass.mole_fractions[0]


def test_unknown_component_raises_unknown_substance():
    with pytest.raises(UnknownSubstance):
        analyse_preparation([("isopropanol", 0.7), ("unobtainium", 0.3)], "volume", 305.15)


def test_unknown_basis_is_refused():
    with pytest.raises(ValueError):
        analyse_preparation([("ethanol", 1.0)], "weight", 305.15)


# --- properties ------------------------------------------------------------------------


@settings(max_examples=15, deadline=None)
@given(
    cool=st.floats(min_value=285.0, max_value=315.0),
    rise=st.floats(min_value=0.1, max_value=10.0),
)
def test_warmer_film_never_gives_less_vapour(cool, rise):
    components = [("isopropanol", 0.7), ("water", 0.3)]
    colder = analyse_preparation(components, "volume", cool)
    warmer = analyse_preparation(components, "volume", cool + rise)
    assert warmer.saturated_vapour_fraction >= colder.saturated_vapour_fraction
