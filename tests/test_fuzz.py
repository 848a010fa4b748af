"""Fuzzing the room file: every file loads into a Room or is refused in FILE:LINE: key form.

Three sources of files: the corpus of nasty files in tests/rooms/nasty/, a few hundred
files mutated from the samples, the test rooms and the template (tests/fuzz_rooms.py,
which also runs ten thousand of them as a script), and hypothesis drawing values for the
keys of the room contract. Loaded rooms are computed, and every figure of their JSON
record must be finite and in range. These are regression tests of our own behaviour.
"""

from __future__ import annotations

import copy
import json
import re
from pathlib import Path
from typing import Any

import pytest
import yaml
from conftest import BASE_ROOM
from conftest import FOREARM_CASE as CASE
from fuzz_rooms import NASTY, Tally, check_corpus, check_file, figure_problems, generate
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from ignite.errors import InputError
from ignite.pipeline import evaluate_room, vocabulary
from ignite.room.load import load_room
from ignite.rules.rulebook import Rulebook

# what each nasty file must be refused for: (line, key path) of at least these problems
NASTY_EXPECTED: dict[str, list[tuple[int, str]]] = {
    "deleted-keys.yaml": [(14, "environment"), (25, "people[0]"), (46, "cases[0]")],
    "duplicated-keys.yaml": [(19, "environment.volume"), (29, "people[0].count")],
    "extreme-quantities.yaml": [
        (12, "room.mains.frequency"),
        (15, "environment.temperature"),
        (18, "environment.volume"),
        (22, "floor.test_voltage"),
        (27, "people[0].count"),
        (35, "trolleys[0].capacitance"),
        (59, "cases[0].drape_pocket.exchange"),
        (63, "cases[0].prep.area"),
        (67, "cases[0].air_speed"),
    ],
    "odd-quantities.yaml": [
        (15, "environment.temperature"),
        (16, "environment.relative_humidity"),
        (58, "cases[0].drape_pocket.volume"),
        (66, "cases[0].prep.skin_temperature"),
        (68, "cases[0].draping_after"),
    ],
    "lone-surrogate.yaml": [(6, "room.name"), (20, "floor"), (27, "people[0].role")],
    "long-lists.yaml": [
        (24, "floor.point_to_point"),
        (30, "people[1].role"),
        (71, "cases[0].ignition_sources"),
    ],
    "tags-and-aliases.yaml": [(6, "room.name"), (10, "room.mains"), (14, "supply")],
    "swapped-types.yaml": [
        (5, "room.id"),
        (23, "floor.point_to_ground"),
        (64, "cases[0].prep.hair"),
    ],
}
NASTY_FILES = sorted(NASTY.glob("*.yaml"))


def test_the_corpus_is_there() -> None:
    assert len(NASTY_FILES) >= 15
    assert set(NASTY_EXPECTED) <= {path.name for path in NASTY_FILES}


@pytest.mark.parametrize("path", NASTY_FILES, ids=lambda path: path.name)
def test_nasty_file_is_refused_in_file_line_key_form(path: Path, book: Rulebook) -> None:
    with pytest.raises(InputError) as caught:
        load_room(path, vocabulary(book))
    texts = [str(problem) for problem in caught.value.problems]
    form = re.compile(re.escape(str(path)) + r":\d+: (\S+: )?\S")
    assert all(form.match(text) for text in texts), texts
    found = {(problem.line, problem.path) for problem in caught.value.problems}
    for expected in NASTY_EXPECTED.get(path.name, []):
        assert expected in found, (expected, texts)


def test_generated_rooms(
    tmp_path: Path, book: Rulebook, capsys: pytest.CaptureFixture[str]
) -> None:
    tally = check_corpus(tmp_path, generate(300, seed=14), book)
    with capsys.disabled():
        print(f"\nfuzz (CI): {tally.line()}")
    assert tally.crashes == []
    assert tally.slow == []
    assert tally.bad_figures == []
    assert tally.bad_rejections == []
    assert tally.loaded >= 20 and tally.rejected >= 100  # both paths exercised


