"""Evaporation from a liquid film: gas properties, diffusivities and mass-transfer coefficients.

Each volatile component leaves a film at the flux

    N_i = k_i · (c_i,surface − c_i,far),    c_i,surface = x_i·γ_i·P_sat,i(T_film) / (R·T_film)

with k_i from forced (laminar flat plate) and natural convection combined as mixed
convection, floored by steady diffusion into still air (`film_mass_transfer_coefficient`).
The natural-convection term is driven by the density difference of the gas at the film
against the room air, from temperature and composition together: no lift where the
vapour-laden gas is the heavier. The heat the film draws from the air follows from the
mass-transfer coefficient by the Chilton–Colburn analogy
(`heat_transfer_coefficient_chilton_colburn`). `ignite.simulate.film` solves the film's
temperature from its heat balance; `ignite.simulate.drying` integrates film and drape
pocket in time.

Units: lengths [m], areas [m²], speeds [m/s], temperatures [K], pressures [Pa],
diffusivities [m²/s], mass-transfer coefficients [m/s], heat-transfer coefficients
[W/(m²·K)], densities [kg/m³], heat capacities [J/(kg·K)].

Where the gas at the film is denser than the air above it, natural convection is taken
as absent (a stably layered gas over an upward-facing film still moves a little), so the
coefficients err low there: towards slow evaporation and long drying times.
"""

from __future__ import annotations

import math

from ignite.physics.vapour import STANDARD_PRESSURE

__all__ = [
    "AIR_MOLAR_MASS",
    "GAS_CONSTANT",
    "STANDARD_GRAVITY",
    "STEFAN_BOLTZMANN",
    "air_heat_capacity",
    "air_kinematic_viscosity",
    "air_thermal_conductivity",
    "buoyancy_fraction",
    "diffusion_volume",
    "diffusivity_at_temperature",
    "diffusivity_fuller",
    "film_mass_transfer_coefficient",
    "heat_transfer_coefficient_chilton_colburn",
    "heat_transfer_coefficient_radiation",
    "mass_transfer_coefficient_mackay_matsugu",
    "mass_transfer_coefficient_still_disc",
    "sherwood_laminar_plate",
    "sherwood_mixed_convection",
    "sherwood_natural_convection",
]

GAS_CONSTANT = 8.314462618
"""Molar gas constant R [J/(mol·K)] (CODATA 2018, exact)."""

STANDARD_GRAVITY = 9.80665
"""g [m/s²] (CGPM 1901)."""

AIR_MOLAR_MASS = 0.0289586
"""Molar mass of dry air [kg/mol] (Lemmon et al. 2000, as in `chemicals`' air correlations)."""

STEFAN_BOLTZMANN = 5.670374419e-8
"""σ [W/(m²·K⁴)] (CODATA 2018, exact from h, c and k)."""

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


def air_thermal_conductivity(temperature: float, pressure: float = STANDARD_PRESSURE) -> float:
    """Thermal conductivity of dry air [W/(m·K)], Lemmon & Jacobsen (2004) via `chemicals`.

    Worked example at 300 K: handbook tables give 0.0263 W/(m·K) (Incropera & DeWitt,
    Table A.4; memory):

    >>> round(air_thermal_conductivity(300.0), 4)
    0.0264

    Reference: Lemmon & Jacobsen, Int. J. Thermophys. 25 (2004) 21-69.
    """
    from chemicals.thermal_conductivity import k_air_lemmon

    molar_density = pressure / (GAS_CONSTANT * temperature)
    return float(k_air_lemmon(temperature, molar_density))


