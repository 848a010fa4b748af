"""Numbers with units: prefixes, rounding, and never rounding across a limit."""

from __future__ import annotations

import math
from fractions import Fraction

import pytest
from hypothesis import assume, given
from hypothesis import strategies as st

from ignite.wording.numbers import (
    MAX_SIG,
    MINUS,
    NEVER,
    NO_VALUE,
    format_against_limit,
    format_duration,
    format_si,
)

# What each printed unit is worth in SI, to read the strings back. Prefix values:
# BIPM SI Brochure, 9th edition (2019), Table 7 (published). 1 min = 60 s and
# 1 h = 3600 s: SI Brochure Table 8, non-SI units accepted for use with the SI (published).
UNIT_VALUE = {
    "Ω": Fraction(1),
    "kΩ": Fraction(10**3),
    "MΩ": Fraction(10**6),
    "GΩ": Fraction(10**9),
    "TΩ": Fraction(10**12),
    "V": Fraction(1),
    "kV": Fraction(10**3),
    "µA": Fraction(1, 10**6),
    "mA": Fraction(1, 10**3),
    "A": Fraction(1),
    "pF": Fraction(1, 10**12),
    "pJ": Fraction(1, 10**12),
    "nJ": Fraction(1, 10**9),
    "µJ": Fraction(1, 10**6),
    "mJ": Fraction(1, 10**3),
    "J": Fraction(1),
    "pC": Fraction(1, 10**12),
    "nC": Fraction(1, 10**9),
    "µC": Fraction(1, 10**6),
    "C": Fraction(1),
    "ms": Fraction(1, 10**3),
    "s": Fraction(1),
    "min": Fraction(60),
    "h": Fraction(3600),
    "%": Fraction(1, 100),
    "°C": Fraction(1),
}


def read_back(text: str) -> Fraction:
    """The SI value a formatted string stands for (°C stays in °C)."""
    number, unit = text.split(" ", 1)
    return Fraction(number.replace(MINUS, "-")) * UNIT_VALUE[unit]


@pytest.mark.parametrize(
    ("value", "unit", "expected"),
    [
        # Resistance in kΩ and MΩ as floor test reports print them (common practice);
        # prefixes per the SI Brochure, 9th ed., Table 7 (published).
        (180e3, "Ω", "180 kΩ"),
        (1.3e6, "ohm", "1.3 MΩ"),
        (25e6, "Ω", "25 MΩ"),
        (1e9, "Ω", "1 GΩ"),
        (1e12, "Ω", "1 TΩ"),
        (950.0, "Ω", "950 Ω"),
        # Voltages in V and kV; walking voltages of 12 kV at 10 % RH (published, ESD table).
        (12e3, "V", "12 kV"),
        (330.0, "V", "330 V"),
        # Currents in mA and µA as IEC 60479-1 and IEC 60601-1 quote them (published).
        (10e-3, "A", "10 mA"),
        (50e-6, "A", "50 µA"),
        (0.1e-6, "A", "0.1 µA"),  # the generation current, written in µA (published)
        # Body capacitance in pF: IEC 61000-4-2 human-body model, 150 pF (published).
        (150e-12, "F", "150 pF"),
        # MIE in mJ, as the handbook tables write it: isopropanol 0.65 mJ (memory),
        # hydrogen 0.017 mJ in air (published); µJ only below 0.01 mJ.
        (0.65e-3, "J", "0.65 mJ"),
        (0.017e-3, "J", "0.017 mJ"),
        (1.2e-6, "J", "1.2 µJ"),
        (9.8e-9, "J", "9.8 nJ"),  # a body at ten volts: nJ, not "0.0098 µJ"
        (7.5e-3, "J", "7.5 mJ"),  # 150 pF at 10 kV, IEC 61000-4-2 worked example (published)
        # Charge: 150 pF at 10 kV holds 1.5 µC (Q = C·V, worked example, published).
        (1.5e-6, "C", "1.5 µC"),
        (750e-9, "C", "750 nC"),
        (18e-12, "C", "18 pC"),
        # Times: label drying 3 min on hairless skin, 1 h in hair (published, product labels).
        (180.0, "s", "3 min"),
        (3600.0, "s", "1 h"),
        (45.0, "s", "45 s"),
        (0.18e-3, "s", "0.18 ms"),  # a leak-path time constant R·C of a few ms
        (0.154, "s", "154 ms"),
        (270.0, "s", "4.5 min"),
        (4320.0, "s", "1.2 h"),
        # Celsius = kelvin − 273.15: SI Brochure, 9th ed., §2.3.1 (published).
        (293.15, "K", "20 °C"),
        (273.15, "K", "0 °C"),
        (250.0, "K", f"{MINUS}23.1 °C"),
        # Oxygen-enriched above 23.5 % (NFPA 99, published), air 20.9 % (common practice).
        (0.235, "fraction", "23.5 %"),
        (0.209, "fraction", "20.9 %"),
        # Display units for the environment table.
        (20 / 3600, "per_s", "20 /h"),
        (150.0, "m3", "150 m³"),
        (10e-3 / 60, "m3_per_s", "10 L/min"),
        (1.34, "", "1.34"),
        (1.5, "Hz", "1.5 Hz"),
    ],
)
def test_units_and_prefixes(value: float, unit: str, expected: str) -> None:
    assert format_si(value, unit) == expected


