"""`ignite audit`: a folder of room files in; a worksheet each, a register and a summary out.

The work is done by `ignite.audit.run`; this module parses options, shows progress on
stderr and maps the outcome to the project's exit codes.
"""

from __future__ import annotations

import signal
import sys
from pathlib import Path
from types import FrameType
from typing import TYPE_CHECKING, NoReturn

import click

from ignite.cli.options import confidence_option, nominal_option, samples_option, sampling_of
from ignite.records.register import ERROR
from ignite.records.results import SEVERITIES
from ignite.room.ranges import Sampling
from ignite.wording.sentences import CLI_CAUTION

if TYPE_CHECKING:
    from ignite.audit.run import AuditOutcome, RoomRun

EXIT_CLEAN, EXIT_FINDINGS, EXIT_USAGE, EXIT_INVALID, EXIT_INTERNAL = 0, 1, 2, 3, 4
EXIT_INTERRUPTED, EXIT_TERMINATED = 130, 143  # 128 + SIGINT, 128 + SIGTERM
LEVELS = (*SEVERITIES, "never")
CAUTION = CLI_CAUTION

HELP = """Assess every room file under DIR: one worksheet each, then a register and a summary.

\b
Room files are *.yaml and *.yml under DIR, recursively, in sorted order; hidden files
and folders (name starting with ".") are skipped. OUTDIR receives:
  <room id>-<date>.pdf   one worksheet per room ("-2", "-3" when two files share a name)
  audit-register.csv     one row per room file: verdict, readings, findings, SHA-256s,
  audit-register.json    and the problems of every file that could not be assessed
  audit-summary.pdf      rooms against their verdicts, the worst findings, and the
                         changes since --previous (a register JSON or CSV of an earlier run)

\b
Nothing is overwritten: if OUTDIR already holds an audit (its register or summary),
or a worksheet name is taken by a different file, the audit refuses with exit code 2
and writes nothing; --force replaces those files (other files in OUTDIR are left as
they are). The worksheets, the register and the summary are rendered into a hidden
staging folder and moved into place together when every room has run: all of them or
none. An interrupted audit says what it left and can simply be run again, without
--force (a run killed while moving its files is undone by the next one).

\b
A room file that is invalid or cannot be assessed never stops the others; the
register lists it with its problems.
"""

EPILOG = (
    "Exit codes: 0 clean; 1 a finding at or above --fail-on; 2 usage, or OUTDIR holds "
    "an earlier audit and --force was not given, or a path cannot be read or written; 3 a "
    "room file (or rule file) invalid or not assessed; 4 an internal error on a room (or "
    "anywhere); 130 interrupted (143 on SIGTERM). " + CAUTION
)


def _say(message: str) -> None:
    click.echo(message, err=True)


def _exit(code: int) -> NoReturn:
    sys.exit(code)


class _Terminated(KeyboardInterrupt):
    """SIGTERM, raised like Ctrl-C so that the staging folder is cleared on the way out."""


def _terminate(signum: int, frame: FrameType | None) -> None:
    raise _Terminated


def _room_line(run: RoomRun, done: int, total: int) -> str:
    width = len(str(total))
    where = f"[{done:>{width}}/{total}] {run.file}"
    if run.results is None:
        return f"{where}: not assessed ({run.status}, {len(run.problems)} problem(s))"
    where = f"{where} ({run.seconds:.1f} s)"
    results = run.results
    floor = "pass" if results.floor.passed else "FAIL"
    worst = results.worst_severity() or "none"
    tail = f"floor {floor}, {len(results.findings)} finding(s), worst {worst}"
    if run.status != "assessed":
        return f"{where}: {results.room.id}: {tail}; NO WORKSHEET ({run.status})"
    return f"{where}: {results.room.id}: {tail}"


@click.command("audit", help=HELP, epilog=EPILOG)
@click.argument(
    "folder", metavar="DIR", type=click.Path(exists=True, file_okay=False, path_type=Path)
)
@click.option(
    "-o",
    "--output",
    metavar="OUTDIR",
    required=True,
    type=click.Path(file_okay=False, path_type=Path),
    help="Folder for the worksheets, the register and the summary (created if missing).",
)
@click.option(
    "--previous",
    metavar="REGISTER",
    type=click.Path(exists=True, dir_okay=False, path_type=Path),
    default=None,
    help="Register (JSON or CSV) of an earlier audit, to report the changes since.",
)
@click.option(
    "--jobs",
    type=click.IntRange(min=1),
    default=None,
    help="Rooms assessed at once, one process each (default: the number of CPUs; "
    "1 runs in this process).",
)
@click.option(
    "--fail-on",
    type=click.Choice(LEVELS),
    default="never",
    show_default=True,
    help="Exit 1 when a finding is at or above this severity.",
)
@click.option(
    "--rules",
    "rules_dir",
    type=click.Path(exists=True, file_okay=False, path_type=Path),
    default=None,
    help="Folder of rule files to use instead of the packaged rules/.",
)
@click.option("--force", is_flag=True, help="Replace the files of an earlier audit in OUTDIR.")
@click.option(
    "--room-timeout",
    metavar="SECONDS",
    type=click.FloatRange(min=0, min_open=True),
    default=120.0,
    show_default=True,
    help="Time limit of one room; a room still running after it is stopped and listed "
    "as not assessed (an error), and the others go on.",
)
@click.option(
    "--paper",
    type=click.Choice(["a4", "letter"], case_sensitive=False),
    default="a4",
    show_default=True,
)
@samples_option
@nominal_option
@confidence_option
def audit(
    folder: Path,
    output: Path,
    previous: Path | None,
    jobs: int | None,
    fail_on: str,
    rules_dir: Path | None,
    force: bool,
    paper: str,
    room_timeout: float,
    samples: int | None,
    nominal: bool,
    confidence: float | None,
) -> None:
    # lazy, for start-up time: every ignite command loads this module, few run an audit
    from ignite.audit.run import AuditInterrupted

    # Ctrl-C or SIGTERM at any moment ends in one message saying what OUTDIR holds.
    old_handler = signal.signal(signal.SIGTERM, _terminate)
    done: list[AuditOutcome] = []
    try:
        sampling = sampling_of(samples, nominal, confidence)
        done.append(
            _audit(folder, output, previous, jobs, rules_dir, force, paper, room_timeout, sampling)
        )
        code = _report(done[0], fail_on)
    except KeyboardInterrupt as exc:
        cause = exc.cause if isinstance(exc, AuditInterrupted) else exc
        if isinstance(exc, AuditInterrupted):
            published = exc.published
        else:
            published = (*done[0].worksheets, *done[0].written) if done else ()
        _say(_interrupted(output, published, force))
        _exit(EXIT_TERMINATED if isinstance(cause, _Terminated) else EXIT_INTERRUPTED)
    finally:
        signal.signal(signal.SIGTERM, old_handler)
    _exit(code)


