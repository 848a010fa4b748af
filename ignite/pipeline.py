"""One room file to its evaluated Results: the path `check`, `assess` and `audit` share."""

from __future__ import annotations

from pathlib import Path

from ignite.errors import InputError, OutputExistsError, PathError, Problem
from ignite.findings.evaluate import evaluate, known_results
from ignite.physics import vapour
from ignite.physics.vapour import SubstanceDataError
from ignite.records.results import Results, RuleRow
from ignite.report.worksheet import render_worksheet, write_worksheet
from ignite.room.load import load_room
from ignite.room.model import Vocabulary
from ignite.room.ranges import Sampling
from ignite.rules.bind import bind
from ignite.rules.bound import Bound
from ignite.rules.rulebook import Rulebook, describe, load_rulebook
from ignite.simulate.compute import METHODS, compute
from ignite.simulate.uncertainty import spread_results


def open_rulebook(directory: Path | None = None) -> Rulebook:
    """The rules in force, validated against the results the checks may read."""
    return load_rulebook(directory, known_results())


def vocabulary(book: Rulebook) -> Vocabulary:
    """The names a room file may use that rules/ defines."""
    return Vocabulary(
        floor_criteria=frozenset(e.id for e in book.of_kind("windows")),
        footwear_classes=frozenset(e.id for e in book.of_kind("footwear")),
        materials=frozenset(book.names_of("materials")),
        ignition_sources=frozenset(book.names_of("ignition-sources")),
        substance_check=substance_problem,
    )


def substance_problem(name: str) -> str | None:
    """None when the `chemicals` tables know the substance; else a message for the room file."""

    try:
        vapour.substance(name)
    except vapour.UnknownSubstance:
        return (
            f"unknown substance {name!r}: give a common name (isopropanol, ethanol, water) "
            "or a CAS number (67-63-0)"
        )
    except vapour.SubstanceDataError as exc:
        return f"substance {name!r} cannot be used: {exc}"
    return None


def evaluate_room(
    path: Path, book: Rulebook, sampling: Sampling | None = None
) -> tuple[Bound, Results]:
    """Load, bind, compute and evaluate one room; raises InputError for a bad room file.

    `sampling` (`--samples`, `--nominal`, `--confidence`): a room with ranges is assessed
    over their spread unless `nominal`; by default as the room file says."""

    sampling = sampling or Sampling()
    room = load_room(path, vocabulary(book))
    bound = bind(room, book, uncertain=sampling.active(bool(room.ranges)))
    try:
        results = spread_results(room, bound, compute(room, bound), sampling)
    except SubstanceDataError as exc:  # a substance the tables know, but without data we need
        raise InputError([Problem(str(path), None, "preparations", str(exc))]) from None
    return bound, evaluate(bound, results)


def run_room(path: Path, book: Rulebook, sampling: Sampling | None = None) -> Results:
    """The evaluated Results of one room file (see `evaluate_room`)."""
    return evaluate_room(path, book, sampling)[1]


def rule_rows(book: Rulebook, only: set[str] | None = None) -> list[RuleRow]:
    """Entries of the rules in force (all, or those in `only`), as `ignite rules` and the
    worksheet's appendix print them."""

    rows = []
    for entry in book.entries.values():
        if only is not None and entry.id not in only:
            continue
        threshold = describe(entry, book.entries)
        rows.append(RuleRow(entry.id, entry.kind, entry.title, threshold, entry.source, entry.flag))
    return rows


def worksheet_path(results: Results, output: Path | None) -> Path:
    """Where a room's worksheet goes: -o as a file, -o as a folder, or output/."""
    name = f"{results.room.id}-{results.room.assessed_on}.pdf"
    if output is None:
        return Path("output") / name
    if output.suffix.lower() == ".pdf":
        return output
    return output / name


def write_room_worksheet(
    path: Path,
    book: Rulebook,
    output: Path | None,
    *,
    force: bool = False,
    paper: str = "a4",
    sampling: Sampling | None = None,
) -> tuple[Results, Path]:
    """Assess one room and write its worksheet.

    Raises InputError (the room file), OutputExistsError, or PathError when the worksheet
    cannot be written (the message names the path and the reason).
    """

    bound, results = evaluate_room(path, book, sampling)
    target = worksheet_path(results, output)
    if target.exists() and not force:
        raise OutputExistsError(target)
    text = Path(path).read_bytes().decode("utf-8")
    data = render_worksheet(
        results,
        rule_rows(book, set(bound.consulted)),
        METHODS,
        text,
        paper="letter" if paper.lower() == "letter" else "A4",
    )
    try:
        target.parent.mkdir(parents=True, exist_ok=True)
        write_worksheet(target, data, force=force)
    except OSError as exc:  # a folder in the way is a file, no permission, disk full, ...
        raise PathError.unwritable(target, exc) from None
    return results, target
