"""Ranges in the room file and the rules (ignite.room.ranges), and what a sampled run adds.

Regression tests of our own behaviour; the checks against independent results (closed
forms) are in tests/validation/test_uncertainty.py.
"""

from __future__ import annotations

import copy
import json
import math
import shutil
from pathlib import Path
from typing import Any

import numpy as np
import pytest
import yaml
from click.testing import CliRunner
from conftest import BASE_ROOM, ROOT
from conftest import SEDATION_CASE as OXYGEN_CASE

from ignite.cli.main import main
from ignite.errors import InputError, RuleFileError, UnitError
from ignite.pipeline import open_rulebook, run_room
from ignite.room.load import load_room_text
from ignite.room.ranges import Sampling, parse_range, sampling_seed
from ignite.rules.bind import bind
from ignite.rules.rulebook import load_rulebook


def oxygen_room(**changes: Any) -> dict[str, Any]:
    """The base room with one oxygen case and no prep (no drying: fast to sample)."""
    data = copy.deepcopy(BASE_ROOM)
    case = copy.deepcopy(OXYGEN_CASE)
    for key, value in changes.items():
        section, _, name = key.rpartition(".")
        target = case[section] if section else case
        target[name] = value
    data["cases"] = [case]
    return data


def write(tmp_path: Path, data: dict[str, Any], name: str = "room.yaml") -> Path:
    path = tmp_path / name
    path.write_text(yaml.safe_dump(data, allow_unicode=True, sort_keys=False), encoding="utf-8")
    return path


# --- the syntax ------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("text", "kind", "central", "low", "high", "spread"),
    [
        ("8 to 12 mL", "uniform", 10e-6, 8e-6, 12e-6, 0.0),
        ("8 mL to 12 mL", "uniform", 10e-6, 8e-6, 12e-6, 0.0),
        ("10 mL ± 2 mL", "normal", 10e-6, 0.0, math.inf, 2e-6),
        ("10 mL +/- 2 mL", "normal", 10e-6, 0.0, math.inf, 2e-6),
        ("10 mL ± 2", "normal", 10e-6, 0.0, math.inf, 2e-6),
    ],
)
def test_range_syntax(text, kind, central, low, high, spread) -> None:
    found = parse_range(text, "volume", 0.0, math.inf)
    assert found is not None
    assert found.kind == kind
    assert found.central == pytest.approx(central, rel=1e-12)
    assert found.low == pytest.approx(low, rel=1e-12)
    assert found.high == pytest.approx(high, rel=1e-12) or math.isinf(high)
    assert found.spread == pytest.approx(spread, rel=1e-12)


def test_triangle_and_temperature_spread() -> None:
    triangle = parse_range({"low": "6 mL", "likely": "10 mL", "high": "20 mL"}, "volume")
    assert triangle is not None and triangle.kind == "triangular"
    assert triangle.central == pytest.approx(10e-6)
    # a spread in degC is a difference: 2 K, not 275 K
    warm = parse_range("32 degC ± 2 degC", "temperature")
    assert warm is not None and warm.spread == pytest.approx(2.0)


def test_a_plain_value_is_no_range() -> None:
    assert parse_range("10 mL", "volume") is None


@pytest.mark.parametrize(
    ("text", "fragment"),
    [
        ("12 to 8 mL", "low end is above the high end"),
        ("10 mL ± -2 mL", "must not be negative"),
        ("8 to 12 kg", "expected a volume"),
    ],
)
def test_bad_ranges(text, fragment) -> None:
    with pytest.raises(UnitError, match=fragment):
        parse_range(text, "volume")


def test_bad_triangle() -> None:
    with pytest.raises(UnitError, match="low ≤ likely ≤ high"):
        parse_range({"low": "6 mL", "likely": "30 mL", "high": "20 mL"}, "volume")
    with pytest.raises(UnitError, match="missing high"):
        parse_range({"low": "6 mL", "likely": "10 mL"}, "volume")


def test_quantiles_of_each_kind() -> None:
    u = np.array([0.0, 0.5, 0.999999])
    uniform = parse_range("8 to 12 mL", "volume")
    assert uniform is not None
    assert uniform.values(u)[1] == pytest.approx(10e-6)
    triangle = parse_range({"low": "0 mL", "likely": "0 mL", "high": "10 mL"}, "volume")
    assert triangle is not None
    # a right triangle from its mode: F(x) = 1 - (1 - x/10)², median at 10·(1 - √½)
    assert triangle.values(np.array([0.5]))[0] == pytest.approx(10e-6 * (1 - 0.5**0.5))
    normal = parse_range("10 mL ± 2 mL", "volume", 0.0, math.inf)
    assert normal is not None
    # 84.13 % of a normal lies below mean + 1 SD (the ± is one standard deviation)
    assert normal.values(np.array([0.841345]))[0] == pytest.approx(12e-6, rel=1e-4)


