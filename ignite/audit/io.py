"""The register on disk: its CSV and JSON, written whole or not at all, and read back.

`register_csv` and `register_json` turn an `AuditReport` into bytes; `publish` puts
bytes in place through a temporary file and a rename (never replacing a file unless
asked); `read_register` reads an earlier audit's register from its JSON or its CSV.
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import os
import secrets
from collections.abc import Iterable
from pathlib import Path
from typing import Any

from ignite.errors import IgniteError, OutputExistsError
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
)
"""The register's CSV header. List cells: readings and point numbers joined by "; ",
findings, warnings and problems one a line ("rule | severity | subject" for findings)."""

_LIST_SEPARATOR = "; "
_FINDING_SEPARATOR = " | "


class RegisterError(IgniteError):
    """A file given as an earlier register is not one (or cannot be read)."""


def existing_audit_files(output: Path) -> list[Path]:
    """The files of an earlier audit in `output` (register and summary)."""
    return [output / name for name in AUDIT_FILES if (output / name).exists()]


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

    Without `force`, an existing file is left alone and `OutputExistsError` raised.
    """
    temporary = path.with_name(f".{path.name}.{secrets.token_hex(4)}.tmp")
    write_new(temporary, data)
    try:
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


def register_csv(report: AuditReport) -> bytes:
    """The register as CSV (UTF-8, header row, one row per room file)."""
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
        }
        for severity in SEVERITIES:
            cells[severity] = str(row.count(severity)) if row.assessed else ""
        writer.writerow([cells[column] for column in CSV_COLUMNS])
    return buffer.getvalue().encode("utf-8")


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
    return (json.dumps(register_record(report), indent=2, ensure_ascii=False) + "\n").encode(
        "utf-8"
    )


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
    for cells in reader:
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
            )
        )
        version = version or cells.get("tool_version") or ""
        digest = digest or cells.get("rules_sha256") or ""
    return rows, version, digest
