"""Ranges in place of single values: a quantity that is not known exactly.

Any quantity in a room file (and any rule value a `ranges` entry names) may be written as

    8 to 12 mL                                uniform between the two ends
    10 mL ± 2 mL        (or 10 mL +/- 2 mL)   normal; the ± is one standard deviation
    {low: 6 mL, likely: 10 mL, high: 20 mL}   triangular

in any unit of the right dimension; a plain value stays a plain value. A `Distribution`
holds the spread in SI units with its central value (the midpoint, the mean, the most
likely value), which is what every nominal calculation uses. A normal spread is cut at
the hard limits of its key (a volume is never negative): `Distribution.values` maps
probabilities through the truncated distribution.

>>> d = parse_range("8 to 12 mL", "volume")
>>> d.kind, round(d.central * 1e6, 9), round(d.low * 1e6, 9), round(d.high * 1e6, 9)
('uniform', 10.0, 8.0, 12.0)
>>> d = parse_range("20 degC ± 2 degC", "temperature")
>>> d.kind, round(d.central, 2), round(d.spread, 9)
('normal', 293.15, 2.0)
>>> parse_range("10 mL", "volume") is None
True
"""

from __future__ import annotations

import hashlib
import math
import re
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ignite.errors import UnitError
from ignite.room.units import describe, number_and_unit, parse_quantity

if TYPE_CHECKING:
    import numpy as np
    import numpy.typing as npt

KINDS = ("uniform", "normal", "triangular")

_TO = re.compile(r"\s+to\s+", re.IGNORECASE)
_PLUS_MINUS = re.compile(r"\s*(?:±|\+/-|\+-)\s*")
_TRIANGLE_KEYS = ("low", "likely", "high")


class RangeError(UnitError):
    """A range that cannot be read: ends the wrong way round, a negative spread, a wrong unit."""


