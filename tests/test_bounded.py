"""Bounded work: any room file the loader accepts gives a worksheet (issue 14, item 4).

Regression tests of our own output: rooms at every list limit of `ignite.room.bounds`
and with the longest names are assessed end to end and the PDF is read back; long lists
are summarised, long name lists cut with a mark, and a table row taller than a page is
split rather than refused.
"""

from __future__ import annotations

import dataclasses
import io
import math
import re
import statistics
from pathlib import Path

import big_rooms
import pytest
import worksheet_fixtures as fx
from click.testing import CliRunner
from pypdf import PdfReader

from ignite.cli.main import main
from ignite.report.worksheet import build_view, model, render_worksheet
from ignite.room.bounds import LISTS, TEXT_LENGTH


def _text(data: bytes) -> str:
    reader = PdfReader(io.BytesIO(data))
    return re.sub(r"\s+", " ", " ".join(page.extract_text() for page in reader.pages))


@pytest.mark.parametrize(
    "kwargs",
    [
        # every floor list at its limit; the longest names, in words; 50 sources a case
        pytest.param({}, id="readings-and-names"),
        # 100 people and 100 trolleys named by one unbroken 200-character word
        pytest.param({"people": 100, "trolleys": 100, "spaces": False}, id="people-unbroken"),
        # 100 cases (no prep: the drying solve is not what this test is about)
        pytest.param({"readings_count": 10, "cases": 100, "prep": False}, id="cases"),
    ],
)
def test_rooms_at_the_list_limits_give_a_worksheet(tmp_path: Path, kwargs: dict) -> None:
    room = big_rooms.write_room(tmp_path / "big.yaml", **kwargs)
    out = tmp_path / "big.pdf"
    result = CliRunner().invoke(main, ["assess", str(room), "-o", str(out)])
    assert result.exit_code == 0, result.output
    data = out.read_bytes()
    assert data.startswith(b"%PDF")
    text = _text(data)
    count = kwargs.get("readings_count", LISTS["floor.point_to_ground"].most)
    if count > model.SHORT_LIST:
        assert f"{count} readings: the figures above and the chart below summarise them" in text
        assert f"{count} readings: lowest" in text  # point to point, as statistics
    assert "… and" in text  # 50 ignition sources a case: cut with a mark


def test_the_limits_used_are_the_loaders() -> None:
    # the generated rooms fill the lists the loader allows, no more
    data = big_rooms.room_data(people=100, trolleys=100)
    assert len(data["floor"]["point_to_ground"]) == LISTS["floor.point_to_ground"].most
    assert len(data["floor"]["point_to_point"]) == LISTS["floor.point_to_point"].most
    assert len(data["people"]) == LISTS["people"].most
    assert len(data["trolleys"]) == LISTS["trolleys"].most
    assert len(data["cases"][0]["ignition_sources"]) == LISTS["cases[].ignition_sources"].most
    assert len(data["people"][0]["role"]) == TEXT_LENGTH
    electrical = data["electrical"]
    assert len(electrical["bonding"]) == LISTS["electrical.bonding"].most
    assert len(electrical["equipment"]) == LISTS["electrical.equipment"].most
    assert len(electrical["cases"][0]["connected"]) == LISTS["electrical.cases[].connected"].most


def _long_floor_results(readings: tuple[float, ...], point_to_point: tuple[float, ...]):
    results = fx.full_results()
    low, high = results.floor.window_low_ohm, results.floor.window_high_ohm
    outside = tuple(
        i
        for i, r in enumerate(readings)
        if (low is not None and r < low) or (high is not None and r > high)
    )
    floor = dataclasses.replace(
        results.floor,
        readings_ohm=readings,
        readings_outside=outside,
        point_to_point_ohm=point_to_point,
        passed=not outside,
    )
    return dataclasses.replace(results, floor=floor)


def test_a_long_list_of_readings_lists_only_those_outside_the_window() -> None:
    readings = tuple(100e3 * (1 + i % 7) for i in range(300))
    readings = readings[:40] + (1.0e3,) * 30 + readings[70:]  # 30 below any window
    results = _long_floor_results(readings, ())
    view = build_view(results, fx.RULES, fx.METHODS, fx.FULL_ROOM_FILE)
    outside = results.floor.readings_outside
    assert len(outside) == 30
    listed = [int(row[0]) for row in view.floor_readings.rows]
    assert listed == [i + 1 for i in sorted(outside)][: model.LISTED_OUTSIDE]
    assert all(row[2].startswith("outside") for row in view.floor_readings.rows)
    assert "the first 24 of the 30 outside the window" in view.floor_readings_note
    assert "and 6 more" in view.floor_readings_note


