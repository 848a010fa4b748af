"""The register on disk: its CSV and JSON, the audit's files published together, and
the register read back.

`register_csv` and `register_json` turn an `AuditReport` into bytes; `publish_all` moves
a set of staged files into place as one transaction (a journal first, then renames,
rolled back on any failure); `recover` undoes a publication whose process was killed
midway; `read_register` reads an earlier audit's register from its JSON or its CSV.
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import os
import secrets
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ignite.errors import IgniteError, OutputExistsError, PathError
from ignite.records.register import (
    ASSESSED,
    ERROR,
    FAIL,
    GONE,
    INVALID,
    PASS,
    AuditReport,
    FindingKey,
    Register,
    RegisterRow,
    RoomChange,
    one_line,
)
from ignite.records.results import SEVERITIES
from ignite.wording.sentences import CLI_CAUTION

REGISTER_CSV = "audit-register.csv"
REGISTER_JSON = "audit-register.json"
SUMMARY_PDF = "audit-summary.pdf"
AUDIT_FILES = (REGISTER_CSV, REGISTER_JSON, SUMMARY_PDF)
"""The files that mark a folder as holding an audit, in the order they are written."""

JOURNAL = ".ignite-audit-journal.json"
"""Written before the first file of an audit is moved into place, removed after the last:
while it is there (and its process is gone), the folder holds an unfinished publication."""

CAUTION = CLI_CAUTION
REGISTER_FORMAT = 1

CSV_COLUMNS = (
    "file",
    "status",
    "room_id",
    "room_name",
    "purpose",
    "assessed_on",
    "assessor",
    "floor_criteria",
    "floor_verdict",
    "lowest_reading_ohm",
    "highest_reading_ohm",
    "window_low_ohm",
    "window_high_ohm",
    "readings_ohm",
    "points_outside",
    "worst_severity",
    *SEVERITIES,
    "findings",
    "input_sha256",
    "worksheet",
    "worksheet_sha256",
    "warnings",
    "problems",
    "change_since_previous",
    "tool_version",
    "rules_sha256",
    "worst_electrical_finding",
    "worst_probability",
)
"""The register's CSV header. List cells: readings and point numbers joined by "; ",
findings, warnings and problems one a line ("rule | severity | subject" for findings)."""

_LIST_SEPARATOR = "; "
_FINDING_SEPARATOR = " | "
_FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
"""A spreadsheet runs a cell starting with one of these as a formula (OWASP, CSV injection)."""


def neutralised(cell: str) -> str:
    """A CSV cell a spreadsheet shows as text: a leading apostrophe where it would run it.

    The OWASP rule for CSV injection: a cell starting with =, +, -, @, a tab or a carriage
    return gets a leading single quote. A cell starting with a quote gets one more, so that
    `restored` gives back exactly what was written.

    >>> neutralised("=1+2"), neutralised("@SUM(A1)"), neutralised("-1"), neutralised("T1")
    ("'=1+2", "'@SUM(A1)", "'-1", 'T1')
    >>> restored(neutralised("'quoted")) == "'quoted"
    True
    """
    return "'" + cell if cell.startswith((*_FORMULA_STARTS, "'")) else cell


def restored(cell: str) -> str:
    """A cell of a register CSV as it was before `neutralised`."""
    return cell[1:] if cell.startswith("'") else cell


class RegisterError(IgniteError):
    """A file given as an earlier register is not one (or cannot be read)."""


def existing_audit_files(output: Path) -> list[Path]:
    """The files of an earlier, finished audit in `output` (register and summary).

    Files that an unfinished publication put there (its journal names them, with their
    bytes, and its process is gone) do not count: `recover` removes them.
    """
    unfinished = {entry.name for entry in _stale_entries(output) if not entry.backup}
    return [
        output / name for name in AUDIT_FILES if (output / name).exists() and name not in unfinished
    ]


# --------------------------------------------------------------------------- files


def sha256_hex(data: bytes) -> str:
    return hashlib.sha256(data).hexdigest()


def write_new(path: Path, data: bytes) -> None:
    """Write a file that must not exist yet, flushed to disk."""
    descriptor = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666)
    with os.fdopen(descriptor, "wb") as handle:
        handle.write(data)
        handle.flush()
        os.fsync(handle.fileno())


def publish(path: Path, data: bytes, *, force: bool) -> None:
    """Put `data` at `path` whole or not at all: a temporary file beside it, then a rename.

    Without `force`, an existing file is left alone and `OutputExistsError` raised. The
    temporary file is removed on every path, even when writing it fails halfway.
    """
    temporary = path.with_name(f".{path.name}.{secrets.token_hex(4)}.tmp")
    try:
        write_new(temporary, data)
        move(temporary, path, force=force)
    finally:
        temporary.unlink(missing_ok=True)


def move(source: Path, target: Path, *, force: bool) -> None:
    """Rename `source` to `target` (same file system); without `force`, never replace a file."""
    if force:
        os.replace(source, target)
        return
    try:
        os.link(source, target)  # never replaces: the last-moment check is atomic
    except FileExistsError:
        raise OutputExistsError(target) from None
    except OSError:
        if target.exists():
            raise OutputExistsError(target) from None
        os.replace(source, target)
    else:
        source.unlink()


def same_bytes(path: Path, sha256: str) -> bool:
    """Whether `path` is a file holding exactly the bytes of SHA-256 `sha256`."""
    try:
        return path.is_file() and sha256_hex(path.read_bytes()) == sha256
    except OSError:
        return False


# --------------------------------------------------------------------------- publishing


@dataclass(frozen=True)
class Staged:
    """One file of an audit, rendered in the staging folder, and where it goes."""

    source: Path  # in the staging folder
    name: str  # its name in the output folder
    sha256: str


@dataclass(frozen=True)
class _Entry:
    """One line of the journal: a file being put in place, and where the one it replaces went."""

    name: str
    sha256: str
    backup: str  # path of the replaced file, relative to the output folder; "" if none


def _process_alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except OSError:
        return True  # alive, but not ours to signal
    return True


def _read_journal(output: Path) -> tuple[int, list[_Entry]] | None:
    try:
        record = json.loads((output / JOURNAL).read_text(encoding="utf-8"))
        entries = [
            _Entry(str(e["name"]), str(e["sha256"]), str(e["backup"])) for e in record["files"]
        ]
        return int(record["pid"]), entries
    except FileNotFoundError:
        return None
    except (OSError, ValueError, KeyError, TypeError):
        return 0, []  # unreadable: a crash while writing it, before anything moved


def _stale_entries(output: Path) -> list[_Entry]:
    journal = _read_journal(output)
    if journal is None:
        return []
    pid, entries = journal
    if pid and _process_alive(pid):
        return []
    return [entry for entry in entries if same_bytes(output / entry.name, entry.sha256)]


def recover(output: Path) -> list[str]:
    """Undo a publication whose process died midway (killed, power cut); the names restored.

    Every file it had put in place is removed, and every file it had replaced is put
    back, so the folder is as it was before that audit. A publication whose process is
    still running is another audit at work: `PathError`.
    """
    journal = _read_journal(output)
    if journal is None:
        return []
    pid, entries = journal
    if pid and _process_alive(pid):
        raise PathError(
            output, "cannot be written", f"another audit (process {pid}) is publishing into it"
        )
    _roll_back(output, entries)
    (output / JOURNAL).unlink(missing_ok=True)
    return [entry.name for entry in entries]


def _roll_back(output: Path, entries: Sequence[_Entry]) -> None:
    for entry in reversed(entries):
        target = output / entry.name
        if entry.backup and (output / entry.backup).exists():
            os.replace(output / entry.backup, target)
        elif not entry.backup and same_bytes(target, entry.sha256):
            target.unlink()


def publish_all(files: Sequence[Staged], output: Path, backups: Path, *, force: bool) -> list[Path]:
    """Move the staged files into `output` together: all of them, or none.

    A file already holding the same bytes is left as it is. Without `force`, any other
    existing file stops the publication before anything moves (`OutputExistsError`); with
    it, the file replaced is first moved into `backups` (a folder inside `output`). A
    journal is written before the first move and removed after the last; a failure or an
    interruption in between puts every file back as it was and raises again. The paths
    of the files in place are returned.
    """
    moving: list[tuple[Staged, _Entry]] = []
    for number, file in enumerate(files):
        target = output / file.name
        if same_bytes(target, file.sha256):
            continue
        backup = ""
        if target.exists() or target.is_symlink():
            if not force:
                raise OutputExistsError(target)
            backup = (backups / f"replaced-{number:06d}").relative_to(output).as_posix()
        moving.append((file, _Entry(file.name, file.sha256, backup)))
    if any(entry.backup for _, entry in moving):
        backups.mkdir(parents=True, exist_ok=True)
    journal = {"pid": os.getpid(), "files": [entry.__dict__ for _, entry in moving]}
    try:
        write_new(output / JOURNAL, json.dumps(journal).encode("utf-8"))
    except FileExistsError:
        raise PathError(
            output, "cannot be written", "another audit is publishing into it"
        ) from None
    started: list[_Entry] = []
    try:
        for file, entry in moving:
            started.append(entry)
            _place(file, output, entry)
    except BaseException:
        _roll_back(output, started)  # the step under way too: its backup may have moved
        (output / JOURNAL).unlink(missing_ok=True)
        raise
    (output / JOURNAL).unlink()
    return [output / file.name for file in files]


def _place(file: Staged, output: Path, entry: _Entry) -> None:
    """One step of `publish_all`: the replaced file to its backup, the staged file in place."""
    target = output / entry.name
    if entry.backup:
        os.replace(target, output / entry.backup)
    move(file.source, target, force=False)


# --------------------------------------------------------------------------- writing


def _finding_record(key: FindingKey) -> dict[str, str]:
    return {"rule": key.rule, "severity": key.severity, "subject": key.subject}


def change_record(change: RoomChange) -> dict[str, Any]:
    """A room's change since the previous register, as the register's JSON holds it."""
    return {
        "kind": change.kind,
        "room_id": change.room_id,
        "file": change.file,
        "status_then": change.status_then,
        "status_now": change.status_now,
        "verdict_then": change.verdict_then,
        "verdict_now": change.verdict_now,
        "window_event": change.window_event,
        "readings_then_ohm": list(change.readings_then),
        "readings_now_ohm": list(change.readings_now),
        "points_moved": list(change.moved),
        "findings_appeared": [_finding_record(f) for f in change.appeared],
        "findings_cleared": [_finding_record(f) for f in change.cleared],
        "worst_then": change.worst_then,
        "worst_now": change.worst_now,
        "assessed_on_then": change.date_then,
        "assessed_on_now": change.date_now,
        "text": change.text,
    }


def _number(value: float | None) -> str:
    return "" if value is None else repr(float(value))


def _finding_cell(key: FindingKey | None) -> str:
    """A finding as the register's cells write it: "rule | severity | subject"."""
    if key is None:
        return ""
    return _FINDING_SEPARATOR.join((key.rule, key.severity, key.subject))


