"""`ignite rules`: every name a room file may use, by category; NAME finds its entry."""

from __future__ import annotations

from click.testing import CliRunner

from ignite.cli import main
from ignite.cli.names import categories
from ignite.room import load as loader


def run(*args: str, **env: str):  # type: ignore[no-untyped-def]
    return CliRunner().invoke(main, list(args), catch_exceptions=False, env=env or None)


def test_rules_lists_every_name_by_category(book):
    result = run("rules")
    assert result.exit_code == 0
    names_part = result.output.split("Rules in force:")[0]
    for kind, heading in (
        ("materials", "materials  (materials, cases[].materials)"),
        ("ignition-sources", "ignition sources  (cases[].ignition_sources)"),
        ("footwear", "footwear classes  (people[].footwear)"),
        ("windows", "floor criteria  (floor.criteria)"),
    ):
        assert heading in names_part
        for entry in book.of_kind(kind):
            for name in entry.get("names", ()) or (entry.id,):
                assert name in names_part, name
    for words in (loader.SITES, loader.PURPOSES, loader.DELIVERIES, loader.SYSTEMS):
        for word in words:
            assert f"  {word}\n" in names_part, word


def test_every_name_the_loader_checks_is_listed(book):
    """The names listed are those the loader's vocabulary accepts (pipeline.vocabulary)."""
    from ignite.pipeline import vocabulary

    listed = {
        c.title: {n.lower() for entry_id, names in c.entries for n in (entry_id, *names)}
        for c in categories(book)
    }
    known = vocabulary(book)
    assert listed["materials"] == set(known.materials)
    assert listed["ignition sources"] == set(known.ignition_sources)
    assert listed["footwear classes"] == set(known.footwear_classes)
    assert listed["floor criteria"] == set(known.floor_criteria)


def test_rules_finds_a_material_by_any_name_a_room_file_uses():
    for name in ("nonwoven polypropylene", "Nonwoven Polypropylene", "sms"):
        result = run("rules", name)
        assert result.exit_code == 0, name
        assert "polypropylene: Polypropylene" in result.output
        assert result.output.count("source: ") == 1


def test_rules_finds_an_ignition_source_a_site_and_a_word():
    assert "[ignition-sources]" in run("rules", "bipolar diathermy").output
    assert "head-neck: Head and neck" in run("rules", "head-neck").output
    result = run("rules", "isolated")
    assert result.exit_code == 0 and "room.mains.system" in result.output


def test_rules_by_id_and_prefix_still_work(book):
    assert "NEK 400:710" in run("rules", "medical-location").output
    prefix = run("rules", "floor").output
    assert prefix.count("source: ") == sum(1 for i in book.entries if i.startswith("floor."))


def test_an_unknown_name_is_a_usage_error_with_suggestions():
    result = run("rules", "nonwoven")
    assert result.exit_code == 2
    assert "nonwoven polypropylene" in result.output


def test_shell_completion_offers_names():
    env = {"_IGNITE_COMPLETE": "bash_complete", "COMP_WORDS": "ignite rules non", "COMP_CWORD": "2"}
    result = CliRunner().invoke(main, [], prog_name="ignite", env=env, catch_exceptions=False)
    offered = [line.split(",", 1)[1] for line in result.output.splitlines()]
    assert "nonwoven polypropylene" in offered
    assert all(name.lower().startswith("non") for name in offered)
