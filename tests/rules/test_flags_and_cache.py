"""Provenance flags in plain words, and the parsed rule book kept between runs.

Rule files may still write `memory`; the rule book reads it as `to confirm`, the word the
worksheet, the table and the JSON record show. A parsed rule book is kept in the cache
folder keyed by the rule files' bytes: a hit equals a fresh parse, an edited file is
parsed again, a corrupt or deleted cache is only a missed shortcut.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from ignite.errors import RuleFileError
from ignite.findings.evaluate import known_results
from ignite.rules import rulebook
from ignite.rules.rulebook import FLAGS, default_rules_dir, flag_word, load_rulebook

FOOTWEAR = (
    "format: 1\nkind: footwear\nentries:\n  - id: {id}\n    title: x\n    resistance: {value}\n"
    "    source: s\n    flag: {flag}\n"
)


@pytest.fixture
def rules(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    monkeypatch.setenv("IGNITE_CACHE_DIR", str(tmp_path / "cache"))
    monkeypatch.delenv("IGNITE_NO_CACHE", raising=False)
    monkeypatch.setattr(rulebook, "_books", {})
    target = tmp_path / "rules"
    shutil.copytree(default_rules_dir(), target)
    return target


def _load(directory: Path) -> rulebook.Rulebook:
    return load_rulebook(directory, known_results())


def test_old_flag_word_reads_as_the_new_one(rules):
    (rules / "extra.yaml").write_text(
        FOOTWEAR.format(id="x-old", value="1 MΩ", flag="memory")
        + FOOTWEAR.format(id="x-new", value="1 MΩ", flag="to confirm").split("entries:\n")[1]
        + FOOTWEAR.format(
            id="x-field", value="{value: 2 MΩ, source: t, flag: memory}", flag="published"
        ).split("entries:\n")[1]
    )
    book = _load(rules)
    assert book.entry("x-old").flag == "to confirm"
    assert book.entry("x-new").flag == "to confirm"
    assert book.entry("x-field").flag == "published"
    assert book.entry("x-field").sourced("resistance").flag == "to confirm"
    assert {entry.flag for entry in book.entries.values()} <= set(FLAGS)


def test_an_unknown_flag_is_refused(rules):
    (rules / "extra.yaml").write_text(FOOTWEAR.format(id="x", value="1 MΩ", flag="remembered"))
    with pytest.raises(RuleFileError) as caught:
        _load(rules)
    assert "extra.yaml" in str(caught.value) and "remembered" in str(caught.value)
    assert flag_word("memory") == "to confirm"


def test_outputs_show_the_new_word_only(book):
    """The table, the rules listing and the JSON record say `to confirm`, never `memory`."""
    import json

    from click.testing import CliRunner

    from ignite.cli import main

    room = str(Path(__file__).resolve().parents[2] / "sample_rooms" / "day-surgery-head-neck.yaml")
    runner = CliRunner()
    text = runner.invoke(main, ["check", room], catch_exceptions=False).output
    listing = runner.invoke(main, ["rules"], catch_exceptions=False).output
    record = json.loads(runner.invoke(main, ["check", room, "--format", "json"]).output)[0]
    assert "(to confirm)" in text and "(memory)" not in text
    assert "[to confirm]" in listing and "[memory]" not in listing
    flags = {finding["flag"] for finding in record["findings"]}
    assert "to confirm" in flags and flags <= set(FLAGS)


def _cached(directory: Path) -> list[Path]:
    return sorted(directory.glob("rulebook-*.pickle"))


def test_a_parsed_rule_book_is_kept_and_a_hit_equals_a_fresh_parse(rules, tmp_path, monkeypatch):
    first = _load(rules)
    kept = _cached(tmp_path / "cache")
    assert len(kept) == 1
    monkeypatch.setattr(rulebook, "_books", {})
    monkeypatch.setattr(rulebook, "_parse", _no_parse)
    second = _load(rules)  # from the disk, not parsed
    assert second == first and second is not first


def _no_parse(*args, **kwargs):  # type: ignore[no-untyped-def]
    raise AssertionError("parsed although the cache holds this rule book")


def test_an_edited_rule_file_is_parsed_again(rules, tmp_path, monkeypatch):
    first = _load(rules)
    path = rules / "footwear.yaml"
    path.write_text(path.read_text().replace("resistance: 100 kΩ", "resistance: 120 kΩ", 1))
    monkeypatch.setattr(rulebook, "_books", {})
    second = _load(rules)
    assert second.digest != first.digest
    assert len(_cached(tmp_path / "cache")) == 2
    changed = [e.id for e in second.entries.values() if e != first.entries[e.id]]
    assert len(changed) == 1


def test_a_corrupt_or_deleted_cache_is_a_miss(rules, tmp_path, monkeypatch):
    first = _load(rules)
    (kept,) = _cached(tmp_path / "cache")
    kept.write_bytes(b"not a pickle")
    monkeypatch.setattr(rulebook, "_books", {})
    assert _load(rules) == first
    shutil.rmtree(tmp_path / "cache")
    monkeypatch.setattr(rulebook, "_books", {})
    assert _load(rules) == first


def test_no_cache_writes_nothing(rules, tmp_path, monkeypatch):
    monkeypatch.setenv("IGNITE_NO_CACHE", "1")
    _load(rules)
    assert not (tmp_path / "cache").exists()


def test_an_invalid_rule_book_is_never_kept(rules, tmp_path):
    (rules / "extra.yaml").write_text(FOOTWEAR.format(id="x", value="1 kg", flag="published"))
    with pytest.raises(RuleFileError):
        _load(rules)
    assert _cached(tmp_path / "cache") == []
