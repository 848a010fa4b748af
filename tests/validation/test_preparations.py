"""Flammable-preparation physics checked against published values.

Each check names its source and flag (published | memory | common practice) beside the
assertion. Where the method misses a published value by more than the stated tolerance,
the test is a strict xfail that states both numbers: the miss is reported, not tuned away.
"""

from __future__ import annotations

import math

import pytest
from scipy.optimize import brentq

from ignite.physics.evaporation import (
    air_kinematic_viscosity,
    diffusion_volume,
    diffusivity_fuller,
    film_mass_transfer_coefficient,
    mass_transfer_coefficient_mackay_matsugu,
)
from ignite.physics.vapour import (
    VAPOUR_PRESSURE_CHOICE,
    bubble_point,
    liaw_sum,
    substance,
    vapour_pressure,
)
from ignite.simulate.preparation import analyse_preparation

C = 273.15
P = 101325.0


def flash_point_c(alcohol: str, volume_fraction: float) -> float:
    a = analyse_preparation(
        [(alcohol, volume_fraction), ("water", 1 - volume_fraction)], "volume", 298.15
    )
    assert a.flash_point_K is not None
    return a.flash_point_K - C


def ideal_flash_point_c(alcohol: str, volume_fraction: float) -> float:
    """Liaw's sum with every activity coefficient set to 1 (ideal Raoult's law)."""
    a = analyse_preparation(
        [(alcohol, volume_fraction), ("water", 1 - volume_fraction)], "volume", 298.15
    )
    x = a.mole_fractions[0]
    at_flash = vapour_pressure(alcohol, substance(alcohol).flash_point)
    return (
        brentq(
            lambda t: liaw_sum([x], [1.0], [vapour_pressure(alcohol, t)], [at_flash]) - 1, 250, 400
        )
        - C
    )


# --- Mixture flash point: aqueous ethanol, closed cup, % by volume ------------------------
# Published series (physics.md §4): 10 % 49 °C, 20 % 36, 30 % 29, 40 % 26, 50 % 24,
# 60 % 22, 70 % 21, 80 % 20, 90 % 17 °C. The series stops at 90 %; the 96 % value below is
# from memory. The activity model is modified UNIFAC (Dortmund): the comparison with
# original UNIFAC is tests/validation/test_activity_models.py.

ETHANOL_SERIES = [
    (0.30, 29.0),
    (0.40, 26.0),
    (0.50, 24.0),
    (0.60, 22.0),
    (0.70, 21.0),
    (0.80, 20.0),
    (0.90, 17.0),
]


@pytest.mark.parametrize(("fraction", "published"), ETHANOL_SERIES)
def test_aqueous_ethanol_flash_point_30_to_90_percent(fraction, published):
    # aqueous ethanol closed-cup flash points (published), tolerance 2 °C
    assert flash_point_c("ethanol", fraction) == pytest.approx(published, abs=2.0)


@pytest.mark.parametrize(("fraction", "published"), [(0.10, 49.0), (0.20, 36.0)])
def test_aqueous_ethanol_flash_point_10_and_20_percent(fraction, published):
    # 10 % v/v: 49 °C, 20 % v/v: 36 °C closed cup (published), tolerance 5 °C;
    # computed 46.3 and 35.5 °C (original UNIFAC: 41.9 and 32.7 °C)
    assert flash_point_c("ethanol", fraction) == pytest.approx(published, abs=5.0)


def test_aqueous_ethanol_flash_point_96_percent():
    # 96 % v/v ethanol: 17 °C closed cup (memory: the °F table behind the series above
    # gives 62 °F at 95 %; safety data sheets of 96 % ethanol give 13-17 °C). Computed
    # 13.8 °C, 3 K below: on the safe side; tolerance 4 °C, below only.
    computed = flash_point_c("ethanol", 0.96)
    assert 17.0 - 4.0 <= computed <= 17.0


@pytest.mark.parametrize(("fraction", "published"), [(0.10, 49.0), (0.20, 36.0)])
def test_dilute_ethanol_errs_on_the_safe_side(fraction, published):
    # Where the method misses (dilute ethanol), it predicts a lower flash point than
    # measured (published series above): it says 'flammable' too early, never too late.
    assert flash_point_c("ethanol", fraction) < published


