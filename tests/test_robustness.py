"""Any valid-looking variation of a room gives results or an input error, never a crash."""

from __future__ import annotations

import copy
from typing import Any

import yaml
from click.testing import CliRunner
from conftest import BASE_ROOM
from conftest import FOREARM_CASE as CASE
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from ignite.cli.main import main

PATHS = [
    ("environment", "relative_humidity", "%"),
    ("environment", "temperature", "degC"),
    ("environment", "air_changes", "/h"),
    ("floor", "test_voltage", "V"),
    ("room", "mains", "voltage", "V"),
]
CASE_PATHS = [
    ("oxygen", "flow", "L/min"),
    ("oxygen", "fraction", "%"),
    ("oxygen", "nitrous_oxide_flow", "L/min"),
    ("oxygen", "stop_before_activation", "s"),
    ("drape_pocket", "volume", "L"),
    ("drape_pocket", "exchange", "L/min"),
    ("draping_after", "s"),
    ("first_activation_after", "s"),
    ("air_speed", "m/s"),
]

numbers = st.one_of(
    st.sampled_from([0, 1e-9, 0.5, 1, 20.9, 100, 150, 1e6, 1e12]),
    st.floats(min_value=-10, max_value=1e4, allow_nan=False, allow_infinity=False),
)


def _set(data: dict[str, Any], path: tuple[str, ...], value: Any) -> None:
    for key in path[:-1]:
        data = data[key]
    data[path[-1]] = value


@settings(
    max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(
    room_changes=st.lists(st.tuples(st.sampled_from(PATHS), numbers), max_size=3),
    case_changes=st.lists(st.tuples(st.sampled_from(CASE_PATHS), numbers), max_size=4),
    readings=st.lists(st.floats(min_value=1e-3, max_value=1e15), min_size=1, max_size=6),
    footwear=st.sampled_from(
        ["conductive", "esd", "antistatic", "insulating", "40 MΩ", "1 Ω", "0 Ω"]
    ),
)
def test_variations_never_crash(tmp_path, room_changes, case_changes, readings, footwear):
    data = copy.deepcopy(BASE_ROOM)
    data["cases"] = [copy.deepcopy(CASE)]
    for path, number in room_changes:
        *keys, unit = path
        _set(data, tuple(keys), f"{number} {unit}")
    for path, number in case_changes:
        *keys, unit = path
        _set(data["cases"][0], tuple(keys), f"{number} {unit}")
    data["floor"]["point_to_ground"] = [f"{r} Ω" for r in readings]
    data["people"][0]["footwear"] = footwear
    path = tmp_path / "room.yaml"
    path.write_text(yaml.safe_dump(data, allow_unicode=True), encoding="utf-8")
    result = CliRunner().invoke(main, ["check", str(path), "--format", "json"])
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    assert result.exit_code in (0, 1, 3), result.output


@settings(
    max_examples=30, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(
    components=st.dictionaries(
        st.sampled_from(
            ["isopropanol", "ethanol", "water", "67-63-0", "acetone", "glycerol", "unobtainium", ""]
        ),
        st.sampled_from(["0 %", "1 %", "30 %", "62 %", "70 %", "99.9 %", "100 %", "70", "70 kg"]),
        min_size=1,
        max_size=3,
    ),
    basis=st.sampled_from(["volume", "mass", "weight"]),
    volume=st.sampled_from(["0 mL", "0.01 mL", "10 mL", "500 mL"]),
    area=st.sampled_from(["1 cm^2", "400 cm^2", "1 m^2"]),
    hair=st.booleans(),
    pooling=st.booleans(),
    skin=st.sampled_from(["25 degC", "32 degC", "41 degC", "60 degC"]),
)
def test_preparation_variations_never_crash(
    tmp_path, components, basis, volume, area, hair, pooling, skin
):
    data = copy.deepcopy(BASE_ROOM)
    data["preparations"] = [
        {"id": "p", "label": "test prep", "basis": basis, "components": components}
    ]
    case = copy.deepcopy(CASE)
    case["prep"] = {
        "preparation": "p",
        "volume": volume,
        "area": area,
        "hair": hair,
        "pooling": pooling,
        "skin_temperature": skin,
    }
    data["cases"] = [case]
    path = tmp_path / "room.yaml"
    path.write_text(yaml.safe_dump(data, allow_unicode=True), encoding="utf-8")
    result = CliRunner().invoke(main, ["check", str(path), "--format", "json"])
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    assert result.exit_code in (0, 1, 3), result.output
    assert "internal error" not in result.stderr


def test_record_is_valid_json_with_null_and_a_reason_for_what_does_not_exist(
    room_data: dict[str, Any], assess_data: Any
) -> None:
    """A pocket that never clears: null with a reason, never a bare Infinity or NaN."""
    import dataclasses
    import json
    import math

    from ignite.records.results import Amount

    room_data["cases"] = [copy.deepcopy(CASE)]
    results = assess_data(room_data)
    case = dataclasses.replace(
        results.cases[0],
        washout_s=math.inf,
        drying_time_s=math.inf,
        oxygen_curve=((math.nan, 0.5), (math.inf, 0.209)),
    )
    finding = dataclasses.replace(results.findings[0], measured=Amount(math.inf, "s"))
    changed = dataclasses.replace(results, cases=(case,), findings=(finding,))
    record = changed.to_record()
    text = json.dumps(record, allow_nan=False)  # raises on NaN or Infinity
    assert "Infinity" not in text and "NaN" not in text
    (case_record,) = record["cases"]
    assert case_record["washout_s"] is None
    assert case_record["washout_note"].startswith("never: the pocket does not fall back")
    assert case_record["drying_time_s"] is None
    assert case_record["drying_time_note"].startswith("never:")
    assert case_record["oxygen_curve"] == [[None, 0.5], [None, 0.209]]
    measured = record["findings"][0]["measured"]
    assert measured == {
        "value": None,
        "unit": "s",
        "note": "never: the time is infinite in the model",
    }
    # finite records are unchanged: no note keys appear
    plain = results.to_record()
    assert not any(key.endswith("_note") for key in plain["cases"][0])
    assert json.loads(json.dumps(plain, allow_nan=False)) == plain
