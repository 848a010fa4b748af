"""Flammable liquids: what a liquid is made of and what vapour it gives off.

Composition by volume or mass → liquid mole fractions; activity coefficients by
modified UNIFAC (Dortmund), or original UNIFAC where a component has no Dortmund groups;
vapour pressures; the mixture flash point by Liaw et al. (2002); the mixture LFL by
Le Chatelier's rule. `ignite.simulate.preparation` steps these through one preparation.

Pure-substance data come from the tables shipped with `chemicals` and `thermo`, always
by a named method:

- flash point, LFL, UFL, autoignition temperature: IEC 60079-20-1:2010 and
  NFPA 497:2008 (`FIRE_DATA_METHODS`), the value on the safe side where both have
  one (ethanol ignites at 363 °C in NFPA 497, at 400 °C in IEC 60079-20-1). The
  `chemicals` package's other flash-point sources are never used: its
  group-contribution set (Serat et al., 2017) puts ethanol at −13 °C against 12 °C
  in IEC 60079-20-1.
- vapour pressure: for water, ethanol, isopropanol, methanol and acetone the correlation
  named in `VAPOUR_PRESSURE_CHOICE`, the one that agrees with the literature value at
  25 °C (tests/validation/test_preparations.py); for any other substance the first
  correlation in `VAPOUR_PRESSURE_METHODS` that `thermo` has for it and whose fitted
  range covers 0 °C (or 20 K below the flash point) to 120 °C;
- liquid density: the first in `DENSITY_METHODS`;
- activity coefficients: `ACTIVITY_MODEL` (modified UNIFAC, Dortmund) with the DDBST
  group assignments `thermo` ships; original UNIFAC for a liquid with a component that
  has no Dortmund assignment (glycerol). The choice rests on the comparison in
  tests/validation/test_activity_models.py.

Mole fractions are [-], temperatures [K], pressures [Pa], molar masses [kg/mol],
densities [kg/m³], molar volumes [m³/mol]. `chemicals` and `thermo` load slowly, so
they are imported inside the functions that use them, and what `substance` resolves and
the `thermo` objects built for it are kept between runs by `ignite.physics._cache`
(identical results, a fraction of the start-up time).
"""

from __future__ import annotations

import bisect
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

from ignite.physics import _cache

__all__ = [
    "ACTIVITY_MODEL",
    "DENSITY_METHODS",
    "FIRE_DATA_METHODS",
    "STANDARD_PRESSURE",
    "UNIFAC_VARIANTS",
    "VAPOUR_PRESSURE_CHOICE",
    "VAPOUR_PRESSURE_METHODS",
    "VOLUME_BASIS_TEMPERATURE",
    "WATER_CAS",
    "Substance",
    "SubstanceDataError",
    "UnknownSubstance",
    "activity_coefficients_dortmund",
    "activity_coefficients_unifac",
    "activity_model",
    "activity_model_name",
    "bubble_point",
    "fraction_of_lfl",
    "lfl_le_chatelier",
    "liaw_sum",
    "liquid_molar_volume",
    "mixture_flash_point",
    "mole_fractions_from_mass",
    "mole_fractions_from_volume",
    "partial_pressures",
    "substance",
    "vapour_pressure",
]

STANDARD_PRESSURE = 101325.0
"""Standard atmosphere [Pa] (ISO 2533); the pressure at which flash points are tabulated."""

WATER_CAS = "7732-18-5"
"""CAS number of water."""

VOLUME_BASIS_TEMPERATURE = 293.15
"""Temperature at which a strength 'by volume' is stated [K]: 20 °C, the reference of the
international alcoholometric tables (OIML R 22; memory)."""

FIRE_DATA_METHODS = ("IEC 60079-20-1 (2010)", "NFPA 497 (2008)")
"""Sources for flash point, LFL, UFL and autoignition temperature. Where both give a
value, the one on the safe side is used (lower flash point, LFL and autoignition
temperature; higher UFL), and the result names it."""

VAPOUR_PRESSURE_METHODS: dict[str, str] = {
    "IAPWS_PSAT": "IAPWS-95 saturation pressure (Wagner & Pruss 2002)",
    "WAGNER_MCGARRY": "Wagner equation, McGarry (1983) coefficients",
    "WAGNER_POLING": "Wagner equation, Poling et al. (2001) coefficients",
    "HEOS_FIT": "fit to the reference Helmholtz equation of state",
    "DIPPR_PERRY_8E": "DIPPR 101 equation, Perry's Handbook 8th ed.",
    "VDI_PPDS": "PPDS equation, VDI Heat Atlas (2010)",
    "ANTOINE_EXTENDED_POLING": "extended Antoine equation, Poling et al. (2001)",
    "ANTOINE_POLING": "Antoine equation, Poling et al. (2001)",
    "LANDOLT": "Antoine equation, Landolt-Börnstein",
}
"""`thermo` vapour-pressure methods in order of preference, with the names reports print."""

