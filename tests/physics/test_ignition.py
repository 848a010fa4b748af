"""Unit tests for ignite.physics.ignition."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ignite.physics.ignition import (
    fitted_exponent,
    holds_charge,
    materials_sustaining,
    mie_at_oxidant,
)

AIR = 0.209  # oxygen in dry air, as rules/oxygen.yaml oxygen.ambient (published)


def test_air_value_at_air_and_power_law_above() -> None:
    assert mie_at_oxidant(0.2e-3, 0.209, 3.0, air_fraction=AIR) == 0.2e-3
    assert mie_at_oxidant(0.2e-3, 0.418, 3.0, air_fraction=AIR) == pytest.approx(
        0.2e-3 / 8.0, rel=1e-12
    )


def test_lower_bound_at_measured_oxygen_value() -> None:
    # n = 3 would give 0.2 mJ * 0.209^3 = 1.83 µJ at x = 1; a measured 5 µJ bounds it.
    assert mie_at_oxidant(0.2e-3, 1.0, 3.0, mie_oxygen=5e-6, air_fraction=AIR) == 5e-6
    assert mie_at_oxidant(0.2e-3, 1.0, 3.0, air_fraction=AIR) == pytest.approx(
        0.2e-3 * 0.209**3, rel=1e-12
    )


def test_below_air_keeps_the_air_value() -> None:
    assert mie_at_oxidant(0.2e-3, 0.15, 3.0, air_fraction=AIR) == 0.2e-3


def test_custom_air_fraction() -> None:
    assert mie_at_oxidant(1e-3, 0.42, 2.0, air_fraction=0.21) == pytest.approx(0.25e-3)


@pytest.mark.parametrize(
    "args",
    [
        (0.0, 0.3, 3.0, None),
        (1e-3, 0.0, 3.0, None),
        (1e-3, 1.2, 3.0, None),
        (1e-3, 0.3, -1.0, None),
        (1e-3, 0.3, 3.0, 2e-3),
    ],
)
def test_mie_rejects_bad_inputs(args: tuple[float, float, float, float | None]) -> None:
    with pytest.raises(ValueError):
        mie_at_oxidant(*args, air_fraction=AIR)


def test_fitted_exponent_round_trip() -> None:
    n = fitted_exponent(0.5e-3, 2e-6, air_fraction=AIR)
    assert n == pytest.approx(math.log(250.0) / math.log(1 / 0.209))
    assert mie_at_oxidant(0.5e-3, 1.0, n, air_fraction=AIR) == pytest.approx(2e-6, rel=1e-12)
    with pytest.raises(ValueError):
        fitted_exponent(0.0, 1e-6, air_fraction=AIR)


@given(
    st.floats(min_value=0.01, max_value=1.0),
    st.floats(min_value=0.01, max_value=1.0),
    st.floats(min_value=0.0, max_value=5.0, allow_subnormal=False),
    st.floats(min_value=1e-6, max_value=1e-2),
    st.booleans(),
)
def test_more_oxidant_never_raises_mie(
    x1: float, x2: float, n: float, mie_air: float, bounded: bool
) -> None:
    low, high = sorted((x1, x2))
    bound = mie_air / 100.0 if bounded else None
    assert mie_at_oxidant(mie_air, high, n, bound, air_fraction=AIR) <= mie_at_oxidant(
        mie_air, low, n, bound, air_fraction=AIR
    )


def test_materials_sustaining_threshold_and_order() -> None:
    materials = [("a", 0.25), ("b", 0.17), ("c", 0.23), ("d", 0.95)]
    assert materials_sustaining(0.23, materials) == ("a", "b", "c")
    assert materials_sustaining(0.2299, materials) == ("b", "c")
    assert materials_sustaining(0.23, materials, allowance=0.0) == ("b", "c")
    assert materials_sustaining(0.5, []) == ()
    with pytest.raises(ValueError):
        materials_sustaining(0.3, materials, allowance=-0.01)


@given(
    st.floats(min_value=0.0, max_value=1.0, allow_subnormal=False),
    st.floats(min_value=0.0, max_value=1.0, allow_subnormal=False),
)
def test_more_oxidant_never_removes_a_material(x1: float, x2: float) -> None:
    materials = [("pp", 0.174), ("cotton", 0.18), ("nylon", 0.24), ("ptfe", 0.95)]
    low, high = sorted((x1, x2))
    assert set(materials_sustaining(low, materials)) <= set(materials_sustaining(high, materials))


def test_holds_charge() -> None:
    assert holds_charge(0.29, 0.30)
    assert not holds_charge(0.30, 0.30)
    assert holds_charge(0.99, 1.0)
