"""The `ignite` command line: thin click commands; each error carries its own exit code.

Exit codes: 0 ran clean, 1 a finding at or above --fail-on, 2 usage (a path that
cannot be read or written, or an output file exists without --force), 3 an invalid room
or rule file, 4 an internal error (a defect of ignite), 130 interrupted.

Output goes out as UTF-8; a character that cannot be encoded (a lone surrogate from a
YAML escape) is replaced, never a crash.
"""

from __future__ import annotations

import contextlib
import difflib
import io
import json
import os
import sys
from collections.abc import Callable, Iterable
from pathlib import Path
from typing import Any, NoReturn

import click
from click.shell_completion import CompletionItem

from ignite import __version__
from ignite.cli.audit import audit
from ignite.cli.names import categories
from ignite.cli.options import confidence_option, nominal_option, samples_option, sampling_of
from ignite.errors import (
    EXIT_INTERNAL,
    EXIT_USAGE,
    IgniteError,
    InputError,
    OutputExistsError,
    PathError,
    unreadable,
)
from ignite.pipeline import open_rulebook, rule_rows, run_room, write_room_worksheet
from ignite.records.results import SEVERITIES, Results
from ignite.report.text import render_text
from ignite.room.schema import json_schema
from ignite.room.template import TEMPLATE
from ignite.rules.rulebook import Entry, Rulebook
from ignite.wording import sentences as say
from ignite.wording.sentences import CLI_CAUTION

EXIT_CLEAN, EXIT_FINDINGS = 0, 1
EXIT_INTERRUPTED = 130  # 128 + SIGINT
LEVELS = (*SEVERITIES, "never")
CAUTION = CLI_CAUTION

