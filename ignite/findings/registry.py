"""The results a check may read, by name: each gives the items it is measured on.

An item is one subject (the floor, a person or trolley, a case) with its value and the
context its rule's detail and mitigation texts may quote. The families register their
results with `@result(name, dimension)` (ignite.findings.floor, .charge, .cases).
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


RESULTS: dict[str, Registered] = {}


def result(name: str, dimension: str) -> Callable[[ResultFn], ResultFn]:
    """Register a result function under the name checks read it by."""

    def register(fn: ResultFn) -> ResultFn:
        RESULTS[name] = Registered(dimension, fn)
        return fn

    return register
