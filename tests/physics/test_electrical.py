"""ignite.physics.electrical: touch voltage, summed leakage, current through a cardiac path."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ignite.physics.electrical import (
    cardiac_current,
    fault_current_for_cardiac_current,
    summed_leakage,
    summed_leakage_single_fault,
    touch_voltage,
)

currents = st.floats(min_value=0.0, max_value=0.1, allow_nan=False)
resistances = st.floats(min_value=1e-4, max_value=1e3, allow_nan=False)


def test_touch_voltage_is_ohms_law():
    assert touch_voltage(0.5, 0.1) == pytest.approx(0.05)
    assert touch_voltage(0.0, 0.3) == 0.0


def test_sums_and_single_fault():
    assert summed_leakage([]) == 0.0
    assert summed_leakage([1e-6, 2e-6]) == pytest.approx(3e-6)
    # one fault at a time: the second device's rise (40 µA) is the larger
    assert summed_leakage_single_fault([5e-6, 10e-6], [30e-6, 50e-6]) == pytest.approx(55e-6)
    # a single-fault reading below the normal one never lowers the sum
    assert summed_leakage_single_fault([5e-6], [1e-6]) == pytest.approx(5e-6)


def test_zero_bonding_resistance_needs_no_finite_fault_current():
    assert math.isinf(fault_current_for_cardiac_current(10e-6, 500.0, 0.0))


@pytest.mark.parametrize(
    "call",
    [
        lambda: touch_voltage(-1.0, 0.1),
        lambda: touch_voltage(1.0, -0.1),
        lambda: touch_voltage(math.nan, 0.1),
        lambda: summed_leakage([1e-6, -1e-6]),
        lambda: cardiac_current(1.0, 0.0),
        lambda: summed_leakage_single_fault([1e-6], []),
        lambda: fault_current_for_cardiac_current(10e-6, 0.0, 0.2),
    ],
)
def test_arguments_outside_the_domain_are_refused(call):
    with pytest.raises(ValueError):
        call()


@given(st.lists(currents, max_size=8), st.lists(currents, max_size=8))
def test_single_fault_sum_is_never_below_the_normal_sum(normal, fault):
    fault = (fault + normal)[: len(normal)]
    assert summed_leakage_single_fault(normal, fault) >= summed_leakage(normal) - 1e-18


@given(currents, resistances, resistances)
def test_touch_current_grows_with_the_fault_current_and_the_bonding_reading(i, r, z):
    assert cardiac_current(touch_voltage(i * 2, r), z) >= cardiac_current(touch_voltage(i, r), z)
    assert touch_voltage(i, r * 2) >= touch_voltage(i, r)


@given(resistances, resistances)
def test_the_fault_current_found_drives_exactly_the_cardiac_current(r, z):
    fault = fault_current_for_cardiac_current(10e-6, z, r)
    assert cardiac_current(touch_voltage(fault, r), z) == pytest.approx(10e-6)