@pytest.mark.parametrize(("fraction", "published"), [(0.10, 49.0), (0.30, 29.0), (0.50, 24.0)])
def test_ideal_raoult_is_badly_wrong_for_alcohol_water(fraction, published):
    # physics.md §4: ideal Raoult's law is badly wrong below ~80 % alcohol. Against the
    # published closed-cup series it misses by far more than UNIFAC's 2 °C.
    assert abs(ideal_flash_point_c("ethanol", fraction) - published) > 10.0
    assert abs(flash_point_c("ethanol", fraction) - published) < abs(
        ideal_flash_point_c("ethanol", fraction) - published
    )


def test_pure_isopropanol_flash_point():
    # pure isopropanol: 12 °C closed cup (published, safety data)
    assert flash_point_c("isopropanol", 1.0) == pytest.approx(12.0, abs=1.0)


@pytest.mark.xfail(
    strict=True,
    reason="Liaw + modified UNIFAC (Dortmund) gives 16.0 °C for 91 % v/v isopropanol "
    "against 14 °C published: 2.0 K high, on the unsafe side (original UNIFAC: 16.2 °C)",
)
def test_isopropanol_91_percent_flash_point_on_the_safe_side():
    # 91 % isopropanol: 14 °C closed cup (published, safety data): the computed flash point
    # must not lie above it (a flash point that is too high says 'not flammable' too late)
    assert flash_point_c("isopropanol", 0.91) <= 14.0


# --- Pure-substance data, as read through chemicals ----------------------------------------


@pytest.mark.parametrize(("name", "lfl"), [("isopropanol", 0.020), ("ethanol", 0.031)])
def test_lower_flammable_limits(name, lfl):
    # LFL: isopropanol 2.0 %, ethanol 3.1 % (IEC 60079-20-1:2010 via chemicals; published)
    assert substance(name).lfl == pytest.approx(lfl, abs=5e-4)


@pytest.mark.parametrize(
    ("name", "low_c", "high_c"),
    [("isopropanol", 399.0, 399.0), ("ethanol", 363.0, 365.0), ("diethyl ether", 160.0, 160.0)],
)
def test_autoignition_temperatures(name, low_c, high_c):
    # physics.md §7: isopropanol 399 °C, ethanol 363-365 °C, diethyl ether 160 °C (published)
    assert low_c - 0.5 <= substance(name).autoignition - C <= high_c + 0.5


def test_water_vapour_pressure_and_boiling_point():
    # IAPWS-95: 3169.9 Pa at 25 °C; boils at 99.97 °C under 101.325 kPa (published)
    assert vapour_pressure("water", 298.15) == pytest.approx(3169.9, rel=1e-3)
    assert bubble_point(["water"], [1.0]) - C == pytest.approx(99.97, abs=0.02)


# Vapour pressures at 25 °C. The correlation for each solvent (VAPOUR_PRESSURE_CHOICE) is
# the one of thermo's that agrees with these; isopropanol's Wagner-type sets (McGarry;
# Poling et al.; VDI PPDS) give 5.78-5.80 kPa, 4 % low, and are not used.
VAPOUR_PRESSURES_25C = [
    ("water", 3169.9),  # IAPWS-95 (Wagner & Pruss 2002; published)
    ("ethanol", 7870.0),  # CRC Handbook of Chemistry and Physics, vapour pressure table (memory)
    ("isopropanol", 6050.0),  # CRC Handbook of Chemistry and Physics (memory)
    ("methanol", 16900.0),  # CRC Handbook of Chemistry and Physics (memory)
    ("acetone", 30800.0),  # CRC Handbook of Chemistry and Physics (memory)
]


@pytest.mark.parametrize(("name", "published"), VAPOUR_PRESSURES_25C)
def test_vapour_pressures_at_25_c(name, published):
    # sources and flags beside each value above; tolerance 1 %
    assert vapour_pressure(name, 298.15) == pytest.approx(published, rel=0.01)
    assert substance(name).vapour_pressure_method == VAPOUR_PRESSURE_CHOICE[substance(name).cas]


