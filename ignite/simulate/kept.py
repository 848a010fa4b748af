"""Drying solves kept on disk between runs, keyed by everything they read.

A drying solve (`ignite.simulate.drying.simulate_prep`, `ignite.simulate.batch.dry_batch`)
and a preparation's analysis (`ignite.simulate.preparation.analyse_preparation`, whose
flash point and vapour need scipy's root finder) are pure functions of their inputs: the preparation's analysis, the application, the room's
air, the drape plan and pocket, the rules' assumptions, and the solver's own constants.
It is also the bulk of a run's time, and the same solves come back again and again: a
room checked and then assessed, a periodic audit of rooms that did not change since the
last one, rooms that share the same stock cases. So a finished solve is kept in the
user's cache directory (`ignite.physics._cache`, the same rules: `IGNITE_NO_CACHE=1`
turns it off, deleting the directory is always safe, a failure to read or write is
silent and the solve simply runs). `IGNITE_SOLVE_AGAIN=1` solves every time but still
keeps the results (to time the solver, or to check a kept result against a new solve).
The kept solves hold at most BUDGET bytes: past it, the least recently used are removed.

An entry is found only when its key repeats exactly (every input, as `repr` writes it,
to the last digit of every float) and it was written by the same code: the versions
name a digest of every source file of `ignite.simulate` and `ignite.physics` and the
versions of the libraries under them. A kept result is therefore the very object the
solve returns, and a run that reads it is byte-identical to one that solves.
"""

from __future__ import annotations

import hashlib
import os
import sys
from collections.abc import Callable
from functools import lru_cache
from pathlib import Path
from typing import Any, TypeVar

from ignite.physics import _cache

__all__ = ["kept", "solver_versions"]

T = TypeVar("T")

KINDS = ("drying", "drying-batch", "preparation")
"""The kinds of entry kept here (a solve of 1000 samples takes about 20 MB)."""
BUDGET = 256 * 2**20
"""Bytes the kept solves may hold; past it the least recently used go."""


def prepare() -> None:
    """Work out now what reading a kept solve back needs (the libraries' versions, the
    code's digest; the property libraries imported). An audit does so before it starts its
    worker processes: forked, each begins with them rather than paying for them on its
    first room."""
    _cache.prepare()
    solver_versions()


@lru_cache(maxsize=1)
def solver_versions() -> _cache.Versions:
    """The code and libraries a solve's result depends on."""
    from importlib.metadata import version

    import chemicals
    import fluids
    import numpy
    import thermo

    code = hashlib.sha256()
    package = Path(__file__).resolve().parent.parent
    for folder in ("simulate", "physics"):
        for source in sorted((package / folder).glob("*.py")):
            code.update(source.name.encode("utf-8"))
            code.update(source.read_bytes())
    return (
        ("format", str(_cache.CACHE_FORMAT)),
        ("code", code.hexdigest()),
        ("python", f"{sys.version_info[0]}.{sys.version_info[1]}"),
        ("numpy", str(numpy.__version__)),
        ("scipy", version("scipy")),  # its version without importing it
        ("chemicals", str(chemicals.__version__)),
        ("thermo", str(thermo.__version__)),
        ("fluids", str(fluids.__version__)),
    )


def kept(kind: str, key: Any, kind_of: type[T], solve: Callable[[], T]) -> T:
    """The result kept under (kind, key) by this code, else `solve()`, then kept.

    `key` must hold every input of the solve (its `repr` is compared whole); an error
    raised by `solve` is raised as ever, and nothing is kept for it."""
    again = os.environ.get("IGNITE_SOLVE_AGAIN", "").strip() not in ("", "0")
    found = (
        None
        if again
        else _cache.load(kind, key, lambda value: isinstance(value, kind_of), solver_versions())
    )
    if found is not None:
        result: T = found
        return result
    result = solve()
    _cache.store(kind, key, result, solver_versions())
    _cache.prune(KINDS, BUDGET)
    return result
