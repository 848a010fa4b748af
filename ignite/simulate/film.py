"""The applied liquid as patches of film, and the film and drape pocket as an ODE system.

`film_patches` splits an application into film and pool, with hair where there is hair
(modelling assumptions of rules/preparations.yaml). `FilmModel` holds, for one
application, each component's surface concentration, the mass-transfer coefficients of
`ignite.physics.evaporation` in open air and under the drapes, and the right-hand sides

    dn_i/dt = −A_wet·N_i                          (each patch of liquid)
    V · dc_i/dt = Σ A_wet·N_i − Q · (c_i − c_i,room)   (the drape pocket, once covered)

that `ignite.simulate.drying` integrates. The pocket's vapour is read as a fraction of
the LFL by Le Chatelier's rule.

The film's temperature is not a state: at every evaluation it is solved, patch by
patch, from the film's heat balance per unit of wetted area

    G·(T_skin − T) + (h + h_r)·(T_air − T) = Σ_i N_i(T)·ΔH_vap,i(T)

(G the tissue conductance, h by the Chilton–Colburn analogy from the mass-transfer
coefficients, h_r radiation to surroundings at the room's air temperature), with
vapour pressures, activity coefficients, enthalpies of vaporisation and the buoyancy of
the gas at the film all at T. The film holds so little heat (some 0.5 kJ/(m²·K)) that
it settles within seconds, against minutes of drying.

Units: volumes [m³], areas [m²], flows [m³/s], speeds [m/s], temperatures [K],
pressures [Pa], amounts [mol], concentrations [mol/m³], diffusivities [m²/s].

The heat stored in the skin is left out (heat comes only through the tissue
conductance), and surroundings and the pocket's air are taken at the room's air
temperature, not warmed by the patient: the film errs cold, its drying errs long.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from ignite.physics.evaporation import (
    AIR_MOLAR_MASS,
    GAS_CONSTANT,
    air_heat_capacity,
    air_kinematic_viscosity,
    air_thermal_conductivity,
    buoyancy_fraction,
    diffusion_volume,
    diffusivity_at_temperature,
    diffusivity_fuller,
    film_mass_transfer_coefficient,
    heat_transfer_coefficient_chilton_colburn,
    heat_transfer_coefficient_radiation,
)
from ignite.physics.vapour import (
    WATER_CAS,
    SubstanceDataError,
    activity_model_at,
    enthalpy_of_vaporisation,
    fraction_of_lfl,
    substance,
    vapour_pressure,
)
from ignite.rules.bound import PrepAssumptions
from ignite.simulate.preparation import PreparationAnalysis

__all__ = [
    "BREAKUP_THICKNESS",
    "FilmModel",
    "FilmPatch",
    "FilmSurface",
    "film_diffusivities",
    "film_patches",
]

BREAKUP_THICKNESS = 1e-7
"""Mean film thickness [m] below which a film no longer covers its patch: it then wets
the fraction h/h_c of it. This lets the last of a film vanish smoothly instead of
leaving a finite flux over a vanishing amount. At 0.1 µm it holds 0.04 % of 10 mL on
400 cm², far below any dry fraction in use."""


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


_GAMMA_NODE_SPACING = 2.0
"""Spacing [K] of the temperatures at which a binary's ln γ is tabulated; between them
ln γ is interpolated linearly in T (UNIFAC's ln γ changes by a few per cent over 2 K)."""


@dataclass(frozen=True)
class FilmSurface:
    """One patch's liquid surface at one moment: its temperature and what carries its vapour off."""

    temperature: float  # K, from the heat balance
    fluxes: tuple[float, ...]  # mol/(m²·s) per component, positive leaving the film
    regimes: tuple[str, ...]  # mass-transfer regime per component ('' when not volatile)


class FilmModel:
    """The ODE right-hand sides and bookkeeping for one application."""

    def __init__(
        self,
        analysis: PreparationAnalysis,
        patches: Sequence[FilmPatch],
        *,
        air_speed: float,
        under_drape_air_speed: float,
        skin_temperature: float,
        air_temperature: float,
        relative_humidity: float,
        pocket_volume: float,
        pocket_exchange: float,
        diffusivities: Sequence[float],
        pressure: float,
        tissue_conductance: float,
        emissivity: float,
        fastest: bool = False,
        lewis_exponent: float = 2.0 / 3.0,
    ) -> None:
        """fastest: the fastest evaporation the film could have, an upper bound for the
        drape pocket's source: the film held at the warmer of skin and air (no
        evaporative cooling), and natural convection driven by that warmth alone (the
        vapour's weight left out). Otherwise the film's temperature comes from its heat
        balance and the buoyancy from its temperature and its vapour together.
        lewis_exponent: the heat/mass analogy's exponent, ⅔ (Chilton–Colburn); the
        validation sets 0 (the Lewis relation) to meet the thermodynamic wet bulb."""
        if tissue_conductance < 0.0:
            raise ValueError("tissue conductance must not be negative")
        self.cas = analysis.cas
        self.count = len(self.cas)
        self.patches = tuple(patches)
        self.skin_temperature = skin_temperature
        self.air_temperature = air_temperature
        self.pressure = pressure
        self.pocket_volume = pocket_volume
        self.pocket_exchange = pocket_exchange
        self.tissue_conductance = tissue_conductance
        self.emissivity = emissivity
        self.fastest = fastest
        self.lewis_exponent = lewis_exponent
        self.air_speed = air_speed
        self.under_drape_air_speed = under_drape_air_speed
        self.molar_masses = [substance(c).molar_mass for c in self.cas]
        self.volatile = [vapour_pressure(c, skin_temperature) > 0.0 for c in self.cas]
        self.flammable = list(analysis.flammable)
        self.lfls = [lfl if lfl is not None else math.inf for lfl in analysis.lfls]
        self.diffusivities = list(diffusivities)
        mean_temperature = 0.5 * (skin_temperature + air_temperature)
        self.viscosity = air_kinematic_viscosity(mean_temperature, pressure)
        # Air properties for the heat side, at the mean boundary-layer temperature.
        self.air_conductivity = air_thermal_conductivity(mean_temperature, pressure)
        density = pressure * AIR_MOLAR_MASS / (GAS_CONSTANT * mean_temperature)
        self.rho_cp = density * air_heat_capacity(mean_temperature)
        self.thermal_diffusivity = self.air_conductivity / self.rho_cp
        self._gamma_nodes: dict[int, Callable[[float, Sequence[float]], tuple[float, ...]]] = {}
        self._last_temperature = [skin_temperature] * len(self.patches)

        self.room = self._room_concentrations(relative_humidity)
        self.molar_volumes = list(analysis.molar_volumes)
        self.initial = self._initial_amounts(analysis.mole_fractions)
        self.flammable_mass0 = self.flammable_mass(self.initial)

    def _room_concentrations(self, relative_humidity: float) -> list[float]:
        """Each component's concentration in the room's air [mol/m³]: its water vapour only."""
        room = [0.0] * self.count
        if WATER_CAS in self.cas:
            water_pressure = relative_humidity * vapour_pressure(WATER_CAS, self.air_temperature)
            room[self.cas.index(WATER_CAS)] = water_pressure / (GAS_CONSTANT * self.air_temperature)
        return room

    # --- the liquid surface ---------------------------------------------------------

    def gammas(self, temperature: float, x: Sequence[float]) -> tuple[float, ...]:
        """Activity coefficients at a film temperature: ln γ linear in T between nodes."""
        if self.count != 2:
            return activity_model_at(tuple(self.cas), temperature)(temperature, x)
        position = temperature / _GAMMA_NODE_SPACING
        low = math.floor(position)
        weight = position - low
        below = self._gamma_node(low)(low * _GAMMA_NODE_SPACING, x)
        if weight == 0.0:
            return below
        above = self._gamma_node(low + 1)((low + 1) * _GAMMA_NODE_SPACING, x)
        return tuple(
            math.exp((1.0 - weight) * math.log(a) + weight * math.log(b))
            for a, b in zip(below, above, strict=True)
        )

    def _gamma_node(self, node: int) -> Callable[[float, Sequence[float]], tuple[float, ...]]:
        found = self._gamma_nodes.get(node)
        if found is None:
            found = activity_model_at(tuple(self.cas), node * _GAMMA_NODE_SPACING)
            self._gamma_nodes[node] = found
        return found

    def _far_molar_mass(self, far: Sequence[float]) -> float:
        """Molar mass [kg/mol] of the air above the film (the room's, or the pocket's)."""
        fractions = [max(c, 0.0) * GAS_CONSTANT * self.air_temperature / self.pressure for c in far]
        rest = max(1.0 - sum(fractions), 0.0)
        return rest * AIR_MOLAR_MASS + sum(
            y * m for y, m in zip(fractions, self.molar_masses, strict=True)
        )

    def _surface_at(
        self,
        p: int,
        temperature: float,
        x: Sequence[float],
        far: Sequence[float],
        far_molar_mass: float,
        speed: float,
    ) -> tuple[float, FilmSurface]:
        """(heat surplus [W/m²], surface) of patch p at a trial film temperature."""
        patch = self.patches[p]
        gammas = self.gammas(temperature, x)
        rt_film = GAS_CONSTANT * temperature
        partial = [
            x[i] * gammas[i] * vapour_pressure(self.cas[i], temperature)
            if self.volatile[i]
            else 0.0
            for i in range(self.count)
        ]
        fractions = [p_i / self.pressure for p_i in partial]
        surface_mass = (1.0 - sum(fractions)) * AIR_MOLAR_MASS + sum(
            y * m for y, m in zip(fractions, self.molar_masses, strict=True)
        )
        if self.fastest:
            surface_mass = far_molar_mass = AIR_MOLAR_MASS
        buoyancy = buoyancy_fraction(
            surface_mass, temperature, far_molar_mass, self.air_temperature
        )
        fluxes: list[float] = []
        regimes: list[str] = []
        latent = 0.0
        h_sum, h_count = 0.0, 0
        for i in range(self.count):
            if not self.volatile[i]:
                fluxes.append(0.0)
                regimes.append("")
                continue
            k, regime = film_mass_transfer_coefficient(
                self.diffusivities[i],
                self.viscosity,
                0.0 if patch.sheltered else speed,
                patch.flow_length,
                patch.area,
                buoyancy,
            )
            h_sum += heat_transfer_coefficient_chilton_colburn(
                k,
                1.0,
                self.rho_cp,
                self.thermal_diffusivity,
                self.diffusivities[i],
                self.lewis_exponent,
            )
            h_count += 1
            if patch.still_layer > 0.0:
                k = 1.0 / (1.0 / k + patch.still_layer / self.diffusivities[i])
            flux = k * (partial[i] / rt_film - far[i])
            fluxes.append(flux)
            regimes.append(regime)
            latent += flux * enthalpy_of_vaporisation(self.cas[i], temperature)
        h = h_sum / h_count if h_count else 0.0
        if patch.still_layer > 0.0 and h > 0.0:
            h = 1.0 / (1.0 / h + patch.still_layer / self.air_conductivity)
        h_r = heat_transfer_coefficient_radiation(
            self.emissivity, temperature, self.air_temperature
        )
        surplus = (
            self.tissue_conductance * (self.skin_temperature - temperature)
            + (h + h_r) * (self.air_temperature - temperature)
            - latent
        )
        return surplus, FilmSurface(temperature, tuple(fluxes), tuple(regimes))

    def surface(
        self, p: int, moles: Sequence[float], far: Sequence[float], covered: bool
    ) -> FilmSurface | None:
        """Patch p's liquid surface with its temperature from the heat balance; None when dry."""
        from scipy.optimize import brentq

        total = sum(max(n, 0.0) for n in moles)
        if total <= 0.0:
            return None
        x = [max(n, 0.0) / total for n in moles]
        speed = self.under_drape_air_speed if covered else self.air_speed
        far_mass = self._far_molar_mass(far)
        if self.fastest:
            warmest = max(self.skin_temperature, self.air_temperature)
            return self._surface_at(p, warmest, x, far, far_mass, speed)[1]

        seen: dict[float, tuple[float, FilmSurface]] = {}  # each temperature evaluated once

        def at(temperature: float) -> tuple[float, FilmSurface]:
            found = seen.get(temperature)
            if found is None:
                found = seen[temperature] = self._surface_at(
                    p, temperature, x, far, far_mass, speed
                )
            return found

        def surplus(temperature: float) -> float:
            return at(temperature)[0]

        guess = self._last_temperature[p]
        low, high = guess - 0.5, guess + 0.5
        step = 1.0
        while surplus(low) < 0.0:
            low -= step
            step *= 2.0
            if low < 150.0:
                raise ValueError("no film temperature balances its heat")
        step = 1.0
        while surplus(high) > 0.0:
            high += step
            step *= 2.0
            if high > 500.0:
                raise ValueError("no film temperature balances its heat")
        temperature = float(brentq(surplus, low, high, xtol=1e-7, rtol=1e-12))
        self._last_temperature[p] = temperature
        return at(temperature)[1]

    def patch_fluxes(
        self, p: int, moles: Sequence[float], far: Sequence[float], covered: bool
    ) -> list[float]:
        """Flux of each component from patch p's liquid surface [mol/(m²·s)]."""
        found = self.surface(p, moles, far, covered)
        return [0.0] * self.count if found is None else list(found.fluxes)

    # --- bookkeeping ----------------------------------------------------------------

    def _initial_amounts(self, mole_fractions: Sequence[float]) -> list[float]:
        """Moles of each component in each patch at the end of prepping."""
        molar_volume = sum(x * v for x, v in zip(mole_fractions, self.molar_volumes, strict=True))
        initial: list[float] = []
        for patch in self.patches:
            moles = patch.volume / molar_volume
            initial.extend(x * moles for x in mole_fractions)
        return initial

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
        # a fraction of what was applied: rounding in the solve never takes it past 0 or 1
        return min(1.0, max(0.0, float(self.flammable_mass(state) / self.flammable_mass0)))

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

    def surfaces(
        self, film: Sequence[float], far: Sequence[float], covered: bool
    ) -> list[FilmSurface]:
        """The liquid surface of every patch that still holds liquid."""
        found = []
        for p in range(len(self.patches)):
            moles = film[p * self.count : (p + 1) * self.count]
            surface = self.surface(p, moles, far, covered)
            if surface is not None:
                found.append(surface)
        return found

    def surface_index(self, state: Sequence[float], far: Sequence[float], covered: bool) -> float:
        """Largest fraction of the LFL in the saturated vapour at any patch's liquid surface,
        at that patch's own temperature."""
        largest = 0.0
        fuels = [i for i in range(self.count) if self.flammable[i]]
        for p in range(len(self.patches)):
            moles = [max(n, 0.0) for n in state[p * self.count : (p + 1) * self.count]]
            total = sum(moles)
            if total <= 0.0:
                continue
            found = self.surface(p, moles, far, covered)
            t = self.skin_temperature if found is None else found.temperature
            x = [n / total for n in moles]
            gammas = self.gammas(t, x)
            vapour = [
                x[i] * gammas[i] * vapour_pressure(self.cas[i], t) / self.pressure for i in fuels
            ]
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

    def rhs(self, covered: bool) -> Callable[[float, Sequence[float]], list[float]]:
        """d(state)/dt for the solver: the patches' amounts, then (covered) the pocket's."""
        count = self.count
        npatch = len(self.patches)

        def derivative(_t: float, state: Sequence[float]) -> list[float]:
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


def film_diffusivities(
    analysis: PreparationAnalysis,
    assumptions: PrepAssumptions,
    temperature: float,
    pressure: float,
) -> tuple[list[float], list[str]]:
    """Each component's diffusivity in air at `temperature` [K], and the names estimated.

    A diffusivity tabulated in the assumptions is moved from their reference temperature;
    a volatile component without one gets the Fuller-Schettler-Giddings estimate.
    """
    values: list[float] = []
    estimated: list[str] = []
    for name, cas in zip(analysis.names, analysis.cas, strict=True):
        tabulated = assumptions.diffusivities.get(cas)
        if tabulated is not None:
            reference = assumptions.diffusivity_reference_temperature
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
