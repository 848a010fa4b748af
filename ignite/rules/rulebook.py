"""Load and validate the rule files in `rules/`.

Every file is YAML with `format: 1`, a `kind` and a list of `entries`. Each entry has an
`id` unique across all files, a `title`, a `source` and a `flag`; its other fields are
declared in `SCHEMAS`. A quantity field may be a plain string with a unit (covered by the
entry's source and flag) or a mapping `{value, source, flag}` of its own. The loader
rejects unknown keys, duplicate identifiers, unknown result names and incompatible units,
collects every problem, and raises `RuleFileError` naming file and line.

Provenance flags are read in the words rule files have always used and kept in the words
a signed form shows (`FLAG_WORDS`: `memory` is read as `to confirm`).

A parsed rule book is kept on disk between runs (`ignite.physics._cache`: the user's
cache folder, atomic writes, safe to delete, `IGNITE_NO_CACHE=1` turns it off), keyed by
the rule files' names and bytes, the results the checks may read, the source of the code
that parses them and the versions of Python, PyYAML and pint. A hit holds exactly what
parsing the files again would give.
"""

from __future__ import annotations

import hashlib
import math
import re
import sys
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ignite.errors import Problem, RuleFileError, UnitError
from ignite.physics import _cache
from ignite.records.results import SEVERITIES
from ignite.room.ranges import is_range, parse_range
from ignite.room.source import load_yaml
from ignite.room.units import number_and_unit, parse_any, parse_quantity
from ignite.wording import sentences

FLAGS = ("published", "to confirm", "common practice", "assumption")
"""The provenance flags, in the words every output shows (the worksheet, the table, JSON)."""

FLAG_WORDS = {"memory": "to confirm"}
"""Older flag words a rule file may still use, and the word each is shown as."""

ACCEPTED_FLAGS = (*FLAGS, *FLAG_WORDS)
"""Every flag a rule file may write."""


def flag_word(written: str) -> str | None:
    """The flag as shown, for a flag as written in a rule file; None for an unknown one.

    >>> flag_word("memory"), flag_word("published"), flag_word("remembered")
    ('to confirm', 'published', None)
    """
    shown = FLAG_WORDS.get(written, written)
    return shown if shown in FLAGS else None


TESTS = ("above", "at-or-above", "below", "at-or-below", "is-true")
WINDOW_LIMITS = ("low", "high", "mean_low", "system_high", "walking_voltage_high")


@dataclass(frozen=True)
class Spec:
    """How one field of an entry is read."""

    type: str  # quantity | number | text | bool | names | points | steps | limit | texts | choice
    dimension: str = ""  # for quantity fields; "any" takes whatever unit parses
    required: bool = False
    choices: tuple[str, ...] = ()


_COMMON = {
    "id": Spec("text", required=True),
    "title": Spec("text", required=True),
    "source": Spec("text", required=True),
    "flag": Spec("choice", required=True, choices=ACCEPTED_FLAGS),
    "note": Spec("text"),
}

SCHEMAS: dict[str, dict[str, Spec]] = {
    "parameters": {"value": Spec("quantity", "any", required=True)},
    "curves": {
        "x": Spec("text", required=True),
        "y": Spec("text", required=True),
        "points": Spec("points", required=True),
        "match": Spec("names"),
    },
    "windows": {
        "low": Spec("steps"),
        "low_inclusive": Spec("bool"),
        "high": Spec("quantity", "resistance"),
        "high_inclusive": Spec("bool"),
        "mean_low": Spec("quantity", "resistance"),
        "mean_min_readings": Spec("number"),
        "system_high": Spec("quantity", "resistance"),
        "walking_voltage_high": Spec("quantity", "voltage"),
    },
    "footwear": {"resistance": Spec("quantity", "resistance", required=True)},
    "fuels": {
        "cas": Spec("text", required=True),
        "names": Spec("names", required=True),
        "mie_air": Spec("quantity", "energy", required=True),
        "mie_oxygen": Spec("quantity", "energy"),
        "exponent": Spec("quantity", "fraction", required=True),
    },
    "materials": {
        "names": Spec("names", required=True),
        "loi": Spec("quantity", "fraction", required=True),
        "holds_charge_below_rh": Spec("quantity", "fraction", required=True),
        "kind": Spec("text"),
    },
    "ignition-sources": {
        "names": Spec("names", required=True),
        "mode": Spec("choice", required=True, choices=("certain", "hot-surface", "spark")),
        "energy": Spec("quantity", "energy"),
        "temperature": Spec("quantity", "temperature"),
    },
    "sites": {"near_airway": Spec("bool", required=True)},
    "ranges": {
        "varies": Spec("text", required=True),  # the id of the entry whose value is uncertain
        "field": Spec("text"),  # which of its fields (default: value; `points` scales a curve)
        "range": Spec("range", required=True),
    },
    "checks": {
        "reads": Spec("text", required=True),
        "test": Spec("choice", required=True, choices=TESTS),
        "limit": Spec("limit"),
        "severity": Spec("choice", required=True, choices=SEVERITIES),
        "group": Spec("text"),
        "detail": Spec("text"),
        "mitigations": Spec("texts"),
    },
}