def register_csv(report: AuditReport) -> bytes:
    """The register as CSV (UTF-8, header row, one row per room file).

    Every cell is `neutralised`: none starts as a spreadsheet formula would.
    """
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\r\n")
    writer.writerow(CSV_COLUMNS)
    for row in report.rows:
        change = report.change_for(row)
        cells: dict[str, str] = {
            "file": row.file,
            "status": row.status,
            "room_id": row.room_id,
            "room_name": row.room_name,
            "purpose": row.purpose,
            "assessed_on": row.assessed_on,
            "assessor": row.assessor,
            "floor_criteria": row.floor_criteria,
            "floor_verdict": row.verdict,
            "lowest_reading_ohm": _number(row.lowest_ohm),
            "highest_reading_ohm": _number(row.highest_ohm),
            "window_low_ohm": _number(row.window_low_ohm),
            "window_high_ohm": _number(row.window_high_ohm),
            "readings_ohm": _LIST_SEPARATOR.join(_number(r) for r in row.readings_ohm),
            "points_outside": _LIST_SEPARATOR.join(str(p) for p in row.points_outside),
            "worst_severity": row.worst_severity,
            "findings": "\n".join(
                _FINDING_SEPARATOR.join((f.rule, f.severity, f.subject)) for f in row.findings
            ),
            "input_sha256": row.input_sha256,
            "worksheet": row.worksheet,
            "worksheet_sha256": row.worksheet_sha256,
            "warnings": "\n".join(row.warnings),
            "problems": "\n".join(row.problems),
            "change_since_previous": change.text if change else "",
            "tool_version": report.tool_version,
            "rules_sha256": report.rules_digest,
            "worst_electrical_finding": _finding_cell(row.worst_electrical),
            "worst_probability": _number(row.worst_probability),
        }
        for severity in SEVERITIES:
            cells[severity] = str(row.count(severity)) if row.assessed else ""
        writer.writerow([neutralised(cells[column]) for column in CSV_COLUMNS])
    return buffer.getvalue().encode("utf-8", "replace")  # a lone surrogate becomes "?"


