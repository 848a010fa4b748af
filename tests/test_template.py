"""The room-file template written by `ignite new` (ignite.room.template)."""

from __future__ import annotations

import re

import pytest

from ignite.room.load import _CASE, _FLOOR, _OXYGEN, _PERSON, _PREP, _TOP, load_room_text
from ignite.room.model import Vocabulary
from ignite.room.source import load_yaml
from ignite.room.template import TEMPLATE


def test_template_loads_cleanly() -> None:
    room = load_room_text(TEMPLATE, "room.yaml")
    assert room.warnings == ()
    assert room.room.name == "Theatre 2, Brackenmoor Day Surgery Unit"
    assert len(room.cases) == 2
    assert room.cases[1].prep is None


def test_template_loads_with_the_contract_names() -> None:
    # names as the room-file guide spells them; rules/ must know at least these
    vocabulary = Vocabulary(
        floor_criteria=frozenset({"medical-location"}),
        materials=frozenset({"nonwoven polypropylene", "cotton", "polyethylene"}),
        ignition_sources=frozenset(
            {"monopolar electrosurgery", "bipolar electrosurgery", "fibre-optic light cable"}
        ),
    )
    assert load_room_text(TEMPLATE, "room.yaml", vocabulary).warnings == ()


@pytest.mark.parametrize(
    ("section", "keys"),
    [
        ("", _TOP),
        ("floor", _FLOOR),
        ("people[0]", _PERSON),
        ("cases[0]", _CASE),
        ("cases[0].oxygen", _OXYGEN),
        ("cases[0].prep", _PREP),
    ],
)
def test_template_shows_every_key(section: str, keys: dict[str, bool]) -> None:
    _, lines = load_yaml(TEMPLATE, "room.yaml")
    for key in keys:
        assert (f"{section}.{key}" if section else key) in lines


def test_template_comments_explain_options() -> None:
    for options in (
        "pre-list | recommissioning | periodic-audit",
        "isolated (IT supply with insulation monitoring) | earthed",
        "conductive | esd | antistatic | insulating",
        "head-neck | chest | abdomen | pelvis | limb | back",
        "none | nasal-cannula | face-mask | closed-airway",
        "volume | mass",
    ):
        assert options in TEMPLATE


def test_template_lines_fit_a_terminal() -> None:
    assert all(len(line) <= 100 for line in TEMPLATE.splitlines())
    assert not re.search(r"[ \t]+$", TEMPLATE, re.MULTILINE)
