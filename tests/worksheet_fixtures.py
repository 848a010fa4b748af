"""Hand-built `Results` for the worksheet and formatting tests.

`full_results()` is an invented theatre with a long list: a floor with readings on both
sides of its window (one just above the upper limit), three kinds of people, a trolley,
two preparations, four cases (one with no oxygen curve, to test that a chart is skipped)
and findings of every severity. `empty_results()` is a floor-only audit with nothing
found. The numbers are plausible, worked out roughly with the project's formulas, but
nothing here is a reference value: the worksheet tests check layout and wording, the
physics tests check the physics.
"""

from __future__ import annotations

import hashlib
import itertools
import math

from ignite.records.results import (
    Amount,
    CaseResult,
    ChargeResult,
    ComponentResult,
    EnvironmentResult,
    Finding,
    FloorResult,
    MethodRef,
    PreparationResult,
    Results,
    RoomInfo,
    RuleRow,
    Triad,
)
from ignite.wording.numbers import format_duration, format_si

GENERATION_CURRENT = 0.1e-6  # A
NO_SPARK = 330.0  # V
ENRICHED_LIMIT = 0.235  # oxygen fraction above which the air is enriched (NFPA 99, published)
RH_NOW = 0.28
# (RH, V) walking on vinyl, the shape of the humidity table the rules carry.
SATURATION = ((0.10, 12e3), (0.40, 5e3), (0.55, 3e3))

FULL_ROOM_FILE = """\
format: 1
room:
  id: T2
  name: Theatre 2, Ashcombe Vale Community Hospital
  purpose: pre-list
  assessed_on: 2026-11-16
  assessor: M. Adeyemi, theatre safety lead
  mains:
    voltage: 230 V
    frequency: 50 Hz
    system: isolated
environment:
  temperature: 20 degC
  relative_humidity: 28 %
  air_changes: 20 /h
  volume: 150 m^3
floor:
  finish: static-dissipative vinyl sheet
  criteria: medical-location
  test_voltage: 500 V
  point_to_ground: [180 kΩ, 240 kΩ, 47 kΩ, 1.3 MΩ, 410 kΩ, 25.04 MΩ, 8.2 MΩ, 2.2 MΩ, 95 kΩ, 640 kΩ]
  point_to_point: [320 kΩ, 410 kΩ]
people:
  - role: scrub practitioner
    count: 2
    footwear: antistatic
  - role: circulating nurse
    count: 1
    footwear: insulating
  - role: anaesthetist
    count: 1
    footwear: 3.28 GΩ
trolleys:
  - name: instrument trolley
    capacitance: 100 pF
    path_to_floor: 50 MΩ
preparations:
  - id: chg-ipa
    label: 2 % chlorhexidine in 70 % isopropanol
    basis: volume
    components:
      isopropanol: 70 %
      water: 30 %
  - id: pvi-eth
    label: povidone-iodine in 72 % ethanol
    basis: volume
    components:
      ethanol: 72 %
      water: 28 %
materials:
  - nonwoven polypropylene
  - cotton
  - polyester gown
cases:
  - id: 1
    procedure: excision of a facial lesion under sedation
    site: head-neck
    oxygen:
      delivery: nasal-cannula
      flow: 4 L/min
      fraction: 100 %
      nitrous_oxide_flow: 0 L/min
      stop_before_activation: 60 s
    drape_pocket:
      volume: 30 L
      exchange: 10 L/min
    prep:
      preparation: chg-ipa
      volume: 10 mL
      area: 400 cm^2
      hair: false
      pooling: false
    air_speed: 0.2 m/s
    draping_after: 3 min
    first_activation_after: 6 min
    materials: [nonwoven polypropylene, cotton]
    ignition_sources: [monopolar electrosurgery, fibre-optic light cable]
  - id: 2
    procedure: carpal tunnel release under regional block
    site: limb
    oxygen:
      delivery: none
    drape_pocket:
      volume: 20 L
      exchange: 15 L/min
    prep:
      preparation: chg-ipa
      volume: 6 mL
      area: 300 cm^2
      hair: false
      pooling: false
    air_speed: 0.2 m/s
    draping_after: 4 min
    first_activation_after: 10 min
    materials: [cotton]
    ignition_sources: [bipolar electrosurgery]
  - id: 3
    procedure: laparoscopic cholecystectomy
    site: abdomen
    oxygen:
      delivery: closed-airway
    drape_pocket:
      volume: 40 L
      exchange: 20 L/min
    prep:
      preparation: pvi-eth
      volume: 20 mL
      area: 900 cm^2
      hair: false
      pooling: true
    air_speed: 0.1 m/s
    draping_after: 3 min
    first_activation_after: 8 min
    materials: [nonwoven polypropylene, polyester gown]
    ignition_sources: [monopolar electrosurgery]
  - id: 4
    procedure: tracheostomy under local anaesthesia
    site: head-neck
    oxygen:
      delivery: face-mask
      flow: 10 L/min
      fraction: 100 %
      nitrous_oxide_flow: 0 L/min
      stop_before_activation: 2 min
    drape_pocket:
      volume: 25 L
      exchange: 12 L/min
    prep:
      preparation: pvi-eth
      volume: 15 mL
      area: 350 cm^2
      hair: true
      pooling: false
    air_speed: 0.1 m/s
    draping_after: 3 min
    first_activation_after: 7 min
    materials: [nonwoven polypropylene, cotton, polyester gown]
    ignition_sources: [monopolar electrosurgery, bipolar electrosurgery]
"""