VAPOUR_PRESSURE_CHOICE: dict[str, str] = {
    "7732-18-5": "IAPWS_PSAT",  # water: the reference equation; 3169.9 Pa at 25 °C
    "64-17-5": "WAGNER_POLING",  # ethanol: 7874 Pa at 25 °C
    "67-63-0": "DIPPR_PERRY_8E",  # isopropanol: 6027 Pa (the Wagner sets give 5780-5800)
    "67-56-1": "WAGNER_POLING",  # methanol: 16943 Pa
    "67-64-1": "WAGNER_POLING",  # acetone: 30803 Pa
}
"""Vapour-pressure correlation by CAS number for the solvents of skin preparations: of the
methods `thermo` carries, the one that agrees with the literature value at 25 °C and
covers 0-120 °C (tests/validation/test_preparations.py compares them). Isopropanol is the
one that departs from the general order: its three Wagner-type sets (McGarry; Poling et
al.; VDI PPDS) lie 4 % below the literature value at 25 °C, DIPPR 101 within 0.4 %."""

UNIFAC_VARIANTS: dict[str, tuple[str, int, str]] = {
    "dortmund": (
        "MODIFIED_UNIFAC",
        1,
        "modified UNIFAC (Dortmund; Weidlich & Gmehling 1987), parameters as published "
        "to 2016, as shipped by thermo",
    ),
    "original": (
        "UNIFAC",
        0,
        "UNIFAC (original; Fredenslund, Jones & Prausnitz 1975) as shipped by thermo",
    ),
}
"""The UNIFAC variants: name -> (DDBST group-assignment table, `thermo` version number,
the name reports print)."""

ACTIVITY_MODEL = "dortmund"
"""The UNIFAC variant used wherever every component has groups for it. Against published
infinite-dilution activity coefficients of ethanol and isopropanol in water and the
aqueous-ethanol flash-point series it fits better than original UNIFAC, and it puts 91 %
isopropanol's flash point nearer the published value (neither is on the safe side there);
tests/validation/test_activity_models.py prints and checks both."""

DENSITY_METHODS: dict[str, str] = {
    "HEOS_FIT": "fit to the reference Helmholtz equation of state",
    "DIPPR_PERRY_8E": "DIPPR 105 equation, Perry's Handbook 8th ed.",
    "VDI_PPDS": "PPDS equation, VDI Heat Atlas (2010)",
    "VDI_TABULAR": "VDI Heat Atlas (2010) tables",
    "CRC_INORG_L_CONST": "CRC Handbook, inorganic liquids",
}
"""`thermo` liquid-density methods in order of preference, with the names reports print."""


class SubstanceDataError(ValueError):
    """A substance lacks data that the requested calculation cannot do without."""

    def __init__(self, name: str, reason: str) -> None:
        super().__init__(f"{name!r}: {reason}")
        self.name = name
        self.reason = reason


class UnknownSubstance(SubstanceDataError):
    """A component name or CAS number that `chemicals` cannot resolve."""

    def __init__(self, name: str) -> None:
        super().__init__(name, "not a substance name or CAS number known to the chemicals tables")


@dataclass(frozen=True)
class Substance:
    """One pure substance and the data this module uses, each with the method it came from.

    Any datum may be None where no named source has it; `methods` says where each
    of the others came from.
    """

    name: str  # common name as resolved by `chemicals`
    cas: str
    formula: str
    molar_mass: float  # kg/mol
    unifac_groups: tuple[tuple[int, int], ...]  # (original UNIFAC subgroup id, count)
    dortmund_groups: tuple[tuple[int, int], ...]  # (modified UNIFAC subgroup id, count)
    flash_point: float | None  # K, closed cup
    lfl: float | None  # mole fraction in air
    ufl: float | None  # mole fraction in air
    autoignition: float | None  # K
    vapour_pressure_method: str | None  # key of VAPOUR_PRESSURE_METHODS
    density_method: str | None  # key of DENSITY_METHODS
    methods: tuple[str, ...] = ()

    @property
    def flammable(self) -> bool:
        """True when a named source gives an LFL: the substance counts as fuel."""
        return self.lfl is not None

    @property
    def volatile(self) -> bool:
        """True when a vapour-pressure correlation exists for the substance."""
        return self.vapour_pressure_method is not None


@lru_cache(maxsize=256)
def substance(name: str) -> Substance:
    """Resolve a common name or CAS number and gather the data for it.

    Raises UnknownSubstance when `chemicals` does not know the name.

    >>> s = substance("isopropyl alcohol")
    >>> s.cas, s.flash_point, s.lfl           # IEC 60079-20-1:2010 via chemicals
    ('67-63-0', 285.15, 0.02)
    """
    text = name.strip()
    if not text:
        raise UnknownSubstance(name)
    kept = _cache.load("substance", text, lambda value: isinstance(value, Substance))
    if kept is not None:
        return kept
    found = _resolve(name, text)
    _cache.store("substance", text, found)
    return found


