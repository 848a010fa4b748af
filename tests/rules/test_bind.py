"""The bind stage: the rules bound to one room hold the rule files' values, and exactly the
entries consulted.

The values compared here are those of rules/ (their sources are checked against the
published figures in tests/validation/test_rules_values.py); these tests check that binding
carries them faithfully and records what it read.
"""

from __future__ import annotations

import ast
import shutil
from pathlib import Path

import pytest
from conftest import ROOT, SAMPLES, vocabulary

from ignite.errors import RuleFileError
from ignite.findings.evaluate import known_results
from ignite.room.load import load_room
from ignite.rules.bind import bind
from ignite.rules.rulebook import default_rules_dir, load_rulebook

PACKAGE = ROOT / "ignite"


def _bound(book, path):  # type: ignore[no-untyped-def]
    return bind(load_room(path, vocabulary(book)), book)


def test_floor_window_is_set_for_the_supply_voltage(book, room_data, write_room):
    # medical-location: > 50 kΩ at supplies up to 500 V, > 100 kΩ above (rules/floor.yaml)
    bound = _bound(book, write_room(room_data))
    assert bound.window.id == "medical-location"
    assert bound.window.low is not None and bound.window.low.value == pytest.approx(50e3)
    assert bound.window.high is not None and bound.window.high.value == pytest.approx(25e6)
    assert "IEC 60364-7-710" in bound.window.low.source or "NEK" in bound.window.low.source
    # conductive-historical: > 10 kΩ at 220-240 V, > 5 kΩ at 110-120 V (rules/floor.yaml)
    room_data["floor"]["criteria"] = "conductive-historical"
    room_data["room"]["mains"]["voltage"] = "120 V"
    low = _bound(book, write_room(room_data)).window.low
    assert low is not None and low.value == pytest.approx(5e3)


def test_values_are_the_rule_files_values_in_si(book, room_data, write_room):
    bound = _bound(book, write_room(room_data))
    assert bound.oxygen.ambient == book.value("oxygen.ambient")
    assert bound.oxygen.enriched_limit == book.value("oxygen.enriched_limit")
    assert bound.charge.no_spark_voltage == book.value("spark.no_spark_voltage")
    assert bound.charge.default_capacitance == book.value("body.capacitance")
    assert bound.shock.let_go == book.value("shock.let_go")
    assert bound.footwear_resistance("antistatic") == book.entry("antistatic").get("resistance")
    # every footwear class is bound, lowest resistance first (the static advice names them)
    resistances = [c.resistance for c in bound.footwear]
    assert resistances == sorted(resistances) and len(resistances) == len(book.of_kind("footwear"))


def test_humidity_table_follows_the_floor_finish(book, room_data, write_room):
    assert _bound(book, write_room(room_data)).charge.saturation_curve_id == "saturation.vinyl"
    room_data["floor"]["finish"] = "wool carpet"
    assert _bound(book, write_room(room_data)).charge.saturation_curve_id == "saturation.carpet"


def test_a_floor_only_room_consults_no_case_or_preparation_rules(book):
    bound = _bound(book, ROOT / "tests" / "rooms" / "valid-floor-only.yaml")
    assert bound.prep is None and not bound.fuels
    assert not any(c.reads.startswith("case.") for c in bound.checks)
    assert not any(i.startswith("prep.") for i in bound.consulted)
    assert "medical-location" in bound.consulted and "conductive-historical" not in bound.consulted


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.name)
def test_consulted_ids_are_entries_and_cover_what_was_bound(book, path):
    bound = _bound(book, path)
    assert bound.consulted <= set(book.entries)
    assert {c.id for c in bound.checks} <= bound.consulted
    assert bound.window.id in bound.consulted
    assert bound.charge.saturation_curve_id in bound.consulted
    for fuels in bound.fuels.values():
        assert {f.id for f in fuels} <= bound.consulted
    assert {m.id for m in bound.materials.values()} <= bound.consulted


def test_preparation_fuels_are_found_by_name_or_cas(book, room_data, write_room):
    room_data["preparations"] = [
        {
            "id": "by-name",
            "label": "alcohol by name",
            "components": {"isopropanol": "70 %", "water": "30 %"},
            "basis": "volume",
        },
        {
            "id": "by-cas",
            "label": "alcohol by CAS number",
            "components": {"64-17-5": "70 %", "water": "30 %"},
            "basis": "volume",
        },
    ]
    bound = _bound(book, write_room(room_data))
    assert [f.id for f in bound.fuels["by-name"]] == ["isopropanol"]
    assert [f.id for f in bound.fuels["by-cas"]] == ["ethanol"]
    assert bound.prep is not None
    assert bound.prep.skin_temperature_default == book.value("prep.skin_temperature_default")


def _imported_modules(path: Path) -> set[str]:
    found = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.ImportFrom) and node.module:
            found.add(node.module)
            found |= {f"{node.module}.{a.name}" for a in node.names}
        elif isinstance(node, ast.Import):
            found |= {a.name for a in node.names}
    return found


@pytest.mark.parametrize("layer", ["simulate", "findings", "report"])
def test_layers_below_bind_never_read_the_rule_book(layer):
    """Downstream of bind, only `Bound` and `Results` are read (no Entry.get())."""
    for path in sorted((PACKAGE / layer).rglob("*.py")):
        imported = _imported_modules(path)
        assert "ignite.rules.rulebook" not in imported, path


def test_body_impedance_is_bound_at_its_percentile_and_path(book, room_data, write_room):
    # rules/curves.yaml body.impedance.p5 (IEC 60479-1:2005 Table 1, memory), read at the
    # percentile of rules/electrical.yaml, with the hand-to-feet path factor
    bound = _bound(book, write_room(room_data))
    assert bound.shock.percentile == book.value("body.impedance_percentile")
    assert bound.shock.curve_id == "body.impedance.p5"
    assert bound.shock.body_impedance == tuple(book.points("body.impedance.p5"))
    assert bound.shock.path_factor == book.value("body.impedance_path_factor")
    assert bound.shock.path == "hand to feet"
    assert {
        "body.impedance.p5",
        "body.impedance_percentile",
        "body.impedance_path_factor",
    } <= bound.consulted
    assert "body.impedance.p50" not in bound.consulted


def test_a_percentile_without_a_table_is_a_rule_file_error(tmp_path, room_data, write_room):
    rules = tmp_path / "rules"
    shutil.copytree(default_rules_dir(), rules)
    path = rules / "electrical.yaml"
    text = path.read_text(encoding="utf-8")
    assert "    value: 5 %\n" in text
    path.write_text(text.replace("    value: 5 %\n", "    value: 7 %\n"), encoding="utf-8")
    other = load_rulebook(rules, known_results())
    with pytest.raises(RuleFileError) as caught:
        _bound(other, write_room(room_data))
    assert "electrical.yaml" in str(caught.value) and "body.impedance.p7" in str(caught.value)
