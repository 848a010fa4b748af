"""Unit tests for ignite.physics.shock."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ignite.physics.shock import body_impedance, path_impedance, shock_current

# An invented three-point table, used only to exercise the interpolation.
TABLE = [(100.0, 1200.0), (220.0, 1000.0), (700.0, 750.0)]


def test_points_are_returned_exactly_and_unclamped() -> None:
    for u, z in TABLE:
        assert body_impedance(u, TABLE) == (z, False)


def test_between_points_log_is_linear_in_voltage() -> None:
    z, clamped = body_impedance(160.0, TABLE)
    assert not clamped
    assert z == pytest.approx(math.sqrt(1200.0 * 1000.0), rel=1e-12)
    z, _ = body_impedance(400.0, TABLE)
    fraction = (400.0 - 220.0) / (700.0 - 220.0)
    assert math.log(z) == pytest.approx(
        math.log(1000.0) + fraction * math.log(750.0 / 1000.0), rel=1e-12
    )


def test_outside_the_table_clamps_and_flags() -> None:
    assert body_impedance(50.0, TABLE) == (1200.0, True)
    assert body_impedance(1000.0, TABLE) == (750.0, True)


def test_one_point_table() -> None:
    assert body_impedance(230.0, [(230.0, 1000.0)]) == (1000.0, False)
    assert body_impedance(240.0, [(230.0, 1000.0)]) == (1000.0, True)


@pytest.mark.parametrize(
    "table",
    [[], [(100.0, 0.0)], [(220.0, 1000.0), (100.0, 1200.0)], [(100.0, 1e3), (100.0, 2e3)]],
)
def test_bad_tables_are_rejected(table: list[tuple[float, float]]) -> None:
    with pytest.raises(ValueError):
        body_impedance(150.0, table)


def test_nan_voltage_is_rejected() -> None:
    with pytest.raises(ValueError):
        body_impedance(math.nan, TABLE)


@given(
    st.floats(min_value=0.0, max_value=2000.0, allow_subnormal=False),
    st.floats(min_value=0.0, max_value=2000.0, allow_subnormal=False),
)
def test_impedance_never_rises_with_voltage_on_a_falling_table(u1: float, u2: float) -> None:
    low, high = sorted((u1, u2))
    assert body_impedance(high, TABLE)[0] <= body_impedance(low, TABLE)[0] * (1 + 1e-12)


def test_shock_current_ohms_law() -> None:
    assert shock_current(230.0, 50e3, 1000.0) == pytest.approx(230.0 / 51e3, rel=1e-15)
    assert shock_current(0.0, 50e3, 1000.0) == 0.0
    assert shock_current(230.0, 0.0, 1000.0) == pytest.approx(0.23)


def test_shock_current_rejects_negative_or_zero_path() -> None:
    with pytest.raises(ValueError):
        shock_current(230.0, -1.0, 1000.0)
    with pytest.raises(ValueError):
        shock_current(230.0, 0.0, 0.0)


@given(
    st.floats(min_value=1e3, max_value=1e9),
    st.floats(min_value=1e3, max_value=1e9),
    st.floats(min_value=500.0, max_value=5e3),
)
def test_a_higher_floor_reading_never_raises_the_current(r1: float, r2: float, body: float) -> None:
    low, high = sorted((r1, r2))
    assert shock_current(230.0, high, body) <= shock_current(230.0, low, body)


def test_path_impedance_scales_the_hand_to_hand_value() -> None:
    assert path_impedance(1000.0, 0.7) == pytest.approx(700.0, rel=1e-15)
    assert path_impedance(1000.0, 1.0) == 1000.0


@pytest.mark.parametrize(
    ("z", "k"), [(-1.0, 0.7), (math.inf, 0.7), (1000.0, 0.0), (1000.0, math.nan)]
)
def test_path_impedance_rejects_bad_inputs(z: float, k: float) -> None:
    with pytest.raises(ValueError):
        path_impedance(z, k)


def test_a_flat_segment_holds_its_value_exactly() -> None:
    table = [(500.0, 625.0), (700.0, 575.0), (1000.0, 575.0)]
    assert body_impedance(850.0, table) == (575.0, False)