rules_option = click.option(
    "--rules",
    "rules_dir",
    type=click.Path(exists=True, file_okay=False, path_type=Path),
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


def _complete_names(
    ctx: click.Context, param: click.Parameter, incomplete: str
) -> list[CompletionItem]:
    """Shell completion of `ignite rules NAME`: rule ids and names starting with the text."""
    try:
        book = open_rulebook(ctx.params.get("rules_dir"))
    except Exception:  # completion must never fail loudly
        return []
    start = incomplete.lower()
    return [CompletionItem(name) for name in _every_name(book) if name.lower().startswith(start)]


def _internal_error(path: Path, exc: Exception) -> None:
    """An unexpected failure on one room: said plainly (IGNITE_DEBUG=1 shows the traceback)."""
    if os.environ.get("IGNITE_DEBUG"):
        raise exc
    _say(
        f"ignite: {path}: not assessed: internal error {type(exc).__name__}: {exc} "
        "(please report it with the room file; IGNITE_DEBUG=1 shows the details)"
    )


def _utf8_streams() -> None:
    """stdout and stderr write UTF-8 and replace what cannot be encoded, never raise."""
    for stream in (sys.stdout, sys.stderr):
        if isinstance(stream, io.TextIOWrapper):
            stream.reconfigure(encoding="utf-8", errors="replace")


def _readable(path: Path) -> Path:
    """`path`, if it is a regular file that can be read; else a `PathError` (exit 2)."""
    reason = unreadable(path)
    if reason is not None:
        raise PathError(path, "cannot be read", reason)
    return path


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
    stops the others. The combined code is the most serious of all rooms': 4 internal
    error > 3 invalid > 2 a path that cannot be read or written, or an output exists > 1 a
    finding reached --fail-on > 0 clean.
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
        except OSError as exc:
            _say(f"ignite: {PathError.from_os_error(exc, 'cannot be read or written', path)}")
            room_code = EXIT_USAGE
        except Exception as exc:
            _internal_error(path, exc)
            room_code = EXIT_INTERNAL
        code = max(code, room_code)
    return code


class _Commands(click.Group):
    """The command group: whatever escapes a command ends in one line and its exit code."""

    def invoke(self, ctx: click.Context) -> Any:
        _utf8_streams()
        try:
            return super().invoke(ctx)
        except (click.exceptions.ClickException, click.exceptions.Exit, click.Abort):
            raise
        except IgniteError as exc:
            _say(f"ignite: {exc}")
            _exit(exc.exit_code)
        except OSError as exc:
            _say(f"ignite: {PathError.from_os_error(exc, 'cannot be read or written')}")
            _exit(EXIT_USAGE)
        except KeyboardInterrupt:
            _say("ignite: interrupted")
            _exit(EXIT_INTERRUPTED)
        except Exception as exc:
            if os.environ.get("IGNITE_DEBUG"):
                raise
            _say(
                f"ignite: internal error {type(exc).__name__}: {exc} "
                "(please report it; IGNITE_DEBUG=1 shows the details)"
            )
            _exit(EXIT_INTERNAL)


@click.group(
    cls=_Commands,
    help=f"Fire and static-ignition sums for operating theatres, from a YAML room file.\n\n{CAUTION}",
    epilog="Exit codes: 0 clean, 1 findings at or above --fail-on, 2 usage (or a path that "
    "cannot be read or written), 3 invalid room or rule file, 4 internal error, 130 interrupted.",
)
@click.version_option(__version__, prog_name="ignite")
def main() -> None:
    pass


@main.command(
    help="Compute and print the results and findings of one or more rooms.\n\n"
    "With --format json, stdout is always one JSON array holding the result record of "
    "each room assessed, in the order the files were given (one room: an array of one)."
)
@click.argument("rooms", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option(
    "--format", "fmt", type=click.Choice(["text", "json"]), default="text", show_default=True
)
@fail_on_option
@rules_option
@samples_option
@nominal_option
@confidence_option
def check(
    rooms: tuple[Path, ...],
    fmt: str,
    fail_on: str,
    rules_dir: Path | None,
    samples: int | None,
    nominal: bool,
    confidence: float | None,
) -> None:
    book = _open_rules(rules_dir)
    records: list[dict[str, Any]] = []
    sampling = sampling_of(samples, nominal, confidence)

    def check_room(path: Path) -> int:
        results = run_room(_readable(path), book, sampling)
        code = _room_done(results, fail_on)
        if fmt == "json":
            record = results.to_record()
            record["caution"] = CAUTION
            records.append(record)
        else:
            click.echo(render_text(results))
        return code

    code = _each_room(rooms, check_room, "room not assessed")
    if fmt == "json":
        click.echo(json.dumps(records, indent=2, ensure_ascii=False))
    _exit(code)


@main.command(help="Write the PDF worksheet of one or more rooms.")
@click.argument("rooms", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option(
    "-o",
    "--output",
    type=click.Path(),
    default=None,
    help="PDF file (one room; name ending .pdf) or folder (created if missing). "
    "Default: output/<room id>-<date>.pdf",
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
@samples_option
@nominal_option
@confidence_option
def assess(
    rooms: tuple[Path, ...],
    output: str | None,
    force: bool,
    paper: str,
    fail_on: str,
    rules_dir: Path | None,
    samples: int | None,
    nominal: bool,
    confidence: float | None,
) -> None:
    target = _worksheet_target(output, len(rooms))
    book = _open_rules(rules_dir)
    sampling = sampling_of(samples, nominal, confidence)

    def assess_room(path: Path) -> int:
        results, written = write_room_worksheet(
            _readable(path), book, target, force=force, paper=paper, sampling=sampling
        )
        code = _room_done(results, fail_on)
        worst = results.worst_severity() or "none"
        click.echo(f"{written}  ({len(results.findings)} findings, worst: {worst})")
        return code

    code = _each_room(rooms, assess_room, "no worksheet written")
    _say(CAUTION)
    _exit(code)


def _worksheet_target(output: str | None, rooms: int) -> Path | None:
    """`assess -o`: a .pdf file (one room) or a folder; anything else is refused (exit 2).

    A folder is a name without a suffix, an existing folder, or a name ending in "/".
    """
    if output is None:
        return None
    path = Path(output)
    is_pdf = path.suffix.lower() == ".pdf"
    if is_pdf and not path.is_dir():
        if rooms > 1:
            raise click.UsageError("with several rooms, -o names a folder, not a .pdf file")
        return path
    if path.suffix and not path.is_dir() and not output.endswith(("/", os.sep)):
        raise click.UsageError(
            f'-o {output}: a worksheet is a PDF; name the file *.pdf, or end a folder name with "/"'
        )
    return path


@main.command(
    "rules",
    help="List the names a room file may use, by category, then every rule and value in "
    "force with its threshold, source and flag.\n\nWith NAME, show the rule or value with "
    "that id (or every one under that id prefix), or the entry a room file reaches by that "
    "name: a material, an ignition source, a footwear class, a site, a substance.",
)
@click.argument("rule_id", metavar="[NAME]", required=False, shell_complete=_complete_names)
@rules_option
def rules_cmd(rule_id: str | None, rules_dir: Path | None) -> None:
    book = _open_rules(rules_dir)
    entries = list(book.entries.values())
    if rule_id is not None:
        entries, words = _find(book, rule_id)
        if not entries and not words:
            raise click.UsageError(
                f"no rule, value or name {rule_id!r}; {_close_names(book, rule_id)}"
            )
        for category, keys in words:
            click.echo(f"{rule_id!r}: one of the {category} a room file may give ({keys})")
        if not entries:
            return
    else:
        _echo_names(book)
        click.echo("")
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


def _echo_names(book: Rulebook) -> None:
    """Every name a room file may use, by category, with the keys that take it."""
    click.echo(say.NAMES_HEADING)
    for category in categories(book):
        click.echo(f"\n{category.title}  ({', '.join(category.keys)})")
        for entry_id, names in category.entries:
            if len(names) == 1 and names[0] == entry_id:
                click.echo(f"  {entry_id}")
            else:
                click.echo(f"  {entry_id}: {', '.join(names)}")
        if category.note:
            click.echo(f"  ({category.note})")


def _find(book: Rulebook, name: str) -> tuple[list[Entry], list[tuple[str, str]]]:
    """Entries reached by `name` (an id, an id prefix, or any name a room file may use),
    and the categories of fixed words (sites, purposes, ...) it belongs to."""
    wanted = name.strip()
    lowered = wanted.lower()
    found = [e for e in book.entries.values() if e.id == wanted or e.id.startswith(wanted + ".")]
    if not found:
        found = [e for e in book.entries.values() if e.id.lower() == lowered]
    if not found:
        for category in categories(book):
            for entry_id, names in category.entries:
                known = entry_id in book.entries
                if known and lowered in (n.lower() for n in (entry_id, *names)):
                    entry = book.entries[entry_id]
                    if entry not in found:
                        found.append(entry)
    words = [
        (category.title, ", ".join(category.keys))
        for category in categories(book)
        if category.fixed
        and any(lowered in (n.lower() for n in (i, *ns)) for i, ns in category.entries)
    ]
    return found, words


def _every_name(book: Rulebook) -> list[str]:
    names = set(book.entries)
    for category in categories(book):
        for entry_id, aliases in category.entries:
            names.add(entry_id)
            names.update(aliases)
    return sorted(names)


def _close_names(book: Rulebook, name: str) -> str:
    every = [n.lower() for n in _every_name(book)]
    holding = [n for n in every if name.strip().lower() in n][:8]
    if holding:
        return "names holding it: " + ", ".join(repr(n) for n in holding)
    close = difflib.get_close_matches(name.lower(), every, n=3)
    if close:
        return "did you mean " + " or ".join(repr(c) for c in close) + "?"
    return "`ignite rules` lists them all"


@main.command(
    help="Print the JSON Schema (draft 2020-12) of the room file, for editors that check YAML "
    "as it is typed. The names of materials, ignition sources, floor criteria and footwear "
    "classes are those of the rules in force (--rules)."
)
@rules_option
def schema(rules_dir: Path | None) -> None:
    book = _open_rules(rules_dir)
    names = {
        category.schema_name: [n for _, names in category.entries for n in names]
        for category in categories(book)
        if category.schema_name
    }
    click.echo(json.dumps(json_schema(names), indent=2, ensure_ascii=False))


@main.command(help="Write a commented template room file that loads cleanly.")
@click.argument("path", type=click.Path(dir_okay=False, path_type=Path))
@click.option("--force", is_flag=True, help="Replace an existing file.")
def new(path: Path, force: bool) -> None:
    if path.exists() and not force:
        exists = OutputExistsError(path)
        _say(f"ignite: {exists}")
        _exit(exists.exit_code)
    temporary = path.with_name(f".{path.name}.tmp")
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        temporary.write_text(TEMPLATE, encoding="utf-8")
        temporary.replace(path)
    except OSError as exc:
        raise PathError.unwritable(path, exc) from None
    finally:
        with contextlib.suppress(OSError):
            temporary.unlink(missing_ok=True)
    click.echo(str(path))


main.add_command(audit)
