"""One room file to its evaluated Results: the path `check`, `assess` and `audit` share."""

from __future__ import annotations

from pathlib import Path

from ignite.model import Vocabulary
from ignite.results import Results, RuleRow
from ignite.rulebook import Rulebook, load_rulebook


def open_rulebook(directory: Path | None = None) -> Rulebook:
    """The rules in force, validated against the results the checks may read."""
    from ignite.evaluate import known_results

    return load_rulebook(directory, known_results())


def vocabulary(book: Rulebook) -> Vocabulary:
    """The names a room file may use that rules/ defines."""
    return Vocabulary(
        floor_criteria=frozenset(e.id for e in book.of_kind("windows")),
        footwear_classes=frozenset(e.id for e in book.of_kind("footwear")),
        materials=frozenset(book.names_of("materials")),
        ignition_sources=frozenset(book.names_of("ignition-sources")),
    )


def run_room(path: Path, book: Rulebook) -> Results:
    """Load, compute and evaluate one room; raises InputError for a bad room file."""
    from ignite.calculations import compute
    from ignite.evaluate import evaluate
    from ignite.load import load_room

    room = load_room(path, vocabulary(book))
    return evaluate(book, room, compute(room, book))


def rule_rows(book: Rulebook) -> list[RuleRow]:
    """Every entry of the rules in force, as `ignite rules` and the appendix print it."""
    from ignite.rulebook import describe

    rows = []
    for entry in book.entries.values():
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
    path: Path, book: Rulebook, output: Path | None, *, force: bool = False, paper: str = "a4"
) -> tuple[Results, Path]:
    """Assess one room and write its worksheet; raises InputError or OutputExistsError."""
    from ignite.calculations import METHODS
    from ignite.errors import OutputExistsError
    from ignite.worksheet import render_worksheet, write_worksheet

    results = run_room(path, book)
    target = worksheet_path(results, output)
    if target.exists() and not force:
        raise OutputExistsError(target)
    text = Path(path).read_bytes().decode("utf-8")
    data = render_worksheet(
        results,
        rule_rows(book),
        METHODS,
        text,
        paper="letter" if paper.lower() == "letter" else "A4",
    )
    target.parent.mkdir(parents=True, exist_ok=True)
    write_worksheet(target, data, force=force)
    return results, target
