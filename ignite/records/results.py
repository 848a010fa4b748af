"""What `ignite` computes for one room, in SI units, and its JSON record.

The record's keys are a contract (see the project's room-file guide): keys may be
added, never renamed or dropped. Field names here follow the record's suffixes:
`_ohm`, `_V`, `_A`, `_C`, `_F`, `_J`, `_s`, `_K`, `_m3`, `_m3_per_s`, `_fraction`.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass, field
from typing import Any

SEVERITIES = ("high", "medium", "low", "note")
"""Severities, worst first."""


def severity_rank(severity: str) -> int:
    """0 for the worst severity (`high`), larger for milder ones."""
    return SEVERITIES.index(severity)


@dataclass(frozen=True)
class Amount:
    """A number with the unit it is expressed in (SI, as in the record)."""

    value: float | None
    unit: str


@dataclass(frozen=True)
class Finding:
    rule: str  # stable identifier from rules/
    title: str
    severity: str  # one of SEVERITIES
    subject: str  # what the finding is about: "floor", "scrub practitioner", "case 1", ...
    measured: Amount
    limit: Amount
    comparison: str  # how measured stands against limit, in words: "above", "at or below", ...
    source: str
    flag: str  # published | to confirm | common practice | assumption (rules/ may write memory)
    mitigations: tuple[str, ...] = ()
    detail: str = ""  # one sentence of explanation, already formatted
    # additions to the contract: what the two amounts are to the reader
    value_kind: str = "computed"  # measured (a reading taken) | planned | computed
    limit_kind: str = ""  # threshold (from rules/) | planned | computed | "" (no limit)


@dataclass(frozen=True)
class FloorResult:
    readings_ohm: tuple[float, ...]
    min_ohm: float
    max_ohm: float
    mean_ohm: float
    geometric_mean_ohm: float
    criteria: str
    window_low_ohm: float | None  # None: the window sets no lower limit
    window_high_ohm: float | None
    passed: bool
    shock_path_ohm: float  # lowest reading + body impedance, no footwear credit
    shock_current_A: float
    # additions to the contract
    test_voltage_V: float = 0.0
    readings_outside: tuple[int, ...] = ()  # indices of readings outside the window
    point_to_point_ohm: tuple[float, ...] = ()
    body_impedance_ohm: float = 0.0
    touch_voltage_V: float = 0.0
    supply_system: str = "earthed"
    shock_note: str = ""  # e.g. the isolated-supply (second fault) statement
    body_impedance_hand_to_hand_ohm: float = 0.0  # IEC 60479-1 table value before the path factor
    body_impedance_percentile_fraction: float = 0.0  # 0.05: the 5th percentile
    body_current_path: str = ""  # the path body_impedance_ohm holds, e.g. "hand to feet"
    body_path_factor_fraction: float = 0.0  # body_impedance_ohm / the hand-to-hand value


@dataclass(frozen=True)
class ChargeResult:
    """A person (role) or a trolley treated as a leaky charged capacitor."""

    kind: str  # "person" | "trolley"
    label: str  # role or name
    count: int
    footwear: str  # class name, "measured", or "" for trolleys
    leak_resistance_ohm: float
    capacitance_F: float
    time_constant_s: float
    body_voltage_V: float
    stored_charge_C: float
    spark_energy_J: float
    settle_time_s: float
    saturation_voltage_V: float = 0.0
    generation_limited: bool = True  # True: I_g*R set the voltage; False: saturation did
    spread: Spread | None = None  # over the samples, when the room is assessed with ranges


@dataclass(frozen=True)
class ComponentResult:
    name: str
    cas: str
    mole_fraction: float
    activity_coefficient: float
    flammable: bool


@dataclass(frozen=True)
class PreparationResult:
    id: str
    label: str
    flash_point_K: float | None
    lfl_fraction: float | None
    saturated_vapour_fraction: float | None
    film_temperature_K: float
    components: tuple[ComponentResult, ...] = ()
    methods: tuple[str, ...] = ()  # data methods and models named, e.g. "IEC 60079-20-1 (LFL)"
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class Triad:
    oxidant: bool
    fuel: bool
    ignition: bool

    @property
    def complete(self) -> bool:
        return self.oxidant and self.fuel and self.ignition


@dataclass(frozen=True)
class Band:
    """The 5th, 50th and 95th percentiles of one figure over the samples (SI units)."""

    p5: float
    p50: float
    p95: float


@dataclass(frozen=True)
class Driver:
    """An input and its Spearman rank correlation with a figure over the samples."""

    input: str  # a room-file key path (cases[0].prep.volume) or a rule entry id
    label: str  # as a reader names it
    rank_correlation: float  # -1 to 1
    measurable: bool = True  # False for a rule value (read the literature, not the room)


@dataclass(frozen=True)
class Spread:
    """A case's or a person's figures over the samples drawn from the ranges.

    bands: figure name (a record key, e.g. drying_time_s) -> percentiles; probabilities:
    name -> fraction of the samples; drivers: figure name -> inputs, strongest first;
    decisions: name -> the figure at the confidence percentile (drape_no_earlier_than_s,
    stop_oxygen_at_least_s), always rounded up to a sample.
    """

    samples: int
    bands: tuple[tuple[str, Band], ...] = ()
    probabilities: tuple[tuple[str, float], ...] = ()
    drivers: tuple[tuple[str, tuple[Driver, ...]], ...] = ()
    decisions: tuple[tuple[str, float], ...] = ()
    # chart bands: (x, p5, p95) along the nominal curve's x values
    oxygen_band: tuple[tuple[float, float, float], ...] = ()
    film_band: tuple[tuple[float, float, float], ...] = ()

    def band(self, name: str) -> Band | None:
        return dict(self.bands).get(name)

    def probability(self, name: str) -> float | None:
        return dict(self.probabilities).get(name)

    def decision(self, name: str) -> float | None:
        return dict(self.decisions).get(name)

    def drivers_of(self, name: str) -> tuple[Driver, ...]:
        return dict(self.drivers).get(name, ())

    def to_record(self) -> dict[str, Any]:
        return _clean(
            {
                "samples": self.samples,
                "percentiles": {name: asdict(band) for name, band in self.bands},
                "probabilities": dict(self.probabilities),
                "decisions": dict(self.decisions),
                "drivers": {
                    name: [asdict(driver) for driver in drivers] for name, drivers in self.drivers
                },
            }
        )


@dataclass(frozen=True)
class SpreadInput:
    """One uncertain input of a sampled run: a room-file range or a rule value's range."""

    input: str  # key path or rule entry id
    label: str
    kind: str  # uniform | normal | triangular
    text: str  # the range as written
    source: str = ""  # for a rule value
    flag: str = ""