EMPTY_ROOM_FILE = """\
format: 1
room:
  id: R7
  name: Recovery bay 7, Tilbury Fen Day Unit
  purpose: periodic-audit
  assessed_on: 2026-10-02
  assessor: J. Lindqvist, estates electrical engineer
  mains:
    voltage: 230 V
    frequency: 50 Hz
    system: earthed
environment:
  temperature: 21 degC
  relative_humidity: 45 %
  air_changes: 15 /h
  volume: 60 m^3
floor:
  finish: conductive rubber tiles
  criteria: medical-location
  test_voltage: 500 V
  point_to_ground: [420 kΩ, 650 kΩ, 1.1 MΩ, 780 kΩ, 900 kΩ]
cases: []
"""


def sha256(text: str) -> str:
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


RULES_DIGEST = sha256("rules as fixed for the worksheet tests")


def _saturation(rh: float) -> float:
    """Log-linear between the table's points, clamped at its ends."""
    if rh <= SATURATION[0][0]:
        return SATURATION[0][1]
    for (r0, v0), (r1, v1) in itertools.pairwise(SATURATION):
        if rh <= r1:
            f = (rh - r0) / (r1 - r0)
            return math.exp(math.log(v0) + f * (math.log(v1) - math.log(v0)))
    return SATURATION[-1][1]


def _charge(
    kind: str, label: str, count: int, footwear: str, leak: float, cap: float
) -> ChargeResult:
    generated = GENERATION_CURRENT * leak
    saturation = _saturation(RH_NOW)
    voltage = min(generated, saturation)
    tau = leak * cap
    return ChargeResult(
        kind=kind,
        label=label,
        count=count,
        footwear=footwear,
        leak_resistance_ohm=leak,
        capacitance_F=cap,
        time_constant_s=tau,
        body_voltage_V=voltage,
        stored_charge_C=cap * voltage,
        spark_energy_J=0.5 * cap * voltage**2,
        settle_time_s=tau * math.log(voltage / NO_SPARK) if voltage > NO_SPARK else 0.0,
        saturation_voltage_V=saturation,
        generation_limited=generated <= saturation,
    )


def _voltage_curve(charge: ChargeResult) -> tuple[tuple[float, float], ...]:
    rhs = [0.10 + 0.05 * i for i in range(13)]
    return tuple(
        (rh, min(GENERATION_CURRENT * charge.leak_resistance_ohm, _saturation(rh))) for rh in rhs
    )


def _oxygen_curve(
    c_ss: float, volume: float, exchange: float, end: float
) -> tuple[tuple[float, float], ...]:
    """Well-mixed pocket after the oxygen stops: 0.209 + (C0 - 0.209)·exp(-Q·t/V)."""
    return tuple(
        (t, 0.209 + (c_ss - 0.209) * math.exp(-exchange * t / volume))
        for t in (end * i / 60 for i in range(61))
    )


def _film_curve(tau: float, end: float) -> tuple[tuple[float, float], ...]:
    return tuple((t, math.exp(-t / tau)) for t in (end * i / 80 for i in range(81)))


def _washout(c0: float, volume: float, exchange: float, target: float = ENRICHED_LIMIT) -> float:
    if c0 <= target:
        return 0.0
    return volume / exchange * math.log((c0 - 0.209) / (target - 0.209))


def _after(c0: float, t: float, volume: float, exchange: float) -> float:
    return 0.209 + (c0 - 0.209) * math.exp(-exchange * t / volume)


def _mie(mie_air: float, x: float) -> float:
    return mie_air * (x / 0.209) ** -3


