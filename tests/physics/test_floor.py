"""Unit tests for ignite.physics.floor."""

from __future__ import annotations

import math
import statistics

import pytest

from ignite.physics.floor import (
    FloorStatistics,
    floor_statistics,
    readings_outside_window,
    window_low_for_supply,
)

READINGS = [180e3, 240e3, 95e3, 1.3e6, 410e3]


def test_statistics_match_the_standard_library() -> None:
    s = floor_statistics(READINGS)
    assert s.count == 5
    assert s.min == 95e3
    assert s.max == 1.3e6
    assert s.mean == pytest.approx(statistics.fmean(READINGS), rel=1e-15)
    assert s.geometric_mean == pytest.approx(statistics.geometric_mean(READINGS), rel=1e-12)


def test_geometric_mean_is_not_above_the_arithmetic_mean() -> None:
    s = floor_statistics(READINGS)
    assert s.min < s.geometric_mean < s.mean < s.max


def test_single_and_equal_readings_keep_order_invariant() -> None:
    s = floor_statistics([3.3e5] * 7)
    assert s == FloorStatistics(count=7, min=3.3e5, max=3.3e5, mean=3.3e5, geometric_mean=3.3e5)
    assert floor_statistics([1.0]).geometric_mean == 1.0


def test_statistics_accept_any_sequence() -> None:
    assert floor_statistics((1e3, 1e5)).geometric_mean == pytest.approx(1e4)


@pytest.mark.parametrize("bad", [[], [0.0], [1e3, -5.0], [math.nan], [math.inf]])
def test_statistics_reject_bad_readings(bad: list[float]) -> None:
    with pytest.raises(ValueError):
        floor_statistics(bad)


def test_window_strict_low_inclusive_high() -> None:
    readings = [50e3, 50.001e3, 25e6, 25.0001e6]
    assert readings_outside_window(
        readings, 50e3, 25e6, low_inclusive=False, high_inclusive=True
    ) == (0, 3)


def test_window_inclusive_low_strict_high() -> None:
    readings = [10e3, 9.999e3, 1e6, 0.999e6]
    assert readings_outside_window(
        readings, 10e3, 1e6, low_inclusive=True, high_inclusive=False
    ) == (1, 2)


def test_window_open_sides() -> None:
    readings = [1.0, 1e12]
    assert (
        readings_outside_window(readings, None, None, low_inclusive=False, high_inclusive=False)
        == ()
    )
    assert readings_outside_window(
        readings, None, 1e9, low_inclusive=False, high_inclusive=False
    ) == (1,)
    assert readings_outside_window(
        readings, 1e3, None, low_inclusive=False, high_inclusive=False
    ) == (0,)


def test_window_rejects_inverted_limits() -> None:
    with pytest.raises(ValueError):
        readings_outside_window([1e5], 1e6, 1e3, low_inclusive=True, high_inclusive=True)


def test_window_with_no_readings() -> None:
    assert readings_outside_window([], 1.0, 2.0, low_inclusive=True, high_inclusive=True) == ()


STEPS = [(500.0, 50e3), (1000.0, 100e3)]


@pytest.mark.parametrize(
    ("supply", "expected"),
    [(0.0, 50e3), (230.0, 50e3), (500.0, 50e3), (500.1, 100e3), (1000.0, 100e3)],
)
def test_window_low_steps(supply: float, expected: float) -> None:
    assert window_low_for_supply(supply, STEPS) == expected


def test_window_low_open_ended_step() -> None:
    assert window_low_for_supply(5e3, [(120.0, 5e3), (math.inf, 10e3)]) == 10e3


def test_window_low_above_last_step_is_an_error() -> None:
    with pytest.raises(ValueError, match="above the highest step"):
        window_low_for_supply(1000.5, STEPS)


@pytest.mark.parametrize(
    "steps", [[], [(500.0, 50e3), (500.0, 100e3)], [(1000.0, 100e3), (500.0, 50e3)]]
)
def test_window_low_rejects_bad_steps(steps: list[tuple[float, float]]) -> None:
    with pytest.raises(ValueError):
        window_low_for_supply(230.0, steps)


def test_window_low_rejects_bad_supply() -> None:
    with pytest.raises(ValueError):
        window_low_for_supply(-1.0, STEPS)
    with pytest.raises(ValueError):
        window_low_for_supply(math.nan, STEPS)
