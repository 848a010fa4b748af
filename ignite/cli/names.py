"""The names a room file may use, by category: those rules/ defines and the loader's words.

`ignite rules` lists them, `ignite rules NAME` finds the entry a name reaches, and
`ignite schema` offers them to editors. The categories follow the room file's keys;
names defined in rules/ come from the rule book in force, fixed words from the loader.
"""

from __future__ import annotations

from dataclasses import dataclass

from ignite.room import load as loader
from ignite.rules.rulebook import Rulebook
from ignite.wording import sentences as say


@dataclass(frozen=True)
class Category:
    """One kind of name: where a room file gives it, and each entry with its names."""

    title: str
    keys: tuple[str, ...]  # the key paths that take such a name
    entries: tuple[tuple[str, tuple[str, ...]], ...]  # (rule id or word, names it answers to)
    note: str = ""
    fixed: bool = False  # words of the loader, not entries of rules/
    schema_name: str = ""  # the category `ignite.room.schema.json_schema` takes names for


def _named(book: Rulebook, kind: str) -> tuple[tuple[str, tuple[str, ...]], ...]:
    found = []
    for entry in book.of_kind(kind):
        names = tuple(str(name) for name in entry.get("names", ())) or (entry.id,)
        found.append((entry.id, names))
    return tuple(found)


def _ids(book: Rulebook, kind: str) -> tuple[tuple[str, tuple[str, ...]], ...]:
    return tuple((entry.id, (entry.id,)) for entry in book.of_kind(kind))


def _fixed(words: tuple[str, ...]) -> tuple[tuple[str, tuple[str, ...]], ...]:
    return tuple((word, (word,)) for word in words)


def categories(book: Rulebook) -> list[Category]:
    """Every category of names, in the order the room file meets them."""
    site_ids = {entry.id for entry in book.of_kind("sites")}
    sites = tuple((site, (site,)) for site in loader.SITES if site in site_ids or not site_ids)
    return [
        Category("purposes", ("room.purpose",), _fixed(loader.PURPOSES), fixed=True),
        Category("supply systems", ("room.mains.system",), _fixed(loader.SYSTEMS), fixed=True),
        Category(
            "floor criteria",
            ("floor.criteria",),
            _ids(book, "windows"),
            schema_name="floor criteria",
        ),
        Category(
            "footwear classes",
            ("people[].footwear",),
            _ids(book, "footwear"),
            note=say.NAMES_FOOTWEAR_NOTE,
            schema_name="footwear classes",
        ),
        Category("preparation bases", ("preparations[].basis",), _fixed(loader.BASES), fixed=True),
        Category(
            "substances with ignition data",
            ("preparations[].components",),
            _named(book, "fuels"),
            note=say.NAMES_SUBSTANCES_NOTE,
        ),
        Category(
            "materials",
            ("materials", "cases[].materials"),
            _named(book, "materials"),
            schema_name="materials",
        ),
        Category("sites", ("cases[].site",), sites, fixed=not site_ids),
        Category(
            "oxygen deliveries", ("cases[].oxygen.delivery",), _fixed(loader.DELIVERIES), fixed=True
        ),
        Category(
            "ignition sources",
            ("cases[].ignition_sources",),
            _named(book, "ignition-sources"),
            schema_name="ignition sources",
        ),
    ]
