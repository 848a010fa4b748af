"""Oxidant under the drapes: a well-mixed pocket fed with oxygen and room air.

The space under the drapes around the site is treated as one well-mixed volume V
receiving the delivered gas (oxygen at fraction F_o, with an inert remainder, plus
nitrous oxide, counted as oxidant) and fresh room air Q_e, and losing the mixture at
the sum of the inflows:

    V · dC/dt = Q_o·F_o + Q_N2O + Q_e·C_a − (Q_o + Q_N2O + Q_e) · C

Its solution is an exponential approach to the steady state; after the delivery
stops only the fresh-air term remains and the pocket washes out towards ambient.

Fractions are oxidant mole fractions [-] (0-1), volumes [m³], flows [m³/s],
times [s], air changes [1/s].
"""

from __future__ import annotations

import math
from collections.abc import Sequence

__all__ = [
    "buildup_time",
    "fraction_after_stop",
    "pocket_fraction",
    "pocket_outflow",
    "pocket_steady_state",
    "room_oxidant_rise",
    "washout_time",
]


def _check_flows(**flows: float) -> None:
    for name, value in flows.items():
        if not (math.isfinite(value) and value >= 0.0):
            raise ValueError(f"{name} must be a finite value >= 0, got {value!r}")


def _check_fraction(name: str, value: float) -> None:
    if not (0.0 <= value <= 1.0):
        raise ValueError(f"{name} must be a fraction in [0, 1], got {value!r}")


def pocket_outflow(o2_flow: float, n2o_flow: float, exchange: float) -> float:
    """Total flow leaving a well-mixed pocket: the sum of what enters it.

        Q = Q_o + Q_N2O + Q_e

    o2_flow, n2o_flow, exchange : delivered oxygen-bearing gas, nitrous oxide and
        fresh room air through the pocket [m³/s]
    Returns Q [m³/s], the flow that sets the pocket's time constant V/Q.

    Worked example (a cannula at 4 L/min and 10 L/min of fresh air, invented case:
    14 L/min):

    >>> round(pocket_outflow(4e-3 / 60, 0.0, 10e-3 / 60) * 60e3, 9)
    14.0

    Reference: mass balance of a well-mixed volume (continuity).
    """
    _check_flows(o2_flow=o2_flow, n2o_flow=n2o_flow, exchange=exchange)
    return o2_flow + n2o_flow + exchange


def pocket_steady_state(
    o2_flow: float,
    o2_fraction: float,
    n2o_flow: float,
    exchange: float,
    ambient: float,
) -> float:
    """Steady oxidant fraction in a well-mixed pocket fed with oxygen and room air.

        C_ss = (Q_o·F_o + Q_N2O + Q_e·C_a) / (Q_o + Q_N2O + Q_e)

    The non-oxygen part of the delivered gas (1 − F_o) is taken as inert; nitrous
    oxide counts wholly as oxidant. With no flow at all the pocket stays at ambient.

    o2_flow : delivered oxygen-bearing gas Q_o [m³/s]
    o2_fraction : oxygen fraction of the delivered gas F_o [-]
    n2o_flow : nitrous oxide Q_N2O [m³/s]
    exchange : fresh room air through the pocket Q_e [m³/s]
    ambient : oxidant fraction of the room air C_a [-]
    Returns C_ss [-].

    Worked example (100 % oxygen by nasal cannula at 4 L/min into a pocket with
    8 L/min of fresh air, invented case; about 47 %, the order of the ~45 %
    measured under drapes by Barnes & Frantz 2000):

    >>> round(pocket_steady_state(4e-3 / 60, 1.0, 0.0, 8e-3 / 60, 0.209), 4)
    0.4727

    Reference: well-mixed (continuously stirred) volume, steady mass balance; the
    dilution-ventilation box model of industrial hygiene.
    """
    _check_flows(o2_flow=o2_flow, n2o_flow=n2o_flow, exchange=exchange)
    _check_fraction("o2_fraction", o2_fraction)
    _check_fraction("ambient", ambient)
    total = o2_flow + n2o_flow + exchange
    if total == 0.0:
        return ambient
    oxidant = o2_flow * o2_fraction + n2o_flow + exchange * ambient
    return min(max(oxidant / total, 0.0), 1.0)


