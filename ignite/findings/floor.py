"""Results of the floor and the shock path: readings against the window, shock current."""

from __future__ import annotations

from collections.abc import Iterator

from ignite.findings.registry import Context, Item, Scope, result
from ignite.physics import electrostatics
from ignite.wording import sentences
from ignite.wording.numbers import format_si


def humidity_advice(scope: Scope, voltage: float) -> str:
    """Advice on the humidity that keeps the walking voltage at or below `voltage`."""
    table = list(scope.bound.charge.saturation_points)
    return sentences.humidity_advice(electrostatics.min_rh_for_voltage(voltage, table), table)


def _context(scope: Scope) -> Context:
    fl = scope.results.floor
    low = fl.window_low_ohm
    outside_low = sum(
        1 for i in fl.readings_outside if low is not None and fl.readings_ohm[i] <= low
    )
    floor_for_let_go = max(
        fl.touch_voltage_V / scope.bound.shock.let_go - fl.body_impedance_ohm, 0.0
    )
    return {
        "count": len(fl.readings_ohm),
        "outside_low": outside_low,
        "outside_high": len(fl.readings_outside) - outside_low,
        "shock_path": sentences.shock_path(fl.touch_voltage_V, fl.shock_path_ohm),
        "shock_note": fl.shock_note,
        "floor_for_let_go": format_si(floor_for_let_go, "Ω"),
        "rh_advice_no_spark": humidity_advice(scope, scope.results.no_spark_voltage_V),
    }


@result("floor.lowest_reading", "resistance", "measured")
def _floor_lowest(scope: Scope) -> Iterator[Item]:
    yield Item("floor", scope.results.floor.min_ohm, _context(scope))


@result("floor.highest_reading", "resistance", "measured")
def _floor_highest(scope: Scope) -> Iterator[Item]:
    yield Item("floor", scope.results.floor.max_ohm, _context(scope))


@result("floor.mean_reading", "resistance", "measured")
def _floor_mean(scope: Scope) -> Iterator[Item]:
    fl = scope.results.floor
    if len(fl.readings_ohm) >= scope.bound.window.mean_min_readings:
        yield Item("floor", fl.mean_ohm, _context(scope))


@result("floor.shock_current", "current")
def _shock_current(scope: Scope) -> Iterator[Item]:
    yield Item(
        "floor (person touching a live enclosure)",
        scope.results.floor.shock_current_A,
        _context(scope),
    )
