"""The electrical section in every output: the JSON record, the text table, the worksheet
and the audit register (regression: our own output, not published values)."""

from __future__ import annotations

import csv
import io
import json
from pathlib import Path

from click.testing import CliRunner
from conftest import ROOT
from pypdf import PdfReader

from ignite.cli.main import main
from ignite.wording import sentences

REFURBISHED = ROOT / "sample_rooms" / "recommissioning-refurbished.yaml"
HEAD_NECK = ROOT / "sample_rooms" / "day-surgery-head-neck.yaml"
FLOOR_ONLY = ROOT / "tests" / "rooms" / "valid-floor-only.yaml"


def run(*args: str | Path):  # type: ignore[no-untyped-def]
    return CliRunner().invoke(main, [str(a) for a in args], catch_exceptions=False)


def test_json_record_gains_an_electrical_section_only_where_the_room_has_one():
    with_section = json.loads(run("check", REFURBISHED, "--format", "json").output)[0]
    without = json.loads(run("check", FLOOR_ONLY, "--format", "json").output)[0]
    assert "electrical" not in without
    record = with_section["electrical"]
    assert record["bonding_limit_ohm"] == 0.2
    sink = next(b for b in record["bonding"] if b["point"] == "scrub sink")
    assert sink["above_limit"] is True and sink["resistance_ohm"] == 0.34
    assert record["supply"]["imd_alarm_setting_ohm"] == 50e3
    assert "biomedical engineer" in record["caution"]
    # the contract's keys stay where they were
    assert list(with_section)[:13] == list(without)[:13]


def test_text_table_shows_the_section_and_its_caution():
    output = run("check", HEAD_NECK).output
    assert sentences.TEXT_ELECTRICAL in output
    assert "Case 4: central line" in output
    assert sentences.ELECTRICAL_CAUTION in output
    assert sentences.ELECTRICAL_CAUTION not in run("check", FLOOR_ONLY).output


def _text(path: Path) -> str:
    """The worksheet's text, white space made single spaces."""
    return " ".join(" ".join(page.extract_text() for page in PdfReader(path).pages).split())


def _at(text: str, needle: str) -> int:
    return text.index(" ".join(needle.split()))


def test_recommissioning_worksheet_leads_with_the_section(tmp_path):
    out = tmp_path / "t6.pdf"
    assert run("assess", REFURBISHED, "-o", out).exit_code == 0
    text = _text(out)
    section = _at(text, sentences.SECTION_ELECTRICAL)
    assert section < _at(text, sentences.SECTION_CASES)
    assert "scrub sink" in text[section:]
    assert "qualified electrical or biomedical" in text


def test_pre_list_worksheet_shows_the_cases_microshock_lines(tmp_path):
    out = tmp_path / "fh.pdf"
    assert run("assess", HEAD_NECK, "-o", out).exit_code == 0
    text = _text(out)
    cases = _at(text, sentences.SECTION_CASES)
    assert _at(text, sentences.MICROSHOCK_NORMAL) > cases
    # a list plan carries the microshock lines and the findings, not the full section
    assert " ".join(sentences.SECTION_ELECTRICAL.split()) not in text


def test_register_gains_the_worst_electrical_finding_after_the_earlier_columns(tmp_path):
    site = tmp_path / "site"
    site.mkdir()
    for path in (REFURBISHED, FLOOR_ONLY):
        (site / path.name).write_bytes(path.read_bytes())
    out = tmp_path / "out"
    run("audit", site, "-o", out, "--jobs", "1")
    rows = list(csv.reader(io.StringIO((out / "audit-register.csv").read_text("utf-8"))))
    # added after the columns that were there before it (the ranges' column follows it)
    column = rows[0].index("worst_electrical_finding")
    assert rows[0][column + 1 :] == ["worst_probability"]
    cells = {row[0]: row[column] for row in rows[1:]}
    assert cells["recommissioning-refurbished.yaml"] == (
        "electrical.bonding-above-limit | high | bonding: scrub sink"
    )
    assert cells["valid-floor-only.yaml"] == ""
    record = json.loads((out / "audit-register.json").read_text("utf-8"))
    rooms = {room["file"]: room for room in record["rooms"]}
    assert rooms["recommissioning-refurbished.yaml"]["worst_electrical_finding"]["rule"] == (
        "electrical.bonding-above-limit"
    )
    assert rooms["valid-floor-only.yaml"]["worst_electrical_finding"] is None
