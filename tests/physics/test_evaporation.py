"""Unit tests for ignite.physics.evaporation: gas properties, diffusivities, mass transfer."""

from __future__ import annotations

import math

import pytest

from ignite.physics.evaporation import (
    air_kinematic_viscosity,
    buoyancy_fraction,
    diffusion_volume,
    diffusivity_at_temperature,
    diffusivity_fuller,
    film_mass_transfer_coefficient,
    heat_transfer_coefficient_chilton_colburn,
    mass_transfer_coefficient_mackay_matsugu,
    mass_transfer_coefficient_still_disc,
    sherwood_laminar_plate,
    sherwood_natural_convection,
)

P = 101325.0


# --- gas properties and diffusivities --------------------------------------------------


def test_air_viscosity_rises_with_temperature_and_falls_with_pressure():
    assert air_kinematic_viscosity(310.0) > air_kinematic_viscosity(290.0)
    # ν = μ/ρ and μ hardly depends on pressure: ν halves when the density doubles.
    assert air_kinematic_viscosity(300.0, 2 * P) == pytest.approx(
        air_kinematic_viscosity(300.0) / 2, rel=1e-3
    )


def test_diffusivity_scales_with_the_fuller_exponent():
    assert diffusivity_at_temperature(1e-5, 298.15, 298.15) == 1e-5
    assert diffusivity_at_temperature(1e-5, 2 * 298.15, 298.15) == pytest.approx(1e-5 * 2**1.75)


def test_diffusion_volumes():
    assert diffusion_volume("H2O") == 13.1  # a tabulated molecule, not its atoms
    assert diffusion_volume("C2H6O") == pytest.approx(2 * 15.9 + 6 * 2.31 + 6.11)
    with pytest.raises(ValueError):
        diffusion_volume("NaCl")


def test_fuller_diffusivity_scales_with_pressure_and_temperature():
    d = diffusivity_fuller(300.0, P, 0.046, 51.77)
    assert diffusivity_fuller(300.0, 2 * P, 0.046, 51.77) == pytest.approx(d / 2)
    assert diffusivity_fuller(600.0, P, 0.046, 51.77) == pytest.approx(d * 2**1.75)


# --- mass-transfer correlations -------------------------------------------------------


def test_laminar_plate_scaling():
    base = sherwood_laminar_plate(1000.0, 1.0)
    assert sherwood_laminar_plate(4000.0, 1.0) == pytest.approx(2 * base)
    assert sherwood_laminar_plate(1000.0, 8.0) == pytest.approx(2 * base)


def test_natural_convection_branches():
    assert sherwood_natural_convection(0.0) == 0.0
    assert sherwood_natural_convection(1e6) == pytest.approx(0.54 * 1e6**0.25)
    assert sherwood_natural_convection(1e8) == pytest.approx(0.15 * 1e8 ** (1 / 3))


def test_still_disc_sherwood_is_eight_over_pi():
    area = 0.03
    diameter = math.sqrt(4 * area / math.pi)
    k = mass_transfer_coefficient_still_disc(2e-5, area)
    assert k * diameter / 2e-5 == pytest.approx(8 / math.pi)


def test_mackay_matsugu_wind_exponent():
    slow = mass_transfer_coefficient_mackay_matsugu(1.0, 0.5, 1.0)
    assert mass_transfer_coefficient_mackay_matsugu(2.0, 0.5, 1.0) == pytest.approx(slow * 2**0.78)


def test_still_air_without_buoyancy_is_diffusion():
    k, regime = film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.0, 0.2, 0.04, 0.0)
    assert regime == "diffusion-limited"
    assert k == pytest.approx(mass_transfer_coefficient_still_disc(1e-5, 0.04))


def test_moving_air_is_forced_and_still_air_over_a_light_gas_is_natural():
    assert film_mass_transfer_coefficient(1e-5, 1.5e-5, 1.0, 0.2, 0.04, 0.0)[1] == "forced"
    assert film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.0, 0.2, 0.04, 0.04)[1] == "natural"
    # A gas at the film heavier than the air drives no convection: diffusion is the floor.
    assert film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.0, 0.2, 0.04, -0.04)[1] == (
        "diffusion-limited"
    )


def test_comparable_forced_and_natural_terms_are_mixed_and_add_up():
    forced, _ = film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.1, 0.2, 0.04, 0.0)
    natural, _ = film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.0, 0.2, 0.04, 0.02)
    both, regime = film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.1, 0.2, 0.04, 0.02)
    assert regime == "mixed"
    assert both == pytest.approx((forced**3 + natural**3) ** (1 / 3))
    assert both > max(forced, natural)


def test_heavier_gas_at_the_film_gets_no_natural_convection():
    still = film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.3, 0.2, 0.04, 0.0)[0]
    assert film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.3, 0.2, 0.04, -0.06)[0] == still


def test_buoyancy_from_temperature_and_composition():
    # same gas warmer: lighter; same temperature heavier gas: denser
    assert buoyancy_fraction(0.029, 310.0, 0.029, 300.0) == pytest.approx(1 - 300 / 310)
    assert buoyancy_fraction(0.031, 300.0, 0.029, 300.0) < 0.0


def test_chilton_colburn_at_unit_lewis_number_is_k_rho_cp():
    assert heat_transfer_coefficient_chilton_colburn(
        2e-3, 1.2, 1005.0, 2e-5, 2e-5
    ) == pytest.approx(2e-3 * 1.2 * 1005.0)


def test_still_layer_adds_a_diffusion_resistance():
    open_k, _ = film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.5, 0.2, 0.04, 0.0)
    held_k, _ = film_mass_transfer_coefficient(1e-5, 1.5e-5, 0.5, 0.2, 0.04, 0.0, 0.005)
    assert held_k == pytest.approx(1 / (1 / open_k + 0.005 / 1e-5))
    assert held_k < min(open_k, 1e-5 / 0.005)