def pocket_fraction(t: float, c0: float, c_inf: float, volume: float, total_flow: float) -> float:
    """Oxidant fraction in a well-mixed pocket at time t, approaching a steady state.

        C(t) = C_∞ + (C_0 − C_∞) · e^(−Q·t/V)

    t : time since the flows were set [s]
    c0 : fraction at t = 0 [-];  c_inf : steady-state fraction [-]
    volume : pocket volume V [m³] (> 0)
    total_flow : flow through the pocket Q [m³/s] (`pocket_outflow`)
    Returns C(t) [-].

    Worked example (invented 30 L pocket, from room air towards 47 % with
    12 L/min through it: τ = V/Q = 2.5 min, so after 2.5 min it has covered 63 %
    of the way, about 38 %):

    >>> round(pocket_fraction(150.0, 0.209, 0.4727, 0.030, 12e-3 / 60), 4)
    0.3757

    Reference: solution of the linear first-order mass balance of a well-mixed
    volume.
    """
    _check_pocket(volume, total_flow)
    if t < 0.0:
        raise ValueError(f"time must be >= 0 s, got {t!r}")
    if total_flow == 0.0 or t == 0.0:
        return c0
    return c_inf + (c0 - c_inf) * math.exp(-total_flow * t / volume)


def buildup_time(
    c_target: float, c0: float, c_inf: float, volume: float, total_flow: float
) -> float:
    """Time for a well-mixed pocket rising from C_0 towards C_∞ to reach C_target.

        t = (V / Q) · ln((C_∞ − C_0) / (C_∞ − C_target))

    c_target : fraction to reach [-];  c0 : starting fraction [-]
    c_inf : steady-state fraction [-]
    volume : pocket volume V [m³] (> 0);  total_flow : Q [m³/s]
    Returns t [s]: 0 when C_0 is already at or above the target; `math.inf` when
    the steady state does not exceed the target (it is approached, never reached)
    or nothing flows.

    Worked example (the pocket of `pocket_fraction`: from room air to the NFPA 99
    oxygen-enriched limit of 23.5 % takes about 16 s):

    >>> round(buildup_time(0.235, 0.209, 0.4727, 0.030, 12e-3 / 60), 1)
    15.6

    Reference: as for `pocket_fraction`, solved for t.
    """
    _check_pocket(volume, total_flow)
    if c0 >= c_target:
        return 0.0
    if c_inf <= c_target or total_flow == 0.0:
        return math.inf
    return (volume / total_flow) * math.log((c_inf - c0) / (c_inf - c_target))


def washout_time(
    c0: float,
    c_target: float,
    volume: float,
    exchange: float,
    ambient: float,
) -> float:
    """Time for a well-mixed pocket to fall from C_0 to C_target after delivery stops.

        t = (V / Q_e) · ln((C_0 − C_a) / (C_target − C_a))

    c0 : fraction when the oxygen stops [-];  c_target : fraction to fall to [-]
    volume : pocket volume V [m³] (> 0);  exchange : fresh air through it Q_e [m³/s]
    ambient : room-air fraction C_a [-]
    Returns t [s]: 0 when C_0 is already at or below the target; `math.inf` when
    the target is at or below ambient (approached, never reached) or no air flows.

    Worked example (invented: 50 L pocket at 45 %, 10 L/min fresh air, down to the
    NFPA 99 oxygen-enriched limit of 23.5 %: about 11 minutes, far beyond the
    one-minute stop of surgical-fire guidance):

    >>> round(washout_time(0.45, 0.235, 0.050, 10e-3 / 60, 0.209))
    668

    Reference: exponential washout of a well-mixed volume (dilution ventilation).
    """
    _check_pocket(volume, exchange)
    if c0 <= c_target:
        return 0.0
    if c_target <= ambient or exchange == 0.0:
        return math.inf
    return (volume / exchange) * math.log((c0 - ambient) / (c_target - ambient))


