"""The results a check may read, by name: each gives the items it is measured on.

An item is one subject (the floor, a person or trolley, a case) with its value and the
context its rule's detail and mitigation texts may quote. The families register their
results with `@result(name, dimension, kind)` (ignite.findings.floor, .charge, .cases);
`kind` says what the value is to the person reading it: `measured` (a reading a person
took), `planned` (a time the team planned) or `computed` (ignite's figure).
"""

from __future__ import annotations

from collections.abc import Callable, Iterator, Mapping
from dataclasses import dataclass, field

from ignite.records.results import Results
from ignite.rules.bound import Bound

Context = Mapping[str, str | int]
"""Placeholder name -> the text (or count) a rule's detail and mitigations may quote."""


@dataclass(frozen=True)
class Item:
    subject: str
    value: float | bool | None
    context: Context = field(default_factory=dict)


@dataclass(frozen=True)
class Scope:
    """Everything a result function may look at."""

    results: Results
    bound: Bound


ResultFn = Callable[[Scope], Iterator[Item]]


@dataclass(frozen=True)
class Registered:
    dimension: str
    items: ResultFn
    kind: str = "computed"  # measured | planned | computed


KINDS = ("measured", "planned", "computed")


RESULTS: dict[str, Registered] = {}


def result(name: str, dimension: str, kind: str = "computed") -> Callable[[ResultFn], ResultFn]:
    """Register a result function under the name checks read it by."""
    if kind not in KINDS:
        raise ValueError(f"result {name}: kind must be one of {KINDS}, got {kind!r}")

    def register(fn: ResultFn) -> ResultFn:
        RESULTS[name] = Registered(dimension, fn, kind)
        return fn

    return register
