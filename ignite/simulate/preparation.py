"""A preparation's liquid and the vapour over it: UNIFAC, mixture flash point, mixture LFL.

`analyse_preparation` steps the formulas of `ignite.physics.vapour` through one
preparation as the room file gives it: resolve each component, keep the ones with
liquid data, turn the strength into liquid mole fractions, then the activity
coefficients at the film temperature, the flash point by Liaw et al. (2002) and the
LFL of the saturated vapour by Le Chatelier's rule. What a reader should know about the
result (a component left out, one that is not fuel) comes back as `Note` codes.

Mole fractions are [-], temperatures [K], pressures [Pa], molar volumes [m³/mol].
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from ignite.physics.vapour import (
    FIRE_DATA_METHODS,
    STANDARD_PRESSURE,
    UNIFAC_VARIANTS,
    VOLUME_BASIS_TEMPERATURE,
    WATER_CAS,
    Substance,
    SubstanceDataError,
    activity_model,
    activity_model_name,
    lfl_le_chatelier,
    liquid_molar_volume,
    mixture_flash_point,
    mole_fractions_from_mass,
    mole_fractions_from_volume,
    substance,
    vapour_pressure,
)
from ignite.simulate.kept import kept
from ignite.simulate.notes import Note

__all__ = ["PreparationAnalysis", "analyse_preparation"]


@dataclass(frozen=True)
class PreparationAnalysis:
    """A preparation's liquid and the vapour over it, at the film temperature."""

    names: tuple[str, ...]  # common names as resolved
    cas: tuple[str, ...]
    mole_fractions: tuple[float, ...]  # liquid, normalised over the components kept
    activity_coefficients: tuple[float, ...]  # UNIFAC (Dortmund) at film_temperature_K
    flammable: tuple[bool, ...]  # has an LFL in FIRE_DATA_METHODS (water: False)
    flash_point_K: float | None  # mixture, Liaw et al. (2002)
    lfl_fraction: float | None  # Le Chatelier over the saturated vapour's flammable part
    saturated_vapour_fraction: float | None  # flammable vapour in saturated air, film T
    film_temperature_K: float
    methods: tuple[str, ...] = ()
    notes: tuple[Note, ...] = ()
    molar_volumes: tuple[float, ...] = ()  # m³/mol of each pure liquid at the basis temperature
    lfls: tuple[float | None, ...] = ()  # pure LFL_i [-]


def analyse_preparation(
    components: Sequence[tuple[str, float]],
    basis: str,
    film_temperature_K: float,
    *,
    pressure: float = STANDARD_PRESSURE,
    basis_temperature_K: float = VOLUME_BASIS_TEMPERATURE,
) -> PreparationAnalysis:
    """Resolve a preparation's components and describe its liquid and vapour.

    components : (common name or CAS number, fraction 0-1) as in the room file
    basis : 'volume' or 'mass', what the fractions mean
    film_temperature_K : temperature of the liquid film [K]

    Fractions need not sum to 1 (non-volatile actives may be left out); mole
    fractions are normalised over the components kept. A component with no
    vapour-pressure correlation and no UNIFAC groups (a non-volatile active such as
    chlorhexidine) is left out of the liquid and named in `notes`. A component with
    no LFL in FIRE_DATA_METHODS is not counted as fuel, and `notes` say so.
    Raises UnknownSubstance for a name that `chemicals` cannot resolve, and
    SubstanceDataError when a volatile component has no UNIFAC groups or a kept
    component has no liquid density (needed on either basis: the film's volume is
    turned into moles with it).

    Worked example, 70 % v/v isopropanol in water on skin at 32 °C:

    >>> a = analyse_preparation([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15)
    >>> round(a.flash_point_K - 273.15, 1), a.lfl_fraction, round(a.saturated_vapour_fraction, 3)
    (19.2, 0.02, 0.055)

    The same analysis by the same code is read from the cache directory when kept there
    (`ignite.simulate.kept`), identical to working it out again.
    """
    key = (tuple(components), basis, film_temperature_K, pressure, basis_temperature_K)
    return kept(
        "preparation",
        key,
        PreparationAnalysis,
        lambda: _analyse_preparation(
            components,
            basis,
            film_temperature_K,
            pressure=pressure,
            basis_temperature_K=basis_temperature_K,
        ),
    )


