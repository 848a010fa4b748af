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

__all__ = ["body_impedance", "path_impedance", "shock_current"]


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

    Between table points (U_i, Z_i) and (U_j, Z_j), ln Z is linear in U (log-linear):

        Z(U) = Z_i · (Z_j / Z_i) ^ ((U − U_i) / (U_j − U_i))

    Where Z falls with U, this curve lies below the straight chord between the points:
    a lower impedance than linear interpolation, so a higher current (the safe side).

    Outside the table the nearest end value is returned and the second element is
    True ('clamped'): the caller must say that the touch voltage lies outside the
    tabulated range rather than present the value as read from the standard.

    touch_voltage : touch voltage [V]
    table : (touch voltage [V], total body impedance [Ω]) points, voltages strictly
        ascending. Which percentile, current path and contact condition it holds is
        the table's business (rules/).
    Returns (impedance [Ω], clamped).

    Worked example (IEC 60479-1:2005 Table 1, 5th percentile, hand to hand, dry,
    large contact area, memory: 775 Ω at 225 V and 700 Ω at 400 V; a 230 V touch
    lies between them, at about 773 Ω; 20 V lies below the table's 25 V, so clamped):

    >>> table = [(25.0, 1750.0), (225.0, 775.0), (400.0, 700.0)]
    >>> body_impedance(225.0, table)
    (775.0, False)
    >>> z, clamped = body_impedance(230.0, table)
    >>> round(z, 1), clamped
    (772.7, False)
    >>> body_impedance(20.0, table)
    (1750.0, True)

    Reference: IEC 60479-1:2005, Effects of current on human beings and livestock,
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
            if u == u1 or z0 == z1:
                return z1, False  # a flat segment holds its value exactly
            fraction = (u - u0) / (u1 - u0)
            return math.exp(math.log(z0) + fraction * (math.log(z1) - math.log(z0))), False
    return points[0][1], False  # a one-point table and u equal to its voltage


def path_impedance(hand_to_hand: float, path_factor: float) -> float:
    """Total body impedance on another current path, from the hand-to-hand value.

        Z_path = k · Z_hand-hand

    hand_to_hand : total body impedance hand to hand Z_hand-hand [Ω]
    path_factor : k [-], the path's impedance as a fraction of hand to hand (> 0)
    Returns Z_path [Ω].

    Worked example (IEC 60479-1:2005, memory: hand to feet some 10 % to 30 % lower
    than hand to hand; the 30 % reduction, k = 0.7, is the safe side; 775 Ω hand to
    hand at 225 V gives 542.5 Ω hand to feet):

    >>> round(path_impedance(775.0, 0.7), 6)
    542.5

    Reference: IEC 60479-1:2005, total body impedance for other current paths.
    """
    if not (math.isfinite(hand_to_hand) and hand_to_hand >= 0.0):
        raise ValueError("hand-to-hand impedance must be finite and >= 0")
    if not (math.isfinite(path_factor) and path_factor > 0.0):
        raise ValueError("path factor must be finite and > 0")
    return path_factor * hand_to_hand


def shock_current(voltage: float, floor_min: float, body: float) -> float:
    """Current through a person in series with the floor, by Ohm's law.

        I = U / (R_floor,min + R_body)

    voltage : touch voltage U [V] (mains to earth)
    floor_min : lowest point-to-ground floor reading [Ω] (the worst spot for current)
    body : total body impedance R_body [Ω] (IEC 60479-1)
    Returns the current I [A]. Raises ValueError on negative inputs or a zero path.

    Worked example (a 230 V touch on a floor at the 50 kΩ lower limit of the
    IEC 60364-7-710 window, body 541 Ω hand to feet from IEC 60479-1:2005 Table 1 at
    230 V, 5th percentile, times 0.7 (memory): about 4.55 mA, below the ~10 mA let-go
    threshold of IEC 60479-1):

    >>> round(shock_current(230.0, 50e3, 541.0) * 1e3, 2)
    4.55

    Reference: Ohm's law; IEC 60479-1 for the body impedance and the effects.
    """
    if voltage < 0.0 or floor_min < 0.0 or body < 0.0:
        raise ValueError("voltage and resistances must be >= 0")
    path = floor_min + body
    if path <= 0.0:
        raise ValueError("the shock path has zero resistance")
    return voltage / path
