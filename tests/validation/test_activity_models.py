"""Original UNIFAC against modified UNIFAC (Dortmund), both as `thermo` ships them.

Both are checked against published values: infinite-dilution activity coefficients of
ethanol and isopropanol in water near 25 °C, the aqueous-ethanol closed-cup flash-point
series, the flash point of 91 % isopropanol and the boiling points of the two azeotropes. `ignite.physics.vapour.ACTIVITY_MODEL`
names the model in use; these tests say why, and fail if the choice stops being the
better one. Run with `-s` to see the table of both models' errors.

Sources and flags stand beside each value. The flash points are computed the way a
preparation is analysed (Liaw et al. 2002, liquid mole fractions from the volume
strength at 20 °C); only the activity model differs between the two columns.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import pytest

from ignite.physics.vapour import (
    ACTIVITY_MODEL,
    UNIFAC_VARIANTS,
    activity_model,
    bubble_point,
    mixture_flash_point,
    mole_fractions_from_mass,
    substance,
)
from ignite.simulate.preparation import analyse_preparation

C = 273.15
VARIANTS = ("original", "dortmund")

# --- published values -------------------------------------------------------------------

# γ∞ of the alcohol in water at 25 °C. Measured values scatter by some 10 %. Both agree
# with Henry's-law constants (ethanol about 200 M/atm, isopropanol about 130 M/atm at
# 25 °C, Sander's compilation, Atmos. Chem. Phys. 15 (2015) 4399; memory) taken with the
# vapour pressures of tests/validation/test_preparations.py.
GAMMA_INFINITY_25C = {
    # Sherman, Trampe, Bush & Eckert, Ind. Eng. Chem. Res. 35 (1996) 1044 (memory)
    "ethanol": 3.6,
    # Sherman, Trampe, Bush & Eckert, Ind. Eng. Chem. Res. 35 (1996) 1044 (memory)
    "isopropanol": 7.5,
}
GAMMA_INFINITY_FACTOR = 2.0
"""Tolerance on γ∞: within a factor of two of the published value."""

# Aqueous ethanol, closed cup, % by volume: physics.md §4 (published). 96 %: memory (the
# °F table behind this series gives 62 °F, 17 °C, at 95 %); not part of the fit measure.
ETHANOL_FLASH_POINTS = [
    (0.10, 49.0),
    (0.20, 36.0),
    (0.30, 29.0),
    (0.40, 26.0),
    (0.50, 24.0),
    (0.60, 22.0),
    (0.70, 21.0),
    (0.80, 20.0),
    (0.90, 17.0),
]
ETHANOL_96 = (0.96, 17.0)  # memory
ETHANOL_RMS_TOLERANCE = 2.0
"""Tolerance on the root-mean-square error over the published series [K]: the 2 °C of
tests/validation/test_preparations.py for the series from 30 %."""

ISOPROPANOL_91 = (0.91, 14.0)  # 91 % v/v: 14 °C closed cup (physics.md §4; published, safety data)

# Boiling point of the azeotrope under 101.325 kPa, % by mass: a check of γ at high
# alcohol content, where the flash points of strong preparations are decided.
AZEOTROPES = [
    ("ethanol", 0.956, 78.15),  # 95.6 % w/w, 78.15 °C (CRC Handbook, azeotrope table; memory)
    ("isopropanol", 0.877, 80.3),  # 87.7 % w/w, 80.3 °C (CRC Handbook, azeotrope table; memory)
]
AZEOTROPE_TOLERANCE = 1.0
"""Tolerance on the azeotrope's boiling point [K]."""


# --- the comparison ---------------------------------------------------------------------


@dataclass(frozen=True)
class Row:
    model: str
    quantity: str
    published: float
    predicted: float

    @property
    def error(self) -> float:
        return self.predicted - self.published


def _mole_fractions(alcohol: str, volume_fraction: float) -> tuple[float, ...]:
    a = analyse_preparation(
        [(alcohol, volume_fraction), ("water", 1.0 - volume_fraction)], "volume", 298.15
    )
    return a.mole_fractions


def _flash_point_c(alcohol: str, volume_fraction: float, variant: str) -> float:
    found = mixture_flash_point(
        [alcohol, "water"], _mole_fractions(alcohol, volume_fraction), variant=variant
    )
    assert found is not None
    return found - C


def _gamma_infinity(alcohol: str, variant: str) -> float:
    return activity_model([alcohol, "water"], variant)(298.15, [0.0, 1.0])[0]


def _azeotrope_boiling_c(alcohol: str, mass_fraction: float, variant: str) -> float:
    masses = [substance(alcohol).molar_mass, substance("water").molar_mass]
    x = mole_fractions_from_mass([mass_fraction, 1.0 - mass_fraction], masses)
    return bubble_point([alcohol, "water"], x, variant=variant) - C


@pytest.fixture(scope="module")
def rows() -> dict[str, list[Row]]:
    table: dict[str, list[Row]] = {}
    for variant in VARIANTS:
        found = [
            Row(
                variant,
                f"γ∞ {alcohol} in water, 25 °C",
                published,
                _gamma_infinity(alcohol, variant),
            )
            for alcohol, published in GAMMA_INFINITY_25C.items()
        ]
        found += [
            Row(
                variant,
                f"flash point {fraction:.0%} ethanol, °C",
                published,
                _flash_point_c("ethanol", fraction, variant),
            )
            for fraction, published in [*ETHANOL_FLASH_POINTS, ETHANOL_96]
        ]
        fraction, published = ISOPROPANOL_91
        found.append(
            Row(
                variant,
                f"flash point {fraction:.0%} isopropanol, °C",
                published,
                _flash_point_c("isopropanol", fraction, variant),
            )
        )
        found += [
            Row(
                variant,
                f"azeotrope {alcohol} {fraction:.1%} w/w boils, °C",
                published,
                _azeotrope_boiling_c(alcohol, fraction, variant),
            )
            for alcohol, fraction, published in AZEOTROPES
        ]
        table[variant] = found
    return table


