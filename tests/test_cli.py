"""The command line: exit codes, stderr messages, files written."""

from __future__ import annotations

import json

import yaml
from click.testing import CliRunner
from conftest import ROOT

from ignite.cli.main import CAUTION, main
from ignite.errors import (
    IgniteError,
    InputError,
    OutputExistsError,
    Problem,
    RuleFileError,
    UnitError,
)
from ignite.room.load import load_room_text


def run(*args: str):  # type: ignore[no-untyped-def]
    return CliRunner().invoke(main, list(args), catch_exceptions=False)


def test_check_text_prints_the_floor_and_the_caution(room_data, write_room):
    result = run("check", str(write_room(room_data)))
    assert result.exit_code == 0
    assert "Floor (medical-location" in result.output
    assert "never replace" in result.output


def test_check_json_is_the_contract_record(room_data, write_room):
    result = run("check", str(write_room(room_data)), "--format", "json")
    assert result.exit_code == 0
    (record,) = json.loads(result.stdout)  # one room: an array of one record
    for key in (
        "format",
        "tool_version",
        "input_sha256",
        "room",
        "floor",
        "people",
        "trolleys",
        "preparations",
        "cases",
        "findings",
    ):
        assert key in record
    floor_keys = {
        "readings_ohm",
        "min_ohm",
        "max_ohm",
        "mean_ohm",
        "geometric_mean_ohm",
        "criteria",
        "window_low_ohm",
        "window_high_ohm",
        "passed",
        "shock_path_ohm",
        "shock_current_A",
    }
    assert floor_keys <= record["floor"].keys()
    person_keys = {
        "role",
        "leak_resistance_ohm",
        "capacitance_F",
        "time_constant_s",
        "body_voltage_V",
        "stored_charge_C",
        "spark_energy_J",
        "settle_time_s",
    }
    assert person_keys <= record["people"][0].keys()
    assert record["floor"]["min_ohm"] == 200e3
    finding_keys = {"rule", "severity", "subject", "measured", "limit", "source", "mitigations"}
    assert all(finding_keys <= f.keys() for f in record["findings"])


def test_fail_on_sets_exit_code_one(room_data, write_room):
    room_data["floor"]["point_to_ground"] = ["40 kΩ"]
    path = str(write_room(room_data))
    assert run("check", path).exit_code == 0
    assert run("check", path, "--fail-on", "high").exit_code == 1
    assert run("check", path, "--fail-on", "never").exit_code == 0


def test_broken_room_gives_exit_three_and_every_problem(room_data, write_room):
    room_data["environment"]["relative_humidity"] = "150 %"
    room_data["environment"]["temperature"] = 20
    room_data["floor"]["point_to_ground"][1] = "5 kg"
    path = write_room(room_data, "broken.yaml")
    result = run("check", str(path))
    assert result.exit_code == 3
    err = result.stderr
    assert "broken.yaml:" in err
    assert "environment.relative_humidity" in err
    assert "environment.temperature" in err
    assert "floor.point_to_ground[1]" in err
    assert "Traceback" not in err


def test_bad_yaml_gives_exit_three(tmp_path):
    path = tmp_path / "bad.yaml"
    path.write_text("room: [unclosed\n")
    result = run("check", str(path))
    assert result.exit_code == 3
    assert "bad.yaml:" in result.stderr


def test_a_room_path_that_cannot_be_read_is_a_usage_error(tmp_path):
    missing = tmp_path / "nowhere.yaml"
    result = run("check", str(missing))
    assert result.exit_code == 2
    assert result.stderr == f"ignite: {missing}: cannot be read: No such file or directory\n"
    result = run("check", str(tmp_path))
    assert result.exit_code == 2
    assert result.stderr == f"ignite: {tmp_path}: cannot be read: is a folder, not a file\n"


def test_one_bad_room_does_not_stop_the_others(room_data, write_room):
    good = write_room(room_data, "good.yaml")
    room_data["floor"]["criteria"] = "no-such-window"
    bad = write_room(room_data, "bad.yaml")
    result = run("check", str(bad), str(good))
    assert result.exit_code == 3
    assert "Theatre 1, Test Valley Clinic" in result.stdout