def test_missing_and_infinite_values() -> None:
    assert format_si(None, "V") == NO_VALUE
    assert format_si(math.nan, "V") == NO_VALUE
    assert format_si(math.inf, "s") == NEVER
    assert format_duration(math.inf) == NEVER
    assert format_duration(None) == NO_VALUE
    assert format_si(math.inf, "Ω") == "∞ Ω"


def test_rounding_carries_into_the_next_prefix() -> None:
    # 999.96 Ω rounds to 1000 Ω at three figures: that is 1 kΩ, never "1000 Ω".
    assert format_si(999.96, "Ω") == "1 kΩ"
    assert format_si(59.996, "s") == "1 min"
    assert format_si(999_600.0, "V") == "1000 kV"  # kV is the largest voltage unit


def test_zero_prints_in_the_base_unit() -> None:
    assert format_si(0.0, "A") == "0 A"
    assert format_si(0.0, "s") == "0 s"
    assert format_si(-0.0, "fraction") == "0 %"


def test_significant_figures_are_honoured() -> None:
    assert format_si(1234.0, "Ω", sig=2) == "1.2 kΩ"
    assert format_si(1234.0, "Ω", sig=4) == "1.234 kΩ"
    with pytest.raises(ValueError):
        format_si(1.0, "V", sig=0)


@given(
    st.floats(min_value=1e-15, max_value=1e15, allow_nan=False, allow_infinity=False),
    st.sampled_from(["Ω", "V", "A", "F", "J", "C", "s", "fraction", "K"]),
    st.booleans(),
)
def test_a_non_zero_number_never_prints_as_zero(value: float, unit: str, negative: bool) -> None:
    if unit == "K":
        # a temperature difference from 0 °C that is not zero
        value = 273.15 + (-value if negative else value)
        assume(value != 273.15)
        text = format_si(value, unit)
        assert read_back(text) != 0
        return
    text = format_si(-value if negative else value, unit)
    shown = read_back(text)
    assert shown != 0
    assert (shown < 0) == negative


@given(
    st.floats(min_value=1e-12, max_value=1e13, allow_nan=False, allow_infinity=False),
    st.floats(min_value=-0.05, max_value=0.05, allow_nan=False),
    st.sampled_from(["Ω", "V", "A", "J", "s", "fraction"]),
)
def test_against_limit_never_prints_on_the_wrong_side(
    limit: float, relative: float, unit: str
) -> None:
    value = limit * (1 + relative)
    value_text, limit_text = format_against_limit(value, limit, unit)
    if value == limit:
        assert value_text == limit_text
        return
    assert value_text != limit_text
    if value_text.startswith(("> ", "< ")):
        # indistinguishable even at MAX_SIG figures: the direction is stated in words
        assert value_text == ("> " if value > limit else "< ") + limit_text
        return
    shown_value, shown_limit = read_back(value_text), read_back(limit_text)
    assert (shown_value > shown_limit) == (value > limit)
    assert (shown_value < shown_limit) == (value < limit)


