"""Numbers with units, written the way the trade writes them.

Shared by the CLI's text output and the worksheet. Values come in as SI floats with
the unit names of the result record (`Ω` or `ohm`, `V`, `A`, `F`, `J`, `C`, `s`,
`K`, `fraction`, `m3`, `m3_per_s`, `per_s`, ...) and go out as short strings:
resistances in kΩ/MΩ/GΩ/TΩ, currents in mA/µA, capacitances in pF, energies in
mJ/µJ/nJ, charges in nC/µC, times in ms/s/min/h, temperatures in °C, fractions in %.

Rounding is to significant figures, never to a fixed number of decimals, so a small
non-zero number never prints as 0. Trailing zeros are dropped ("4.5 min", not
"4.50 min"). `format_against_limit` adds figures until a value that differs from its
limit also prints differently, on the right side of it.
"""

from __future__ import annotations

import math
from decimal import Decimal
from fractions import Fraction

NO_VALUE = "—"
"""Printed for a value that was not computed (None)."""

NEVER = "never"
"""Printed for an infinite time."""

MINUS = "−"
"""The minus sign (U+2212), as typeset numbers use it."""

MAX_SIG = 8
"""`format_against_limit` stops adding significant figures here."""

# A ladder lists the display units of one quantity, smallest first: (SI value of one
# display unit, symbol). The largest unit whose rounded mantissa is at least 1 wins,
# except where `_LOWEST_MANTISSA` lets the trade's habit win: ignition energies are
# written in mJ down to hundredths ("0.017 mJ" for hydrogen in air).
_Ladder = tuple[tuple[Fraction, str], ...]

_RESISTANCE: _Ladder = (
    (Fraction(1), "Ω"),
    (Fraction(10**3), "kΩ"),
    (Fraction(10**6), "MΩ"),
    (Fraction(10**9), "GΩ"),
    (Fraction(10**12), "TΩ"),
)

_LADDERS: dict[str, _Ladder] = {
    "Ω": _RESISTANCE,
    "ohm": _RESISTANCE,
    "V": ((Fraction(1), "V"), (Fraction(10**3), "kV")),
    "A": ((Fraction(1, 10**6), "µA"), (Fraction(1, 10**3), "mA"), (Fraction(1), "A")),
    "F": ((Fraction(1, 10**12), "pF"),),
    "J": (
        (Fraction(1, 10**12), "pJ"),
        (Fraction(1, 10**9), "nJ"),
        (Fraction(1, 10**6), "µJ"),
        (Fraction(1, 10**3), "mJ"),
        (Fraction(1), "J"),
    ),
    "C": (
        (Fraction(1, 10**12), "pC"),
        (Fraction(1, 10**9), "nC"),
        (Fraction(1, 10**6), "µC"),
        (Fraction(1), "C"),
    ),
    "s": (
        (Fraction(1, 10**3), "ms"),
        (Fraction(1), "s"),
        (Fraction(60), "min"),
        (Fraction(3600), "h"),
    ),
    "fraction": ((Fraction(1, 100), "%"),),
    "fraction_of_lfl": ((Fraction(1, 100), "% of LFL"),),
    "m3": ((Fraction(1), "m³"),),
    "m3_per_s": ((Fraction(1, 60_000), "L/min"),),
    "per_s": ((Fraction(1, 3600), "/h"),),
    "1/s": ((Fraction(1, 3600), "/h"),),
}

_LOWEST_MANTISSA: dict[str, Decimal] = {"mJ": Decimal("0.01")}

_KELVIN_OFFSET = 273.15


def _significant(x: float | Decimal, sig: int) -> str:
    """`x` (not negative) rounded to `sig` significant figures, plain decimal notation.

    >>> _significant(0.000123456, 3), _significant(149_999.0, 2), _significant(4.5, 3)
    ('0.000123', '150000', '4.5')

    Numbers no room can hold (beyond 10^±15) print in exponent form, never as
    hundreds of digits:

    >>> _significant(Decimal("1.5e312"), 3), _significant(5e-324, 2)
    ('1.5e+312', '4.9e-324')
    """
    if x == 0:
        return "0"
    rounded = Decimal(f"{x:.{sig - 1}e}")
    if not -15 <= rounded.adjusted() <= 15:
        mantissa, exponent = f"{rounded:.{sig - 1}e}".split("e")
        if "." in mantissa:
            mantissa = mantissa.rstrip("0").rstrip(".")
        return f"{mantissa}e{exponent}"
    text = format(rounded, "f")
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return text


def _render(value: float, unit: str, sig: int) -> tuple[str, float | Fraction]:
    """The text for a finite or infinite `value`, and the number that text stands for.

    The second element is in the display scale (exact, so that two texts can be
    compared without float noise); it only serves to compare a value with a limit.
    """
    if unit == "K":
        celsius = value - _KELVIN_OFFSET
        if math.isinf(value):
            return ("∞ °C" if value > 0 else f"{MINUS}∞ °C"), value
        text = _significant(abs(celsius), sig)
        shown = Fraction(Decimal(text))
        if shown == 0:
            return "0 °C", shown
        return (f"{MINUS}{text} °C", -shown) if celsius < 0 else (f"{text} °C", shown)

    ladder = _LADDERS.get(unit)
    if math.isinf(value):
        if unit == "s" and value > 0:
            return NEVER, value
        symbol = _base_symbol(unit, ladder)
        sign = "" if value > 0 else MINUS
        return (f"{sign}∞ {symbol}".rstrip(), value)

    if ladder is None:
        text = _significant(abs(value), sig)
        shown = Fraction(Decimal(text))
        sign = MINUS if value < 0 and shown != 0 else ""
        number = f"{sign}{text}"
        return (f"{number} {unit}" if unit not in ("", "1") else number), (
            -shown if sign else shown
        )

    magnitude = abs(value)
    chosen = ladder[0]
    if magnitude == 0:
        zero = next((entry for entry in ladder if entry[0] == 1), ladder[0])
        return f"0 {zero[1]}", Fraction(0)
    text = _significant(_scaled(magnitude, chosen[0]), sig)
    for size, symbol in reversed(ladder):
        candidate = _significant(_scaled(magnitude, size), sig)
        if Decimal(candidate) >= _LOWEST_MANTISSA.get(symbol, Decimal(1)):
            chosen, text = (size, symbol), candidate
            break
    shown = Fraction(Decimal(text)) * chosen[0]
    negative = value < 0 and shown != 0
    return f"{MINUS if negative else ''}{text} {chosen[1]}", (-shown if negative else shown)


