"""A folder of room files in; a worksheet each, a register and a summary out.

`run_audit` finds every room file under a folder, assesses the rooms in parallel
worker processes (each loads the rules once), writes one worksheet per room, then the
register (CSV and JSON) and the summary PDF, last. It never prints: progress is
reported through a callback, and the command line (`ignite.cli.audit`) does the talking.

Nothing is lost and nothing is half-written:

- a room file that is invalid, unreadable or that trips an internal error becomes a
  register row with its problems; the other rooms carry on;
- the worksheets, the register and the summary are rendered into a hidden staging folder
  inside the output folder and moved into place together only when every room has run
  (`ignite.audit.io.publish_all`: a journal, then renames on the same file system, every
  file put back as it was on any failure); Ctrl-C and SIGTERM are held for the few
  milliseconds the moves take, so an interrupted audit has published all or nothing;
- a publication whose process was killed midway (SIGKILL, power cut) is undone by the
  next run into the same folder, which then needs no `force`;
- an earlier audit in the output folder (its register or summary) is never replaced
  unless `force` is given, and neither is any other file, except one holding exactly
  the bytes that would be written (the build is deterministic, so re-running an
  interrupted audit does not trip over the worksheets it had already put in place).

The register carries each room's readings and finding identifiers, so a later audit
can say what changed (`ignite.audit.compare`).
"""

from __future__ import annotations

import os
import re
import shutil
import signal
import tempfile
import threading
import time
from collections import deque
from collections.abc import Callable, Iterable, Iterator, Sequence
from concurrent.futures import FIRST_COMPLETED, Future, ProcessPoolExecutor, wait
from contextlib import contextmanager
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

from ignite import __version__, pipeline  # pipeline.* looked up per call: tests stand in for it
from ignite.audit.compare import compare
from ignite.audit.io import (
    REGISTER_CSV,
    REGISTER_JSON,
    SUMMARY_PDF,
    Staged,
    existing_audit_files,
    publish_all,
    recover,
    register_csv,
    register_json,
    same_bytes,
    sha256_hex,
    write_new,
)
from ignite.errors import InputError, OutputExistsError, PathError, SolveLimitError, unreadable
from ignite.records.register import (
    ASSESSED,
    ERROR,
    INVALID,
    AuditReport,
    Register,
    RegisterRow,
    SiteFinding,
    row_from_results,
)
from ignite.records.results import Results, severity_rank
from ignite.report.worksheet import prepare_drawing, render_worksheet
from ignite.report.worksheet.summary import render_summary
from ignite.room.ranges import Sampling
from ignite.rules.rulebook import Rulebook
from ignite.simulate.compute import METHODS
from ignite.simulate.kept import prepare as prepare_solving

ROOM_SUFFIXES = (".yaml", ".yml")
STAGING_PREFIX = ".ignite-audit-staging-"
ROOM_TIMEOUT = 120.0
"""Default time limit of one room [s]: a sample room takes a few seconds, a room at every
list limit under half a minute; a room still running after this is listed as not assessed."""


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


class _RoomTimeout(BaseException):
    """Raised by the alarm in this process when a room runs past its time limit.

    A BaseException, so that no `except Exception` on the way (the room's own error
    handling included) mistakes it for the room's failure."""


def _timed_out(index: int, file: str, limit: float) -> RoomRun:
    return RoomRun(
        index,
        file,
        ERROR,
        problems=(
            f"{file}: not assessed: still running after the time limit of {limit:g} s "
            "(--room-timeout); the other rooms went on",
        ),
        seconds=limit,
    )


class AuditInterrupted(KeyboardInterrupt):
    """The audit was stopped by Ctrl-C or SIGTERM (`cause`); `published` says what is there.

    `published` is empty when the output folder holds nothing of this run (it is as it
    was before), else the paths of every file of the audit, all in place.
    """

    def __init__(self, cause: KeyboardInterrupt, published: Sequence[Path]) -> None:
        super().__init__()
        self.cause = cause
        self.published = tuple(published)


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


# --------------------------------------------------------------------------- one room


