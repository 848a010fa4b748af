"""Shock current through a person standing on the floor and touching a live part.

The floor's lowest reading and the IEC 60479-1 body impedance are in series with the
touch voltage; footwear gets no credit (people may wear conductive footwear or stand
in spilt fluid). The impedance table is data in `rules/`.

Resistances and impedances in ohms [Ω], voltages in volts [V], currents in amperes [A].
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from itertools import pairwise

__all__ = ["body_impedance", "shock_current"]


def _check_table(table: Sequence[tuple[float, float]], what: str) -> list[tuple[float, float]]:
    points = [(float(x), float(y)) for x, y in table]
    if not points:
        raise ValueError(f"empty {what} table")
    for x, y in points:
        if not (math.isfinite(x) and math.isfinite(y) and y > 0.0):
            raise ValueError(f"{what} table point ({x!r}, {y!r}) must be finite with a value > 0")
    if any(b[0] <= a[0] for a, b in pairwise(points)):
        raise ValueError(f"{what} table must be strictly ascending in its first column")
    return points


def body_impedance(
    touch_voltage: float, table: Sequence[tuple[float, float]]
) -> tuple[float, bool]:
    """Total body impedance at a touch voltage, interpolated in an IEC 60479-1 table.

    Between table points (U_i, Z_i) and (U_j, Z_j), ln Z is linear in U:

        Z(U) = Z_i · (Z_j / Z_i) ^ ((U − U_i) / (U_j − U_i))

    Outside the table the nearest end value is returned and the second element is
    True ('clamped'): the caller must say that the touch voltage lies outside the
    tabulated range rather than present the value as read from the standard.

    touch_voltage : touch voltage [V]
    table : (touch voltage [V], total body impedance [Ω]) points, voltages strictly
        ascending. Which percentile, current path and contact condition it holds is
        the table's business (rules/).
    Returns (impedance [Ω], clamped).

    Worked example (IEC 60479-1 Table 1 as quoted in the project's physics guide:
    5th percentile, hand to hand, dry, large contact area: 1200 Ω at 100 V, 1000 Ω
    at 220 V; a 230 V touch lies above this two-point table, so it is clamped):

    >>> body_impedance(220.0, [(100.0, 1200.0), (220.0, 1000.0)])
    (1000.0, False)
    >>> z, clamped = body_impedance(160.0, [(100.0, 1200.0), (220.0, 1000.0)])
    >>> round(z, 1), clamped
    (1095.4, False)
    >>> body_impedance(230.0, [(100.0, 1200.0), (220.0, 1000.0)])
    (1000.0, True)

    Reference: IEC 60479-1, Effects of current on human beings and livestock,
    Part 1: General aspects, Table 1 (total body impedance).
    """
    points = _check_table(table, "body impedance")
    u = float(touch_voltage)
    if math.isnan(u):
        raise ValueError("touch voltage is not a number")
    if u < points[0][0]:
        return points[0][1], True
    if u > points[-1][0]:
        return points[-1][1], True
    for (u0, z0), (u1, z1) in pairwise(points):
        if u0 <= u <= u1:
            if u == u0:
                return z0, False
            if u == u1:
                return z1, False
            fraction = (u - u0) / (u1 - u0)
            return math.exp(math.log(z0) + fraction * (math.log(z1) - math.log(z0))), False
    return points[0][1], False  # a one-point table and u equal to its voltage


def shock_current(voltage: float, floor_min: float, body: float) -> float:
    """Current through a person in series with the floor, by Ohm's law.

        I = U / (R_floor,min + R_body)

    voltage : touch voltage U [V] (mains to earth)
    floor_min : lowest point-to-ground floor reading [Ω] (the worst spot for current)
    body : total body impedance R_body [Ω] (IEC 60479-1)
    Returns the current I [A]. Raises ValueError on negative inputs or a zero path.

    Worked example (a 230 V touch on a floor at the 50 kΩ lower limit of the
    IEC 60364-7-710 window, body 1000 Ω from IEC 60479-1 Table 1 at 220 V, 5th
    percentile: about 4.5 mA, below the ~10 mA let-go threshold of IEC 60479-1):

    >>> round(shock_current(230.0, 50e3, 1000.0) * 1e3, 2)
    4.51

    Reference: Ohm's law; IEC 60479-1 for the body impedance and the effects.
    """
    if voltage < 0.0 or floor_min < 0.0 or body < 0.0:
        raise ValueError("voltage and resistances must be >= 0")
    path = floor_min + body
    if path <= 0.0:
        raise ValueError("the shock path has zero resistance")
    return voltage / path