def _floor(
    readings: tuple[float, ...], outside: tuple[int, ...], system: str, note: str
) -> FloorResult:
    body = 1000.0
    lowest = min(readings)
    return FloorResult(
        readings_ohm=readings,
        min_ohm=lowest,
        max_ohm=max(readings),
        mean_ohm=sum(readings) / len(readings),
        geometric_mean_ohm=math.exp(sum(math.log(r) for r in readings) / len(readings)),
        criteria="medical-location",
        window_low_ohm=50e3,
        window_high_ohm=25e6,
        passed=not outside,
        shock_path_ohm=lowest + body,
        shock_current_A=230.0 / (lowest + body),
        test_voltage_V=500.0,
        readings_outside=outside,
        point_to_point_ohm=(320e3, 410e3) if outside else (),
        body_impedance_ohm=body,
        touch_voltage_V=230.0,
        supply_system=system,
        shock_note=note,
    )


def _rules() -> tuple[RuleRow, ...]:
    rows = [
        RuleRow(
            "medical-location",
            "windows",
            "Medical location floor (IEC 60364-7-710)",
            "> 50 kΩ (≤ 500 V supply), > 100 kΩ (≤ 1000 V); ≤ 25 MΩ",
            "IEC 60364-7-710 as adopted in NEK 400:710 (Norway)",
            "published",
        ),
        RuleRow(
            "conductive-historical",
            "windows",
            "Conductive floor, historical rule",
            "> 5 kΩ (≤ 130 V), > 10 kΩ (≤ 480 V); < 1 MΩ; mean > 25 kΩ",
            "NFPA 99 (editions up to 2005), reproduced in US DOE-HDBK-1092-98 §5.1.4.5",
            "published",
        ),
        RuleRow(
            "esd-control",
            "windows",
            "ESD-control floor (person + footwear + floor)",
            "< 1 GΩ; walking body voltage < 100 V",
            "IEC 61340-5-1; ANSI/ESD S20.20-2014",
            "published",
        ),
        RuleRow(
            "body.capacitance",
            "parameters",
            "Capacitance of a person (default)",
            "150 pF",
            "IEC 61000-4-2 human-body model (range 100–300 pF)",
            "published",
        ),
        RuleRow(
            "charge.generation_current",
            "parameters",
            "Charge generation current while walking",
            "0.1 µA",
            "worked example in electrostatics texts",
            "published",
        ),
        RuleRow(
            "spark.no_spark_voltage",
            "parameters",
            "No spark from a conductor below this voltage",
            "330 V",
            "Paschen minimum of air, ~327 V",
            "published",
        ),
        RuleRow(
            "brush.discharge_energy",
            "parameters",
            "Equivalent energy of a brush discharge",
            "4 mJ",
            "IEC TS 60079-32-1 (common statement)",
            "published",
        ),
        RuleRow(
            "shock.perception",
            "parameters",
            "Perception threshold of current",
            "0.5 mA",
            "IEC 60479-1",
            "published",
        ),
        RuleRow(
            "shock.let_go",
            "parameters",
            "Let-go threshold of current",
            "10 mA",
            "IEC 60479-1",
            "published",
        ),
        RuleRow(
            "shock.fibrillation",
            "parameters",
            "Ventricular fibrillation possible (over 1 s)",
            "50 mA",
            "IEC 60479-1",
            "published",
        ),
        RuleRow(
            "shock.harmless",
            "parameters",
            "Largest current usually quoted as harmless",
            "5 mA",
            "common practice",
            "common practice",
        ),
        RuleRow(
            "body.impedance",
            "curves",
            "Total body impedance, 5th percentile, hand to hand",
            "1200 Ω at 100 V; 1000 Ω at 220 V",
            "IEC 60479-1 Table 1",
            "published",
        ),
        RuleRow(
            "saturation.vinyl",
            "curves",
            "Walking voltage on vinyl against RH",
            "12 kV at 10 %; 5 kV at 40 %; 3 kV at 55 %",
            "ESD industry table of typical voltages",
            "published",
        ),
        RuleRow(
            "footwear.conductive",
            "footwear",
            "Conductive footwear",
            "≤ 100 kΩ",
            "EN ISO 20345; IEC 61340-4-3",
            "memory",
        ),
        RuleRow(
            "footwear.esd",
            "footwear",
            "ESD footwear",
            "≤ 35 MΩ",
            "EN ISO 20345; IEC 61340-4-3",
            "memory",
        ),
        RuleRow(
            "footwear.antistatic",
            "footwear",
            "Antistatic footwear",
            "≤ 1 GΩ",
            "EN ISO 20345; IEC 61340-4-3",
            "memory",
        ),
        RuleRow(
            "footwear.insulating",
            "footwear",
            "Insulating footwear",
            "~1 TΩ",
            "common practice",
            "common practice",
        ),
        RuleRow(
            "oxygen.ambient",
            "parameters",
            "Oxygen in dry room air",
            "20.9 %",
            "composition of dry air",
            "common practice",
        ),
        RuleRow(
            "oxygen.enriched_limit",
            "parameters",
            "Oxygen-enriched atmosphere above",
            "23.5 %",
            "NFPA 99",
            "published",
        ),
        RuleRow(
            "oxygen.open_delivery_ceiling",
            "parameters",
            "Highest oxygen for open delivery",
            "30 %",
            "surgical-fire prevention guidance",
            "published",
        ),
        RuleRow(
            "oxygen.stop_advice",
            "parameters",
            "Stop supplemental oxygen before activation",
            "60 s",
            "surgical-fire prevention guidance",
            "published",
        ),
        RuleRow(
            "prep.pocket_margin",
            "parameters",
            "Drape-pocket vapour margin",
            "25 % of LFL",
            "NFPA 69",
            "memory",
        ),
        RuleRow(
            "prep.label_minimum_hairless",
            "parameters",
            "Label drying time, hairless skin",
            "3 min",
            "product labels",
            "published",
        ),
        RuleRow(
            "prep.label_maximum_hair",
            "parameters",
            "Label drying time, in hair",
            "1 h",
            "product labels",
            "published",
        ),
        RuleRow(
            "materials.loi_allowance",
            "parameters",
            "Flag a material from this far below its LOI",
            "2 %",
            "NFPA 53",
            "published",
        ),
    ]
    fuels = [
        ("isopropanol", "0.65 mJ in air", "Calcote et al. 1952; NFPA 77 Annex B", "memory"),
        ("ethanol", "0.28 mJ in air", "compilation citing NFPA 497/921", "published"),
        ("methanol", "0.14 mJ in air", "compilation", "memory"),
        ("acetone", "0.55 mJ in air", "compilation", "published"),
        (
            "diethyl-ether",
            "0.19 mJ in air; 0.0013 mJ in O₂",
            "Calcote et al. 1952; Blanc et al. 1949",
            "memory",
        ),
        ("hydrogen", "0.017 mJ in air; 0.0012 mJ in O₂", "Lewis & von Elbe", "published"),
    ]
    rows += [
        RuleRow(f"fuel.{name}", "fuels", f"MIE of {name.replace('-', ' ')}", mie, src, flag)
        for name, mie, src, flag in fuels
    ]
    materials = [
        ("polyethylene", "LOI 17.4 %", "published"),
        ("polypropylene", "LOI 17.4 % (grades to 21 %)", "published"),
        ("cotton", "LOI 18 %", "published"),
        ("polyester", "LOI 21 %", "published"),
        ("nylon-6-6", "LOI 24 % (low end of 24–29 %)", "published"),
        ("rigid-pvc", "LOI 45 %", "published"),
        ("ptfe", "LOI 95 %", "published"),
        ("polyurethane-foam", "LOI 16.5 %", "published"),
        ("wool", "LOI 25 %", "memory"),
        ("paper", "LOI 18 %", "memory"),
    ]
    rows += [
        RuleRow(
            f"material.{name}",
            "materials",
            name.replace("-", " ").capitalize(),
            loi,
            "ISO 4589-2 / ASTM D2863 LOI tables",
            flag,
        )
        for name, loi, flag in materials
    ]
    checks = [
        (
            "floor.reading-below-window",
            "Floor reading below the window's lower limit",
            "window low",
        ),
        (
            "floor.reading-above-window",
            "Floor reading above the window's upper limit",
            "window high",
        ),
        ("shock.fibrillation", "Shock current can cause ventricular fibrillation", "≥ 50 mA"),
        ("shock.let-go", "Shock current exceeds the let-go threshold", "≥ 10 mA"),
        ("shock.perception", "Shock current would be felt", "≥ 0.5 mA"),
        ("static.spark-above-mie", "A static spark can ignite the room's fuels", "≥ lowest MIE"),
        ("static.spark-possible", "A charged person or trolley can spark", "> 330 V"),
        (
            "oxygen.enriched-at-activation",
            "Oxidant at the site enriched at first activation",
            "> 23.5 %",
        ),
        ("oxygen.open-delivery-high", "Open delivery above the guidance ceiling", "> 30 %"),
        (
            "prep.draping-too-early",
            "Drapes on before the pocket stays below the margin",
            "< safe time",
        ),
        ("prep.label-minimum", "Computed drying shorter than the label minimum", "< 3 min"),
        (
            "environment.low-humidity",
            "Relative humidity low enough for drapes to hold charge",
            "< 30 %",
        ),
    ]
    rows += [
        RuleRow(i, "checks", t, th, "see the rule's limit", "published") for i, t, th in checks
    ]
    return tuple(rows)


