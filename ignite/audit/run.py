"""A folder of room files in; a worksheet each, a register and a summary out.

`run_audit` finds every room file under a folder, assesses the rooms in parallel
worker processes (each loads the rules once), writes one worksheet per room, then the
register (CSV and JSON) and the summary PDF, last. It never prints: progress is
reported through a callback, and the command line (`audit_cli.py`) does the talking.

Nothing is lost and nothing is half-written:

- a room file that is invalid, unreadable or that trips an internal error becomes a
  register row with its problems; the other rooms carry on;
- the worksheets are rendered into a hidden staging folder inside the output folder and
  moved into place (`os.replace`, same file system) only when every room has run; the
  register and the summary are written after them, each through a temporary file;
- an earlier audit in the output folder (its register or summary) is never replaced
  unless `force` is given, and neither is any other file, except one holding exactly
  the bytes that would be written (the build is deterministic, so re-running an
  interrupted audit does not trip over the worksheets it had already put in place).

The register carries each room's readings and finding identifiers, so a later audit
can say what changed (`compare`): readings that moved, rooms that left or re-entered
their floor window, findings that appeared or cleared.
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import os
import secrets
import shutil
import signal
import tempfile
import time
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ignite.errors import IgniteError, InputError, OutputExistsError
from ignite.records.results import SEVERITIES, Finding, Results, severity_rank
from ignite.rules.rulebook import Rulebook

ROOM_SUFFIXES = (".yaml", ".yml")
REGISTER_CSV = "audit-register.csv"
REGISTER_JSON = "audit-register.json"
SUMMARY_PDF = "audit-summary.pdf"
AUDIT_FILES = (REGISTER_CSV, REGISTER_JSON, SUMMARY_PDF)
"""The files that mark a folder as holding an audit, in the order they are written."""

STAGING_PREFIX = ".ignite-audit-staging-"
CAUTION = (
    "The figures support, and never replace, local codes, the manufacturer's instructions "
    "and licensed professional judgement."
)
REGISTER_FORMAT = 1

ASSESSED, INVALID, ERROR = "assessed", "invalid", "error"
"""Row statuses: worksheet written; the room file has problems; ignite failed on it."""

PASS, FAIL = "pass", "fail"

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


# --------------------------------------------------------------------------- records


@dataclass(frozen=True, order=True)
class FindingKey:
    """What identifies a finding from one audit to the next."""

    rule: str
    subject: str
    severity: str = field(compare=False, default="note")

    @property
    def identity(self) -> tuple[str, str]:
        return self.rule, self.subject

    def __str__(self) -> str:
        return f"{self.rule} ({self.subject})" if self.subject else self.rule


@dataclass(frozen=True)
class RegisterRow:
    """One room file of an audit: what the register holds for it."""

    file: str  # path relative to the audited folder, with "/"
    status: str  # ASSESSED | INVALID | ERROR
    room_id: str = ""
    room_name: str = ""
    purpose: str = ""
    assessed_on: str = ""
    assessor: str = ""
    floor_criteria: str = ""
    floor_passed: bool | None = None
    window_low_ohm: float | None = None
    window_high_ohm: float | None = None
    readings_ohm: tuple[float, ...] = ()
    points_outside: tuple[int, ...] = ()  # 1-based test points outside the window
    findings: tuple[FindingKey, ...] = ()
    input_sha256: str = ""
    worksheet: str = ""  # file name in the output folder; "" when none was written
    worksheet_sha256: str = ""
    warnings: tuple[str, ...] = ()
    problems: tuple[str, ...] = ()

    @property
    def assessed(self) -> bool:
        return self.status == ASSESSED or (self.status == ERROR and bool(self.room_id))

    @property
    def verdict(self) -> str:
        if self.floor_passed is None:
            return ""
        return PASS if self.floor_passed else FAIL

    @property
    def lowest_ohm(self) -> float | None:
        return min(self.readings_ohm) if self.readings_ohm else None

    @property
    def highest_ohm(self) -> float | None:
        return max(self.readings_ohm) if self.readings_ohm else None

    @property
    def worst_severity(self) -> str:
        """The worst severity found; "none" for a room without findings, "" if not assessed."""
        if not self.findings:
            return "none" if self.assessed else ""
        return min((f.severity for f in self.findings), key=severity_rank)

    def count(self, severity: str) -> int:
        return sum(1 for f in self.findings if f.severity == severity)


@dataclass(frozen=True)
class SiteFinding:
    """One finding of one room, for the summary's list of the worst across the site."""

    room_id: str
    room_name: str
    finding: Finding