@dataclass(frozen=True)
class Sourced:
    """A value with where it came from."""

    value: Any  # SI float for quantities; list for points/steps; str/bool otherwise
    text: str  # as written in the file
    source: str
    flag: str
    dimension: str = ""


@dataclass(frozen=True)
class Limit:
    """A check's limit: a fixed quantity, a parameter, a window field, or another result."""

    kind: str  # quantity | param | window | result
    ref: str = ""  # parameter id, window field name, or result name
    value: Sourced | None = None  # for kind == quantity


@dataclass(frozen=True)
class Entry:
    id: str
    kind: str
    title: str
    source: str
    flag: str
    note: str
    file: str
    line: int | None
    fields: Mapping[str, Any] = field(default_factory=dict)  # name -> Sourced or plain value

    def has(self, name: str) -> bool:
        return name in self.fields

    def get(self, name: str, default: Any = None) -> Any:
        """The field's value: an SI float for quantities, else the plain value."""
        item = self.fields.get(name)
        if item is None:
            return default
        return item.value if isinstance(item, Sourced) else item

    def sourced(self, name: str) -> Sourced:
        item = self.fields[name]
        if isinstance(item, Sourced):
            return item
        return Sourced(item, str(item), self.source, self.flag)


@dataclass(frozen=True)
class Rulebook:
    directory: Path
    entries: Mapping[str, Entry]
    digest: str  # SHA-256 over the rule files' names and bytes

    def of_kind(self, kind: str) -> list[Entry]:
        return [e for e in self.entries.values() if e.kind == kind]

    def entry(self, entry_id: str) -> Entry:
        return self.entries[entry_id]

    def value(self, entry_id: str) -> float:
        """A parameter's value in SI units."""
        return float(self.entries[entry_id].get("value"))

    def points(self, entry_id: str) -> list[tuple[float, float]]:
        return list(self.entries[entry_id].get("points"))

    def names_of(self, kind: str) -> dict[str, Entry]:
        """Every name and alias of entries of a kind, lower-cased, to its entry."""
        found: dict[str, Entry] = {}
        for entry in self.of_kind(kind):
            found[entry.id.lower()] = entry
            for name in entry.get("names", ()):
                found[name.lower()] = entry
        return found


def default_rules_dir() -> Path:
    """rules/ beside the package in a checkout; the packaged copy in an installed wheel."""
    package = Path(__file__).resolve().parents[1]
    checkout = package.parent / "rules"
    if checkout.is_dir() and (checkout / "checks.yaml").exists():
        return checkout
    return package / "_rules"


_books: dict[tuple[Path, str], Rulebook] = {}

CACHE_KIND = "rulebook"
_CODE = ("rules/rulebook.py", "room/units.py", "room/source.py", "records/results.py")
"""Source files (under ignite/) whose code decides what a parsed rule book holds."""