def _resolve(name: str, text: str) -> Substance:
    """`substance` without the cache: look the text up and gather the data."""
    from chemicals import CAS_from_any
    from chemicals.identifiers import search_chemical
    from thermo.unifac import UNIFAC_group_assignment_DDBST

    try:
        cas = CAS_from_any(text)
    except ValueError:
        raise UnknownSubstance(name) from None
    metadata = search_chemical(cas)
    common = metadata.common_name or text

    methods: list[str] = []
    fire: dict[str, tuple[float | None, str | None]] = {}
    for quantity, value_and_method in _fire_data(cas).items():
        fire[quantity] = value_and_method
        value, method = value_and_method
        if value is not None:
            methods.append(f"{common} {quantity}: {method}")

    flash_point = fire["flash point"][0]
    span_low = min(273.15, flash_point - 20.0) if flash_point is not None else 273.15
    psat_model = _vapour_pressure_model(cas)
    psat_method = VAPOUR_PRESSURE_CHOICE.get(cas)
    if psat_method not in psat_model.all_methods:
        psat_method = _preferred_method(psat_model, VAPOUR_PRESSURE_METHODS, (span_low, 393.15))
    if psat_method is not None:
        methods.append(f"{common} vapour pressure: {VAPOUR_PRESSURE_METHODS[psat_method]}")
    density_method = _preferred_method(_liquid_volume_model(cas), DENSITY_METHODS)
    if density_method is not None:
        methods.append(f"{common} liquid density: {DENSITY_METHODS[density_method]}")

    groups = UNIFAC_group_assignment_DDBST(cas, UNIFAC_VARIANTS["original"][0]) or {}
    dortmund = UNIFAC_group_assignment_DDBST(cas, UNIFAC_VARIANTS["dortmund"][0]) or {}
    return Substance(
        name=common,
        cas=cas,
        formula=metadata.formula,
        molar_mass=metadata.MW / 1000.0,
        unifac_groups=tuple(sorted((int(k), int(v)) for k, v in groups.items())),
        dortmund_groups=tuple(sorted((int(k), int(v)) for k, v in dortmund.items())),
        flash_point=flash_point,
        lfl=fire["LFL"][0],
        ufl=fire["UFL"][0],
        autoignition=fire["autoignition temperature"][0],
        vapour_pressure_method=psat_method,
        density_method=density_method,
        methods=tuple(methods),
    )


def _fire_data(cas: str) -> dict[str, tuple[float | None, str | None]]:
    """Flash point, LFL, UFL and autoignition temperature from FIRE_DATA_METHODS only.

    Where both sources give a value, the one on the safe side is kept: the lower flash
    point, LFL and autoignition temperature, the higher UFL.
    """
    from chemicals import safety

    lookups: dict[str, tuple[Callable[..., Any], Callable[..., Any], bool, bool]] = {
        # quantity: (getter, method lister, keyword call, safe side is the higher value)
        "flash point": (safety.T_flash, safety.T_flash_methods, False, False),
        "LFL": (safety.LFL, safety.LFL_methods, True, False),
        "UFL": (safety.UFL, safety.UFL_methods, True, True),
        "autoignition temperature": (
            safety.T_autoignition,
            safety.T_autoignition_methods,
            False,
            False,
        ),
    }
    found: dict[str, tuple[float | None, str | None]] = {}
    for quantity, (getter, lister, by_keyword, higher_is_safe) in lookups.items():
        available = lister(CASRN=cas) if by_keyword else lister(cas)
        candidates: list[tuple[float, str]] = []
        for method in FIRE_DATA_METHODS:
            if method in available:
                value = getter(CASRN=cas, method=method) if by_keyword else getter(cas, method)
                if value is not None:
                    candidates.append((float(value), method))
        if not candidates:
            found[quantity] = (None, None)
            continue
        sign = -1.0 if higher_is_safe else 1.0
        # min() keeps the first of equal values: IEC 60079-20-1 before NFPA 497.
        found[quantity] = min(candidates, key=lambda pair: sign * pair[0])
    return found


@lru_cache(maxsize=256)
def _vapour_pressure_model(cas: str) -> Any:
    def build() -> Any:
        from thermo import VaporPressure

        return VaporPressure(CASRN=cas)

    return _cached_model("vapour-pressure", cas, "VaporPressure", build)


@lru_cache(maxsize=256)
def _liquid_volume_model(cas: str) -> Any:
    def build() -> Any:
        from chemicals import MW
        from thermo import VolumeLiquid

        return VolumeLiquid(CASRN=cas, MW=MW(cas))

    return _cached_model("liquid-volume", cas, "VolumeLiquid", build)


