"""Evaporation of a skin-preparation film, and its vapour under the drapes.

Each volatile component leaves the film at the flux

    N_i = k_i · (c_i,surface − c_i,far),    c_i,surface = x_i·γ_i·P_sat,i(T_film) / (R·T_film)

with k_i from the laminar flat plate in the air stream, floored by natural convection
over the warm film and by steady diffusion for still air, and the composition
integrated in time: the alcohol leaves first. Before draping the far side is the room (its water vapour from
RH); once drapes are on it is the drape pocket, a well-mixed volume

    V · dc_i/dt = Σ A·N_i − Q · (c_i − c_i,room)

whose vapour, as a fraction of the LFL by Le Chatelier's rule, is compared with a margin.

Units: lengths [m], areas [m²], volumes [m³], flows [m³/s], speeds [m/s], times [s],
temperatures [K], pressures [Pa], concentrations [mol/m³], diffusivities [m²/s],
fluxes [mol/(m²·s)]. Fractions are 0-1.

The model errs towards fast evaporation: the film is held at the skin temperature
(evaporative cooling, which slows drying, is left out) and the weight of the vapour,
which damps natural convection over an alcohol film, is left out too. Computed
drying times are therefore floors, and pocket peaks err high. Water taken up from
humid air by a film that has none is not modelled.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

from ignite.physics.vapour import (
    STANDARD_PRESSURE,
    PreparationAnalysis,
    SubstanceDataError,
    activity_model_at,
    fraction_of_lfl,
    substance,
    vapour_pressure,
)

__all__ = [
    "AIR_MOLAR_MASS",
    "ASSUMPTION_KEYS",
    "BREAKUP_THICKNESS",
    "DIFFUSIVITY_KEY_PREFIX",
    "GAS_CONSTANT",
    "HORIZON",
    "FilmPatch",
    "PrepOutcome",
    "air_kinematic_viscosity",
    "diffusion_volume",
    "diffusivity_at_temperature",
    "diffusivity_fuller",
    "film_mass_transfer_coefficient",
    "film_patches",
    "mass_transfer_coefficient_mackay_matsugu",
    "mass_transfer_coefficient_still_disc",
    "sherwood_laminar_plate",
    "sherwood_natural_convection",
    "simulate_prep",
]

GAS_CONSTANT = 8.314462618
"""Molar gas constant R [J/(mol·K)] (CODATA 2018, exact)."""

STANDARD_GRAVITY = 9.80665
"""g [m/s²] (CGPM 1901)."""

AIR_MOLAR_MASS = 0.0289586
"""Molar mass of dry air [kg/mol] (Lemmon et al. 2000, as in `chemicals`' air correlations)."""

WATER_CAS = "7732-18-5"

BREAKUP_THICKNESS = 1e-7
"""Mean film thickness [m] below which a film no longer covers its patch: it then wets
the fraction h/h_c of it. This lets the last of a film vanish smoothly instead of
leaving a finite flux over a vanishing amount. At 0.1 µm it holds 0.04 % of 10 mL on
400 cm², far below any dry fraction in use."""

HORIZON = 12 * 3600.0
"""Longest time simulated [s]; a film not dry by then counts as never dry."""

ASSUMPTION_KEYS: tuple[str, ...] = (
    "dry_fraction",
    "pocket_margin",
    "under_drape_air_speed",
    "hair_still_layer",
    "hair_exposed_fraction",
    "pooling_volume_fraction",
    "pooling_area_fraction",
)
"""Keys `simulate_prep` needs in `assumptions` (ids in rules/preparations.yaml less `prep.`)."""

DIFFUSIVITY_KEY_PREFIX = "diffusivity."
"""Optional keys `diffusivity.<CAS>` in `assumptions`: a vapour's diffusivity in air [m²/s]
at `diffusivity_reference_temperature` [K], which must then be given too. A component
without one gets the Fuller-Schettler-Giddings estimate."""

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


@dataclass(frozen=True)
class FilmPatch:
    """Part of the applied liquid that evaporates in one way."""

    volume: float  # m³ of liquid
    area: float  # m² of liquid surface open to the air
    flow_length: float  # m of surface the air stream crosses
    sheltered: bool  # True: out of the air stream (pooled liquid)
    still_layer: float  # m of still air between liquid and air stream (hair)


def film_patches(
    volume: float,
    area: float,
    *,
    hair: bool,
    pooling: bool,
    hair_still_layer: float,
    hair_exposed_fraction: float,
    pooling_volume_fraction: float,
    pooling_area_fraction: float,
) -> tuple[FilmPatch, ...]:
    """Split an application into film and pool, with hair where there is hair.

    Pooling: `pooling_volume_fraction` of the liquid collects on
    `pooling_area_fraction` of the area, out of the air stream; the rest spreads
    over the remaining area. Hair: the liquid held among hairs sees the air through
    a still layer `hair_still_layer` thick, from `hair_exposed_fraction` of its area.
    These are modelling assumptions, not published values (rules/preparations.yaml).

    >>> [(round(p.volume * 1e6, 1), round(p.area * 1e4), p.sheltered) for p in film_patches(
    ...     10e-6, 0.04, hair=False, pooling=True, hair_still_layer=0.005,
    ...     hair_exposed_fraction=0.5, pooling_volume_fraction=0.5, pooling_area_fraction=0.1)]
    [(5.0, 360, False), (5.0, 40, True)]
    """
    if volume <= 0.0 or area <= 0.0:
        raise ValueError("volume and area must be positive")
    layer = hair_still_layer if hair else 0.0
    exposed = hair_exposed_fraction if hair else 1.0
    parts: list[tuple[float, float, bool]] = []
    if pooling and pooling_volume_fraction > 0.0:
        pool_area = area * pooling_area_fraction
        parts.append((volume * (1.0 - pooling_volume_fraction), area - pool_area, False))
        parts.append((volume * pooling_volume_fraction, pool_area, True))
    else:
        parts.append((volume, area, False))
    return tuple(
        FilmPatch(
            volume=v,
            area=a * exposed,
            flow_length=math.sqrt(a),
            sheltered=sheltered,
            still_layer=layer,
        )
        for v, a, sheltered in parts
        if v > 0.0 and a > 0.0
    )


@dataclass(frozen=True)
class PrepOutcome:
    """What one application of a preparation does over time, from the end of prepping."""

    drying_time_s: float  # flammable part below the dry fraction, on the case's timeline
    flammable_left_at_draping_fraction: float  # of the flammable mass applied
    flammable_left_at_activation_fraction: float
    pocket_peak_fraction_of_lfl: float  # 0 if dry at draping
    pocket_at_activation_fraction_of_lfl: float
    safe_draping_after_s: float  # earliest draping keeping the peak <= margin
    film_curve: tuple[tuple[float, float], ...]  # (s, flammable liquid left, fraction)
    pocket_curve: tuple[tuple[float, float], ...]  # (s, pocket vapour / LFL)
    notes: tuple[str, ...] = ()
    open_air_drying_time_s: float = math.inf  # if the site were never draped
    pocket_peak_time_s: float | None = None  # s from end of prep


class _FilmModel:
    """The ODE right-hand sides and bookkeeping for one application."""

    def __init__(
        self,
        analysis: PreparationAnalysis,
        patches: Sequence[FilmPatch],
        *,
        air_speed: float,
        under_drape_air_speed: float,
        film_temperature: float,
        air_temperature: float,
        relative_humidity: float,
        pocket_volume: float,
        pocket_exchange: float,
        diffusivities: Sequence[float],
        pressure: float,
    ) -> None:
        self.cas = analysis.cas
        self.count = len(self.cas)
        self.patches = tuple(patches)
        self.film_temperature = film_temperature
        self.air_temperature = air_temperature
        self.pressure = pressure
        self.pocket_volume = pocket_volume
        self.pocket_exchange = pocket_exchange
        self.gamma = activity_model_at(tuple(self.cas), film_temperature)
        self.molar_masses = [substance(c).molar_mass for c in self.cas]
        self.psat = [vapour_pressure(c, film_temperature) for c in self.cas]
        self.volatile = [p > 0.0 for p in self.psat]
        self.flammable = list(analysis.flammable)
        self.lfls = [lfl if lfl is not None else math.inf for lfl in analysis.lfls]
        self.diffusivities = list(diffusivities)
        mean_temperature = 0.5 * (film_temperature + air_temperature)
        self.viscosity = air_kinematic_viscosity(mean_temperature, pressure)

        room = [0.0] * self.count
        if WATER_CAS in self.cas:
            water_pressure = relative_humidity * vapour_pressure(WATER_CAS, air_temperature)
            room[self.cas.index(WATER_CAS)] = water_pressure / (GAS_CONSTANT * air_temperature)
        self.room = room

        # Transfer coefficients [m/s] per patch and component, in open air and under drapes.
        warmth = (film_temperature - air_temperature) / mean_temperature
        self.k_open: list[list[float]] = []
        self.k_covered: list[list[float]] = []
        self.open_regimes: set[str] = set()
        for patch in self.patches:
            for covered, table in ((False, self.k_open), (True, self.k_covered)):
                speed = under_drape_air_speed if covered else air_speed
                row = []
                for i in range(self.count):
                    if not self.volatile[i]:
                        row.append(0.0)
                        continue
                    k, regime = film_mass_transfer_coefficient(
                        self.diffusivities[i],
                        self.viscosity,
                        0.0 if patch.sheltered else speed,
                        patch.flow_length,
                        patch.area,
                        warmth,
                        patch.still_layer,
                    )
                    row.append(k)
                    if not covered and not patch.sheltered and self.flammable[i]:
                        self.open_regimes.add(regime)
                table.append(row)

        self.molar_volumes = list(analysis.molar_volumes)
        molar_volume = sum(
            x * v for x, v in zip(analysis.mole_fractions, self.molar_volumes, strict=True)
        )
        self.initial: list[float] = []
        for patch in self.patches:
            moles = patch.volume / molar_volume
            self.initial.extend(x * moles for x in analysis.mole_fractions)
        self.flammable_mass0 = self.flammable_mass(self.initial)

    def flammable_mass(self, state: Sequence[float]) -> float:
        total = 0.0
        for p in range(len(self.patches)):
            for i in range(self.count):
                if self.flammable[i]:
                    total += max(state[p * self.count + i], 0.0) * self.molar_masses[i]
        return total

    def flammable_left(self, state: Sequence[float]) -> float:
        if self.flammable_mass0 <= 0.0:
            return 0.0
        return float(self.flammable_mass(state) / self.flammable_mass0)

    def pocket_index(self, concentrations: Sequence[float]) -> float:
        """Pocket vapour as a fraction of the LFL; the pocket's gas is at room temperature."""
        to_fraction = GAS_CONSTANT * self.air_temperature / self.pressure
        fuels = [i for i in range(self.count) if self.flammable[i]]
        return float(
            fraction_of_lfl(
                [max(concentrations[i], 0.0) * to_fraction for i in fuels],
                [self.lfls[i] for i in fuels],
            )
        )

    def patch_fluxes(
        self, p: int, moles: Sequence[float], far: Sequence[float], covered: bool
    ) -> list[float]:
        """Flux of each component from patch p's liquid surface [mol/(m²·s)]."""
        total = sum(max(n, 0.0) for n in moles)
        if total <= 0.0:
            return [0.0] * self.count
        x = [max(n, 0.0) / total for n in moles]
        gammas = self.gamma(self.film_temperature, x)
        rt_film = GAS_CONSTANT * self.film_temperature
        k = self.k_covered[p] if covered else self.k_open[p]
        return [
            k[i] * (x[i] * gammas[i] * self.psat[i] / rt_film - far[i]) for i in range(self.count)
        ]

    def surface_index(self, state: Sequence[float]) -> float:
        """Largest fraction of the LFL in the saturated vapour at any patch's liquid surface."""
        largest = 0.0
        fuels = [i for i in range(self.count) if self.flammable[i]]
        for p in range(len(self.patches)):
            moles = [max(n, 0.0) for n in state[p * self.count : (p + 1) * self.count]]
            total = sum(moles)
            if total <= 0.0:
                continue
            x = [n / total for n in moles]
            gammas = self.gamma(self.film_temperature, x)
            vapour = [x[i] * gammas[i] * self.psat[i] / self.pressure for i in fuels]
            largest = max(largest, fraction_of_lfl(vapour, [self.lfls[i] for i in fuels]))
        return largest

    def held_concentrations(self, state: Sequence[float]) -> list[float]:
        """Pocket concentrations the film's present source would hold: S_i / Q [mol/m³]."""
        npc = len(self.patches) * self.count
        source = self._film_rates(state, list(state[npc:]), covered=True)[1]
        return [rate / self.pocket_exchange for rate in source]

    def _film_rates(
        self, state: Sequence[float], far: Sequence[float], covered: bool
    ) -> tuple[list[float], list[float]]:
        """(d moles/dt of each patch's components, total vapour source [mol/s])."""
        count = self.count
        change = [0.0] * (len(self.patches) * count)
        source = [0.0] * count
        for p, patch in enumerate(self.patches):
            moles = state[p * count : (p + 1) * count]
            fluxes = self.patch_fluxes(p, moles, far, covered)
            liquid = sum(max(n, 0.0) * v for n, v in zip(moles, self.molar_volumes, strict=True))
            wetted = patch.area * min(1.0, liquid / (patch.area * BREAKUP_THICKNESS))
            for i in range(count):
                rate = wetted * fluxes[i]
                change[p * count + i] = -rate
                source[i] += rate
        return change, source

    def rhs(self, covered: bool) -> Any:
        count = self.count
        npatch = len(self.patches)

        def derivative(_t: float, state: Any) -> list[float]:
            far = list(state[npatch * count :]) if covered else self.room
            change, source = self._film_rates(state, far, covered)
            if not covered:
                return change
            pocket = [
                (source[i] - self.pocket_exchange * (state[npatch * count + i] - self.room[i]))
                / self.pocket_volume
                for i in range(count)
            ]
            return change + pocket

        return derivative


_RTOL = 1e-5


def _max_step(model: _FilmModel) -> float:
    """Longest solver step [s]: half the pocket's time constant, at most 10 min. Without
    a cap, LSODA was seen to stall over the 12 h horizon once the film was gone."""
    step = 600.0
    if model.pocket_exchange > 0.0:
        step = min(step, 0.5 * model.pocket_volume / model.pocket_exchange)
    return step


def _tolerances(model: _FilmModel, covered: bool) -> list[float]:
    atol = [max(n, 1e-9) * 1e-8 for n in model.initial]
    if covered:
        atol.extend([1e-9] * model.count)
    return atol


def _open_phase(model: _FilmModel, dry_fraction: float, horizon: float) -> Any:
    """Integrate the film in open air until far past dry, or to the horizon."""
    from scipy.integrate import solve_ivp

    def nearly_gone(_t: float, state: Any) -> float:
        return model.flammable_left(state) - dry_fraction * 1e-2

    nearly_gone.terminal = True  # type: ignore[attr-defined]

    def dry(_t: float, state: Any) -> float:
        return model.flammable_left(state) - dry_fraction

    return solve_ivp(
        model.rhs(covered=False),
        (0.0, horizon),
        model.initial,
        method="LSODA",
        dense_output=True,
        events=(dry, nearly_gone),
        rtol=_RTOL,
        atol=_tolerances(model, covered=False),
        max_step=_max_step(model),
    )


def _covered_phase(
    model: _FilmModel,
    start: float,
    film_state: Sequence[float],
    dry_fraction: float,
    horizon: float,
    *,
    stop: str,
) -> Any:
    """Integrate film and pocket from draping on.

    stop='clear': until the film is nearly gone and the pocket has cleared;
    stop='peak': until the peak has passed, or the film is nearly gone. The peak has
    passed once the level the film's present source would hold the pocket at (S/Q) is
    below 0.9 of the pocket's own level: the pocket is then falling, and as long as the
    source does not grow again, which it does not once the alcohol is depleting, it
    cannot climb back above where it is. The test reads the state alone, as solve_ivp's
    event location requires.
    """
    from scipy.integrate import solve_ivp

    count = model.count
    npc = len(model.patches) * count
    state0 = [*film_state, *model.room]

    def film_gone(state: Any) -> float:
        return model.flammable_left(state[:npc]) - dry_fraction * 1e-2

    def finished(_t: float, state: Any) -> float:
        pocket = model.pocket_index(state[npc:])
        if stop == "clear":
            return max(film_gone(state), pocket - 1e-4)
        if model.pocket_exchange <= 0.0:
            return film_gone(state)
        held = model.pocket_index(model.held_concentrations(state))
        return min(film_gone(state), held - 0.9 * pocket)

    finished.terminal = True  # type: ignore[attr-defined]

    def dry(_t: float, state: Any) -> float:
        return model.flammable_left(state[:npc]) - dry_fraction

    return solve_ivp(
        model.rhs(covered=True),
        (start, max(horizon, start + 1.0)),
        state0,
        method="LSODA",
        dense_output=True,
        events=(dry, finished),
        rtol=_RTOL,
        atol=_tolerances(model, covered=True),
        max_step=_max_step(model),
    )


def _samples(start: float, end: float, count: int, extra: Sequence[float]) -> list[float]:
    if end <= start:
        return [start]
    grid = [start + (end - start) * j / (count - 1) for j in range(count)]
    return sorted({*grid, *(t for t in extra if start <= t <= end)})


def _pocket_peak(model: _FilmModel, solution: Any) -> tuple[float, float]:
    """Largest pocket vapour / LFL along a covered-phase solution, and when."""
    npatch_count = len(model.patches) * model.count
    times = _samples(solution.t[0], solution.t[-1], 200, list(solution.t))
    best, when = 0.0, float(solution.t[0])
    for t in times:
        value = float(model.pocket_index(solution.sol(t)[npatch_count:]))
        if value > best:
            best, when = value, float(t)
    return best, when


def simulate_prep(
    analysis: PreparationAnalysis,
    *,
    volume_m3: float,
    area_m2: float,
    air_speed_m_s: float,
    film_temperature_K: float,
    air_temperature_K: float,
    relative_humidity: float,
    hair: bool,
    pooling: bool,
    draping_after_s: float,
    first_activation_after_s: float,
    pocket_volume_m3: float,
    pocket_exchange_m3_s: float,
    assumptions: Mapping[str, float],
    pressure: float = STANDARD_PRESSURE,
) -> PrepOutcome:
    """Evaporate an applied preparation, drape it, and find the safe draping time.

    Times are from the end of prepping. Before `draping_after_s` the film dries in
    the room's air stream; from then on it lies under the drapes, in still air
    (`under_drape_air_speed`) against the pocket's own vapour. The pocket's peak
    vapour as a fraction of the LFL (Le Chatelier's index) is compared with
    `pocket_margin`; `safe_draping_after_s` is the earliest draping time that keeps
    the peak at or below it (brentq on the peak, which falls as draping waits).

    assumptions : the values of rules/preparations.yaml as SI floats, keyed by id
    less `prep.` (ASSUMPTION_KEYS, and optional `diffusivity.<CAS>` entries).
    Returns a PrepOutcome; times that never come within HORIZON are math.inf.

    Worked example, 10 mL of 70 % v/v isopropanol on 400 cm² of skin at 32 °C,
    0.2 m/s of room air at 20 °C and 30 % RH, drapes at 3 min over a 30 L pocket
    with 10 L/min of fresh air (an invented case; assumptions as in rules/):

    >>> from ignite.physics.vapour import analyse_preparation
    >>> a = analyse_preparation([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15)
    >>> out = simulate_prep(a, volume_m3=10e-6, area_m2=0.04, air_speed_m_s=0.2,
    ...     film_temperature_K=305.15, air_temperature_K=293.15, relative_humidity=0.3,
    ...     hair=False, pooling=False, draping_after_s=180.0, first_activation_after_s=360.0,
    ...     pocket_volume_m3=0.030, pocket_exchange_m3_s=10e-3 / 60, assumptions={
    ...     "dry_fraction": 0.01, "pocket_margin": 0.25, "under_drape_air_speed": 0.0,
    ...     "hair_still_layer": 0.005, "hair_exposed_fraction": 0.5,
    ...     "pooling_volume_fraction": 0.5, "pooling_area_fraction": 0.1})
    >>> round(out.open_air_drying_time_s), round(out.pocket_peak_fraction_of_lfl, 2)
    (460, 0.82)
    >>> round(out.safe_draping_after_s)
    424
    """
    missing = [key for key in ASSUMPTION_KEYS if key not in assumptions]
    if missing:
        raise KeyError(f"assumptions lack {', '.join(missing)}")
    if pocket_volume_m3 <= 0.0:
        raise ValueError("pocket volume must be positive")
    if pocket_exchange_m3_s < 0.0 or air_speed_m_s < 0.0:
        raise ValueError("flows and speeds must not be negative")
    dry_fraction = assumptions["dry_fraction"]
    margin = assumptions["pocket_margin"]
    notes: list[str] = [
        "the model errs towards fast evaporation (no evaporative cooling of the film, no "
        "damping of convection by the vapour's weight): the drying time is a floor",
    ]
    if not any(analysis.flammable):
        return PrepOutcome(
            drying_time_s=0.0,
            flammable_left_at_draping_fraction=0.0,
            flammable_left_at_activation_fraction=0.0,
            pocket_peak_fraction_of_lfl=0.0,
            pocket_at_activation_fraction_of_lfl=0.0,
            safe_draping_after_s=0.0,
            film_curve=((0.0, 0.0),),
            pocket_curve=((0.0, 0.0),),
            notes=("no flammable component",),
            open_air_drying_time_s=0.0,
        )

    patches = film_patches(
        volume_m3,
        area_m2,
        hair=hair,
        pooling=pooling,
        hair_still_layer=assumptions["hair_still_layer"],
        hair_exposed_fraction=assumptions["hair_exposed_fraction"],
        pooling_volume_fraction=assumptions["pooling_volume_fraction"],
        pooling_area_fraction=assumptions["pooling_area_fraction"],
    )
    if hair:
        notes.append(
            f"hair: liquid evaporates from {assumptions['hair_exposed_fraction']:.0%} of the "
            f"area through {assumptions['hair_still_layer'] * 1e3:g} mm of still air "
            "(modelling assumption)"
        )
    if pooling:
        notes.append(
            f"pooling: {assumptions['pooling_volume_fraction']:.0%} of the liquid pools on "
            f"{assumptions['pooling_area_fraction']:.0%} of the area, out of the air stream "
            "(modelling assumption)"
        )
    mean_temperature = 0.5 * (film_temperature_K + air_temperature_K)
    diffusivities, estimated = _diffusivities(analysis, assumptions, mean_temperature, pressure)
    for name in estimated:
        notes.append(f"{name}: diffusivity in air by Fuller-Schettler-Giddings")
    model = _FilmModel(
        analysis,
        patches,
        air_speed=air_speed_m_s,
        under_drape_air_speed=assumptions["under_drape_air_speed"],
        film_temperature=film_temperature_K,
        air_temperature=air_temperature_K,
        relative_humidity=relative_humidity,
        pocket_volume=pocket_volume_m3,
        pocket_exchange=pocket_exchange_m3_s,
        diffusivities=diffusivities,
        pressure=pressure,
    )

    open_air = _open_phase(model, dry_fraction, HORIZON)
    open_end = float(open_air.t[-1])
    open_dry = float(open_air.t_events[0][0]) if len(open_air.t_events[0]) else math.inf
    gone_in_open_air = len(open_air.t_events[1]) > 0

    def film_at(t: float) -> list[float]:
        return list(open_air.sol(min(t, open_end)))

    peaks: dict[float, float] = {}

    def peak_if_draped_at(t: float) -> float:
        if t >= open_end:
            return 0.0  # nothing left to feed the pocket
        if t not in peaks:
            covered = _covered_phase(model, t, film_at(t), dry_fraction, HORIZON, stop="peak")
            peaks[t] = _pocket_peak(model, covered)[0]
        return peaks[t]

    # The case as planned.
    draping = draping_after_s
    if draping < open_end:
        covered = _covered_phase(
            model, draping, film_at(draping), dry_fraction, HORIZON, stop="clear"
        )
        npc = len(patches) * model.count
        peak, peak_time = _pocket_peak(model, covered)
        covered_end = float(covered.t[-1])
        drying = float(covered.t_events[0][0]) if len(covered.t_events[0]) else math.inf
        if drying == math.inf and open_dry <= draping:
            drying = open_dry

        def state_at(t: float) -> tuple[list[float], list[float]]:
            if t < draping:
                return film_at(t), list(model.room)
            full = list(covered.sol(min(t, covered_end)))
            if t > covered_end:
                return full[:npc], list(model.room)
            return full[:npc], full[npc:]

        end = covered_end
        pocket_times = _samples(draping, covered_end, 120, [peak_time, first_activation_after_s])
        pocket_curve = tuple((t, model.pocket_index(state_at(t)[1])) for t in pocket_times)
    else:
        peak, peak_time = 0.0, None
        drying = open_dry
        end = open_end

        def state_at(t: float) -> tuple[list[float], list[float]]:
            return film_at(t), list(model.room)

        pocket_curve = ((draping, 0.0),)

    film_times = _samples(0.0, min(end, HORIZON), 120, [draping, first_activation_after_s])
    film_curve = tuple((t, model.flammable_left(state_at(t)[0])) for t in film_times)
    at_activation = state_at(first_activation_after_s)

    # Earliest draping time that keeps the pocket's peak within the margin.
    if peak_if_draped_at(0.0) <= margin:
        safe = 0.0
    elif not gone_in_open_air:
        safe = math.inf  # still wet at the horizon: no draping time within it is safe
    else:
        from scipy.optimize import brentq

        safe = float(
            brentq(lambda t: peak_if_draped_at(t) - margin, 0.0, open_end, xtol=0.5, rtol=1e-4)
        )

    if model.open_regimes - {"forced"}:
        notes.append(
            "in open air, natural convection over the warm film (or diffusion), not the "
            "room's air stream, set the evaporation rate"
        )
    left_at_activation = model.flammable_left(at_activation[0])
    if left_at_activation > dry_fraction:
        notes.append(
            f"{left_at_activation:.0%} of the flammable liquid is still on the skin at first "
            f"activation: the vapour at its surface is {model.surface_index(at_activation[0]):.1f}"
            " times the LFL, whatever the pocket's average"
        )
    if math.isinf(drying):
        notes.append(f"not dry within {HORIZON / 3600:g} h")
    return PrepOutcome(
        drying_time_s=drying,
        flammable_left_at_draping_fraction=model.flammable_left(state_at(draping)[0]),
        flammable_left_at_activation_fraction=left_at_activation,
        pocket_peak_fraction_of_lfl=peak,
        pocket_at_activation_fraction_of_lfl=model.pocket_index(at_activation[1]),
        safe_draping_after_s=safe,
        film_curve=film_curve,
        pocket_curve=pocket_curve,
        notes=tuple(notes),
        open_air_drying_time_s=open_dry,
        pocket_peak_time_s=peak_time,
    )


def _diffusivities(
    analysis: PreparationAnalysis,
    assumptions: Mapping[str, float],
    temperature: float,
    pressure: float,
) -> tuple[list[float], list[str]]:
    """Each component's diffusivity in air at `temperature`, and the names estimated."""
    values: list[float] = []
    estimated: list[str] = []
    for name, cas in zip(analysis.names, analysis.cas, strict=True):
        tabulated = assumptions.get(DIFFUSIVITY_KEY_PREFIX + cas)
        if tabulated is not None:
            reference = assumptions["diffusivity_reference_temperature"]
            values.append(diffusivity_at_temperature(tabulated, temperature, reference))
            continue
        found = substance(cas)
        if not found.volatile:
            values.append(0.0)  # never used: a non-volatile component has no flux
            continue
        try:
            volume = diffusion_volume(found.formula)
        except ValueError as error:
            raise SubstanceDataError(name, f"no diffusivity in air: {error}") from None
        values.append(diffusivity_fuller(temperature, pressure, found.molar_mass, volume))
        estimated.append(name)
    return values, estimated