@dataclass(frozen=True)
class Distribution:
    """An uncertain quantity, in SI units.

    uniform: `low`..`high`; normal: mean `central`, standard deviation `spread`, cut at
    `low`..`high` (the key's hard limits, possibly infinite); triangular: `low`, mode
    `central`, `high`. `central` is the value every nominal calculation uses; `text` is
    the range as written.
    """

    kind: str  # uniform | normal | triangular
    central: float
    low: float
    high: float
    spread: float = 0.0  # the standard deviation of a normal spread
    text: str = ""

    @property
    def ends(self) -> tuple[float, ...]:
        """The values as written, which must lie within the key's limits."""
        if self.kind == "normal":
            return (self.central,)
        return (self.low, self.central, self.high)

    @property
    def width(self) -> float:
        """The 5-95 % width a reader would quote, for comparing spreads (SI)."""
        if self.kind == "normal":
            return 2 * 1.6448536269514722 * self.spread
        return self.high - self.low

    def values(self, probabilities: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
        """The quantity at each probability in [0, 1) (the inverse distribution function)."""
        import numpy as np

        u = np.asarray(probabilities, dtype=float)
        if self.kind == "uniform" or self.high == self.low:
            return self.low + u * (self.high - self.low)
        if self.kind == "triangular":
            span = self.high - self.low
            split = (self.central - self.low) / span
            rising = self.low + np.sqrt(u * span * (self.central - self.low))
            falling = self.high - np.sqrt((1.0 - u) * span * (self.high - self.central))
            return np.where(u < split, rising, falling)
        if self.spread == 0.0:
            return np.full_like(u, self.central)
        # the standard normal from the standard library (Wichura's AS 241 for the inverse):
        # within a few units in the last place of scipy.special's ndtri, without importing
        # scipy (a fifth of a second) into a run whose solves are kept
        from statistics import NormalDist

        unit = NormalDist()
        lower = unit.cdf((self.low - self.central) / self.spread)
        upper = unit.cdf((self.high - self.central) / self.spread)
        inside = lower + u * (upper - lower)
        inside = np.clip(inside, 1e-12, 1.0 - 1e-12)
        normal = np.array([unit.inv_cdf(float(p)) for p in inside.ravel()]).reshape(inside.shape)
        found = self.central + self.spread * normal
        return np.clip(found, self.low, self.high)

    def describe(self) -> str:
        """How the worksheet names the spread: 'uniform', 'normal (± is one SD)', ..."""
        return {
            "uniform": "uniform between the ends",
            "normal": "normal, ± one standard deviation",
            "triangular": "triangular (low, most likely, high)",
        }[self.kind]


def is_range(value: Any) -> bool:
    """True when `value` is written as a range (not necessarily a valid one)."""
    if isinstance(value, dict):
        return True
    if not isinstance(value, str):
        return False
    return bool(_TO.search(value) or _PLUS_MINUS.search(value))


def parse_range(
    value: Any,
    dimension: str,
    hard_low: float = -math.inf,
    hard_high: float = math.inf,
) -> Distribution | None:
    """`value` as a `Distribution` in SI units, or None when it is a plain value.

    `hard_low`/`hard_high` are the key's physical limits: a normal spread is cut at
    them (the caller checks that the ends and the mean lie within). Raises `RangeError`
    naming what is wrong.
    """
    if not is_range(value):
        return None
    if isinstance(value, dict):
        return _triangle(value, dimension, hard_low, hard_high)
    text = str(value).strip()
    if _TO.search(text):
        left, right = _TO.split(text, maxsplit=1)
        low, high = _pair(left, right, dimension, text)
        if low > high:
            raise RangeError(f"got {describe(text)}: the low end is above the high end")
        return Distribution(
            "uniform", _midpoint(left, right, dimension, low, high), low, high, text=text
        )
    left, right = _PLUS_MINUS.split(text, maxsplit=1)
    mean = _quantity(left, dimension, text)
    spread = _difference(left, right, dimension, text)
    if spread < 0.0:
        raise RangeError(f"got {describe(text)}: the spread after ± must not be negative")
    return Distribution("normal", mean, hard_low, hard_high, spread=spread, text=text)


def _quantity(part: str, dimension: str, whole: str) -> float:
    try:
        return parse_quantity(part.strip(), dimension)
    except UnitError as exc:
        raise RangeError(f"in the range {describe(whole)}: {exc.message}") from None


def _pair(left: str, right: str, dimension: str, whole: str) -> tuple[float, float]:
    """Both ends of 'A to B'; a bare number on the left takes the right end's unit."""
    found = number_and_unit(right.strip())
    if number_and_unit(left.strip()) is None and found is not None:
        left = f"{left.strip()} {found[1]}"
    return _quantity(left, dimension, whole), _quantity(right, dimension, whole)


def _midpoint(left: str, right: str, dimension: str, low: float, high: float) -> float:
    """The middle of 'A to B' read as the file would write it ('6 to 10 L/min' is exactly
    what '8 L/min' reads as), else the middle of the SI ends."""
    found_left, found_right = number_and_unit(left.strip()), number_and_unit(right.strip())
    unit = found_right[1] if found_right else ""
    if found_right and (found_left is None or found_left[1] == unit):
        number = split_number(left.strip()) if found_left is None else found_left[0]
        if number is not None:
            try:
                return parse_quantity(f"{0.5 * (number + found_right[0])!r} {unit}", dimension)
            except UnitError:
                pass
    return float(f"{0.5 * (low + high):.15g}")


def split_number(text: str) -> float | None:
    try:
        return float(text.replace("\u2212", "-"))
    except ValueError:
        return None


def _difference(centre: str, spread: str, dimension: str, whole: str) -> float:
    """The spread after ± in SI units, as a difference (2 degC is 2 K, not 275 K); a bare
    number takes the centre's unit."""
    centre_split = number_and_unit(centre.strip())
    spread_split = number_and_unit(spread.strip())
    if spread_split is None and centre_split is not None:
        spread = f"{spread.strip()} {centre_split[1]}"
        spread_split = number_and_unit(spread)
    if spread_split is None:
        raise RangeError(f"got {describe(whole)}: the spread after ± needs a unit")
    number, unit = spread_split
    base = _quantity(f"0 {unit}", dimension, whole)
    return _quantity(f"{number!r} {unit}", dimension, whole) - base


def _triangle(
    value: dict[Any, Any], dimension: str, hard_low: float, hard_high: float
) -> Distribution:
    keys = set(value)
    if keys != set(_TRIANGLE_KEYS):
        missing = [k for k in _TRIANGLE_KEYS if k not in keys]
        extra = sorted(str(k) for k in keys - set(_TRIANGLE_KEYS))
        said = []
        if missing:
            said.append(f"missing {', '.join(missing)}")
        if extra:
            said.append(f"unknown {', '.join(extra)}")
        raise RangeError(
            "expected a value, a range ('8 to 12 mL', '10 mL ± 2 mL') or "
            f"{{low: ..., likely: ..., high: ...}}; {'; '.join(said)}"
        )
    text = f"low {value['low']}, likely {value['likely']}, high {value['high']}"
    low, likely, high = (
        _quantity(_text(value[key], key), dimension, text) for key in _TRIANGLE_KEYS
    )
    if not low <= likely <= high:
        raise RangeError(f"got {text}: expected low ≤ likely ≤ high")
    return Distribution("triangular", likely, low, high, text=text)


def _text(value: Any, key: str) -> str:
    if not isinstance(value, str):
        raise RangeError(f"{key}: expected a value with a unit, got {describe(value)}")
    return value


def sampling_seed(*digests: str) -> int:
    """A seed from hex digests (the room file's and the rules'): the same inputs always
    draw the same samples, so the output is byte-identical run to run.

    >>> sampling_seed("ab", "cd") == sampling_seed("ab", "cd")
    True
    """
    joined = hashlib.sha256("\n".join(digests).encode("ascii")).hexdigest()
    return int(joined[:16], 16)


@dataclass(frozen=True)
class Sampling:
    """How ranges are treated in a run (`--samples`, `--nominal`, `--confidence`).

    samples: None for the default, taken when the room gives a range (rule ranges join
    in then); a number also samples a room that gives none. nominal: central values only,
    no sampling. confidence: the percentile decisions are read at (0.95: drape no earlier
    than the 95th percentile of the safe draping time).
    """

    samples: int | None = None
    nominal: bool = False
    confidence: float | None = None  # None: the rules' default

    def active(self, room_has_ranges: bool) -> bool:
        """Whether this run samples at all."""
        if self.nominal:
            return False
        return room_has_ranges or self.samples is not None


DEFAULT_SAMPLES = 1000
"""Samples drawn when `--samples` is not given: a percentile then stands within about 0.1 of
a percentage point of its level. The batch drying solver takes about 1 s per case with a
flammable prep at this count on a laptop-class machine, and a sampled room about 3 times
its run at central values (tests/benchmark.py); `--samples 100` is quicker and coarser."""