def _cached_model(kind: str, key: Any, class_name: str, build: Callable[[], Any]) -> Any:
    """A `thermo` object from the on-disk cache, or built and stored there before first use.

    It is stored as built, before any calculation, so a cached object is in the same
    state as a fresh one.
    """
    kept = _cache.load(kind, key, lambda value: _is_thermo(value, class_name))
    if kept is not None:
        return kept
    built = build()
    _cache.store(kind, key, built)
    return built


def _is_thermo(value: Any, class_name: str) -> bool:
    kind = type(value)
    return kind.__name__ == class_name and kind.__module__.split(".")[0] == "thermo"


def _preferred_method(
    model: Any, preference: dict[str, str], span: tuple[float, float] | None = None
) -> str | None:
    """The first method in `preference` that the model has and whose fitted range covers
    `span` [K]; failing that, the one whose range reaches lowest."""
    available = [m for m in preference if m in model.all_methods]
    if not available:
        return None
    if span is None:
        return available[0]
    for method in available:
        low, high = model.T_limits[method]
        if low <= span[0] and high >= span[1]:
            return method
    return min(available, key=lambda m: model.T_limits[m][0])


def _temperature_limits(cas: str) -> tuple[float, float]:
    """Range [K] over which the chosen vapour-pressure correlation was fitted."""
    found = substance(cas)
    low, high = _vapour_pressure_model(found.cas).T_limits[found.vapour_pressure_method]
    return float(low), float(high)


def vapour_pressure(cas: str, temperature: float) -> float:
    """Saturated vapour pressure of a pure liquid [Pa], by the method `substance` names.

    cas : CAS number (or any name `substance` resolves);  temperature [K]
    Returns 0 for a substance with no vapour-pressure correlation (a non-volatile active).

    >>> round(vapour_pressure("7732-18-5", 298.15), 0)   # IAPWS-95: 3169.9 Pa at 25 °C
    3170.0
    """
    found = substance(cas)
    if found.vapour_pressure_method is None:
        return 0.0
    model = _vapour_pressure_model(found.cas)
    return float(model.calculate(temperature, found.vapour_pressure_method))


def liquid_molar_volume(cas: str, temperature: float) -> float:
    """Molar volume of a pure liquid [m³/mol], by the method `substance` names.

    Raises SubstanceDataError when no density correlation exists for the substance.

    >>> round(0.01801528 / liquid_molar_volume("7732-18-5", 293.15), 1)  # water, 998.2 kg/m³
    998.2
    """
    found = substance(cas)
    if found.density_method is None:
        raise SubstanceDataError(found.name, "no liquid density in the thermo tables")
    return float(_liquid_volume_model(found.cas).calculate(temperature, found.density_method))


def mole_fractions_from_volume(
    fractions: Sequence[float], molar_masses: Sequence[float], densities: Sequence[float]
) -> tuple[float, ...]:
    """Liquid mole fractions from volume fractions of the pure, unmixed liquids.

        n_i = φ_i · ρ_i / M_i,    x_i = n_i / Σ n_j

    fractions : volume fractions φ_i [-] (need not sum to 1: normalised here)
    molar_masses : M_i [kg/mol];  densities : pure-liquid ρ_i [kg/m³] at the
    temperature the strength is stated for.
    Volume contraction on mixing (about 3 % for alcohol–water) is not modelled.

    Worked example, 70 % v/v ethanol in water at 20 °C (ρ 789.4 and 998.2 kg/m³,
    handbook values; M 46.07 and 18.02 g/mol):

    >>> [round(x, 3) for x in mole_fractions_from_volume(
    ...     [0.7, 0.3], [0.04607, 0.01802], [789.4, 998.2])]
    [0.419, 0.581]
    """
    _check_fractions(fractions)
    moles = [f * rho / m for f, rho, m in zip(fractions, densities, molar_masses, strict=True)]
    return _normalise(moles)


def mole_fractions_from_mass(
    fractions: Sequence[float], molar_masses: Sequence[float]
) -> tuple[float, ...]:
    """Liquid mole fractions from mass fractions: n_i = w_i / M_i, x_i = n_i / Σ n_j.

    fractions : mass fractions w_i [-] (normalised here);  molar_masses : M_i [kg/mol]

    Worked example, 50 % w/w ethanol in water (M 46.07 and 18.02 g/mol):

    >>> [round(x, 4) for x in mole_fractions_from_mass([0.5, 0.5], [0.04607, 0.01802])]
    [0.2812, 0.7188]
    """
    _check_fractions(fractions)
    return _normalise([f / m for f, m in zip(fractions, molar_masses, strict=True)])


def _check_fractions(fractions: Sequence[float]) -> None:
    if not fractions:
        raise ValueError("no components")
    for value in fractions:
        if not (math.isfinite(value) and 0.0 <= value <= 1.0):
            raise ValueError(f"fractions must lie in [0, 1], got {value!r}")
    if sum(fractions) <= 0.0:
        raise ValueError("fractions sum to zero")


