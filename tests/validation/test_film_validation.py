"""The film's heat balance and mass transfer against values from outside the project.

Published values, with source and flag beside each assertion; regression tests of our
own output live in tests/simulate/.
"""

from __future__ import annotations

import dataclasses
import math
from itertools import pairwise

import pytest
from conftest import PREP_ASSUMPTIONS
from hypothesis import given, settings
from hypothesis import strategies as st

from ignite.physics.evaporation import (
    air_kinematic_viscosity,
    diffusion_volume,
    diffusivity_fuller,
    film_mass_transfer_coefficient,
    mass_transfer_coefficient_mackay_matsugu,
    sherwood_laminar_plate,
)
from ignite.physics.vapour import substance
from ignite.simulate.drying import DrapePlan, DrapePocket, Film, RoomAir, simulate_prep
from ignite.simulate.film import FilmModel, film_diffusivities, film_patches
from ignite.simulate.preparation import analyse_preparation

P = 101325.0

ASSUMPTIONS = PREP_ASSUMPTIONS


# --- a water film with no heat from below sits at the wet-bulb temperature -------------


@pytest.fixture(scope="module")
def water():
    return analyse_preparation([("water", 1.0)], "volume", 298.15)


def _water_film_temperature(
    water, dry_bulb: float, rh: float, speed: float, lewis_exponent: float
) -> float:
    patches = film_patches(
        1e-6,
        0.01,
        hair=False,
        pooling=False,
        hair_still_layer=0.0,
        hair_exposed_fraction=1.0,
        pooling_volume_fraction=0.0,
        pooling_area_fraction=0.0,
    )
    diffusivities, _ = film_diffusivities(water, ASSUMPTIONS, dry_bulb, P)
    model = FilmModel(
        water,
        patches,
        air_speed=speed,
        under_drape_air_speed=0.0,
        skin_temperature=dry_bulb,
        air_temperature=dry_bulb,
        relative_humidity=rh,
        pocket_volume=0.03,
        pocket_exchange=0.0,
        diffusivities=diffusivities,
        pressure=P,
        tissue_conductance=0.0,  # no skin heat
        emissivity=0.0,  # the psychrometric wet bulb: radiation shielded
        lewis_exponent=lewis_exponent,
    )
    surface = model.surface(0, model.initial, model.room, covered=False)
    assert surface is not None
    return surface.temperature


_WET_BULB_POINTS = [
    (20.0, 0.6),
    (25.0, 0.5),
    (15.0, 0.8),
    (25.0, 0.7),
    (20.0, 0.3),
    (30.0, 0.2),
    (35.0, 0.4),
]


def _psychrolib_wet_bulb(dry_bulb_c: float, rh: float) -> float:
    import psychrolib

    psychrolib.SetUnitSystem(psychrolib.SI)
    return float(psychrolib.GetTWetBulbFromRelHum(dry_bulb_c, rh, P))


@pytest.mark.parametrize(("dry_bulb_c", "rh"), _WET_BULB_POINTS)
def test_water_film_without_skin_heat_sits_at_the_wet_bulb(water, dry_bulb_c, rh):
    """The heat balance itself (latent heat, vapour pressure, humidity, the solve).

    psychrolib's thermodynamic wet bulb assumes the Lewis relation (psychrometric ratio
    h/(k·ρ·c_p) = 1); the film is put on the same footing (analogy exponent 0) so that
    the comparison tests the balance, not the choice of analogy.
    """
    expected = _psychrolib_wet_bulb(dry_bulb_c, rh)
    ours = _water_film_temperature(water, dry_bulb_c + 273.15, rh, 3.0, 0.0) - 273.15
    # ASHRAE Handbook - Fundamentals (2017) ch. 1 psychrometric equations, via psychrolib
    # (published): within 0.5 K of the thermodynamic wet bulb
    assert ours == pytest.approx(expected, abs=0.5)


@pytest.mark.parametrize(("dry_bulb_c", "rh"), _WET_BULB_POINTS)
def test_the_chilton_colburn_film_runs_colder_than_the_wet_bulb(water, dry_bulb_c, rh):
    """The product's analogy, h = k·ρ·c_p·Le^⅔ (Le ≈ 0.85 for water vapour in air, a
    psychrometric ratio ≈ 0.9), reads a film colder than the thermodynamic wet bulb by
    about a tenth of the wet-bulb depression: colder is slower drying, the safe side."""
    expected = _psychrolib_wet_bulb(dry_bulb_c, rh)
    ours = _water_film_temperature(water, dry_bulb_c + 273.15, rh, 3.0, 2.0 / 3.0) - 273.15
    depression = dry_bulb_c - expected
    # ASHRAE Handbook - Fundamentals (2017) ch. 1 via psychrolib (published): never warmer
    # than the thermodynamic wet bulb ...
    assert ours <= expected + 0.05
    # ... and no further below it than a psychrometric ratio of 0.9 explains: the
    # Chilton-Colburn exponent (Incropera & DeWitt eq. 6.60, published) with Le 0.84-0.88
    # moves the film by at most 15 % of the depression
    assert expected - ours <= 0.15 * depression + 0.1


