"""YAML text -> plain data, plus the line of every key and list item.

Only the YAML that a hand-written room or rules file needs is accepted: mappings,
lists, text, numbers, booleans, null and dates. Anything else is refused with a
`Problem` naming the line and key path:

- tags other than YAML's own plain types (``!!python/...``, ``!custom``, ``!!binary``,
  ``!!set``, merge keys) are refused, never constructed;
- anchors (``&a``) and aliases (``*a``) are refused, which also rules out
  "billion laughs" expansion;
- files over `MAX_BYTES` and nesting deeper than `MAX_DEPTH` are refused;
- a key given twice in one mapping is a problem (the first value is kept);
- syntax errors carry the line from the YAML mark.

Values come back as str, int, float, bool, None, list and dict. Dates (YAML reads
``2026-12-01`` as a date) come back as ISO strings; mapping keys come back as the
text written in the file (so ``1:`` is the key ``"1"`` and ``on:`` is ``"on"``).

Key paths look like ``floor.point_to_ground[3]``, ``cases[0].oxygen.flow`` and
``people[1]``; `join` and `item` build them, `line_of` finds the nearest line.

>>> data, lines = load_yaml("floor:\\n  readings: [1 kΩ, 2 kΩ]\\n", "room.yaml")
>>> data
{'floor': {'readings': ['1 kΩ', '2 kΩ']}}
>>> lines["floor.readings[1]"]
2
"""

from __future__ import annotations

import datetime
from dataclasses import dataclass, field
from typing import Any

import yaml
from yaml.events import AliasEvent
from yaml.nodes import MappingNode, Node, ScalarNode, SequenceNode

from ignite.errors import InputError, Problem

MAX_BYTES = 1024 * 1024  # larger than any hand-written room or rules file
MAX_DEPTH = 32  # a room file nests five deep

_STANDARD = "tag:yaml.org,2002:"
_SCALAR_TAGS = frozenset(
    _STANDARD + name for name in ("str", "int", "float", "bool", "null", "timestamp")
)
_COLLECTION_TAGS = frozenset({_STANDARD + "seq", _STANDARD + "map"})
_ALIAS_TAG = "!ignite/refused-alias"  # stands in for an alias; never leaves this module


@dataclass
class ParsedYaml:
    """What `parse_yaml` found: data, lines, and the problems it could recover from.

    `refused` holds the key paths whose value was dropped (an alias, a refused tag):
    a validator should not report those paths again.
    """

    data: Any
    lines: dict[str, int]
    problems: list[Problem] = field(default_factory=list)
    refused: set[str] = field(default_factory=set)


class _TooDeep(Exception):
    def __init__(self, mark: yaml.Mark) -> None:
        self.mark = mark


class _Composer(yaml.SafeLoader):
    """A SafeLoader used only to compose nodes: aliases stand in as marked nodes,
    anchors are recorded (and not registered), depth is bounded."""

    def __init__(self, stream: str) -> None:
        super().__init__(stream)
        self.anchored: dict[int, str] = {}  # id(node) -> anchor name
        self.depth = 0

    def compose_node(self, parent: Node | None, index: Any) -> Node | None:
        if self.check_event(AliasEvent):
            event = self.get_event()
            return ScalarNode(_ALIAS_TAG, event.anchor, event.start_mark, event.end_mark)
        event = self.peek_event()
        anchor = getattr(event, "anchor", None)
        if anchor is not None:
            event.anchor = None  # never registered, so no alias can reach it
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise _TooDeep(event.start_mark)
        try:
            node = super().compose_node(parent, index)
        finally:
            self.depth -= 1
        if anchor is not None:
            self.anchored[id(node)] = anchor
        return node


def join(parent: str, key: str) -> str:
    """Key path of `key` inside the mapping at `parent`.

    >>> join("", "floor"), join("cases[0]", "oxygen")
    ('floor', 'cases[0].oxygen')
    """
    return f"{parent}.{key}" if parent else key


def item(parent: str, index: int) -> str:
    """Key path of list item `index` inside the list at `parent`.

    >>> item("people", 1)
    'people[1]'
    """
    return f"{parent}[{index}]"


def parent_of(path: str) -> str:
    """The key path one level up ('' at the top).

    >>> parent_of("cases[0].oxygen.flow"), parent_of("cases[0]"), parent_of("format")
    ('cases[0].oxygen', 'cases', '')
    """
    if path.endswith("]") and "[" in path:
        return path[: path.rindex("[")]
    if "." in path:
        return path[: path.rindex(".")]
    return ""


def line_of(lines: dict[str, int], path: str) -> int | None:
    """Line of `path`, or of its nearest ancestor that has one (a missing key's parent).

    >>> line_of({"": 1, "room": 2, "room.mains": 7}, "room.mains.voltage")
    7
    """
    while True:
        if path in lines:
            return lines[path]
        if not path:
            return None
        path = parent_of(path)


def _line(node: Node) -> int:
    return int(node.start_mark.line) + 1


def _show_tag(tag: str) -> str:
    return "!!" + tag[len(_STANDARD) :] if tag.startswith(_STANDARD) else tag