def _audit(
    folder: Path,
    output: Path,
    previous: Path | None,
    jobs: int | None,
    rules_dir: Path | None,
    force: bool,
    paper: str,
    room_timeout: float | None = None,
    sampling: Sampling | None = None,
) -> AuditOutcome:
    from ignite.audit.io import RegisterError, existing_audit_files, read_register
    from ignite.audit.run import discover_rooms, run_audit
    from ignite.errors import OutputExistsError, RuleFileError
    from ignite.pipeline import open_rulebook

    if output.exists() and not output.is_dir():
        raise click.UsageError(f"-o {output} is a file; OUTDIR must be a folder")
    if not force:
        earlier = existing_audit_files(output)
        if earlier:
            _refuse(output, [p.name for p in earlier], EXIT_USAGE)
    rooms = discover_rooms(folder)
    if not rooms:
        raise click.UsageError(f"no room files (*.yaml, *.yml) under {folder}")
    register = None
    if previous is not None:
        try:
            register = read_register(previous)
        except RegisterError as exc:
            raise click.UsageError(f"--previous: {exc}") from None
    try:
        book = open_rulebook(rules_dir)
    except RuleFileError as exc:
        _say(f"ignite: invalid rule file(s):\n{exc}")
        _exit(exc.exit_code)

    plain = not sys.stderr.isatty()
    bar = None if plain else click.progressbar(length=len(rooms), label="Auditing", file=sys.stderr)

    def progress(run: RoomRun, done: int, total: int) -> None:
        if bar is None:
            _say(_room_line(run, done, total))
        else:
            bar.update(1)

    if bar is not None:
        bar.__enter__()
    try:
        return run_audit(
            folder,
            output,
            book,
            rules_dir=rules_dir,
            previous=register,
            jobs=jobs,
            paper=paper,
            force=force,
            progress=progress,
            room_timeout=room_timeout,
            sampling=sampling,
        )
    except OutputExistsError as exc:
        _refuse(output, [exc.path.name], exc.exit_code)
    finally:
        if bar is not None:
            bar.__exit__(None, None, None)


def _interrupted(output: Path, published: tuple[Path, ...], force: bool) -> str:
    """What an interrupted audit left in OUTDIR, exactly."""
    if published:
        return (
            f"ignite: audit interrupted after its output was in place: {output} holds the "
            f"register, the summary and {len(published) - 3} worksheet(s), complete."
        )
    from ignite.audit.io import existing_audit_files

    if force:
        again = "with --force, as before"
    elif existing_audit_files(output):  # stopped before the check that would have refused
        again = "it holds an earlier audit, so --force is needed to replace it"
    else:
        again = "--force is not needed"
    return (
        f"ignite: audit interrupted before its output was published: nothing of this run is "
        f"in {output} (it is as it was). Run it again to finish; {again}."
    )


def _refuse(output: Path, names: list[str], code: int) -> NoReturn:
    _say(
        f"ignite: {output} already holds audit output ({', '.join(names)}); nothing was "
        "written. Use --force to replace it, or choose another -o folder."
    )
    _exit(code)


def _report(outcome: AuditOutcome, fail_on: str) -> int:
    report = outcome.report
    not_assessed = report.not_assessed
    for row in not_assessed:
        _say(f"ignite: {row.file}: {row.status}:")
        for problem in row.problems:
            _say(f"  {problem}")
    for row in report.rows:
        for warning in row.warnings:
            _say(f"warning: {row.file}: {warning}")
    for path in (*outcome.written,):
        click.echo(str(path))
    assessed = len(report.rows) - len(not_assessed)
    failed = sum(1 for row in report.rows if row.floor_passed is False)
    _say(
        f"ignite: {len(report.rows)} room file(s): {assessed} assessed, {len(not_assessed)} not; "
        f"{failed} floor(s) outside the window; {len(outcome.worksheets)} worksheet(s) in "
        f"{outcome.seconds:.1f} s."
    )
    _say(CAUTION)
    if any(row.status == ERROR for row in not_assessed):
        return EXIT_INTERNAL
    if not_assessed:
        return EXIT_INVALID
    reached = fail_on != "never" and any(
        LEVELS.index(item.finding.severity) <= LEVELS.index(fail_on)
        for item in report.site_findings
    )
    return EXIT_FINDINGS if reached else EXIT_CLEAN
