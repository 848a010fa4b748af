"""The rule loader: every value sourced and flagged; bad rule files rejected with file and line."""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from ignite.errors import RuleFileError
from ignite.findings.evaluate import known_results
from ignite.rules.rulebook import (
    FLAGS,
    Sourced,
    check_dimensions,
    default_rules_dir,
    load_rulebook,
)


def test_every_value_has_a_source_and_a_flag(book):
    for entry in book.entries.values():
        assert entry.source.strip(), entry.id
        assert entry.flag in FLAGS, entry.id
        for name, item in entry.fields.items():
            if isinstance(item, Sourced):
                assert item.source.strip() and item.flag in FLAGS, f"{entry.id}.{name}"


def test_checks_read_known_results_with_matching_units(book):
    known = known_results()
    for check in book.of_kind("checks"):
        assert check.get("reads") in known
    assert check_dimensions(book, known_results()) == []


def _copy_rules(tmp_path: Path) -> Path:
    target = tmp_path / "rules"
    shutil.copytree(default_rules_dir(), target)
    return target


def _load(directory: Path):  # type: ignore[no-untyped-def]
    return load_rulebook(directory, known_results())


def _problems(directory: Path) -> str:
    with pytest.raises(RuleFileError) as caught:
        _load(directory)
    return str(caught.value)


def test_unknown_key_is_rejected_with_file_and_line(tmp_path):
    rules = _copy_rules(tmp_path)
    path = rules / "footwear.yaml"
    path.write_text(
        path.read_text().replace(
            "    resistance: 100 kΩ", "    resistance: 100 kΩ\n    colour: red"
        )
    )
    text = _problems(rules)
    assert "footwear.yaml:" in text and "colour" in text and "unknown key" in text


def test_duplicate_identifier_is_rejected(tmp_path):
    rules = _copy_rules(tmp_path)
    (rules / "extra.yaml").write_text(
        "format: 1\nkind: footwear\nentries:\n  - id: esd\n    title: x\n    resistance: 1 MΩ\n"
        "    source: s\n    flag: memory\n"
    )
    text = _problems(rules)
    assert "extra.yaml:4" in text and "duplicate identifier" in text


def test_unknown_result_is_rejected(tmp_path):
    rules = _copy_rules(tmp_path)
    path = rules / "checks.yaml"
    path.write_text(
        path.read_text().replace("reads: floor.highest_reading", "reads: floor.tallest_reading")
    )
    assert "unknown result 'floor.tallest_reading'" in _problems(rules)


def test_incompatible_units_are_rejected(tmp_path):
    rules = _copy_rules(tmp_path)
    path = rules / "checks.yaml"
    path.write_text(path.read_text().replace("limit: {param: shock.let_go}", "limit: 10 kV"))
    assert "incompatible units" in _problems(rules)


def test_wrong_unit_in_a_value_is_rejected(tmp_path):
    rules = _copy_rules(tmp_path)
    path = rules / "footwear.yaml"
    path.write_text(path.read_text().replace("resistance: 35 MΩ", "resistance: 35 kg"))
    text = _problems(rules)
    assert "footwear.yaml:" in text and "resistance" in text


def test_unknown_flag_is_rejected(tmp_path):
    rules = _copy_rules(tmp_path)
    path = rules / "footwear.yaml"
    path.write_text(path.read_text().replace("flag: common practice", "flag: folklore", 1))
    assert "folklore" in _problems(rules)


def test_digest_changes_with_the_rules(tmp_path, book):
    rules = _copy_rules(tmp_path)
    assert _load(rules).digest == book.digest
    path = rules / "footwear.yaml"
    path.write_text(path.read_text().replace("resistance: 35 MΩ", "resistance: 30 MΩ"))
    rules2 = tmp_path / "rules2"
    shutil.copytree(rules, rules2)
    assert _load(rules2).digest != book.digest