def _cache_versions() -> _cache.Versions:
    """What a cached rule book depends on besides the rule files and the known results."""
    import pint
    import yaml

    package = Path(__file__).resolve().parents[1]
    code = hashlib.sha256()
    for name in _CODE:
        code.update(name.encode() + b"\0" + (package / name).read_bytes() + b"\0")
    return (
        ("format", "1"),
        ("code", code.hexdigest()),
        ("python", f"{sys.version_info[0]}.{sys.version_info[1]}"),
        ("pyyaml", str(yaml.__version__)),
        ("pint", str(pint.__version__)),
    )


def load_rulebook(
    directory: Path | None = None,
    known_results: Mapping[str, str] | None = None,
) -> Rulebook:
    """Read every `*.yaml` in the directory; raise RuleFileError listing all problems.

    known_results maps result names a check may read to their dimension; when given,
    checks reading an unknown result, or with a limit of another dimension, are rejected.
    """
    directory = (directory or default_rules_dir()).resolve()
    files = sorted(directory.glob("*.yaml")) if directory.is_dir() else []
    if not files:
        raise RuleFileError([Problem(str(directory), None, "", "no rule files (*.yaml) found")])
    raws = [(path, path.read_bytes()) for path in files]
    digest = hashlib.sha256()
    for path, raw in raws:
        digest.update(path.name.encode() + b"\0" + raw + b"\0")
    known = None if known_results is None else tuple(sorted(known_results.items()))
    key = (str(directory), digest.hexdigest(), known)
    memo_key = (directory, repr(key))
    if memo_key in _books:
        return _books[memo_key]
    versions = _cache_versions()
    kept = _cache.load(CACHE_KIND, key, lambda found: isinstance(found, Rulebook), versions)
    if kept is not None:
        _books[memo_key] = kept
        return kept  # type: ignore[no-any-return]
    book = _parse(directory, raws, digest.hexdigest(), known_results)
    _cache.store(CACHE_KIND, key, book, versions)
    _books[memo_key] = book
    return book


def _parse(
    directory: Path,
    raws: list[tuple[Path, bytes]],
    digest: str,
    known_results: Mapping[str, str] | None,
) -> Rulebook:
    """Parse and check the rule files' bytes; raise RuleFileError listing every problem."""
    problems: list[Problem] = []
    entries: dict[str, Entry] = {}
    for path, raw in raws:
        for entry in _load_file(path, raw, problems):
            if entry.id in entries:
                first = entries[entry.id]
                problems.append(
                    Problem(
                        str(path),
                        entry.line,
                        entry.id,
                        f"duplicate identifier; first defined at {first.file}:{first.line}",
                    )
                )
            else:
                entries[entry.id] = entry
    _cross_check(entries, known_results, problems)
    if problems:
        raise RuleFileError(problems)
    return Rulebook(directory, entries, digest)


def _load_file(path: Path, raw: bytes, problems: list[Problem]) -> Iterable[Entry]:
    name = str(path)
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        problems.append(Problem(name, None, "", "not UTF-8 text"))
        return []
    try:
        data, lines = load_yaml(text, name)
    except RuleFileError as exc:
        problems.extend(exc.problems)
        return []
    except Exception as exc:  # the YAML layer reports its own problems as InputError
        found = getattr(exc, "problems", None)
        problems.extend(found or [Problem(name, None, "", str(exc))])
        return []
    if not isinstance(data, dict):
        problems.append(Problem(name, 1, "", "expected a mapping with format, kind and entries"))
        return []
    unknown = set(data) - {"format", "kind", "entries"}
    for key in sorted(unknown):
        problems.append(
            Problem(name, lines.get(key), key, "unknown key; allowed: format, kind, entries")
        )
    if data.get("format") != 1:
        problems.append(
            Problem(name, lines.get("format"), "format", f"expected 1, got {data.get('format')!r}")
        )
    kind = data.get("kind")
    if kind not in SCHEMAS:
        problems.append(
            Problem(
                name,
                lines.get("kind"),
                "kind",
                f"expected one of {', '.join(SCHEMAS)}, got {kind!r}",
            )
        )
        return []
    raw_entries = data.get("entries")
    if not isinstance(raw_entries, list):
        problems.append(
            Problem(name, lines.get("entries"), "entries", "expected a list of entries")
        )
        return []
    result = []
    for index, item in enumerate(raw_entries):
        entry = _load_entry(name, kind, index, item, lines, problems)
        if entry is not None:
            result.append(entry)
    return result


