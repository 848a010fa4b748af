"""People and trolleys as leaky charged capacitors.

A person walking (or a trolley being pushed) charges at a generation current I_g
and leaks to earth through footwear (or castors) and the floor, a resistance R. The
body voltage rises towards I_g·R with the time constant τ = R·C, and cannot rise
above the contact-charging saturation voltage of the floor surface at the room's
humidity. Spark energy and the time to fall below the no-spark voltage follow.

Resistances [Ω], capacitances [F], currents [A], voltages [V], charges [C],
energies [J], times [s], relative humidity as a fraction [-] (0-1).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from itertools import pairwise

__all__ = [
    "body_voltage",
    "max_footwear_resistance",
    "max_leak_resistance",
    "min_rh_for_voltage",
    "saturation_voltage",
    "settle_time",
    "spark_energy",
    "spark_energy_if_sparking",
    "stored_charge",
    "time_constant",
    "voltage_for_energy",
]


def _check_curve(table: Sequence[tuple[float, float]]) -> list[tuple[float, float]]:
    points = [(float(rh), float(v)) for rh, v in table]
    if not points:
        raise ValueError("empty saturation-voltage table")
    for rh, v in points:
        if not (math.isfinite(rh) and math.isfinite(v) and v > 0.0):
            raise ValueError(f"saturation table point ({rh!r}, {v!r}) must be finite, V > 0")
    if any(b[0] <= a[0] for a, b in pairwise(points)):
        raise ValueError("saturation table must be strictly ascending in RH")
    return points


def _log_between(x: float, x0: float, y0: float, x1: float, y1: float) -> float:
    """y at x on the straight line through (x0, ln y0) and (x1, ln y1)."""
    if x == x0:
        return y0
    if x == x1 or y0 == y1:
        return y1  # a flat segment holds its value exactly
    fraction = (x - x0) / (x1 - x0)
    return math.exp(math.log(y0) + fraction * (math.log(y1) - math.log(y0)))


def saturation_voltage(rh: float, table: Sequence[tuple[float, float]]) -> tuple[float, bool]:
    """Contact-charging saturation voltage at a relative humidity, from a table.

    Between table points (RH_i, V_i) and (RH_j, V_j), ln V is linear in RH:

        V(RH) = V_i · (V_j / V_i) ^ ((RH − RH_i) / (RH_j − RH_i))

    Outside the table the nearest end value is returned and the second element is
    True ('clamped'), so the caller can say the humidity lies outside the table.

    rh : relative humidity [-] (fraction, 0-1)
    table : (RH [-], V [V]) points, RH strictly ascending (one walking surface).
    Returns (saturation voltage [V], clamped).

    Worked example (the ESD industry's table of typical body voltages, walking on
    a vinyl floor: 12 kV at 10 % RH, 5 kV at 40 %, 3 kV at 55 % (published), and
    250 V in the 65-90 % RH column of its two-column form (memory); at 28 % RH the
    interpolation gives about 7.1 kV; at 5 % RH the table says nothing, so 12 kV
    is returned with the clamp flag; 75 % RH lies in the flat high-humidity column):

    >>> vinyl = [(0.10, 12e3), (0.40, 5e3), (0.55, 3e3), (0.65, 250.0), (0.90, 250.0)]
    >>> v, clamped = saturation_voltage(0.28, vinyl)
    >>> round(v), clamped
    (7097, False)
    >>> saturation_voltage(0.05, vinyl)
    (12000.0, True)
    >>> saturation_voltage(0.75, vinyl)
    (250.0, False)

    Reference: typical electrostatic voltages against RH, as tabulated by the ESD
    industry (e.g. ESD Association fundamentals); DOD-HDBK-263 for the two-column form
    (10-25 % and 65-90 % RH).
    """
    points = _check_curve(table)
    x = float(rh)
    if math.isnan(x):
        raise ValueError("relative humidity is not a number")
    if x < points[0][0]:
        return points[0][1], True
    if x > points[-1][0]:
        return points[-1][1], True
    for (x0, y0), (x1, y1) in pairwise(points):
        if x0 <= x <= x1:
            return _log_between(x, x0, y0, x1, y1), False
    return points[0][1], False  # a one-point table and rh equal to its RH


def min_rh_for_voltage(v_limit: float, table: Sequence[tuple[float, float]]) -> float | None:
    """Lowest relative humidity at which the saturation voltage is at or below a limit.

    The inverse of `saturation_voltage` on the same log-linear segments:

        RH = RH_i + (RH_j − RH_i) · ln(V_limit / V_i) / ln(V_j / V_i)

    v_limit : voltage not to exceed [V]
    table : (RH [-], V [V]) points, RH strictly ascending, V not increasing.
    Returns RH [-]; the table's lowest RH when the limit is met across the whole
    table (the table cannot say how much lower would still do); None when even the
    table's highest RH leaves the voltage above the limit.

    Worked example (vinyl floor, ESD industry table as in `saturation_voltage`:
    5 kV is read at 40 % RH; 500 V at about 62 % RH; 200 V is not reached within
    the table, whose highest-humidity column gives 250 V):

    >>> vinyl = [(0.10, 12e3), (0.40, 5e3), (0.55, 3e3), (0.65, 250.0), (0.90, 250.0)]
    >>> round(min_rh_for_voltage(5e3, vinyl), 6)
    0.4
    >>> round(min_rh_for_voltage(500.0, vinyl), 3)
    0.622
    >>> min_rh_for_voltage(200.0, vinyl) is None
    True

    Reference: as for `saturation_voltage`.
    """
    points = _check_curve(table)
    if any(b[1] > a[1] for a, b in pairwise(points)):
        raise ValueError("saturation table must not rise with RH to be inverted")
    if math.isnan(v_limit):
        raise ValueError("voltage limit is not a number")
    if points[0][1] <= v_limit:
        return points[0][0]
    for (x0, y0), (x1, y1) in pairwise(points):
        if y1 <= v_limit < y0:
            if y1 == v_limit:
                return x1
            return x0 + (x1 - x0) * math.log(v_limit / y0) / math.log(y1 / y0)
    return None


def time_constant(resistance: float, capacitance: float) -> float:
    """Time constant of a capacitor discharging through a resistance.

        τ = R · C

    resistance : leak path to earth R [Ω] (may be `math.inf`)
    capacitance : C [F]
    Returns τ [s].

    Worked example (IEC 61000-4-2 body model, 150 pF, on a 1 GΩ path, the
    IEC 61340-5-1 upper limit for person + footwear + floor: 0.15 s):

    >>> round(time_constant(1e9, 150e-12), 6)
    0.15

    Reference: RC circuit, any electrical engineering text.
    """
    if resistance < 0.0 or capacitance < 0.0:
        raise ValueError("resistance and capacitance must be >= 0")
    if capacitance == 0.0 or resistance == 0.0:
        return 0.0
    return resistance * capacitance


def body_voltage(
    generation_current: float,
    resistance: float,
    capacitance: float,
    v_saturation: float,
    duration: float = math.inf,
) -> float:
    """Voltage of a person or trolley charging at I_g through a leak path, capped.

        V = min( I_g · R · (1 − e^(−t/τ)),  V_sat ),   τ = R · C

    With an unbounded leak resistance the uncapped voltage is the pure charging
    ramp I_g · t / C (the limit of the formula as R → ∞).

    generation_current : I_g [A] (walking, pushing)
    resistance : leak path to earth R [Ω] (footwear + floor; may be `math.inf`)
    capacitance : C [F]
    v_saturation : humidity-limited saturation voltage V_sat [V]
    duration : charging time t [s]; the default, `math.inf`, gives the steady state
    Returns V [V].

    Worked example (the electrostatics texts' walking current of 0.1 µA, 150 pF,
    a 1 GΩ path: steady 100 V, the IEC 61340-5-1 pairing; on 100 GΩ the steady
    10 kV is capped by a 7.1 kV saturation voltage):

    >>> round(body_voltage(0.1e-6, 1e9, 150e-12, 7.1e3), 6)
    100.0
    >>> body_voltage(0.1e-6, 100e9, 150e-12, 7.1e3)
    7100.0

    Reference: leaky-capacitor charging model, e.g. IEC TS 60079-32-1 (charge
    accumulation on isolated conductors); electrostatics texts.
    """
    i_g, r, c, t = generation_current, resistance, capacitance, duration
    if i_g < 0.0 or r < 0.0 or c < 0.0 or v_saturation < 0.0 or t < 0.0:
        raise ValueError("body_voltage inputs must be >= 0")
    if i_g == 0.0 or r == 0.0 or t == 0.0:
        return 0.0
    if math.isinf(r):
        uncapped = math.inf if (math.isinf(t) or c == 0.0) else i_g * t / c
    elif math.isinf(t) or c == 0.0:
        uncapped = i_g * r
    else:
        uncapped = i_g * r * -math.expm1(-t / (r * c))
    return min(uncapped, v_saturation)


def stored_charge(capacitance: float, voltage: float) -> float:
    """Charge on a capacitor.

        Q = C · V

    capacitance : C [F];  voltage : V [V]
    Returns Q [C].

    Worked example (IEC 61000-4-2 human-body model, 150 pF, at 10 kV: 1.5 µC):

    >>> round(stored_charge(150e-12, 10e3) * 1e6, 9)
    1.5

    Reference: definition of capacitance.
    """
    return capacitance * voltage


def spark_energy(capacitance: float, voltage: float) -> float:
    """Energy stored on a capacitor, the most a single spark from it can release.

        E = ½ · C · V²

    capacitance : C [F];  voltage : V [V]
    Returns E [J].

    Worked example (IEC 61000-4-2 human-body model, 150 pF, at 10 kV: 7.5 mJ):

    >>> round(spark_energy(150e-12, 10e3) * 1e3, 9)
    7.5

    Reference: energy of a charged capacitor; IEC TS 60079-32-1 (spark discharges).
    """
    return 0.5 * capacitance * voltage * voltage


def spark_energy_if_sparking(capacitance: float, voltage: float, v_no_spark: float) -> float:
    """Energy of the spark a charged conductor can give: none at or below the no-spark voltage.

        E = ½ · C · V²   when V > V_ns;   E = 0   when V <= V_ns

    Below the Paschen minimum of air no gap breaks down, so no spark happens and there is
    no energy to compare with an MIE. Above it the whole stored energy is counted (a real
    spark leaves some charge behind): the larger figure, the safe side.

    capacitance : C [F];  voltage : V [V]
    v_no_spark : voltage at or below which a conductor cannot spark V_ns [V] (> 0; the
        Paschen minimum of air, ~330 V)
    Returns E [J].

    Worked example (a 300 pF trolley at 300 V stores 13.5 µJ, but 300 V is below the
    ~330 V Paschen minimum of air, so no spark; at 10 kV the IEC 61000-4-2 150 pF body
    gives its 7.5 mJ):

    >>> spark_energy_if_sparking(300e-12, 300.0, 330.0)
    0.0
    >>> round(spark_energy_if_sparking(150e-12, 10e3, 330.0) * 1e3, 9)
    7.5

    Reference: energy of a charged capacitor; Paschen's law for the no-spark voltage;
    IEC TS 60079-32-1 (spark discharges).
    """
    if v_no_spark <= 0.0 or math.isnan(voltage):
        raise ValueError("v_no_spark must be > 0 and the voltage a number")
    if abs(voltage) <= v_no_spark:
        return 0.0
    return spark_energy(capacitance, voltage)


def voltage_for_energy(energy: float, capacitance: float) -> float:
    """Voltage at which a capacitor holds a given energy (inverse of `spark_energy`).

        V = √(2 · E / C)

    energy : E [J] (for instance a fuel's MIE);  capacitance : C [F] (> 0)
    Returns V [V].

    Worked example (methane's MIE in air, 0.28 mJ, published in NFPA 77 / the
    IEC 60079-20-1 compilations, stored on a 150 pF person: about 1.93 kV):

    >>> round(voltage_for_energy(0.28e-3, 150e-12))
    1932

    Reference: energy of a charged capacitor.
    """
    if energy < 0.0 or capacitance <= 0.0:
        raise ValueError("energy must be >= 0 and capacitance > 0")
    return math.sqrt(2.0 * energy / capacitance)


def settle_time(voltage: float, tau: float, v_no_spark: float) -> float:
    """Time for a person who stops moving to fall below the no-spark voltage.

        t = τ · ln(V / V_ns),   0 when V <= V_ns

    voltage : body voltage when movement stops V [V]
    tau : time constant of the leak path τ [s] (may be `math.inf`)
    v_no_spark : voltage below which a conductor cannot spark V_ns [V] (> 0; the
        Paschen minimum of air, ~330 V)
    Returns t [s]; `math.inf` when the path does not leak (τ infinite).

    Worked example (7.1 kV on a person with τ = 1.5 s, V_ns = 330 V from the
    Paschen minimum of air: about 4.6 s):

    >>> round(settle_time(7.1e3, 1.5, 330.0), 2)
    4.6

    Reference: exponential RC discharge; Paschen's law for the no-spark voltage.
    """
    if v_no_spark <= 0.0 or tau < 0.0 or voltage < 0.0:
        raise ValueError("v_no_spark must be > 0; tau and voltage >= 0")
    if voltage <= v_no_spark or tau == 0.0:
        return 0.0
    if math.isinf(tau):
        return math.inf
    return tau * math.log(voltage / v_no_spark)


def max_leak_resistance(v_limit: float, generation_current: float) -> float:
    """Largest leak resistance that keeps the steady body voltage at or below a limit.

        R_max = V_limit / I_g      (from I_g · R <= V_limit)

    v_limit : voltage not to exceed [V];  generation_current : I_g [A]
    Returns R_max [Ω]; `math.inf` when nothing is generated.

    Worked example (IEC 61340-5-1 body-voltage limit of 100 V and the textbook
    walking current of 0.1 µA give 1 GΩ, the standard's person + footwear + floor
    limit):

    >>> round(max_leak_resistance(100.0, 0.1e-6))
    1000000000

    Reference: Ohm's law; IEC 61340-5-1 / ANSI/ESD S20.20 for the pairing.
    """
    if v_limit < 0.0 or generation_current < 0.0:
        raise ValueError("v_limit and generation_current must be >= 0")
    if generation_current == 0.0:
        return math.inf
    return v_limit / generation_current


def max_footwear_resistance(
    v_limit: float, generation_current: float, floor_max: float
) -> float | None:
    """Largest footwear resistance that keeps the body voltage at or below a limit.

        R_footwear,max = V_limit / I_g − R_floor,max

    v_limit : voltage not to exceed [V];  generation_current : I_g [A]
    floor_max : highest point-to-ground floor reading [Ω]
    Returns R_footwear,max [Ω]; None when the floor alone already exceeds
    V_limit / I_g (no footwear can help); `math.inf` when nothing is generated.

    Worked example (100 V limit, 0.1 µA walking current as in `max_leak_resistance`,
    a floor whose worst reading is 1.3 MΩ: footwear up to 998.7 MΩ):

    >>> round(max_footwear_resistance(100.0, 0.1e-6, 1.3e6) / 1e6, 3)
    998.7

    Reference: series resistances and Ohm's law; IEC 61340-5-1.
    """
    if floor_max < 0.0:
        raise ValueError("floor_max must be >= 0")
    total = max_leak_resistance(v_limit, generation_current)
    if floor_max > total:
        return None
    return total - floor_max
