"""Hints added to a loader message where a likely slip is recognised.

A bare fraction for a percentage (``relative_humidity: 0.24``) is most likely 24 %, not
0.24 %; a room temperature of 68 degC (or a bare 68) is most likely 68 degF. The hint
names the spelling that was probably meant, and what the other reading would mean. The
ranges consulted are those of `ignite.room.bounds`.
"""

from __future__ import annotations

import math

from ignite.room.bounds import CELSIUS, Bound
from ignite.room.units import EXAMPLES, number_and_unit


def _number(value: float) -> str:
    """A number as a person writes it: 24, not 24.000000000000004."""
    return f"{value:.10g}"


def _kelvin(number: float, unit: str) -> float:
    if unit == "degC":
        return number + CELSIUS
    if unit == "degF":
        return (number - 32.0) * 5.0 / 9.0 + CELSIUS
    return number


def _celsius(kelvin: float) -> str:
    return f"{_number(round(kelvin - CELSIUS, 1))} °C"


def bare_number_hint(number: float, shown: str, example_unit: str, bound: Bound) -> str:
    """What to write instead of the bare `number` (written `shown`) for a key of `bound`.

    >>> from ignite.room.bounds import BOUNDS
    >>> bare_number_hint(0.24, "0.24", "%", BOUNDS["environment.relative_humidity"])
    "write '24 %' (a bare 0.24 reads as a fraction of one; '0.24 %' would mean 0.24 percent)"
    >>> bare_number_hint(68.0, "68", "degC", BOUNDS["environment.temperature"])
    "add a unit: '68 degF' (20 °C) if that is Fahrenheit; 68 degC is outside 5-45 degC"
    """
    if not math.isfinite(number):
        example = EXAMPLES[bound.dimension]
        return f"{shown} is not a number any room holds; write one such as '{example}'"
    if bound.dimension == "fraction" and 0.0 < number <= 1.0:
        return (
            f"write '{_number(number * 100)} %' (a bare {shown} reads as a fraction of one; "
            f"'{shown} %' would mean {shown} percent)"
        )
    if bound.dimension == "temperature":
        for unit in ("degC", "degF", "K"):
            kelvin = _kelvin(number, unit)
            if bound.hard.contains(kelvin):
                if unit == "degC":
                    break
                low, high = bound.hard.low or 0.0, bound.hard.high or 0.0
                return (
                    f"add a unit: '{shown} {unit}' ({_celsius(kelvin)}) if that is "
                    f"{'Fahrenheit' if unit == 'degF' else 'kelvin'}; {shown} degC is outside "
                    f"{_number(low - CELSIUS)}-{_number(high - CELSIUS)} degC"
                )
    return f"add a unit, e.g. '{shown} {example_unit}'"


def other_scale_hint(value: object, bound: Bound) -> str:
    """'; did you mean ...' when `value` read on the other scale would be in range.

    Temperatures: degC for degF and back. Percentages: a number of at most 1 written
    with % (``0.24 %``) may have been meant as a fraction of one (24 %).

    >>> from ignite.room.bounds import BOUNDS
    >>> other_scale_hint("68 degC", BOUNDS["environment.temperature"])
    "; did you mean '68 degF' (20 °C)?"
    >>> other_scale_hint("0.24 %", BOUNDS["environment.relative_humidity"])
    "; if 0.24 is a fraction of one, write '24 %'"
    >>> other_scale_hint("20 degC", BOUNDS["environment.temperature"])
    ''
    """
    split = number_and_unit(value)
    if split is None:
        return ""
    number, unit = split
    if not math.isfinite(number):
        return ""
    if bound.dimension == "temperature" and unit in ("degC", "degF"):
        other = "degF" if unit == "degC" else "degC"
        kelvin = _kelvin(number, other)
        if bound.hard.contains(kelvin):
            return f"; did you mean '{_number(number)} {other}' ({_celsius(kelvin)})?"
    as_fraction = bound.dimension == "fraction" and unit == "percent" and 0.0 < number <= 1.0
    if as_fraction and (bound.usual is None or bound.usual.contains(number)):
        return f"; if {_number(number)} is a fraction of one, write '{_number(number * 100)} %'"
    return ""
