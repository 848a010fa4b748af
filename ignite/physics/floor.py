"""Floor point-to-ground readings: summary statistics and acceptance windows.

A floor must be conductive enough to bleed charge from people and trolleys and
resistive enough to limit the current through a person touching a live part. The
window's limits (which standard, which supply voltage) are data in `rules/`; these
functions only apply them to the readings.

All resistances in ohms [Ω], voltages in volts [V].
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from itertools import pairwise

__all__ = [
    "FloorStatistics",
    "floor_statistics",
    "readings_outside_window",
    "window_low_for_supply",
]


@dataclass(frozen=True)
class FloorStatistics:
    """Summary of a set of point-to-ground readings [Ω]."""

    count: int
    min: float
    max: float
    mean: float
    geometric_mean: float


def floor_statistics(readings: Sequence[float]) -> FloorStatistics:
    """Count, extremes, arithmetic and geometric mean of floor resistance readings.

    mean = (1/n) Σ R_i;   geometric mean = exp((1/n) Σ ln R_i)

    The geometric mean suits readings that spread over decades (a floor may read
    50 kΩ in one spot and 5 MΩ in the next); the arithmetic mean is what averaging
    rules in floor standards use. Static checks take `max`, shock checks take `min`.

    readings : point-to-ground resistances [Ω], each finite and > 0
    Returns a `FloorStatistics` in ohms. Raises ValueError on an empty sequence or a
    reading that is not a finite positive number.

    Worked example (an invented floor, readings in kΩ: 100, 1000, 10000; the
    geometric mean of a decade-spaced triple is its middle value):

    >>> s = floor_statistics([100e3, 1e6, 10e6])
    >>> s.count, s.min, s.max
    (3, 100000.0, 10000000.0)
    >>> round(s.mean), round(s.geometric_mean)
    (3700000, 1000000)

    Reference: arithmetic and geometric means, any statistics text; readings taken
    as described in IEC 60364-6 / NFPA 99 floor test methods.
    """
    values = tuple(float(r) for r in readings)
    if not values:
        raise ValueError("no floor readings")
    for i, r in enumerate(values):
        if not (math.isfinite(r) and r > 0.0):
            raise ValueError(f"floor reading [{i}] must be a finite resistance > 0 Ω, got {r!r}")
    n = len(values)
    mean = math.fsum(values) / n
    geometric = math.exp(math.fsum(math.log(r) for r in values) / n)
    # Rounding in exp/log can put the geometric mean a hair outside [min, max] when
    # all readings are equal; keep the invariant min <= gm <= mean <= max exact.
    low, high = min(values), max(values)
    geometric = min(max(geometric, low), high)
    mean = min(max(mean, geometric), high)
    return FloorStatistics(count=n, min=low, max=high, mean=mean, geometric_mean=geometric)


def readings_outside_window(
    readings: Sequence[float],
    low: float | None,
    high: float | None,
    *,
    low_inclusive: bool,
    high_inclusive: bool,
) -> tuple[int, ...]:
    """Indices of the readings that fall outside an acceptance window.

    A reading R is inside when  low < R  (or  low <= R  if `low_inclusive`)
    and  R < high  (or  R <= high  if `high_inclusive`). `None` means no limit on
    that side. Standards word their limits strictly or not ("more than 50 kΩ",
    "not more than 25 MΩ"), so the caller says which.

    readings : resistances [Ω];  low, high : window limits [Ω] or None
    Returns the zero-based indices of readings outside the window, in order.

    Worked example (limits of the IEC 60364-7-710 medical-location window as
    adopted in NEK 400:710: each reading > 50 kΩ and <= 25 MΩ; readings invented):

    >>> readings_outside_window([180e3, 50e3, 1.3e6, 30e6], 50e3, 25e6,
    ...                         low_inclusive=False, high_inclusive=True)
    (1, 3)

    Reference: IEC 60364-7-710 (NEK 400:710); NFPA 99 (editions up to 2005).
    """
    if low is not None and high is not None and low > high:
        raise ValueError(f"window low limit {low!r} Ω is above its high limit {high!r} Ω")
    outside: list[int] = []
    for i, r in enumerate(readings):
        too_low = low is not None and (r < low if low_inclusive else r <= low)
        too_high = high is not None and (r > high if high_inclusive else r >= high)
        if too_low or too_high:
            outside.append(i)
    return tuple(outside)


def window_low_for_supply(supply_voltage: float, steps: Sequence[tuple[float, float]]) -> float:
    """Lower resistance limit of a floor window that depends on the supply voltage.

    Picks the first step whose supply bound is at or above the supply:
    limit = R_low,k  for the smallest k with  U_supply <= U_k.

    supply_voltage : nominal mains voltage [V]
    steps : (supply up to [V], lower limit [Ω]) pairs, supply bounds strictly
        ascending; use `math.inf` as the last bound for an open-ended step.
    Returns the lower limit [Ω]. Raises ValueError when the supply is above the
    last step: the window does not say, and guessing would be silent extrapolation.

    Worked example (IEC 60364-7-710 as adopted in NEK 400:710: > 50 kΩ for supplies
    up to 500 V, > 100 kΩ above; a 230 V theatre supply):

    >>> window_low_for_supply(230.0, [(500.0, 50e3), (math.inf, 100e3)])
    50000.0
    >>> window_low_for_supply(690.0, [(500.0, 50e3), (math.inf, 100e3)])
    100000.0

    Reference: IEC 60364-7-710 (NEK 400:710); NFPA 99 (editions up to 2005).
    """
    if not steps:
        raise ValueError("no supply-voltage steps given")
    if not (math.isfinite(supply_voltage) and supply_voltage >= 0.0):
        raise ValueError(f"supply voltage must be a finite value >= 0 V, got {supply_voltage!r}")
    bounds = [float(u) for u, _ in steps]
    if any(b <= a for a, b in pairwise(bounds)):
        raise ValueError(f"supply-voltage steps must be strictly ascending, got {bounds}")
    for upper, limit in steps:
        if supply_voltage <= upper:
            return float(limit)
    raise ValueError(
        f"supply voltage {supply_voltage:g} V is above the highest step ({bounds[-1]:g} V) "
        "of the floor window"
    )
