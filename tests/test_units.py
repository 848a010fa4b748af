"""Quantity strings -> SI floats (ignite.room.units).

Expected values are the unit definitions of the SI Brochure (BIPM, 9th edition, 2019,
Tables 2-8: prefixes, litre, minute, hour, degree Celsius) and NIST SP 811 (2008),
Appendix B.9 (degree Fahrenheit), flagged beside each check.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ignite.errors import UnitError
from ignite.room.units import DIMENSIONS, EXAMPLES, SI_UNITS, parse_quantity, registry, to_si

ACCEPTED = [
    # text, dimension, SI value
    # temperatures: T/K = t/°C + 273.15 (SI Brochure 9th ed. §2.3.1; published)
    ("21 degC", "temperature", 294.15),
    ("21 °C", "temperature", 294.15),
    ("21 ℃", "temperature", 294.15),
    ("-5 degC", "temperature", 268.15),
    ("−5 °C", "temperature", 268.15),  # MINUS SIGN
    # T/K = (t/°F + 459.67)/1.8 (NIST SP 811 (2008) B.9; published)
    ("68 degF", "temperature", 293.15),
    ("68 °F", "temperature", 293.15),
    ("98.6 °F", "temperature", 310.15),
    ("300 K", "temperature", 300.0),
    # percent: 1 % = 0.01 (SI Brochure 9th ed. §5.4.7; published)
    ("28 %", "fraction", 0.28),
    ("100 %", "fraction", 1.0),
    ("28%", "fraction", 0.28),
    # ohm and SI prefixes k, M, G, T = 1e3, 1e6, 1e9, 1e12 (SI Brochure Table 7; published)
    ("250 Ω", "resistance", 250.0),  # GREEK CAPITAL LETTER OMEGA U+03A9
    ("250 \u2126", "resistance", 250.0),  # OHM SIGN U+2126
    ("250 ohm", "resistance", 250.0),
    ("250 ohms", "resistance", 250.0),
    ("250 kΩ", "resistance", 250e3),
    ("250kΩ", "resistance", 250e3),
    ("250 k\u2126", "resistance", 250e3),
    ("1.3 MΩ", "resistance", 1.3e6),
    ("40 MOhm", "resistance", 40e6),
    ("2 GΩ", "resistance", 2e9),
    ("1 TΩ", "resistance", 1e12),
    ("1e3 kΩ", "resistance", 1e6),
    ("230 V", "voltage", 230.0),
    ("2.5 kV", "voltage", 2500.0),
    ("50 Hz", "frequency", 50.0),
    # litre = 1e-3 m^3, minute = 60 s, hour = 3600 s (SI Brochure Table 8; published)
    ("4 L/min", "flow", 4e-3 / 60),
    ("10 mL", "volume", 10e-6),
    ("30 L", "volume", 30e-3),
    ("140 m^3", "volume", 140.0),
    ("140 m³", "volume", 140.0),
    ("400 cm^2", "area", 400e-4),
    ("400 cm²", "area", 400e-4),
    ("25 /h", "rate", 25 / 3600),
    ("25 1/h", "rate", 25 / 3600),
    ("150 pF", "capacitance", 150e-12),
    ("1.5 nF", "capacitance", 1.5e-9),
    ("0.2 mJ", "energy", 0.2e-3),
    ("60 s", "time", 60.0),
    ("3 min", "time", 180.0),
    ("1 h", "time", 3600.0),
    ("0.2 m/s", "speed", 0.2),
    ("250\u00a0kΩ", "resistance", 250e3),  # no-break space between number and unit
]


@pytest.mark.parametrize(("text", "dimension", "expected"), ACCEPTED)
def test_accepted_spellings(text: str, dimension: str, expected: float) -> None:
    assert parse_quantity(text, dimension) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    ("value", "dimension", "fragment"),
    [
        ("5 kg", "resistance", "expected a resistance (e.g. '250 kΩ'), got '5 kg'"),
        (28, "fraction", "got a bare number 28: add a unit, e.g. '28 %'"),
        (2.5, "time", "got a bare number 2.5: add a unit"),
        ("28", "fraction", "got a bare number 28: add a unit, e.g. '28 %'"),
        ("28 deg", "fraction", "write a fraction with %"),  # pint counts angles dimensionless
        ("3 furlongs/fortnight", "flow", "got '3 furlongs/fortnight'"),
        ("3 blorp", "time", "unknown unit 'blorp'"),
        ("abc", "resistance", "got 'abc'"),
        ("1e999 V", "voltage", "out of range"),
        ("5 Hz", "flow", "expected a volume flow"),
        ("5 __import__('os')", "time", "is not a unit"),
        (True, "voltage", "got true"),
        (None, "time", "got nothing"),
        (["1 V"], "voltage", "got a list"),
        ("50 Hz", "voltage", "got '50 Hz'"),
        ("20 degC", "fraction", "expected a percentage"),
    ],
)
def test_refused(value: object, dimension: str, fragment: str) -> None:
    with pytest.raises(UnitError) as caught:
        parse_quantity(value, dimension)  # type: ignore[arg-type]
    assert fragment in caught.value.message
    assert str(caught.value) == caught.value.message


def test_unit_error_is_a_value_error() -> None:
    with pytest.raises(ValueError):
        parse_quantity("5 kg", "voltage")


def test_unknown_dimension_is_a_programming_error() -> None:
    with pytest.raises(KeyError):
        parse_quantity("5 V", "colour")


def test_every_dimension_has_an_example_that_parses() -> None:
    assert set(DIMENSIONS) == set(SI_UNITS) == set(EXAMPLES)
    for dimension, example in EXAMPLES.items():
        value = parse_quantity(example, dimension)
        assert math.isfinite(value)


def test_own_registry_not_the_application_default() -> None:
    import pint

    assert registry() is registry()
    assert registry() is not pint.get_application_registry().get()


def test_to_si() -> None:
    # SI Brochure 9th ed. Table 7 (pico = 1e-12) and §2.3.1 (degC); published
    assert to_si(150, "pF") == pytest.approx(150e-12)
    assert to_si(20, "degC") == pytest.approx(293.15)
    assert to_si(28, "%") == pytest.approx(0.28)
    assert to_si(4, "L/min") == pytest.approx(4e-3 / 60)
    assert to_si(1, "MΩ") == pytest.approx(1e6)
    with pytest.raises(UnitError):
        to_si(1, "blorp")


prefixes = st.sampled_from([("", 1.0), ("k", 1e3), ("M", 1e6), ("G", 1e9), ("T", 1e12)])


@given(
    magnitude=st.floats(min_value=1e-6, max_value=1e6, allow_nan=False, allow_infinity=False),
    prefix=prefixes,
)
def test_resistance_scales_with_prefix(magnitude: float, prefix: tuple[str, float]) -> None:
    symbol, factor = prefix
    assert parse_quantity(f"{magnitude!r} {symbol}Ω", "resistance") == pytest.approx(
        magnitude * factor, rel=1e-12
    )


@given(st.text(max_size=30))
def test_any_text_parses_or_raises_unit_error(text: str) -> None:
    for dimension in ("resistance", "temperature", "fraction", "flow"):
        try:
            value = parse_quantity(text, dimension)
        except UnitError:
            continue
        assert math.isfinite(value)


@pytest.mark.parametrize(
    ("text", "dimension"),
    [
        ("1.7976931348623157e308 V", "voltage"),  # rounds to infinity at 15 digits
        ("1.8e308 Hz", "frequency"),  # infinity as read
        ("1.7976931348623157e308 K", "temperature"),
        ("1e300 TΩ", "resistance"),  # infinity after the prefix
    ],
)
def test_numbers_that_become_infinite_are_refused(text: str, dimension: str) -> None:
    with pytest.raises(UnitError, match="out of range"):
        parse_quantity(text, dimension)


def test_a_bare_number_error_carries_the_number() -> None:
    from ignite.room.units import BareNumberError

    with pytest.raises(BareNumberError) as caught:
        parse_quantity("0.24", "fraction")
    assert (caught.value.number, caught.value.shown) == (0.24, "0.24")
    with pytest.raises(BareNumberError) as huge:
        parse_quantity(10**400, "volume")  # type: ignore[arg-type]
    assert huge.value.number == math.inf
