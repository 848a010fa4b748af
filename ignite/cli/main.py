"""The `ignite` command line: thin click commands; each error carries its own exit code.

Exit codes: 0 ran clean, 1 a finding at or above --fail-on, 2 usage (or an output
file exists without --force), 3 an invalid room or rule file.
"""

from __future__ import annotations

import json
import os
import sys
from collections.abc import Callable, Iterable
from pathlib import Path
from typing import Any, NoReturn

import click

from ignite import __version__
from ignite.cli.audit import audit
from ignite.errors import EXIT_INVALID, IgniteError, InputError, OutputExistsError
from ignite.pipeline import open_rulebook, rule_rows, run_room, write_room_worksheet
from ignite.records.results import SEVERITIES, Results
from ignite.report.text import render_text
from ignite.room.template import TEMPLATE
from ignite.rules.rulebook import Rulebook
from ignite.wording.sentences import CLI_CAUTION

EXIT_CLEAN, EXIT_FINDINGS = 0, 1
LEVELS = (*SEVERITIES, "never")
CAUTION = CLI_CAUTION

rules_option = click.option(
    "--rules",
    "rules_dir",
    type=click.Path(file_okay=False, path_type=Path),
    default=None,
    help="Folder of rule files to use instead of the packaged rules/.",
)
fail_on_option = click.option(
    "--fail-on",
    type=click.Choice(LEVELS),
    default="never",
    show_default=True,
    help="Exit 1 when a finding is at or above this severity.",
)


def _say(message: str) -> None:
    click.echo(message, err=True)


def _exit(code: int) -> NoReturn:
    sys.exit(code)


def _open_rules(rules_dir: Path | None) -> Rulebook:
    try:
        return open_rulebook(rules_dir)
    except InputError as exc:  # a RuleFileError
        _say(f"ignite: invalid rule file(s):\n{exc}")
        _exit(exc.exit_code)


def _internal_error(path: Path, exc: Exception) -> None:
    """An unexpected failure on one room: said plainly (IGNITE_DEBUG=1 shows the traceback)."""
    if os.environ.get("IGNITE_DEBUG"):
        raise exc
    _say(
        f"ignite: {path}: not assessed: internal error {type(exc).__name__}: {exc} "
        "(please report it with the room file; IGNITE_DEBUG=1 shows the details)"
    )


def _reaches(severity: str, fail_on: str) -> bool:
    return fail_on != "never" and LEVELS.index(severity) <= LEVELS.index(fail_on)


def _room_done(results: Results, fail_on: str) -> int:
    """Say a room's warnings on stderr; its exit code: 1 if a finding reaches --fail-on."""
    for warning in results.warnings:
        _say(f"warning: {warning}")
    reached = any(_reaches(f.severity, fail_on) for f in results.findings)
    return EXIT_FINDINGS if reached else EXIT_CLEAN


def _each_room(rooms: Iterable[Path], action: Callable[[Path], int], not_done: str) -> int:
    """Run `action` on every room file in turn; the combined exit code.

    `action(path)` does one room's work and returns its exit code (0 or 1). A room that
    fails is reported on stderr, with `not_done` saying what did not happen, and never
    stops the others. The combined code is the most serious of all rooms': 3 invalid or
    not assessed > 2 an output exists > 1 a finding reached --fail-on > 0 clean.
    """
    code = EXIT_CLEAN
    for path in rooms:
        try:
            room_code = action(path)
        except InputError as exc:
            _say(str(exc))
            _say(f"ignite: {path}: {len(exc.problems)} problem(s); {not_done}")
            room_code = exc.exit_code
        except IgniteError as exc:
            _say(f"ignite: {exc}")
            room_code = exc.exit_code
        except Exception as exc:
            _internal_error(path, exc)
            room_code = EXIT_INVALID
        code = max(code, room_code)
    return code


@click.group(
    help=f"Fire and static-ignition sums for operating theatres, from a YAML room file.\n\n{CAUTION}",
    epilog="Exit codes: 0 clean, 1 findings at or above --fail-on, 2 usage, 3 invalid room or rule file.",
)
@click.version_option(__version__, prog_name="ignite")
def main() -> None:
    pass