@dataclass(frozen=True)
class SpreadSummary:
    """How the room's ranges were sampled: the record's top-level `uncertainty`."""

    samples: int
    seed: int
    confidence: float  # the percentile decisions are read at (0.95)
    probability_limit: float  # a probability at or above this is reported
    method: str
    sensitivity: str
    inputs: tuple[SpreadInput, ...]
    worst_probability: float | None = None  # the largest probability of any case
    worst_probability_of: str = ""  # which case and which probability


@dataclass(frozen=True)
class CaseResult:
    id: str
    procedure: str
    site: str
    oxidant_fraction: float  # steady state at the site while oxygen flows
    oxygen_enriched: bool
    washout_s: float  # after oxygen stops, to the enriched limit
    oxidant_at_activation_fraction: float
    mie_J: float | None  # lowest MIE of the fuels present, at that oxidant
    drying_time_s: float | None
    pocket_vapour_peak_fraction_of_lfl: float | None
    safe_draping_after_s: float | None
    materials_sustain_burning: tuple[str, ...]
    triad: Triad
    # additions to the contract
    mie_fuel: str = ""  # which fuel sets mie_J
    buildup_s: float | None = None  # time to reach the enriched limit after oxygen starts
    required_stop_s: float | None = None  # oxygen stop before activation to reach the limit
    largest_spark_J: float | None = None
    materials_holding_charge: tuple[str, ...] = ()
    ignition_sources: tuple[str, ...] = ()
    draping_after_s: float | None = None
    first_activation_after_s: float | None = None
    stop_before_activation_s: float | None = None
    delivery: str = ""  # oxygen delivery: none | nasal-cannula | face-mask | closed-airway
    ceiling_stop_s: float | None = (
        None  # oxygen stop that brings the site to the open-delivery ceiling
    )
    preparation: str = ""  # id of the prep used
    prep_flammable: bool = False  # the prep has a flammable component
    hair: bool = False
    pooling: bool = False
    flammable_left_at_draping_fraction: float | None = None
    flammable_left_at_activation_fraction: float | None = None
    pocket_at_activation_fraction_of_lfl: float | None = None
    oxygen_curve: tuple[tuple[float, float], ...] = ()  # (s after oxygen stops, oxidant fraction)
    film_curve: tuple[tuple[float, float], ...] = ()  # (s, flammable liquid left, fraction)
    notes: tuple[str, ...] = ()
    # the film's heat balance and mass transfer (from the end of prepping until dry)
    film_temperature_min_K: float | None = None  # coldest film temperature until dry
    mass_transfer_regime: str = ""  # forced | natural | mixed | diffusion-limited, open air
    mass_transfer_regime_under_drapes: str = ""  # the same once draped ('' if dry by then)
    open_air_drying_time_s: float | None = None  # drying time if the site stayed uncovered
    # for the plan's timeline: the pocket over time and the limits the actions use
    pocket_curve: tuple[tuple[float, float], ...] = ()  # (s, pocket vapour / LFL) as planned
    pocket_margin_fraction_of_lfl: float | None = None  # rules: the pocket stays below this
    label_minimum_s: float | None = None  # the label's drying time on hairless skin
    spread: Spread | None = None  # over the samples, when the room is assessed with ranges