def air_heat_capacity(temperature: float) -> float:
    """Isobaric heat capacity of dry air as an ideal gas [J/(kg·K)].

    c_p = R·(1 − τ²·∂²α⁰/∂τ²)/M with τ = T_c/T, from the ideal-gas part α⁰ of the
    Lemmon et al. (2000) equation of state for air, as `chemicals` implements it.

    Worked example at 300 K: handbook tables give 1007 J/(kg·K) (Incropera & DeWitt,
    Table A.4; memory):

    >>> round(air_heat_capacity(300.0))
    1005

    Reference: Lemmon, Jacobsen, Penoncello & Friend, J. Phys. Chem. Ref. Data 29 (2000) 331.
    """
    from chemicals.air import (
        lemmon2000_air_d2A0_dtau2,
        lemmon2000_air_MW,
        lemmon2000_air_R,
        lemmon2000_air_T_reducing,
    )

    if temperature <= 0.0:
        raise ValueError("temperature must be positive")
    tau = lemmon2000_air_T_reducing / temperature
    cv_over_r = -(tau**2) * lemmon2000_air_d2A0_dtau2(tau, 0.0)
    return float(lemmon2000_air_R * (cv_over_r + 1.0) / (lemmon2000_air_MW * 1e-3))


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
    and 0.6 ≤ Sc ≤ 10 (the heat-transfer result by the heat-mass analogy). The
    correlation is the one `ht` carries (`Nu_horizontal_plate_laminar_Baehr`).

    Worked example, air at 0.2 m/s over 0.2 m of film, ν 1.6e-5 m²/s (Re 2500), Sc 1.5:

    >>> round(sherwood_laminar_plate(2500.0, 1.5), 1)
    38.0

    Reference: Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, eq. 7.34
    (Pohlhausen's solution); Baehr & Stephan, Heat and Mass Transfer (2013).
    """
    from ht.conv_external import Nu_horizontal_plate_laminar_Baehr

    if reynolds < 0.0 or schmidt <= 0.0:
        raise ValueError("Re must not be negative and Sc must be positive")
    return float(Nu_horizontal_plate_laminar_Baehr(reynolds, schmidt))


def sherwood_natural_convection(rayleigh: float) -> float:
    """Sherwood number for free convection above a horizontal surface facing up whose
    gas is lighter than the air above it.

        Sh = 0.54·Ra^¼ (Ra ≤ 1e7),  0.15·Ra^⅓ (above)

    Ra = g·(Δρ/ρ)·L³/(ν·D) with L = area/perimeter: the Rayleigh number of the
    heat-mass analogy, the buoyancy from temperature and composition together
    (`buoyancy_fraction`). Below Ra ≈ 1e4 the correlation is extrapolated; the
    diffusion floor then governs. Ra ≤ 0 (no lift) gives 0. The correlation is the one
    `ht` carries (`Nu_horizontal_plate_McAdams`, buoyancy-assisted).

    Worked example, Ra 1e5 (a 400 cm² patch some 5 K above the room):

    >>> round(sherwood_natural_convection(1e5), 2)
    9.6

    Reference: McAdams, Heat Transmission, 3rd ed.; Lloyd & Moran, J. Heat Transfer 96
    (1974) 443; Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, eqs. 9.30-9.31.
    """
    from ht.conv_free_immersed import Nu_horizontal_plate_McAdams

    if rayleigh <= 0.0:
        return 0.0
    return float(Nu_horizontal_plate_McAdams(1.0, rayleigh, buoyancy=True))


def sherwood_mixed_convection(forced: float, natural: float) -> float:
    """Sherwood number of mixed (assisting) convection, Sh = (Sh_F³ + Sh_N³)^⅓.

    The Churchill–Usagi blend of the forced and natural limits with exponent 3, as
    recommended for forced flow over a plate heated from below.

    Worked example: equal limits of 10 give 10·2^⅓:

    >>> round(sherwood_mixed_convection(10.0, 10.0), 2)
    12.6

    Reference: Churchill & Usagi, AIChE J. 18 (1972) 1121; Incropera & DeWitt,
    Fundamentals of Heat and Mass Transfer, eq. 9.64.
    """
    if forced < 0.0 or natural < 0.0:
        raise ValueError("Sherwood numbers must not be negative")
    return float((forced**3 + natural**3) ** (1.0 / 3.0))


def buoyancy_fraction(
    surface_molar_mass: float,
    surface_temperature: float,
    air_molar_mass: float,
    air_temperature: float,
) -> float:
    """Relative density deficit of the gas at a film against the air above it, Δρ/ρ [-].

        Δρ/ρ = (ρ_air − ρ_s)/ρ_air = 1 − (M_s·T_air)/(M_air·T_s)

    for ideal gases at one pressure. Positive: the gas at the film is lighter and rises;
    negative: it is heavier and lies on the film. molar masses [kg/mol] (of the mixture
    of vapour and air at the surface, and of the room's air); temperatures [K].

    Worked example, pure isopropanol at 32 °C (P_sat 8.4 kPa, 8.3 % of the gas at the
    surface, M 60.1 g/mol) in dry air at 21 °C: the surface gas is some 5 % denser.

    >>> y = 8.4e3 / 101325
    >>> m_s = y * 0.0601 + (1 - y) * 0.0289586
    >>> round(buoyancy_fraction(m_s, 305.15, 0.0289586, 294.15), 3)
    -0.05

    Reference: ideal-gas law; Gebhart & Pera, Int. J. Heat Mass Transfer 14 (1971) 2025
    (combined thermal and solutal buoyancy).
    """
    if min(surface_molar_mass, surface_temperature, air_molar_mass, air_temperature) <= 0.0:
        raise ValueError("molar masses and temperatures must be positive")
    return 1.0 - (surface_molar_mass * air_temperature) / (air_molar_mass * surface_temperature)


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
    buoyancy: float,
    still_layer: float = 0.0,
) -> tuple[float, str]:
    """Mass-transfer coefficient of one vapour from a film patch [m/s], and what set it.

    k = max(mixed, diffusion), then a still-air layer δ in series:
        forced    Sh_F = 0.664·Re^½·Sc^⅓ over flow_length (sherwood_laminar_plate)
        natural   Sh_N(Ra) over L = area/perimeter of a square patch, Ra = g·(Δρ/ρ)·L³/(ν·D),
                  only where the gas at the film is lighter than the air (buoyancy > 0)
        mixed     Sh = (Sh_F³ + Sh_N³)^⅓ (sherwood_mixed_convection), k = Sh·D/L
        diffusion k = 8·D/(π·d) (mass_transfer_coefficient_still_disc): steady diffusion
                  into still, unbounded air, which any air movement only adds to; it is
                  a floor, not a term of the blend
        1/k_eff = 1/k + δ/D

    buoyancy : Δρ/ρ of the gas at the film against the air above it (`buoyancy_fraction`).
    Returns (k [m/s], regime): 'forced' or 'natural' when that term carries at least
    90 % of Sh³, 'mixed' otherwise, 'diffusion-limited' when the floor is the larger.

    Worked example, ethanol (D 1.37e-5 m²/s) from 400 cm² in air at 0.2 m/s,
    ν 1.6e-5 m²/s, a gas at the film 4 % lighter than the air:

    >>> k, regime = film_mass_transfer_coefficient(1.37e-5, 1.6e-5, 0.2, 0.2, 0.04, 0.04)
    >>> round(k * 1e3, 2), regime
    (3.61, 'mixed')

    The same gas 1 % heavier than the air gets the forced term alone:

    >>> k, regime = film_mass_transfer_coefficient(1.37e-5, 1.6e-5, 0.2, 0.2, 0.04, -0.01)
    >>> round(k * 1e3, 2), regime
    (2.39, 'forced')
    """
    if diffusivity <= 0.0 or kinematic_viscosity <= 0.0 or area <= 0.0 or flow_length <= 0.0:
        raise ValueError("diffusivity, viscosity, area and flow length must be positive")
    schmidt = kinematic_viscosity / diffusivity
    forced = 0.0
    if air_speed > 0.0:
        forced = sherwood_laminar_plate(air_speed * flow_length / kinematic_viscosity, schmidt)
    k_forced = forced * diffusivity / flow_length
    natural = 0.0
    length = math.sqrt(area) / 4.0
    if buoyancy > 0.0:
        grashof = STANDARD_GRAVITY * buoyancy * length**3 / kinematic_viscosity**2
        natural = sherwood_natural_convection(grashof * schmidt)
    k_natural = natural * diffusivity / length
    k_mixed = sherwood_mixed_convection(k_forced, k_natural)
    k_floor = mass_transfer_coefficient_still_disc(diffusivity, area)
    if k_floor >= k_mixed:
        k, regime = k_floor, "diffusion-limited"
    else:
        k = k_mixed
        share = k_forced**3 / k_mixed**3
        regime = "forced" if share >= 0.9 else "natural" if share <= 0.1 else "mixed"
    if still_layer > 0.0:
        k = 1.0 / (1.0 / k + still_layer / diffusivity)
    return k, regime


def heat_transfer_coefficient_chilton_colburn(
    mass_transfer_coefficient: float,
    density: float,
    heat_capacity: float,
    thermal_diffusivity: float,
    diffusivity: float,
    lewis_exponent: float = 2.0 / 3.0,
) -> float:
    """Convective heat-transfer coefficient from a mass-transfer coefficient [W/(m²·K)].

        h = k · ρ · c_p · Le^n,    Le = α / D,    n = ⅔

    lewis_exponent n is ⅔ for Chilton–Colburn; n = 0 is the Lewis relation (psychrometric
    ratio 1), the assumption behind the thermodynamic wet-bulb temperature.

    the Chilton–Colburn analogy (j_H = j_D). mass_transfer_coefficient k [m/s]; density ρ
    [kg/m³] and heat capacity c_p [J/(kg·K)] of the air; thermal_diffusivity α [m²/s] of
    the air; diffusivity D [m²/s] of the vapour the k belongs to.

    Worked example, water vapour in air at 20 °C (D 2.5e-5, α 2.1e-5 m²/s, ρ 1.2 kg/m³,
    c_p 1005 J/(kg·K)), k 5e-3 m/s: 6.03·0.84^⅔ = 5.37 W/(m²·K):

    >>> round(heat_transfer_coefficient_chilton_colburn(5e-3, 1.2, 1005.0, 2.1e-5, 2.5e-5), 2)
    5.37

    Reference: Chilton & Colburn, Ind. Eng. Chem. 26 (1934) 1183; Incropera & DeWitt,
    Fundamentals of Heat and Mass Transfer, eq. 6.60.
    """
    if min(density, heat_capacity, thermal_diffusivity, diffusivity) <= 0.0:
        raise ValueError("density, heat capacity and diffusivities must be positive")
    lewis = thermal_diffusivity / diffusivity
    return mass_transfer_coefficient * density * heat_capacity * lewis**lewis_exponent


def heat_transfer_coefficient_radiation(
    emissivity: float, surface_temperature: float, surroundings_temperature: float
) -> float:
    """Radiative exchange of a small grey surface with large surroundings [W/(m²·K)].

        h_r = ε·σ·(T_s + T_∞)·(T_s² + T_∞²),   q = h_r·(T_∞ − T_s)

    emissivity ε [-] of the surface; temperatures [K].

    Worked example, ε 0.95 at 300 K against 293 K: 0.95·5.67e-8·593·175849 W/(m²·K):

    >>> round(heat_transfer_coefficient_radiation(0.95, 300.0, 293.0), 2)
    5.62

    Reference: Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, eq. 1.9.
    """
    if not 0.0 <= emissivity <= 1.0:
        raise ValueError("emissivity must lie in 0-1")
    t_s, t_inf = surface_temperature, surroundings_temperature
    return emissivity * STEFAN_BOLTZMANN * (t_s + t_inf) * (t_s**2 + t_inf**2)
