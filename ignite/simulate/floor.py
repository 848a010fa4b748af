"""The floor: readings against the window in force, and the shock current through the lowest reading.

The body impedance is the IEC 60479-1 hand-to-hand table at the bound percentile (the 5th:
the low impedance, the high current), log-linear in the touch voltage, times the path
factor to the feet (the low end of the standard's range: the safe side).
"""

from __future__ import annotations

from ignite.physics import floor, shock
from ignite.records.results import (
    FloorResult,
)
from ignite.room.model import Room
from ignite.rules.bound import Bound
from ignite.wording import sentences


def compute_floor(room: Room, bound: Bound) -> FloorResult:
    readings = room.floor.point_to_ground
    stats = floor.floor_statistics(readings)
    window = bound.window
    mains = room.room.mains
    low = window.low.value if window.low is not None else None
    high = window.high.value if window.high is not None else None
    outside = floor.readings_outside_window(
        readings,
        low,
        high,
        low_inclusive=window.low_inclusive,
        high_inclusive=window.high_inclusive,
    )
    passed = not outside
    if (
        window.mean_low is not None
        and stats.count >= window.mean_min_readings
        and stats.mean <= window.mean_low.value
    ):
        passed = False
    model = bound.shock
    hand_to_hand, extrapolated = shock.body_impedance(mains.voltage, list(model.body_impedance))
    body = shock.path_impedance(hand_to_hand, model.path_factor)
    current = shock.shock_current(mains.voltage, stats.min, body)
    notes = []
    if mains.system == "isolated":
        notes.append(sentences.ISOLATED_SUPPLY_SHOCK)
    if extrapolated:
        notes.append(sentences.body_impedance_outside_table(mains.voltage))
    return FloorResult(
        readings_ohm=tuple(readings),
        min_ohm=stats.min,
        max_ohm=stats.max,
        mean_ohm=stats.mean,
        geometric_mean_ohm=stats.geometric_mean,
        criteria=room.floor.criteria,
        window_low_ohm=low,
        window_high_ohm=high,
        passed=passed,
        shock_path_ohm=stats.min + body,
        shock_current_A=current,
        test_voltage_V=room.floor.test_voltage,
        readings_outside=tuple(outside),
        point_to_point_ohm=tuple(room.floor.point_to_point),
        body_impedance_ohm=body,
        touch_voltage_V=mains.voltage,
        supply_system=mains.system,
        shock_note=" ".join(notes),
        body_impedance_hand_to_hand_ohm=hand_to_hand,
        body_impedance_percentile_fraction=model.percentile,
        body_current_path=model.path,
        body_path_factor_fraction=model.path_factor,
    )