def _load_entry(
    name: str, kind: str, index: int, item: Any, lines: Mapping[str, int], problems: list[Problem]
) -> Entry | None:
    where = f"entries[{index}]"
    line = lines.get(where)
    if not isinstance(item, dict):
        problems.append(Problem(name, line, where, "expected a mapping"))
        return None
    schema = {**_COMMON, **SCHEMAS[kind]}
    before = len(problems)
    for key in item:
        if key not in schema:
            problems.append(
                Problem(
                    name,
                    lines.get(f"{where}.{key}", line),
                    f"{where}.{key}",
                    f"unknown key for a {kind} entry; allowed: {', '.join(schema)}",
                )
            )
    for key, spec in schema.items():
        if spec.required and key not in item:
            problems.append(Problem(name, line, f"{where}.{key}", "missing required key"))
    if len(problems) > before:
        return None
    entry_source = str(item["source"])
    entry_flag = flag_word(str(item["flag"]))
    if entry_flag is None:
        problems.append(
            Problem(
                name,
                lines.get(f"{where}.flag", line),
                f"{where}.flag",
                f"expected one of {ACCEPTED_FLAGS}, got {str(item['flag'])!r}",
            )
        )
        return None
    fields: dict[str, Any] = {}
    for key, spec in SCHEMAS[kind].items():
        if key not in item:
            continue
        path = f"{where}.{key}"
        try:
            fields[key] = _read_field(spec, item[key], entry_source, entry_flag)
        except _FieldError as exc:
            problems.append(Problem(name, lines.get(path, line), path, str(exc)))
    return Entry(
        id=str(item["id"]),
        kind=kind,
        title=str(item["title"]),
        source=entry_source,
        flag=entry_flag,
        note=str(item.get("note", "")),
        file=name,
        line=line,
        fields=fields,
    )


class _FieldError(ValueError):
    pass


def _quantity(text: Any, dimension: str) -> tuple[float, str]:
    """Parse a value with a unit; returns (SI value, dimension)."""
    if dimension == "fraction" and isinstance(text, (int, float)) and not isinstance(text, bool):
        return float(text), "fraction"
    if dimension == "any":
        if isinstance(text, (int, float)) and not isinstance(text, bool):
            return float(text), "fraction"
        try:
            return parse_any(str(text))
        except UnitError as exc:
            raise _FieldError(str(exc)) from None
    try:
        return parse_quantity(str(text), dimension), dimension
    except UnitError as exc:
        raise _FieldError(str(exc)) from None


def _read_field(spec: Spec, raw: Any, source: str, flag: str) -> Any:
    if spec.type == "quantity":
        if isinstance(raw, dict):
            extra = set(raw) - {"value", "source", "flag"}
            if extra or "value" not in raw:
                raise _FieldError("expected {value, source, flag} or a value with a unit")
            own_flag = flag_word(str(raw.get("flag", flag)))
            if own_flag is None:
                raise _FieldError(
                    f"flag must be one of {ACCEPTED_FLAGS}, got {str(raw.get('flag'))!r}"
                )
            value, dim = _quantity(raw["value"], spec.dimension)
            return Sourced(value, str(raw["value"]), str(raw.get("source", source)), own_flag, dim)
        value, dim = _quantity(raw, spec.dimension)
        return Sourced(value, str(raw), source, flag, dim)
    if spec.type == "number":
        if isinstance(raw, bool) or not isinstance(raw, (int, float)):
            raise _FieldError(f"expected a number, got {raw!r}")
        return float(raw)
    if spec.type == "text":
        if isinstance(raw, (dict, list)):
            raise _FieldError(f"expected text, got {raw!r}")
        return str(raw)
    if spec.type == "bool":
        if not isinstance(raw, bool):
            raise _FieldError(f"expected true or false, got {raw!r}")
        return raw
    if spec.type == "choice":
        if raw not in spec.choices:
            raise _FieldError(f"expected one of {', '.join(spec.choices)}, got {raw!r}")
        return raw
    if spec.type in ("names", "texts"):
        if not isinstance(raw, list) or not all(isinstance(n, (str, int, float)) for n in raw):
            raise _FieldError("expected a list of text items")
        return tuple(str(n) for n in raw)
    if spec.type == "points":
        return _read_points(raw, source, flag)
    if spec.type == "steps":
        return _read_steps(raw, source, flag)
    if spec.type == "limit":
        return _read_limit(raw, source, flag)
    if spec.type == "range":
        return _read_range(raw, source, flag)
    raise AssertionError(spec.type)


