"""The project's one pint registry and the parsing of quantity strings into SI floats.

Room files and `rules/` hold values as strings with units (``"250 kΩ"``, ``"20 degC"``,
``"4 L/min"``); everything inside ignite is an SI float. This module is the only place
that converts. It never touches pint's application-wide default registry, and it builds
its own registry on first use so that ``import ignite.room.units`` stays cheap.

The number and the unit are split before pint sees them: pint refuses ``"21 degC"`` as
one expression (an offset unit in a multiplication), and splitting also keeps pint's
expression parser away from anything but a short unit text.

>>> parse_quantity("1.3 MΩ", "resistance")
1300000.0
>>> parse_quantity("28 %", "fraction")
0.28
>>> round(parse_quantity("68 degF", "temperature"), 2)
293.15
"""

from __future__ import annotations

import contextlib
import functools
import math
import os
import re
import shutil
import sys
import tempfile
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

from ignite.errors import UnitError
from ignite.physics._cache import cache_directory

if TYPE_CHECKING:
    import pint


class BareNumberError(UnitError):
    """A number written without a unit; `number` is it, for a hint that fits the key."""

    def __init__(self, expected: str, shown: str, number: float, example_unit: str) -> None:
        super().__init__(
            f"{expected}, got a bare number {shown}: add a unit, e.g. '{shown} {example_unit}'"
        )
        self.expected = expected  # "expected a temperature (e.g. '20 degC')"
        self.shown = shown  # the number as written
        self.number = number
        self.example_unit = example_unit


# Dimension names used by the loaders -> pint dimensionality expression.
DIMENSIONS: dict[str, str] = {
    "resistance": "[resistance]",
    "voltage": "[electric_potential]",
    "current": "[current]",
    "charge": "[charge]",
    "frequency": "[frequency]",
    "temperature": "[temperature]",
    "fraction": "dimensionless",
    "volume": "[volume]",
    "area": "[area]",
    "length": "[length]",
    "flow": "[length]**3/[time]",
    "rate": "1/[time]",
    "capacitance": "[capacitance]",
    "energy": "[energy]",
    "power": "[power]",
    "pressure": "[pressure]",
    "mass": "[mass]",
    "time": "[time]",
    "speed": "[length]/[time]",
    "diffusivity": "[length]**2/[time]",
    "heat transfer coefficient": "[power]/[length]**2/[temperature]",
}

# The SI unit each dimension is returned in.
SI_UNITS: dict[str, str] = {
    "resistance": "ohm",
    "voltage": "volt",
    "current": "ampere",
    "charge": "coulomb",
    "frequency": "hertz",
    "temperature": "kelvin",
    "fraction": "dimensionless",
    "volume": "meter**3",
    "area": "meter**2",
    "length": "meter",
    "flow": "meter**3/second",
    "rate": "1/second",
    "capacitance": "farad",
    "energy": "joule",
    "power": "watt",
    "pressure": "pascal",
    "mass": "kilogram",
    "time": "second",
    "speed": "meter/second",
    "diffusivity": "meter**2/second",
    "heat transfer coefficient": "watt/meter**2/kelvin",
}

# Shown in error messages: one correct way to write each dimension.
EXAMPLES: dict[str, str] = {
    "resistance": "250 kΩ",
    "voltage": "230 V",
    "current": "10 mA",
    "charge": "1.5 µC",
    "frequency": "50 Hz",
    "temperature": "20 degC",
    "fraction": "28 %",
    "volume": "140 m^3",
    "area": "400 cm^2",
    "length": "1.5 m",
    "flow": "4 L/min",
    "rate": "25 /h",
    "capacitance": "150 pF",
    "energy": "0.2 mJ",
    "power": "40 W",
    "pressure": "101.3 kPa",
    "mass": "10 g",
    "time": "3 min",
    "speed": "0.2 m/s",
    "diffusivity": "0.26 cm^2/s",
    "heat transfer coefficient": "12.6 W/(m^2*K)",
}

_NOUNS: dict[str, str] = {
    "fraction": "a percentage",
    "rate": "a rate per unit time",
    "flow": "a volume flow",
    "area": "an area",
    "energy": "an energy",
}

# The only units a fraction may be written in (pint also counts angles as dimensionless).
_FRACTION_UNITS = frozenset({"percent", "permille", "ppm"})

