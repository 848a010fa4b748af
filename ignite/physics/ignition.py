"""Ignition by sparks and burning of materials in an oxidant-enriched atmosphere.

Minimum ignition energy (MIE) falls steeply as oxygen (and nitrous oxide, counted as
oxygen) replaces the nitrogen of air; materials that merely smoulder or self-extinguish
in air burn once the oxidant reaches their limiting oxygen index (LOI). The fuel and
material values are data in `rules/`.

Energies [J], oxidant and humidity as mole / relative fractions [-] (0-1).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

__all__ = [
    "fitted_exponent",
    "holds_charge",
    "materials_sustaining",
    "mie_at_oxidant",
]


def mie_at_oxidant(
    mie_air: float,
    oxidant_fraction: float,
    exponent: float,
    mie_oxygen: float | None = None,
    *,
    air_fraction: float,
) -> float:
    """Minimum ignition energy of a fuel at an oxidant fraction between air and oxygen.

        MIE(x) = max( MIE_air · (x / x_air)^(−n),  MIE_O2 )     for x >= x_air
        MIE(x) = MIE_air                                        for x <  x_air

    The power law is anchored at the measured value in air and, where one is known,
    bounded below by the measured value in pure oxygen. Below air the air value is
    kept: the law was fitted between air and oxygen only, and a leaner atmosphere is
    not credited with a higher MIE (conservative).

    mie_air : MIE in air [J]
    oxidant_fraction : x = x_O2 + x_N2O [-], in (0, 1]
    exponent : n [-] (about 3 for organic vapours, about 1.7 for hydrogen; or
        `fitted_exponent` of an air/oxygen pair)
    mie_oxygen : MIE in pure oxygen [J], or None when not measured
    air_fraction : x_air [-], oxygen in air
    Returns MIE(x) [J].

    Worked example (methane: 0.28 mJ in air, published; 0.003 mJ in oxygen, memory,
    Lewis & von Elbe; with the exponent fitted to the pair, 40 % oxidant gives about
    0.043 mJ and pure oxygen returns the measured 0.003 mJ):

    >>> n = fitted_exponent(0.28e-3, 0.003e-3, 0.209)
    >>> round(mie_at_oxidant(0.28e-3, 0.40, n, 0.003e-3, air_fraction=0.209) * 1e3, 4)
    0.0427
    >>> round(mie_at_oxidant(0.28e-3, 1.0, n, 0.003e-3, air_fraction=0.209) * 1e3, 6)
    0.003

    Reference: Lewis & von Elbe, Combustion, Flames and Explosions of Gases (MIE
    in air and in oxygen). The power law between them is a derived fit through
    those pairs, not a published correlation; MIE is itself a 50 % ignition
    statistic, so treat the result as an estimate, not a hard line.
    """
    if not (mie_air > 0.0 and math.isfinite(mie_air)):
        raise ValueError(f"MIE in air must be a finite value > 0 J, got {mie_air!r}")
    if not (0.0 < oxidant_fraction <= 1.0):
        raise ValueError(f"oxidant fraction must be in (0, 1], got {oxidant_fraction!r}")
    if not (0.0 < air_fraction < 1.0):
        raise ValueError(f"air oxygen fraction must be in (0, 1), got {air_fraction!r}")
    if exponent < 0.0:
        raise ValueError(f"MIE exponent must be >= 0, got {exponent!r}")
    if mie_oxygen is not None and not (0.0 < mie_oxygen <= mie_air):
        raise ValueError("MIE in oxygen must be > 0 and not above the MIE in air")
    if oxidant_fraction <= air_fraction:
        return mie_air
    mie: float = mie_air * math.pow(oxidant_fraction / air_fraction, -exponent)
    if mie_oxygen is not None:
        mie = max(mie, mie_oxygen)
    return mie


def fitted_exponent(mie_air: float, mie_oxygen: float, air_fraction: float) -> float:
    """Exponent n of the MIE power law through a measured air / oxygen pair.

        n = ln(MIE_air / MIE_O2) / ln(1 / x_air)

    mie_air, mie_oxygen : MIE in air and in pure oxygen [J]
    air_fraction : x_air [-]
    Returns n [-].

    Worked example (hydrogen: 0.017 mJ in air, published; 0.0012 mJ in oxygen,
    memory, Lewis & von Elbe; gives n ≈ 1.7, the value usually quoted for hydrogen):

    >>> round(fitted_exponent(0.017e-3, 0.0012e-3, 0.209), 2)
    1.69

    Reference: Lewis & von Elbe (the pair); the fit is derived, not published.
    """
    if not (mie_air > 0.0 and mie_oxygen > 0.0):
        raise ValueError("MIE values must be > 0")
    if not (0.0 < air_fraction < 1.0):
        raise ValueError(f"air oxygen fraction must be in (0, 1), got {air_fraction!r}")
    return math.log(mie_air / mie_oxygen) / math.log(1.0 / air_fraction)


def materials_sustaining(
    oxidant_fraction: float,
    materials: Sequence[tuple[str, float]],
    allowance: float = 0.02,
) -> tuple[str, ...]:
    """Names of the materials that can sustain burning at an oxidant fraction.

        sustains  ⇔  LOI − allowance <= x

    A material burns steadily once the oxidant reaches its limiting oxygen index;
    upward burning and alcohol-wetted or oxygen-soaked fabric burn below it, hence
    the allowance (2 points by default).

    oxidant_fraction : x [-] at the site
    materials : (name, LOI [-]) pairs, in the order to report them
    allowance : how far below the LOI to start flagging [-]
    Returns the names, in input order.

    Worked example (LOI from ISO 4589-2 / ASTM D2863 tables: polypropylene 17.4 %,
    cotton 18 %, rigid PVC 45 %; in room air, 20.9 %, the first two are flagged):

    >>> materials_sustaining(0.209, [("polypropylene", 0.174), ("cotton", 0.18),
    ...                              ("rigid PVC", 0.45)])
    ('polypropylene', 'cotton')

    Reference: ISO 4589-2 / ASTM D2863 (LOI); NFPA 53 (burning below the LOI in
    oxygen-enriched atmospheres).
    """
    if allowance < 0.0:
        raise ValueError(f"allowance must be >= 0, got {allowance!r}")
    return tuple(name for name, loi in materials if loi - allowance <= oxidant_fraction)


def holds_charge(rh: float, holds_below_rh: float) -> bool:
    """Whether a material's surface holds static charge at a relative humidity.

        holds  ⇔  RH < RH_threshold

    Hygroscopic materials (cotton, paper, wool) lose surface resistivity about a
    decade per 10-15 % RH and bleed charge above roughly 30 % RH; polyolefins hardly
    change, so their threshold is 100 % (they always hold charge).

    rh : relative humidity [-];  holds_below_rh : the material's threshold [-]
    Returns True when the material holds charge.

    Worked example (thresholds from the project's materials data, flagged memory:
    cotton 30 %, polypropylene 100 %; a theatre at 28 % RH):

    >>> holds_charge(0.28, 0.30), holds_charge(0.45, 0.30), holds_charge(0.45, 1.0)
    (True, False, True)

    Reference: IEC 61340-1 (humidity and surface resistivity), memory.
    """
    return rh < holds_below_rh