def _methods() -> tuple[MethodRef, ...]:
    return (
        MethodRef(
            "Shock current through floor and body (Ohm's law)",
            "IEC 60479-1 body impedance, Table 1",
        ),
        MethodRef(
            "Leaky-capacitor body voltage",
            "IEC 61340-5-1; electrostatics texts (I_g·R·(1 − e^(−t/τ)))",
        ),
        MethodRef("Spark energy E = ½·C·V²", "IEC 61000-4-2 human-body model"),
        MethodRef(
            "MIE against oxidant fraction",
            "MIE(x) = MIE_air·(x/0.209)^(−n), exponent from air/O₂ pairs",
        ),
        MethodRef("Activity coefficients", "UNIFAC (Fredenslund, Jones & Prausnitz 1975)"),
        MethodRef("Mixture flash point", "Liaw et al. (2002)"),
        MethodRef("Mixture LFL", "Le Chatelier's rule"),
        MethodRef(
            "Film evaporation",
            "Sh = 0.664·Re^½·Sc^⅓, laminar flat plate; Welty–Wicks–Wilson diffusivities",
        ),
        MethodRef(
            "Drape pocket oxygen",
            "well-mixed pocket; washout t = (V/Q)·ln((C0 − 0.209)/(0.235 − 0.209))",
        ),
        MethodRef(
            "Pure-component data", "IEC 60079-20-1:2010 and NFPA 497:2008 via the chemicals package"
        ),
    )