@dataclass(frozen=True)
class RoomChange:
    """How one room stands against the previous audit."""

    room_id: str
    room_name: str
    file: str
    kind: str  # "compared" | "new" (not in the previous register) | "gone" (only there)
    status_then: str = ""
    status_now: str = ""
    verdict_then: str = ""
    verdict_now: str = ""
    readings_then: tuple[float, ...] = ()
    readings_now: tuple[float, ...] = ()
    moved: tuple[int, ...] = ()  # 1-based points whose reading changed or exists on one side only
    window_low_ohm: float | None = None
    window_high_ohm: float | None = None
    appeared: tuple[FindingKey, ...] = ()
    cleared: tuple[FindingKey, ...] = ()
    worst_then: str = ""
    worst_now: str = ""
    date_then: str = ""  # assessed_on in the previous register
    date_now: str = ""

    @property
    def window_event(self) -> str:
        if self.verdict_then == PASS and self.verdict_now == FAIL:
            return "left its window"
        if self.verdict_then == FAIL and self.verdict_now == PASS:
            return "re-entered its window"
        return ""

    @property
    def changed(self) -> bool:
        return bool(
            self.kind != "compared"
            or self.status_then != self.status_now
            or self.verdict_then != self.verdict_now
            or self.moved
            or self.appeared
            or self.cleared
        )

    def describe(self) -> str:
        """The change in one line, as the register's `change_since_previous` holds it."""
        from ignite.wording.numbers import format_si

        if self.kind == "new":
            return "new: not in the previous register"
        if self.kind == "gone":
            return "gone: in the previous register, not in this audit"
        parts: list[str] = []
        if self.status_then != self.status_now:
            parts.append(f"status {self.status_then} → {self.status_now}")
        if self.window_event:
            parts.append(f"{self.window_event} ({self.verdict_then} → {self.verdict_now})")
        if self.moved:
            then, now = self.readings_then, self.readings_now
            moves = []
            for point in self.moved:
                before = format_si(then[point - 1], "Ω") if point <= len(then) else "none"
                after = format_si(now[point - 1], "Ω") if point <= len(now) else "none"
                moves.append(f"#{point} {before} → {after}")
            total = max(len(then), len(now))
            parts.append(f"{len(self.moved)} of {total} readings moved: " + ", ".join(moves))
        if self.appeared:
            parts.append("appeared: " + ", ".join(map(str, self.appeared)))
        if self.cleared:
            parts.append("cleared: " + ", ".join(map(str, self.cleared)))
        return "; ".join(parts) if parts else "no change"

    def to_record(self) -> dict[str, Any]:
        return {
            "kind": self.kind,
            "room_id": self.room_id,
            "file": self.file,
            "status_then": self.status_then,
            "status_now": self.status_now,
            "verdict_then": self.verdict_then,
            "verdict_now": self.verdict_now,
            "window_event": self.window_event,
            "readings_then_ohm": list(self.readings_then),
            "readings_now_ohm": list(self.readings_now),
            "points_moved": list(self.moved),
            "findings_appeared": [_finding_record(f) for f in self.appeared],
            "findings_cleared": [_finding_record(f) for f in self.cleared],
            "worst_then": self.worst_then,
            "worst_now": self.worst_now,
            "assessed_on_then": self.date_then,
            "assessed_on_now": self.date_now,
            "text": self.describe(),
        }


@dataclass(frozen=True)
class Register:
    """A register read back from disk (an earlier audit)."""

    path: Path
    sha256: str
    rows: tuple[RegisterRow, ...]
    tool_version: str = ""
    rules_digest: str = ""