def test_isopropanol_vapour_pressure_at_20_c():
    # isopropanol 4.4 kPa at 20 °C (safety data sheets; memory), tolerance 3 % (two figures)
    assert vapour_pressure("isopropanol", 293.15) == pytest.approx(4400.0, rel=0.03)


def test_air_kinematic_viscosity():
    # air at 300 K and 1 atm: 15.89e-6 m²/s (Incropera & DeWitt, Table A.4; memory)
    assert air_kinematic_viscosity(300.0) == pytest.approx(15.89e-6, rel=0.01)


# --- Diffusivities in air at 25 °C: Fuller-Schettler-Giddings against measurement ------


def fuller(name: str) -> float:
    s = substance(name)
    return diffusivity_fuller(298.15, P, s.molar_mass, diffusion_volume(s.formula))


@pytest.mark.parametrize(("name", "published"), [("water", 2.60e-5), ("methanol", 1.62e-5)])
def test_fuller_diffusivities(name, published):
    # water 2.60e-5, methanol 1.62e-5 m²/s at 25 °C (Welty, Wicks & Wilson; published), 5 %
    assert fuller(name) == pytest.approx(published, rel=0.05)


@pytest.mark.xfail(
    strict=True,
    reason="Fuller gives 1.225e-5 m²/s for ethanol against 1.32e-5 published: 7 % low",
)
def test_fuller_diffusivity_of_ethanol():
    # ethanol 1.32e-5 m²/s at 25 °C (Welty, Wicks & Wilson; published), 5 %
    assert fuller("ethanol") == pytest.approx(1.32e-5, rel=0.05)


def test_fuller_diffusivity_of_isopropanol():
    # isopropanol ~1.0e-5 m²/s at 25 °C by Fuller-Schettler-Giddings (Poling et al.
    # eq. 11-4.4, as quoted in physics.md §4; memory)
    assert fuller("isopropanol") == pytest.approx(1.0e-5, rel=0.05)


# --- Pure-liquid evaporation against Mackay & Matsugu (1973) ---------------------------
# Both models give the flux as k·c_sat for a pure liquid in clean air, so the rates stand
# in the ratio of their k. Mackay & Matsugu fitted pools under wind; the laminar plate
# holds below Re 5e5. Their common ground in a theatre: 0.2-1 m/s over 0.2-1 m. (At 2 m/s
# over 0.5-1 m the laminar plate gives 0.44-0.58 of Mackay & Matsugu: the turbulent wind
# they fitted is outside its reach.)


@pytest.mark.parametrize("name", ["water", "ethanol"])
@pytest.mark.parametrize("speed", [0.2, 0.5, 1.0])
@pytest.mark.parametrize("size", [0.2, 0.5, 1.0])
def test_pure_liquid_rates_within_a_factor_of_two_of_mackay_matsugu(name, speed, size):
    t = 293.15
    d = diffusivity_fuller(
        t, P, substance(name).molar_mass, diffusion_volume(substance(name).formula)
    )
    nu = air_kinematic_viscosity(t)
    ours, regime = film_mass_transfer_coefficient(d, nu, speed, size, size * size, 0.0)
    assert regime == "forced"
    theirs = mass_transfer_coefficient_mackay_matsugu(speed, size, nu / d)
    # Mackay & Matsugu (1973), constants 0.0292, 0.78, -0.11, -0.67 (memory): factor of two
    assert 0.5 <= ours / theirs <= 2.0


def test_mackay_matsugu_worked_value():
    # Mackay & Matsugu (1973) (memory): k = 0.0292·U^0.78·X^-0.11·Sc^-0.67 m/h with
    # U = 3600 m/h (1 m/s), X = 1 m, Sc = 1: 0.0292·3600^0.78 m/h
    expected = 0.0292 * 3600**0.78 / 3600
    assert mass_transfer_coefficient_mackay_matsugu(1.0, 1.0, 1.0) == pytest.approx(expected)
    assert math.isclose(expected * 3600, 17.34, rel_tol=1e-3)