# -- hypothesis over the room contract ---------------------------------------------------

QUANTITY_KEYS: list[tuple[tuple[Any, ...], str]] = [
    (("room", "mains", "voltage"), "V"),
    (("room", "mains", "frequency"), "Hz"),
    (("environment", "temperature"), "degC"),
    (("environment", "relative_humidity"), "%"),
    (("environment", "air_changes"), "/h"),
    (("environment", "volume"), "m^3"),
    (("floor", "test_voltage"), "V"),
    (("floor", "point_to_ground", 0), "kΩ"),
    (("people", 0, "capacitance"), "pF"),
    (("people", 0, "footwear"), "MΩ"),
    (("cases", 0, "oxygen", "flow"), "L/min"),
    (("cases", 0, "oxygen", "fraction"), "%"),
    (("cases", 0, "oxygen", "nitrous_oxide_flow"), "L/min"),
    (("cases", 0, "oxygen", "stop_before_activation"), "s"),
    (("cases", 0, "drape_pocket", "volume"), "L"),
    (("cases", 0, "drape_pocket", "exchange"), "L/min"),
    (("cases", 0, "air_speed"), "m/s"),
    (("cases", 0, "draping_after"), "min"),
    (("cases", 0, "first_activation_after"), "min"),
]
numbers = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True),
    st.sampled_from([0.0, 1e-300, 1.7976931348623157e308, 5e-324, 0.24, 68.0]),
    st.integers(min_value=-(10**30), max_value=10**30),
)
values = st.one_of(
    numbers.map(lambda n: f"{n!r}"),
    st.tuples(numbers, st.sampled_from(["", "%", "degF", "K", "kg", "TΩ", "µL"])).map(
        lambda pair: f"{pair[0]!r} {pair[1]}"
    ),
    numbers,
    st.none(),
    st.booleans(),
    st.text(max_size=30),
    st.lists(st.text(max_size=5), max_size=3),
)


def _set(data: Any, path: tuple[Any, ...], value: Any) -> None:
    for key in path[:-1]:
        data = data[key]
    data[path[-1]] = value


@settings(
    max_examples=150, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(
    changes=st.lists(
        st.tuples(
            st.sampled_from(QUANTITY_KEYS),
            st.one_of(values, numbers.map(lambda n: f"{n!r}")),
            st.booleans(),
        ),
        min_size=1,
        max_size=4,
    )
)
def test_contract_values_give_a_room_or_clean_problems(
    tmp_path: Path, book: Rulebook, changes: list[tuple[tuple[tuple[Any, ...], str], Any, bool]]
) -> None:
    data = copy.deepcopy(BASE_ROOM)
    data["people"][0]["capacitance"] = "150 pF"
    data["cases"] = [copy.deepcopy(CASE)]
    for (path, unit), value, with_unit in changes:
        if with_unit and isinstance(value, str) and " " not in value:
            value = f"{value} {unit}"
        _set(data, path, value)
    path = tmp_path / "room.yaml"
    path.write_text(
        yaml.safe_dump(data, allow_unicode=True), encoding="utf-8", errors="surrogatepass"
    )
    tally = Tally()
    check_file(path, book, tally)
    assert tally.crashes == []
    assert tally.bad_figures == []
    assert tally.bad_rejections == []


def test_figure_check_finds_bad_figures() -> None:
    record = {
        "a_s": float("inf"),
        "b_fraction": 1.5,
        "c": [[0.0, float("nan")]],
        "room_oxidant_rise_fraction": -0.01,
        "d_ohm": -1.0,
    }
    found = list(figure_problems(record))
    assert len(found) == 4, found
    assert json.dumps({"ok": 1.0}, allow_nan=False)


def test_a_loaded_room_computes_to_finite_figures(write_room: Any, book: Rulebook) -> None:
    data = copy.deepcopy(BASE_ROOM)
    data["cases"] = [copy.deepcopy(CASE)]
    _, results = evaluate_room(write_room(data), book)
    record = results.to_record()
    json.dumps(record, allow_nan=False)
    assert list(figure_problems(record)) == []