# --- the loader --------------------------------------------------------------------------


def test_loader_keeps_the_spread_and_the_central_value() -> None:
    data = oxygen_room(**{"drape_pocket.exchange": "8 to 12 L/min"})
    room = load_room_text(yaml.safe_dump(data), "room.yaml")
    assert room.cases[0].drape_pocket.exchange == pytest.approx(10e-3 / 60)
    assert dict(room.ranges)["cases[0].drape_pocket.exchange"].kind == "uniform"


@pytest.mark.parametrize(
    ("key", "value", "fragment"),
    [
        ("drape_pocket.exchange", "12 to 8 L/min", "low end is above the high end"),
        ("drape_pocket.exchange", "10 L/min ± -1 L/min", "must not be negative"),
        ("drape_pocket.exchange", "8 to 12 mL", "expected a volume flow"),
        ("drape_pocket.volume", "-5 to 30 L", "at every point of the range"),
    ],
)
def test_bad_ranges_exit_3_naming_file_line_and_key(tmp_path, key, value, fragment) -> None:
    path = write(tmp_path, oxygen_room(**{key: value}))
    result = CliRunner().invoke(main, ["check", str(path)])
    assert result.exit_code == 3
    line = next(
        n
        for n, text in enumerate(path.read_text(encoding="utf-8").splitlines(), 1)
        if key.split(".")[-1] + ":" in text and value.split()[0] in text
    )
    assert f"room.yaml:{line}: cases[0].{key}:" in result.stderr
    assert fragment in result.stderr


def test_a_range_where_none_is_taken_is_refused() -> None:
    data = copy.deepcopy(BASE_ROOM)
    data["environment"]["volume"] = "100 to 140 m^3"
    with pytest.raises(InputError, match="a range is taken only where"):
        load_room_text(yaml.safe_dump(data), "room.yaml")


def test_measured_footwear_may_be_a_range() -> None:
    data = copy.deepcopy(BASE_ROOM)
    data["people"][0]["footwear"] = {"low": "20 MΩ", "likely": "40 MΩ", "high": "80 MΩ"}
    room = load_room_text(yaml.safe_dump(data), "room.yaml")
    assert room.people[0].footwear.resistance == pytest.approx(40e6)
    assert "people[0].footwear" in dict(room.ranges)


# --- rules --------------------------------------------------------------------------------


def test_rule_ranges_hold_the_value_in_force(book) -> None:
    ranges = book.of_kind("ranges")
    assert ranges, "rules/ranges.yaml"
    for entry in ranges:
        assert entry.source and entry.flag


def _rules_copy(tmp_path: Path) -> Path:
    folder = tmp_path / "rules"
    shutil.copytree(ROOT / "rules", folder)
    return folder


def test_a_rule_range_of_the_wrong_unit_is_refused(tmp_path) -> None:
    folder = _rules_copy(tmp_path)
    path = folder / "ranges.yaml"
    path.write_text(
        path.read_text(encoding="utf-8").replace("0.23 to 0.28 mJ", "0.23 to 0.28 mm"),
        encoding="utf-8",
    )
    with pytest.raises(RuleFileError, match="incompatible units"):
        load_rulebook(folder)


def test_a_rule_range_must_hold_the_value_in_force(tmp_path) -> None:
    folder = _rules_copy(tmp_path)
    path = folder / "ranges.yaml"
    path.write_text(
        path.read_text(encoding="utf-8").replace("0.23 to 0.28 mJ", "0.30 to 0.40 mJ"),
        encoding="utf-8",
    )
    with pytest.raises(RuleFileError, match="does not hold the value in force"):
        load_rulebook(folder)


def test_rule_ranges_and_probability_checks_only_for_a_sampled_room(book) -> None:
    plain = load_room_text(yaml.safe_dump(oxygen_room()), "room.yaml")
    bound = bind(plain, book)
    assert bound.spreads == () and bound.uncertainty is None
    assert not any(c.reads.startswith("case.probability_") for c in bound.checks)
    assert not any(i.startswith("spread.") for i in bound.consulted)
    sampled = bind(plain, book, uncertain=True)
    assert sampled.uncertainty is not None
    assert any(c.reads.startswith("case.probability_") for c in sampled.checks)


# --- a sampled run ---------------------------------------------------------------------------