def _case(
    case_id: str,
    procedure: str,
    site: str,
    *,
    c_ss: float,
    stop: float | None,
    volume: float,
    exchange: float,
    buildup: float | None,
    mie_air: float,
    fuel: str,
    drying: float,
    peak: float,
    safe: float,
    draping: float,
    activation: float,
    sustaining: tuple[str, ...],
    holding: tuple[str, ...],
    sources: tuple[str, ...],
    triad: Triad,
    largest_spark: float,
    oxygen_curve: bool = True,
    notes: tuple[str, ...] = (),
) -> CaseResult:
    at_activation = _after(c_ss, stop or 0.0, volume, exchange)
    washout = _washout(c_ss, volume, exchange)
    curve_end = max(stop or 0.0, washout, 60.0) * 1.3
    return CaseResult(
        id=case_id,
        procedure=procedure,
        site=site,
        oxidant_fraction=c_ss,
        oxygen_enriched=c_ss > ENRICHED_LIMIT,
        washout_s=washout,
        oxidant_at_activation_fraction=at_activation,
        mie_J=_mie(mie_air, max(at_activation, 0.209)),
        drying_time_s=drying,
        pocket_vapour_peak_fraction_of_lfl=peak,
        safe_draping_after_s=safe,
        materials_sustain_burning=sustaining,
        triad=triad,
        mie_fuel=fuel,
        buildup_s=buildup,
        required_stop_s=washout,
        largest_spark_J=largest_spark,
        materials_holding_charge=holding,
        ignition_sources=sources,
        draping_after_s=draping,
        first_activation_after_s=activation,
        stop_before_activation_s=stop,
        oxygen_curve=_oxygen_curve(c_ss, volume, exchange, curve_end) if oxygen_curve else (),
        film_curve=_film_curve(drying / 4.6, max(activation, drying) * 1.2),
        notes=notes,
    )


