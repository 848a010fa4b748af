"""Evaporation from a liquid film: gas properties, diffusivities and mass-transfer coefficients.

Each volatile component leaves a film at the flux

    N_i = k_i · (c_i,surface − c_i,far),    c_i,surface = x_i·γ_i·P_sat,i(T_film) / (R·T_film)

with k_i from the laminar flat plate in the air stream, floored by natural convection
over the warm film and by steady diffusion for still air (`film_mass_transfer_coefficient`).
`ignite.simulate.drying` integrates the film and the drape pocket over it in time.

Units: lengths [m], areas [m²], speeds [m/s], temperatures [K], pressures [Pa],
diffusivities [m²/s], mass-transfer coefficients [m/s].

The coefficients err high (towards fast evaporation): the weight of the vapour, which
damps natural convection over an alcohol film, is left out.
"""

from __future__ import annotations

import math

from ignite.physics.vapour import STANDARD_PRESSURE

__all__ = [
    "AIR_MOLAR_MASS",
    "GAS_CONSTANT",
    "STANDARD_GRAVITY",
    "air_kinematic_viscosity",
    "diffusion_volume",
    "diffusivity_at_temperature",
    "diffusivity_fuller",
    "film_mass_transfer_coefficient",
    "mass_transfer_coefficient_mackay_matsugu",
    "mass_transfer_coefficient_still_disc",
    "sherwood_laminar_plate",
    "sherwood_natural_convection",
]

GAS_CONSTANT = 8.314462618
"""Molar gas constant R [J/(mol·K)] (CODATA 2018, exact)."""

STANDARD_GRAVITY = 9.80665
"""g [m/s²] (CGPM 1901)."""

AIR_MOLAR_MASS = 0.0289586
"""Molar mass of dry air [kg/mol] (Lemmon et al. 2000, as in `chemicals`' air correlations)."""

# Atomic and molecular diffusion volumes of the Fuller-Schettler-Giddings method
# (Poling, Prausnitz & O'Connell, The Properties of Gases and Liquids, 5th ed., Table 11-1).
_ATOMIC_DIFFUSION_VOLUMES = {
    "C": 15.9,
    "H": 2.31,
    "O": 6.11,
    "N": 4.54,
    "F": 14.7,
    "Cl": 21.0,
    "Br": 21.9,
    "I": 29.8,
    "S": 22.9,
}
_MOLECULAR_DIFFUSION_VOLUMES = {"H2O": 13.1, "N2": 18.5, "O2": 16.3, "CO2": 26.9, "NH3": 20.7}
_AIR_DIFFUSION_VOLUME = 19.7


def air_kinematic_viscosity(temperature: float, pressure: float = STANDARD_PRESSURE) -> float:
    """Kinematic viscosity of dry air, ν = μ/ρ [m²/s].

    μ from Lemmon & Jacobsen (2004) as implemented in `chemicals`; ρ from the ideal-gas law.

    Worked example at 20 °C: handbook tables give 1.51e-5 m²/s (Incropera & DeWitt,
    Table A.4; memory):

    >>> round(air_kinematic_viscosity(293.15) * 1e5, 2)
    1.51

    Reference: Lemmon & Jacobsen, Int. J. Thermophys. 25 (2004) 21-69.
    """
    from chemicals.viscosity import mu_air_lemmon

    molar_density = pressure / (GAS_CONSTANT * temperature)
    viscosity = mu_air_lemmon(temperature, molar_density)
    return float(viscosity) / (molar_density * AIR_MOLAR_MASS)


def diffusivity_at_temperature(
    diffusivity: float, temperature: float, reference_temperature: float
) -> float:
    """A gas diffusivity moved to another temperature: D(T) = D_ref · (T / T_ref)^1.75.

    The exponent is that of the Fuller-Schettler-Giddings correlation.

    Worked example, ethanol in air, 1.32e-5 m²/s at 25 °C (Welty, Wicks & Wilson) moved to 32 °C:

    >>> round(diffusivity_at_temperature(1.32e-5, 305.15, 298.15) * 1e5, 3)
    1.375

    Reference: Fuller, Schettler & Giddings, Ind. Eng. Chem. 58 (1966) 18-27.
    """
    return diffusivity * (temperature / reference_temperature) ** 1.75