def _normalise(amounts: Sequence[float]) -> tuple[float, ...]:
    total = sum(amounts)
    return tuple(a / total for a in amounts)


@lru_cache(maxsize=128)
def _unifac(groups: tuple[tuple[tuple[int, int], ...], ...], variant: str) -> Any:
    version = UNIFAC_VARIANTS[variant][1]

    def build() -> Any:
        from thermo.unifac import UNIFAC

        chemgroups = [dict(g) for g in groups]
        start = [1.0 / len(groups)] * len(groups)
        return UNIFAC.from_subgroups(T=298.15, xs=start, chemgroups=chemgroups, version=version)

    return _cached_model("unifac", (variant, groups), "UNIFAC", build)


def _gammas(
    variant: str,
    temperature: float,
    mole_fractions: Sequence[float],
    groups: Sequence[Sequence[tuple[int, int]]],
) -> tuple[float, ...]:
    key = tuple(tuple((int(a), int(b)) for a, b in g) for g in groups)
    model = _unifac(key, variant)
    return tuple(float(g) for g in model.to_T_xs(temperature, list(mole_fractions)).gammas())


def activity_coefficients_unifac(
    temperature: float,
    mole_fractions: Sequence[float],
    groups: Sequence[Sequence[tuple[int, int]]],
) -> tuple[float, ...]:
    """Liquid-phase activity coefficients γ_i by original UNIFAC.

    temperature [K];  mole_fractions x_i [-];  groups : per component, its
    (subgroup id, count) pairs in the original UNIFAC table (as `Substance.unifac_groups`).
    Returns γ_i [-].

    Worked example, ethanol–water at x_EtOH = 0.1 and 25 °C (ethanol CH3 + CH2 + OH,
    water H2O; group counts from the UNIFAC tables). Ethanol's vapour is 3.4 times
    what ideal Raoult's law would give:

    >>> [round(g, 2) for g in activity_coefficients_unifac(
    ...     298.15, [0.1, 0.9], [((1, 1), (2, 1), (14, 1)), ((16, 1),)])]
    [3.43, 1.04]

    Reference: Fredenslund, Jones & Prausnitz, AIChE J. 21 (1975) 1086; parameters as
    shipped by `thermo` (original UNIFAC subgroups and interaction table).
    """
    return _gammas("original", temperature, mole_fractions, groups)


def activity_coefficients_dortmund(
    temperature: float,
    mole_fractions: Sequence[float],
    groups: Sequence[Sequence[tuple[int, int]]],
) -> tuple[float, ...]:
    """Liquid-phase activity coefficients γ_i by modified UNIFAC (Dortmund).

    Differs from original UNIFAC in a combinatorial part with volume fractions to the
    power 3/4 and in temperature-dependent group interactions, a_nm + b_nm·T + c_nm·T².

    temperature [K];  mole_fractions x_i [-];  groups : per component, its
    (subgroup id, count) pairs in the modified UNIFAC (Dortmund) table (as
    `Substance.dortmund_groups`). Returns γ_i [-].

    Worked example, ethanol–water at x_EtOH = 0.1 and 25 °C (ethanol CH3 + CH2 + OH(p),
    water H2O; group counts from the DDBST assignments). Ethanol's vapour is 3.0 times
    what ideal Raoult's law would give (original UNIFAC says 3.4):

    >>> [round(g, 2) for g in activity_coefficients_dortmund(
    ...     298.15, [0.1, 0.9], [((1, 1), (2, 1), (14, 1)), ((16, 1),)])]
    [3.04, 1.02]

    Reference: Weidlich & Gmehling, Ind. Eng. Chem. Res. 26 (1987) 1372; Gmehling, Li &
    Schiller, Ind. Eng. Chem. Res. 32 (1993) 178; parameters as published to 2016, as
    shipped by `thermo`.
    """
    return _gammas("dortmund", temperature, mole_fractions, groups)


def activity_model_name(cas: Sequence[str], variant: str = ACTIVITY_MODEL) -> str:
    """The UNIFAC variant `activity_model(cas, variant)` uses: `variant` when every
    component has groups for it, else "original" (the wider table).

    >>> activity_model_name(["ethanol", "water"]), activity_model_name(["glycerol", "water"])
    ('dortmund', 'original')
    """
    if variant not in UNIFAC_VARIANTS:
        raise ValueError(f"unknown UNIFAC variant {variant!r}")
    if variant == "dortmund" and not all(substance(c).dortmund_groups for c in cas):
        return "original"
    return variant


