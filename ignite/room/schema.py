"""The room file's keys, read from the loader, and a JSON Schema of it for editors.

The loader (`ignite.room.load`) is the truth: its key tables (`_TOP`, `_ROOM`, ...) say
which keys each section takes and which are required, `ignite.room.bounds` says which
keys hold a quantity and in what range, and the loader's option tuples (`SITES`, ...)
the words a key accepts. `SECTIONS` places each key table in the file; `room_keys()`
walks them into one `Key` per key path, and `json_schema()` writes the JSON Schema
(draft 2020-12) that `ignite schema` prints. The documentation test
(`tests/test_docs.py`) checks every path of `room_keys()` is in `docs/`, and
`tests/test_schema.py` checks that every key table of the loader is placed here.

The schema is meant for editors: it is as strict as the loader where JSON Schema can say
it (keys, lists and their limits, choices, booleans, whole numbers) and more lenient
where it cannot (a quantity is text that starts with a number; its unit and range are
in the description). A file the schema accepts may still be refused by `ignite check`;
a file `ignite check` accepts is always accepted by the schema.
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from typing import Any

from ignite.room import electrical
from ignite.room import load as loader
from ignite.room.bounds import BOUNDS, LISTS, PEOPLE_COUNT, TEXT_LENGTH, pattern
from ignite.room.source import join
from ignite.room.units import EXAMPLES, noun

DRAFT = "https://json-schema.org/draft/2020-12/schema"

SECTIONS: dict[str, Mapping[str, bool]] = {
    "": loader._TOP,
    "room": loader._ROOM,
    "room.mains": loader._MAINS,
    "environment": loader._ENVIRONMENT,
    "floor": loader._FLOOR,
    "people[]": loader._PERSON,
    "trolleys[]": loader._TROLLEY,
    "preparations[]": loader._PREPARATION,
    "cases[]": loader._CASE,
    "cases[].oxygen": loader._OXYGEN,
    "cases[].drape_pocket": loader._POCKET,
    "cases[].prep": loader._PREP,
    "electrical": electrical.ELECTRICAL,
    "electrical.supply": electrical.SUPPLY,
    "electrical.supply.insulation_monitor": electrical.MONITOR,
    "electrical.bonding[]": electrical.BONDING,
    "electrical.equipment[]": electrical.EQUIPMENT,
    "electrical.cases[]": electrical.CASE,
    **{f"electrical.equipment[].{key}": electrical.LEAKAGE for key in electrical.LEAKAGE_KEYS},
}
"""Where each key table of the loader sits in the file (`[]`: each entry of a list)."""

CHOICES: dict[str, tuple[str, ...]] = {
    "room.purpose": loader.PURPOSES,
    "room.mains.system": loader.SYSTEMS,
    "preparations[].basis": loader.BASES,
    "cases[].site": loader.SITES,
    "cases[].oxygen.delivery": loader.DELIVERIES,
    "electrical.supply.system": electrical.SUPPLY_SYSTEMS,
    "electrical.bonding[].kind": electrical.BONDED_PARTS,
    "electrical.equipment[].protection_class": tuple(electrical.PROTECTION_CLASSES.values()),
    "electrical.equipment[].applied_part": tuple(electrical.APPLIED_PARTS.values()),
    "electrical.equipment[].test": electrical.TESTS,
    "electrical.cases[].cardiac_path": electrical.CARDIAC_PATHS,
}
"""Keys that take one of a fixed set of words (any case)."""

NAMES: dict[str, str] = {
    "floor.criteria": "floor criteria",
    "materials[]": "materials",
    "cases[].materials[]": "materials",
    "cases[].ignition_sources[]": "ignition sources",
}
"""Keys that take a name defined in rules/, and the category of `ignite rules` it is in."""

SPECIAL: dict[str, str] = {
    "format": "format",
    "room.id": "room id",
    "room.assessed_on": "date",
    "people[].count": "count",
    "people[].footwear": "footwear",
    "preparations[].components": "components",
    "cases[].prep": "prep",
    "cases[].prep.hair": "bool",
    "cases[].prep.pooling": "bool",
    "materials": "names",
    "cases[].materials": "names",
    "cases[].ignition_sources": "names",
    "electrical.equipment[].earth_leakage": "leakage",
    "electrical.equipment[].touch_current": "leakage",
    "electrical.equipment[].patient_leakage": "leakage",
    "electrical.cases[].case": "case ref",
    "electrical.cases[].connected": "ids",
}
"""Keys read by a reader of their own in the loader (not text, a choice or a quantity)."""

DEFAULTS: dict[str, str] = {
    "floor.point_to_point": "no readings",
    "people[].capacitance": "the body capacitance in rules/ (`body.capacitance`)",
    "trolleys": "no trolleys",
    "preparations": "no preparations",
    "materials": "no materials",
    "cases": "no cases: an assessment of the room alone",
    "cases[].prep.skin_temperature": "the skin temperature in rules/ (`prep.skin_temperature_default`)",
}
"""What an optional key left out means."""


@dataclass(frozen=True)
class Key:
    """One key path of the room file (list entries written `[]`)."""

    path: str
    kind: str  # section | list | quantity | quantities | choice | name | text | and SPECIAL's
    required: bool


def room_keys() -> list[Key]:
    """Every key path the loader accepts, in file order (sections before their keys)."""
    found: list[Key] = []

    def walk(section: str) -> None:
        for key, required in SECTIONS[section].items():
            path = join(section, key) if section else key
            found.append(Key(path, kind_of(path), required))
            if path in SECTIONS:
                walk(path)
            elif path + "[]" in SECTIONS:
                walk(path + "[]")

    walk("")
    return found


def kind_of(path: str) -> str:
    """How the loader reads the value at key path `path` (list indices written `[]`)."""
    path = pattern(path)
    if path in SPECIAL:
        return SPECIAL[path]
    if path + "[]" in SECTIONS:
        return "list"
    if path in SECTIONS:
        return "section"
    if path in CHOICES:
        return "choice"
    if path in NAMES:
        return "name"
    if path in BOUNDS:
        return "quantity"
    if path + "[]" in BOUNDS:
        return "quantities"
    return "text"


# -- the JSON Schema ------------------------------------------------------------------

_META = set(".^$*+?()[]{}|\\/")


def any_case(words: Iterable[str]) -> str:
    """A regular expression matching any of `words` in any case, with spaces around.

    >>> import re
    >>> bool(re.match(any_case(["head-neck"]), " Head-Neck "))
    True
    """
    alternatives = []
    for word in sorted(set(words)):
        parts = []
        for char in word:
            if char.lower() != char.upper() and len(char.upper()) == 1:
                parts.append(f"[{char.lower()}{char.upper()}]")
            elif char in _META:
                parts.append("\\" + char)
            else:
                parts.append(char)
        alternatives.append("".join(parts))
    return r"^\s*(" + "|".join(alternatives) + r")\s*$"


def _words(words: Iterable[str], description: str) -> dict[str, Any]:
    shown = sorted(set(words))
    return {
        "description": description,
        "anyOf": [{"enum": shown}, {"type": "string", "pattern": any_case(shown)}],
    }


def _quantity_description(path: str) -> str:
    bound = BOUNDS[path]
    text = (
        f"{noun(bound.dimension)} with a unit, e.g. '{EXAMPLES[bound.dimension]}'; "
        f"accepted {bound.hard.text}"
    )
    if bound.usual is not None:
        text += f"; usual {bound.usual.text} (outside it: a warning)"
    return f"{text}. Why: {bound.reason}."


def _list(path: str, items: dict[str, Any]) -> dict[str, Any]:
    shape: dict[str, Any] = {"type": ["array", "null"], "items": items}
    limit = LISTS.get(path)
    if limit is not None:
        shape["maxItems"] = limit.most
    return shape


def _section(section: str, names: Mapping[str, Iterable[str]]) -> dict[str, Any]:
    keys = SECTIONS[section]
    properties = {}
    for key in keys:
        path = join(section, key) if section else key
        properties[key] = _value(path, names)
    shape: dict[str, Any] = {
        "type": "object",
        "properties": properties,
        "additionalProperties": False,
    }
    required = [key for key, needed in keys.items() if needed]
    if required:
        shape["required"] = required
    return shape


def _value(path: str, names: Mapping[str, Iterable[str]]) -> dict[str, Any]:
    kind = kind_of(path)
    shape: dict[str, Any]
    if kind == "section":
        shape = _section(path, names)
    elif kind == "list":
        shape = _list(path, _section(path + "[]", names))
    elif kind == "quantity":
        shape = {"$ref": "#/$defs/quantity", "description": _quantity_description(path)}
    elif kind == "quantities":
        shape = _list(
            path, {"$ref": "#/$defs/quantity", "description": _quantity_description(path + "[]")}
        )
    elif kind == "choice":
        shape = _words(CHOICES[path], f"one of: {', '.join(CHOICES[path])}")
    elif kind == "name":
        shape = _name(path, names)
    elif kind == "names":
        shape = _list(path, _name(path + "[]", names))
    elif kind == "format":
        shape = {"const": loader.FORMAT, "description": "the room-file format; this ignite reads 1"}
    elif kind == "room id":
        shape = {
            "anyOf": [
                {"type": "string", "pattern": "^" + loader._ROOM_ID.pattern.rstrip("Z\\") + "$"},
                {"type": "integer", "minimum": 0},
            ],
            "description": "up to 40 letters, digits, '.', '_' or '-' (used in file names)",
        }
    elif kind == "date":
        shape = {
            "type": "string",
            "pattern": r"^\d{4}-\d{2}-\d{2}$",
            "description": "a date, YYYY-MM-DD",
        }
    elif kind == "count":
        shape = {
            "type": "integer",
            "minimum": int(PEOPLE_COUNT.low or 1),
            "maximum": int(PEOPLE_COUNT.high or 100),
            "description": f"how many people of this role: {PEOPLE_COUNT.text}",
        }
    elif kind == "footwear":
        classes = names.get("footwear classes") or loader.FOOTWEAR_CLASSES
        shape = {
            "description": "a footwear class, or a measured resistance through the soles "
            "(e.g. '40 MΩ')",
            "anyOf": [*_words(classes, "")["anyOf"], {"$ref": "#/$defs/quantity"}],
        }
    elif kind == "components":
        limit = LISTS["preparations[].components"]
        shape = {
            "type": "object",
            "description": "substance (common name or CAS number) -> fraction, e.g. "
            "isopropanol: 70 %",
            "minProperties": 1,
            "maxProperties": limit.most,
            "additionalProperties": {
                "$ref": "#/$defs/quantity",
                "description": _quantity_description("preparations[].components.*"),
            },
        }
    elif kind == "prep":
        shape = {
            "description": "the skin preparation of this case, or none",
            "anyOf": [
                {"type": "null"},
                {"type": "string", "pattern": any_case(["none"])},
                _section(path, names),
            ],
        }
    elif kind == "bool":
        shape = {"type": "boolean"}
    elif kind == "leakage":
        shape = {
            "description": "a current in the normal condition, or the normal and single-fault "
            "readings: {normal: 10 µA, single_fault: 50 µA}",
            "anyOf": [{"$ref": "#/$defs/quantity"}, _section(path, names)],
        }
    elif kind == "case ref":
        shape = {
            "anyOf": [{"type": "string"}, {"type": "integer"}],
            "description": "the id of a case of this file",
        }
    elif kind == "ids":
        shape = _list(path, {"anyOf": [{"type": "string"}, {"type": "integer"}]})
        shape["description"] = "ids of devices of electrical.equipment"
    else:
        shape = {"$ref": "#/$defs/text"}
    if path in DEFAULTS:
        shape["description"] = (
            shape.get("description", "") + f" Optional; left out: {DEFAULTS[path]}."
        ).strip()
    return shape


def _name(path: str, names: Mapping[str, Iterable[str]]) -> dict[str, Any]:
    category = NAMES[pattern(path)]
    known = sorted(set(names.get(category, ())))
    description = f"a name of {category} in rules/ (`ignite rules` lists them)"
    if not known:
        return {"$ref": "#/$defs/text", "description": description}
    return _words(known, description)


def json_schema(names: Mapping[str, Iterable[str]] | None = None) -> dict[str, Any]:
    """The JSON Schema (draft 2020-12) of the room file.

    `names` maps a category of `NAMES` ("materials", "ignition sources", "floor
    criteria", and "footwear classes") to the names the rules in force define; a
    category left out takes any text.
    """
    names = names or {}
    schema: dict[str, Any] = {
        "$schema": DRAFT,
        "$id": "urn:ignite:room-file:format-1",
        "title": "ignite room file, format 1",
        "description": "One operating theatre and its planned list, read by `ignite check`. "
        "Values with a dimension are text with a unit ('28 %', '1.2 MΩ', '4 L/min'). "
        "See docs/room-file.md.",
    }
    schema.update(_section("", names))
    schema["$defs"] = {
        "quantity_text": {
            "type": "string",
            "pattern": r"^\s*[+\-\u2212]?(\d|\.\d)",
            "description": "a number and its unit; a range may be written '8 to 12 mL' or "
            "'10 mL ± 2 mL'",
        },
        "quantity": {
            "anyOf": [
                {"$ref": "#/$defs/quantity_text"},
                {
                    "type": "object",
                    "description": "a range: {low, likely, high}, each a number and its unit",
                    "properties": {
                        "low": {"$ref": "#/$defs/quantity_text"},
                        "likely": {"$ref": "#/$defs/quantity_text"},
                        "high": {"$ref": "#/$defs/quantity_text"},
                    },
                    "minProperties": 1,
                },
            ]
        },
        "text": {
            "anyOf": [
                {"type": "string", "pattern": r"\S"},
                {"type": "integer"},
            ],
            "description": f"text of up to {TEXT_LENGTH} characters",
        },
    }
    return schema


def key_tables() -> dict[str, Mapping[str, bool]]:
    """Every key table of the loader (module-level mappings of key -> required)."""
    tables: dict[str, Mapping[str, bool]] = {}
    for name, value in vars(loader).items():
        if (
            re.fullmatch(r"_[A-Z][A-Z_]*", name)
            and isinstance(value, dict)
            and value
            and all(isinstance(k, str) and isinstance(v, bool) for k, v in value.items())
        ):
            tables[name] = value
    return tables