def register_record(report: AuditReport) -> dict[str, Any]:
    """The register as a JSON-ready mapping."""
    rooms = []
    for row in report.rows:
        change = report.change_for(row)
        rooms.append(
            {
                "file": row.file,
                "status": row.status,
                "room_id": row.room_id,
                "room_name": row.room_name,
                "purpose": row.purpose,
                "assessed_on": row.assessed_on,
                "assessor": row.assessor,
                "floor_criteria": row.floor_criteria,
                "floor_verdict": row.verdict,
                "floor_passed": row.floor_passed,
                "lowest_reading_ohm": row.lowest_ohm,
                "highest_reading_ohm": row.highest_ohm,
                "window_low_ohm": row.window_low_ohm,
                "window_high_ohm": row.window_high_ohm,
                "readings_ohm": list(row.readings_ohm),
                "points_outside": list(row.points_outside),
                "worst_severity": row.worst_severity,
                "severity_counts": {s: row.count(s) for s in SEVERITIES} if row.assessed else None,
                "findings": [_finding_record(f) for f in row.findings],
                "input_sha256": row.input_sha256,
                "worksheet": row.worksheet,
                "worksheet_sha256": row.worksheet_sha256,
                "warnings": list(row.warnings),
                "problems": list(row.problems),
                "change_since_previous": change_record(change) if change else None,
                "worst_electrical_finding": None
                if row.worst_electrical is None
                else _finding_record(row.worst_electrical),
                "worst_probability": row.worst_probability,
            }
        )
    previous = report.previous
    assessed = [row for row in report.rows if row.assessed]
    return {
        "format": REGISTER_FORMAT,
        "kind": "ignite audit register",
        "tool_version": report.tool_version,
        "rules_sha256": report.rules_digest,
        "folder": report.folder,
        "previous": None
        if previous is None
        else {
            "file": previous.path.name,
            "sha256": previous.sha256,
            "tool_version": previous.tool_version,
            "rules_sha256": previous.rules_digest,
        },
        "totals": {
            "room_files": len(report.rows),
            "assessed": sum(1 for row in report.rows if row.status == ASSESSED),
            "invalid": sum(1 for row in report.rows if row.status == INVALID),
            "error": sum(1 for row in report.rows if row.status == ERROR),
            "floor_pass": sum(1 for row in assessed if row.floor_passed),
            "floor_fail": sum(1 for row in assessed if row.floor_passed is False),
            "findings": {s: sum(row.count(s) for row in report.rows) for s in SEVERITIES},
        },
        "caution": CAUTION,
        "rooms": rooms,
        "rooms_gone": [change_record(c) for c in report.changes if c.kind == GONE],
    }


