"""One-line cases of the electrical checks, and the electrical rules bound to a room."""

from __future__ import annotations

import copy
from typing import Any

import pytest
from conftest import ROOT, vocabulary

from ignite.room.load import load_room
from ignite.rules.bind import bind


def rules_of(results):  # type: ignore[no-untyped-def]
    return {f.rule for f in results.findings}


def electrical_rules(results):  # type: ignore[no-untyped-def]
    return {r for r in rules_of(results) if r.startswith("electrical.")}


def device(**changes: Any) -> dict[str, Any]:
    data: dict[str, Any] = {
        "id": "monitor-1",
        "kind": "patient monitor",
        "protection_class": "I",
        "applied_part": "CF",
        "test": "recurrent",
        "earth_leakage": "100 µA",
        "touch_current": "10 µA",
        "patient_leakage": "2 µA",
    }
    data.update(changes)
    return data


CASE: dict[str, Any] = {
    "id": "1",
    "procedure": "pacemaker box change",
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


@pytest.fixture
def electrical_room(room_data):  # type: ignore[no-untyped-def]
    data = copy.deepcopy(room_data)
    data["room"]["mains"]["system"] = "isolated"
    data["cases"] = [copy.deepcopy(CASE)]
    data["electrical"] = {
        "supply": {
            "system": "isolated",
            "transformer_rating": "8 kVA",
            "insulation_monitor": {"alarm_setting": "50 kΩ", "tested_alarm_at": "55 kΩ"},
        },
        "bonding": [{"point": "table", "kind": "exposed", "resistance": "0.1 Ω"}],
        "equipment": [device()],
        "cases": [{"case": "1", "cardiac_path": "pacing-wires", "connected": ["monitor-1"]}],
    }
    return data


def test_compliant_electrical_section_gives_no_electrical_finding(electrical_room, assess_data):
    results = assess_data(electrical_room)
    assert electrical_rules(results) == set()
    # 2 µA of patient leakage + 100 µA × 0.1 Ω / 500 Ω = 0.02 µA of touch current
    assert results.electrical.cases[0].cardiac_current_normal_A == pytest.approx(2.02e-6)


def test_bonding_reading_above_limit(electrical_room, assess_data):
    electrical_room["electrical"]["bonding"].append(
        {"point": "scrub sink", "kind": "extraneous", "resistance": "0.25 Ω"}
    )
    finding = next(
        f
        for f in assess_data(electrical_room).findings
        if f.rule == "electrical.bonding-above-limit"
    )
    assert finding.subject == "bonding: scrub sink" and finding.severity == "high"
    assert finding.limit.value == pytest.approx(0.2)
    # computed: 10 µA × 500 Ω / 0.25 Ω = 20 mA; at the 0.2 Ω limit, 25 mA
    assert any("20 mA" in m for m in finding.mitigations)
    assert any("25 mA" in m for m in finding.mitigations)


def test_bonding_reading_at_the_limit_is_within(electrical_room, assess_data):
    electrical_room["electrical"]["bonding"][0]["resistance"] = "0.2 Ω"
    assert "electrical.bonding-above-limit" not in rules_of(assess_data(electrical_room))


def test_insulation_monitor_set_and_alarming_below_the_limit(electrical_room, assess_data):
    monitor = electrical_room["electrical"]["supply"]["insulation_monitor"]
    monitor["alarm_setting"] = "30 kΩ"
    monitor["tested_alarm_at"] = "28 kΩ"
    found = electrical_rules(assess_data(electrical_room))
    assert {"electrical.monitor-set-below-limit", "electrical.monitor-alarmed-late"} <= found


def test_recurrent_leakage_above_its_class_limit(electrical_room, assess_data):
    electrical_room["electrical"]["equipment"] = [device(earth_leakage="650 µA")]
    finding = next(
        f
        for f in assess_data(electrical_room).findings
        if f.rule == "electrical.leakage-above-recurrent-limit"
    )
    # IEC 62353 equipment leakage, class I: 500 µA (memory)
    assert finding.limit.value == pytest.approx(500e-6)
    assert "earth leakage" in finding.subject
    assert "iec62353.equipment_leakage_class_i" in finding.detail


def test_type_test_patient_leakage_by_applied_part_and_condition(electrical_room, assess_data):
    electrical_room["electrical"]["equipment"] = [
        device(
            test="type",
            earth_leakage=None,
            touch_current=None,
            patient_leakage={"normal": "8 µA", "single_fault": "60 µA"},
        )
    ]
    findings = [
        f
        for f in assess_data(electrical_room).findings
        if f.rule == "electrical.leakage-above-type-test-limit"
    ]
    # CF: 8 µA within 10 µA in normal condition; 60 µA above 50 µA in single fault (memory)
    assert [f.subject for f in findings] == [
        "monitor-1 (patient monitor): patient leakage, single fault"
    ]
    assert findings[0].limit.value == pytest.approx(50e-6)


def test_bf_device_on_pacing_wires(electrical_room, assess_data):
    electrical_room["electrical"]["equipment"] = [device(applied_part="BF")]
    results = assess_data(electrical_room)
    assert "electrical.non-cf-on-cardiac-path" in rules_of(results)
    # no direct path: no such finding, and no microshock figures
    electrical_room["electrical"]["cases"][0]["cardiac_path"] = "none"
    results = assess_data(electrical_room)
    assert electrical_rules(results) == set()
    assert results.electrical.cases[0].cardiac_current_normal_A is None


def test_device_without_a_reading_counts_at_its_limit(electrical_room, assess_data):
    electrical_room["electrical"]["equipment"] = [device(patient_leakage=None)]
    results = assess_data(electrical_room)
    case = results.electrical.cases[0]
    # CF normal-condition limit, 10 µA (IEC 60601-1 Table 3, memory): the safe side
    assert case.counted_at_limit == ("monitor-1",)
    assert case.patient_leakage_normal_A == pytest.approx(10e-6)
    assert "electrical.microshock-normal" in rules_of(results)


def test_worst_bonding_reading_sets_the_touch_voltage(electrical_room, assess_data):
    electrical_room["electrical"]["bonding"].append(
        {"point": "sink", "kind": "extraneous", "resistance": "0.5 Ω"}
    )
    case = assess_data(electrical_room).electrical.cases[0]
    # 100 µA × 0.5 Ω = 50 µV; / 500 Ω = 0.1 µA
    assert case.touch_voltage_V == pytest.approx(50e-6)
    assert case.touch_cardiac_current_A == pytest.approx(0.1e-6)


# --- bind -------------------------------------------------------------------------------


def test_a_room_without_an_electrical_section_consults_no_electrical_rule(book):
    bound = bind(load_room(ROOT / "tests/rooms/valid-full.yaml", vocabulary(book)), book)
    assert bound.electrical is None
    assert not any(c.reads.startswith("electrical.") for c in bound.checks)
    assert not any(
        i.startswith(("electrical.", "iec6", "me_system.", "microshock.", "patient.leakage"))
        for i in bound.consulted
    )


def test_electrical_values_are_bound_and_consulted(book, electrical_room, write_room):
    bound = bind(load_room(write_room(electrical_room), vocabulary(book)), book)
    rules = bound.electrical
    assert rules is not None
    assert rules.bonding_max.value == book.value("electrical.bonding_resistance_max")
    assert rules.imd_alarm_min.value == book.value("electrical.imd_alarm_min")
    assert rules.microshock_limit.value == book.value("microshock.limit")
    assert rules.path_impedance.value == book.value("microshock.path_impedance")
    # a recurrent CF class I device: its recurrent limits and the type-test limits a missing
    # reading is counted at
    assert {
        "iec62353.equipment_leakage_class_i",
        "iec62353.applied_part_leakage_cf",
        "me_system.touch_current_normal",
        "patient.leakage_cf_normal",
        "patient.leakage_cf_single_fault",
    } <= bound.consulted
    assert "iec62353.applied_part_leakage_bf" not in bound.consulted
    assert {r.id for r in rules.leakage.values()} <= bound.consulted
    assert {c.id for c in bound.checks if c.reads.startswith("electrical.")} <= bound.consulted