_NUMBER = re.compile(r"\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*\Z", re.DOTALL)
_UNIT_CHARS = re.compile(r"[A-Za-z0-9µμΩ°²³%‰/^*.() _-]*\Z")
_MAX_UNIT_LENGTH = 40

# Spellings pint does not know, rewritten before parsing. Order matters.
_REWRITES: tuple[tuple[re.Pattern[str], str], ...] = (
    (re.compile("\u2126"), "Ω"),  # OHM SIGN -> GREEK CAPITAL LETTER OMEGA
    (re.compile("[Oo][Hh][Mm][Ss]?(?![A-Za-z])"), "ohm"),  # Ohm, ohms; keeps the prefix
    (re.compile("\u2103"), "degC"),  # ℃
    (re.compile("\u2109"), "degF"),  # ℉
    (re.compile("°\\s*C(?![A-Za-z])"), "degC"),
    (re.compile("°\\s*F(?![A-Za-z])"), "degF"),
    (re.compile("³"), "^3"),
    (re.compile("²"), "^2"),
    (re.compile("%"), "percent"),
    (re.compile("‰"), "permille"),
    (re.compile(r"\A/"), "1/"),  # "25 /h": per hour
)

_registry: pint.UnitRegistry[Any] | None = None

_READY = "complete"
"""The file that marks a folder of pint's build cache as whole (written last)."""


def registry() -> pint.UnitRegistry[Any]:
    """The project's pint registry, built on first use (never pint's default registry).

    pint keeps what it built from its definition files in a cache folder of its own
    making (`cache_folder`, keyed there by the files' bytes); ignite gives it a folder in
    the user's cache directory (`ignite.physics._cache.cache_directory`) named for the
    versions of Python and pint. That folder is filled in a private folder and moved into
    place whole, so a process never reads a half-written file; any failure, or
    `IGNITE_NO_CACHE=1`, builds the registry without it. Deleting the folder is safe.
    """
    global _registry
    if _registry is None:
        import pint

        _registry = _cached_registry(pint) or pint.UnitRegistry(
            autoconvert_offset_to_baseunit=False
        )
    return _registry


def _cached_registry(pint: Any) -> pint.UnitRegistry[Any] | None:
    """The registry built through pint's own build cache, or None when that cannot be used."""
    directory = cache_directory()
    if directory is None:
        return None
    folder = directory / f"pint-{pint.__version__}-py{sys.version_info[0]}.{sys.version_info[1]}"
    try:
        if (folder / _READY).is_file():
            return pint.UnitRegistry(autoconvert_offset_to_baseunit=False, cache_folder=folder)
        directory.mkdir(parents=True, exist_ok=True)
        with tempfile.TemporaryDirectory(prefix=".tmp-pint-", dir=directory) as scratch:
            staging = Path(scratch) / "cache"
            staging.mkdir()
            built = pint.UnitRegistry(autoconvert_offset_to_baseunit=False, cache_folder=staging)
            (staging / _READY).write_text(pint.__version__, encoding="utf-8")
            with contextlib.suppress(OSError):  # another process got there first: fine
                os.rename(staging, folder)
        return built
    except Exception:  # a cache that cannot be read or written is only a missed shortcut
        _set_aside(folder)
        return None


def _set_aside(folder: Path) -> None:
    """Move a build cache that could not be used out of the way: the next run fills it again."""
    with contextlib.suppress(OSError):
        if folder.is_dir():
            aside = Path(tempfile.mkdtemp(prefix=".tmp-pint-stale-", dir=folder.parent))
            os.rename(folder, aside / "cache")
            shutil.rmtree(aside, ignore_errors=True)


def noun(dimension: str) -> str:
    """The dimension as messages name it: 'a resistance', 'a percentage', 'an area'."""
    return _NOUNS.get(dimension, f"a {dimension}")


def _expected(dimension: str) -> str:
    return f"expected {noun(dimension)} (e.g. '{EXAMPLES[dimension]}')"


def _show_number(value: float) -> str:
    if isinstance(value, float):
        return repr(value)
    try:
        text = str(value)
    except ValueError:  # more digits than Python converts
        return "with thousands of digits"
    return text if len(text) <= 20 else f"{text[:8]}... ({len(text)} digits)"