@dataclass(frozen=True)
class RoomInfo:
    id: str
    name: str
    purpose: str
    assessed_on: str  # ISO date
    assessor: str


@dataclass(frozen=True)
class EnvironmentResult:
    temperature_K: float
    relative_humidity_fraction: float
    air_changes_per_s: float
    volume_m3: float
    mains_voltage_V: float
    mains_frequency_Hz: float
    mains_system: str
    room_oxidant_rise_fraction: float = 0.0  # whole-room enrichment from open delivery


@dataclass(frozen=True)
class SupplyResult:
    """The supply of the patient environment and its insulation monitor, against the limit."""

    system: str  # isolated | earthed
    transformer_rating_VA: float | None
    imd_alarm_setting_ohm: float | None
    imd_tested_alarm_at_ohm: float | None
    insulation_reading_ohm: float | None
    imd_alarm_min_ohm: float | None  # the lowest alarm setting allowed (isolated supplies)


@dataclass(frozen=True)
class BondingResult:
    point: str
    kind: str  # exposed | extraneous
    resistance_ohm: float
    above_limit: bool
    # the current through this conductor whose touch voltage drives the microshock limit
    # through a direct cardiac path (null for a 0 Ω reading: no such current)
    fault_current_for_microshock_A: float
    touch_voltage_per_ampere_V: float = 0.0  # the touch voltage of 1 A through it (= R)


@dataclass(frozen=True)
class LeakageReading:
    quantity: str  # earth_leakage | touch_current | patient_leakage
    condition: str  # normal | single_fault
    measured_A: float
    limit_A: float | None  # None: no limit for this test and type
    limit_rule: str  # the rule entry of the limit ("" when none)
    above_limit: bool


@dataclass(frozen=True)
class EquipmentResult:
    id: str
    kind: str
    protection_class: str  # I | II | internal
    applied_part: str  # B | BF | CF | none
    test: str  # type | recurrent
    readings: tuple[LeakageReading, ...] = ()


