"""The patient environment's electrical safety against the standards and by hand.

The rule values are compared with the figures of the standards they name; each is flagged
`memory` in rules/electrical.yaml (recalled, not re-read here) and names the clause to
confirm it in, except the microshock thresholds (`common practice`) and the impedance of a
cardiac path (`assumption`). The worked examples are computed by hand in the comments and
checked through the whole pipeline, not only through the formulas.
"""

from __future__ import annotations

import copy

import pytest
from click.testing import CliRunner
from conftest import ROOT

from ignite.cli.main import main
from ignite.physics.electrical import (
    cardiac_current,
    fault_current_for_cardiac_current,
    summed_leakage,
    touch_voltage,
)

# --- the rule values against the standards ----------------------------------------------

STANDARD_VALUES = [
    # (rule id, value in SI, flag, words the source must name)
    # IEC 60364-7-710, 710.415.2.2: bonding of group 2 locations ≤ 0.2 Ω (memory: flag `to confirm`)
    ("electrical.bonding_resistance_max", 0.2, "to confirm", "710.415.2.2"),
    # IEC 60364-7-710: the IT supply's insulation monitor alarms at 50 kΩ or above (memory: flag `to confirm`)
    ("electrical.imd_alarm_min", 50e3, "to confirm", "IEC 60364-7-710"),
    # IEC 60601-1:2005+A1:2012 Table 3: earth leakage 5 mA NC, 10 mA SFC (memory: flag `to confirm`)
    ("iec60601.earth_leakage_normal", 5e-3, "to confirm", "Table 3"),
    ("iec60601.earth_leakage_single_fault", 10e-3, "to confirm", "Table 3"),
    # IEC 60601-1 Table 3: touch current 100 µA NC, 500 µA SFC (memory: flag `to confirm`)
    ("iec60601.touch_current_normal", 100e-6, "to confirm", "Table 3"),
    ("iec60601.touch_current_single_fault", 500e-6, "to confirm", "Table 3"),
    # IEC 60601-1 Table 3: patient leakage (a.c.), B and BF 100 µA NC, 500 µA SFC (memory: flag `to confirm`)
    ("patient.leakage_b_normal", 100e-6, "to confirm", "Table 3"),
    ("patient.leakage_b_single_fault", 500e-6, "to confirm", "Table 3"),
    # IEC 60601-1 Table 3: patient leakage (a.c.), CF 10 µA NC, 50 µA SFC (memory: flag `to confirm`)
    ("patient.leakage_cf_normal", 10e-6, "to confirm", "Table 3"),
    ("patient.leakage_cf_single_fault", 50e-6, "to confirm", "Table 3"),
    # IEC 62353:2014 Table 2: equipment leakage, direct or differential method,
    # class I 500 µA, class II 100 µA (memory: flag `to confirm`)
    ("iec62353.equipment_leakage_class_i", 500e-6, "to confirm", "IEC 62353"),
    ("iec62353.equipment_leakage_class_ii", 100e-6, "to confirm", "IEC 62353"),
    # IEC 62353:2014 Table 2: applied part leakage, BF 5000 µA, CF 50 µA (memory: flag `to confirm`)
    ("iec62353.applied_part_leakage_bf", 5000e-6, "to confirm", "IEC 62353"),
    ("iec62353.applied_part_leakage_cf", 50e-6, "to confirm", "IEC 62353"),
    # IEC 60601-1 16.6.1: ME system touch current in the patient environment 100 µA NC (memory: flag `to confirm`)
    ("me_system.touch_current_normal", 100e-6, "to confirm", "16.6.1"),
    # microshock: 10 µA through a direct cardiac path, normal condition (common practice)
    ("microshock.limit", 10e-6, "common practice", "common practice"),
    # microshock: about 100 µA through a direct cardiac path can cause ventricular
    # fibrillation, the limit for a single fault (common practice)
    ("microshock.single_fault_limit", 100e-6, "common practice", "common practice"),
    # the cardiac path's impedance: ignite's choice at the low end (assumption)
    ("microshock.path_impedance", 500.0, "assumption", "safe side"),
]


@pytest.mark.parametrize(("rule", "value", "flag", "named"), STANDARD_VALUES)
def test_rule_values_are_the_standards(book, rule, value, flag, named):
    entry = book.entry(rule)
    assert entry.get("value") == pytest.approx(value)
    assert entry.flag == flag
    assert named in entry.source
    if flag == "to confirm":  # a recalled value says where to confirm it
        assert "confirm" in entry.source


def test_cf_limits_are_a_tenth_of_b_and_bf():
    # IEC 60601-1 Table 3 (memory): CF 10/50 µA against B/BF 100/500 µA, a factor of ten
    # in both conditions; the same factor read from the rule book
    from ignite.pipeline import open_rulebook

    book = open_rulebook()
    for condition in ("normal", "single_fault"):
        cf = book.value(f"patient.leakage_cf_{condition}")
        b = book.value(f"patient.leakage_b_{condition}")
        assert b / cf == pytest.approx(10.0)


# --- worked examples by hand --------------------------------------------------------------


