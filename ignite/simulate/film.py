"""The applied liquid as patches of film, and the film and drape pocket as an ODE system.

`film_patches` splits an application into film and pool, with hair where there is hair
(modelling assumptions of rules/preparations.yaml). `FilmModel` holds, for one
application, each component's surface concentration, the mass-transfer coefficients of
`ignite.physics.evaporation` in open air and under the drapes, and the right-hand sides

    dn_i/dt = −A_wet·N_i                          (each patch of liquid)
    V · dc_i/dt = Σ A_wet·N_i − Q · (c_i − c_i,room)   (the drape pocket, once covered)

that `ignite.simulate.drying` integrates. The pocket's vapour is read as a fraction of
the LFL by Le Chatelier's rule.

Units: volumes [m³], areas [m²], flows [m³/s], speeds [m/s], temperatures [K],
pressures [Pa], amounts [mol], concentrations [mol/m³], diffusivities [m²/s].

The film is held at the skin temperature: evaporative cooling, which slows drying, is
left out, so the model errs towards fast evaporation.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from ignite.physics.evaporation import (
    GAS_CONSTANT,
    air_kinematic_viscosity,
    diffusion_volume,
    diffusivity_at_temperature,
    diffusivity_fuller,
    film_mass_transfer_coefficient,
)
from ignite.physics.vapour import (
    WATER_CAS,
    SubstanceDataError,
    activity_model_at,
    fraction_of_lfl,
    substance,
    vapour_pressure,
)
from ignite.rules.bound import PrepAssumptions
from ignite.simulate.preparation import PreparationAnalysis

__all__ = ["BREAKUP_THICKNESS", "FilmModel", "FilmPatch", "film_diffusivities", "film_patches"]

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


class FilmModel:
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

        self.room = self._room_concentrations(relative_humidity)
        # Transfer coefficients [m/s] per patch and component, in open air and under drapes.
        warmth = (film_temperature - air_temperature) / mean_temperature
        self.open_regimes: set[str] = set()
        self.k_open = self._coefficients(air_speed, warmth, covered=False)
        self.k_covered = self._coefficients(under_drape_air_speed, warmth, covered=True)
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

    def _coefficients(self, speed: float, warmth: float, *, covered: bool) -> list[list[float]]:
        """Mass-transfer coefficients [m/s] per patch and component at an air speed.

        In open air, the regimes that set a flammable component's coefficient on an
        unsheltered patch are collected in `open_regimes`.
        """
        table: list[list[float]] = []
        for patch in self.patches:
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
        return table

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