def _as_float(number: float) -> float:
    """`number` as a float; an integer too large for one becomes infinity."""
    try:
        return float(number)
    except OverflowError:
        return math.inf if number > 0 else -math.inf


def _normalise_unit(unit: str) -> str:
    for pattern, replacement in _REWRITES:
        unit = pattern.sub(replacement, unit)
    return unit.strip()


def _split(text: str) -> tuple[float, str] | None:
    """Number and unit text, or None when the text does not start with a number."""
    cleaned = text.replace("\u2212", "-")  # MINUS SIGN
    for space in ("\u00a0", "\u202f", "\u2009"):
        cleaned = cleaned.replace(space, " ")
    match = _NUMBER.match(cleaned)
    if match is None:
        return None
    return float(match.group(1)), match.group(2)


def number_and_unit(text: object) -> tuple[float, str] | None:
    """The number and the unit (as pint reads it) of a quantity string, or None.

    >>> number_and_unit("68 °C"), number_and_unit("0.24 %"), number_and_unit(5)
    ((68.0, 'degC'), (0.24, 'percent'), None)
    """
    if not isinstance(text, str):
        return None
    split = _split(text)
    if split is None or not split[1]:
        return None
    return split[0], _normalise_unit(split[1])


def parse_quantity(text: str | float, dimension: str) -> float:
    """Read ``"<number> <unit>"`` as `dimension` and return it in SI units.

    Temperatures come back in kelvin, fractions (``"28 %"``) as 0-1, rates and
    frequencies per second, flows in m³/s. Raises `UnitError` with a message that says
    what was expected (with an example) and what was found; a bare number is refused
    because its unit would be a guess.

    >>> round(parse_quantity("25 /h", "rate") * 3600, 9)
    25.0
    >>> round(parse_quantity("4 L/min", "flow") * 60_000, 9)
    4.0
    >>> parse_quantity("5 kg", "resistance")
    Traceback (most recent call last):
    ...
    ignite.errors.UnitError: expected a resistance (e.g. '250 kΩ'), got '5 kg'
    """
    if dimension not in DIMENSIONS:
        raise KeyError(f"unknown dimension {dimension!r}; known: {', '.join(DIMENSIONS)}")
    expected = _expected(dimension)
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        raise UnitError(f"{expected}, got {describe(text)}")
    if not isinstance(text, str):
        raise BareNumberError(
            expected, _show_number(text), _as_float(text), EXAMPLES[dimension].split(" ", 1)[1]
        )
    split = _split(text)
    if split is None:
        raise UnitError(f"{expected}, got '{text}'")
    magnitude, unit_text = split
    if not math.isfinite(magnitude):
        raise UnitError(f"{expected}, got '{text}': the number is out of range")
    if not unit_text:
        raise BareNumberError(
            expected, text.strip(), magnitude, EXAMPLES[dimension].split(" ", 1)[1]
        )
    unit = _normalise_unit(unit_text)
    if len(unit) > _MAX_UNIT_LENGTH or not _UNIT_CHARS.match(unit):
        raise UnitError(f"{expected}, got '{text}': '{unit_text}' is not a unit")
    return _convert(magnitude, unit, dimension, f"{expected}, got '{text}'")


def _dimensionality(dimension: str) -> Any:
    """pint dimensionality of `dimension` (from DIMENSIONS; 'dimensionless' has none)."""
    ureg = registry()
    expression = DIMENSIONS[dimension]
    if expression == "dimensionless":
        return ureg.Quantity(1.0, "dimensionless").dimensionality
    return ureg.get_dimensionality(expression)


@dataclass(frozen=True)
class _UnitCheck:
    """What pint said about one unit text for one dimension (cached: files repeat units)."""

    why: str | None  # None: usable; else what to add to the complaint
    scale: float | None = None  # SI value of 1 unit, for units without an offset


@functools.lru_cache(maxsize=512)
def _check_unit(unit: str, dimension: str) -> _UnitCheck:
    ureg = registry()
    try:
        one = ureg.Quantity(1.0, unit)
    except Exception:  # pint raises many kinds (undefined unit, syntax, assertion, ...)
        return _UnitCheck(f": unknown unit '{unit}'")
    try:
        if one.dimensionality != _dimensionality(dimension):
            return _UnitCheck("")
        # pint counts angles as dimensionless: "28 deg" must not pass as 0.49
        if dimension == "fraction" and str(one.units) not in _FRACTION_UNITS:
            return _UnitCheck(": write a fraction with %")
        zero = float(ureg.Quantity(0.0, unit).to(SI_UNITS[dimension]).magnitude)
        scale = float(one.to(SI_UNITS[dimension]).magnitude)
    except Exception:  # overflow and the like
        return _UnitCheck(": the value is out of range")
    # degC and degF have an offset: those are converted by pint each time
    return _UnitCheck(None, scale if zero == 0.0 else None)