def activity_model(
    cas: Sequence[str], variant: str = ACTIVITY_MODEL
) -> Callable[[float, Sequence[float]], tuple[float, ...]]:
    """γ(T, x) for a fixed list of substances: UNIFAC, or γ = 1 for a single component.

    variant : a key of UNIFAC_VARIANTS; where a component lacks Dortmund groups the
    whole liquid falls back to original UNIFAC (`activity_model_name` says which).
    The UNIFAC object is built once, so the returned function is cheap to call in a loop.

    >>> gamma = activity_model(["ethanol", "water"])
    >>> [round(g, 2) for g in gamma(298.15, [0.1, 0.9])]
    [3.04, 1.02]
    >>> [round(g, 2) for g in activity_model(["ethanol", "water"], "original")(298.15, [0.1, 0.9])]
    [3.43, 1.04]
    """
    return _activity_model(tuple(cas), variant)


@lru_cache(maxsize=64)
def _activity_model(
    cas: tuple[str, ...], variant: str
) -> Callable[[float, Sequence[float]], tuple[float, ...]]:
    substances = [substance(c) for c in cas]
    if len(substances) == 1:
        return lambda temperature, x: (1.0,)
    used = activity_model_name(cas, variant)
    groups = tuple(s.dortmund_groups if used == "dortmund" else s.unifac_groups for s in substances)
    for s, found in zip(substances, groups, strict=True):
        if not found:
            raise SubstanceDataError(s.name, "no UNIFAC group assignment in the thermo tables")
    model = _unifac(groups, used)

    def gammas(temperature: float, x: Sequence[float]) -> tuple[float, ...]:
        return tuple(float(g) for g in model.to_T_xs(temperature, list(x)).gammas())

    return gammas


@lru_cache(maxsize=64)
def activity_model_at(
    cas: tuple[str, ...], temperature: float
) -> Callable[[float, Sequence[float]], tuple[float, ...]]:
    """γ(T, x) for many calls at one temperature: a binary's ln γ is tabulated once.

    Same signature as `activity_model`'s function (the variant ACTIVITY_MODEL); a call at
    another temperature falls back to UNIFAC itself. For three or more components UNIFAC is called directly.
    """
    direct = activity_model(cas)
    if len(cas) != 2:
        return direct
    return _tabulated_binary(direct, temperature, (cas, ACTIVITY_MODEL))


BINARY_GRID_POINTS = 801
"""Points of the composition grid on which a binary's ln γ is tabulated (see below)."""


def _tabulated_binary(
    gammas: Callable[[float, Sequence[float]], tuple[float, ...]],
    temperature: float,
    key: tuple[object, ...] | None = None,
) -> Callable[[float, Sequence[float]], tuple[float, ...]]:
    """γ(T, x) of a binary from ln γ tabulated at one temperature, linear in x₁.

    The film and pocket integrations call γ thousands of times at one film
    temperature; UNIFAC's ln γ is smooth in composition, so a grid of 801 points
    reproduces it to better than 0.1 % (tests/physics/test_vapour.py checks this)
    at a small fraction of the cost. With a `key` naming the binary and the model, the
    table is kept in the cache directory (`_cache`): building one takes 801 UNIFAC calls.
    """
    import numpy as np

    grid = np.linspace(0.0, 1.0, BINARY_GRID_POINTS)
    entry = None if key is None else (*key, temperature, BINARY_GRID_POINTS)
    table = None
    if entry is not None:
        table = _cache.load(
            "binary-gammas",
            entry,
            lambda found: isinstance(found, np.ndarray) and found.shape == (2, len(grid)),
        )
    if table is None:
        inner = np.clip(grid, 1e-12, 1.0 - 1e-12)
        values = np.array([gammas(temperature, [x1, 1.0 - x1]) for x1 in inner])
        table = np.log(values).T.copy()
        if entry is not None:
            _cache.store("binary-gammas", entry, table)
    ln1, ln2 = table[0], table[1]

    # plain floats: the film solver calls this some 10^5 times a run, and numpy's per-call
    # overhead on a scalar is most of the cost; np.interp's own formula, in the same order
    nodes, first, second = grid.tolist(), ln1.tolist(), ln2.tolist()
    last = len(nodes) - 1

    def tabulated(at: float, x: Sequence[float]) -> tuple[float, ...]:
        if at != temperature:
            return gammas(at, x)
        total = x[0] + x[1]
        x1 = min(max(x[0] / total, 0.0), 1.0) if total > 0 else 0.5
        if x1 >= nodes[last]:
            return (math.exp(first[last]), math.exp(second[last]))
        j = bisect.bisect_right(nodes, x1) - 1
        span = nodes[j + 1] - nodes[j]
        offset = x1 - nodes[j]
        return (
            math.exp((first[j + 1] - first[j]) / span * offset + first[j]),
            math.exp((second[j + 1] - second[j]) / span * offset + second[j]),
        )

    return tabulated