def test_usage_error_is_exit_two():
    assert run("check").exit_code == 2
    assert run("check", "x.yaml", "--fail-on", "sometimes").exit_code == 2


def test_rules_lists_every_value_with_source_and_flag(book):
    result = run("rules")
    assert result.exit_code == 0
    for entry in book.entries.values():
        assert f"{entry.id}: " in result.output
    assert result.output.count("source: ") == len(book.entries)


def test_rules_single_id_and_unknown_id():
    result = run("rules", "medical-location")
    assert result.exit_code == 0 and "NEK 400:710" in result.output
    assert run("rules", "no-such-rule").exit_code == 2


def test_invalid_rules_folder_gives_exit_three(tmp_path, room_data, write_room):
    rules = tmp_path / "rules"
    rules.mkdir()
    (rules / "checks.yaml").write_text("format: 2\nkind: checks\nentries: []\n")
    result = run("check", str(write_room(room_data)), "--rules", str(rules))
    assert result.exit_code == 3
    assert "checks.yaml" in result.stderr


def test_new_writes_a_template_that_loads_and_refuses_to_overwrite(tmp_path, book):
    from ignite.pipeline import vocabulary

    path = tmp_path / "new-room.yaml"
    assert run("new", str(path)).exit_code == 0
    load_room_text(path.read_text(encoding="utf-8"), str(path), vocabulary(book))
    path.write_text("mine")
    assert run("new", str(path)).exit_code == 2
    assert path.read_text() == "mine"
    assert run("new", str(path), "--force").exit_code == 0


def test_samples_are_valid_yaml():
    for path in (ROOT / "sample_rooms").glob("*.yaml"):
        assert isinstance(yaml.safe_load(path.read_text(encoding="utf-8")), dict)


def test_worksheet_appendix_lists_the_rules_this_room_uses(room_data, write_room, tmp_path):
    from pypdf import PdfReader

    out = tmp_path / "sheet.pdf"
    assert run("assess", str(write_room(room_data)), "-o", str(out)).exit_code == 0
    text = "".join(page.extract_text() for page in PdfReader(out).pages)
    assert "medical-location" in text and "antistatic" in text  # the window and footwear in use
    assert "conductive-historical" not in text  # a window the room does not use
    assert "floor.reading-below-window" in text  # every check


def test_unknown_substance_is_an_input_error_with_its_line(room_data, write_room):
    room_data["preparations"] = [
        {
            "id": "x",
            "label": "a made-up solvent",
            "basis": "volume",
            "components": {"unobtainium": "70 %", "water": "30 %"},
        }
    ]
    path = write_room(room_data, "unknown-substance.yaml")
    result = run("check", str(path))
    assert result.exit_code == 3
    assert "unknown-substance.yaml:" in result.stderr
    assert "preparations[0].components.unobtainium" in result.stderr
    assert "Traceback" not in result.stderr


# Exit codes: each expected value is the README's exit-code table (the user's contract).


def test_each_error_carries_the_exit_code_the_readme_documents(tmp_path):
    problem = Problem("room.yaml", 3, "floor", "expected a mapping")
    assert InputError([problem]).exit_code == 3  # invalid room file
    assert RuleFileError([problem]).exit_code == 3  # invalid rule file
    assert UnitError("expected a resistance, got '5 kg'").exit_code == 3  # becomes an InputError
    assert OutputExistsError(tmp_path / "x.pdf").exit_code == 2  # exists, no --force
    assert IgniteError("cannot do that").exit_code == 2  # usage


def test_assess_on_a_broken_room_exits_three_and_writes_nothing(room_data, write_room, tmp_path):
    room_data["floor"]["point_to_ground"][0] = "5 kg"
    out = tmp_path / "sheet.pdf"
    result = run("assess", str(write_room(room_data, "broken.yaml")), "-o", str(out))
    assert result.exit_code == 3
    assert "broken.yaml:" in result.stderr and "floor.point_to_ground[0]" in result.stderr
    assert "1 problem(s); no worksheet written" in result.stderr
    assert not out.exists()
    assert list(tmp_path.glob("*.pdf")) == []