@dataclass(frozen=True)
class CardiacCaseResult:
    """The current that can reach a patient's heart, summed in phase (the worst case)."""

    case: str  # case id
    procedure: str
    cardiac_path: str  # central-line | pacing-wires | none
    connected: tuple[str, ...]  # equipment ids
    non_cf_connected: tuple[str, ...]  # B or BF devices on a patient with a direct cardiac path
    patient_leakage_normal_A: float  # Σ of the connected devices, normal condition
    patient_leakage_single_fault_A: float  # the same with the worst one device in single fault
    counted_at_limit: tuple[str, ...]  # devices without a reading, counted at their limit
    bonding_resistance_ohm: float  # the worst bonding reading (or the limit, when none given)
    touch_voltage_V: float  # Σ earth leakage of the connected devices across that conductor
    touch_cardiac_current_A: float  # that touch voltage across the cardiac path's impedance
    cardiac_current_normal_A: float | None  # None: no direct cardiac path
    cardiac_current_single_fault_A: float | None
    largest_device: str = ""  # the device with the largest patient leakage
    largest_device_A: float = 0.0
    worst_fault_device: str = ""  # the device whose single fault gives the largest sum
    worst_fault_device_A: float = 0.0  # its current in that fault


@dataclass(frozen=True)
class ElectricalResult:
    """The patient environment's electrical safety (rooms with an `electrical` section)."""

    supply: SupplyResult | None
    bonding_limit_ohm: float
    bonding: tuple[BondingResult, ...]
    equipment: tuple[EquipmentResult, ...]
    cases: tuple[CardiacCaseResult, ...]
    microshock_limit_A: float
    microshock_single_fault_limit_A: float
    cardiac_path_impedance_ohm: float
    caution: str = ""  # the electrical caution, beside the figures


@dataclass(frozen=True)
class Results:
    tool_version: str
    input_sha256: str
    input_name: str  # file name of the room file
    rules_digest: str  # SHA-256 over the rule files in force
    room: RoomInfo
    environment: EnvironmentResult
    floor: FloorResult
    people: tuple[ChargeResult, ...]
    trolleys: tuple[ChargeResult, ...]
    preparations: tuple[PreparationResult, ...]
    cases: tuple[CaseResult, ...]
    findings: tuple[Finding, ...] = ()
    warnings: tuple[str, ...] = ()  # accepted but unusual input, stated on every output
    lowest_site_mie_J: float | None = None
    lowest_site_mie_fuel: str = ""  # the fuel (and where) that sets lowest_site_mie_J
    largest_spark_J: float | None = None
    # thresholds in force, from rules/: required, so a value can never come from here
    no_spark_voltage_V: float = field(kw_only=True)
    oxygen_enriched_limit_fraction: float = field(kw_only=True)
    # chart data: per person/trolley label, (RH fraction, body voltage V) at the room's leak path
    voltage_vs_rh: tuple[tuple[str, tuple[tuple[float, float], ...]], ...] = ()
    electrical: ElectricalResult | None = None  # rooms with an `electrical` section
    uncertainty: SpreadSummary | None = None  # how the ranges were sampled, when they were

    def worst_severity(self) -> str | None:
        if not self.findings:
            return None
        return min((f.severity for f in self.findings), key=severity_rank)

    def to_record(self) -> dict[str, Any]:
        """The JSON result record of the contract (plus optional additions).

        Always valid JSON: a figure that does not exist (a pocket that never clears, an
        infinite time) is null, with its reason in a `<name>_note` key beside it.
        """
        record = _clean(
            {
                "format": 1,
                "tool_version": self.tool_version,
                "input_sha256": self.input_sha256,
                "rules_sha256": self.rules_digest,
                "room": asdict(self.room),
                "environment": asdict(self.environment),
                "floor": _clean(asdict(self.floor)),
                "people": [_charge_record(p, "role") for p in self.people],
                "trolleys": [_charge_record(t, "name") for t in self.trolleys],
                "preparations": [_clean(asdict(p)) for p in self.preparations],
                "cases": [_case_record(c) for c in self.cases],
                "findings": [_clean(asdict(f)) for f in self.findings],
                "warnings": list(self.warnings),
            }
        )
        if self.electrical is not None:  # an addition: only rooms with an electrical section
            record["electrical"] = _clean(asdict(self.electrical))
        if self.uncertainty is not None:
            record["uncertainty"] = _clean(asdict(self.uncertainty))
        return record


def _charge_record(charge: ChargeResult, label_key: str) -> dict[str, Any]:
    record = _clean(asdict(charge))
    record[label_key] = record.pop("label")
    _spread_record(record, charge.spread)
    return record