def partial_pressures(
    cas: Sequence[str],
    mole_fractions: Sequence[float],
    temperature: float,
    variant: str = ACTIVITY_MODEL,
) -> tuple[float, ...]:
    """Modified Raoult's law over a liquid: p_i = x_i · γ_i · P_sat,i(T) [Pa].

    γ_i by `activity_model(cas, variant)`.

    Worked example, pure isopropanol at 25 °C (DIPPR 101, Perry's 8th ed.; the
    literature value is about 6.05 kPa):

    >>> round(partial_pressures(["isopropanol"], [1.0], 298.15)[0], -1)
    6030.0
    """
    gammas = activity_model(cas, variant)(temperature, mole_fractions)
    return tuple(
        x * g * vapour_pressure(c, temperature)
        for c, x, g in zip(cas, mole_fractions, gammas, strict=True)
    )


def liaw_sum(
    mole_fractions: Sequence[float],
    activity_coefficients: Sequence[float],
    vapour_pressures: Sequence[float],
    vapour_pressures_at_flash_point: Sequence[float],
) -> float:
    """Liaw's flash-point sum over the flammable components of a liquid.

        Σ x_i · γ_i · P_sat,i(T) / P_sat,i(T_fp,i)

    The mixture is at its flash point where the sum is 1: each flammable vapour
    contributes in proportion to its own partial pressure at its own flash point
    (Le Chatelier's rule applied at the lower limit).

    All arguments for the flammable components only; pressures [Pa]. Returns [-].

    Worked example, pure liquid at its own flash point (by construction):

    >>> liaw_sum([1.0], [1.0], [4400.0], [4400.0])
    1.0

    Reference: Liaw, Lee, Tang, Hsu & Liu, J. Loss Prev. Process Ind. 15 (2002) 429-438.
    """
    return sum(
        x * g * p / p_fp
        for x, g, p, p_fp in zip(
            mole_fractions,
            activity_coefficients,
            vapour_pressures,
            vapour_pressures_at_flash_point,
            strict=True,
        )
    )


def bubble_point(
    cas: Sequence[str],
    mole_fractions: Sequence[float],
    pressure: float = STANDARD_PRESSURE,
    variant: str = ACTIVITY_MODEL,
) -> float:
    """Temperature [K] at which the liquid boils: Σ x_i·γ_i·P_sat,i(T) = P.

    γ_i by `activity_model(cas, variant)`.

    >>> round(bubble_point(["water"], [1.0]) - 273.15, 2)     # IAPWS-95: 99.97 °C
    99.97
    """
    from scipy.optimize import brentq

    volatile = [c for c in cas if substance(c).volatile]
    if not volatile:
        raise SubstanceDataError(", ".join(cas), "no volatile component")
    low = max(_temperature_limits(c)[0] for c in volatile)
    high = min(_temperature_limits(c)[1] for c in volatile)

    def excess(temperature: float) -> float:
        return sum(partial_pressures(cas, mole_fractions, temperature, variant)) - pressure

    if excess(high) < 0.0:
        return high
    return float(brentq(excess, low, high, xtol=1e-4))


def mixture_flash_point(
    cas: Sequence[str],
    mole_fractions: Sequence[float],
    pressure: float = STANDARD_PRESSURE,
    variant: str = ACTIVITY_MODEL,
) -> float | None:
    """Closed-cup flash point of a liquid mixture [K] by Liaw et al. (2002).

    Solves Σ_flammable x_i·γ_i(T)·P_sat,i(T)/P_sat,i(T_fp,i) = 1 for T, with UNIFAC
    γ (`activity_model(cas, variant)`) over the whole liquid (water included) and pure
    flash points from
    FIRE_DATA_METHODS. Components with an LFL but no tabulated flash point are left
    out of the sum (a flash point that is too high, on the unsafe side; the caller
    notes them). Returns None when the liquid has no flammable component with a
    flash point, or when its vapour stays below the lower limit up to the bubble point.

    Worked example, 50 % v/v ethanol in water (x_EtOH = 0.236). The published closed-cup
    value is 24 °C:

    >>> round(mixture_flash_point(["ethanol", "water"], [0.2357, 0.7643]) - 273.15, 1)
    24.5

    Reference: Liaw, Lee, Tang, Hsu & Liu, J. Loss Prev. Process Ind. 15 (2002) 429-438.
    """
    from scipy.optimize import brentq

    fuels = [
        i
        for i, c in enumerate(cas)
        if substance(c).flash_point is not None and substance(c).volatile
    ]
    if not fuels or all(mole_fractions[i] <= 0.0 for i in fuels):
        return None
    gamma = activity_model(cas, variant)
    fuel_cas = [cas[i] for i in fuels]
    at_flash = [vapour_pressure(c, _flash_point_of(c)) for c in fuel_cas]

    def excess(temperature: float) -> float:
        gammas = gamma(temperature, mole_fractions)
        return (
            liaw_sum(
                [mole_fractions[i] for i in fuels],
                [gammas[i] for i in fuels],
                [vapour_pressure(c, temperature) for c in fuel_cas],
                at_flash,
            )
            - 1.0
        )

    high = bubble_point(cas, mole_fractions, pressure, variant)
    if excess(high) < 0.0:
        return None
    volatile = [c for c in cas if substance(c).volatile]
    low = max(_temperature_limits(c)[0] for c in volatile)
    low = max(low, min(_flash_point_of(c) for c in fuel_cas) - 100.0)
    if excess(low) > 0.0:
        raise SubstanceDataError(
            ", ".join(cas), "flash point below the range of the vapour-pressure correlations"
        )
    return float(brentq(excess, low, high, xtol=1e-4))


