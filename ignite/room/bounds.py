"""The one table of plausible ranges for every quantity and list of the room file.

Each key of the room file that holds a number has a `Bound`: a hard range (outside it the
file is refused: the value cannot describe an operating theatre, or the physics behind the
figures does not hold there) and a usual range (outside it the value is accepted with a
warning: possible, but more often a slip of unit or decimal point), with the reason for
both. Lists have a `ListLimit`: the most entries a room file may give, with its reason.

The bounds come from the physics and the trade, never from what the parser can hold: no
number outside a hard range, and no infinite or NaN number, ever reaches the physics. Keys
are key paths with list indices written `[]` (``cases[].drape_pocket.volume``); `bound_for`
finds the bound of a concrete path (``cases[2].drape_pocket.volume``).

Values are in SI units (m³, m³/s, Ω, F, K, s, fractions); the `text` of each range says
them in the units the room file uses.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

L = 1e-3  # m³ in a litre
L_PER_MIN = 1e-3 / 60.0  # m³/s in a litre per minute
PER_HOUR = 1.0 / 3600.0  # 1/s in one per hour
MINUTE = 60.0
HOUR = 3600.0
CELSIUS = 273.15  # K at 0 degC


@dataclass(frozen=True)
class Limits:
    """A closed or open interval of SI values, with the words that describe it.

    Only finite numbers are ever inside: infinity and NaN are outside every range.
    """

    text: str
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    high_open: bool = False

    def contains(self, value: float) -> bool:
        try:
            if not math.isfinite(value):
                return False
        except OverflowError:  # an integer too large for a float
            return False
        # a hair of tolerance so that "45 degC" (318.15 K after float arithmetic) is in
        slack = 1e-9 * abs(value)  # (no floor: a tiny negative below a limit of 0 is out)
        if self.low is not None:
            if self.low_open and not value > self.low:
                return False
            if not self.low_open and value < self.low - slack:
                return False
        if self.high is not None:
            if self.high_open and not value < self.high:
                return False
            if not self.high_open and value > self.high + slack:
                return False
        return True


@dataclass(frozen=True)
class Bound:
    """The ranges of one quantity key: refused outside `hard`, warned outside `usual`."""

    dimension: str  # a dimension of ignite.room.units.DIMENSIONS
    hard: Limits
    usual: Limits | None
    reason: str


@dataclass(frozen=True)
class ListLimit:
    """The most entries a list of the room file may hold, and why."""

    most: int
    what: str  # the entries, as a message names them
    reason: str


_RESISTANCE_HARD = Limits("between 1 Ω and 1000 TΩ", low=1.0, high=1e15)
_RESISTANCE_REASON = (
    "resistance meters for floors, footwear and castors read from about 1 kΩ to 1 TΩ "
    "(IEC 61340-4-1, EN 1081; common practice); below 1 Ω is a short circuit and above "
    "1000 TΩ beyond any meter, so either is a slip of unit"
)
_CAPACITANCE = Bound(
    "capacitance",
    Limits("between 1 pF and 100 nF", low=1e-12, high=100e-9),
    Limits("20 pF to 1000 pF", low=20e-12, high=1000e-12),
    "a person stands at 100-300 pF to the floor (IEC 61000-4-2 uses 150 pF; published) and "
    "a trolley at tens to hundreds of pF (common practice); nF or µF for pF is a slip of unit",
)
_CASE_TIME_REASON = (
    "times within one operating list; a day (24 h) is longer than any list, and a wait of "
    "hours before draping or the first activation is more often minutes written as hours"
)

BOUNDS: dict[str, Bound] = {
    "room.mains.voltage": Bound(
        "voltage",
        Limits("between 100 V and 480 V", low=100.0, high=480.0),
        None,
        "public low-voltage supplies run from 100 V to 480 V line to line (IEC 60038; to confirm)",
    ),
    "room.mains.frequency": Bound(
        "frequency",
        Limits("between 45 Hz and 65 Hz", low=45.0, high=65.0),
        None,
        "public supplies run at 50 Hz or 60 Hz (IEC 60038; to confirm)",
    ),
    "environment.temperature": Bound(
        "temperature",
        Limits("between 5 degC and 45 degC", low=CELSIUS + 5.0, high=CELSIUS + 45.0),
        Limits("15 degC to 30 degC", low=CELSIUS + 15.0, high=CELSIUS + 30.0),
        "a room people work in; theatres are kept at about 18-25 degC (common practice); the "
        "air and vapour correlations are for room conditions",
    ),
    "environment.relative_humidity": Bound(
        "fraction",
        Limits("between 0 % and 100 %", low=0.0, high=1.0),
        Limits("10 % to 90 %", low=0.10, high=0.90),
        "relative humidity is 0-100 % by definition; a ventilated theatre seldom reads below "
        "10 % or above 90 %, and such a reading is more often a slip (0.24 % for 24 %)",
    ),
    "environment.air_changes": Bound(
        "rate",
        Limits("above 0 /h and at most 1000 /h", low=0.0, high=1000.0 * PER_HOUR, low_open=True),
        Limits("up to 100 /h", high=100.0 * PER_HOUR),
        "the room's oxidant rise is a steady state of ventilation, which needs some (leakage "
        "alone gives about 0.5 /h); theatres run 15-25 /h and ultra-clean air up to a few "
        "hundred /h (common practice)",
    ),
    "environment.volume": Bound(
        "volume",
        Limits("between 1 m^3 and 100000 m^3", low=1.0, high=1e5),
        Limits("20 m^3 to 1000 m^3", low=20.0, high=1000.0),
        "a theatre is about 100-200 m^3 (common practice); below 1 m^3 no one fits and above "
        "100000 m^3 it is a hall, not a room",
    ),
    "floor.test_voltage": Bound(
        "voltage",
        Limits("between 10 V and 1000 V", low=10.0, high=1000.0),
        None,
        "floor tests apply 10 V, 100 V or 500 V (IEC 61340-4-1; to confirm); insulation testers "
        "reach 1000 V",
    ),
    "floor.point_to_ground[]": Bound(
        "resistance",
        _RESISTANCE_HARD,
        Limits("1 kΩ to 1 TΩ", low=1e3, high=1e12),
        _RESISTANCE_REASON,
    ),
    "floor.point_to_point[]": Bound(
        "resistance",
        _RESISTANCE_HARD,
        Limits("1 kΩ to 1 TΩ", low=1e3, high=1e12),
        _RESISTANCE_REASON,
    ),
    "people[].footwear": Bound("resistance", _RESISTANCE_HARD, None, _RESISTANCE_REASON),
    "people[].capacitance": _CAPACITANCE,
    "trolleys[].capacitance": _CAPACITANCE,
    "trolleys[].path_to_floor": Bound("resistance", _RESISTANCE_HARD, None, _RESISTANCE_REASON),
    "preparations[].components.*": Bound(
        "fraction",
        Limits("above 0 % and at most 100 %", low=0.0, high=1.0, low_open=True),
        None,
        "a component is a part of the whole; leave out a component that is not there",
    ),
    "cases[].oxygen.flow": Bound(
        "flow",
        Limits("between 0 L/min and 100 L/min", low=0.0, high=100.0 * L_PER_MIN),
        Limits("up to 15 L/min", high=15.0 * L_PER_MIN),
        "oxygen flowmeters read to 15 L/min and an anaesthetic machine's flush gives "
        "35-75 L/min (ISO 80601-2-13; to confirm); 100 L/min is beyond any medical supply",
    ),
    "cases[].oxygen.fraction": Bound(
        "fraction",
        Limits("between 20.9 % and 100 %", low=0.209, high=1.0),
        None,
        "no gas delivered to a patient is leaner than air, 20.9 % oxygen (medical air is "
        "taken as air); write 21 % when no oxygen is added",
    ),
    "cases[].oxygen.nitrous_oxide_flow": Bound(
        "flow",
        Limits("between 0 L/min and 100 L/min", low=0.0, high=100.0 * L_PER_MIN),
        Limits("up to 15 L/min", high=15.0 * L_PER_MIN),
        "nitrous oxide flowmeters read to 10-15 L/min (common practice)",
    ),
    "cases[].oxygen.stop_before_activation": Bound(
        "time",
        Limits("between 0 s and 24 h", low=0.0, high=24 * HOUR),
        Limits("up to 1 h", high=HOUR),
        "oxygen is stopped a minute or a few before activation (common practice); "
        + _CASE_TIME_REASON,
    ),
    "cases[].drape_pocket.volume": Bound(
        "volume",
        Limits("between 1 L and 500 L", low=1.0 * L, high=500.0 * L),
        Limits("5 L to 200 L", low=5.0 * L, high=200.0 * L),
        "the gas space under drapes around one operative site is litres to a few hundred "
        "litres (common practice); below 1 L there is no pocket, above 500 L it is the room",
    ),
    "cases[].drape_pocket.exchange": Bound(
        "flow",
        Limits(
            "above 0.01 L/min and at most 10000 L/min",
            low=0.01 * L_PER_MIN,
            high=10000.0 * L_PER_MIN,
        ),
        Limits("0.5 L/min to 500 L/min", low=0.5 * L_PER_MIN, high=500.0 * L_PER_MIN),
        "a pocket with no exchange never clears and one below 0.01 L/min takes weeks; a "
        "theatre's whole supply is some 1000-100000 L/min, and the pocket gets a share of it",
    ),
    "cases[].prep.volume": Bound(
        "volume",
        Limits("between 0.1 mL and 1 L", low=0.1e-6, high=1e-3),
        Limits("1 mL to 100 mL", low=1e-6, high=100e-6),
        "skin-prep applicators hold about 1-26 mL (common practice); a litre is a bottle",
    ),
    "cases[].prep.area": Bound(
        "area",
        Limits("between 1 cm^2 and 3 m^2", low=1e-4, high=3.0),
        Limits("10 cm^2 to 1 m^2", low=1e-3, high=1.0),
        "an adult's whole skin is about 1.6-2.2 m^2 (Mosteller body-surface area; to confirm); a "
        "prep covers a site, some hundreds of cm^2",
    ),
    "cases[].prep.skin_temperature": Bound(
        "temperature",
        Limits("between 20 degC and 42 degC", low=CELSIUS + 20.0, high=CELSIUS + 42.0),
        None,
        "skin of a living patient, cooled or febrile (common practice)",
    ),
    "cases[].air_speed": Bound(
        "speed",
        Limits("between 0 m/s and 10 m/s", low=0.0, high=10.0),
        Limits("up to 1 m/s", high=1.0),
        "air at the operating table moves at 0.1-0.5 m/s (common practice); 10 m/s is a gale "
        "indoors",
    ),
    "cases[].draping_after": Bound(
        "time",
        Limits("between 0 s and 24 h", low=0.0, high=24 * HOUR),
        Limits("up to 1 h", high=HOUR),
        _CASE_TIME_REASON,
    ),
    "cases[].first_activation_after": Bound(
        "time",
        Limits("between 0 s and 24 h", low=0.0, high=24 * HOUR),
        Limits("up to 4 h", high=4 * HOUR),
        _CASE_TIME_REASON,
    ),
}

PEOPLE_COUNT = Limits("a whole number from 1 to 100", low=1, high=100)
PEOPLE_COUNT_REASON = "the people of one role in one theatre; 100 is more than any room holds"

# A wet film thicker than this runs off skin: the prep's volume over its area.
FILM_THICKNESS = Limits("at most 5 mm", high=5e-3)
FILM_THICKNESS_REASON = (
    "a liquid film on skin runs off at about a millimetre (common practice); a thicker "
    "layer is a pool: give the volume that stays on the site and say pooling: true"
)

# The air of a pocket turned over faster than this is open air, not a pocket.
POCKET_TURNOVER = Limits("at least 1 s", low=1.0)
POCKET_TURNOVER_REASON = (
    "a pocket whose air is replaced in under a second (volume / exchange) is open air; "
    "check the volume and the exchange and their units"
)

# --- the electrical section (ignite.room.electrical) ---------------------------------
_BONDING = Bound(
    "resistance",
    Limits("between 0 Ω and 1 kΩ", low=0.0, high=1e3),
    Limits("up to 1 Ω", high=1.0),
    "a bonding conductor to the equipotential bonding bar reads milliohms to tenths of an "
    "ohm (IEC 60364-7-710 sets 0.2 Ω; to confirm); a resistance is never negative, and a "
    "reading in kΩ is a slip of unit or an open connection",
)
_LEAKAGE = Bound(
    "current",
    Limits("between 0 µA and 100 mA", low=0.0, high=0.1),
    Limits("up to 20 mA", high=0.02),
    "leakage and touch currents of medical equipment read microamperes to a few "
    "milliamperes (IEC 60601-1 allows at most 10 mA of earth leakage in single fault; "
    "to confirm); a current is never negative, and amperes are a slip of unit",
)
_MONITOR = Bound(
    "resistance",
    Limits("between 1 kΩ and 1000 MΩ", low=1e3, high=1e9),
    Limits("20 kΩ to 500 kΩ", low=20e3, high=500e3),
    "an insulation monitor of a medical IT system alarms at some tens of kΩ (IEC "
    "60364-7-710 asks for 50 kΩ or more; to confirm); MΩ for kΩ is a slip of unit",
)
BOUNDS.update(
    {
        "electrical.supply.transformer_rating": Bound(
            "power",
            Limits("between 100 VA and 100 kVA", low=100.0, high=1e5),
            Limits("0.5 kVA to 10 kVA", low=500.0, high=1e4),
            "medical IT transformers are rated 0.5-10 kVA (IEC 60364-7-710, IEC 61558-2-15; "
            "to confirm); write the rating in VA or kVA",
        ),
        "electrical.supply.insulation_monitor.alarm_setting": _MONITOR,
        "electrical.supply.insulation_monitor.tested_alarm_at": _MONITOR,
        "electrical.supply.insulation_monitor.insulation_reading": Bound(
            "resistance",
            Limits("between 1 kΩ and 1000 TΩ", low=1e3, high=1e15),
            None,
            "an IT supply's insulation reads from tens of kΩ (a fault) to many MΩ; "
            "below 1 kΩ is a short circuit to earth",
        ),
        "electrical.bonding[].resistance": _BONDING,
        **{
            f"electrical.equipment[].{key}{condition}": _LEAKAGE
            for key in ("earth_leakage", "touch_current", "patient_leakage")
            for condition in ("", ".normal", ".single_fault")
        },
    }
)
LISTS_ELECTRICAL: dict[str, ListLimit] = {
    "electrical.bonding": ListLimit(
        500, "bonding readings", "one reading per bonded part of one theatre: some tens"
    ),
    "electrical.equipment": ListLimit(
        200, "devices", "the equipment in one patient environment: some tens"
    ),
    "electrical.cases": ListLimit(100, "cases", "one entry per case of one operating list"),
    "electrical.cases[].connected": ListLimit(
        50, "devices", "the equipment connected to one patient"
    ),
}

TEXT_LENGTH = 200
TEXT_REASON = "a name or label the worksheet prints on a line or two"

LISTS: dict[str, ListLimit] = {
    "floor.point_to_ground": ListLimit(
        1000, "readings", "a floor survey takes some tens of readings (EN 1081; to confirm)"
    ),
    "floor.point_to_point": ListLimit(
        1000, "readings", "a floor survey takes some tens of readings (EN 1081; to confirm)"
    ),
    "people": ListLimit(100, "groups of people", "one entry per role in one theatre"),
    "trolleys": ListLimit(100, "trolleys", "the trolleys and carts of one theatre"),
    "preparations": ListLimit(50, "preparations", "the skin preparations stocked in one room"),
    "preparations[].components": ListLimit(
        20, "components", "a skin preparation has a handful of volatile components"
    ),
    "materials": ListLimit(100, "materials", "the drapes, gowns and covers of one room"),
    "cases": ListLimit(100, "cases", "one operating list; a day holds some tens of cases"),
    "cases[].materials": ListLimit(50, "materials", "the materials at one operative site"),
    "cases[].ignition_sources": ListLimit(
        50, "ignition sources", "the devices used in one case (each named once)"
    ),
}

LISTS.update(LISTS_ELECTRICAL)

_INDEX = re.compile(r"\[\d+\]")


def pattern(path: str) -> str:
    """The table key of a key path: list indices become `[]`.

    >>> pattern("cases[2].drape_pocket.volume"), pattern("floor.point_to_ground[13]")
    ('cases[].drape_pocket.volume', 'floor.point_to_ground[]')
    """
    return _INDEX.sub("[]", path)


def bound_for(path: str) -> Bound:
    """The bound of the quantity at key path `path` (KeyError for a key without one)."""
    key = pattern(path)
    if key in BOUNDS:
        return BOUNDS[key]
    head, _, _ = key.rpartition(".")
    return BOUNDS[head + ".*"]


def list_limit(path: str) -> ListLimit | None:
    """The limit on the list at key path `path`, if it has one."""
    return LISTS.get(pattern(path))