def _read_range(raw: Any, source: str, flag: str) -> Sourced:
    """A range in the room file's syntax (`ignite.room.ranges`), in the dimension its unit
    says; `_check_ranges` matches that with the field it varies."""
    if not is_range(raw):
        raise _FieldError(
            "expected a range: '0.23 to 0.28 mJ', '12.6 W/(m^2*K) ± 2 W/(m^2*K)' or "
            "{low: ..., likely: ..., high: ...}"
        )
    if isinstance(raw, dict):
        written = str(raw.get("high", ""))
    else:
        written = re.split(r"\s+to\s+|\s*(?:±|\+/-|\+-)\s*", str(raw).strip(), maxsplit=1)[0]
        if number_and_unit(written) is None:
            written = re.split(r"\s+to\s+", str(raw).strip(), maxsplit=1)[-1]
    try:
        dimension = parse_any(written)[1]
        spread = parse_range(raw, dimension)
    except UnitError as exc:
        raise _FieldError(str(exc)) from None
    assert spread is not None
    return Sourced(spread, spread.text, source, flag, dimension)


def _read_points(raw: Any, source: str, flag: str) -> Sourced:
    if not isinstance(raw, list) or len(raw) < 2:
        raise _FieldError("expected a list of at least two [x, y] pairs")
    points = []
    for pair in raw:
        if not isinstance(pair, list) or len(pair) != 2:
            raise _FieldError(f"expected an [x, y] pair, got {pair!r}")
        x, _ = _quantity(pair[0], "any")
        y, _ = _quantity(pair[1], "any")
        points.append((x, y))
    xs = [p[0] for p in points]
    if xs != sorted(xs) or len(set(xs)) != len(xs):
        raise _FieldError("x values must increase")
    text = ", ".join(f"{a} → {b}" for a, b in raw)
    return Sourced(tuple(points), text, source, flag)


def _read_steps(raw: Any, source: str, flag: str) -> Sourced:
    if not isinstance(raw, list) or not raw:
        raise _FieldError("expected a list of {supply_up_to, value}")
    steps = []
    for step in raw:
        if not isinstance(step, dict) or set(step) != {"supply_up_to", "value"}:
            raise _FieldError(
                f"expected {{supply_up_to: <voltage>, value: <resistance>}}, got {step!r}"
            )
        supply, _ = _quantity(step["supply_up_to"], "voltage")
        value, _ = _quantity(step["value"], "resistance")
        steps.append((supply, value))
    if [s[0] for s in steps] != sorted(s[0] for s in steps):
        raise _FieldError("supply_up_to must increase")
    text = ", ".join(f"{s['value']} up to {s['supply_up_to']}" for s in raw)
    return Sourced(tuple(steps), text, source, flag, "resistance")


def _read_limit(raw: Any, source: str, flag: str) -> Limit:
    if isinstance(raw, dict):
        if len(raw) != 1 or next(iter(raw)) not in ("param", "window", "result"):
            raise _FieldError(
                "expected a value with a unit, {param: ID}, {window: FIELD} or {result: NAME}"
            )
        kind, ref = next(iter(raw.items()))
        if kind == "window" and ref not in WINDOW_LIMITS:
            raise _FieldError(
                f"window limit must be one of {', '.join(WINDOW_LIMITS)}, got {ref!r}"
            )
        return Limit(kind, str(ref))
    value, dim = _quantity(raw, "any")
    return Limit("quantity", value=Sourced(value, str(raw), source, flag, dim))


_WINDOW_DIMENSIONS = {
    "low": "resistance",
    "high": "resistance",
    "mean_low": "resistance",
    "system_high": "resistance",
    "walking_voltage_high": "voltage",
}