class _Builder:
    def __init__(self, filename: str, composer: _Composer, parsed: ParsedYaml) -> None:
        self.filename = filename
        self.composer = composer
        self.parsed = parsed

    def problem(self, line: int, path: str, message: str) -> None:
        self.parsed.problems.append(Problem(self.filename, line, path, message))

    def refuse(self, node: Node, path: str) -> bool:
        """Report a node that may not be used; True when its value must be dropped."""
        if node.tag == _ALIAS_TAG:
            self.problem(
                _line(node),
                path,
                f"aliases (*{node.value}) are not accepted: write the value out in full",
            )
            return True
        anchor = self.composer.anchored.get(id(node))
        if anchor is not None:
            self.problem(
                _line(node),
                path,
                f"anchors (&{anchor}) are not accepted: write each value out in full",
            )
        allowed = (
            _COLLECTION_TAGS if isinstance(node, (MappingNode, SequenceNode)) else _SCALAR_TAGS
        )
        if node.tag not in allowed:
            self.problem(
                _line(node),
                path,
                f"the tag '{_show_tag(node.tag)}' is not accepted: only plain text, numbers, "
                "true/false, dates, lists and mappings",
            )
            return True
        return False

    def build(self, node: Node, path: str) -> Any:
        if self.refuse(node, path):
            self.parsed.refused.add(path)
            return None
        if isinstance(node, MappingNode):
            return self.mapping(node, path)
        if isinstance(node, SequenceNode):
            result: list[Any] = []
            for index, child in enumerate(node.value):
                child_path = item(path, index)
                self.parsed.lines[child_path] = _line(child)
                result.append(self.build(child, child_path))
            return result
        return self.scalar(node)

    def mapping(self, node: MappingNode, path: str) -> dict[str, Any]:
        result: dict[str, Any] = {}
        for key_node, value_node in node.value:
            if not isinstance(key_node, ScalarNode) or key_node.tag == _ALIAS_TAG:
                self.problem(_line(key_node), path, "keys must be plain text")
                continue
            if key_node.tag == _STANDARD + "merge":
                self.problem(_line(key_node), path, "merge keys ('<<') are not accepted")
                continue
            if key_node.tag not in _SCALAR_TAGS:
                self.problem(
                    _line(key_node),
                    path,
                    f"the tag '{_show_tag(key_node.tag)}' is not accepted on a key",
                )
                continue
            key = str(key_node.value)
            if any("\ud800" <= char <= "\udfff" for char in key):
                shown = key.encode("utf-8", "backslashreplace").decode("utf-8")
                self.problem(
                    _line(key_node),
                    path,
                    f"the key '{shown}' holds a lone surrogate (no character): write the "
                    "key in plain text",
                )
                continue
            child_path = join(path, key)
            if key in result:
                first = self.parsed.lines.get(child_path)
                self.problem(
                    _line(key_node),
                    child_path,
                    f"duplicate key '{key}' (first given at line {first}); give each key once",
                )
                continue
            self.parsed.lines[child_path] = _line(key_node)
            result[key] = self.build(value_node, child_path)
        return result

    def scalar(self, node: Node) -> Any:
        try:
            value = self.composer.construct_object(node, deep=True)
        except Exception:  # an impossible date, an over-long integer: keep the text
            return str(node.value)
        if isinstance(value, (datetime.date, datetime.datetime)):
            return value.isoformat()
        return value


def _byte_length(text: str) -> int:
    if len(text) > MAX_BYTES:
        return len(text)
    return len(text.encode("utf-8", "replace"))


def parse_yaml(text: str, filename: str) -> ParsedYaml:
    """Parse `text`, returning data, line map and every problem found (never raising).

    When the YAML cannot be read at all (syntax, size, depth), `data` is None and the
    problems say why; otherwise `data` holds everything that could be kept.
    """
    parsed = ParsedYaml(data=None, lines={})
    size = _byte_length(text)
    if size > MAX_BYTES:
        parsed.problems.append(
            Problem(
                filename,
                None,
                "",
                f"the file is {size} bytes; the limit is {MAX_BYTES} bytes (1 MiB)",
            )
        )
        return parsed
    composer: _Composer | None = None
    try:
        composer = _Composer(text)
        root = composer.get_single_node()
    except _TooDeep as exc:
        parsed.problems.append(
            Problem(
                filename,
                exc.mark.line + 1,
                "",
                f"nesting deeper than {MAX_DEPTH} levels is not accepted",
            )
        )
        return parsed
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        detail = exc.problem or "unreadable YAML"
        if exc.context:
            context = exc.context
            start = exc.context_mark
            if start is not None and mark is not None and start.line != mark.line:
                context = f"{context} begun at line {start.line + 1}"
            detail = f"{context}, {detail}"
        line = None if mark is None else mark.line + 1
        parsed.problems.append(Problem(filename, line, "", f"invalid YAML: {detail}"))
        return parsed
    except yaml.reader.ReaderError as exc:
        line = text.count("\n", 0, max(exc.position, 0)) + 1
        code = exc.character if isinstance(exc.character, int) else ord(exc.character[:1] or "?")
        parsed.problems.append(
            Problem(filename, line, "", f"invalid YAML: the character U+{code:04X} is not allowed")
        )
        return parsed
    except yaml.YAMLError as exc:
        parsed.problems.append(Problem(filename, None, "", f"invalid YAML: {exc}"))
        return parsed
    finally:
        if composer is not None:
            composer.dispose()
    if root is None:
        return parsed
    parsed.lines[""] = _line(root)
    parsed.data = _Builder(filename, composer, parsed).build(root, "")
    parsed.problems.sort(key=lambda problem: problem.line or 0)
    return parsed


def load_yaml(text: str, filename: str) -> tuple[Any, dict[str, int]]:
    """Plain data and a map of key path -> 1-based line; `InputError` with every problem.

    >>> load_yaml("a: 1\\nb: !!python/name:os.system x\\n", "room.yaml")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    ignite.errors.InputError: room.yaml:2: b: the tag '!!python/name:os.system' is not accepted: ...
    """
    parsed = parse_yaml(text, filename)
    if parsed.problems:
        raise InputError(parsed.problems)
    return parsed.data, parsed.lines
