"""The rules bound to one room: typed, frozen records of every rule value the room needs.

`ignite.rules.bind.bind(room, book)` builds a `Bound` once per room. Everything downstream
(the simulations, the findings, the text, the JSON record and the worksheet) reads these
records and never the rule book: values are SI floats, and `consulted` holds the id of
every rule entry that was read, so the worksheet's appendix lists exactly those.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from ignite.room.ranges import Distribution


@dataclass(frozen=True)
class SourcedValue:
    """A threshold with where it comes from (`flag`: published, to confirm, common practice, assumption)."""

    value: float
    source: str
    flag: str


@dataclass(frozen=True)
class FloorWindow:
    """The floor criteria in force, with the lower limit set for the room's supply voltage."""

    id: str
    title: str
    low: SourcedValue | None
    high: SourcedValue | None
    low_inclusive: bool
    high_inclusive: bool
    mean_low: SourcedValue | None
    mean_min_readings: int
    system_high: SourcedValue | None
    walking_voltage_high: SourcedValue | None

    def limit(self, name: str) -> SourcedValue | None:
        """A limit by its field name in rules/floor.yaml (low, high, mean_low, ...)."""
        found: SourcedValue | None = {
            "low": self.low,
            "high": self.high,
            "mean_low": self.mean_low,
            "system_high": self.system_high,
            "walking_voltage_high": self.walking_voltage_high,
        }.get(name)
        return found


@dataclass(frozen=True)
class ShockModel:
    """IEC 60479-1 body impedance against touch voltage, and the let-go threshold.

    The table is hand to hand at one percentile; the shock path of a person standing on
    the floor is hand to feet, `path_factor` times the hand-to-hand value.
    """

    body_impedance: tuple[tuple[float, float], ...]  # (V, Ω), hand to hand
    let_go: float  # A
    percentile: float  # fraction of the population with a lower impedance (0.05: the 5th)
    path: str  # the current path the shock current is computed for ("hand to feet")
    path_factor: float  # impedance on `path` as a fraction of hand to hand
    curve_id: str  # the rule entry of the table


@dataclass(frozen=True)
class ChargeModel:
    """What the leaky-capacitor charging model needs."""

    generation_current: float  # A
    no_spark_voltage: float  # V
    default_capacitance: float  # F, a person without a measured capacitance
    saturation_curve_id: str
    saturation_points: tuple[tuple[float, float], ...]  # (RH fraction, V)


@dataclass(frozen=True)
class FootwearClass:
    id: str
    resistance: float  # Ω through the soles


@dataclass(frozen=True)
class Fuel:
    """A fuel's MIE against oxidant: MIE(x) = mie_air·(x/x_air)^(−exponent), bounded by mie_oxygen."""

    id: str
    title: str
    cas: str
    mie_air: float  # J
    exponent: float
    mie_oxygen: float | None  # J


@dataclass(frozen=True)
class Material:
    id: str
    title: str
    loi: float  # fraction
    holds_charge_below_rh: float  # fraction


@dataclass(frozen=True)
class OxygenModel:
    ambient: float  # oxidant fraction of room air
    enriched_limit: float  # fraction above which the atmosphere is oxygen-enriched
    open_delivery_ceiling: float  # fraction


@dataclass(frozen=True)
class PrepAssumptions:
    """The film-evaporation model's assumptions and tabulated data (rules/preparations.yaml)."""

    dry_fraction: float  # of the applied flammable liquid, below which the film counts as dry
    pocket_margin: float  # fraction of the LFL the drape pocket must stay below
    under_drape_air_speed: float  # m/s
    hair_still_layer: float  # m
    hair_exposed_fraction: float
    pooling_volume_fraction: float
    pooling_area_fraction: float
    diffusivity_reference_temperature: float  # K
    diffusivities: Mapping[str, float]  # CAS -> m²/s at the reference temperature
    skin_temperature_default: float  # K, when a case gives none
    label_minimum_hairless: float | None  # s, the label's drying time on hairless skin
    label_maximum_hair: float | None  # s, the label's longest drying time in hair
    tissue_conductance: float  # W/(m²·K), from tissue at the skin temperature to the film
    film_emissivity: float  # of the liquid film, against surroundings at the room's air temperature