def test_assess_onto_an_existing_worksheet_exits_two_unless_forced(room_data, write_room, tmp_path):
    room = str(write_room(room_data))
    out = tmp_path / "sheet.pdf"
    out.write_bytes(b"an earlier worksheet")
    result = run("assess", room, "-o", str(out))
    assert result.exit_code == 2
    assert f"ignite: {out} exists; use --force to overwrite it" in result.stderr
    assert out.read_bytes() == b"an earlier worksheet"
    assert run("assess", room, "-o", str(out), "--force").exit_code == 0
    assert out.read_bytes().startswith(b"%PDF")


def test_several_rooms_exit_with_the_most_serious_code(room_data, write_room, tmp_path):
    room_data["floor"]["point_to_ground"] = ["40 kΩ"]  # a high finding: below the window
    reaching = str(write_room(room_data, "reaching.yaml"))
    room_data["floor"]["point_to_ground"] = ["5 kg"]
    broken = str(write_room(room_data, "broken.yaml"))
    outdir = tmp_path / "sheets"
    # check: a finding at --fail-on gives 1; a broken room among them gives 3, in any order
    assert run("check", reaching, "--fail-on", "high").exit_code == 1
    assert run("check", reaching, broken, "--fail-on", "high").exit_code == 3
    assert run("check", broken, reaching, "--fail-on", "high").exit_code == 3
    # assess: an existing worksheet (2) outranks a finding (1); a broken room (3) both
    result = run("assess", reaching, "-o", str(outdir), "--fail-on", "high")
    assert result.exit_code == 1
    (written,) = outdir.glob("*.pdf")
    again = run("assess", reaching, reaching, "-o", str(outdir), "--fail-on", "high")
    assert again.exit_code == 2
    assert again.stderr.count("exists; use --force") == 2
    third = run("assess", broken, reaching, "-o", str(outdir), "--fail-on", "high", "--force")
    assert third.exit_code == 3
    assert f"{written}  (" in third.stdout  # the good room still got its worksheet


def test_invalid_rules_folder_stops_assess_with_exit_three(tmp_path, room_data, write_room):
    rules = tmp_path / "rules"
    rules.mkdir()
    (rules / "checks.yaml").write_text("format: 2\nkind: checks\nentries: []\n")
    out = tmp_path / "sheet.pdf"
    result = run("assess", str(write_room(room_data)), "--rules", str(rules), "-o", str(out))
    assert result.exit_code == 3
    assert "ignite: invalid rule file(s):" in result.stderr and "checks.yaml" in result.stderr
    assert not out.exists()


# Paths that cannot be read or written, internal errors, encodings (issue 14, item 2)