def _scaled(magnitude: float, size: Fraction) -> float | Decimal:
    """`magnitude` in display units of `size`; in decimal where a float would overflow.

    Float division as always for the values a room gives (so texts stay as they were);
    decimal only past a float's range, never infinity.

    >>> _scaled(6.195e-3, Fraction(1, 10**3))
    6.195
    >>> _scaled(1e300, Fraction(1, 10**12)) > Decimal("1e311")  # 1e300 F in pF
    True
    """
    scaled = magnitude / float(size)
    if math.isinf(scaled) or (scaled == 0.0 and magnitude != 0.0):
        return Decimal(magnitude) * size.denominator / size.numerator
    return scaled


def _base_symbol(unit: str, ladder: _Ladder | None) -> str:
    if ladder is None:
        return "" if unit in ("", "1") else unit
    for size, symbol in ladder:
        if size == 1:
            return symbol
    return ladder[0][1]


def _missing(value: float | None) -> bool:
    return value is None or math.isnan(value)


def format_si(value: float | None, unit: str, sig: int = 3) -> str:
    """`value` (SI, in `unit`) as a short string with the prefix the trade uses.

    None (and NaN) print as "—"; an infinite time prints as "never".

    >>> format_si(1.3e6, "Ω"), format_si(95e3, "ohm"), format_si(2.5e12, "Ω")
    ('1.3 MΩ', '95 kΩ', '2.5 TΩ')
    >>> format_si(12_000.0, "V"), format_si(0.2109, "A"), format_si(35e-6, "A")
    ('12 kV', '211 mA', '35 µA')
    >>> format_si(150e-12, "F"), format_si(0.65e-3, "J"), format_si(17e-6, "J")
    ('150 pF', '0.65 mJ', '0.017 mJ')
    >>> format_si(1.2e-6, "J"), format_si(7.5e-3, "J"), format_si(0.0, "A")
    ('1.2 µJ', '7.5 mJ', '0 A')
    >>> format_si(0.75e-6, "C"), format_si(270.0, "s"), format_si(4320.0, "s")
    ('750 nC', '4.5 min', '1.2 h')
    >>> format_si(293.15, "K"), format_si(0.235, "fraction"), format_si(None, "V")
    ('20 °C', '23.5 %', '—')
    >>> format_si(math.inf, "s"), format_si(-0.004, "fraction")
    ('never', '−0.4 %')
    """
    if _missing(value):
        return NO_VALUE
    assert value is not None
    if sig < 1:
        raise ValueError(f"sig must be at least 1, got {sig}")
    return _render(value, unit, sig)[0]


def format_duration(seconds: float | None) -> str:
    """A time in s, min or h; "never" for an infinite time, "—" for None.

    >>> format_duration(45.0), format_duration(183.0), format_duration(5400.0)
    ('45 s', '3.05 min', '1.5 h')
    >>> format_duration(math.inf), format_duration(None)
    ('never', '—')
    """
    return format_si(seconds, "s")


def _sign(x: float | Fraction) -> int:
    return (x > 0) - (x < 0)


def format_against_limit(value: float, limit: float, unit: str, sig: int = 3) -> tuple[str, str]:
    """`value` and `limit`, formatted so that the two texts stand in the true order.

    A value that differs from its limit never prints equal to it, and a value just
    above a limit never rounds down to look compliant: significant figures are added
    (up to `MAX_SIG`) until the printed numbers differ in the same direction as the
    true ones. Past that, the value prints as "> limit" or "< limit". Equal values
    print equal.

    >>> format_against_limit(25.04e6, 25e6, "Ω")
    ('25.04 MΩ', '25 MΩ')
    >>> format_against_limit(0.23501, 0.235, "fraction")
    ('23.501 %', '23.5 %')
    >>> format_against_limit(999_950.0, 1e6, "Ω")
    ('999.95 kΩ', '1 MΩ')
    >>> format_against_limit(0.2, 0.235, "fraction")
    ('20 %', '23.5 %')
    """
    if _missing(value) or _missing(limit):
        return format_si(value, unit, sig), format_si(limit, unit, sig)
    truth = _sign(value - limit) if not (math.isinf(value) and value == limit) else 0
    for figures in range(sig, max(sig, MAX_SIG) + 1):
        value_text, value_shown = _render(value, unit, figures)
        limit_text, limit_shown = _render(limit, unit, figures)
        shown = 0 if value_shown == limit_shown else _sign(value_shown - limit_shown)
        if shown == truth and (truth == 0 or value_text != limit_text):
            return value_text, limit_text
    limit_text = _render(limit, unit, sig)[0]
    return (f"> {limit_text}" if truth > 0 else f"< {limit_text}"), limit_text