@main.command(help="Compute and print the results and findings of one or more rooms.")
@click.argument("rooms", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option(
    "--format", "fmt", type=click.Choice(["text", "json"]), default="text", show_default=True
)
@fail_on_option
@rules_option
def check(rooms: tuple[Path, ...], fmt: str, fail_on: str, rules_dir: Path | None) -> None:
    book = _open_rules(rules_dir)
    records: list[dict[str, Any]] = []

    def check_room(path: Path) -> int:
        results = run_room(path, book)
        code = _room_done(results, fail_on)
        if fmt == "json":
            record = results.to_record()
            record["caution"] = CAUTION
            records.append(record)
        else:
            click.echo(render_text(results))
        return code

    code = _each_room(rooms, check_room, "room not assessed")
    if fmt == "json" and records:
        click.echo(
            json.dumps(records[0] if len(rooms) == 1 else records, indent=2, ensure_ascii=False)
        )
    _exit(code)


@main.command(help="Write the PDF worksheet of one or more rooms.")
@click.argument("rooms", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option(
    "-o",
    "--output",
    type=click.Path(path_type=Path),
    default=None,
    help="PDF file (one room) or folder. Default: output/<room id>-<date>.pdf",
)
@click.option("--force", is_flag=True, help="Replace an existing worksheet.")
@click.option(
    "--paper",
    type=click.Choice(["a4", "letter"], case_sensitive=False),
    default="a4",
    show_default=True,
)
@fail_on_option
@rules_option
def assess(
    rooms: tuple[Path, ...],
    output: Path | None,
    force: bool,
    paper: str,
    fail_on: str,
    rules_dir: Path | None,
) -> None:
    book = _open_rules(rules_dir)
    if output is not None and len(rooms) > 1 and output.suffix.lower() == ".pdf":
        raise click.UsageError("with several rooms, -o names a folder, not a .pdf file")

    def assess_room(path: Path) -> int:
        results, written = write_room_worksheet(path, book, output, force=force, paper=paper)
        code = _room_done(results, fail_on)
        worst = results.worst_severity() or "none"
        click.echo(f"{written}  ({len(results.findings)} findings, worst: {worst})")
        return code

    code = _each_room(rooms, assess_room, "no worksheet written")
    _say(CAUTION)
    _exit(code)


@main.command(
    "rules", help="List every rule and value in force with its threshold, source and flag."
)
@click.argument("rule_id", required=False)
@rules_option
def rules_cmd(rule_id: str | None, rules_dir: Path | None) -> None:
    book = _open_rules(rules_dir)
    entries = list(book.entries.values())
    if rule_id is not None:
        entries = [e for e in entries if e.id == rule_id or e.id.startswith(rule_id + ".")]
        if not entries:
            raise click.UsageError(
                f"no rule or value with id {rule_id!r}; `ignite rules` lists them all"
            )
    click.echo(f"Rules in force: {book.directory}  (sha256 {book.digest[:16]}…)")
    wanted = {e.id for e in entries}
    kind = None
    for row in rule_rows(book):
        if row.id not in wanted:
            continue
        if row.kind != kind:
            kind = row.kind
            click.echo(f"\n[{kind}]")
        click.echo(f"{row.id}: {row.title}")
        if row.threshold:
            click.echo(f"    {row.threshold}")
        click.echo(f"    source: {row.source} [{row.flag}]")
        note = book.entry(row.id).note
        if note:
            click.echo(f"    note: {note}")


@main.command(help="Write a commented template room file that loads cleanly.")
@click.argument("path", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--force", is_flag=True, help="Replace an existing file.")
def new(path: Path, force: bool) -> None:
    if path.exists() and not force:
        exists = OutputExistsError(path)
        _say(f"ignite: {exists}")
        _exit(exists.exit_code)
    path.parent.mkdir(parents=True, exist_ok=True)
    temporary = path.with_name(f".{path.name}.tmp")
    temporary.write_text(TEMPLATE, encoding="utf-8")
    temporary.replace(path)
    click.echo(str(path))


main.add_command(audit)