def fraction_after_stop(
    c0: float,
    t: float,
    volume: float,
    exchange: float,
    ambient: float,
) -> float:
    """Oxidant fraction in a well-mixed pocket a time t after the delivery stops.

        C(t) = C_a + (C_0 − C_a) · e^(−Q_e·t/V)

    c0 : fraction when the oxygen stops [-];  t : time since [s]
    volume : pocket volume V [m³] (> 0);  exchange : fresh air Q_e [m³/s]
    ambient : room-air fraction C_a [-]
    Returns C(t) [-].

    Worked example (the pocket of `washout_time`, one minute after the oxygen
    stops: still about 41 %):

    >>> round(fraction_after_stop(0.45, 60.0, 0.050, 10e-3 / 60, 0.209), 4)
    0.4063

    Reference: exponential washout of a well-mixed volume (dilution ventilation).
    """
    return pocket_fraction(t, c0, ambient, volume, exchange)


def fractions_after_stop(
    c0: float,
    times: Sequence[float],
    volume: float,
    exchange: float,
    ambient: float,
) -> list[float]:
    """`fraction_after_stop` at each of `times` [s] (the inputs checked once, for curves).

    >>> [round(c, 4) for c in fractions_after_stop(0.45, [0.0, 60.0], 0.050, 10e-3 / 60, 0.209)]
    [0.45, 0.4063]
    """
    _check_pocket(volume, exchange)
    if any(t < 0.0 for t in times):
        raise ValueError(f"times must be >= 0 s, got {min(times)!r}")
    if exchange == 0.0:
        return [c0 for _ in times]
    rate = -exchange
    return [
        c0 if t == 0.0 else ambient + (c0 - ambient) * math.exp(rate * t / volume) for t in times
    ]


def room_oxidant_rise(
    o2_flow: float,
    o2_fraction: float,
    n2o_flow: float,
    room_volume: float,
    air_changes_per_s: float,
    ambient: float,
) -> float:
    """Steady rise of the whole room's oxidant fraction above ambient from open delivery.

        ΔC = (Q_o·(F_o − C_a) + Q_N2O·(1 − C_a)) / (Q_o + Q_N2O + N·V_room)

    The room is one well-mixed volume ventilated with N·V_room of outside air of the
    ambient fraction; this is `pocket_steady_state` with the ventilation as the
    exchange, less the ambient.

    o2_flow, n2o_flow : delivered gas and nitrous oxide [m³/s]
    o2_fraction : oxygen fraction of the delivered gas [-]
    room_volume : V_room [m³];  air_changes_per_s : N [1/s]
    ambient : C_a [-]
    Returns ΔC [-] (negative if the delivered gas is leaner than air).

    Worked example (invented 140 m³ theatre at 25 air changes an hour, 4 L/min of
    oxygen: a rise of about 5e-5, negligible):

    >>> round(room_oxidant_rise(4e-3 / 60, 1.0, 0.0, 140.0, 25 / 3600, 0.209) * 1e5, 2)
    5.42

    Reference: steady well-mixed room (dilution ventilation) mass balance.
    """
    _check_flows(room_volume=room_volume, air_changes_per_s=air_changes_per_s)
    ventilation = room_volume * air_changes_per_s
    return pocket_steady_state(o2_flow, o2_fraction, n2o_flow, ventilation, ambient) - ambient


def _check_pocket(volume: float, flow: float) -> None:
    if not (math.isfinite(volume) and volume > 0.0):
        raise ValueError(f"pocket volume must be a finite value > 0 m³, got {volume!r}")
    _check_flows(flow=flow)