@dataclass(frozen=True)
class RuleValue:
    """A rule value with the id of its entry, for a figure a finding names its rule for."""

    id: str
    value: float
    source: str
    flag: str


@dataclass(frozen=True)
class ElectricalRules:
    """The patient environment's limits (rules/electrical.yaml), for rooms with an
    `electrical` section.

    `leakage` maps (test, quantity, condition, selector) to its limit: test "type" or
    "recurrent"; quantity earth_leakage, touch_current or patient_leakage; condition
    "normal" or "single_fault"; selector the applied part (B, BF, CF) for patient leakage,
    the protection class (I, II, internal) for a recurrent earth leakage, else "".
    """

    bonding_max: RuleValue  # Ω
    imd_alarm_min: RuleValue  # Ω
    leakage: Mapping[tuple[str, str, str, str], RuleValue]  # A
    microshock_limit: RuleValue  # A, normal condition
    microshock_single_fault_limit: RuleValue  # A
    path_impedance: RuleValue  # Ω, of a direct cardiac path


def leakage_selector(quantity: str, test: str, applied_part: str, protection_class: str) -> str:
    """The last part of a `LEAKAGE_LIMITS` key for a device's reading."""
    if quantity == "patient_leakage":
        return applied_part
    if quantity == "earth_leakage" and test == "recurrent":
        return protection_class
    return ""


@dataclass(frozen=True)
class BoundLimit:
    """A check's limit, resolved: a number with its provenance, or another result by name.

    `value` is None when the limit does not apply to this room (a window without that field).
    `inclusive_outside` says whether equality with a window limit lies outside the window
    (None for plain comparisons, which follow the check's test).
    """

    value: float | None = None
    source: str = ""
    flag: str = ""
    result: str = ""  # the result name when the limit is another result, matched per subject
    inclusive_outside: bool | None = None


@dataclass(frozen=True)
class BoundCheck:
    id: str
    title: str
    reads: str
    test: str  # above | at-or-above | below | at-or-below | is-true
    limit: BoundLimit | None
    severity: str
    group: str
    detail: str
    mitigations: tuple[str, ...]
    source: str
    flag: str


@dataclass(frozen=True)
class RuleSpread:
    """A rule value's range (rules/ranges.yaml): which entry and field it varies, and how."""

    id: str  # the ranges entry
    title: str
    varies: str  # the entry whose value is uncertain (a fuel, a prep.* parameter, a curve)
    field: str  # value | mie_air | exponent | points (a factor on the curve's y values)
    distribution: Distribution
    source: str
    flag: str


@dataclass(frozen=True)
class UncertaintyModel:
    """How samples become decisions: the percentile waits are read at, the probability
    at or above which a hazard is reported (rules/uncertainty.yaml)."""

    confidence: SourcedValue
    probability_limit: SourcedValue


@dataclass(frozen=True)
class Bound:
    """Every rule value one room needs, and the ids of the entries consulted."""

    rules_digest: str
    window: FloorWindow
    shock: ShockModel
    charge: ChargeModel
    footwear: tuple[FootwearClass, ...]  # every class, lowest resistance first
    oxygen: OxygenModel
    loi_allowance: float  # fraction: a material burns where oxidant > LOI − allowance
    materials: Mapping[str, Material]  # lower-cased name as the room writes it -> material
    sites_near_airway: Mapping[str, bool]  # a case's site -> open oxygen reaches its drape pocket
    fuels: Mapping[str, tuple[Fuel, ...]]  # preparation id -> fuels among its components
    prep: PrepAssumptions | None  # None when the room stocks no preparation
    checks: tuple[BoundCheck, ...]
    consulted: frozenset[str]
    electrical: ElectricalRules | None = None  # None: the room has no `electrical` section
    # only when the room is assessed with ranges: the rule values' ranges, and the settings
    spreads: tuple[RuleSpread, ...] = ()
    uncertainty: UncertaintyModel | None = None

    def footwear_resistance(self, cls: str) -> float:
        """Sole resistance of a footwear class."""
        for item in self.footwear:
            if item.id == cls:
                return item.resistance
        raise KeyError(cls)