def _said(exc: BaseException) -> str:
    """An error as the register records it: its kind and message, without the memory
    addresses an object's repr carries (" at 0x7f..."), so that the same rooms give the
    same register each run."""
    return re.sub(r" at 0x[0-9a-fA-F]+", "", f"{type(exc).__name__}: {exc}")


_WORKER: dict[str, Any] = {}


def _start_worker(rules_dir: str | None, digest: str) -> None:
    """Worker initialiser: load the rules once; leave Ctrl-C to the parent; end quietly
    on SIGTERM (the parent stops its workers so when a room runs past its time limit)."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    try:
        _prepare(_open_book(rules_dir), digest)
    except Exception as exc:  # reported on every room, never lost in a broken pool
        _WORKER.clear()
        _WORKER["failure"] = f"the worker could not load the rules: {_said(exc)}"


def _open_book(rules_dir: str | None) -> Rulebook:
    return pipeline.open_rulebook(Path(rules_dir) if rules_dir else None)


def _prepare(book: Rulebook, digest: str) -> None:
    _WORKER.clear()
    if book.digest != digest:
        _WORKER["failure"] = "the rule files changed while the audit was starting; run it again"
        return
    _WORKER["book"] = book


def assess_room(
    index: int,
    path: str,
    file: str,
    staging: str,
    paper: str,
    sampling: Sampling | None = None,
) -> RoomRun:
    """Assess one room and render its worksheet into the staging folder.

    Runs in a worker (after `_start_worker`) or in the parent (after `_prepare`).
    Never raises for anything a room file can cause: the outcome says what happened.
    """
    start = time.perf_counter()

    reason = unreadable(path)  # only regular files are read: a named pipe would block
    if reason is not None:
        return RoomRun(
            index,
            file,
            INVALID,
            problems=(f"{file}: cannot be read: {reason}",),
            seconds=time.perf_counter() - start,
        )
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
    digest = sha256_hex(data)

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
        bound, results = pipeline.evaluate_room(Path(path), book, sampling)
    except InputError as exc:
        return outcome(INVALID, [str(problem) for problem in exc.problems])
    except SolveLimitError as exc:
        return outcome(ERROR, [f"{file}: not assessed: {exc}"])
    except Exception as exc:
        return outcome(
            ERROR,
            [
                f"{file}: not assessed: internal error {_said(exc)} "
                "(please report it with the room file)"
            ],
        )
    try:
        pdf = render_worksheet(
            results,
            pipeline.rule_rows(book, set(bound.consulted)),
            METHODS,
            data.decode("utf-8"),
            paper="letter" if paper.lower() == "letter" else "A4",
        )
        staged = Path(staging) / f"{index:06d}.pdf"
        write_new(staged, pdf)
    except Exception as exc:
        return outcome(
            ERROR,
            [f"{file}: assessed, but the worksheet could not be written: {_said(exc)}"],
            results=results,
        )
    return outcome(
        ASSESSED,
        [],
        results=results,
        staged=str(staged),
        worksheet_name=pipeline.worksheet_path(results, None).name,
        worksheet_sha256=sha256_hex(pdf),
    )


# --------------------------------------------------------------------------- files


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
    room_timeout: float | None = ROOM_TIMEOUT,
    sampling: Sampling | None = None,
) -> AuditOutcome:
    """Audit every room file under `folder` into `output`.

    `book` is the rulebook already opened (and validated) from `rules_dir`; workers open
    the same folder once each and check they got the same digest. `jobs` worker processes
    (default `os.cpu_count()`; 1 runs in this process). A room still running after
    `room_timeout` seconds (None: no limit) is stopped and listed as an error. Raises `OutputExistsError` (before
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
    try:
        output.mkdir(parents=True, exist_ok=True)
        recover(output)  # a publication killed midway: put the folder back as it was
        _clear_stale_staging(output)
        staging = Path(tempfile.mkdtemp(prefix=f"{STAGING_PREFIX}{os.getpid()}-", dir=output))
    except OSError as exc:
        raise PathError.unwritable(output, exc) from None
    published: list[Path] = []
    try:
        runs = _run_all(
            rooms, folder, staging, book, rules_dir, jobs, paper, progress, room_timeout, sampling
        )
        names = _worksheet_names(runs)
        report = build_report(folder, runs, names, book, previous, paper)
        files = _stage_outputs(runs, names, report, staging)
        if not force:  # refuse before anything moves
            publish_check(files, output)
        with _signals_held():
            try:
                published = publish_all(files, output, staging / "replaced", force=force)
            except OSError as exc:
                raise PathError.unwritable(Path(exc.filename or output), exc) from None
    except KeyboardInterrupt as exc:
        raise AuditInterrupted(exc, published) from None
    finally:
        shutil.rmtree(staging, ignore_errors=True)
    worksheets = [output / names[run.index] for run in runs if run.index in names]
    written = [output / name for name in (REGISTER_CSV, REGISTER_JSON, SUMMARY_PDF)]
    return AuditOutcome(
        report, tuple(runs), tuple(written), tuple(worksheets), time.perf_counter() - start
    )


def publish_check(files: Sequence[Staged], output: Path) -> None:
    """`OutputExistsError` for the first file whose name is taken by other bytes."""
    for file in files:
        target = output / file.name
        if (target.exists() or target.is_symlink()) and not same_bytes(target, file.sha256):
            raise OutputExistsError(target)


@contextmanager
def _signals_held() -> Iterator[None]:
    """Hold Ctrl-C and SIGTERM while the files move into place; deliver them after.

    The moves take milliseconds; an interruption then takes effect with the audit's
    output wholly in place (or wholly rolled back), never half of it.
    """
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    caught: list[int] = []

    def hold(signum: int, frame: object) -> None:
        caught.append(signum)

    wanted = (signal.SIGINT, signal.SIGTERM)
    previous = {number: signal.signal(number, hold) for number in wanted}
    try:
        yield
    finally:
        for number, handler in previous.items():
            signal.signal(number, handler)
        if caught:
            signal.raise_signal(caught[0])


def _run_all(
    rooms: Sequence[Path],
    folder: Path,
    staging: Path,
    book: Rulebook,
    rules_dir: Path | None,
    jobs: int | None,
    paper: str,
    progress: Progress | None,
    room_timeout: float | None = None,
    sampling: Sampling | None = None,
) -> list[RoomRun]:
    tasks = [
        (index, str(path), path.relative_to(folder).as_posix(), str(staging), paper, sampling)
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
                done(_assess_here(task, room_timeout))
        finally:
            _WORKER.clear()
    else:
        prepare_drawing()  # once here, not in each worker (forked, they inherit it)
        prepare_solving()
        initargs = (str(rules_dir) if rules_dir else None, book.digest)
        queue: deque[Task] = deque(tasks)
        while queue:  # a fresh pool after each room stopped for its time limit
            _run_pool(queue, workers, initargs, room_timeout, done)
    return sorted(runs, key=lambda run: run.index)


Task = tuple[int, str, str, str, str, Sampling | None]  # the arguments of assess_room


def _assess_here(task: Task, limit: float | None) -> RoomRun:
    """One room in this process, stopped by an alarm after `limit` seconds where the
    platform has one (SIGALRM) and this is the main thread; else without a limit."""
    usable = (
        limit is not None
        and hasattr(signal, "setitimer")
        and threading.current_thread() is threading.main_thread()
    )
    if not usable or limit is None:
        return assess_room(*task)

    def alarm(signum: int, frame: object) -> None:
        raise _RoomTimeout

    previous = signal.signal(signal.SIGALRM, alarm)
    try:
        signal.setitimer(signal.ITIMER_REAL, limit)
        try:
            return assess_room(*task)
        finally:
            signal.setitimer(signal.ITIMER_REAL, 0)
    except _RoomTimeout:
        return _timed_out(task[0], task[2], limit)
    finally:
        signal.signal(signal.SIGALRM, previous)


def _run_pool(
    queue: deque[Task],
    workers: int,
    initargs: tuple[str | None, str],
    limit: float | None,
    done: Callable[[RoomRun], None],
) -> None:
    """Run rooms from `queue` in one pool, at most one a worker at a time, so that each
    room's clock starts when it does. When a room passes `limit`, it is listed as timed
    out, the pool's processes are stopped (nothing says which one runs which room), the
    rooms still running go back to the front of the queue, and this returns."""
    pool = ProcessPoolExecutor(
        max_workers=min(workers, len(queue)), initializer=_start_worker, initargs=initargs
    )
    running: dict[Future[RoomRun], tuple[Task, float]] = {}
    try:
        while queue or running:
            while queue and len(running) < workers:
                task = queue.popleft()
                running[pool.submit(assess_room, *task)] = (task, time.monotonic())
            wait_for = None
            if limit is not None:
                first = min(started for _, started in running.values())
                wait_for = max(0.0, first + limit - time.monotonic())
            finished, _ = wait(running, timeout=wait_for, return_when=FIRST_COMPLETED)
            for future in finished:
                task, _ = running.pop(future)
                done(_outcome(future, task))
            if limit is None:
                continue
            now = time.monotonic()
            late = [f for f, (_, started) in running.items() if now - started >= limit]
            if late:
                for future in late:
                    task, _ = running.pop(future)
                    done(_timed_out(task[0], task[2], limit))
                queue.extendleft(reversed([task for task, _ in running.values()]))
                running.clear()
                _stop(pool)
                return
    except BaseException:
        _stop(pool)
        raise
    pool.shutdown(wait=True)


def _outcome(future: Future[RoomRun], task: Task) -> RoomRun:
    try:
        return future.result()
    except Exception as exc:  # a worker died (killed, out of memory, ...)
        index, _, file, _, _, _ = task
        return RoomRun(
            index,
            file,
            ERROR,
            problems=(
                f"{file}: not assessed: the worker process stopped ({_said(exc)}); "
                "run the audit again",
            ),
        )


def _stop(pool: ProcessPoolExecutor) -> None:
    """Stop the pool's worker processes (ours, by their ids) and the pool itself."""
    processes = list((getattr(pool, "_processes", None) or {}).values())
    for process in processes:
        if process.is_alive():
            process.terminate()
    for process in processes:
        process.join(5)
        if process.is_alive():
            process.kill()
            process.join(5)
    pool.shutdown(wait=True, cancel_futures=True)


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


def _stage_outputs(
    runs: Sequence[RoomRun], names: dict[int, str], report: AuditReport, staging: Path
) -> list[Staged]:
    """The worksheets (already staged), then the register and the summary, rendered into
    the staging folder: everything the audit publishes, in the order it is moved."""
    files = [
        Staged(Path(run.staged), names[run.index], run.worksheet_sha256)
        for run in runs
        if run.index in names
    ]
    for name, render in (
        (REGISTER_CSV, register_csv),
        (REGISTER_JSON, register_json),
        (SUMMARY_PDF, render_summary),
    ):
        data = render(report)
        write_new(staging / name, data)
        files.append(Staged(staging / name, name, sha256_hex(data)))
    return files


# --------------------------------------------------------------------------- register


def build_report(
    folder: Path,
    runs: Sequence[RoomRun],
    names: dict[int, str],
    book: Rulebook,
    previous: Register | None,
    paper: str,
) -> AuditReport:
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
    rows = _warn_duplicate_ids(rows)
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


def _warn_duplicate_ids(rows: Sequence[RegisterRow]) -> list[RegisterRow]:
    """Rows whose room id another room file also gives (ignoring case) carry a warning."""
    files: dict[str, list[str]] = {}
    for row in rows:
        if row.room_id:
            files.setdefault(row.room_id.casefold(), []).append(row.file)
    marked = []
    for row in rows:
        sharing = files.get(row.room_id.casefold(), []) if row.room_id else []
        if len(sharing) > 1:
            others = ", ".join(file for file in sharing if file != row.file)
            warning = (
                f"room id {row.room_id} is given by {len(sharing)} room files (also {others}); "
                "the register and a later comparison cannot tell these rooms apart by id"
            )
            row = replace(row, warnings=(*row.warnings, warning))
        marked.append(row)
    return marked
