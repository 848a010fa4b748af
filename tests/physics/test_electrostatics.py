"""Unit tests for ignite.physics.electrostatics."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ignite.physics.electrostatics import (
    body_voltage,
    max_footwear_resistance,
    max_leak_resistance,
    min_rh_for_voltage,
    saturation_voltage,
    settle_time,
    spark_energy,
    spark_energy_if_sparking,
    stored_charge,
    time_constant,
    voltage_for_energy,
)

# Invented table shaped like a walking-voltage curve (falls with RH).
TABLE = [(0.10, 20e3), (0.30, 8e3), (0.60, 1e3)]


def test_saturation_log_linear_between_points() -> None:
    v, clamped = saturation_voltage(0.20, TABLE)
    assert not clamped
    assert v == pytest.approx(math.sqrt(20e3 * 8e3), rel=1e-12)
    v, _ = saturation_voltage(0.50, TABLE)
    assert math.log(v) == pytest.approx(
        math.log(8e3) + (0.2 / 0.3) * math.log(1e3 / 8e3), rel=1e-12
    )


def test_saturation_clamps_and_flags_outside() -> None:
    assert saturation_voltage(0.05, TABLE) == (20e3, True)
    assert saturation_voltage(0.95, TABLE) == (1e3, True)
    assert saturation_voltage(0.10, TABLE) == (20e3, False)
    assert saturation_voltage(0.60, TABLE) == (1e3, False)


@pytest.mark.parametrize("table", [[], [(0.3, 0.0)], [(0.4, 1e3), (0.2, 2e3)]])
def test_saturation_rejects_bad_tables(table: list[tuple[float, float]]) -> None:
    with pytest.raises(ValueError):
        saturation_voltage(0.3, table)


def test_min_rh_inverts_saturation() -> None:
    for v_limit in (15e3, 8e3, 5e3, 2e3, 1e3):
        rh = min_rh_for_voltage(v_limit, TABLE)
        assert rh is not None
        assert saturation_voltage(rh, TABLE)[0] == pytest.approx(v_limit, rel=1e-12)


def test_min_rh_ends() -> None:
    # Limit met across the whole table: the table's lowest RH.
    assert min_rh_for_voltage(25e3, TABLE) == 0.10
    assert min_rh_for_voltage(20e3, TABLE) == 0.10
    # Not reachable within the table.
    assert min_rh_for_voltage(999.0, TABLE) is None


def test_min_rh_on_a_flat_segment_takes_its_start() -> None:
    table = [(0.1, 5e3), (0.3, 2e3), (0.5, 2e3)]
    assert min_rh_for_voltage(2e3, table) == 0.3


def test_min_rh_rejects_a_rising_table() -> None:
    with pytest.raises(ValueError):
        min_rh_for_voltage(1e3, [(0.1, 1e3), (0.5, 2e3)])


def test_time_constant() -> None:
    assert time_constant(1e9, 150e-12) == pytest.approx(0.15)
    assert time_constant(0.0, 150e-12) == 0.0
    assert time_constant(math.inf, 150e-12) == math.inf
    with pytest.raises(ValueError):
        time_constant(-1.0, 1e-12)


def test_body_voltage_transient_and_steady() -> None:
    i_g, r, c = 0.1e-6, 1e9, 150e-12
    tau = r * c
    assert body_voltage(i_g, r, c, 1e6) == pytest.approx(100.0)
    assert body_voltage(i_g, r, c, 1e6, duration=tau) == pytest.approx(
        100.0 * (1.0 - math.exp(-1.0)), rel=1e-12
    )
    assert body_voltage(i_g, r, c, 1e6, duration=0.0) == 0.0


def test_body_voltage_capped_by_saturation() -> None:
    assert body_voltage(0.1e-6, 1e12, 150e-12, 5e3) == 5e3


def test_body_voltage_with_no_leak_is_a_ramp() -> None:
    assert body_voltage(0.1e-6, math.inf, 150e-12, 1e6, duration=1.0) == pytest.approx(
        0.1e-6 / 150e-12
    )
    assert body_voltage(0.1e-6, math.inf, 150e-12, 7e3) == 7e3


def test_body_voltage_zero_cases() -> None:
    assert body_voltage(0.0, 1e9, 150e-12, 5e3) == 0.0
    assert body_voltage(0.1e-6, 0.0, 150e-12, 5e3) == 0.0


def test_body_voltage_rejects_negative_inputs() -> None:
    with pytest.raises(ValueError):
        body_voltage(-1e-7, 1e9, 150e-12, 5e3)


def test_charge_and_energy() -> None:
    assert stored_charge(100e-12, 2e3) == pytest.approx(2e-7)
    assert spark_energy(100e-12, 2e3) == pytest.approx(2e-4)
    assert voltage_for_energy(spark_energy(230e-12, 3.3e3), 230e-12) == pytest.approx(3.3e3)
    with pytest.raises(ValueError):
        voltage_for_energy(1e-3, 0.0)


def test_settle_time() -> None:
    assert settle_time(330.0 * math.e, 2.0, 330.0) == pytest.approx(2.0)
    assert settle_time(330.0, 2.0, 330.0) == 0.0
    assert settle_time(100.0, 2.0, 330.0) == 0.0
    assert settle_time(5e3, 0.0, 330.0) == 0.0
    assert settle_time(5e3, math.inf, 330.0) == math.inf
    with pytest.raises(ValueError):
        settle_time(5e3, 1.0, 0.0)


def test_leak_and_footwear_limits() -> None:
    assert max_leak_resistance(100.0, 0.1e-6) == pytest.approx(1e9)
    assert max_leak_resistance(100.0, 0.0) == math.inf
    assert max_footwear_resistance(100.0, 0.1e-6, 25e6) == pytest.approx(975e6)
    assert max_footwear_resistance(100.0, 0.1e-6, 1e9) == pytest.approx(0.0, abs=1e-3)
    assert max_footwear_resistance(100.0, 0.1e-6, 2e9) is None
    assert max_footwear_resistance(100.0, 0.0, 2e9) == math.inf


# Property: more humidity never raises the body voltage (brief; a falling table).
@given(
    st.floats(min_value=0.0, max_value=1.0, allow_subnormal=False),
    st.floats(min_value=0.0, max_value=1.0, allow_subnormal=False),
    st.floats(min_value=1e5, max_value=1e13),
    st.floats(min_value=50e-12, max_value=400e-12),
    st.floats(min_value=0.0, max_value=100.0, allow_subnormal=False) | st.just(math.inf),
)
def test_more_humidity_never_raises_body_voltage(
    rh1: float, rh2: float, r: float, c: float, t: float
) -> None:
    low, high = sorted((rh1, rh2))
    v_low = body_voltage(0.1e-6, r, c, saturation_voltage(low, TABLE)[0], t)
    v_high = body_voltage(0.1e-6, r, c, saturation_voltage(high, TABLE)[0], t)
    assert v_high <= v_low * (1 + 1e-12)


@given(
    st.floats(min_value=1e5, max_value=1e13),
    st.floats(min_value=1e5, max_value=1e13),
    st.floats(min_value=0.0, max_value=100.0, allow_subnormal=False),
)
def test_a_tighter_leak_path_never_raises_body_voltage(r1: float, r2: float, t: float) -> None:
    low, high = sorted((r1, r2))
    assert body_voltage(0.1e-6, low, 150e-12, 1e5, t) <= body_voltage(
        0.1e-6, high, 150e-12, 1e5, t
    ) * (1 + 1e-12)


@given(st.floats(min_value=1.0, max_value=30e3))
def test_min_rh_round_trip(v_limit: float) -> None:
    rh = min_rh_for_voltage(v_limit, TABLE)
    if v_limit < 1e3:
        assert rh is None
    else:
        assert rh is not None
        assert saturation_voltage(rh, TABLE)[0] <= v_limit * (1 + 1e-9)


@given(
    st.floats(min_value=1e-12, max_value=1e-9),
    st.floats(min_value=0.0, max_value=50e3),
    st.floats(min_value=1.0, max_value=5e3),
)
def test_spark_energy_is_zero_at_or_below_the_no_spark_voltage(
    c: float, v: float, v_ns: float
) -> None:
    energy = spark_energy_if_sparking(c, v, v_ns)
    if v <= v_ns:
        assert energy == 0.0
    else:
        assert energy == spark_energy(c, v) > 0.0


def test_spark_energy_if_sparking_rejects_bad_inputs() -> None:
    with pytest.raises(ValueError):
        spark_energy_if_sparking(150e-12, 1e3, 0.0)
    with pytest.raises(ValueError):
        spark_energy_if_sparking(150e-12, math.nan, 330.0)
