"""Every file in sample_rooms/ runs end to end: check (text and JSON) and assess."""

from __future__ import annotations

import json

import pytest
from click.testing import CliRunner
from conftest import SAMPLES

from ignite.cli.main import main

CASE_KEYS = {
    "id",
    "oxidant_fraction",
    "oxygen_enriched",
    "washout_s",
    "oxidant_at_activation_fraction",
    "mie_J",
    "drying_time_s",
    "pocket_vapour_peak_fraction_of_lfl",
    "safe_draping_after_s",
    "materials_sustain_burning",
    "triad",
}
PREP_KEYS = {
    "id",
    "flash_point_K",
    "lfl_fraction",
    "saturated_vapour_fraction",
    "film_temperature_K",
}


@pytest.fixture(scope="module")
def records() -> dict[str, dict]:
    found = {}
    for path in SAMPLES:
        result = CliRunner().invoke(
            main, ["check", str(path), "--format", "json"], catch_exceptions=False
        )
        assert result.exit_code == 0, result.stderr
        (found[path.name],) = json.loads(result.stdout)  # an array of one record
    return found


def test_there_are_three_samples():
    assert len(SAMPLES) >= 3


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.name)
def test_sample_checks_clean_in_text(path):
    result = CliRunner().invoke(main, ["check", str(path)], catch_exceptions=False)
    assert result.exit_code == 0, result.stderr
    assert "Traceback" not in result.stderr


def test_sample_records_have_the_contract_shape(records):
    for name, record in records.items():
        assert record["format"] == 1, name
        assert len(record["input_sha256"]) == 64
        assert record["people"], name
        for prep in record["preparations"]:
            assert prep.keys() >= PREP_KEYS, name
        for case in record["cases"]:
            assert case.keys() >= CASE_KEYS, name
            assert set(case["triad"]) >= {"oxidant", "fuel", "ignition"}
        for finding in record["findings"]:
            assert finding["severity"] in ("high", "medium", "low", "note")
            assert finding["source"]


def test_cases_have_computed_prep_and_oxygen_figures(records):
    cases = [c for r in records.values() for c in r["cases"]]
    assert cases
    for case in cases:
        assert 0.2 <= case["oxidant_fraction"] <= 1.0
        assert case["mie_J"] is None or case["mie_J"] > 0


def test_head_neck_cannula_case_with_one_minute_stop_is_high_and_states_the_stop(records):
    record = records["day-surgery-head-neck.yaml"]
    case = next(c for c in record["cases"] if c["id"] == "1")
    assert case["oxygen_enriched"] and case["oxidant_at_activation_fraction"] > 0.235
    finding = next(
        f
        for f in record["findings"]
        if f["rule"] == "oxygen.enriched-at-activation" and f["subject"].startswith("case 1:")
    )
    assert finding["severity"] == "high"
    assert any("Stop open oxygen at least" in m for m in finding["mitigations"])


def test_closed_airway_case_has_no_oxygen_finding(records):
    record = records["day-surgery-head-neck.yaml"]
    assert not [
        f
        for f in record["findings"]
        if f["rule"].startswith("oxygen.") and f["subject"].startswith("case 3:")
    ]


def test_hair_prep_draped_at_one_minute_is_high_with_the_computed_wait(records):
    record = records["day-surgery-head-neck.yaml"]
    findings = [
        f
        for f in record["findings"]
        if f["subject"].startswith("case 2:") and f["rule"].startswith("prep.")
    ]
    high = [f for f in findings if f["severity"] == "high"]
    assert high
    assert any("Drape no earlier than" in m for f in high for m in f["mitigations"])


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.name)
def test_sample_assess_writes_a_worksheet(path, tmp_path):
    out = tmp_path / "sheet.pdf"
    result = CliRunner().invoke(main, ["assess", str(path), "-o", str(out)], catch_exceptions=False)
    assert result.exit_code == 0, result.stderr
    assert out.read_bytes().startswith(b"%PDF")
    again = CliRunner().invoke(main, ["assess", str(path), "-o", str(out)], catch_exceptions=False)
    assert again.exit_code == 2
    assert "--force" in again.stderr
