"""Unit tests for ignite.physics.vapour: substances, composition, UNIFAC, flash point, LFL."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ignite.physics import vapour
from ignite.physics.vapour import (
    ACTIVITY_MODEL,
    FIRE_DATA_METHODS,
    UNIFAC_VARIANTS,
    VAPOUR_PRESSURE_CHOICE,
    VAPOUR_PRESSURE_METHODS,
    SubstanceDataError,
    UnknownSubstance,
    activity_coefficients_dortmund,
    activity_coefficients_unifac,
    activity_model,
    activity_model_name,
    bubble_point,
    fraction_of_lfl,
    lfl_le_chatelier,
    liaw_sum,
    liquid_molar_volume,
    mixture_flash_point,
    mole_fractions_from_mass,
    mole_fractions_from_volume,
    partial_pressures,
    substance,
    vapour_pressure,
)

ETHANOL, ISOPROPANOL, WATER = "64-17-5", "67-63-0", "7732-18-5"


# --- substances ------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "cas"),
    [
        ("ethanol", ETHANOL),
        ("ethyl alcohol", ETHANOL),
        ("isopropyl alcohol", ISOPROPANOL),
        ("2-propanol", ISOPROPANOL),
        ("67-63-0", ISOPROPANOL),
        ("  Water ", WATER),
    ],
)
def test_names_and_cas_numbers_resolve(name, cas):
    assert substance(name).cas == cas


@pytest.mark.parametrize("name", ["no-such-solvent", "", "   "])
def test_unknown_names_raise_with_the_name(name):
    with pytest.raises(UnknownSubstance) as caught:
        substance(name)
    assert caught.value.name == name
    assert isinstance(caught.value, ValueError)


def test_flash_point_never_comes_from_the_group_contribution_table():
    from chemicals.safety import T_flash

    ethanol = substance("ethanol")
    far_off = T_flash(ETHANOL, method="Serat DIPPR (2017)")
    assert ethanol.flash_point == T_flash(ETHANOL, method="IEC 60079-20-1 (2010)")
    assert abs(ethanol.flash_point - far_off) > 20.0
    assert "ethanol flash point: IEC 60079-20-1 (2010)" in ethanol.methods


def test_fire_data_takes_the_safe_side_of_the_two_sources():
    from chemicals.safety import UFL, T_autoignition

    # Ethanol autoignition: IEC 400 °C, NFPA 363 °C: the lower one is kept.
    ethanol = substance("ethanol")
    nfpa = T_autoignition(ETHANOL, method="NFPA 497 (2008)")
    iec = T_autoignition(ETHANOL, method="IEC 60079-20-1 (2010)")
    assert nfpa < iec
    assert ethanol.autoignition == nfpa
    assert "ethanol autoignition temperature: NFPA 497 (2008)" in ethanol.methods
    # Acetone UFL: IEC 14.3 %, NFPA 12.8 %: the higher one is kept.
    acetone = substance("acetone")
    assert acetone.ufl == UFL(CASRN="67-64-1", method="IEC 60079-20-1 (2010)")
    assert acetone.ufl > UFL(CASRN="67-64-1", method="NFPA 497 (2008)")


def test_water_is_volatile_but_not_fuel():
    water = substance("water")
    assert water.volatile and not water.flammable
    assert water.flash_point is None and water.lfl is None


def test_non_volatile_active_has_no_vapour_pressure():
    chlorhexidine = substance("chlorhexidine")
    assert not chlorhexidine.volatile
    assert vapour_pressure("chlorhexidine", 305.15) == 0.0
    with pytest.raises(SubstanceDataError):
        liquid_molar_volume("chlorhexidine", 293.15)


def test_vapour_pressure_rises_with_temperature():
    assert vapour_pressure("ethanol", 310.0) > vapour_pressure("ethanol", 290.0) > 0.0


def test_fire_data_methods_are_the_two_named_tables():
    assert FIRE_DATA_METHODS == ("IEC 60079-20-1 (2010)", "NFPA 497 (2008)")


# --- composition -----------------------------------------------------------------------


def test_volume_fractions_by_hand():
    # 1 L of each of two liquids: 800 g / 40 g/mol = 20 mol and 1000 g / 20 g/mol = 50 mol
    x = mole_fractions_from_volume([0.5, 0.5], [0.040, 0.020], [800.0, 1000.0])
    assert x == pytest.approx((20 / 70, 50 / 70))


def test_mass_fractions_by_hand():
    x = mole_fractions_from_mass([0.2, 0.8], [0.040, 0.020])
    assert x == pytest.approx((5 / 45, 40 / 45))


def test_fractions_need_not_sum_to_one():
    assert mole_fractions_from_mass([0.35, 0.15], [0.046, 0.018]) == pytest.approx(
        mole_fractions_from_mass([0.7, 0.3], [0.046, 0.018])
    )


@pytest.mark.parametrize("fractions", [[], [-0.1, 0.5], [0.0, 0.0], [1.5], [math.nan]])
def test_bad_fractions_are_refused(fractions):
    with pytest.raises(ValueError):
        mole_fractions_from_mass(fractions, [0.04] * len(fractions))


# --- activity coefficients -------------------------------------------------------------


def test_pure_component_limit_is_ideal():
    groups = [substance("ethanol").unifac_groups, substance("water").unifac_groups]
    gammas = activity_coefficients_unifac(298.15, [1.0, 0.0], groups)
    assert gammas[0] == pytest.approx(1.0, abs=1e-9)
    assert activity_model(["isopropanol"])(300.0, [1.0]) == (1.0,)


def test_alcohol_water_deviates_positively_from_raoult():
    gammas = activity_model(["ethanol", "water"])(298.15, [0.1, 0.9])
    assert gammas[0] > 2.0
    assert gammas[1] > 1.0


def test_substance_without_groups_cannot_enter_unifac():
    with pytest.raises(SubstanceDataError):
        activity_model(["chlorhexidine", "water"])


def test_the_chosen_model_is_dortmund_with_its_own_groups():
    assert ACTIVITY_MODEL == "dortmund"
    assert ACTIVITY_MODEL in UNIFAC_VARIANTS
    # isopropanol's OH is secondary in the Dortmund table (subgroup 81), primary in the original
    assert (81, 1) in substance("isopropanol").dortmund_groups
    assert (14, 1) in substance("isopropanol").unifac_groups
    groups = [substance(n).dortmund_groups for n in ("isopropanol", "water")]
    direct = activity_coefficients_dortmund(305.15, [0.3, 0.7], groups)
    assert activity_model(["isopropanol", "water"])(305.15, [0.3, 0.7]) == direct
    assert activity_model(["isopropanol", "water"], "dortmund")(305.15, [0.3, 0.7]) == direct


def test_the_two_variants_differ_and_both_are_ideal_when_pure():
    dortmund = activity_model(["ethanol", "water"], "dortmund")
    original = activity_model(["ethanol", "water"], "original")
    assert dortmund(298.15, [0.1, 0.9]) != original(298.15, [0.1, 0.9])
    for model in (dortmund, original):
        assert model(298.15, [1.0, 0.0])[0] == pytest.approx(1.0, abs=1e-9)
        assert model(298.15, [0.0, 1.0])[1] == pytest.approx(1.0, abs=1e-9)


def test_a_component_without_dortmund_groups_falls_back_to_original_unifac():
    # glycerol has original UNIFAC groups but no Dortmund assignment in the DDBST tables
    assert substance("glycerol").unifac_groups and not substance("glycerol").dortmund_groups
    cas = ["glycerol", "ethanol", "water"]
    assert activity_model_name(cas) == "original"
    assert activity_model_name(["ethanol", "water"]) == "dortmund"
    assert activity_model_name(["ethanol", "water"], "original") == "original"
    x = [0.05, 0.3, 0.65]
    assert activity_model(cas)(300.0, x) == activity_model(cas, "original")(300.0, x)


def test_an_unknown_variant_is_refused():
    with pytest.raises(ValueError, match="variant"):
        activity_model_name(["ethanol", "water"], "lyngby")


def test_chosen_vapour_pressure_methods_are_named_and_cover_the_range():
    for cas, method in VAPOUR_PRESSURE_CHOICE.items():
        found = substance(cas)
        assert found.vapour_pressure_method == method
        assert any(VAPOUR_PRESSURE_METHODS[method] in m for m in found.methods)
        low, high = vapour._vapour_pressure_model(cas).T_limits[method]
        assert low <= 273.15 and high >= 393.15


def test_other_substances_keep_the_general_order():
    # diethyl ether is not in the explicit table: the first method of the order that fits
    assert "60-29-7" not in VAPOUR_PRESSURE_CHOICE
    assert substance("diethyl ether").vapour_pressure_method in VAPOUR_PRESSURE_METHODS


def test_partial_pressures_of_a_pure_liquid_are_its_vapour_pressure():
    assert partial_pressures(["ethanol"], [1.0], 300.0)[0] == pytest.approx(
        vapour_pressure("ethanol", 300.0)
    )


# --- flash point and LFL ---------------------------------------------------------------


def test_liaw_sum_is_linear_in_each_term():
    assert liaw_sum([0.5, 0.5], [2.0, 1.0], [1000.0, 3000.0], [2000.0, 3000.0]) == 1.0


def test_pure_flammable_liquid_flashes_at_its_table_value():
    assert mixture_flash_point(["isopropanol"], [1.0]) == pytest.approx(
        substance("isopropanol").flash_point, abs=1e-3
    )


def test_no_flammable_component_gives_no_flash_point():
    assert mixture_flash_point(["water"], [1.0]) is None


def test_a_trace_of_alcohol_does_not_flash_below_boiling():
    assert mixture_flash_point(["ethanol", "water"], [1e-4, 1 - 1e-4]) is None


def test_bubble_point_of_a_mixture_lies_between_the_pure_ones():
    t_mix = bubble_point(["ethanol", "water"], [0.3, 0.7])
    assert bubble_point(["ethanol"], [1.0]) < t_mix < bubble_point(["water"], [1.0])


def test_le_chatelier_of_one_fuel_is_its_own_limit():
    assert lfl_le_chatelier([3.0], [0.031]) == pytest.approx(0.031)


def test_le_chatelier_ignores_the_scale_of_the_amounts():
    assert lfl_le_chatelier([1.0, 3.0], [0.02, 0.03]) == pytest.approx(
        lfl_le_chatelier([0.25, 0.75], [0.02, 0.03])
    )


def test_fraction_of_lfl_is_one_at_the_mixture_limit():
    lfl = lfl_le_chatelier([0.4, 0.6], [0.02, 0.031])
    assert fraction_of_lfl([0.4 * lfl, 0.6 * lfl], [0.02, 0.031]) == pytest.approx(1.0)


def test_le_chatelier_without_fuel_is_refused():
    with pytest.raises(ValueError):
        lfl_le_chatelier([0.0], [0.02])


# --- properties ------------------------------------------------------------------------


@settings(max_examples=15, deadline=None)
@given(
    low=st.floats(min_value=0.3, max_value=0.95),
    step=st.floats(min_value=0.01, max_value=0.3),
)
def test_more_alcohol_never_raises_the_flash_point(low, step):
    high = min(low + step, 1.0)
    leaner = mixture_flash_point(["ethanol", "water"], [low, 1 - low])
    richer = mixture_flash_point(["ethanol", "water"], [high, 1 - high])
    assert leaner is not None and richer is not None
    assert richer <= leaner + 1e-3


def test_tabulated_binary_matches_direct_unifac():
    """The binary γ table reproduces UNIFAC itself (regression of the speed-up, not a published value)."""
    from ignite.physics.vapour import activity_coefficients_dortmund, activity_model_at, substance

    groups = [substance(n).dortmund_groups for n in ("isopropanol", "water")]
    gamma = activity_model_at(("isopropanol", "water"), 305.15)
    for x1 in (0.0005, 0.01, 0.13, 0.41, 0.77, 0.999):
        direct = activity_coefficients_dortmund(305.15, [x1, 1 - x1], groups)
        table = gamma(305.15, [x1, 1 - x1])
        for d, t in zip(direct, table, strict=True):
            assert t == pytest.approx(d, rel=1e-3)