def _analyse_preparation(
    components: Sequence[tuple[str, float]],
    basis: str,
    film_temperature_K: float,
    *,
    pressure: float,
    basis_temperature_K: float,
) -> PreparationAnalysis:
    """`analyse_preparation`, worked out (not read from the kept results)."""
    if basis not in ("volume", "mass"):
        raise ValueError(f"basis must be 'volume' or 'mass', got {basis!r}")
    substances, fractions, notes = _liquid(components)
    cas = tuple(s.cas for s in substances)
    molar_volumes = tuple(liquid_molar_volume(c, basis_temperature_K) for c in cas)
    x = _mole_fractions(substances, fractions, molar_volumes, basis)
    gammas = activity_model(cas)(film_temperature_K, x)
    flammable = tuple(s.flammable for s in substances)
    notes.extend(_fuel_notes(substances))
    flash_point = mixture_flash_point(cas, x, pressure) if any(flammable) else None
    lfl, saturated = _saturated_vapour(substances, x, gammas, film_temperature_K, pressure)
    return PreparationAnalysis(
        names=tuple(s.name for s in substances),
        cas=cas,
        mole_fractions=x,
        activity_coefficients=gammas,
        flammable=flammable,
        flash_point_K=flash_point,
        lfl_fraction=lfl,
        saturated_vapour_fraction=saturated,
        film_temperature_K=film_temperature_K,
        methods=_methods(substances, cas, basis, basis_temperature_K),
        notes=tuple(notes),
        molar_volumes=molar_volumes,
        lfls=tuple(s.lfl for s in substances),
    )


def _liquid(
    components: Sequence[tuple[str, float]],
) -> tuple[list[Substance], list[float], list[Note]]:
    """The components that make up the liquid, their fractions, and notes on those left out.

    Raises SubstanceDataError when no component has liquid data.
    """
    found = [(substance(name), fraction) for name, fraction in components]
    notes: list[Note] = []
    kept: list[tuple[Substance, float]] = []
    for s, fraction in found:
        if not s.volatile and not s.unifac_groups:
            notes.append(Note.of("component-left-out", name=s.name))
            continue
        kept.append((s, fraction))
    if not kept:
        raise SubstanceDataError(
            ", ".join(name for name, _ in components), "no component has liquid data"
        )
    return [s for s, _ in kept], [f for _, f in kept], notes


def _mole_fractions(
    substances: Sequence[Substance],
    fractions: Sequence[float],
    molar_volumes: Sequence[float],
    basis: str,
) -> tuple[float, ...]:
    """Liquid mole fractions from fractions by volume (pure-liquid densities) or by mass."""
    molar_masses = [s.molar_mass for s in substances]
    if basis == "volume":
        densities = [m / v for m, v in zip(molar_masses, molar_volumes, strict=True)]
        return mole_fractions_from_volume(fractions, molar_masses, densities)
    return mole_fractions_from_mass(fractions, molar_masses)


def _fuel_notes(substances: Sequence[Substance]) -> list[Note]:
    """Notes on components that are not fuel, or are fuel without a flash point."""
    notes: list[Note] = []
    for s in substances:
        if not s.flammable:
            if s.cas != WATER_CAS:
                notes.append(Note.of("component-not-fuel", name=s.name, sources=FIRE_DATA_METHODS))
        elif s.flash_point is None:
            notes.append(Note.of("component-without-flash-point", name=s.name))
    return notes


def _saturated_vapour(
    substances: Sequence[Substance],
    mole_fractions: Sequence[float],
    gammas: Sequence[float],
    temperature: float,
    pressure: float,
) -> tuple[float | None, float | None]:
    """(mixture LFL by Le Chatelier, flammable vapour fraction) of air saturated over the liquid.

    Both None without a flammable component; the LFL None when there is no flammable vapour.
    """
    flammable = [s.flammable for s in substances]
    if not any(flammable):
        return None, None
    pressures = [
        x_i * g * vapour_pressure(s.cas, temperature)
        for s, x_i, g in zip(substances, mole_fractions, gammas, strict=True)
    ]
    fuel_pressures = [p for p, f in zip(pressures, flammable, strict=True) if f]
    fuel_lfls = [s.lfl for s in substances if s.lfl is not None]
    saturated = sum(fuel_pressures) / pressure
    if saturated <= 0.0:
        return None, saturated
    return lfl_le_chatelier(fuel_pressures, fuel_lfls), saturated


def _methods(
    substances: Sequence[Substance], cas: Sequence[str], basis: str, basis_temperature: float
) -> tuple[str, ...]:
    """The methods behind the analysis, then those behind each substance's data."""
    methods = [
        _activity_method(substances, cas),
        "mixture flash point: Liaw et al. (2002)",
        "mixture LFL: Le Chatelier's rule over the saturated vapour",
        f"composition by {basis}; pure-liquid densities at {basis_temperature - 273.15:g} °C",
    ]
    for s in substances:
        methods.extend(s.methods)
    return tuple(methods)


def _activity_method(substances: Sequence[Substance], cas: Sequence[str]) -> str:
    """The activity-coefficient method, and why where the liquid falls back to original UNIFAC."""
    if len(substances) == 1:
        return "single component: activity coefficient 1"
    used = activity_model_name(cas)
    name = UNIFAC_VARIANTS[used][2]
    missing = [s.name for s in substances if not s.dortmund_groups]
    if used == "original" and missing:
        return f"{name} (no modified UNIFAC (Dortmund) groups for {', '.join(missing)})"
    return name
