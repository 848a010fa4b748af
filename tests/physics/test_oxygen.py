"""Unit tests for ignite.physics.oxygen."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ignite.physics.oxygen import (
    buildup_time,
    fraction_after_stop,
    pocket_fraction,
    pocket_outflow,
    pocket_steady_state,
    room_oxidant_rise,
    washout_time,
)

AIR = 0.209  # oxygen in dry air, as rules/oxygen.yaml oxygen.ambient (published)

LPM = 1e-3 / 60.0  # m³/s in one litre per minute


def test_steady_state_mixing() -> None:
    assert pocket_steady_state(4 * LPM, 1.0, 0.0, 4 * LPM, ambient=AIR) == pytest.approx(
        (1.0 + 0.209) / 2
    )
    # The non-oxygen part of the delivered gas is inert.
    assert pocket_steady_state(2 * LPM, 0.5, 0.0, 0.0, ambient=AIR) == pytest.approx(0.5)
    # Nitrous oxide counts wholly as oxidant.
    assert pocket_steady_state(0.0, 0.0, 3 * LPM, 3 * LPM, ambient=AIR) == pytest.approx(
        (1.0 + 0.209) / 2
    )


def test_steady_state_zero_flows_is_ambient() -> None:
    assert pocket_steady_state(0.0, 1.0, 0.0, 0.0, ambient=AIR) == 0.209
    assert pocket_steady_state(0.0, 1.0, 0.0, 0.0, ambient=0.2095) == 0.2095
    assert pocket_steady_state(0.0, 1.0, 0.0, 5 * LPM, ambient=AIR) == pytest.approx(0.209)


def test_steady_state_rejects_bad_inputs() -> None:
    with pytest.raises(ValueError):
        pocket_steady_state(-1.0, 1.0, 0.0, 0.0, ambient=AIR)
    with pytest.raises(ValueError):
        pocket_steady_state(1.0, 1.5, 0.0, 0.0, ambient=AIR)
    with pytest.raises(ValueError):
        pocket_steady_state(1.0, 1.0, math.nan, 0.0, ambient=AIR)


def test_outflow() -> None:
    assert pocket_outflow(1.0, 2.0, 3.0) == 6.0


def test_pocket_fraction_approach() -> None:
    v, q = 0.03, 12 * LPM
    assert pocket_fraction(0.0, 0.209, 0.47, v, q) == 0.209
    assert pocket_fraction(v / q, 0.209, 0.47, v, q) == pytest.approx(
        0.47 + (0.209 - 0.47) / math.e
    )
    assert pocket_fraction(math.inf, 0.209, 0.47, v, q) == 0.47
    assert pocket_fraction(100.0, 0.3, 0.47, v, 0.0) == 0.3


def test_pocket_rejects_bad_volume_and_time() -> None:
    with pytest.raises(ValueError):
        pocket_fraction(1.0, 0.2, 0.3, 0.0, 1.0)
    with pytest.raises(ValueError):
        pocket_fraction(-1.0, 0.2, 0.3, 1.0, 1.0)


def test_buildup_time_inverts_pocket_fraction() -> None:
    v, q = 0.03, 12 * LPM
    t = buildup_time(0.30, 0.209, 0.47, v, q)
    assert pocket_fraction(t, 0.209, 0.47, v, q) == pytest.approx(0.30, rel=1e-12)


def test_buildup_edges() -> None:
    assert buildup_time(0.235, 0.30, 0.47, 0.03, 1e-4) == 0.0  # already above
    assert buildup_time(0.235, 0.235, 0.47, 0.03, 1e-4) == 0.0
    assert buildup_time(0.5, 0.209, 0.47, 0.03, 1e-4) == math.inf  # never reached
    assert buildup_time(0.47, 0.209, 0.47, 0.03, 1e-4) == math.inf  # only approached
    assert buildup_time(0.3, 0.209, 0.47, 0.03, 0.0) == math.inf  # nothing flows


def test_washout_inverts_fraction_after_stop() -> None:
    v, q = 0.05, 10 * LPM
    t = washout_time(0.45, 0.235, v, q, ambient=AIR)
    assert fraction_after_stop(0.45, t, v, q, ambient=AIR) == pytest.approx(0.235, rel=1e-12)


def test_washout_edges() -> None:
    assert washout_time(0.22, 0.235, 0.05, 1e-4, ambient=AIR) == 0.0  # already below
    assert washout_time(0.235, 0.235, 0.05, 1e-4, ambient=AIR) == 0.0
    assert washout_time(0.45, 0.209, 0.05, 1e-4, ambient=AIR) == math.inf  # ambient only approached
    assert washout_time(0.45, 0.235, 0.05, 0.0, ambient=AIR) == math.inf  # no fresh air
    with pytest.raises(ValueError):
        washout_time(0.45, 0.235, 0.0, 1e-4, ambient=AIR)


def test_fraction_after_stop_edges() -> None:
    assert fraction_after_stop(0.45, 0.0, 0.05, 1e-4, ambient=AIR) == 0.45
    assert fraction_after_stop(0.45, 1e9, 0.05, 1e-4, ambient=AIR) == pytest.approx(0.209)
    assert fraction_after_stop(0.45, 100.0, 0.05, 0.0, ambient=AIR) == 0.45


def test_room_rise_small_for_open_delivery() -> None:
    rise = room_oxidant_rise(4 * LPM, 1.0, 0.0, 140.0, 25 / 3600, ambient=AIR)
    q_room = 140.0 * 25 / 3600
    assert rise == pytest.approx(4 * LPM * (1 - 0.209) / (4 * LPM + q_room), rel=1e-12)
    assert 1e-5 < rise < 1e-4
    assert room_oxidant_rise(0.0, 1.0, 0.0, 140.0, 25 / 3600, ambient=AIR) == 0.0
    assert room_oxidant_rise(0.0, 1.0, 0.0, 140.0, 0.0, ambient=AIR) == 0.0


flows = st.floats(min_value=0.0, max_value=20 * LPM, allow_subnormal=False)


# Property: more oxygen flow never lowers the site fraction. It holds whenever the
# delivered gas is at least as rich as the pocket: pure oxygen with any nitrous oxide,
# or any mixture not leaner than air without it (a 50 % mix does dilute pure N2O).
@given(flows, flows, flows, flows)
def test_more_pure_oxygen_never_lowers_the_fraction(
    q1: float, q2: float, n2o: float, q_e: float
) -> None:
    low, high = sorted((q1, q2))
    assert pocket_steady_state(high, 1.0, n2o, q_e, ambient=AIR) >= pocket_steady_state(
        low, 1.0, n2o, q_e, ambient=AIR
    ) * (1 - 1e-12)


@given(flows, flows, st.floats(min_value=0.209, max_value=1.0), flows)
def test_more_oxygen_flow_never_lowers_the_fraction(
    q1: float, q2: float, f_o: float, q_e: float
) -> None:
    low, high = sorted((q1, q2))
    assert pocket_steady_state(high, f_o, 0.0, q_e, ambient=AIR) >= pocket_steady_state(
        low, f_o, 0.0, q_e, ambient=AIR
    ) * (1 - 1e-12)


# Property: a longer stop never raises the fraction at activation.
@given(
    st.floats(min_value=0.209, max_value=1.0),
    st.floats(min_value=0.0, max_value=3600.0, allow_subnormal=False),
    st.floats(min_value=0.0, max_value=3600.0, allow_subnormal=False),
    st.floats(min_value=1e-3, max_value=1.0),
    flows,
)
def test_a_longer_stop_never_raises_the_fraction(
    c0: float, t1: float, t2: float, volume: float, q_e: float
) -> None:
    short, long = sorted((t1, t2))
    assert fraction_after_stop(c0, long, volume, q_e, ambient=AIR) <= fraction_after_stop(
        c0, short, volume, q_e, ambient=AIR
    )
    assert fraction_after_stop(c0, long, volume, q_e, ambient=AIR) >= 0.209 * (1 - 1e-12)