def _case_record(case: CaseResult) -> dict[str, Any]:
    record = _clean(asdict(case))
    record["materials_sustain_burning"] = list(case.materials_sustain_burning)
    _spread_record(record, case.spread)
    return record


def _spread_record(record: dict[str, Any], spread: Spread | None) -> None:
    """The optional `uncertainty` key: absent (not null) when nothing was sampled, so a
    record without ranges is byte for byte what it was."""
    record.pop("spread")
    if spread is not None:
        record["uncertainty"] = spread.to_record()


# Why a figure has no finite value, by record key; `_clean` puts it beside the null.
_NO_VALUE_REASONS: dict[str, str] = {
    "washout_s": "never: the pocket does not fall back to the oxygen-enriched limit",
    "required_stop_s": "never: no oxygen stop brings the site to the oxygen-enriched limit",
    "ceiling_stop_s": "never: no oxygen stop brings the site to the open-delivery ceiling",
    "buildup_s": "never: the site does not reach the oxygen-enriched limit",
    "drying_time_s": "never: the flammable part of the prep does not evaporate in the time "
    "modelled",
    "safe_draping_after_s": "never: the drape pocket does not stay below the limit",
    "open_air_drying_time_s": "never: the flammable part of the prep does not evaporate in "
    "the time modelled",
    "settle_time_s": "never: the voltage does not fall below the no-spark voltage",
    "fault_current_for_microshock_A": "none: a conductor of 0 Ω lifts the part by no voltage",
}
_UNIT_SUFFIXES = (
    "_fraction_of_lfl",
    "_m3_per_s",
    "_fraction",
    "_per_s",
    "_ohm",
    "_m3",
    "_Hz",
    "_VA",
    "_V",
    "_A",
    "_C",
    "_F",
    "_J",
    "_K",
    "_s",
)


def _note_key(key: str, record: dict[str, Any]) -> str:
    """The key beside `key` that says why its value is null: washout_s -> washout_note."""
    if key == "value":
        stem = ""
    else:
        stem = next((key[: -len(s)] for s in _UNIT_SUFFIXES if key.endswith(s)), key) + "_"
    note = f"{stem}note"
    return note if note not in record else f"{key}_note"


def _no_value_reason(key: str, value: float) -> str:
    if key in _NO_VALUE_REASONS and value > 0:
        return _NO_VALUE_REASONS[key]
    if math.isnan(value):
        return "not defined for these inputs"
    return "without bound in the model (infinite)"


def _clean(value: Any, key: str = "") -> Any:
    """Plain, valid JSON: tuples to lists, and no NaN or infinity, recursively.

    A non-finite number becomes None; in a mapping, a `<name>_note` key beside it
    says why (a finding's measured value gets `note`).

    >>> _clean({"washout_s": math.inf, "curve": ((0.0, math.nan),)})
    {'washout_s': None, 'washout_note': 'never: the pocket does not fall back to the \
oxygen-enriched limit', 'curve': [[0.0, None]]}
    """
    if isinstance(value, dict):
        cleaned: dict[str, Any] = {}
        for name, item in value.items():
            cleaned[name] = _clean(item, name)
            if isinstance(item, float) and not math.isfinite(item):
                if name == "value" and value.get("unit") == "s" and item > 0:
                    reason = "never: the time is infinite in the model"
                else:
                    reason = _no_value_reason(name, item)
                cleaned[_note_key(name, value)] = reason
        return cleaned
    if isinstance(value, (list, tuple)):
        return [_clean(v, key) for v in value]
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


@dataclass
class RunOutcome:
    """What one room produced: results, or the problems that stopped it."""

    path: str
    results: Results | None = None
    problems: list[str] = field(default_factory=list)


@dataclass(frozen=True)
class RuleRow:
    """One line of the rules appendix: the same fields `ignite rules` prints."""

    id: str
    kind: str  # parameters | curves | windows | footwear | fuels | materials | ignition-sources | checks
    title: str
    threshold: str  # the value(s), formatted with units
    source: str
    flag: str


@dataclass(frozen=True)
class MethodRef:
    """A method used in the calculations, with its published reference."""

    name: str
    reference: str