# --- mass transfer: Mackay & Matsugu, and the forced limit of mixed convection ----------


def _coefficients(name: str, speed: float, size: float, buoyancy: float):
    t = 293.15
    found = substance(name)
    d = diffusivity_fuller(t, P, found.molar_mass, diffusion_volume(found.formula))
    nu = air_kinematic_viscosity(t)
    return d, nu, film_mass_transfer_coefficient(d, nu, speed, size, size * size, buoyancy)


@pytest.mark.parametrize("name", ["water", "ethanol", "isopropanol"])
@pytest.mark.parametrize("speed", [0.2, 0.5, 1.0])
def test_pool_without_warmth_within_a_factor_of_two_of_mackay_matsugu(name, speed):
    d, nu, (ours, regime) = _coefficients(name, speed, 0.5, 0.0)
    assert regime == "forced"
    theirs = mass_transfer_coefficient_mackay_matsugu(speed, 0.5, nu / d)
    # Mackay & Matsugu, Can. J. Chem. Eng. 51 (1973) 434, constants 0.0292, 0.78, -0.11,
    # -0.67 (memory): pool evaporation without warmth, within a factor of two
    assert 0.5 <= ours / theirs <= 2.0


@pytest.mark.parametrize("buoyancy", [0.01, 0.04, 0.1])
def test_mixed_convection_tends_to_the_laminar_plate_at_high_air_speed(buoyancy):
    d, nu, (mixed, regime) = _coefficients("ethanol", 10.0, 0.2, buoyancy)
    forced = sherwood_laminar_plate(10.0 * 0.2 / nu, nu / d) * d / 0.2
    # Pohlhausen's laminar plate, Sh = 0.664 Re^1/2 Sc^1/3 (Incropera & DeWitt eq. 7.34,
    # published): at 10 m/s (Re 1.3e5, laminar) the natural term adds less than 1 %
    assert regime == "forced"
    assert mixed == pytest.approx(forced, rel=0.01)
    assert mixed >= forced


# --- drying time: the directions the physics fixes ----------------------------------
# common practice (and the reason for the issue behind these tests): still air, cool
# skin, hair, pooling and more liquid all make a film dry more slowly.


@pytest.fixture(scope="module")
def ipa70():
    return analyse_preparation([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15)


def _open_air_drying(analysis, *, speed=0.2, skin=305.15, hair=False, pooling=False, volume=10e-6):
    out = simulate_prep(
        analysis,
        Film(volume, 0.04, skin, hair=hair, pooling=pooling),
        RoomAir(294.15, 0.3, speed),
        DrapePlan(1e6, 1e6),
        DrapePocket(0.030, 10e-3 / 60),
        ASSUMPTIONS,
    )
    return out.open_air_drying_time_s


def test_drying_time_strictly_increases_as_the_air_slows(ipa70):
    # the case: 10 mL of 70 % isopropanol over 400 cm² on 32 °C skin in 21 °C air
    times = [_open_air_drying(ipa70, speed=v) for v in (0.3, 0.2, 0.1, 0.02, 0.0)]
    assert all(a < b for a, b in pairwise(times))


def test_drying_time_strictly_increases_as_skin_cools_with_hair_pooling_and_volume(ipa70):
    base = _open_air_drying(ipa70)
    assert _open_air_drying(ipa70, skin=301.15) > base
    assert _open_air_drying(ipa70, hair=True) > base
    assert _open_air_drying(ipa70, pooling=True) > base
    assert _open_air_drying(ipa70, volume=15e-6) > base


@settings(max_examples=3, deadline=None)
@given(
    early=st.floats(min_value=0.0, max_value=300.0), wait=st.floats(min_value=30.0, max_value=300.0)
)
def test_draping_earlier_never_shortens_the_drying_time(ipa70, early, wait):
    def drying(draping: float) -> float:
        return simulate_prep(
            ipa70,
            Film(10e-6, 0.04, 305.15),
            RoomAir(294.15, 0.3, 0.2),
            DrapePlan(draping, draping + 60.0),
            DrapePocket(0.030, 10e-3 / 60),
            ASSUMPTIONS,
        ).drying_time_s

    assert drying(early) >= drying(early + wait) * (1 - 1e-6)


def test_evaporative_cooling_lengthens_drying(ipa70):
    # physics: a film held at the skin's temperature (vast tissue conductance) dries faster
    held = dataclasses.replace(ASSUMPTIONS, tissue_conductance=1e9)
    hot = simulate_prep(
        ipa70,
        Film(10e-6, 0.04, 305.15),
        RoomAir(294.15, 0.3, 0.2),
        DrapePlan(1e6, 1e6),
        DrapePocket(0.030, 10e-3 / 60),
        held,
    ).open_air_drying_time_s
    assert hot < _open_air_drying(ipa70)
    assert math.isfinite(hot)