def limit_dimension(
    limit: Limit, entries: Mapping[str, Entry], known: Mapping[str, str]
) -> str | None:
    """The dimension a limit is expressed in, or None when it cannot be told."""
    if limit.kind == "quantity" and limit.value is not None:
        return limit.value.dimension
    if limit.kind == "param":
        entry = entries.get(limit.ref)
        return entry.sourced("value").dimension if entry and entry.kind == "parameters" else None
    if limit.kind == "window":
        return _WINDOW_DIMENSIONS[limit.ref]
    return known.get(limit.ref)


RANGED_FIELDS: dict[str, tuple[str, ...]] = {
    "parameters": ("value",),
    "fuels": ("mie_air", "exponent"),
    "curves": ("points",),
}
"""The fields a `ranges` entry may vary, by the kind of entry it names; a curve's `points`
are scaled (the range is a factor on its y values)."""


def _check_ranges(entries: Mapping[str, Entry], problems: list[Problem]) -> None:
    """A `ranges` entry names an entry and field that exist, in the same dimension, and its
    range holds the value in force (so the nominal run sits inside the spread)."""
    for entry in entries.values():
        if entry.kind != "ranges":
            continue
        where = f"{entry.id}.varies"
        target = entries.get(str(entry.get("varies")))
        name = str(entry.get("field") or "value")
        if target is None or name not in RANGED_FIELDS.get(target.kind, ()):
            allowed = "; ".join(f"{k}: {', '.join(v)}" for k, v in RANGED_FIELDS.items())
            problems.append(
                Problem(
                    entry.file,
                    entry.line,
                    where,
                    f"expected an entry id and one of its fields that may vary ({allowed}), "
                    f"got {entry.get('varies')!r} field {name!r}",
                )
            )
            continue
        spread = entry.sourced("range")
        if name == "points":
            wanted, central = "fraction", 1.0
        else:
            item = target.sourced(name)
            wanted, central = item.dimension or "fraction", float(item.value)
        if spread.dimension != wanted:
            problems.append(
                Problem(
                    entry.file,
                    entry.line,
                    f"{entry.id}.range",
                    f"incompatible units: {target.id} {name} is a {wanted}, the range a "
                    f"{spread.dimension}",
                )
            )
            continue
        found = spread.value
        slack = 1e-9 * abs(central)
        if not (found.low - slack <= central <= found.high + slack):
            problems.append(
                Problem(
                    entry.file,
                    entry.line,
                    f"{entry.id}.range",
                    f"the range {found.text!r} does not hold the value in force of "
                    f"{target.id} {name}",
                )
            )


def _cross_check(
    entries: Mapping[str, Entry], known: Mapping[str, str] | None, problems: list[Problem]
) -> None:
    _check_ranges(entries, problems)
    for entry in entries.values():
        if entry.kind == "curves":
            points = entry.get("points")
            if any(not math.isfinite(v) for pair in points for v in pair):
                problems.append(Problem(entry.file, entry.line, f"{entry.id}.points", "not finite"))
        if entry.kind != "checks" or known is None:
            continue
        reads = entry.get("reads")
        where = f"{entry.id}.reads"
        if reads not in known:
            problems.append(
                Problem(
                    entry.file,
                    entry.line,
                    where,
                    f"unknown result {reads!r}; known: {', '.join(sorted(known))}",
                )
            )
            continue
        dimension = known[reads]
        limit: Limit | None = entry.get("limit")
        test = entry.get("test")
        if test == "is-true":
            if dimension != "flag":
                problems.append(
                    Problem(
                        entry.file,
                        entry.line,
                        where,
                        f"test is-true needs a yes/no result, {reads!r} is a {dimension}",
                    )
                )
            continue
        if limit is None:
            problems.append(
                Problem(entry.file, entry.line, f"{entry.id}.limit", f"test {test!r} needs a limit")
            )
            continue
        if limit.kind == "param" and (
            limit.ref not in entries or entries[limit.ref].kind != "parameters"
        ):
            problems.append(
                Problem(
                    entry.file, entry.line, f"{entry.id}.limit", f"unknown parameter {limit.ref!r}"
                )
            )
            continue
        if limit.kind == "result" and limit.ref not in known:
            problems.append(
                Problem(
                    entry.file, entry.line, f"{entry.id}.limit", f"unknown result {limit.ref!r}"
                )
            )
            continue
        limit_dim = limit_dimension(limit, entries, known)
        if limit_dim is not None and limit_dim != dimension:
            problems.append(
                Problem(
                    entry.file,
                    entry.line,
                    f"{entry.id}.limit",
                    f"incompatible units: {reads!r} is a {dimension}, the limit is a {limit_dim}",
                )
            )