def test_check_on_a_named_pipe_refuses_rather_than_waiting(tmp_path):
    import os
    import subprocess
    import sys

    pipe = tmp_path / "pipe.yaml"
    os.mkfifo(pipe)
    # in a child process with a time limit: a regression would block for ever
    done = subprocess.run(
        [sys.executable, "-m", "ignite", "check", str(pipe)],
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert done.returncode == 2
    assert done.stderr == f"ignite: {pipe}: cannot be read: is a named pipe, not a regular file\n"


def test_new_into_a_missing_folder_creates_it_and_below_a_file_is_a_usage_error(tmp_path):
    deep = tmp_path / "a" / "b" / "room.yaml"
    assert run("new", str(deep)).exit_code == 0 and deep.is_file()
    blocker = tmp_path / "plain-file"
    blocker.write_text("x")
    target = blocker / "room.yaml"
    result = run("new", str(target))
    assert result.exit_code == 2
    assert result.stderr == (
        f"ignite: {target}: cannot be written: {blocker} is a file, not a folder\n"
    )
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a", "plain-file"]  # no temp file


def test_assess_output_below_a_file_is_a_usage_error(room_data, write_room, tmp_path):
    room = str(write_room(room_data))
    blocker = tmp_path / "plain-file"
    blocker.write_text("x")
    for output in (blocker / "sheet.pdf", blocker / "folder"):
        result = run("assess", room, "-o", str(output))
        assert result.exit_code == 2, result.stderr
        target = output if output.suffix == ".pdf" else output / "TST-1-2026-12-01.pdf"
        assert f"ignite: {target}: cannot be written: {blocker} is a file, not a folder\n" in (
            result.stderr
        )
        assert "internal error" not in result.stderr


def test_assess_refuses_an_output_that_is_neither_pdf_nor_folder(room_data, write_room, tmp_path):
    room = str(write_room(room_data))
    result = run("assess", room, "-o", str(tmp_path / "sheet.txt"))
    assert result.exit_code == 2
    assert "a worksheet is a PDF" in result.stderr
    assert list(tmp_path.glob("sheet.txt*")) == []
    # a dotted folder name is a folder when it exists or ends with "/"
    assert run("assess", room, "-o", f"{tmp_path / 'sheets.v2'}/").exit_code == 0
    assert (tmp_path / "sheets.v2" / "TST-1-2026-12-01.pdf").is_file()


def test_an_internal_error_has_its_own_exit_code(room_data, write_room, monkeypatch):
    import importlib

    cli = importlib.import_module("ignite.cli.main")  # the module; ignite.cli.main is the group

    def failing(path, book, *sampling):  # type: ignore[no-untyped-def]
        raise ZeroDivisionError("simulated")

    monkeypatch.setattr(cli, "run_room", failing)
    result = run("check", str(write_room(room_data)))
    assert result.exit_code == 4  # README: 4 internal error; never 1 (a finding at --fail-on)
    assert "internal error ZeroDivisionError: simulated" in result.stderr
    assert "Traceback" not in result.stderr

    def broken_rules(directory):  # type: ignore[no-untyped-def]
        raise RuntimeError("simulated, outside any room")

    monkeypatch.setattr(cli, "open_rulebook", broken_rules)
    result = run("rules")
    assert result.exit_code == 4
    assert result.stderr.count("\n") == 1 and "internal error RuntimeError" in result.stderr


def test_the_readme_documents_every_exit_code():
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    for code in ("| 0 |", "| 1 |", "| 2 |", "| 3 |", "| 4 |", "| 130, 143 |"):
        assert code in readme


def test_an_unencodable_character_is_refused_with_its_line_not_a_crash(
    room_data, write_room, tmp_path
):
    room_data["people"][0]["role"] = "ROLE"
    path = write_room(room_data, "surrogate.yaml")
    # a YAML escape for a lone UTF-16 surrogate: valid YAML, not encodable as UTF-8; the
    # loader refuses it (file, line, key) before anything could try to print it
    path.write_text(path.read_text(encoding="utf-8").replace("ROLE", '"\\ud800"'), "utf-8")
    for args in (("check", str(path)), ("check", str(path), "--format", "json")):
        result = run(*args)
        assert result.exit_code == 3, result.stderr
        assert "people[0].role" in result.stderr and "Traceback" not in result.stderr


# One JSON shape (issue 14, item 8)


def test_check_json_is_one_array_for_one_room_and_for_many(room_data, write_room, book):
    from ignite.pipeline import run_room

    first = write_room(room_data, "first.yaml")
    room_data["room"]["id"] = "T2"
    second = write_room(room_data, "second.yaml")
    one = json.loads(run("check", str(first), "--format", "json").stdout)
    two = json.loads(run("check", str(first), str(second), "--format", "json").stdout)
    assert isinstance(one, list) and isinstance(two, list)
    assert [r["room"]["id"] for r in two] == ["TST-1", "T2"]  # in the order given
    # the record inside the array is the contract record, unchanged (plus the caution)
    expected = json.loads(json.dumps(run_room(first, book).to_record()))
    expected["caution"] = CAUTION
    assert one == [expected] and two[0] == expected
    # a room not assessed is absent (its problems are on stderr); stdout stays valid JSON
    broken = write_room({"format": 1}, "broken.yaml")
    result = run("check", str(broken), "--format", "json")
    assert result.exit_code == 3 and json.loads(result.stdout) == []


def test_a_rules_folder_that_does_not_exist_is_a_usage_error(room_data, write_room, tmp_path):
    missing = tmp_path / "no-rules"
    result = run("check", str(write_room(room_data)), "--rules", str(missing))
    assert result.exit_code == 2
    assert str(missing) in result.stderr and "does not exist" in result.stderr