def test_a_short_list_of_readings_is_listed_whole() -> None:
    results = fx.full_results()
    view = build_view(results, fx.RULES, fx.METHODS, fx.FULL_ROOM_FILE)
    assert len(view.floor_readings.rows) == len(results.floor.readings_ohm)
    assert view.floor_readings_note == ""


def test_long_point_to_point_readings_are_given_as_statistics() -> None:
    p2p = tuple(10 ** (4 + (i * 37 % 100) / 25) for i in range(200))
    view = build_view(_long_floor_results((1e5,) * 5, p2p), fx.RULES, fx.METHODS, fx.FULL_ROOM_FILE)
    row = dict(view.floor_summary.rows)[model.say.FLOOR_POINT_TO_POINT]
    lowest_at = p2p.index(min(p2p)) + 1
    highest_at = p2p.index(max(p2p)) + 1
    assert row.startswith("200 readings: lowest")
    assert f"(point {lowest_at})" in row and f"(point {highest_at})" in row
    # the means checked against the standard library, not our own arithmetic
    gmean = statistics.geometric_mean(p2p)
    mean = statistics.fmean(p2p)
    assert model.format_si(gmean, "Ω") in row
    assert model.format_si(mean, "Ω") in row
    assert math.isfinite(gmean)


def test_names_are_cut_with_a_mark() -> None:
    names = [f"source {i}" for i in range(50)]
    text = model.names(names)
    assert text.endswith(f"… and {50 - model.NAMES_SHOWN} more")
    assert text.startswith("source 0, source 1")
    assert model.names(names[:3]) == "source 0, source 1, source 2"
    long = ["x" * 200] * 5
    assert model.names(long).endswith("… and 4 more")  # one long name is always given


def test_a_row_taller_than_a_page_is_split_not_refused(monkeypatch: pytest.MonkeyPatch) -> None:
    from reportlab.platypus.doctemplate import LayoutError

    from ignite.report.worksheet import pdf

    results = fx.full_results()
    first = results.findings[0]
    detail = " ".join(f"word{i}" for i in range(6000))
    results = dataclasses.replace(
        results, findings=(dataclasses.replace(first, detail=detail), *results.findings[1:])
    )
    data = render_worksheet(results, fx.RULES, fx.METHODS, fx.FULL_ROOM_FILE)
    text = _text(data)
    assert "word0 " in text and "word5999" in text  # nothing lost
    # without the in-row split, the same worksheet cannot be laid out
    monkeypatch.setattr(pdf, "TALL_ROW", math.inf)
    with pytest.raises(LayoutError):
        render_worksheet(results, fx.RULES, fx.METHODS, fx.FULL_ROOM_FILE)


def test_an_audit_of_a_room_at_the_limits_writes_its_summary(tmp_path: Path) -> None:
    rooms = tmp_path / "rooms"
    rooms.mkdir()
    big_rooms.write_room(rooms / "big.yaml", spaces=False)  # hundreds of points outside
    out = tmp_path / "out"
    result = CliRunner().invoke(main, ["audit", str(rooms), "-o", str(out), "--jobs", "1"])
    assert result.exit_code == 0, result.output
    text = _text((out / "audit-summary.pdf").read_bytes())
    assert "… and" in text  # the test points outside the window, cut with a mark
    assert len(list(out.glob("*.pdf"))) == 2  # the worksheet and the summary


def test_a_room_at_the_limits_gives_a_letter_worksheet(tmp_path: Path) -> None:
    room = big_rooms.write_room(tmp_path / "big.yaml", people=100, spaces=False)
    out = tmp_path / "big.pdf"
    result = CliRunner().invoke(main, ["assess", str(room), "-o", str(out), "--paper", "letter"])
    assert result.exit_code == 0, result.output
    assert len(PdfReader(out).pages) > 10


# --- a solve that runs out of steps stops with a clear error, never a hang --------------


def test_a_drying_solve_past_its_step_budget_is_an_internal_error_naming_the_case(
    monkeypatch, tmp_path
):
    from ignite.simulate import drying

    monkeypatch.setattr(drying, "MAX_EVALUATIONS", 5)
    room = Path(__file__).parent.parent / "sample_rooms" / "day-surgery-head-neck.yaml"
    result = CliRunner().invoke(main, ["check", str(room)])
    assert result.exit_code == 4, result.output
    assert "the drying solve (open air) of preparation" in result.output
    assert "stopped after 5 steps without finishing" in result.output
    assert re.search(r"case \S+: the drying solve", result.output)
    assert "Traceback" not in result.output
