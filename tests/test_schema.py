"""`ignite schema`: a JSON Schema (draft 2020-12) of the room file, read from the loader.

Checked with the `jsonschema` reference validator: the sample rooms, the `ignite new`
template and the test rooms the loader accepts validate; mutated rooms (an unknown key, a
word not offered, a bare number for a quantity, a list too long) are rejected.
"""

from __future__ import annotations

import copy
import json
from pathlib import Path
from typing import Any

import jsonschema
import pytest
from click.testing import CliRunner

from ignite.cli import main
from ignite.cli.names import categories
from ignite.room.schema import any_case, json_schema
from ignite.room.source import parse_yaml
from ignite.room.template import TEMPLATE

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = sorted((ROOT / "sample_rooms").glob("*.yaml"))


@pytest.fixture(scope="module")
def printed() -> dict[str, Any]:
    result = CliRunner().invoke(main, ["schema"], catch_exceptions=False)
    assert result.exit_code == 0
    return json.loads(result.output)


@pytest.fixture(scope="module")
def validator(printed: dict[str, Any]) -> jsonschema.Draft202012Validator:
    jsonschema.Draft202012Validator.check_schema(printed)
    return jsonschema.Draft202012Validator(printed)


def _data(text: str) -> Any:
    """The room file as an editor's YAML reader sees it (dates stay text, as the loader reads them)."""
    return parse_yaml(text, "room.yaml").data


def _errors(validator: jsonschema.Draft202012Validator, data: Any) -> list[str]:
    return [f"{list(e.absolute_path)}: {e.message}" for e in validator.iter_errors(data)]


def test_the_printed_schema_is_draft_2020_12(printed):
    assert printed["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    assert printed["additionalProperties"] is False


def test_the_printed_schema_offers_the_names_of_the_rules_in_force(printed, book):
    names = {c.schema_name: c for c in categories(book) if c.schema_name}
    assert set(names) == {"floor criteria", "footwear classes", "materials", "ignition sources"}
    material = printed["properties"]["materials"]["items"]["anyOf"][0]["enum"]
    assert "nonwoven polypropylene" in material and "cotton" in material


@pytest.mark.parametrize("sample", SAMPLES, ids=[s.stem for s in SAMPLES])
def test_the_sample_rooms_validate(validator, sample):
    assert _errors(validator, _data(sample.read_text(encoding="utf-8"))) == []


@pytest.mark.parametrize("name", ["valid-floor-only.yaml", "valid-full.yaml", "warnings.yaml"])
def test_test_rooms_the_loader_accepts_validate(validator, name):
    assert _errors(validator, _data((ROOT / "tests" / "rooms" / name).read_text("utf-8"))) == []


def test_the_template_validates(validator):
    assert _errors(validator, _data(TEMPLATE)) == []


def _mutated(change) -> Any:  # type: ignore[no-untyped-def]
    data = copy.deepcopy(_data(TEMPLATE))
    change(data)
    return data


@pytest.mark.parametrize(
    ("what", "change"),
    [
        ("an unknown key", lambda d: d["cases"][0]["oxygen"].update(flw="3 L/min")),
        ("a missing required key", lambda d: d["environment"].pop("volume")),
        ("a site not offered", lambda d: d["cases"][0].update(site="knee")),
        ("a bare number for a quantity", lambda d: d["environment"].update(volume=150)),
        ("text that is no quantity", lambda d: d["floor"].update(test_voltage="high")),
        ("no people", lambda d: d["people"][0].update(count=0)),
        ("an unknown material", lambda d: d["materials"].append("balsa wood")),
        ("a boolean as text", lambda d: d["cases"][0]["prep"].update(hair="no")),
        ("too many cases", lambda d: d.update(cases=[d["cases"][1]] * 101)),
        ("format 2", lambda d: d.update(format=2)),
        ("a room id with a space", lambda d: d["room"].update(id="T 2")),
        ("a date in another order", lambda d: d["room"].update(assessed_on="18/11/2026")),
    ],
)
def test_a_mutated_template_is_rejected(validator, what, change):
    assert _errors(validator, _mutated(change)), what


@pytest.mark.parametrize(
    "value",
    ["8 mL", "8 to 12 mL", "10 mL ± 2 mL", {"low": "6 mL", "likely": "8 mL", "high": "12 mL"}],
)
def test_quantities_may_be_ranges(validator, value):
    data = _mutated(lambda d: d["cases"][0]["prep"].update(volume=value))
    assert _errors(validator, data) == []


def test_words_and_names_in_any_case_and_prep_none(validator):
    def change(d: Any) -> None:
        d["cases"][0]["site"] = "Head-Neck"
        d["cases"][0]["ignition_sources"] = ["Monopolar Electrosurgery"]
        d["cases"][0]["prep"] = "None"
        d["people"][0]["footwear"] = "ANTISTATIC"
        d["trolleys"] = None

    assert _errors(validator, _mutated(change)) == []


def test_the_loader_accepts_what_the_schema_offers_in_any_case(book):
    """The schema's case-insensitive words are the loader's: each offered word loads."""
    from ignite.pipeline import vocabulary
    from ignite.room.load import load_room_text

    text = TEMPLATE.replace("site: head-neck", "site: HEAD-neck").replace(
        "- monopolar electrosurgery", "- Monopolar Electrosurgery"
    )
    room = load_room_text(text, "t.yaml", vocabulary(book))
    assert room.cases[0].site == "head-neck"


def test_any_case_matches_whole_words_only():
    import re

    pattern = re.compile(any_case(["esd", "pe"]))
    assert pattern.match("ESD") and pattern.match(" pe ")
    assert not pattern.match("esd-control") and not pattern.match("p.e")


def test_without_rules_names_take_any_text():
    schema = json_schema()
    assert schema["properties"]["materials"]["items"]["$ref"] == "#/$defs/text"