def diffusion_volume(formula: str) -> float:
    """Fuller diffusion volume Σv of a molecule from its formula [-].

    Sums atomic volumes (C 15.9, H 2.31, O 6.11, ...); water and a few small molecules
    take their own tabulated volumes. The aromatic and heterocyclic ring
    correction (−18.3 per ring) is not applied, since a formula does not show rings.

    >>> round(diffusion_volume("C3H8O"), 2)      # isopropanol: 3·15.9 + 8·2.31 + 6.11
    72.29

    Reference: Poling, Prausnitz & O'Connell, The Properties of Gases and Liquids,
    5th ed. (2001), Table 11-1.
    """
    if formula in _MOLECULAR_DIFFUSION_VOLUMES:
        return _MOLECULAR_DIFFUSION_VOLUMES[formula]
    from chemicals.elements import simple_formula_parser

    atoms = simple_formula_parser(formula)
    unknown = sorted(set(atoms) - set(_ATOMIC_DIFFUSION_VOLUMES))
    if unknown:
        raise ValueError(f"no Fuller diffusion volume for {', '.join(unknown)} in {formula}")
    return sum(_ATOMIC_DIFFUSION_VOLUMES[a] * n for a, n in atoms.items())


def diffusivity_fuller(
    temperature: float, pressure: float, molar_mass: float, volume: float
) -> float:
    """Diffusivity of a vapour in air by Fuller, Schettler & Giddings [m²/s].

        D = 1.43e-7 · T^1.75 / (P_bar · M_AB^½ · (Σv_A^⅓ + Σv_air^⅓)²)

    with D in m²/s, T in K, P in bar, M_AB = 2/(1/M_A + 1/M_air) in g/mol.
    temperature [K];  pressure [Pa];  molar_mass of the vapour [kg/mol];
    volume : its diffusion volume Σv (`diffusion_volume`).

    Worked example, isopropanol at 25 °C and 1 atm, where physics.md gives ~1.0e-5 m²/s:

    >>> round(diffusivity_fuller(298.15, 101325.0, 0.06010, diffusion_volume("C3H8O")) * 1e5, 2)
    1.02

    Reference: Poling, Prausnitz & O'Connell, The Properties of Gases and Liquids,
    5th ed. (2001), eq. 11-4.4.
    """
    m_vapour = molar_mass * 1000.0
    m_air = AIR_MOLAR_MASS * 1000.0
    m_ab = 2.0 / (1.0 / m_vapour + 1.0 / m_air)
    denominator = (
        (pressure / 1e5)
        * math.sqrt(m_ab)
        * (volume ** (1 / 3) + _AIR_DIFFUSION_VOLUME ** (1 / 3)) ** 2
    )
    return 1.43e-7 * temperature**1.75 / denominator


def sherwood_laminar_plate(reynolds: float, schmidt: float) -> float:
    """Average Sherwood number over a flat plate in laminar flow: Sh = 0.664·Re^½·Sc^⅓.

    Re = u·L/ν, Sc = ν/D, Sh = k·L/D over the plate length L; valid for Re < 5e5
    and Sc ≥ 0.6 (the heat-transfer result by the heat-mass analogy).

    Worked example, air at 0.2 m/s over 0.2 m of film, ν 1.6e-5 m²/s (Re 2500), Sc 1.5:

    >>> round(sherwood_laminar_plate(2500.0, 1.5), 1)
    38.0

    Reference: Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, eq. 7.34
    (Pohlhausen's solution).
    """
    return 0.664 * math.sqrt(reynolds) * schmidt ** (1 / 3)


def sherwood_natural_convection(rayleigh: float) -> float:
    """Sherwood number for free convection above a warm horizontal surface facing up.

        Sh = 0.54·Ra^¼ (Ra ≤ 1e7),  0.15·Ra^⅓ (above)

    Ra = g·β·ΔT·L³/(ν·D) with β = 1/T and L = area/perimeter: the Rayleigh number of
    the heat-mass analogy. Below Ra ≈ 1e4 the correlation is extrapolated; the
    diffusion floor then governs.

    Worked example, Ra 1e5 (a 400 cm² patch some 5 K above the room):

    >>> round(sherwood_natural_convection(1e5), 2)
    9.6

    Reference: Lloyd & Moran, J. Heat Transfer 96 (1974) 443; Incropera & DeWitt,
    Fundamentals of Heat and Mass Transfer, eqs. 9.30-9.31.
    """
    rayleigh = max(rayleigh, 0.0)
    if rayleigh <= 1e7:
        return 0.54 * rayleigh**0.25
    return 0.15 * rayleigh ** (1 / 3)


