"""The drying of one case's prep over many samples at once: numpy arrays through time steps.

The equations are those of `ignite.simulate.film` (film patches, mixed convection, the
film's heat balance, the well-mixed drape pocket) and the timeline that of
`ignite.simulate.drying` (open air until draping; the slow film for drying, the fastest
film for the pocket; the safe draping time as the earliest draping that keeps the pocket's
peak within its margin). What differs is how they are solved:
- every sample advances together, each with its own step: at most 5 % of the flammable
  liquid (20 % once it is below the dry fraction) and half of what is left of any
  component per step, at most 60 s in open air and 300 s under the drapes;
- the film by Heun's method, the pocket by solving its linear equation exactly over the
  step (stable however short its time constant);
- the film temperature by Newton's method kept inside a bracket on the heat balance, from
  a first guess carried along the last step's change (`_settle`);
- the safe draping time by regula falsi (Illinois) on the draping time, stepping only the
  samples still searching;
- vapour pressures and enthalpies of vaporisation from tables in T (0.1 K), a binary's
  ln γ from a table in T (2 K, as the scalar solver) and x₁ (201 points) built once per
  preparation by direct UNIFAC calls.

Which side it errs on: a time is read at the end of the step in which it is passed
(drying, the film gone), and the safe draping time is the upper end of its last bracket,
so each errs late; past the dry fraction, Heun's method leaves more of a decaying film than
there is (1 - z + z²/2 > e^-z), so the longer steps there err wet.
tests/simulate/test_batch.py checks drying times, pocket peaks and safe draping times
against the scalar solver on the sample cases and states the tolerance. Preparations of
three or more components are left to the scalar solver.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import TYPE_CHECKING

from ignite.physics.evaporation import (
    AIR_MOLAR_MASS,
    GAS_CONSTANT,
    STANDARD_GRAVITY,
    STEFAN_BOLTZMANN,
    air_heat_capacity,
    air_kinematic_viscosity,
    air_thermal_conductivity,
)
from ignite.physics.vapour import (
    STANDARD_PRESSURE,
    WATER_CAS,
    activity_model,
    enthalpy_of_vaporisation,
    substance,
    vapour_pressure,
)
from ignite.rules.bound import PrepAssumptions
from ignite.simulate.drying import HORIZON
from ignite.simulate.film import BREAKUP_THICKNESS, film_diffusivities
from ignite.simulate.kept import kept
from ignite.simulate.preparation import PreparationAnalysis

if TYPE_CHECKING:
    import numpy as np
    import numpy.typing as npt

    Array = npt.NDArray[np.float64]
    Mask = npt.NDArray[np.bool_]

_Rates = tuple["Array", "Array", "Array"]
"""(d moles/dt (S,P,n), the film's source into the pocket (S,n), its conductance (S,n))."""

__all__ = ["BatchDrying", "BatchInputs", "batch_supported", "dry_batch", "gamma_table"]

STEP_CHANGE = 0.05
"""Largest share of the flammable liquid one step may remove (4 %, at a fifth more steps,
moved no figure of the sample cases by more than 0.08 % against 5 %; 2 % moved none by
more than 0.1 % against 4 %)."""
TAIL_CHANGE = 0.2
"""Largest share of the flammable liquid one step may remove once it is below the dry
fraction (what is read there: the film from drying until nearly gone, for late drapings)."""
SAFE_TOLERANCE = 0.01
"""Relative width at which the search for the safe draping time stops (its upper end is kept)."""
STEP_STABLE = 0.5
"""Largest share of what is left of any one component one step may remove."""
GONE_SHARE = 1e-6
"""Below this share of what was applied, a component (or the flammable liquid) no longer
limits the step: it is gone for every figure read (the dry fraction is 1e-2, gone 1e-4)."""
STEP_MAX = 300.0
"""Longest step [s] under the drapes (the pocket is stepped exactly, so this is for the
film's accuracy alone)."""
OPEN_STEP_MAX = 60.0
"""Longest step [s] in open air: the safe draping search reads the film between these steps
(300 s here moved the pooled sample case's safe draping time 0.4 % late)."""
STEP_MIN = 1e-3
"""Shortest step [s]."""
T_GRID = 0.1
"""Spacing [K] of the vapour-pressure and enthalpy tables."""
GAMMA_T_SPACING = 2.0
"""Spacing [K] of the activity-coefficient table in T, as the scalar solver's nodes."""
GAMMA_X_POINTS = 201
"""Points of the activity-coefficient table in x₁."""
NEWTON_LINEAR = 0.05
"""Newton step on the film temperature [K] below which the fluxes are moved to first order
and the solve ends (ln P_sat changes by about 0.06 per K: the second-order term of a flux
over 0.05 K is under 1e-5 of it)."""
BRACKET_WIDTH = 0.005
"""Width [K] of a bracket on the film temperature that ends the solve (a flux then within
3e-4 of itself)."""
ROOT_ITERATIONS = 60
"""Most steps on the heat balance (a bracket halves at least every other step)."""
NEWTON_STEP = 5.0
"""Largest Newton step [K]."""


def batch_supported(analysis: PreparationAnalysis) -> bool:
    """One or two components: the activity coefficients come from a table in (T, x₁)."""
    return len(analysis.cas) <= 2


@dataclass(frozen=True)
class BatchInputs:
    """One case's prep application over S samples: arrays of shape (S,), SI units."""

    volume: Array
    area: Array
    skin_temperature: Array
    air_temperature: Array
    relative_humidity: Array
    air_speed: Array
    draping_after: Array
    first_activation_after: Array
    pocket_volume: Array
    pocket_exchange: Array
    hair_still_layer: Array
    hair_exposed_fraction: Array
    pooling_volume_fraction: Array
    pooling_area_fraction: Array
    tissue_conductance: Array
    hair: bool
    pooling: bool


@dataclass(frozen=True)
class BatchDrying:
    """What the samples' preps did (arrays (S,)); times are math.inf when never."""

    drying_time_s: Array
    left_at_activation: Array  # flammable liquid left at first activation, fraction
    pocket_peak: Array  # fraction of the LFL, drapes as planned (fastest film)
    safe_draping_after_s: Array
    # the planned slow film: in open air (K, S) until draping, then covered (L, S)
    open_times: Array
    open_left: Array
    covered_times: Array
    covered_left: Array
    draping_after: Array

    def left_on(self, times: Array) -> Array:
        """Flammable liquid left (fraction) of every sample at each of `times`: (S, Q)."""
        import numpy as np

        rows = []
        for s in range(self.open_times.shape[1]):
            before = np.interp(times, self.open_times[:, s], self.open_left[:, s])
            after = np.interp(times, self.covered_times[:, s], self.covered_left[:, s])
            rows.append(np.where(times < self.draping_after[s], before, after))
        return np.array(rows)


# --- property tables ------------------------------------------------------------------------


@lru_cache(maxsize=32)
def _property_table(cas: str, kind: str) -> tuple[float, Array]:
    """(first T, values on T_GRID) of ln P_sat or ΔH_vap of one substance, 273.2-370 K
    (water's IAPWS-95 correlation starts at 273.15 K; a film is never that cold here)."""
    import numpy as np

    temperatures = np.arange(2732, 3701) * T_GRID
    if kind == "psat":
        values = [vapour_pressure(cas, float(t)) for t in temperatures]
        table = np.log(np.maximum(np.array(values), 1e-300))
    else:
        table = np.array([enthalpy_of_vaporisation(cas, float(t)) for t in temperatures])
    return float(temperatures[0]), table


@lru_cache(maxsize=32)
def _stacked_tables(cas: tuple[str, ...]) -> tuple[float, Array]:
    """(first T, ln P_sat of each component then ΔH_vap of each on T_GRID): shape
    (temperatures, 2n), so that one index reads them all."""
    import numpy as np

    columns = [_property_table(c, "psat") for c in cas] + [_property_table(c, "dh") for c in cas]
    return columns[0][0], np.stack([table for _, table in columns], axis=1)


def _lookups(cas: tuple[str, ...], temperature: Array) -> tuple[Array, Array]:
    """(P_sat, ΔH_vap) of every component at `temperature`, shapes (..., n): linear in T
    between the table's points (ln P_sat, so P_sat is read log-linear)."""
    import numpy as np

    start, table = _stacked_tables(cas)
    position = np.minimum(np.maximum((temperature - start) / T_GRID, 0.0), len(table) - 1.000001)
    low = position.astype(int)  # (as floor: positions are not negative)
    weight = (position - low)[..., None]
    between = (1.0 - weight) * table[low] + weight * table[low + 1]
    n = len(cas)
    return np.exp(between[..., :n]), between[..., n:]


_GAMMA_NODES: dict[tuple[tuple[str, str], int], Array] = {}


def gamma_table(cas: tuple[str, str], node: int) -> Array:
    """ln γ of a binary at T = node·2 K on GAMMA_X_POINTS values of x₁: shape (points, 2),
    by direct UNIFAC calls (`activity_model`), kept per process."""
    import numpy as np

    key = (cas, node)
    found = _GAMMA_NODES.get(key)
    if found is None:
        model = activity_model(cas)
        temperature = node * GAMMA_T_SPACING
        grid = np.clip(np.linspace(0.0, 1.0, GAMMA_X_POINTS), 1e-12, 1.0 - 1e-12)
        found = np.log(np.array([model(temperature, [x, 1.0 - x]) for x in grid]))
        _GAMMA_NODES[key] = found
    return found


_GAMMA_BLOCKS: dict[tuple[str, str], tuple[int, Array]] = {}


def _gamma_block(pair: tuple[str, str], first: int, last: int) -> tuple[int, Array]:
    """(first node, ln γ on nodes first..last at least): shape (nodes, points, 2), the
    per-node tables stacked so that one fancy index reads any node; grown as needed."""
    import numpy as np

    held = _GAMMA_BLOCKS.get(pair)
    if held is not None and held[0] <= first and held[0] + len(held[1]) - 1 >= last:
        return held
    if held is not None:
        first, last = min(first, held[0]), max(last, held[0] + len(held[1]) - 1)
    block = np.stack([gamma_table(pair, node) for node in range(first, last + 1)])
    _GAMMA_BLOCKS[pair] = (first, block)
    return first, block


def _gammas(cas: tuple[str, ...], temperature: Array, x1: Array) -> Array:
    """γ of each component, shape (..., 2): ln γ bilinear in (T, x₁) between table nodes."""
    return _gammas_sloped(cas, temperature, x1)[0]


def _gammas_sloped(cas: tuple[str, ...], temperature: Array, x1: Array) -> tuple[Array, Array]:
    """(γ, d ln γ/dT) of each component, shapes (..., n): the table's slope in T."""
    import numpy as np

    if len(cas) == 1:
        return np.ones((*temperature.shape, 1)), np.zeros((*temperature.shape, 1))
    pair = (cas[0], cas[1])
    position = temperature / GAMMA_T_SPACING
    low = position.astype(int)  # (as floor: positions and xs are not negative)
    weight = (position - low)[..., None]
    xs = np.minimum(np.maximum(x1, 0.0), 1.0) * (GAMMA_X_POINTS - 1)
    xi = np.minimum(xs.astype(int), GAMMA_X_POINTS - 2)
    xw = (xs - xi)[..., None]
    first, block = _gamma_block(pair, int(low.min()), int(low.max()) + 1)
    flat = block.reshape(-1, block.shape[-1])  # (nodes·points, n): one index reads a corner
    corner = (low - first) * GAMMA_X_POINTS + xi
    below = (1.0 - xw) * flat[corner] + xw * flat[corner + 1]
    corner = corner + GAMMA_X_POINTS
    above = (1.0 - xw) * flat[corner] + xw * flat[corner + 1]
    found: Array = np.exp((1.0 - weight) * below + weight * above)
    return found, (above - below) / GAMMA_T_SPACING


def _across(values: Array) -> Array:
    """The sum over the last axis (the components), as `values.sum(-1)` gives it, without a
    numpy reduction over a short axis (slow per call on one or two components)."""
    if values.shape[-1] == 1:
        return values[..., 0]
    if values.shape[-1] == 2:
        found: Array = values[..., 0] + values[..., 1]
        return found
    summed: Array = values.sum(-1)
    return summed


# --- the model ----------------------------------------------------------------------------


class _Batch:
    """The film patches and pocket of every sample, and their right-hand sides."""

    def __init__(
        self, analysis: PreparationAnalysis, given: BatchInputs, assumptions: PrepAssumptions
    ) -> None:
        import numpy as np

        self.cas = tuple(analysis.cas)
        n = len(self.cas)
        s = len(given.volume)
        self.samples = s
        self.pressure = STANDARD_PRESSURE
        self.skin = given.skin_temperature
        self.air = given.air_temperature
        self.speed = given.air_speed
        self.under_speed = assumptions.under_drape_air_speed
        self.conductance = given.tissue_conductance
        self.emissivity = assumptions.film_emissivity
        self.pocket_volume = given.pocket_volume
        self.pocket_exchange = given.pocket_exchange
        # patches, as film_patches: (S, P)
        exposed = given.hair_exposed_fraction if given.hair else np.ones(s)
        layer = given.hair_still_layer if given.hair else np.zeros(s)
        if given.pooling:
            pool_area = given.area * given.pooling_area_fraction
            volumes = [given.volume * (1 - given.pooling_volume_fraction)]
            volumes.append(given.volume * given.pooling_volume_fraction)
            areas = [given.area - pool_area, pool_area]
            self.sheltered = np.array([False, True])
        else:
            volumes, areas = [given.volume], [given.area]
            self.sheltered = np.array([False])
        self.patch_area = np.stack([a * exposed for a in areas], axis=1)
        self.flow_length = np.stack([np.sqrt(a) for a in areas], axis=1)
        self.layer = layer[:, None]
        patch_volume = np.stack(volumes, axis=1)
        # properties at the boundary layer's mean temperature, per sample
        mean = 0.5 * (self.skin + self.air)
        self.viscosity = np.array([air_kinematic_viscosity(t, self.pressure) for t in mean])
        self.k_air = np.array([air_thermal_conductivity(t, self.pressure) for t in mean])
        density = self.pressure * AIR_MOLAR_MASS / (GAS_CONSTANT * mean)
        self.rho_cp = density * np.array([air_heat_capacity(t) for t in mean])
        self.alpha = self.k_air / self.rho_cp
        self.diffusivity = np.array(
            [film_diffusivities(analysis, assumptions, float(t), self.pressure)[0] for t in mean]
        )  # (S, n)
        self.molar_mass = np.array([substance(c).molar_mass for c in self.cas])
        self.volatile = np.array(
            [vapour_pressure(c, float(given.skin_temperature[0])) > 0.0 for c in self.cas]
        )
        self.all_volatile = bool(self.volatile.all())
        self.volatile_count = int(self.volatile.sum())
        self.flammable = np.array(analysis.flammable)
        self.flammable_weights = np.where(self.flammable, self.molar_mass, 0.0)  # [kg/mol]
        self.lfl = np.array([lfl if lfl is not None else math.inf for lfl in analysis.lfls])
        self.molar_volume = np.array(analysis.molar_volumes)
        x0 = np.array(analysis.mole_fractions)
        per_mole = float(x0 @ self.molar_volume)
        self.initial = (patch_volume / per_mole)[:, :, None] * x0  # (S, P, n)
        self.room = np.zeros((s, n))
        if WATER_CAS in self.cas:
            water = self.cas.index(WATER_CAS)
            p_water = given.relative_humidity * _lookups(self.cas, self.air)[0][:, water]
            self.room[:, water] = p_water / (GAS_CONSTANT * self.air)
        self.flammable_mass0 = self.flammable_mass(self.initial)
        self.dry_mass = assumptions.dry_fraction * self.flammable_mass0
        self.temperature = np.repeat(self.skin[:, None], len(volumes), axis=1)
        # the film temperature's change over the last step, and that step: a first guess
        # for the next step's trial state (the film warms or cools steadily under drapes)
        self.drift = np.zeros_like(self.temperature)
        self.drift_step = np.zeros(s)
        self.transfer = np.zeros_like(self.initial)  # the last mass-transfer coefficients [m/s]
        self._transfer_constants()
        # the fastest film under the drapes: its temperature, vapour pressures and
        # mass-transfer coefficients (which no composition or pocket changes there)
        self.warm = np.maximum(self.skin, self.air)[:, None] * np.ones(len(volumes))
        self.warm_psat = _lookups(self.cas, self.warm)[0]
        self._surface(self.warm, self.initial, self.room, np.ones(s, dtype=bool), True)
        self.warm_transfer = self.transfer
        self.transfer = np.zeros_like(self.initial)

    PER_SAMPLE = (
        "air",
        "alpha",
        "conductance",
        "diffusivity",
        "drift",
        "drift_step",
        "dry_mass",
        "flammable_mass0",
        "floor",
        "flow_length",
        "forced",
        "heat_factor",
        "initial",
        "k_air",
        "layer",
        "layer_resistance",
        "natural_scale",
        "patch_area",
        "pocket_exchange",
        "pocket_volume",
        "rayleigh_per_buoyancy",
        "rho_cp",
        "room",
        "skin",
        "speed",
        "temperature",
        "transfer",
        "viscosity",
        "warm",
        "warm_psat",
        "warm_transfer",
    )
    """The attributes that hold one row per sample (the rest are per component or patch)."""

    def subset(self, lanes: Mask) -> _Batch:
        """The same model for the samples in `lanes` only (a search then steps those alone)."""
        import copy

        part = copy.copy(self)
        for name in self.PER_SAMPLE:
            setattr(part, name, getattr(self, name)[lanes])
        part.samples = int(lanes.sum())
        return part

    def take_back(self, part: _Batch, lanes: Mask, names: tuple[str, ...]) -> None:
        """The state `names` that `part` (`subset(lanes)`) moved on, copied back into these
        samples (a copy: the old arrays may still be read by a caller)."""
        for name in names:
            merged = getattr(self, name).copy()
            merged[lanes] = getattr(part, name)
            setattr(self, name, merged)

    def _transfer_constants(self) -> None:
        """What of the mass-transfer coefficients does not change with the film's state:
        shapes (S, P, n) (`ignite.physics.evaporation.film_mass_transfer_coefficient`)."""
        import numpy as np

        d = self.diffusivity[:, None, :]
        nu = self.viscosity[:, None, None]
        schmidt = nu / d
        # every branch of the laminar-plate correlation is a factor of Sc times Re^½
        factor = np.select(
            [schmidt < 0.005, schmidt < 0.05, schmidt < 10.0],
            [1.128 * np.sqrt(schmidt), np.sqrt(schmidt), 0.664 * np.cbrt(schmidt)],
            0.678 * np.cbrt(schmidt),
        )
        flow = self.flow_length[:, :, None]
        area = self.patch_area[:, :, None]
        # k_forced = factor·√(u·L/ν)·D/L = forced·√u
        self.forced = np.where(
            self.sheltered[None, :, None], 0.0, factor * np.sqrt(flow / nu) * d / flow
        )
        length = np.sqrt(area) / 4.0
        self.rayleigh_per_buoyancy = STANDARD_GRAVITY * length**3 / nu**2 * schmidt
        self.natural_scale = d / length
        self.floor = 8.0 * d / (math.pi * np.sqrt(4.0 * area / math.pi))
        lewis = self.alpha[:, None, None] / d
        self.heat_factor = self.rho_cp[:, None, None] * lewis ** (2.0 / 3.0)
        self.layer_resistance = self.layer[:, :, None] / d

    def flammable_mass(self, moles: Array) -> Array:
        import numpy as np

        found: Array = (np.maximum(moles, 0.0) * self.flammable_weights).sum(axis=(1, 2))
        return found

    def left(self, moles: Array) -> Array:
        import numpy as np

        # (as np.clip(np.nan_to_num(share), 0, 1): a sample that applied no flammable
        # liquid has none left)
        applied = self.flammable_mass0 > 0.0
        share = self.flammable_mass(moles) / np.where(applied, self.flammable_mass0, 1.0)
        found: Array = np.where(applied, np.minimum(np.maximum(share, 0.0), 1.0), 0.0)
        return found

    def pocket_index(self, concentrations: Array) -> Array:
        import numpy as np

        to_fraction = GAS_CONSTANT * self.air[:, None] / self.pressure
        fractions = np.maximum(concentrations, 0.0) * to_fraction
        return _across(np.where(self.flammable, fractions / self.lfl, 0.0))

    # -- the liquid surface --------------------------------------------------------------

    def _surface(
        self,
        temperature: Array,
        x: Array,
        far: Array,
        covered: Array,
        fastest: bool,
    ) -> tuple[Array, Array]:
        """(heat surplus [W/m²], fluxes [mol/(m²·s)]) of every patch, shapes (S,P), (S,P,n)."""
        surplus, fluxes, _, _ = self._surface_sloped(temperature, x, far, covered, fastest, False)
        return surplus, fluxes

    def _surface_sloped(
        self,
        temperature: Array,
        x: Array,
        far: Array,
        covered: Array,
        fastest: bool,
        sloped: bool,
    ) -> tuple[Array, Array, Array, Array]:
        """As `_surface`, with (when `sloped`) the surplus's and the fluxes' rates of change
        in T, worked out along every step: d ln P_sat/dT by Clausius–Clapeyron
        (ΔH_vap/RT²), d ln γ/dT from the table, the surface gas's weight and so the
        buoyancy, natural convection and the mixed transfer coefficients (ΔH_vap's own
        change with T, about 0.1 % per K, is left out, so the slope is close, not exact).
        Where natural convection starts, stops or changes correlation the surplus has a
        kink (or a small step at Ra = 1e7), which `_settle` brackets."""
        import numpy as np

        t = temperature
        gammas, d_ln_gammas = _gammas_sloped(self.cas, t, x[..., 0])
        psat, heats = _lookups(self.cas, t)
        volatile = self.volatile
        every = self.all_volatile  # (then the masks below change nothing)
        partial = x * gammas * psat if every else np.where(volatile, x * gammas * psat, 0.0)
        fractions = partial / self.pressure
        surface_mass = (1.0 - _across(fractions)) * AIR_MOLAR_MASS + fractions @ self.molar_mass
        far_fractions = np.maximum(far, 0.0) * GAS_CONSTANT * self.air[:, None] / self.pressure
        rest = np.maximum(1.0 - _across(far_fractions), 0.0)
        far_mass = (rest * AIR_MOLAR_MASS + far_fractions @ self.molar_mass)[:, None]
        if fastest:
            surface_mass = np.full_like(t, AIR_MOLAR_MASS)
            far_mass = np.full_like(t, AIR_MOLAR_MASS)
        air = self.air[:, None]
        buoyancy = 1.0 - surface_mass * air / (far_mass * t)
        root_speed = np.sqrt(np.where(covered, self.under_speed, self.speed))[:, None, None]
        lift = np.maximum(buoyancy, 0.0)
        # the components along the last axis (a component that does not evaporate has
        # no flux and no share in the heat transfer coefficient)
        k_forced = self.forced * root_speed
        rayleigh = self.rayleigh_per_buoyancy * lift[..., None]
        laminar = rayleigh <= 1e7
        sh_natural = np.where(laminar, 0.54 * np.sqrt(np.sqrt(rayleigh)), 0.15 * np.cbrt(rayleigh))
        k_natural = sh_natural * self.natural_scale
        k_mixed = np.cbrt(k_forced**3 + k_natural**3)
        above_floor = k_mixed > self.floor
        k_open = np.where(above_floor, k_mixed, self.floor)
        count = self.volatile_count
        heat = k_open * self.heat_factor
        h_sum = _across(heat if every else np.where(volatile, heat, 0.0))
        k = 1.0 / (1.0 / k_open + self.layer_resistance)
        k = k if every else np.where(volatile, k, 0.0)
        self.transfer = k
        at_surface = partial / (GAS_CONSTANT * t)[..., None]
        driving = at_surface - far[:, None, :]
        fluxes = k * driving
        latent = _across(fluxes * heats)
        h_open = h_sum / max(count, 1)
        layered = (self.layer > 0.0) & (h_open > 0.0)
        with np.errstate(divide="ignore"):
            h = np.where(layered, 1.0 / (1.0 / h_open + self.layer / self.k_air[:, None]), h_open)
        h_r = self.emissivity * STEFAN_BOLTZMANN * (t + air) * (t**2 + air**2)
        surplus = (
            self.conductance[:, None] * (self.skin[:, None] - t) + (h + h_r) * (air - t) - latent
        )
        if not sloped:
            return surplus, fluxes, surplus, fluxes
        # d ln (x γ P_sat)/dT, and what follows from it: the surface gas's weight, the
        # buoyancy, the relative change of the lift (0 where there is none), natural
        # convection and the mixed coefficients
        d_ln_partial = heats / (GAS_CONSTANT * t * t)[..., None] + d_ln_gammas
        d_surface_mass = (fractions * d_ln_partial) @ (self.molar_mass - AIR_MOLAR_MASS)
        d_buoyancy = air / far_mass * (surface_mass / t**2 - d_surface_mass / t)
        self.buoyancy = buoyancy
        with np.errstate(divide="ignore", invalid="ignore"):
            d_ln_lift = np.where(buoyancy > 0.0, d_buoyancy / buoyancy, 0.0)
            d_k_natural = k_natural * d_ln_lift[..., None] * np.where(laminar, 0.25, 1.0 / 3.0)
            d_k_mixed = np.where(k_mixed > 0.0, k_natural**2 * d_k_natural / k_mixed**2, 0.0)
        d_k_open = np.where(above_floor if every else above_floor & volatile, d_k_mixed, 0.0)
        d_h_sum = _across(d_k_open * self.heat_factor)
        d_k = d_k_open * (k / k_open) ** 2
        d_at_surface = at_surface * (d_ln_partial - 1.0 / t[..., None])
        d_fluxes = d_k * driving + k * d_at_surface
        d_fluxes = d_fluxes if every else np.where(volatile, d_fluxes, 0.0)
        d_latent = _across(d_fluxes * heats)
        d_h_open = d_h_sum / max(count, 1)
        with np.errstate(divide="ignore", invalid="ignore"):
            d_h = np.where(layered, d_h_open * (h / h_open) ** 2, d_h_open)
        d_h_r = self.emissivity * STEFAN_BOLTZMANN * (3.0 * t**2 + 2.0 * air * t + air**2)
        slope = -self.conductance[:, None] - h - h_r + (d_h + d_h_r) * (air - t) - d_latent
        return surplus, fluxes, slope, d_fluxes

    def fluxes(self, moles: Array, far: Array, covered: Array, fastest: bool) -> Array:
        """Fluxes of every patch at its film temperature (the heat balance, or the warmest)."""
        import numpy as np

        total = np.maximum(moles, 0.0).sum(-1)
        x = np.where(
            total[..., None] > 0.0,
            np.maximum(moles, 0.0) / np.maximum(total, 1e-300)[..., None],
            0.0,
        )
        if fastest and covered.all():
            # at a fixed temperature under the drapes only the activity coefficients and
            # the pocket change (`_surface` in fewer steps, to the same figures)
            gammas = _gammas(self.cas, self.warm, x[..., 0])
            partial = np.where(self.volatile, x * gammas * self.warm_psat, 0.0)
            at_surface = partial / (GAS_CONSTANT * self.warm)[..., None]
            self.transfer = self.warm_transfer
            found: Array = self.warm_transfer * (at_surface - far[:, None, :])
            return found
        if fastest:
            warm = np.maximum(self.skin, self.air)[:, None] * np.ones_like(total)
            return self._surface(warm, x, far, covered, True)[1]
        found, self.temperature = _settle(self, self.temperature, x, far, covered, total > 0.0)
        return np.where(total[..., None] > 0.0, found, 0.0)

    def rates(self, moles: Array, pocket: Array, covered: Array, fastest: bool) -> _Rates:
        """d moles/dt (S,P,n), and the film's source into the pocket [mol/s] and the
        conductance [m³/s] by which it falls as the pocket fills (S,n)."""
        import numpy as np

        far = np.where(covered[:, None], pocket, self.room)
        flux = self.fluxes(moles, far, covered, fastest)
        liquid = np.maximum(moles, 0.0) @ self.molar_volume
        wetted = self.patch_area * np.minimum(1.0, liquid / (self.patch_area * BREAKUP_THICKNESS))
        rate = wetted[..., None] * flux
        conductance = (wetted[..., None] * self.transfer).sum(axis=1)
        return -rate, rate.sum(axis=1), conductance

    def pocket_after(
        self, pocket: Array, source: Array, conductance: Array, dt: Array, covered: Array
    ) -> Array:
        """The pocket `dt` later, its source `source` at the present `pocket`, falling by
        `conductance` times the rise: the linear equation V·dc/dt = S − G·(c − c₀) −
        Q·(c − c_room) solved exactly over the step, which is stable however short the
        pocket's time constant V/(Q + G) (an explicit step is not, past twice it)."""
        import numpy as np

        if not covered.any():
            return pocket
        rate = self.pocket_exchange[:, None] + conductance
        with np.errstate(divide="ignore", invalid="ignore"):
            level = (
                self.pocket_exchange[:, None] * self.room + source + conductance * pocket
            ) / rate
            decay = np.exp(-dt[:, None] * rate / self.pocket_volume[:, None])
        moved = np.where(
            rate > 0.0,
            level + (pocket - level) * decay,
            pocket + dt[:, None] * source / self.pocket_volume[:, None],
        )
        return np.where(covered[:, None], moved, pocket)


def _settle(
    model: _Batch, t: Array, x: Array, far: Array, covered: Array, wet: Mask
) -> tuple[Array, Array]:
    """(fluxes, temperatures) at the film temperature: the root of the heat surplus, found
    from the temperatures `t` by Newton's method kept inside a bracket.

    The step uses the surplus's slope (`_surface_sloped`, within 1 % of a numerical
    derivative on the sample cases). Each evaluation narrows a bracket on the root; a
    step that would leave it, or is not half the last step (the safeguard of Numerical
    Recipes' rtsafe), is replaced: by false position in y = lift^¼ when natural convection
    is on at an end (Illinois: an end kept twice over counts half), else by the bracket's
    middle. That settles the samples whose surplus has a kink or a step near the root
    (natural convection starting, leaving the diffusion floor or changing correlation),
    where Newton's steps swing across. A sample is done:
    - once its step, inside the bracket, is under NEWTON_LINEAR; its fluxes are then
      moved to first order by the step along their own slope (the second-order term
      is under 1e-4 of a flux);
    - or once its bracket is narrower than BRACKET_WIDTH; its fluxes are then those at
      the end last evaluated.
    Only `wet` patches count: a dry patch's temperature moves no flux. After the first step
    the few samples not yet settled go on alone, on `model.subset` of them, so their extra
    steps do not evaluate every sample again."""
    import numpy as np

    low = np.full_like(t, -np.inf)
    high = np.full_like(t, np.inf)
    f_low, f_high, b_low, b_high = (np.zeros_like(t) for _ in range(4))  # at the ends
    moved_end = np.zeros_like(t)  # +1: the last evaluation moved the low end, -1: the high
    previous = np.full_like(t, np.inf)  # the size of the last step taken
    done = ~wet
    found = np.zeros_like(x)
    for iteration in range(ROOT_ITERATIONS):
        surplus, flux, slope, d_flux = model._surface_sloped(t, x, far, covered, False, True)
        raised = (surplus > 0.0) & (t > low)
        lowered = (surplus <= 0.0) & (t < high)
        low, high = np.where(raised, t, low), np.where(lowered, t, high)
        # (Illinois: an end kept twice over counts half, so that both ends move)
        f_low = np.where(raised, surplus, np.where(lowered & (moved_end < 0), 0.5, 1.0) * f_low)
        f_high = np.where(lowered, surplus, np.where(raised & (moved_end > 0), 0.5, 1.0) * f_high)
        moved_end = np.where(raised, 1.0, np.where(lowered, -1.0, moved_end))
        b_low = np.where(raised, model.buoyancy, b_low)
        b_high = np.where(lowered, model.buoyancy, b_high)
        with np.errstate(divide="ignore", invalid="ignore"):
            step = np.where(slope < 0.0, -surplus / slope, np.sign(surplus) * NEWTON_STEP)
        candidate = t + step
        settled = (
            ~done
            & (slope < 0.0)
            & (np.abs(step) < NEWTON_LINEAR)
            & (candidate >= low)
            & (candidate <= high)
        )
        narrow = ~done & ~settled & (high - low < BRACKET_WIDTH)
        found = np.where(settled[..., None], flux + d_flux * step[..., None], found)
        found = np.where(narrow[..., None], flux, found)
        step = np.where(settled, step, np.where(narrow, 0.0, step))
        t_next = t + np.where(settled, step, 0.0)
        done = done | settled | narrow
        if done.all():
            return found, t_next
        candidate = t + np.clip(step, -NEWTON_STEP, NEWTON_STEP)
        bracketed = np.isfinite(low) & np.isfinite(high)
        # a Newton step that leaves the bracket, or is not half the last one, is not used
        leaves = (candidate <= low) | (candidate >= high)
        leaves = leaves | (bracketed & (np.abs(step) > 0.5 * previous))
        with np.errstate(invalid="ignore", divide="ignore"):
            halved = np.where(np.isfinite(low) & np.isfinite(high), 0.5 * (low + high), t)
            # a bracket with natural convection at one end or both: the surplus bends
            # sharply where natural convection lifts the mass-transfer coefficients off
            # their diffusion floor; false position is taken in y = lift^¼ (laminar
            # natural convection grows as y), where it is nearer straight than in T, and
            # mapped back through the buoyancy, taken as linear across the bracket
            y_low = np.sqrt(np.sqrt(np.maximum(b_low, 0.0)))
            y_high = np.sqrt(np.sqrt(np.maximum(b_high, 0.0)))
            across = bracketed & ((b_low > 0.0) | (b_high > 0.0))
            y_root = y_low + f_low * (y_high - y_low) / (f_low - f_high)
            lifted = low + (y_root**4 - b_low) / (b_high - b_low) * (high - low)
            across = across & (lifted > low) & (lifted < high)
        inner = np.where(across, lifted, halved)
        t_then = t
        t = np.where(done, t_next, np.where(leaves, inner, candidate))
        previous = np.abs(t - t_then)
        rows: Mask = np.asarray(~done.all(axis=1))  # samples with a patch still to settle
        if iteration == 0 and 2 * int(rows.sum()) <= rows.size:
            part = model.subset(rows)
            rest, t_rest = _settle(part, t[rows], x[rows], far[rows], covered[rows], ~done[rows])
            open_rows = ~done[rows]
            found[rows] = np.where(open_rows[..., None], rest, found[rows])
            t[rows] = np.where(open_rows, t_rest, t[rows])
            model.take_back(part, rows, ("transfer",))
            return found, t
    raise RuntimeError("the film temperature did not settle")  # a bracket halves each time


def _step_size(model: _Batch, moles: Array, change: Array, cap: Array) -> Array:
    """Each sample's step: at most STEP_CHANGE of the flammable liquid left, at most
    STEP_STABLE of any component left (Heun's method is stable to twice a component's
    e-folding time), at most STEP_MAX and `cap`."""
    import numpy as np

    weights = model.flammable_weights
    mass = (np.maximum(moles, 0.0) * weights).sum(axis=(1, 2))
    loss = (-np.minimum(change, 0.0) * weights).sum(axis=(1, 2))
    with np.errstate(divide="ignore", invalid="ignore"):
        # past a millionth of the flammable liquid nothing read from it changes
        needed = (loss > 0.0) & (mass > GONE_SHARE * model.flammable_mass0)
        # below the dry fraction the share grows to TAIL_CHANGE: Heun's method leaves
        # more of a decaying film than there is (1 - z + z²/2 > e^-z), so it errs wet
        share_of_mass = np.where(mass > model.dry_mass, STEP_CHANGE, TAIL_CHANGE)
        accurate = np.where(needed, share_of_mass * mass / loss, np.inf)
        share = np.where(change < 0.0, np.maximum(moles, 0.0) / -change, np.inf)
    share = np.where(moles > GONE_SHARE * model.initial, share, np.inf)
    # a patch thinner than twice the breakup film holds under 0.1 % of any application:
    # it may leave within a step (clipped at zero), not hold every sample's step down
    liquid = np.maximum(moles, 0.0) @ model.molar_volume
    thin = liquid < 2.0 * BREAKUP_THICKNESS * model.patch_area
    share = np.where(thin[..., None], np.inf, share)
    stable = STEP_STABLE * share.reshape(model.samples, -1).min(axis=1)
    found: Array = np.clip(np.minimum(np.minimum(accurate, stable), cap), STEP_MIN, STEP_MAX)
    return found


def _heun(
    model: _Batch,
    moles: Array,
    pocket: Array,
    covered: Array,
    fastest: bool,
    cap: Array,
    start: _Rates | None = None,
) -> tuple[Array, Array, Array]:
    """One step of every sample: (moles, pocket, the step taken [s]); `cap` 0 holds a
    sample. `start`: the rates at the present state, when already computed. Once half the
    samples or more are held, the others step alone (`_Batch.subset`)."""
    import numpy as np

    moving = cap > 0.0
    count = int(moving.sum())
    if count > 0 and 2 * count <= moving.size:
        part = model.subset(moving)
        given = None if start is None else (start[0][moving], start[1][moving], start[2][moving])
        stepped = _heun(
            part, moles[moving], pocket[moving], covered[moving], fastest, cap[moving], given
        )
        moles, pocket = moles.copy(), pocket.copy()
        moles[moving], pocket[moving] = stepped[0], stepped[1]
        dt = np.zeros_like(cap)
        dt[moving] = stepped[2]
        model.take_back(part, moving, ("temperature", "transfer", "drift", "drift_step"))
        return moles, pocket, dt

    d_moles, source, conductance = start or model.rates(moles, pocket, covered, fastest)
    dt = np.where(cap > 0.0, _step_size(model, moles, d_moles, cap), 0.0)
    trial = np.maximum(moles + dt[:, None, None] * d_moles, 0.0)
    trial_pocket = model.pocket_after(pocket, source, conductance, dt, covered)
    if not fastest:
        # the trial's film temperature first guessed along the last step's change (at
        # most NEWTON_STEP; a dry patch's temperature is not solved, so it carries none)
        present = model.temperature
        with np.errstate(divide="ignore", invalid="ignore"):
            scale = np.where(model.drift_step > 0.0, np.minimum(dt / model.drift_step, 2.0), 0.0)
        guess = np.clip(model.drift * scale[:, None], -NEWTON_STEP, NEWTON_STEP)
        model.temperature = present + guess
    d_moles2, source2, conductance2 = model.rates(trial, trial_pocket, covered, fastest)
    if not fastest:
        moved = (dt > 0.0)[:, None] & (trial.sum(-1) > 0.0)
        model.drift = np.where(moved, model.temperature - present, 0.0)
        model.drift_step = np.where(dt > 0.0, dt, model.drift_step)
    moles = np.maximum(moles + 0.5 * dt[:, None, None] * (d_moles + d_moles2), 0.0)
    # the pocket: the two sources averaged, the trial's carried back to the present pocket
    # along its conductance, and the linear equation solved over the step
    mean_conductance = 0.5 * (conductance + conductance2)
    mean_source = 0.5 * (source + source2 + conductance2 * (trial_pocket - pocket))
    pocket = model.pocket_after(pocket, mean_source, mean_conductance, dt, covered)
    return moles, pocket, dt


# --- the timeline -----------------------------------------------------------------------------


@dataclass
class _History:
    times: list[Array]
    moles: list[Array]

    def at(self, when: Array, lanes: Mask | None = None) -> Array:
        """Each sample's film at its own time `when` (S,), linear between steps; of the
        samples in `lanes` only (when given; `when` then holds theirs)."""
        import numpy as np

        times = np.array(self.times)  # (K, S)
        moles = np.array(self.moles)  # (K, S, P, n)
        if lanes is not None:
            times, moles = times[:, lanes], moles[:, lanes]
        index = np.clip((times <= when[None, :]).sum(axis=0) - 1, 0, len(times) - 2)
        columns = np.arange(times.shape[1])
        t0, t1 = times[index, columns], times[index + 1, columns]
        with np.errstate(divide="ignore", invalid="ignore"):
            weight = np.clip(np.where(t1 > t0, (when - t0) / (t1 - t0), 1.0), 0.0, 1.0)
        m0, m1 = moles[index, columns], moles[index + 1, columns]
        found: Array = m0 + weight[:, None, None] * (m1 - m0)
        return found


def _open_air(model: _Batch, dry_fraction: float) -> tuple[_History, Array, Array]:
    """The slow film in open air from the end of prepping until nearly gone (or the
    horizon): its history, when each sample was nearly gone (inf: never)."""
    import numpy as np

    s = model.samples
    moles = model.initial.copy()
    pocket = np.zeros_like(model.room)
    t = np.zeros(s)
    gone = np.full(s, math.inf)
    history = _History([t.copy()], [moles.copy()])
    covered = np.zeros(s, dtype=bool)
    while True:
        active = np.isinf(gone) & (t < HORIZON)
        if not active.any():
            break
        cap = np.where(active, np.minimum(HORIZON - t, OPEN_STEP_MAX), 0.0)
        moles, pocket, dt = _heun(model, moles, pocket, covered, False, cap)
        t = t + dt
        left = model.left(moles)
        gone = np.where(np.isinf(gone) & (left <= dry_fraction * 1e-2), t, gone)
        history.times.append(t.copy())
        history.moles.append(moles.copy())
    return history, gone, t


def _covered(
    model: _Batch,
    start: Array,
    film: Array,
    dry_fraction: float,
    fastest: bool,
    *,
    until: str,
    watch: Array | None = None,
    lanes: Mask | None = None,
) -> tuple[Array, Array, Array, Array, Array, Array]:
    """Film and pocket from draping at `start` (S,) on. Returns (peak, drying time, left at
    `watch`, pocket at `watch`, film times (K,S), film left (K,S)).

    until='peak': stop once the peak has passed (the held level below 0.9 of the pocket's,
    as the scalar solver) or the film is nearly gone; until='dry': once the film is dry
    and `watch` has passed (the film's curve then holds its last value: errs wet).
    `lanes`: the samples to run (the rest hold still; default all)."""
    import numpy as np

    s = model.samples
    moles = film.copy()
    pocket = model.room.copy()
    t = start.copy()
    covered = np.ones(s, dtype=bool)
    peak = np.zeros(s)
    dry = np.where(model.left(moles) <= dry_fraction, start, math.inf)
    watch = np.full(s, math.inf) if watch is None else watch
    left_at = np.where(watch <= start, model.left(moles), np.nan)
    pocket_at = np.where(watch <= start, 0.0, np.nan)
    done = np.zeros(s, dtype=bool) if lanes is None else ~lanes
    times, lefts = [t.copy()], [model.left(moles)]
    while True:
        rates = model.rates(moles, pocket, covered, fastest)
        if until == "peak":
            # the peak has passed once the level the film's present source would hold the
            # pocket at is below 0.9 of the pocket's own (as the scalar solver)
            source = -rates[0].sum(axis=1)
            with np.errstate(divide="ignore", invalid="ignore"):
                held = model.pocket_index(source / model.pocket_exchange[:, None])
            index = model.pocket_index(pocket)
            passed = (model.pocket_exchange > 0.0) & (held < 0.9 * index) & (t > start)
            done = done | passed
        active = ~done & (t < HORIZON)
        if not active.any():
            break
        to_watch = np.where(t < watch, watch - t, np.inf)
        cap = np.where(active, np.minimum(to_watch, HORIZON - t), 0.0)
        moles, pocket, dt = _heun(model, moles, pocket, covered, fastest, cap, rates)
        t = t + dt
        left = model.left(moles)
        index = model.pocket_index(pocket)
        peak = np.maximum(peak, np.where(active, index, 0.0))
        dry = np.where(np.isinf(dry) & (left <= dry_fraction), t, dry)
        reached = np.isnan(left_at) & (t >= watch)
        left_at = np.where(reached, left, left_at)
        pocket_at = np.where(reached, index, pocket_at)
        finished = left <= (dry_fraction * 1e-2 if until == "peak" else dry_fraction)
        finished = finished & ~(np.isnan(left_at) & np.isfinite(watch))
        done = done | (active & finished)
        times.append(t.copy())
        lefts.append(left)
    left_at = np.where(np.isnan(left_at), model.left(moles), left_at)
    pocket_at = np.where(np.isnan(pocket_at), model.pocket_index(pocket), pocket_at)
    return peak, dry, left_at, pocket_at, np.array(times), np.array(lefts)


def dry_batch(
    analysis: PreparationAnalysis, given: BatchInputs, assumptions: PrepAssumptions
) -> BatchDrying:
    """Drying time, liquid left at activation, pocket peak and safe draping time of every
    sample (see the module's note for the method and the side each errs on). The same
    samples solved by the same code before are read from the cache directory when kept
    there (`ignite.simulate.kept`), identical to solving them again."""
    import hashlib

    if not batch_supported(analysis):
        raise ValueError("the batch solver takes preparations of one or two components")
    arrays = hashlib.sha256()
    for name, value in vars(given).items():
        arrays.update(name.encode("utf-8"))
        arrays.update(value.tobytes() if hasattr(value, "tobytes") else repr(value).encode())
    constants = (STEP_CHANGE, STEP_STABLE, STEP_MAX, STEP_MIN, SAFE_TOLERANCE, HORIZON)
    key = (analysis, arrays.hexdigest(), len(given.volume), assumptions, constants)
    return kept("drying-batch", key, BatchDrying, lambda: _dry_batch(analysis, given, assumptions))


def _dry_batch(
    analysis: PreparationAnalysis, given: BatchInputs, assumptions: PrepAssumptions
) -> BatchDrying:
    """`dry_batch`, solved (not read from the kept results)."""
    import numpy as np

    slow = _Batch(analysis, given, assumptions)
    fast = _Batch(analysis, given, assumptions)
    dry_fraction = assumptions.dry_fraction
    margin = assumptions.pocket_margin
    history, gone, end = _open_air(slow, dry_fraction)
    draping = given.draping_after
    activation = given.first_activation_after
    open_times = np.array(history.times)
    open_left = np.array([slow.left(m) for m in history.moles])

    # as planned: the slow film for drying and the liquid left; the fastest for the pocket
    film_at_draping = history.at(np.minimum(draping, end))
    still_there = draping < end
    _, dry_covered, left_covered, _, covered_times, covered_left = _covered(
        slow, draping, film_at_draping, dry_fraction, False, until="dry", watch=activation
    )
    open_dry = _first_time(open_times, open_left, dry_fraction)
    drying = np.where(still_there, np.where(open_dry <= draping, open_dry, dry_covered), open_dry)
    left_open = _left_at(open_times, open_left, activation)
    left_at_activation = np.where(still_there & (activation >= draping), left_covered, left_open)
    peak, *_ = _covered(fast, draping, film_at_draping, dry_fraction, True, until="peak")
    peak = np.where(still_there, peak, 0.0)

    # the safe draping time: regula falsi (Illinois) on the peak against the draping time,
    # the planned draping a first point inside the bracket; each bracket's upper end safe.
    # A sample whose planned draping is unsafe needs no run from the end of prepping (the
    # peak only falls with later draping): the planned draping is its bracket's lower end.
    inside = still_there & (draping > 0.0) & (draping < gone)
    unsafe_as_planned = inside & (peak > margin)
    first = peak.copy()
    need_first = ~unsafe_as_planned
    if need_first.any():
        first[need_first] = _covered(
            fast.subset(need_first),
            np.zeros(int(need_first.sum())),
            fast.initial[need_first],
            dry_fraction,
            True,
            until="peak",
        )[0]
    low, f_low = np.zeros_like(draping), first - margin
    high = np.where(np.isinf(gone), math.inf, gone)
    f_high = np.full_like(draping, -margin)  # nothing left to feed the pocket
    low = np.where(unsafe_as_planned, draping, low)
    f_low = np.where(unsafe_as_planned, peak - margin, f_low)
    high = np.where(inside & (peak <= margin), draping, high)
    f_high = np.where(inside & (peak <= margin), peak - margin, f_high)
    safe = np.where(first <= margin, 0.0, high)
    searching = (first > margin) & np.isfinite(high)
    side = np.zeros_like(draping)
    for _ in range(40):
        searching = searching & ((high - low) > np.maximum(0.5, SAFE_TOLERANCE * high))
        if not searching.any():
            break
        # (samples not searching may hold an infinite end: their guess is not used)
        with np.errstate(divide="ignore", invalid="ignore"):
            guess = low + f_low * (high - low) / (f_low - f_high)
            # a guess within a twentieth of the bracket of an end moves to that twentieth,
            # so the bracket narrows from both sides even where the peak bends sharply
            guess = np.clip(guess, low + 0.05 * (high - low), high - 0.05 * (high - low))
        middle = np.where(searching, guess, 0.0)
        film = history.at(middle[searching], searching)
        found = np.zeros_like(middle)
        found[searching] = _covered(
            fast.subset(searching), middle[searching], film, dry_fraction, True, until="peak"
        )[0]
        ok = searching & (found <= margin)
        unsafe = searching & (found > margin)
        # Illinois: halve the value kept at the end that stays, so both ends move
        f_low = np.where(ok & (side == 1.0), 0.5 * f_low, f_low)
        f_high = np.where(unsafe & (side == -1.0), 0.5 * f_high, f_high)
        high = np.where(ok, middle, high)
        f_high = np.where(ok, found - margin, f_high)
        low = np.where(unsafe, middle, low)
        f_low = np.where(unsafe, found - margin, f_low)
        side = np.where(ok, 1.0, np.where(unsafe, -1.0, side))
    safe = np.where((first > margin) & np.isfinite(gone), high, safe)

    return BatchDrying(
        drying_time_s=drying,
        left_at_activation=left_at_activation,
        pocket_peak=peak,
        safe_draping_after_s=safe,
        open_times=open_times,
        open_left=open_left,
        covered_times=covered_times,
        covered_left=covered_left,
        draping_after=draping,
    )


def _first_time(times: Array, left: Array, level: float | Array) -> Array:
    """Each sample's first time on the grid (end of the step) at which `left` ≤ level (one
    level, or each sample's own)."""
    import numpy as np

    below = left <= level
    index = np.argmax(below, axis=0)
    found = times[index, np.arange(times.shape[1])]
    return np.where(below.any(axis=0), found, math.inf)


def _left_at(times: Array, left: Array, when: Array) -> Array:
    """`left` at each sample's time `when`, read at the last step at or before it (the
    earlier, wetter state: errs wet)."""
    import numpy as np

    index = np.clip((times <= when[None, :]).sum(axis=0) - 1, 0, len(times) - 1)
    found: Array = left[index, np.arange(times.shape[1])]
    return found