def register_json(report: AuditReport) -> bytes:
    text = json.dumps(register_record(report), indent=2, ensure_ascii=False) + "\n"
    return text.encode("utf-8", "replace")  # a lone surrogate becomes "?"


# --------------------------------------------------------------------------- reading


def read_register(path: Path) -> Register:
    """A register written by an earlier audit, from its JSON or its CSV."""
    path = Path(path)
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise RegisterError(f"{path}: cannot be read: {exc.strerror or exc}") from None
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise RegisterError(f"{path}: not UTF-8 text, so not an audit register") from None
    try:
        if text.lstrip().startswith("{"):
            rows, version, digest = _rows_from_json(text)
        else:
            rows, version, digest = _rows_from_csv(text)
    except (ValueError, KeyError, TypeError, AttributeError, csv.Error) as exc:
        raise RegisterError(f"{path}: not an audit register ({exc})") from None
    return Register(path, sha256_hex(data), tuple(rows), version, digest)


def _floats(values: Iterable[Any]) -> tuple[float, ...]:
    return tuple(float(v) for v in values)


def _optional_float(value: Any) -> float | None:
    return None if value in (None, "") else float(value)


def _rows_from_json(text: str) -> tuple[list[RegisterRow], str, str]:
    record = json.loads(text)
    if not isinstance(record, dict) or not isinstance(record.get("rooms"), list):
        raise ValueError("no 'rooms' list")
    rows = []
    for room in record["rooms"]:
        verdict = room.get("floor_verdict", "")
        rows.append(
            RegisterRow(
                file=str(room["file"]),
                status=str(room["status"]),
                room_id=str(room.get("room_id") or ""),
                room_name=str(room.get("room_name") or ""),
                purpose=str(room.get("purpose") or ""),
                assessed_on=str(room.get("assessed_on") or ""),
                assessor=str(room.get("assessor") or ""),
                floor_criteria=str(room.get("floor_criteria") or ""),
                floor_passed=None if verdict not in (PASS, FAIL) else verdict == PASS,
                window_low_ohm=_optional_float(room.get("window_low_ohm")),
                window_high_ohm=_optional_float(room.get("window_high_ohm")),
                readings_ohm=_floats(room.get("readings_ohm") or ()),
                points_outside=tuple(int(p) for p in room.get("points_outside") or ()),
                findings=tuple(
                    FindingKey(
                        str(f["rule"]),
                        one_line(str(f.get("subject", ""))),
                        str(f.get("severity", "note")),
                    )
                    for f in room.get("findings") or ()
                ),
                input_sha256=str(room.get("input_sha256") or ""),
                worksheet=str(room.get("worksheet") or ""),
                worksheet_sha256=str(room.get("worksheet_sha256") or ""),
                warnings=tuple(room.get("warnings") or ()),
                problems=tuple(room.get("problems") or ()),
                worst_probability=_optional_float(room.get("worst_probability")),
            )
        )
    return rows, str(record.get("tool_version", "")), str(record.get("rules_sha256", ""))


