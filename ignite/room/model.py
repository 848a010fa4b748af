"""The room file as validated data: frozen dataclasses holding SI floats.

Every field here was parsed from a string with a unit and range-checked by
`ignite.room.load`; nothing downstream converts units again. Percentages are fractions,
temperatures kelvin, times seconds, volumes m³, flows m³/s, resistances Ω.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

from ignite.room.ranges import Distribution


@dataclass(frozen=True)
class Mains:
    voltage: float  # V
    frequency: float  # Hz
    system: str  # "isolated" | "earthed"


@dataclass(frozen=True)
class RoomHeader:
    id: str
    name: str
    purpose: str  # pre-list | recommissioning | periodic-audit
    assessed_on: str  # ISO date
    assessor: str
    mains: Mains


@dataclass(frozen=True)
class Environment:
    temperature: float  # K
    relative_humidity: float  # fraction 0-1
    air_changes: float  # 1/s
    volume: float  # m^3


@dataclass(frozen=True)
class Floor:
    finish: str
    criteria: str  # a window id from rules/
    test_voltage: float  # V
    point_to_ground: tuple[float, ...]  # Ω
    point_to_point: tuple[float, ...] = ()  # Ω


@dataclass(frozen=True)
class Footwear:
    """A footwear class from rules/, or a measured resistance through the soles."""

    cls: str | None  # conductive | esd | antistatic | insulating, or None when measured
    resistance: float | None  # Ω, when measured


@dataclass(frozen=True)
class Person:
    role: str
    count: int
    footwear: Footwear
    capacitance: float | None  # F; None: the default from rules/


@dataclass(frozen=True)
class Trolley:
    name: str
    capacitance: float  # F
    path_to_floor: float  # Ω


@dataclass(frozen=True)
class Preparation:
    id: str
    label: str
    basis: str  # "volume" | "mass"
    components: tuple[tuple[str, float], ...]  # (name or CAS, fraction 0-1), file order


@dataclass(frozen=True)
class Oxygen:
    delivery: str  # none | nasal-cannula | face-mask | closed-airway
    flow: float  # m^3/s
    fraction: float  # O2 fraction of the delivered gas, 0-1
    nitrous_oxide_flow: float  # m^3/s
    stop_before_activation: float  # s


@dataclass(frozen=True)
class DrapePocket:
    volume: float  # m^3
    exchange: float  # m^3/s


@dataclass(frozen=True)
class Prep:
    preparation: str  # id of a Preparation
    volume: float  # m^3 of liquid applied
    area: float  # m^2
    hair: bool
    pooling: bool
    skin_temperature: float | None  # K; None: default from rules/


@dataclass(frozen=True)
class Case:
    id: str
    procedure: str
    site: str  # head-neck | chest | abdomen | pelvis | limb | back
    oxygen: Oxygen
    drape_pocket: DrapePocket
    prep: Prep | None
    air_speed: float  # m/s
    draping_after: float  # s
    first_activation_after: float  # s
    materials: tuple[str, ...]
    ignition_sources: tuple[str, ...]


@dataclass(frozen=True)
class Leakage:
    """A leakage or touch current as measured, in normal and single-fault condition (A)."""

    normal: float | None
    single_fault: float | None


@dataclass(frozen=True)
class InsulationMonitor:
    """The insulation monitor of an isolated (IT) supply: its setting and test readings (Ω)."""

    alarm_setting: float
    tested_alarm_at: float | None  # the insulation resistance at which it alarmed on test
    insulation_reading: float | None  # the supply's insulation resistance as read


@dataclass(frozen=True)
class Supply:
    system: str  # "isolated" | "earthed"
    transformer_rating: float | None  # VA (W), isolating transformer
    insulation_monitor: InsulationMonitor | None


@dataclass(frozen=True)
class BondingPoint:
    point: str
    kind: str  # "exposed" | "extraneous" conductive part
    resistance: float  # Ω to the equipotential bonding bar


@dataclass(frozen=True)
class Equipment:
    id: str
    kind: str
    protection_class: str  # "I" | "II" | "internal"
    applied_part: str  # "B" | "BF" | "CF" | "none"
    test: str  # "type" (IEC 60601-1) | "recurrent" (IEC 62353)
    earth_leakage: Leakage
    touch_current: Leakage
    patient_leakage: Leakage


@dataclass(frozen=True)
class CardiacCase:
    """A case's conductive paths to the patient's heart and the equipment connected to them."""

    case: str  # a case id
    cardiac_path: str  # "central-line" | "pacing-wires" | "none"
    connected: tuple[str, ...]  # equipment ids


@dataclass(frozen=True)
class Electrical:
    """The patient environment's electrical safety (the optional `electrical` section)."""

    supply: Supply | None = None
    bonding: tuple[BondingPoint, ...] = ()
    equipment: tuple[Equipment, ...] = ()
    cases: tuple[CardiacCase, ...] = ()


@dataclass(frozen=True)
class Room:
    path: str  # the file it came from
    sha256: str  # of the file's bytes
    text: str  # the file as read, for the worksheet's appendix
    format: int
    room: RoomHeader
    environment: Environment
    floor: Floor
    people: tuple[Person, ...] = ()
    trolleys: tuple[Trolley, ...] = ()
    preparations: tuple[Preparation, ...] = ()
    materials: tuple[str, ...] = ()
    cases: tuple[Case, ...] = ()
    warnings: tuple[str, ...] = field(default=())
    electrical: Electrical | None = None  # None: the file has no `electrical` section
    # key path -> spread, for each quantity given as a range (its field holds the central value)
    ranges: tuple[tuple[str, Distribution], ...] = ()


@dataclass(frozen=True)
class Vocabulary:
    """Names the room file may use that are defined in rules/ (lower-case for matching)."""

    floor_criteria: frozenset[str] = frozenset()
    footwear_classes: frozenset[str] = frozenset()
    materials: frozenset[str] = frozenset()  # every material name and alias, lower-cased
    ignition_sources: frozenset[str] = frozenset()  # every source name and alias, lower-cased
    # given a substance name or CAS number: None when known, else what is wrong with it
    substance_check: Callable[[str], str | None] | None = None