_TEST_WORDS = {
    "above": "is above",
    "at-or-above": "is at or above",
    "below": "is below",
    "at-or-below": "is at or below",
    "is-true": "is found",
}


def _limit_text(limit: Limit, entries: Mapping[str, Entry]) -> str:
    if limit.kind == "quantity" and limit.value is not None:
        return limit.value.text
    if limit.kind == "param":
        entry = entries.get(limit.ref)
        value = entry.sourced("value").text if entry is not None else "?"
        return f"{value} ({limit.ref})"
    if limit.kind == "window":
        return f"the floor window's {limit.ref.replace('_', ' ')} limit"
    return f"that subject's {sentences.result_words(limit.ref).removeprefix('the ')}"


def describe(entry: Entry, entries: Mapping[str, Entry] | None = None) -> str:
    """The threshold or values of an entry in one line, as `ignite rules` and the appendix print it."""
    if entry.kind == "checks":
        reads = entry.get("reads")
        test = entry.get("test")
        limit = entry.get("limit")
        text = (
            f"{entry.get('severity')} finding when {sentences.result_words(reads)} "
            f"{_TEST_WORDS[test]}"
        )
        if limit is not None:
            text += " " + _limit_text(limit, entries or {})
        return text
    if entry.kind == "windows":
        return _window_text(entry)
    skip = {"names", "match", "x", "y", "cas", "kind"}
    parts = []
    for key, item in entry.fields.items():
        if key in skip:
            continue
        if isinstance(item, Sourced):
            text = item.text
            if item.source != entry.source or item.flag != entry.flag:
                text += f" ({item.flag}: {item.source})"
            parts.append(text if key == "value" else f"{key.replace('_', ' ')} {text}")
        else:
            parts.append(f"{key.replace('_', ' ')} {item}")
    return "; ".join(parts)


def _provenance(entry: Entry, name: str) -> str:
    item = entry.sourced(name)
    if item.source != entry.source or item.flag != entry.flag:
        return f" ({item.flag}: {item.source})"
    return ""


def _window_text(entry: Entry) -> str:
    parts = []
    if entry.has("low"):
        sign = "≥" if entry.get("low_inclusive", False) else ">"
        steps = entry.sourced("low").text.split(", ")
        parts.append(
            "each reading "
            + ", ".join(f"{sign} {step.replace(' up to ', ' at supply ≤ ')}" for step in steps)
        )
    if entry.has("high"):
        sign = "≤" if entry.get("high_inclusive", True) else "<"
        parts.append(
            f"each reading {sign} {entry.sourced('high').text}{_provenance(entry, 'high')}"
        )
    if entry.has("mean_low"):
        count = int(entry.get("mean_min_readings", 1))
        parts.append(
            f"average of {count} or more readings > {entry.sourced('mean_low').text}{_provenance(entry, 'mean_low')}"
        )
    if entry.has("system_high"):
        parts.append(f"person + footwear + floor < {entry.sourced('system_high').text}")
    if entry.has("walking_voltage_high"):
        parts.append(f"walking body voltage < {entry.sourced('walking_voltage_high').text}")
    return "; ".join(parts)


def check_dimensions(book: Rulebook, known: Mapping[str, str]) -> list[str]:
    """Checks whose limit's dimension differs from the dimension of the result they read."""
    bad = []
    for check in book.of_kind("checks"):
        limit = check.get("limit")
        if limit is not None and limit_dimension(limit, book.entries, known) not in (
            None,
            known[check.get("reads")],
        ):
            bad.append(check.id)
    return bad