def _split(cell: str | None, separator: str) -> list[str]:
    return [part.strip() for part in (cell or "").split(separator) if part.strip()]


def _rows_from_csv(text: str) -> tuple[list[RegisterRow], str, str]:
    reader = csv.DictReader(io.StringIO(text, newline=""))
    if not reader.fieldnames or not {"file", "status"} <= set(reader.fieldnames):
        raise ValueError("no 'file' and 'status' columns")
    rows, version, digest = [], "", ""
    for written in reader:
        cells = {key: restored(value or "") for key, value in written.items() if key is not None}
        findings = []
        for line in _split(cells.get("findings"), "\n"):
            rule, severity, subject = [*line.split(_FINDING_SEPARATOR.strip(), 2), "", ""][:3]
            findings.append(FindingKey(rule.strip(), one_line(subject), severity.strip() or "note"))
        verdict = cells.get("floor_verdict") or ""
        rows.append(
            RegisterRow(
                file=cells["file"],
                status=cells["status"],
                room_id=cells.get("room_id") or "",
                room_name=cells.get("room_name") or "",
                purpose=cells.get("purpose") or "",
                assessed_on=cells.get("assessed_on") or "",
                assessor=cells.get("assessor") or "",
                floor_criteria=cells.get("floor_criteria") or "",
                floor_passed=None if verdict not in (PASS, FAIL) else verdict == PASS,
                window_low_ohm=_optional_float(cells.get("window_low_ohm")),
                window_high_ohm=_optional_float(cells.get("window_high_ohm")),
                readings_ohm=_floats(_split(cells.get("readings_ohm"), _LIST_SEPARATOR.strip())),
                points_outside=tuple(
                    int(p) for p in _split(cells.get("points_outside"), _LIST_SEPARATOR.strip())
                ),
                findings=tuple(findings),
                input_sha256=cells.get("input_sha256") or "",
                worksheet=cells.get("worksheet") or "",
                worksheet_sha256=cells.get("worksheet_sha256") or "",
                warnings=tuple(_split(cells.get("warnings"), "\n")),
                problems=tuple(_split(cells.get("problems"), "\n")),
                worst_probability=_optional_float(cells.get("worst_probability") or None),
            )
        )
        version = version or cells.get("tool_version") or ""
        digest = digest or cells.get("rules_sha256") or ""
    return rows, version, digest