def test_just_above_a_limit_never_looks_compliant() -> None:
    # Medical-location window: each reading ≤ 25 MΩ (IEC 60364-7-710, published).
    assert format_against_limit(25.04e6, 25e6, "Ω") == ("25.04 MΩ", "25 MΩ")
    assert format_against_limit(25.0001e6, 25e6, "Ω") == ("25.0001 MΩ", "25 MΩ")
    # Oxygen-enriched above 23.5 % (NFPA 99, published).
    assert format_against_limit(0.23504, 0.235, "fraction") == ("23.504 %", "23.5 %")
    # No spark below the Paschen minimum, ~330 V (published).
    assert format_against_limit(330.4, 330.0, "V") == ("330.4 V", "330 V")
    # Just below prints just below, not equal.
    assert format_against_limit(49_990.0, 50e3, "Ω") == ("49.99 kΩ", "50 kΩ")
    # Across a prefix boundary: 999.95 kΩ stays below 1 MΩ.
    assert format_against_limit(999_950.0, 1e6, "Ω") == ("999.95 kΩ", "1 MΩ")


def test_equal_values_print_equal_and_plain() -> None:
    assert format_against_limit(0.235, 0.235, "fraction") == ("23.5 %", "23.5 %")
    assert format_against_limit(180.0, 180.0, "s") == ("3 min", "3 min")


def test_beyond_max_figures_the_direction_is_stated() -> None:
    limit = 25e6
    above = limit * (1 + 10 ** -(MAX_SIG + 2))
    below = limit * (1 - 10 ** -(MAX_SIG + 2))
    assert format_against_limit(above, limit, "Ω") == ("> 25 MΩ", "25 MΩ")
    assert format_against_limit(below, limit, "Ω") == ("< 25 MΩ", "25 MΩ")


def test_against_limit_with_missing_or_infinite_values() -> None:
    assert format_against_limit(math.nan, 1.0, "V") == (NO_VALUE, "1 V")
    assert format_against_limit(math.inf, 60.0, "s") == (NEVER, "1 min")
    assert format_against_limit(math.inf, math.inf, "s") == (NEVER, NEVER)


def test_temperatures_against_a_limit() -> None:
    # Flash point of pure isopropanol 12 °C (published, safety data) against a 32 °C film.
    assert format_against_limit(285.15, 305.15, "K") == ("12 °C", "32 °C")
    assert format_against_limit(305.16, 305.15, "K") == ("32.01 °C", "32 °C")


UNITS = ["Ω", "V", "A", "F", "J", "C", "s", "K", "fraction", "m3", "m3_per_s", "per_s", "W"]


def test_extreme_finite_values_print_in_exponent_form() -> None:
    # A trolley of 1e300 F once crashed here (its pF value overflowed a float).
    assert format_si(1e300, "F") == "1e+312 pF"
    assert format_si(1.7976931348623157e308, "J") == "1.8e+308 J"
    assert format_si(5e-324, "Ω") == "4.94e-324 Ω"


@given(
    value=st.floats(allow_nan=False, allow_infinity=False),
    limit=st.floats(allow_nan=False, allow_infinity=False),
    unit=st.sampled_from(UNITS),
)
def test_any_finite_value_formats_without_error(value: float, limit: float, unit: str) -> None:
    text = format_si(value, unit)
    assert text and "inf" not in text and "nan" not in text.lower()
    value_text, limit_text = format_against_limit(value, limit, unit)
    assert value_text and limit_text