def test_touch_voltage_of_10_A_across_0_2_ohm():
    # by hand: U = I·R = 10 A × 0.2 Ω = 2 V (Ohm's law; 0.2 Ω is IEC 60364-7-710's limit, memory)
    assert touch_voltage(10.0, 0.2) == pytest.approx(2.0)
    # 2 V across a 500 Ω cardiac path (assumption) drives 2 / 500 = 4 mA: 400 times the
    # 10 µA microshock limit (common practice): the bonding limit protects against
    # macroshock, not microshock, at fault currents
    assert cardiac_current(2.0, 500.0) == pytest.approx(4e-3)
    # the current that lifts a 0.2 Ω conductor to 10 µA × 500 Ω = 5 mV: 5 mV / 0.2 Ω = 25 mA
    assert fault_current_for_cardiac_current(10e-6, 500.0, 0.2) == pytest.approx(25e-3)


def test_three_bf_devices_summed_against_the_cf_limit():
    # by hand: 4 µA + 5 µA + 3 µA = 12 µA in phase, above the CF normal-condition limit of
    # 10 µA (IEC 60601-1 Table 3, memory) though each is far within the BF limit of 100 µA
    readings = [4e-6, 5e-6, 3e-6]
    assert summed_leakage(readings) == pytest.approx(12e-6)
    assert summed_leakage(readings) > 10e-6
    assert all(r < 100e-6 for r in readings)


def _three_bf_devices(room_data):  # type: ignore[no-untyped-def]
    data = copy.deepcopy(room_data)
    data["cases"] = [
        {
            "id": "1",
            "procedure": "central line insertion",
            "site": "chest",
            "oxygen": {
                "delivery": "closed-airway",
                "flow": "0 L/min",
                "fraction": "21 %",
                "nitrous_oxide_flow": "0 L/min",
                "stop_before_activation": "0 s",
            },
            "drape_pocket": {"volume": "20 L", "exchange": "20 L/min"},
            "prep": "none",
            "air_speed": "0.2 m/s",
            "draping_after": "3 min",
            "first_activation_after": "8 min",
            "materials": [],
            "ignition_sources": [],
        }
    ]
    data["electrical"] = {
        "equipment": [
            {
                "id": name,
                "kind": "infusion pump",
                "protection_class": "II",  # no protective earth: no touch-voltage share
                "applied_part": "BF",
                "test": "type",
                "patient_leakage": {"normal": normal, "single_fault": fault},
            }
            for name, normal, fault in (
                ("pump-a", "4 µA", "20 µA"),
                ("pump-b", "5 µA", "25 µA"),
                ("pump-c", "3 µA", "15 µA"),
            )
        ],
        "cases": [
            {
                "case": "1",
                "cardiac_path": "central-line",
                "connected": ["pump-a", "pump-b", "pump-c"],
            }
        ],
    }
    return data


def test_three_bf_devices_on_a_central_line_through_the_pipeline(room_data, assess_data):
    results = assess_data(_three_bf_devices(room_data))
    case = results.electrical.cases[0]
    # normal condition: 4 + 5 + 3 = 12 µA (by hand, above)
    assert case.patient_leakage_normal_A == pytest.approx(12e-6)
    # single fault, one device at a time: the largest rise is pump-b's 25 − 5 = 20 µA,
    # so 12 + 20 = 32 µA (by hand)
    assert case.patient_leakage_single_fault_A == pytest.approx(32e-6)
    assert case.touch_cardiac_current_A == 0.0  # class II: no earth leakage
    normal = next(f for f in results.findings if f.rule == "electrical.microshock-normal")
    # 12 µA at or above the microshock limit of 10 µA (common practice)
    assert normal.measured.value == pytest.approx(12e-6) and normal.limit.value == 10e-6
    # the computed mitigation: without pump-b (5 µA) the sum is 7 µA, within the limit
    assert any("pump-b" in m and "7 µA" in m and "within" in m for m in normal.mitigations)
    # 32 µA in single fault is below 100 µA (common practice): no single-fault finding
    assert "electrical.microshock-single-fault" not in {f.rule for f in results.findings}
    # the three BF devices on a central line are named in one finding of the case
    # (IEC 60601-1, memory: only type CF is made for direct cardiac application)
    non_cf = [f for f in results.findings if f.rule == "electrical.non-cf-on-cardiac-path"]
    assert len(non_cf) == 1
    assert all(f"pump-{x} (BF)" in non_cf[0].detail for x in "abc")


# --- bad electrical input: exit 3 with file, line and key ---------------------------------


def test_bad_electrical_input_exits_3_naming_file_line_and_key():
    path = ROOT / "tests" / "rooms" / "broken-electrical.yaml"
    result = CliRunner().invoke(main, ["check", str(path)], catch_exceptions=False)
    assert result.exit_code == 3
    err = result.stderr
    lines = path.read_text(encoding="utf-8").splitlines()

    def line_of(text: str) -> int:
        return next(n for n, line in enumerate(lines, start=1) if text in line)

    # a negative resistance
    assert f"broken-electrical.yaml:{line_of('-0.1 Ω')}: electrical.bonding[0].resistance:" in err
    # an unknown applied-part type
    assert f"broken-electrical.yaml:{line_of('CX')}: electrical.equipment[0].applied_part:" in err
    assert "B, BF, CF, none" in err
    # a leakage in volts
    assert (
        f"broken-electrical.yaml:{line_of('12 V')}: electrical.equipment[0].patient_leakage:" in err
    )
    assert "expected a current" in err
    assert "Traceback" not in err
