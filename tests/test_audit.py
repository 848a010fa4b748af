"""`ignite audit`: a folder of rooms in; worksheets, a register and a summary out.

The checks lean on references outside the project where there is one: the register's
hashes against `hashlib` (FIPS 180-4 SHA-256), its CSV against the standard `csv`
module, the worksheets and the summary against `pypdf`, and the floor verdicts against
the IEC 60364-7-710 window for medical locations (each reading > 50 kΩ at a supply up
to 500 V, and ≤ 25 MΩ; published, as adopted in NEK 400:710).
"""

from __future__ import annotations

import copy
import csv
import hashlib
import json
import time
from pathlib import Path
from typing import Any

import pytest
import yaml
from click.testing import CliRunner
from conftest import BASE_ROOM
from pypdf import PdfReader

from ignite.audit.compare import compare
from ignite.audit.io import REGISTER_CSV, REGISTER_JSON, SUMMARY_PDF, read_register
from ignite.audit.run import STAGING_PREFIX, discover_rooms
from ignite.cli.main import main
from ignite.records.register import ASSESSED, FindingKey, RegisterRow


def room(room_id: str, readings: list[str], **room_fields: Any) -> dict[str, Any]:
    data = copy.deepcopy(BASE_ROOM)
    data["room"]["id"] = room_id
    data["room"]["name"] = f"Theatre {room_id}, Test Valley Clinic"
    data["room"].update(room_fields)
    data["floor"]["point_to_ground"] = readings
    return data


def write(folder: Path, name: str, data: dict[str, Any]) -> Path:
    path = folder / name
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(yaml.safe_dump(data, allow_unicode=True, sort_keys=False), encoding="utf-8")
    return path


def audit(*args: str | Path) -> Any:
    return CliRunner().invoke(main, ["audit", *map(str, args)], catch_exceptions=False)