def _flash_point_of(cas: str) -> float:
    value = substance(cas).flash_point
    assert value is not None
    return value


def lfl_le_chatelier(fuel_fractions: Sequence[float], lfls: Sequence[float]) -> float:
    """Lower flammable limit of a fuel-vapour mixture by Le Chatelier's rule.

        LFL_mix = 1 / Σ (y_i / LFL_i),   y_i normalised over the fuels

    fuel_fractions : amounts of each flammable vapour (any common scale, normalised here)
    lfls : pure-vapour LFL_i as mole fractions in air [-]. Returns LFL_mix [-].

    Worked example, equal parts ethanol (3.1 %) and isopropanol (2.0 %), IEC 60079-20-1
    values: 1 / (0.5/0.031 + 0.5/0.020) = 2.43 %

    >>> round(lfl_le_chatelier([0.5, 0.5], [0.031, 0.020]), 4)
    0.0243

    Reference: Le Chatelier (1891); Coward & Jones, US Bureau of Mines Bulletin 503 (1952).
    """
    total = sum(fuel_fractions)
    if total <= 0.0:
        raise ValueError("no fuel in the mixture")
    return 1.0 / sum(y / total / lfl for y, lfl in zip(fuel_fractions, lfls, strict=True))


def fraction_of_lfl(vapour_fractions: Sequence[float], lfls: Sequence[float]) -> float:
    """How far a gas is towards its lower limit: Σ y_i / LFL_i (Le Chatelier's index).

    vapour_fractions : mole fractions y_i of each flammable vapour in the gas [-]
    lfls : LFL_i [-]. Returns the fraction of the mixture's LFL [-]: 1 at the LFL.

    Worked example, 0.5 % isopropanol in air (LFL 2.0 %, IEC 60079-20-1): a quarter of
    the LFL, the usual process-safety margin.

    >>> fraction_of_lfl([0.005], [0.020])
    0.25

    Reference: Le Chatelier (1891); the index form as in NFPA 69 (memory).
    """
    return sum(y / lfl for y, lfl in zip(vapour_fractions, lfls, strict=True))


# --- enthalpy of vaporisation (the film's heat balance) ------------------------------

ENTHALPY_OF_VAPORISATION_METHODS = ("DIPPR_PERRY_8E", "VDI_PPDS", "HEOS_FIT", "VDI_TABULAR")
"""Correlations of `thermo.EnthalpyVaporization`, in order of preference: the first the
substance has whose fitted range covers 0-60 °C."""


@lru_cache(maxsize=256)
def _enthalpy_of_vaporisation_model(cas: str) -> tuple[Any, str | None]:
    def build() -> Any:
        from thermo import EnthalpyVaporization

        return EnthalpyVaporization(CASRN=cas)

    model = _cached_model("enthalpy-of-vaporisation", cas, "EnthalpyVaporization", build)
    preference = dict.fromkeys(ENTHALPY_OF_VAPORISATION_METHODS, "")
    return model, _preferred_method(model, preference, (273.15, 333.15))


def enthalpy_of_vaporisation(cas: str, temperature: float) -> float:
    """Molar enthalpy of vaporisation of a pure liquid [J/mol], by a named correlation.

    cas : CAS number (or any name `substance` resolves);  temperature [K].
    The method is the first of `ENTHALPY_OF_VAPORISATION_METHODS` that `thermo` has for
    the substance and whose range covers 0-60 °C (`enthalpy_of_vaporisation_method`).
    Returns 0 for a substance that does not evaporate (no vapour-pressure correlation).

    Worked example, water at 25 °C: 43.99 kJ/mol in the IAPWS-95 tables (44.0 kJ/mol,
    CRC Handbook; memory):

    >>> round(enthalpy_of_vaporisation("7732-18-5", 298.15) / 1e3, 1)
    44.0

    Reference: Perry's Chemical Engineers' Handbook, 8th ed., Table 2-150 (DIPPR
    correlations), via `thermo`.
    """
    found = substance(cas)
    if found.vapour_pressure_method is None:
        return 0.0
    model, method = _enthalpy_of_vaporisation_model(found.cas)
    if method is None:
        raise SubstanceDataError(cas, "no enthalpy of vaporisation")
    return float(model.calculate(temperature, method))


def enthalpy_of_vaporisation_method(cas: str) -> str | None:
    """The `thermo` method `enthalpy_of_vaporisation` uses for a substance."""
    return _enthalpy_of_vaporisation_model(substance(cas).cas)[1]