@dataclass(frozen=True)
class AuditReport:
    """Everything the register and the summary are made from."""

    folder: str
    tool_version: str
    rules_digest: str
    rows: tuple[RegisterRow, ...]
    site_findings: tuple[SiteFinding, ...]  # every finding of the site, worst first
    previous: Register | None = None
    changes: tuple[RoomChange, ...] = ()
    paper: str = "a4"

    @property
    def not_assessed(self) -> tuple[RegisterRow, ...]:
        return tuple(row for row in self.rows if row.status != ASSESSED)

    def change_for(self, row: RegisterRow) -> RoomChange | None:
        for change in self.changes:
            if change.kind != "gone" and change.file == row.file:
                return change
        return None


@dataclass(frozen=True)
class RoomRun:
    """What one worker sends back for one room file."""

    index: int
    file: str
    status: str
    results: Results | None = None
    problems: tuple[str, ...] = ()
    input_sha256: str = ""
    staged: str = ""  # the worksheet, in the staging folder; "" if none was rendered
    worksheet_name: str = ""
    worksheet_sha256: str = ""
    seconds: float = 0.0


@dataclass(frozen=True)
class AuditOutcome:
    report: AuditReport
    runs: tuple[RoomRun, ...]
    written: tuple[Path, ...]  # register CSV, register JSON, summary PDF
    worksheets: tuple[Path, ...]
    seconds: float


Progress = Callable[[RoomRun, int, int], None]
"""Called in the parent as each room finishes: (run, rooms done, rooms in all)."""


# --------------------------------------------------------------------------- discovery


def discover_rooms(folder: Path) -> list[Path]:
    """Every room file under `folder`, recursively, sorted by relative path.

    Room files end in .yaml or .yml (any case). Hidden files and folders (name starting
    with ".") are skipped, and so are symbolic links to folders, so a link loop cannot
    stall an audit.
    """
    folder = Path(folder)
    found: list[Path] = []
    for root, dirs, files in os.walk(folder):
        dirs[:] = sorted(d for d in dirs if not d.startswith("."))
        for name in files:
            if not name.startswith(".") and os.path.splitext(name)[1].lower() in ROOM_SUFFIXES:
                found.append(Path(root) / name)
    return sorted(found, key=lambda p: p.relative_to(folder).parts)


def existing_audit_files(output: Path) -> list[Path]:
    """The files of an earlier audit in `output` (register and summary)."""
    return [output / name for name in AUDIT_FILES if (output / name).exists()]


# --------------------------------------------------------------------------- one room


_WORKER: dict[str, Any] = {}