def csv_rows(path: Path) -> list[dict[str, str]]:
    with path.open(newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


def pdf_text(path: Path) -> str:
    """The text of a PDF, white space folded (line breaks fall where the layout puts them)."""
    return " ".join(" ".join(page.extract_text() for page in PdfReader(path).pages).split())


def sha256(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def snapshot(folder: Path) -> dict[str, bytes]:
    return {
        p.relative_to(folder).as_posix(): p.read_bytes() for p in folder.rglob("*") if p.is_file()
    }


@pytest.fixture
def site(tmp_path: Path) -> Path:
    """Three valid rooms (one in a subfolder, one .yml) and a broken one."""
    rooms = tmp_path / "rooms"
    write(rooms, "t1.yaml", room("T1", ["200 kΩ", "300 kΩ", "400 kΩ"]))
    # 25 MΩ is inside the window (≤ 25 MΩ, IEC 60364-7-710, published)
    write(rooms, "east/t2.yml", room("T2", ["120 kΩ", "25 MΩ"]))
    # 30 MΩ at point 3 is above it
    write(rooms, "east/t3.yaml", room("T3", ["100 kΩ", "1 MΩ", "30 MΩ"]))
    (rooms / "broken.yaml").write_text(
        "format: 1\nroom:\n  id: BAD\nfloor:\n  point_to_ground: [5 kg]\n", encoding="utf-8"
    )
    (rooms / "notes.txt").write_text("not a room", encoding="utf-8")
    return rooms


def test_a_broken_room_never_stops_the_others(site: Path, tmp_path: Path) -> None:
    out = tmp_path / "out"
    result = audit(site, "-o", out, "--jobs", "2")
    assert result.exit_code == 3, result.output
    # every valid room has its worksheet, a PDF that opens
    for name in ("T1-2026-12-01.pdf", "T2-2026-12-01.pdf", "T3-2026-12-01.pdf"):
        assert len(PdfReader(out / name).pages) >= 1
    rows = {row["file"]: row for row in csv_rows(out / REGISTER_CSV)}
    assert set(rows) == {"broken.yaml", "east/t2.yml", "east/t3.yaml", "t1.yaml"}
    broken = rows["broken.yaml"]
    assert broken["status"] == "invalid" and broken["worksheet"] == ""
    assert "broken.yaml:" in broken["problems"] and "point_to_ground" in broken["problems"]
    assert "broken.yaml" in result.stderr
    # nothing half-written or staged is left behind
    assert not [p for p in out.iterdir() if p.name.startswith(".")]
    assert "never replace" in result.stderr


def test_verdicts_follow_the_published_window(site: Path, tmp_path: Path) -> None:
    out = tmp_path / "out"
    audit(site, "-o", out, "--jobs", "1")
    rows = {row["room_id"]: row for row in csv_rows(out / REGISTER_CSV) if row["room_id"]}
    # IEC 60364-7-710 (published): each reading > 50 kΩ and ≤ 25 MΩ
    assert rows["T1"]["floor_verdict"] == "pass"
    assert rows["T2"]["floor_verdict"] == "pass"  # 25 MΩ exactly is allowed
    assert rows["T3"]["floor_verdict"] == "fail"
    assert rows["T3"]["points_outside"] == "3"
    assert float(rows["T3"]["highest_reading_ohm"]) == 30e6
    assert float(rows["T3"]["window_high_ohm"]) == 25e6
    assert float(rows["T1"]["window_low_ohm"]) == 50e3
    assert rows["T3"]["worst_severity"] != "none"
    assert "floor.reading-above-window" in rows["T3"]["findings"]
    assert "floor.reading" not in rows["T1"]["findings"]


def test_register_csv_reads_back_and_its_hashes_match(site: Path, tmp_path: Path) -> None:
    out = tmp_path / "out"
    audit(site, "-o", out, "--jobs", "1")
    rows = csv_rows(out / REGISTER_CSV)
    assert len(rows) == len(discover_rooms(site)) == 4  # one row per room file
    record = json.loads((out / REGISTER_JSON).read_text(encoding="utf-8"))
    assert [r["file"] for r in record["rooms"]] == [r["file"] for r in rows]
    for row, room_record in zip(rows, record["rooms"], strict=True):
        # the input hash is SHA-256 of the file's bytes (FIPS 180-4, via hashlib)
        assert row["input_sha256"] == sha256(site / row["file"]) == room_record["input_sha256"]
        if row["status"] == ASSESSED:
            assert row["worksheet_sha256"] == sha256(out / row["worksheet"])
            readings = [float(r) for r in row["readings_ohm"].split(";")]
            assert readings == room_record["readings_ohm"]
            assert float(row["lowest_reading_ohm"]) == min(readings)
            counts = sum(int(row[s]) for s in ("high", "medium", "low", "note"))
            assert counts == len(row["findings"].splitlines()) == len(room_record["findings"])
    assert record["totals"]["room_files"] == 4 and record["totals"]["invalid"] == 1
    assert "never replace" in record["caution"]


def test_changes_since_the_previous_audit(site: Path, tmp_path: Path) -> None:
    first = tmp_path / "first"
    assert audit(site, "-o", first, "--jobs", "1").exit_code == 3
    # since then: T1 leaves its window, T3 re-enters it, T2 is removed, T4 is new
    write(site, "t1.yaml", room("T1", ["200 kΩ", "40 MΩ", "400 kΩ"]))
    write(site, "east/t3.yaml", room("T3", ["100 kΩ", "1 MΩ", "20 MΩ"]))
    (site / "east/t2.yml").unlink()
    write(site, "t4.yaml", room("T4", ["150 kΩ"]))
    second = tmp_path / "second"
    result = audit(site, "-o", second, "--jobs", "1", "--previous", first / REGISTER_JSON)
    assert result.exit_code == 3, result.output

    record = json.loads((second / REGISTER_JSON).read_text(encoding="utf-8"))
    changes = {r["room_id"] or r["file"]: r["change_since_previous"] for r in record["rooms"]}
    assert changes["T1"]["window_event"] == "left its window"
    assert changes["T1"]["points_moved"] == [2]
    assert changes["T1"]["readings_then_ohm"][1] == 300e3
    assert changes["T1"]["readings_now_ohm"][1] == 40e6
    assert {f["rule"] for f in changes["T1"]["findings_appeared"]} == {"floor.reading-above-window"}
    assert changes["T3"]["window_event"] == "re-entered its window"
    assert "floor.reading-above-window" in {f["rule"] for f in changes["T3"]["findings_cleared"]}
    assert changes["T4"]["kind"] == "new"
    assert [g["room_id"] for g in record["rooms_gone"]] == ["T2"]

    csv_change = {r["room_id"]: r["change_since_previous"] for r in csv_rows(second / REGISTER_CSV)}
    assert "left its window" in csv_change["T1"] and "#2 300 kΩ → 40 MΩ" in csv_change["T1"]

    text = pdf_text(second / SUMMARY_PDF)
    assert "Changes since the previous audit" in text
    assert "Left their window: T1" in text and "Re-entered their window: T3" in text
    assert "Gone since then: T2" in text and "New since then: T4" in text
    assert "300 kΩ → 40 MΩ" in text
    assert "Floor readings then and now" in text

    # the CSV register of the first audit tells the same story as its JSON
    third = tmp_path / "third"
    audit(site, "-o", third, "--jobs", "1", "--previous", first / REGISTER_CSV)
    again = json.loads((third / REGISTER_JSON).read_text(encoding="utf-8"))
    assert [r["change_since_previous"] for r in again["rooms"]] == [
        r["change_since_previous"] for r in record["rooms"]
    ]


def test_readings_changed_in_an_earlier_register_show_as_moved(site: Path, tmp_path: Path) -> None:
    first = tmp_path / "first"
    audit(site, "-o", first, "--jobs", "1")
    rows = csv_rows(first / REGISTER_CSV)
    for row in rows:
        if row["room_id"] == "T1":
            row["readings_ohm"] = "200000.0; 350000.0; 400000.0"
    edited = tmp_path / "edited.csv"
    with edited.open("w", newline="", encoding="utf-8") as handle:
        writer = csv.DictWriter(handle, fieldnames=list(rows[0]))
        writer.writeheader()
        writer.writerows(rows)
    second = tmp_path / "second"
    audit(site, "-o", second, "--jobs", "1", "--previous", edited)
    change = {r["room_id"]: r["change_since_previous"] for r in csv_rows(second / REGISTER_CSV)}
    assert change["T1"] == "1 of 3 readings moved: #2 350 kΩ → 300 kΩ"
    assert change["T2"] == change["T3"] == "no change"
    assert "#2: 350 kΩ → 300 kΩ" in pdf_text(second / SUMMARY_PDF)


def test_an_earlier_audit_is_never_overwritten_without_force(site: Path, tmp_path: Path) -> None:
    out = tmp_path / "out"
    audit(site, "-o", out, "--jobs", "1")
    before = snapshot(out)
    write(site, "t1.yaml", room("T1", ["200 kΩ", "40 MΩ", "400 kΩ"]))
    refused = audit(site, "-o", out, "--jobs", "1")
    assert refused.exit_code == 2
    assert "--force" in refused.stderr and "nothing was written" in refused.stderr
    assert snapshot(out) == before
    forced = audit(site, "-o", out, "--jobs", "1", "--force")
    assert forced.exit_code == 3  # the broken room is still there
    rows = {r["room_id"]: r for r in csv_rows(out / REGISTER_CSV)}
    assert rows["T1"]["floor_verdict"] == "fail"
    assert rows["T1"]["worksheet_sha256"] == sha256(out / rows["T1"]["worksheet"])
    assert (out / rows["T1"]["worksheet"]).read_bytes() != before[rows["T1"]["worksheet"]]


def test_a_worksheet_of_another_origin_is_not_replaced(site: Path, tmp_path: Path) -> None:
    out = tmp_path / "out"
    out.mkdir()
    (out / "T1-2026-12-01.pdf").write_bytes(b"someone else's file")
    result = audit(site, "-o", out, "--jobs", "1")
    assert result.exit_code == 2
    assert sorted(p.name for p in out.iterdir()) == ["T1-2026-12-01.pdf"]
    assert (out / "T1-2026-12-01.pdf").read_bytes() == b"someone else's file"


def test_an_interrupted_audit_can_simply_be_run_again(site: Path, tmp_path: Path) -> None:
    out = tmp_path / "out"
    audit(site, "-o", out, "--jobs", "1")
    complete = snapshot(out)
    # as if stopped after the worksheets were in place but before the register, and with
    # a staging folder left by a process that no longer exists
    for name in (REGISTER_CSV, REGISTER_JSON, SUMMARY_PDF):
        (out / name).unlink()
    stale = out / f"{STAGING_PREFIX}999999999-x"
    stale.mkdir()
    (stale / "000000.pdf").write_bytes(b"%PDF half")
    result = audit(site, "-o", out, "--jobs", "1")
    assert result.exit_code == 3
    assert snapshot(out) == complete  # same files, same bytes: the build is deterministic


def test_the_outputs_do_not_depend_on_the_number_of_workers(site: Path, tmp_path: Path) -> None:
    one, two = tmp_path / "one", tmp_path / "two"
    audit(site, "-o", one, "--jobs", "1")
    audit(site, "-o", two, "--jobs", "2")
    assert snapshot(one) == snapshot(two)


def test_summary_lists_rooms_verdicts_worst_findings_and_cautions(
    site: Path, tmp_path: Path
) -> None:
    out = tmp_path / "out"
    audit(site, "-o", out, "--jobs", "1", "--paper", "letter")
    reader = PdfReader(out / SUMMARY_PDF)
    text = pdf_text(out / SUMMARY_PDF)
    for expected in (
        "Rooms and their verdicts",
        "✘ FAIL",
        "✔ PASS",
        "T3",
        "broken.yaml",
        "The worst findings across the site",
        "never replace",
        "licensed professional",
    ):
        assert expected in text
    total = len(reader.pages)
    for number, page in enumerate(reader.pages, start=1):
        footer = page.extract_text()
        assert f"Page {number} of {total}" in footer and "ignite " in footer
        assert "Rules SHA-256" in footer
    width, height = float(reader.pages[0].mediabox.width), float(reader.pages[0].mediabox.height)
    assert (round(width), round(height)) == (612, 792)  # US letter, 8.5 × 11 in (ANSI/ASME Y14.1)
    for page in reader.pages:
        for font in page["/Resources"]["/Font"].values():
            descriptor = font.get_object().get("/FontDescriptor")
            # FontFile2 = an embedded TrueType program (ISO 32000-1 Table 126, published)
            assert descriptor is not None and "/FontFile2" in descriptor.get_object()


def test_warnings_reach_the_register_and_the_summary(tmp_path: Path) -> None:
    rooms = tmp_path / "rooms"
    write(rooms, "w.yaml", room("W1", ["200 kΩ", "2 TΩ"]))  # 2 TΩ: accepted, but unusual
    out = tmp_path / "out"
    audit(rooms, "-o", out, "--jobs", "1")
    (row,) = csv_rows(out / REGISTER_CSV)
    assert "point_to_ground[1]" in row["warnings"]
    text = pdf_text(out / SUMMARY_PDF)
    assert "Unusual input, accepted" in text and "point_to_ground[1]" in text


def test_fail_on_sets_the_exit_code_when_every_room_is_valid(site: Path, tmp_path: Path) -> None:
    (site / "broken.yaml").unlink()
    assert audit(site, "-o", tmp_path / "a", "--jobs", "1").exit_code == 0
    assert audit(site, "-o", tmp_path / "b", "--jobs", "1", "--fail-on", "medium").exit_code == 1


def test_two_rooms_with_one_worksheet_name_keep_both(tmp_path: Path) -> None:
    rooms = tmp_path / "rooms"
    write(rooms, "a.yaml", room("T1", ["200 kΩ"]))
    write(rooms, "b.yaml", room("T1", ["300 kΩ"]))
    out = tmp_path / "out"
    assert audit(rooms, "-o", out, "--jobs", "1").exit_code == 0
    rows = csv_rows(out / REGISTER_CSV)
    assert [r["worksheet"] for r in rows] == ["T1-2026-12-01.pdf", "T1-2026-12-01-2.pdf"]
    assert "saved as T1-2026-12-01-2.pdf" in rows[1]["problems"]
    for row in rows:
        assert sha256(out / row["worksheet"]) == row["worksheet_sha256"]


def test_an_error_is_recorded_without_memory_addresses(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """A Python object's repr names its address, which changes from run to run: the
    register and summary must come out the same each time (regression test of our own)."""
    import ignite.pipeline

    real = ignite.pipeline.evaluate_room

    def failing(path: Path, book: Any, sampling: Any = None) -> Any:
        if path.name == "t1.yaml":
            raise ValueError(f"cannot place {object()!r}")
        return real(path, book, sampling)

    monkeypatch.setattr(ignite.pipeline, "evaluate_room", failing)
    out = tmp_path / "out"
    audit(site, "-o", out, "--jobs", "1")
    problems = {r["file"]: r for r in csv_rows(out / REGISTER_CSV)}["t1.yaml"]["problems"]
    assert "ValueError: cannot place <object object>" in problems
    assert "0x" not in problems


def test_an_internal_error_is_listed_and_the_rest_carry_on(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import ignite.pipeline

    real = ignite.pipeline.evaluate_room

    def failing(path: Path, book: Any, sampling: Any = None) -> Any:
        if path.name == "t1.yaml":
            raise ZeroDivisionError("simulated")
        return real(path, book, sampling)

    monkeypatch.setattr(ignite.pipeline, "evaluate_room", failing)
    out = tmp_path / "out"
    result = audit(site, "-o", out, "--jobs", "1")
    assert result.exit_code == 4  # an internal error outranks the invalid room (3)
    rows = {r["file"]: r for r in csv_rows(out / REGISTER_CSV)}
    assert (
        rows["t1.yaml"]["status"] == "error" and "ZeroDivisionError" in rows["t1.yaml"]["problems"]
    )
    assert rows["east/t3.yaml"]["status"] == "assessed"


def test_usage_errors(site: Path, tmp_path: Path) -> None:
    empty = tmp_path / "empty"
    empty.mkdir()
    assert audit(empty, "-o", tmp_path / "out").exit_code == 2
    not_a_register = tmp_path / "x.json"
    not_a_register.write_text("[1, 2]", encoding="utf-8")
    result = audit(site, "-o", tmp_path / "out", "--previous", not_a_register)
    assert result.exit_code == 2 and "not an audit register" in result.output
    assert not (tmp_path / "out").exists()


def test_compare_pairs_rooms_by_id_then_by_file() -> None:
    then = [
        RegisterRow(
            "old/a.yaml", ASSESSED, room_id="A", floor_passed=True, readings_ohm=(1e5, 2e5)
        ),
        RegisterRow("b.yaml", "invalid"),
        RegisterRow(
            "c.yaml",
            ASSESSED,
            room_id="C",
            floor_passed=True,
            readings_ohm=(1e5,),
            findings=(FindingKey("x.rule", "floor", "low"),),
        ),
    ]
    now = [
        RegisterRow(
            "new/a.yaml", ASSESSED, room_id="A", floor_passed=False, readings_ohm=(1e5, 3e7, 2e5)
        ),
        RegisterRow("b.yaml", ASSESSED, room_id="B", floor_passed=True, readings_ohm=(1e5,)),
    ]
    changes = {c.room_id or c.file: c for c in compare(then, now)}
    a = changes["A"]
    assert a.kind == "compared" and a.window_event == "left its window"
    assert a.moved == (2, 3)  # point 2 changed, point 3 is new
    assert changes["B"].kind == "compared" and changes["B"].status_then == "invalid"
    assert changes["B"].moved == () and "status invalid → assessed" in changes["B"].describe()
    assert changes["C"].kind == "gone"


def test_read_register_rejects_what_is_not_one(tmp_path: Path) -> None:
    from ignite.audit.io import RegisterError

    path = tmp_path / "r.csv"
    path.write_bytes(b"a,b\n1,2\n")
    with pytest.raises(RegisterError):
        read_register(path)
    path.write_bytes(b"\xff\xfe\x00")
    with pytest.raises(RegisterError):
        read_register(path)


def test_discovery_is_recursive_sorted_and_skips_hidden(tmp_path: Path) -> None:
    for name in ("b.yaml", "a/c.YML", "a/b.yaml", ".hidden/x.yaml", "a/.x.yaml", "z.txt"):
        (tmp_path / name).parent.mkdir(parents=True, exist_ok=True)
        (tmp_path / name).write_text("", encoding="utf-8")
    found = [p.relative_to(tmp_path).as_posix() for p in discover_rooms(tmp_path)]
    assert found == ["a/b.yaml", "a/c.YML", "b.yaml"]


# Publication all or nothing (issue 14, item 5). The audit's files are moved into place by
# `ignite.audit.io._place`, one call per file that changes: here each step is made to fail,
# to be interrupted, or to receive a real SIGINT, and the folder is checked afterwards.


def _steps_of_a_clean_audit(site: Path, tmp_path: Path) -> tuple[int, dict[str, bytes]]:
    clean = tmp_path / "clean"
    audit(site, "-o", clean, "--jobs", "1")
    files = snapshot(clean)
    return len(files), files


def _fail_at(monkeypatch: pytest.MonkeyPatch, step: int, error: BaseException) -> list[int]:
    import ignite.audit.io

    real = ignite.audit.io._place
    calls: list[int] = []

    def place(*args: Any) -> None:
        calls.append(len(calls))
        if len(calls) - 1 == step:
            raise error
        real(*args)

    monkeypatch.setattr(ignite.audit.io, "_place", place)
    return calls


@pytest.mark.parametrize("step", range(6))  # 3 worksheets, the two registers, the summary
def test_an_interruption_at_any_step_leaves_the_folder_as_it_was(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch, step: int
) -> None:
    count, complete = _steps_of_a_clean_audit(site, tmp_path)
    assert count == 6
    out = tmp_path / "out"
    calls = _fail_at(monkeypatch, step, KeyboardInterrupt())
    result = audit(site, "-o", out, "--jobs", "1")
    assert len(calls) == step + 1
    assert result.exit_code == 130
    assert "nothing of this run is in" in result.stderr and "--force is not needed" in result.stderr
    assert snapshot(out) == {}  # no file, no temporary file, no journal, no staging folder
    monkeypatch.undo()
    again = audit(site, "-o", out, "--jobs", "1")  # run it again, without --force
    assert again.exit_code == 3 and snapshot(out) == complete


@pytest.mark.parametrize("step", [0, 2, 5])
def test_a_failure_while_replacing_an_earlier_audit_puts_it_back(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch, step: int
) -> None:
    out = tmp_path / "out"
    audit(site, "-o", out, "--jobs", "1")
    before = snapshot(out)
    # every room changes, so --force replaces every file: six steps, each with a backup
    for name, readings in (
        ("t1.yaml", ["210 kΩ"]),
        ("east/t2.yml", ["130 kΩ"]),
        ("east/t3.yaml", ["110 kΩ"]),
    ):
        write(site, name, room(Path(name).stem.upper(), readings))
    _fail_at(monkeypatch, step, PermissionError(13, "Permission denied", str(out / "x")))
    result = audit(site, "-o", out, "--jobs", "1", "--force")
    assert result.exit_code == 2
    assert f"ignite: {out / 'x'}: cannot be written: Permission denied" in result.stderr
    assert snapshot(out) == before  # the earlier audit, byte for byte


def test_a_signal_while_the_files_move_is_held_until_all_are_in_place(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import os
    import signal

    import ignite.audit.io

    _, complete = _steps_of_a_clean_audit(site, tmp_path)
    real = ignite.audit.io._place
    calls: list[int] = []

    def place(*args: Any) -> None:
        calls.append(1)
        if len(calls) == 2:  # Ctrl-C, for real, after the first file moved
            os.kill(os.getpid(), signal.SIGINT)
        real(*args)

    monkeypatch.setattr(ignite.audit.io, "_place", place)
    out = tmp_path / "out"
    # Python's own Ctrl-C handler, as in a terminal: a process started as a background job
    # inherits SIGINT ignored, and the audit rightly keeps that (the signal is then lost)
    inherited = signal.signal(signal.SIGINT, signal.default_int_handler)
    try:
        result = audit(site, "-o", out, "--jobs", "1")
    finally:
        signal.signal(signal.SIGINT, inherited)
    assert result.exit_code == 130
    assert "interrupted after its output was in place" in result.stderr
    assert "3 worksheet(s), complete" in result.stderr
    assert snapshot(out) == complete


class _Killed(BaseException):
    """Stands for SIGKILL: the process stops where it is, no clean-up runs."""


def test_a_run_killed_while_publishing_is_undone_by_the_next(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import ignite.audit.io
    from ignite.audit.io import JOURNAL, existing_audit_files

    _, complete = _steps_of_a_clean_audit(site, tmp_path)
    out = tmp_path / "out"
    _fail_at(monkeypatch, 4, _Killed())  # the worksheets and the CSV register are in place

    def no_clean_up(*args: Any) -> None:
        raise _Killed

    monkeypatch.setattr(ignite.audit.io, "_roll_back", no_clean_up)
    with pytest.raises(_Killed):
        audit(site, "-o", out, "--jobs", "1")
    left = snapshot(out)
    assert JOURNAL in left and REGISTER_CSV in left and REGISTER_JSON not in left
    monkeypatch.undo()
    monkeypatch.setattr(ignite.audit.io, "_process_alive", lambda pid: False)  # it was killed
    assert existing_audit_files(out) == []  # the CSV is the unfinished run's, not an audit
    again = audit(site, "-o", out, "--jobs", "1")  # without --force
    assert again.exit_code == 3, again.stderr
    assert snapshot(out) == complete


def test_while_another_audit_publishes_into_the_folder_nothing_is_touched(
    site: Path, tmp_path: Path
) -> None:
    import os

    from ignite.audit.io import JOURNAL

    out = tmp_path / "out"
    out.mkdir()
    (out / JOURNAL).write_text(f'{{"pid": {os.getpid()}, "files": []}}', encoding="utf-8")
    result = audit(site, "-o", out, "--jobs", "1")
    assert result.exit_code == 2
    assert "another audit" in result.stderr and f"process {os.getpid()}" in result.stderr
    assert sorted(snapshot(out)) == [JOURNAL]


def test_publish_removes_its_temporary_file_on_every_path(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import os

    from ignite.audit.io import publish

    def full(descriptor: int) -> None:
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(os, "fsync", full)
    with pytest.raises(OSError):
        publish(tmp_path / "audit-register.csv", b"data", force=False)
    assert list(tmp_path.iterdir()) == []


# Paths that cannot be read or written (issue 14, item 2)


def test_an_output_folder_below_a_file_is_a_usage_error(site: Path, tmp_path: Path) -> None:
    blocker = tmp_path / "plain-file"
    blocker.write_text("x", encoding="utf-8")
    result = audit(site, "-o", blocker / "out", "--jobs", "1")
    assert result.exit_code == 2
    assert f"ignite: {blocker / 'out'}: cannot be written: {blocker} is a file, not a folder\n" in (
        result.stderr
    )
    assert "Traceback" not in result.stderr and blocker.read_text(encoding="utf-8") == "x"


def test_a_named_pipe_among_the_rooms_is_listed_not_waited_for(site: Path, tmp_path: Path) -> None:
    import os

    os.mkfifo(site / "pipe.yaml")
    out = tmp_path / "out"
    result = audit(site, "-o", out, "--jobs", "1")
    assert result.exit_code == 3
    rows = {row["file"]: row for row in csv_rows(out / REGISTER_CSV)}
    assert rows["pipe.yaml"]["status"] == "invalid"
    assert (
        rows["pipe.yaml"]["problems"]
        == "pipe.yaml: cannot be read: is a named pipe, not a regular file"
    )


def test_an_unencodable_file_name_reaches_the_register_replaced(tmp_path: Path) -> None:
    import os

    rooms = tmp_path / "rooms"
    rooms.mkdir()
    # a file name that is not UTF-8: Python holds the byte 0xFF as the lone surrogate U+DCFF
    name = os.fsdecode(b"r\xff.yaml")
    write(rooms, name, room("S1", ["200 kΩ"]))
    out = tmp_path / "out"
    result = audit(rooms, "-o", out, "--jobs", "1")
    assert result.exit_code == 0, result.stderr
    (row,) = csv_rows(out / REGISTER_CSV)
    assert row["file"] == "r?.yaml"
    record = json.loads((out / REGISTER_JSON).read_text(encoding="utf-8"))
    assert record["rooms"][0]["file"] == "r?.yaml"


# The register (issue 14, item 7)


def test_register_cells_a_spreadsheet_would_run_are_neutralised(tmp_path: Path) -> None:
    # OWASP "CSV Injection": cells starting with =, +, -, @, tab or carriage return are
    # prefixed with a single quote so that a spreadsheet shows them as text.
    dangerous = {
        "name": '=HYPERLINK("http://example.invalid","x")',
        "assessor": "@SUM(1+1)",
        "purpose": "pre-list",
    }
    rooms = tmp_path / "rooms"
    write(rooms, "-2+3.yaml", room("T1", ["200 kΩ"], **dangerous))  # ids start alphanumeric
    out = tmp_path / "out"
    result = audit(rooms, "-o", out, "--jobs", "1")
    assert result.exit_code == 0, result.stderr
    (row,) = csv_rows(out / REGISTER_CSV)
    assert row["room_name"] == "'" + dangerous["name"]
    assert row["assessor"] == "'@SUM(1+1)"
    assert row["file"] == "'-2+3.yaml"
    for cell in row.values():
        assert not cell.startswith(("=", "+", "-", "@", "\t", "\r"))
    # the JSON register holds the values as they are; reading the CSV back restores them
    record = json.loads((out / REGISTER_JSON).read_text(encoding="utf-8"))["rooms"][0]
    assert record["room_name"] == dangerous["name"] and record["file"] == "-2+3.yaml"
    (back,) = read_register(out / REGISTER_CSV).rows
    assert (back.file, back.room_id, back.room_name, back.assessor) == (
        "-2+3.yaml",
        "T1",
        dangerous["name"],
        "@SUM(1+1)",
    )


def test_duplicate_room_ids_are_a_warning_on_the_console_and_in_the_register(
    tmp_path: Path,
) -> None:
    rooms = tmp_path / "rooms"
    write(rooms, "a.yaml", room("T1", ["200 kΩ"]))
    write(rooms, "b.yaml", room("t1", ["300 kΩ"]))  # ids differing only in case collide too
    write(rooms, "c.yaml", room("T3", ["300 kΩ"]))
    out = tmp_path / "out"
    result = audit(rooms, "-o", out, "--jobs", "1")
    assert result.exit_code == 0
    assert "warning: a.yaml: room id T1 is given by 2 room files (also b.yaml)" in result.stderr
    assert "warning: b.yaml: room id t1 is given by 2 room files (also a.yaml)" in result.stderr
    rows = {r["file"]: r for r in csv_rows(out / REGISTER_CSV)}
    assert "room id T1 is given by 2 room files" in rows["a.yaml"]["warnings"]
    assert "also a.yaml" in rows["b.yaml"]["warnings"]
    assert rows["c.yaml"]["warnings"] == ""
    record = json.loads((out / REGISTER_JSON).read_text(encoding="utf-8"))
    assert any("given by 2 room files" in w for w in record["rooms"][0]["warnings"])


def test_an_interruption_after_publication_says_the_output_is_complete(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import importlib

    cli = importlib.import_module("ignite.cli.audit")
    _, complete = _steps_of_a_clean_audit(site, tmp_path)

    def interrupted(*args: Any) -> int:
        raise KeyboardInterrupt

    monkeypatch.setattr(cli, "_report", interrupted)
    out = tmp_path / "out"
    result = audit(site, "-o", out, "--jobs", "1")
    assert result.exit_code == 130
    assert "interrupted after its output was in place" in result.stderr
    assert "3 worksheet(s), complete" in result.stderr
    assert snapshot(out) == complete


# --------------------------------------------------------------------------- time limit


def _slow_room(monkeypatch: pytest.MonkeyPatch, name: str, seconds: float) -> None:
    """A stand-in for a room whose solve runs on: `name` sleeps before it is evaluated.

    With the fork start method the pool's workers inherit the stand-in too."""
    import ignite.pipeline

    real = ignite.pipeline.evaluate_room

    def slow(path: Path, book: Any, sampling: Any = None) -> Any:
        if path.name == name:
            time.sleep(seconds)
        return real(path, book, sampling)

    monkeypatch.setattr(ignite.pipeline, "evaluate_room", slow)


@pytest.mark.parametrize("jobs", ["1", "2"])
def test_a_room_past_its_time_limit_is_not_assessed_and_the_rest_carry_on(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch, jobs: str
) -> None:
    import multiprocessing

    if jobs != "1" and multiprocessing.get_start_method() != "fork":
        pytest.skip("the stand-in reaches the workers only when they are forked")
    _slow_room(monkeypatch, "t1.yaml", 60.0)
    out = tmp_path / "out"
    start = time.perf_counter()
    result = audit(site, "-o", out, "--jobs", jobs, "--room-timeout", "1.5")
    elapsed = time.perf_counter() - start
    assert elapsed < 40  # the slow room was stopped, not waited for
    assert result.exit_code == 4  # a room not assessed for an internal reason: an error
    rows = {r["file"]: r for r in csv_rows(out / REGISTER_CSV)}
    assert rows["t1.yaml"]["status"] == "error"
    assert "time limit of 1.5 s" in rows["t1.yaml"]["problems"]
    assert rows["t1.yaml"]["worksheet"] == ""
    assert rows["east/t2.yml"]["status"] == "assessed"
    assert rows["east/t3.yaml"]["status"] == "assessed"
    for row in rows.values():
        if row["worksheet"]:
            assert (out / row["worksheet"]).exists()
    assert not list(out.glob(".ignite-audit-staging-*"))


def test_rooms_within_the_time_limit_are_unaffected(
    site: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    _slow_room(monkeypatch, "t1.yaml", 0.2)
    out = tmp_path / "out"
    result = audit(site, "-o", out, "--jobs", "1", "--room-timeout", "30")
    assert result.exit_code == 3  # only the broken room
    rows = {r["file"]: r for r in csv_rows(out / REGISTER_CSV)}
    assert rows["t1.yaml"]["status"] == "assessed"


def test_the_time_limit_must_be_positive(site: Path, tmp_path: Path) -> None:
    result = CliRunner().invoke(
        main, ["audit", str(site), "-o", str(tmp_path / "o"), "--room-timeout", "0"]
    )
    assert result.exit_code == 2


def test_the_audit_summary_has_its_own_sign_off(tmp_path):
    from pypdf import PdfReader

    from ignite.wording import sentences

    site = tmp_path / "site"
    site.mkdir()
    sample = Path(__file__).resolve().parent.parent / "sample_rooms"
    (site / "r.yaml").write_bytes((sample / "recommissioning-refurbished.yaml").read_bytes())
    out = tmp_path / "out"
    CliRunner().invoke(main, ["audit", str(site), "-o", str(out), "--jobs", "1"])
    reader = PdfReader(str(out / "audit-summary.pdf"))
    text = " ".join(" ".join(page.extract_text() for page in reader.pages).split())
    assert sentences.SIGN_OFF_SUMMARY_HEADING in text
    assert sentences.SIGN_OFF_SUMMARY_PROMPT in text
    for decision in sentences.SIGN_OFF_SUMMARY_DECISIONS:
        assert decision in text
    for role in sentences.SIGN_OFF_ROLES:
        assert role in text


def test_audit_takes_the_sampling_options(tmp_path):
    # --nominal: central values only, so no probability in the register; --samples N samples
    site = tmp_path / "site"
    site.mkdir()
    sample = Path(__file__).resolve().parent.parent / "sample_rooms"
    (site / "o.yaml").write_bytes((sample / "orthopaedic-periodic-audit.yaml").read_bytes())
    cells = {}
    for name, options in (("nominal", ["--nominal"]), ("sampled", ["--samples", "10"])):
        out = tmp_path / name
        result = CliRunner().invoke(
            main, ["audit", str(site), "-o", str(out), "--jobs", "1", *options]
        )
        assert result.exit_code in (0, 1), result.output
        rows = list(csv.DictReader((out / "audit-register.csv").open(encoding="utf-8")))
        cells[name] = rows[0]["worst_probability"]
    assert cells["nominal"] == ""
    assert 0.0 <= float(cells["sampled"]) <= 1.0