def _gamma_rows(rows: dict[str, list[Row]], variant: str) -> list[Row]:
    return [r for r in rows[variant] if r.quantity.startswith("γ∞")]


def _ethanol_rms(rows: dict[str, list[Row]], variant: str) -> float:
    published = {f"flash point {f:.0%} ethanol, °C" for f, _ in ETHANOL_FLASH_POINTS}
    errors = [r.error for r in rows[variant] if r.quantity in published]
    assert len(errors) == len(ETHANOL_FLASH_POINTS)
    return math.sqrt(sum(e * e for e in errors) / len(errors))


def _isopropanol_91(rows: dict[str, list[Row]], variant: str) -> Row:
    return next(r for r in rows[variant] if r.quantity.startswith("flash point 91% isopropanol"))


def test_print_the_comparison(rows, capsys):
    with capsys.disabled():
        print("\nmodel     quantity                                  published  predicted   error")
        for variant in VARIANTS:
            for r in rows[variant]:
                print(
                    f"{variant:9} {r.quantity:41} {r.published:9.2f} {r.predicted:10.2f} "
                    f"{r.error:+7.2f}"
                )
            print(f"{variant:9} RMS error, ethanol 10-90 % [K]: {_ethanol_rms(rows, variant):.2f}")
    assert all(len(rows[v]) == len(rows[VARIANTS[0]]) for v in VARIANTS)


# --- the chosen model within stated tolerances -------------------------------------------


def test_the_chosen_model_is_one_of_the_two():
    assert ACTIVITY_MODEL in VARIANTS
    assert set(VARIANTS) <= set(UNIFAC_VARIANTS)


@pytest.mark.parametrize("alcohol", sorted(GAMMA_INFINITY_25C))
def test_chosen_model_infinite_dilution_within_a_factor_of_two(rows, alcohol):
    # published values and sources: GAMMA_INFINITY_25C above (memory), factor of two
    row = next(r for r in _gamma_rows(rows, ACTIVITY_MODEL) if alcohol in r.quantity)
    ratio = row.predicted / row.published
    assert 1.0 / GAMMA_INFINITY_FACTOR <= ratio <= GAMMA_INFINITY_FACTOR


def test_chosen_model_ethanol_series_rms_within_tolerance(rows):
    # aqueous ethanol 10-90 % (physics.md §4; published): RMS error within 2 K
    assert _ethanol_rms(rows, ACTIVITY_MODEL) <= ETHANOL_RMS_TOLERANCE


def test_chosen_model_errs_low_on_dilute_ethanol(rows):
    # 10 % and 20 % (physics.md §4; published): where the error is largest, it must be a
    # flash point below the measured one (flammable too early, never too late)
    for r in rows[ACTIVITY_MODEL]:
        if r.quantity.startswith(("flash point 10% ethanol", "flash point 20% ethanol")):
            assert r.predicted < r.published


@pytest.mark.parametrize("alcohol", [a for a, _, _ in AZEOTROPES])
def test_chosen_model_boils_the_azeotrope_at_the_published_temperature(rows, alcohol):
    # AZEOTROPES above (memory), tolerance 1 K
    row = next(r for r in rows[ACTIVITY_MODEL] if r.quantity.startswith(f"azeotrope {alcohol}"))
    assert abs(row.error) <= AZEOTROPE_TOLERANCE


# --- the chosen model fits better than the other ----------------------------------------


def _other() -> str:
    return next(v for v in VARIANTS if v != ACTIVITY_MODEL)


def test_chosen_model_is_nearer_the_published_infinite_dilution_values(rows):
    # GAMMA_INFINITY_25C (memory): compare |ln(predicted / published)|
    for chosen, other in zip(
        _gamma_rows(rows, ACTIVITY_MODEL), _gamma_rows(rows, _other()), strict=True
    ):
        assert abs(math.log(chosen.predicted / chosen.published)) < abs(
            math.log(other.predicted / other.published)
        )


def test_chosen_model_fits_the_ethanol_series_better(rows):
    # physics.md §4 (published), 10-90 %
    assert _ethanol_rms(rows, ACTIVITY_MODEL) < _ethanol_rms(rows, _other())


def test_chosen_model_is_no_further_on_the_unsafe_side_for_91_percent_isopropanol(rows):
    # 91 % isopropanol, 14 °C (physics.md §4; published, safety data)
    assert _isopropanol_91(rows, ACTIVITY_MODEL).error <= _isopropanol_91(rows, _other()).error


@pytest.mark.xfail(
    strict=True,
    reason="neither model puts 91 % v/v isopropanol on the safe side: modified UNIFAC "
    "(Dortmund) gives 16.0 °C, original UNIFAC 16.2 °C, against 14 °C published",
)
@pytest.mark.parametrize("variant", VARIANTS)
def test_91_percent_isopropanol_on_the_safe_side(rows, variant):
    # 91 % isopropanol, 14 °C (physics.md §4; published, safety data): at or below it
    assert _isopropanol_91(rows, variant).error <= 0.0
