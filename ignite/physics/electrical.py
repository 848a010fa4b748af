"""The patient environment's electrical safety: touch voltage on a bonding conductor, and
the current that can reach the heart through a direct cardiac path (microshock).

Pure functions on SI floats (A, V, Ω). Every figure here errs high: leakage currents are
added as though they were in phase (the largest sum they can make), and the current a
touch voltage drives through a cardiac path is Ohm's law across the path's impedance alone
(nothing else in the circuit is credited).
"""

from __future__ import annotations

import math
from collections.abc import Sequence


def _finite_non_negative(value: float, name: str) -> None:
    if not (math.isfinite(value) and value >= 0.0):
        raise ValueError(f"{name} must be a finite number at or above 0, got {value!r}")


def touch_voltage(fault_current: float, bonding_resistance: float) -> float:
    """Voltage a current through a bonding conductor lifts the bonded part to (Ohm's law).

    U = I · R

    fault_current : current through the conductor to the equipotential bonding bar [A]
    bonding_resistance : resistance of that conductor, as measured [Ω]
    Returns the touch voltage between the part and the bonding bar [V].

    >>> touch_voltage(10.0, 0.2)   # the worked example of IEC 60364-7-710's 0.2 Ω limit
    2.0

    Reference: Ohm's law.
    """
    _finite_non_negative(fault_current, "fault_current")
    _finite_non_negative(bonding_resistance, "bonding_resistance")
    return fault_current * bonding_resistance


def summed_leakage(currents: Sequence[float]) -> float:
    """Patient leakage of several devices on one patient, summed as though in phase.

    I = Σ I_i

    Leakage currents of different devices have different phases; their arithmetic sum is
    the largest the real (vector) sum can be, so it errs high.

    currents : the patient leakage of each device connected to the patient [A]
    Returns the worst-case sum [A].

    >>> round(summed_leakage([4e-6, 5e-6, 3e-6]) * 1e6, 9)   # three devices, made-up readings
    12.0

    Reference: superposition of currents, the in-phase (arithmetic) bound.
    """
    for current in currents:
        _finite_non_negative(current, "each current")
    return math.fsum(currents)


def summed_leakage_single_fault(normal: Sequence[float], single_fault: Sequence[float]) -> float:
    """Summed patient leakage with one device in its single-fault condition (the worst one).

    I = Σ I_normal,i + max_k (I_fault,k − I_normal,k)

    A single-fault condition is one fault at a time: the sum is taken with each device in
    turn at its single-fault reading and the others in normal condition, and the largest
    is returned (all in phase, as `summed_leakage`).

    normal, single_fault : per device, its patient leakage in each condition [A]
    Returns the worst-case sum [A]; the normal-condition sum when no device is given.

    >>> round(summed_leakage_single_fault([4e-6, 5e-6], [20e-6, 9e-6]) * 1e6, 9)  # made-up
    25.0

    Reference: IEC 60601-1 single-fault condition (one fault at a time); in-phase bound.
    """
    if len(normal) != len(single_fault):
        raise ValueError("normal and single_fault must give one reading per device")
    base = summed_leakage(normal)
    summed_leakage(single_fault)  # checks the readings
    rise = max((f - n for n, f in zip(normal, single_fault, strict=True)), default=0.0)
    return base + max(rise, 0.0)


def cardiac_current(touch_voltage: float, path_impedance: float) -> float:
    """Current a voltage drives through a direct cardiac path (catheter or pacing wire).

    I = U / Z

    touch_voltage : voltage across the path, e.g. between a bonded part and the patient [V]
    path_impedance : impedance of the catheter or wire and the heart to the body [Ω]
    Returns the current through the heart [A].

    >>> round(cardiac_current(0.005, 500.0) * 1e6, 9)   # 5 mV across 500 Ω, made-up
    10.0

    Reference: Ohm's law.
    """
    _finite_non_negative(touch_voltage, "touch_voltage")
    if not (math.isfinite(path_impedance) and path_impedance > 0.0):
        raise ValueError(f"path_impedance must be above 0, got {path_impedance!r}")
    return touch_voltage / path_impedance


def fault_current_for_cardiac_current(
    cardiac_current: float, path_impedance: float, bonding_resistance: float
) -> float:
    """Current through a bonding conductor at which its touch voltage drives a given current
    through a direct cardiac path.

    I_fault = I_heart · Z / R

    cardiac_current : the current through the heart to reach [A]
    path_impedance : impedance of the cardiac path [Ω]
    bonding_resistance : resistance of the bonding conductor [Ω]
    Returns the fault current [A]; infinite for a conductor of 0 Ω.

    >>> round(fault_current_for_cardiac_current(10e-6, 500.0, 0.2), 9)  # 10 µA, 500 Ω, 0.2 Ω
    0.025

    Reference: Ohm's law, twice (`touch_voltage`, `cardiac_current`).
    """
    _finite_non_negative(cardiac_current, "cardiac_current")
    _finite_non_negative(bonding_resistance, "bonding_resistance")
    if not (math.isfinite(path_impedance) and path_impedance > 0.0):
        raise ValueError(f"path_impedance must be above 0, got {path_impedance!r}")
    if bonding_resistance == 0.0:
        return math.inf
    return cardiac_current * path_impedance / bonding_resistance
