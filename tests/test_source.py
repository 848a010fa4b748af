"""Safe YAML with a key-path -> line map (ignite.room.source)."""

from __future__ import annotations

import pytest

from ignite.errors import InputError
from ignite.room.source import MAX_BYTES, MAX_DEPTH, item, join, line_of, load_yaml, parse_yaml

ROOM = """\
format: 1
room:
  id: 1
  assessed_on: 2026-12-01
floor:
  point_to_ground:
    - 180 kΩ
    - 240 kΩ
  point_to_point: [320 kΩ, 410 kΩ]
cases:
  - id: a
    oxygen:
      flow: 4 L/min
  - id: b
"""


def test_values_are_plain_and_lines_are_one_based() -> None:
    data, lines = load_yaml(ROOM, "room.yaml")
    assert data["format"] == 1
    assert data["room"]["id"] == 1  # ints stay ints; the room loader turns ids into text
    assert data["room"]["assessed_on"] == "2026-12-01"  # YAML's date becomes ISO text
    assert data["floor"]["point_to_ground"] == ["180 kΩ", "240 kΩ"]
    assert lines[""] == 1
    assert lines["format"] == 1
    assert lines["room"] == 2
    assert lines["room.assessed_on"] == 4
    assert lines["floor.point_to_ground"] == 6
    assert lines["floor.point_to_ground[0]"] == 7
    assert lines["floor.point_to_ground[1]"] == 8
    assert lines["floor.point_to_point[1]"] == 9  # flow-style items share their line
    assert lines["cases[0]"] == 11
    assert lines["cases[0].oxygen.flow"] == 13
    assert lines["cases[1]"] == 14
    assert lines["cases[1].id"] == 14


def test_path_helpers() -> None:
    assert join("", "floor") == "floor"
    assert join(item("cases", 0), "oxygen") == "cases[0].oxygen"
    _, lines = load_yaml(ROOM, "room.yaml")
    assert line_of(lines, "cases[0].oxygen.fraction") == 12  # missing key: its parent's line
    assert line_of(lines, "nowhere.at.all") == 1


def test_keys_are_the_text_written() -> None:
    data, _ = load_yaml("1: a\non: b\n64-17-5: c\n", "f.yaml")
    assert data == {"1": "a", "on": "b", "64-17-5": "c"}


def test_impossible_date_stays_text() -> None:
    data, _ = load_yaml("assessed_on: 2026-02-30\n", "f.yaml")
    assert data == {"assessed_on": "2026-02-30"}


def _only_problem(text: str) -> str:
    with pytest.raises(InputError) as caught:
        load_yaml(text, "room.yaml")
    assert len(caught.value.problems) == 1
    return str(caught.value.problems[0])


def test_duplicate_key() -> None:
    message = _only_problem("floor:\n  finish: vinyl\n  finish: rubber\n")
    assert message.startswith("room.yaml:3: floor.finish: duplicate key 'finish'")
    assert "first given at line 2" in message


def test_alias_and_anchor_refused() -> None:
    with pytest.raises(InputError) as caught:
        load_yaml("a: &x [1, 2]\nb: *x\n", "room.yaml")
    shown = [str(problem) for problem in caught.value.problems]
    assert shown[0].startswith("room.yaml:1: a: anchors (&x) are not accepted")
    assert shown[1].startswith("room.yaml:2: b: aliases (*x) are not accepted")


def test_refused_values_are_dropped_and_named() -> None:
    parsed = parse_yaml("a: 1\nb: *nowhere\nc: !!python/object:os.system x\n", "room.yaml")
    assert parsed.data == {"a": 1, "b": None, "c": None}
    assert parsed.refused == {"b", "c"}


@pytest.mark.parametrize(
    ("text", "fragment"),
    [
        ("room: !!python/object/apply:os.system [echo hi]\n", "'!!python/object/apply:os.system'"),
        ("room: !!python/name:os.system\n", "'!!python/name:os.system'"),
        ("room: !custom 3\n", "'!custom'"),
        ("room: !!binary aGk=\n", "'!!binary'"),
        ("room: !!set {a, b}\n", "'!!set'"),
        ("room: !!omap [a: 1]\n", "'!!omap'"),
    ],
)
def test_non_standard_tags_refused(text: str, fragment: str) -> None:
    message = _only_problem(text)
    assert message.startswith("room.yaml:1: room: the tag ")
    assert fragment in message


def test_explicit_standard_tag_accepted() -> None:
    data, _ = load_yaml("id: !!str 12\n", "f.yaml")
    assert data == {"id": "12"}


def test_merge_key_refused() -> None:
    assert "merge keys" in _only_problem("a:\n  <<: {b: 1}\n")


def test_complex_key_refused() -> None:
    assert "keys must be plain text" in _only_problem("? [a, b]\n: 1\n")


def test_syntax_error_has_line_from_mark() -> None:
    message = _only_problem("format: 1\nfloor:\n  point_to_ground: [1 kΩ, 2 kΩ\npeople: []\n")
    assert message.startswith("room.yaml:4: invalid YAML:")
    assert "flow sequence begun at line 3" in message


def test_bad_indentation() -> None:
    assert _only_problem("a: 1\n b: 2\n").startswith("room.yaml:2: invalid YAML:")


def test_two_documents_refused() -> None:
    assert "single document" in _only_problem("a: 1\n---\nb: 2\n")


def test_control_character_refused() -> None:
    assert _only_problem("a: 1\nb: \x07\n").startswith("room.yaml:2: invalid YAML: the character")


def test_size_limit() -> None:
    text = "a: " + "x" * MAX_BYTES + "\n"
    assert "limit is 1048576 bytes" in _only_problem(text)


def test_size_limit_counts_bytes_not_characters() -> None:
    text = "a: " + "Ω" * (MAX_BYTES // 2 + 10) + "\n"  # 2 bytes each in UTF-8
    assert "limit" in _only_problem(text)


def test_depth_limit() -> None:
    text = "a: " + "[" * (MAX_DEPTH + 5) + "]" * (MAX_DEPTH + 5) + "\n"
    assert "nesting deeper than" in _only_problem(text)


def test_all_problems_reported_in_line_order() -> None:
    text = "a: *one\nb: !!python/none x\nc: 1\nc: 2\n"
    with pytest.raises(InputError) as caught:
        load_yaml(text, "room.yaml")
    assert [problem.line for problem in caught.value.problems] == [1, 2, 4]


def test_empty_text_is_none() -> None:
    assert load_yaml("", "f.yaml") == (None, {})
    assert load_yaml("# only a comment\n", "f.yaml") == (None, {})