def full_results() -> Results:
    readings = (180e3, 240e3, 47e3, 1.3e6, 410e3, 25.04e6, 8.2e6, 2.2e6, 95e3, 640e3)
    floor = _floor(
        readings,
        outside=(2, 5),
        system="isolated",
        note=(
            "Isolated supply: a first insulation fault closes no circuit; this current "
            "flows only after a second fault."
        ),
    )
    high = floor.max_ohm
    people = (
        _charge("person", "scrub practitioner", 2, "antistatic", 1e9 + high, 150e-12),
        _charge("person", "circulating nurse", 1, "insulating", 1e12 + high, 150e-12),
        _charge("person", "anaesthetist", 1, "measured", 3.304e9, 200e-12),
    )
    trolleys = (_charge("trolley", "instrument trolley", 1, "", 50e6 + high, 100e-12),)
    largest_spark = max(c.spark_energy_J for c in (*people, *trolleys))
    preparations = (
        PreparationResult(
            id="chg-ipa",
            label="2 % chlorhexidine in 70 % isopropanol",
            flash_point_K=273.15 + 19.4,
            lfl_fraction=0.020,
            saturated_vapour_fraction=0.0623,
            film_temperature_K=305.15,
            components=(
                ComponentResult("isopropanol", "67-63-0", 0.355, 1.86, True),
                ComponentResult("water", "7732-18-5", 0.645, 1.21, False),
            ),
            methods=(
                "LFL: IEC 60079-20-1:2010 via chemicals",
                "flash point: Liaw et al. (2002), UNIFAC",
            ),
        ),
        PreparationResult(
            id="pvi-eth",
            label="povidone-iodine in 72 % ethanol",
            flash_point_K=273.15 + 21.2,
            lfl_fraction=0.033,
            saturated_vapour_fraction=0.0871,
            film_temperature_K=305.15,
            components=(
                ComponentResult("ethanol", "64-17-5", 0.443, 1.34, True),
                ComponentResult("water", "7732-18-5", 0.557, 1.27, False),
            ),
            methods=("LFL: IEC 60079-20-1:2010 via chemicals",),
            notes=("povidone-iodine is non-volatile and was left out of the liquid.",),
        ),
    )
    complete = Triad(oxidant=True, fuel=True, ignition=True)
    cases = (
        _case(
            "1",
            "excision of a facial lesion under sedation",
            "head-neck",
            c_ss=0.209 + (1.0 - 0.209) * (4 / 14),
            stop=60.0,
            volume=0.030,
            exchange=10e-3 / 60,
            buildup=38.0,
            mie_air=0.65e-3,
            fuel="isopropanol",
            drying=152.0,
            peak=0.42,
            safe=231.0,
            draping=180.0,
            activation=360.0,
            sustaining=("nonwoven polypropylene", "cotton"),
            holding=("nonwoven polypropylene",),
            sources=("monopolar electrosurgery", "fibre-optic light cable"),
            triad=complete,
            largest_spark=largest_spark,
        ),
        _case(
            "2",
            "carpal tunnel release under regional block",
            "limb",
            c_ss=0.209,
            stop=None,
            volume=0.020,
            exchange=15e-3 / 60,
            buildup=None,
            mie_air=0.65e-3,
            fuel="isopropanol",
            drying=95.0,
            peak=0.08,
            safe=0.0,
            draping=240.0,
            activation=600.0,
            sustaining=(),
            holding=(),
            sources=("bipolar electrosurgery",),
            triad=Triad(oxidant=False, fuel=True, ignition=True),
            largest_spark=largest_spark,
            notes=("No supplemental oxygen: the pocket is taken at room air.",),
        ),
        _case(
            "3",
            "laparoscopic cholecystectomy",
            "abdomen",
            c_ss=0.209,
            stop=None,
            volume=0.040,
            exchange=20e-3 / 60,
            buildup=None,
            mie_air=0.28e-3,
            fuel="ethanol",
            drying=420.0,
            peak=0.61,
            safe=505.0,
            draping=180.0,
            activation=480.0,
            sustaining=(),
            holding=("nonwoven polypropylene", "polyester gown"),
            sources=("monopolar electrosurgery",),
            triad=Triad(oxidant=False, fuel=True, ignition=True),
            largest_spark=largest_spark,
            oxygen_curve=False,
            notes=(
                "Closed airway: the pocket is taken at room air (no cuff leak assumed).",
                "Pooling: the pooled prep holds more liquid and sees less air.",
            ),
        ),
        _case(
            "4",
            "tracheostomy under local anaesthesia",
            "head-neck",
            c_ss=0.209 + (1.0 - 0.209) * (10 / 22),
            stop=120.0,
            volume=0.025,
            exchange=12e-3 / 60,
            buildup=12.0,
            mie_air=0.28e-3,
            fuel="ethanol",
            drying=2950.0,
            peak=0.93,
            safe=3100.0,
            draping=180.0,
            activation=420.0,
            sustaining=("nonwoven polypropylene", "cotton", "polyester gown"),
            holding=("nonwoven polypropylene", "polyester gown"),
            sources=("monopolar electrosurgery", "bipolar electrosurgery"),
            triad=complete,
            largest_spark=largest_spark,
            notes=("Hair at the site: more liquid held and less air; the label allows up to 1 h.",),
        ),
    )
    nurse = people[1]
    lowest_mie = min(c.mie_J for c in cases if c.mie_J is not None)
    findings = (
        # listed out of order on purpose: the worksheet sorts them worst first
        Finding(
            "environment.low-humidity",
            "Relative humidity low enough for drapes to hold charge",
            "low",
            "room",
            Amount(RH_NOW, "fraction"),
            Amount(0.30, "fraction"),
            "below",
            "physics guide §6: hygroscopic materials below ~30 % RH",
            "memory",
            ("Raise RH to at least 30 % before the list, where the plant allows it.",),
            "Below about 30 % RH most drapes hold charge for minutes.",
        ),
        Finding(
            "shock.perception",
            "Current through a person touching a live enclosure would be felt",
            "note",
            "floor",
            Amount(floor.shock_current_A, "A"),
            Amount(0.5e-3, "A"),
            "at or above",
            "IEC 60479-1",
            "published",
            ("No action for the floor; keep enclosures of mains equipment earthed and tested.",),
            "47 kΩ + 1 kΩ: lowest floor reading plus body impedance. " + floor.shock_note,
        ),
        Finding(
            "static.spark-above-mie",
            "A spark from a charged person or trolley can ignite the fuels in the room",
            "high",
            "circulating nurse",
            Amount(nurse.spark_energy_J, "J"),
            Amount(lowest_mie, "J"),
            "at or above",
            "energy E = ½·C·V² against the MIE table (rules/fuels.yaml)",
            "published",
            (
                "Replace insulating footwear with antistatic or ESD footwear (≤ 35 MΩ) for this "
                "role.",
                "Keep RH at or above 55 % (humidity table), where reachable.",
                f"Stand still for {format_duration(nurse.settle_time_s)} and touch an earthed "
                "point before approaching a prepped site.",
            ),
            f"Body voltage {format_si(nurse.body_voltage_V, 'V')} on a leak path of "
            f"{format_si(nurse.leak_resistance_ohm, 'Ω')}; the lowest MIE is "
            f"{format_si(lowest_mie, 'J')} (ethanol, case 4).",
        ),
        Finding(
            "floor.reading-above-window",
            "Floor reading above the window's upper limit (too resistive to bleed charge)",
            "medium",
            "floor",
            Amount(high, "ohm"),
            Amount(25e6, "ohm"),
            "above",
            "IEC 60364-7-710 as adopted in NEK 400:710 (Norway)",
            "published",
            (
                "Clean the floor with a cleaner that leaves no insulating film and re-test the "
                "high spots.",
                "Until the floor is restored, require conductive or ESD footwear and keep RH at "
                "or above 55 %.",
            ),
            "1 of 10 readings above the upper limit; the highest is at the worst spot for static "
            "charge.",
            value_kind="measured",
            limit_kind="threshold",
        ),
        Finding(
            "floor.reading-below-window",
            "Floor reading below the window's lower limit (too conductive for shock protection)",
            "high",
            "floor",
            Amount(floor.min_ohm, "ohm"),
            Amount(50e3, "ohm"),
            "at or below",
            "IEC 60364-7-710 as adopted in NEK 400:710 (Norway)",
            "published",
            (
                "Re-test the low spots with the prescribed electrode and test voltage; look for "
                "spilt fluid or a damaged finish.",
                "Restore or replace the finish at the low spots before the list; until then keep "
                "mains-powered equipment off that area.",
            ),
            "1 of 10 readings at or below the lower limit; the lowest is at the worst spot for "
            "shock current.",
            value_kind="measured",
            limit_kind="threshold",
        ),
        Finding(
            "oxygen.enriched-at-activation",
            "Oxidant at the site still enriched at first activation",
            "high",
            "case 1",
            Amount(cases[0].oxidant_at_activation_fraction, "fraction"),
            Amount(ENRICHED_LIMIT, "fraction"),
            "above",
            "NFPA 99",
            "published",
            (
                "Stop supplemental oxygen at least 5.2 min before activation, or deliver air or "
                "≤ 30 % O₂.",
                "Tent the drapes away from the face so that oxygen can escape.",
                "Use bipolar electrosurgery near the airway where the procedure allows.",
            ),
            "60 s of washout is not enough for a 30 L pocket exchanging 10 L/min.",
        ),
        Finding(
            "oxygen.enriched-at-activation",
            "Oxidant at the site still enriched at first activation",
            "high",
            "case 4",
            Amount(cases[3].oxidant_at_activation_fraction, "fraction"),
            Amount(ENRICHED_LIMIT, "fraction"),
            "above",
            "NFPA 99",
            "published",
            (
                "Stop supplemental oxygen at least 5.1 min before activation, or deliver air or "
                "≤ 30 % O₂.",
            ),
        ),
        Finding(
            "oxygen.open-delivery-high",
            "Open delivery above the guidance ceiling",
            "medium",
            "case 4",
            Amount(cases[3].oxidant_fraction, "fraction"),
            Amount(0.30, "fraction"),
            "above",
            "surgical-fire prevention guidance (use air or ≤ 30 % O₂ for open delivery)",
            "published",
            ("Titrate to the lowest oxygen that keeps saturation, or secure the airway.",),
        ),
        Finding(
            "prep.draping-too-early",
            "Drapes on before the pocket stays below the vapour margin",
            "high",
            "case 3",
            Amount(180.0, "s"),
            Amount(505.0, "s"),
            "below",
            "NFPA 69",
            "memory",
            (
                "Wait 8.4 min after the end of prep before draping, and check for pooling first.",
                "Wick away pooled prep with a sterile swab; remove soaked linen.",
            ),
            "Peak vapour in the pocket 61 % of LFL, over the 25 % margin.",
        ),
        Finding(
            "prep.label-minimum",
            "Computed drying shorter than the label minimum",
            "note",
            "case 2",
            Amount(95.0, "s"),
            Amount(180.0, "s"),
            "below",
            "product labels",
            "published",
            ("Keep the label minimum of 3 min; the shorter computed time does not apply.",),
        ),
        Finding(
            "static.spark-possible",
            "A charged person or trolley can spark, though below the MIE of the room's fuels",
            "low",
            "anaesthetist",
            Amount(people[2].body_voltage_V, "V"),
            Amount(NO_SPARK, "V"),
            "above",
            "Paschen minimum of air",
            "published",
            ("Use ESD footwear (≤ 35 MΩ) for this role.",),
        ),
    )
    return Results(
        tool_version="0.1.0",
        input_sha256=sha256(FULL_ROOM_FILE),
        input_name="theatre-2.yaml",
        rules_digest=RULES_DIGEST,
        room=RoomInfo(
            "T2",
            "Theatre 2, Ashcombe Vale Community Hospital",
            "pre-list",
            "2026-11-16",
            "M. Adeyemi, theatre safety lead",
        ),
        environment=EnvironmentResult(
            temperature_K=293.15,
            relative_humidity_fraction=RH_NOW,
            air_changes_per_s=20 / 3600,
            volume_m3=150.0,
            mains_voltage_V=230.0,
            mains_frequency_Hz=50.0,
            mains_system="isolated",
            room_oxidant_rise_fraction=1.1e-4,
        ),
        floor=floor,
        people=people,
        trolleys=trolleys,
        preparations=preparations,
        cases=cases,
        findings=findings,
        warnings=("cases[3].prep: hair at the site; the label allows up to 1 h of drying.",),
        lowest_site_mie_J=lowest_mie,
        largest_spark_J=largest_spark,
        no_spark_voltage_V=NO_SPARK,
        oxygen_enriched_limit_fraction=ENRICHED_LIMIT,
        voltage_vs_rh=tuple((c.label, _voltage_curve(c)) for c in (*people, *trolleys)),
    )


def empty_results() -> Results:
    """A floor-only periodic audit: no people, no cases, nothing found."""
    readings = (420e3, 650e3, 1.1e6, 780e3, 900e3)
    return Results(
        tool_version="0.1.0",
        input_sha256=sha256(EMPTY_ROOM_FILE),
        input_name="recovery-7.yaml",
        rules_digest=RULES_DIGEST,
        room=RoomInfo(
            "R7",
            "Recovery bay 7, Tilbury Fen Day Unit",
            "periodic-audit",
            "2026-10-02",
            "J. Lindqvist, estates electrical engineer",
        ),
        environment=EnvironmentResult(
            temperature_K=294.15,
            relative_humidity_fraction=0.45,
            air_changes_per_s=15 / 3600,
            volume_m3=60.0,
            mains_voltage_V=230.0,
            mains_frequency_Hz=50.0,
            mains_system="earthed",
        ),
        floor=_floor(readings, outside=(), system="earthed", note=""),
        people=(),
        trolleys=(),
        preparations=(),
        cases=(),
        no_spark_voltage_V=NO_SPARK,
        oxygen_enriched_limit_fraction=ENRICHED_LIMIT,
    )


RULES = _rules()
METHODS = _methods()