def mass_transfer_coefficient_still_disc(diffusivity: float, area: float) -> float:
    """Mass-transfer coefficient of a wetted disc into still, unbounded air [m/s].

    The steady diffusion flux from a disc of radius a at uniform concentration into a
    half-space is 4·D·a·Δc, so the mean k = 4·D·a/(π·a²) = 8·D/(π·d). The disc takes the
    film's area. This is the floor no air movement can go below.

    Worked example, 400 cm² of ethanol film (D 1.32e-5 m²/s):

    >>> round(mass_transfer_coefficient_still_disc(1.32e-5, 0.04) * 1e4, 2)
    1.49

    Reference: Crank, The Mathematics of Diffusion, 2nd ed. (1975), §5.3; Picknett &
    Bexon, J. Colloid Interface Sci. 61 (1977) 336.
    """
    diameter = math.sqrt(4.0 * area / math.pi)
    return 8.0 * diffusivity / (math.pi * diameter)


def mass_transfer_coefficient_mackay_matsugu(
    air_speed: float, pool_diameter: float, schmidt: float
) -> float:
    """Mass-transfer coefficient over an evaporating pool by Mackay & Matsugu [m/s].

        k = 0.0292 · U^0.78 · X^−0.11 · Sc^−0.67    (k in m/h, U in m/h, X in m)

    Used here only to cross-check the laminar flat-plate model. The constants are
    memory: confirm against the source.

    >>> round(mass_transfer_coefficient_mackay_matsugu(1.0, 0.5, 1.5) * 1e3, 2)
    3.96

    Reference: Mackay & Matsugu, Can. J. Chem. Eng. 51 (1973) 434-439.
    """
    speed_m_per_h = air_speed * 3600.0
    k_m_per_h = 0.0292 * speed_m_per_h**0.78 * pool_diameter**-0.11 * schmidt**-0.67
    return k_m_per_h / 3600.0


def film_mass_transfer_coefficient(
    diffusivity: float,
    kinematic_viscosity: float,
    air_speed: float,
    flow_length: float,
    area: float,
    warmth: float,
    still_layer: float = 0.0,
) -> tuple[float, str]:
    """Mass-transfer coefficient of one vapour from a film patch [m/s], and what set it.

    k = max(forced, natural, diffusion), then a still-air layer δ in series:
        forced    Sh = 0.664·Re^½·Sc^⅓ over flow_length (sherwood_laminar_plate)
        natural   Sh(Ra) over area/perimeter of a square patch, when the film is warmer
                  than the air (sherwood_natural_convection)
        diffusion k = 8·D/(π·d) (mass_transfer_coefficient_still_disc)
        1/k_eff = 1/k + δ/D

    warmth : β·ΔT = (T_film − T_air)/T_mean [-], the thermal buoyancy of the film.
    The weight of the vapour, which damps this convection over an alcohol film, is
    left out, so k errs high: computed drying times are floors and pocket peaks err
    high, never the other way round.
    Returns (k [m/s], one of 'forced', 'natural convection', 'diffusion').

    Worked example, ethanol (D 1.37e-5 m²/s) from 400 cm² in air at 0.2 m/s,
    ν 1.6e-5 m²/s, film 12 K above the room (warmth 0.04). Over so small a patch the
    warm film's own convection beats the air stream (forced alone gives 2.39e-3 m/s):

    >>> k, regime = film_mass_transfer_coefficient(1.37e-5, 1.6e-5, 0.2, 0.2, 0.04, 0.04)
    >>> round(k * 1e3, 2), regime
    (3.22, 'natural convection')
    """
    schmidt = kinematic_viscosity / diffusivity
    candidates: dict[str, float] = {}
    if air_speed > 0.0:
        reynolds = air_speed * flow_length / kinematic_viscosity
        candidates["forced"] = sherwood_laminar_plate(reynolds, schmidt) * diffusivity / flow_length
    if warmth > 0.0:
        length = math.sqrt(area) / 4.0
        grashof = STANDARD_GRAVITY * warmth * length**3 / kinematic_viscosity**2
        sherwood = sherwood_natural_convection(grashof * schmidt)
        candidates["natural convection"] = sherwood * diffusivity / length
    candidates["diffusion"] = mass_transfer_coefficient_still_disc(diffusivity, area)
    regime = max(candidates, key=lambda name: candidates[name])
    k = candidates[regime]
    if still_layer > 0.0:
        k = 1.0 / (1.0 / k + still_layer / diffusivity)
    return k, regime