def _convert(magnitude: float, unit: str, dimension: str, complaint: str) -> float:
    """`magnitude` `unit` in the SI unit of `dimension`, or UnitError(`complaint` + why)."""
    check = _check_unit(unit, dimension)
    if check.why is not None:
        raise UnitError(complaint + check.why)
    if check.scale is not None:
        value = magnitude * check.scale
    else:
        try:
            quantity = registry().Quantity(magnitude, unit)
            value = float(quantity.to(SI_UNITS[dimension]).magnitude)
        except Exception:
            raise UnitError(f"{complaint}: the value is out of range") from None
    value = _tidy(value)
    if not math.isfinite(value):
        raise UnitError(f"{complaint}: the value is out of range")
    return value


def _tidy(value: float) -> float:
    """Round to 15 significant digits: "70 %" is 0.7, not 0.7000000000000001.

    Float conversion factors leave noise in the 16th-17th digit; no reading in a room
    file is known to better than a few digits. Rounding can carry the largest floats
    to infinity (1.7976931348623157e308 becomes 1.79769313486232e308): the caller
    checks the result is finite.

    >>> _tidy(1.7976931348623157e308)
    inf
    """
    return float(f"{value:.15g}")


def to_si(value: float, unit: str) -> float:
    """`value` in `unit`, converted to SI base units (kelvin for temperatures).

    For loaders that hold the number and the unit apart. Raises `UnitError` for a
    unit pint does not know.

    >>> to_si(150, "pF")
    1.5e-10
    >>> round(to_si(20, "degC"), 2)
    293.15
    """
    normalised = _normalise_unit(unit)
    ureg = registry()
    try:
        quantity = ureg.Quantity(float(value), normalised)
        result = _tidy(float(quantity.to_base_units().magnitude))
    except Exception as exc:
        raise UnitError(f"cannot read the unit '{unit}'") from exc
    if not math.isfinite(result):
        raise UnitError(f"{value} {unit} is out of range")
    return result


def describe(value: object) -> str:
    """How a found value is named in messages: quoted text, a number, 'a list', ...

    >>> describe("5 kg"), describe(None), describe([1])
    ("'5 kg'", 'nothing', 'a list')
    """
    if value is None:
        return "nothing"
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        return f"the number {_show_number(value)}"
    if isinstance(value, str):
        shown = value if len(value) <= 60 else value[:57] + "..."
        # a lone surrogate cannot be printed: show it as its escape
        shown = shown.encode("utf-8", "backslashreplace").decode("utf-8")
        return f"'{shown}'"
    if isinstance(value, list):
        return "a list"
    if isinstance(value, dict):
        return "a mapping of keys"
    return type(value).__name__


@functools.lru_cache(maxsize=512)
def _dimension_of_unit(unit: str) -> str | None:
    """The first dimension in DIMENSIONS whose dimensionality the unit has, or None."""
    try:
        dimensionality = registry().Quantity(1.0, unit).dimensionality
    except Exception:  # pint raises many kinds for text it cannot read
        return None
    for dimension in DIMENSIONS:
        if _dimensionality(dimension) == dimensionality:
            return dimension
    return None


def parse_any(text: str) -> tuple[float, str]:
    """Read ``"<number> <unit>"`` of whatever dimension its unit has: (SI value, dimension).

    For rule files, whose parameters may be of any dimension. Raises `UnitError`.

    >>> parse_any("150 pF")
    (1.5e-10, 'capacitance')
    >>> parse_any("25 %")
    (0.25, 'fraction')
    """
    split = _split(str(text))
    if split is None or not split[1]:
        raise UnitError(f"expected a value with a unit, got {describe(text)}")
    dimension = _dimension_of_unit(_normalise_unit(split[1]))
    if dimension is None:
        raise UnitError(f"expected a value with a known unit, got {describe(text)}")
    return parse_quantity(text, dimension), dimension