def _start_worker(rules_dir: str | None, digest: str) -> None:
    """Worker initialiser: load the rules once; leave Ctrl-C to the parent."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    try:
        _prepare(_open_book(rules_dir), digest)
    except Exception as exc:  # reported on every room, never lost in a broken pool
        _WORKER.clear()
        _WORKER["failure"] = f"the worker could not load the rules: {type(exc).__name__}: {exc}"


def _open_book(rules_dir: str | None) -> Rulebook:
    from ignite.pipeline import open_rulebook

    return open_rulebook(Path(rules_dir) if rules_dir else None)


def _prepare(book: Rulebook, digest: str) -> None:
    _WORKER.clear()
    if book.digest != digest:
        _WORKER["failure"] = "the rule files changed while the audit was starting; run it again"
        return
    _WORKER["book"] = book


def _sha256(data: bytes) -> str:
    return hashlib.sha256(data).hexdigest()


def assess_room(index: int, path: str, file: str, staging: str, paper: str) -> RoomRun:
    """Assess one room and render its worksheet into the staging folder.

    Runs in a worker (after `_start_worker`) or in the parent (after `_prepare`).
    Never raises for anything a room file can cause: the outcome says what happened.
    """
    start = time.perf_counter()

    try:
        data = Path(path).read_bytes()
    except OSError as exc:
        return RoomRun(
            index,
            file,
            INVALID,
            problems=(f"{file}: cannot be read: {exc.strerror or exc}",),
            seconds=time.perf_counter() - start,
        )
    digest = _sha256(data)

    def outcome(status: str, problems: Iterable[str], **more: Any) -> RoomRun:
        return RoomRun(
            index,
            file,
            status,
            problems=tuple(problems),
            input_sha256=digest,
            seconds=time.perf_counter() - start,
            **more,
        )

    if "failure" in _WORKER:
        return outcome(ERROR, [f"{file}: {_WORKER['failure']}"])
    book: Rulebook = _WORKER["book"]
    try:
        from ignite.pipeline import evaluate_room

        bound, results = evaluate_room(Path(path), book)
    except InputError as exc:
        return outcome(INVALID, [str(problem) for problem in exc.problems])
    except Exception as exc:
        return outcome(
            ERROR,
            [
                f"{file}: not assessed: internal error {type(exc).__name__}: {exc} "
                "(please report it with the room file)"
            ],
        )
    try:
        from ignite.pipeline import rule_rows, worksheet_path
        from ignite.report.worksheet import render_worksheet
        from ignite.simulate.compute import METHODS

        pdf = render_worksheet(
            results,
            rule_rows(book, set(bound.consulted)),
            METHODS,
            data.decode("utf-8"),
            paper="letter" if paper.lower() == "letter" else "A4",
        )
        staged = Path(staging) / f"{index:06d}.pdf"
        _write_new(staged, pdf)
    except Exception as exc:
        return outcome(
            ERROR,
            [
                f"{file}: assessed, but the worksheet could not be written: "
                f"{type(exc).__name__}: {exc}"
            ],
            results=results,
        )
    return outcome(
        ASSESSED,
        [],
        results=results,
        staged=str(staged),
        worksheet_name=worksheet_path(results, None).name,
        worksheet_sha256=_sha256(pdf),
    )


# --------------------------------------------------------------------------- files


def _write_new(path: Path, data: bytes) -> None:
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
    _write_new(temporary, data)
    try:
        _move(temporary, path, force=force)
    finally:
        temporary.unlink(missing_ok=True)


def _move(source: Path, target: Path, *, force: bool) -> None:
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


def _same_bytes(path: Path, sha256: str) -> bool:
    try:
        return path.is_file() and _sha256(path.read_bytes()) == sha256
    except OSError:
        return False


def _clear_stale_staging(output: Path) -> None:
    """Remove staging folders left by an audit that was killed (its process is gone)."""
    for entry in output.glob(f"{STAGING_PREFIX}*"):
        pid_text = entry.name[len(STAGING_PREFIX) :].split("-", 1)[0]
        if not entry.is_dir() or not pid_text.isdigit():
            continue
        try:
            os.kill(int(pid_text), 0)
        except ProcessLookupError:
            shutil.rmtree(entry, ignore_errors=True)
        except OSError:
            pass  # alive, or not ours to judge


# --------------------------------------------------------------------------- the audit


def run_audit(
    folder: Path,
    output: Path,
    book: Rulebook,
    *,
    rules_dir: Path | None = None,
    previous: Register | None = None,
    jobs: int | None = None,
    paper: str = "a4",
    force: bool = False,
    progress: Progress | None = None,
) -> AuditOutcome:
    """Audit every room file under `folder` into `output`.

    `book` is the rulebook already opened (and validated) from `rules_dir`; workers open
    the same folder once each and check they got the same digest. `jobs` worker processes
    (default `os.cpu_count()`; 1 runs in this process). Raises `OutputExistsError` (before
    any work) when `output` holds an earlier audit and `force` is not given, and (before
    anything is written) when a worksheet name is taken by a different file.
    """
    start = time.perf_counter()
    folder, output = Path(folder), Path(output)
    rooms = discover_rooms(folder)
    if not force:
        earlier = existing_audit_files(output)
        if earlier:
            raise OutputExistsError(earlier[0])
    output.mkdir(parents=True, exist_ok=True)
    _clear_stale_staging(output)
    staging = Path(tempfile.mkdtemp(prefix=f"{STAGING_PREFIX}{os.getpid()}-", dir=output))
    try:
        runs = _run_all(rooms, folder, staging, book, rules_dir, jobs, paper, progress)
        names = _worksheet_names(runs)
        _check_targets(runs, names, output, force)
        worksheets = _put_in_place(runs, names, output, force)
        report = build_report(folder, runs, names, book, previous, paper)
        written = write_outputs(report, output, force=force)
    finally:
        shutil.rmtree(staging, ignore_errors=True)
    return AuditOutcome(
        report, tuple(runs), tuple(written), tuple(worksheets), time.perf_counter() - start
    )


def _run_all(
    rooms: Sequence[Path],
    folder: Path,
    staging: Path,
    book: Rulebook,
    rules_dir: Path | None,
    jobs: int | None,
    paper: str,
    progress: Progress | None,
) -> list[RoomRun]:
    tasks = [
        (index, str(path), path.relative_to(folder).as_posix(), str(staging), paper)
        for index, path in enumerate(rooms)
    ]
    workers = max(1, min(jobs or os.cpu_count() or 1, len(tasks)))
    runs: list[RoomRun] = []

    def done(run: RoomRun) -> None:
        runs.append(run)
        if progress is not None:
            progress(run, len(runs), len(tasks))

    if workers == 1:
        _prepare(book, book.digest)
        try:
            for task in tasks:
                done(assess_room(*task))
        finally:
            _WORKER.clear()
    else:
        from concurrent.futures import ProcessPoolExecutor, as_completed

        pool = ProcessPoolExecutor(
            max_workers=workers,
            initializer=_start_worker,
            initargs=(str(rules_dir) if rules_dir else None, book.digest),
        )
        try:
            futures = {pool.submit(assess_room, *task): task for task in tasks}
            for future in as_completed(futures):
                try:
                    run = future.result()
                except Exception as exc:  # a worker died (killed, out of memory, ...)
                    index, _, file, _, _ = futures[future]
                    run = RoomRun(
                        index,
                        file,
                        ERROR,
                        problems=(
                            f"{file}: not assessed: the worker process stopped "
                            f"({type(exc).__name__}: {exc}); run the audit again",
                        ),
                    )
                done(run)
        except BaseException:
            pool.shutdown(wait=True, cancel_futures=True)
            raise
        pool.shutdown(wait=True)
    return sorted(runs, key=lambda run: run.index)


def _worksheet_names(runs: Sequence[RoomRun]) -> dict[int, str]:
    """Final worksheet names; a name two room files share gets "-2", "-3", ... in file order."""
    names: dict[int, str] = {}
    taken: set[str] = set()
    for run in runs:
        if not run.staged:
            continue
        name = run.worksheet_name
        number = 1
        while name.lower() in taken:
            number += 1
            stem, suffix = os.path.splitext(run.worksheet_name)
            name = f"{stem}-{number}{suffix}"
        taken.add(name.lower())
        names[run.index] = name
    return names


def _check_targets(
    runs: Sequence[RoomRun], names: dict[int, str], output: Path, force: bool
) -> None:
    if force:
        return
    for run in runs:
        if run.index in names:
            target = output / names[run.index]
            if target.exists() and not _same_bytes(target, run.worksheet_sha256):
                raise OutputExistsError(target)


def _put_in_place(
    runs: Sequence[RoomRun], names: dict[int, str], output: Path, force: bool
) -> list[Path]:
    placed = []
    for run in runs:
        if run.index not in names:
            continue
        target = output / names[run.index]
        if not force and _same_bytes(target, run.worksheet_sha256):
            Path(run.staged).unlink()
        else:
            _move(Path(run.staged), target, force=force)
        placed.append(target)
    return placed


# --------------------------------------------------------------------------- register


def row_from_results(
    file: str,
    results: Results,
    *,
    status: str = ASSESSED,
    worksheet: str = "",
    worksheet_sha256: str = "",
    problems: Sequence[str] = (),
) -> RegisterRow:
    floor = results.floor
    return RegisterRow(
        file=file,
        status=status,
        room_id=results.room.id,
        room_name=results.room.name,
        purpose=results.room.purpose,
        assessed_on=results.room.assessed_on,
        assessor=results.room.assessor,
        floor_criteria=floor.criteria,
        floor_passed=floor.passed,
        window_low_ohm=floor.window_low_ohm,
        window_high_ohm=floor.window_high_ohm,
        readings_ohm=tuple(floor.readings_ohm),
        points_outside=tuple(i + 1 for i in floor.readings_outside),
        findings=tuple(
            FindingKey(f.rule, _one_line(f.subject), f.severity) for f in results.findings
        ),
        input_sha256=results.input_sha256,
        worksheet=worksheet,
        worksheet_sha256=worksheet_sha256,
        warnings=tuple(results.warnings),
        problems=tuple(problems),
    )


def build_report(
    folder: Path,
    runs: Sequence[RoomRun],
    names: dict[int, str],
    book: Rulebook,
    previous: Register | None,
    paper: str,
) -> AuditReport:
    from ignite import __version__

    rows: list[RegisterRow] = []
    site: list[SiteFinding] = []
    for run in runs:
        if run.results is None:
            rows.append(
                RegisterRow(
                    run.file, run.status, input_sha256=run.input_sha256, problems=run.problems
                )
            )
            continue
        name = names.get(run.index, "")
        problems = list(run.problems)
        if name and name != run.worksheet_name:
            problems.append(
                f"{run.file}: another room file gives the worksheet name "
                f"{run.worksheet_name}; this one is saved as {name}"
            )
        rows.append(
            row_from_results(
                run.file,
                run.results,
                status=run.status,
                worksheet=name,
                worksheet_sha256=run.worksheet_sha256 if name else "",
                problems=problems,
            )
        )
        site += [
            SiteFinding(run.results.room.id, run.results.room.name, f) for f in run.results.findings
        ]
    site.sort(
        key=lambda s: (
            severity_rank(s.finding.severity),
            s.room_id,
            s.finding.rule,
            s.finding.subject,
        )
    )
    changes = compare(previous.rows, rows) if previous is not None else ()
    return AuditReport(
        str(folder),
        __version__,
        book.digest,
        tuple(rows),
        tuple(site),
        previous,
        tuple(changes),
        paper,
    )


def _one_line(text: str) -> str:
    return " ".join(text.split())


def _finding_record(key: FindingKey) -> dict[str, str]:
    return {"rule": key.rule, "severity": key.severity, "subject": key.subject}


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
            "change_since_previous": change.describe() if change else "",
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
                "change_since_previous": change.to_record() if change else None,
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
        "rooms_gone": [c.to_record() for c in report.changes if c.kind == "gone"],
    }


def register_json(report: AuditReport) -> bytes:
    return (json.dumps(register_record(report), indent=2, ensure_ascii=False) + "\n").encode(
        "utf-8"
    )


def write_outputs(report: AuditReport, output: Path, *, force: bool) -> list[Path]:
    """Register CSV, register JSON, then the summary PDF; each whole or not at all."""
    from ignite.report.worksheet.summary import render_summary

    written = []
    for name, data in (
        (REGISTER_CSV, register_csv(report)),
        (REGISTER_JSON, register_json(report)),
    ):
        publish(output / name, data, force=force)
        written.append(output / name)
    publish(output / SUMMARY_PDF, render_summary(report), force=force)
    written.append(output / SUMMARY_PDF)
    return written


# --------------------------------------------------------------------------- an earlier register


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
    return Register(path, _sha256(data), tuple(rows), version, digest)


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
                        _one_line(str(f.get("subject", ""))),
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
            findings.append(
                FindingKey(rule.strip(), _one_line(subject), severity.strip() or "note")
            )
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


# --------------------------------------------------------------------------- comparison


def compare(then: Sequence[RegisterRow], now: Sequence[RegisterRow]) -> list[RoomChange]:
    """Each room of `now` against `then`, plus the rooms only `then` had.

    Rooms are paired by room id where the id is unique in both registers, otherwise
    (a room not assessed, or an id used twice) by file path.
    """
    unique = _unique_ids(then) & _unique_ids(now)
    left = list(then)
    matches: dict[int, RegisterRow] = {}
    for position, row in enumerate(now):
        if row.room_id in unique:
            matches[position] = next(r for r in left if r.room_id == row.room_id)
            left.remove(matches[position])
    for position, row in enumerate(now):
        if position not in matches and row.room_id not in unique:
            match = next((r for r in left if r.file == row.file and r.room_id not in unique), None)
            if match is not None:
                matches[position] = match
                left.remove(match)
    changes = [_change(matches.get(position), row) for position, row in enumerate(now)]
    return changes + [_change(row, None) for row in left]


def _worst_first(key: FindingKey) -> tuple[int, str, str]:
    rank = severity_rank(key.severity) if key.severity in SEVERITIES else len(SEVERITIES)
    return rank, key.rule, key.subject


def _unique_ids(rows: Sequence[RegisterRow]) -> set[str]:
    seen: dict[str, int] = {}
    for row in rows:
        if row.room_id:
            seen[row.room_id] = seen.get(row.room_id, 0) + 1
    return {room_id for room_id, count in seen.items() if count == 1}


def _change(then: RegisterRow | None, now: RegisterRow | None) -> RoomChange:
    some = now if now is not None else then
    assert some is not None
    if then is None or now is None:
        return RoomChange(
            some.room_id,
            some.room_name,
            some.file,
            "new" if then is None else "gone",
            status_then=then.status if then else "",
            status_now=now.status if now else "",
            verdict_then=then.verdict if then else "",
            verdict_now=now.verdict if now else "",
            readings_then=then.readings_ohm if then else (),
            readings_now=now.readings_ohm if now else (),
            window_low_ohm=some.window_low_ohm,
            window_high_ohm=some.window_high_ohm,
            worst_then=then.worst_severity if then else "",
            worst_now=now.worst_severity if now else "",
            date_then=then.assessed_on if then else "",
            date_now=now.assessed_on if now else "",
        )
    points = max(len(then.readings_ohm), len(now.readings_ohm))
    moved = tuple(
        point + 1
        for point in range(points)
        if point >= len(then.readings_ohm)
        or point >= len(now.readings_ohm)
        or then.readings_ohm[point] != now.readings_ohm[point]
    )
    if not then.readings_ohm or not now.readings_ohm:
        moved = ()  # one side was not assessed: its status says so, not its readings
    before = {f.identity: f for f in then.findings}
    after = {f.identity: f for f in now.findings}
    return RoomChange(
        now.room_id or then.room_id,
        now.room_name or then.room_name,
        now.file,
        "compared",
        status_then=then.status,
        status_now=now.status,
        verdict_then=then.verdict,
        verdict_now=now.verdict,
        readings_then=then.readings_ohm,
        readings_now=now.readings_ohm,
        moved=moved,
        window_low_ohm=now.window_low_ohm if now.readings_ohm else then.window_low_ohm,
        window_high_ohm=now.window_high_ohm if now.readings_ohm else then.window_high_ohm,
        appeared=tuple(sorted((f for k, f in after.items() if k not in before), key=_worst_first)),
        cleared=tuple(sorted((f for k, f in before.items() if k not in after), key=_worst_first)),
        worst_then=then.worst_severity,
        worst_now=now.worst_severity,
        date_then=then.assessed_on,
        date_now=now.assessed_on,
    )


__all__ = [
    "ASSESSED",
    "AUDIT_FILES",
    "ERROR",
    "INVALID",
    "REGISTER_CSV",
    "REGISTER_JSON",
    "SUMMARY_PDF",
    "AuditOutcome",
    "AuditReport",
    "FindingKey",
    "Register",
    "RegisterError",
    "RegisterRow",
    "RoomChange",
    "RoomRun",
    "SiteFinding",
    "assess_room",
    "compare",
    "discover_rooms",
    "existing_audit_files",
    "publish",
    "read_register",
    "register_csv",
    "register_json",
    "register_record",
    "run_audit",
]