def test_a_room_without_ranges_has_no_uncertainty_keys(tmp_path, book) -> None:
    record = run_room(write(tmp_path, oxygen_room()), book).to_record()
    assert "uncertainty" not in record
    assert all("uncertainty" not in case for case in record["cases"])
    assert all("uncertainty" not in person for person in record["people"])


def test_nominal_gives_the_record_of_the_central_values(tmp_path, book) -> None:
    ranged = run_room(
        write(tmp_path, oxygen_room(**{"drape_pocket.exchange": "8 to 12 L/min"}), "a.yaml"),
        book,
        Sampling(nominal=True),
    ).to_record()
    plain = run_room(
        write(tmp_path, oxygen_room(**{"drape_pocket.exchange": "10 L/min"}), "b.yaml"), book
    ).to_record()
    for record in (ranged, plain):
        record.pop("input_sha256")
    assert ranged == plain


def test_sampled_output_is_byte_identical_run_to_run(tmp_path) -> None:
    path = write(tmp_path, oxygen_room(**{"drape_pocket.exchange": "8 L/min ± 2 L/min"}))
    runs = [
        CliRunner().invoke(main, ["check", str(path), "--format", "json", "--samples", "50"])
        for _ in range(2)
    ]
    assert runs[0].exit_code == 0, runs[0].stderr
    assert runs[0].stdout == runs[1].stdout
    (record,) = json.loads(runs[0].stdout)
    spread = record["cases"][0]["uncertainty"]
    assert spread["samples"] == 50
    washout = spread["percentiles"]["washout_s"]
    assert washout["p5"] <= washout["p50"] <= washout["p95"]
    assert record["uncertainty"]["seed"] == sampling_seed(
        record["input_sha256"], record["rules_sha256"], "50"
    )
    # the pocket's exchange drives the washout, and nothing else of this room can
    drivers = spread["drivers"]["washout_s"]
    assert [d["input"] for d in drivers] == ["cases[0].drape_pocket.exchange"]
    assert drivers[0]["rank_correlation"] < -0.99


def test_confidence_moves_the_wait_and_is_stated(tmp_path) -> None:
    path = write(tmp_path, oxygen_room(**{"drape_pocket.exchange": "6 to 14 L/min"}))

    def stop(*options: str) -> tuple[float, str]:
        result = CliRunner().invoke(main, ["check", str(path), "--samples", "50", *options])
        assert result.exit_code == 0, result.stderr
        record = json.loads(
            CliRunner()
            .invoke(main, ["check", str(path), "--format", "json", "--samples", "50", *options])
            .stdout
        )[0]
        return record["cases"][0]["uncertainty"]["decisions"][
            "stop_oxygen_at_least_s"
        ], result.stdout

    at_95, text_95 = stop()
    at_80, text_80 = stop("--confidence", "80")
    assert at_80 < at_95
    assert "95th percentile" in text_95 and "80th percentile" in text_80


def test_a_probability_at_the_limit_is_a_finding(tmp_path, book) -> None:
    # planned stop 60 s against a washout of several minutes: enriched in every sample
    path = write(tmp_path, oxygen_room(**{"drape_pocket.exchange": "8 to 12 L/min"}))
    results = run_room(path, book, Sampling(samples=20))
    rules = {f.rule for f in results.findings}
    assert "spread.enriched-at-activation" in rules
    assert results.uncertainty is not None and results.uncertainty.worst_probability == 1.0


def test_stop_advice_uses_the_conservative_percentile(tmp_path, book) -> None:
    path = write(tmp_path, oxygen_room(**{"drape_pocket.exchange": "6 to 14 L/min"}))
    results = run_room(path, book, Sampling(samples=50))
    case = results.cases[0]
    assert case.spread is not None
    decided = case.spread.decision("stop_oxygen_at_least_s")
    assert decided is not None and case.required_stop_s is not None
    assert decided > case.required_stop_s  # slower exchange than the central value
    advice = next(f for f in results.findings if f.rule == "oxygen.enriched-at-activation")
    minutes = math.ceil(decided / 60.0 - 1e-9) if decided > 600 else None
    assert any("Stop" in m or "stop" in m for m in advice.mitigations)
    if minutes is not None:
        assert any(f"{minutes} min" in m for m in advice.mitigations)


def test_register_gains_worst_probability_at_the_end() -> None:
    from ignite.audit.io import CSV_COLUMNS

    assert CSV_COLUMNS[-1] == "worst_probability"


def test_template_shows_a_range() -> None:
    from ignite.room.template import TEMPLATE

    room = load_room_text(TEMPLATE, "room.yaml")
    assert room.ranges


def test_rulebook_is_shared(book) -> None:
    assert open_rulebook() is book
