"""On-disk cache of resolved substance data and pure-component model objects.

Resolving a substance in `chemicals` and building its `thermo` property objects loads
several data tables, which costs about a second in a fresh process. What comes out
depends only on the text looked up, on the code that resolves it and on the installed
`chemicals` and `thermo` (and the `fluids` and `numpy` under them), so it is kept here
between runs as pickles, one file an entry:

- directory: `$IGNITE_CACHE_DIR`, else `$XDG_CACHE_HOME/ignite`, else `~/.cache/ignite`;
  `IGNITE_NO_CACHE=1` turns the cache off;
- each file holds a header (cache format, a digest of the source of `vapour.py` and of
  this module, library versions, kind and key of the entry) and the object; a file
  whose header differs from what is asked for is ignored and rewritten, so a library
  upgrade or an edit to the code that resolves substances never mixes old data in;
- files are written to a temporary name in the same directory and moved into place
  with `os.replace`, so a reader never sees half a file; a temporary file left by a
  process killed mid-write is removed by the next write once it is STALE_SECONDS old;
- any failure (unreadable or corrupt file, unwritable directory) is silent: the caller
  computes the value the ordinary way, and the cache is only ever a shortcut.

The cache changes no result: an entry holds exactly what the ordinary path computes.
Pickles are loaded only from the user's own cache directory.
"""

from __future__ import annotations

import contextlib
import hashlib
import os
import pickle
import sys
import tempfile
import time
from collections.abc import Callable
from functools import lru_cache
from pathlib import Path
from typing import Any

__all__ = ["CACHE_FORMAT", "Versions", "cache_directory", "load", "prune", "store"]

CACHE_FORMAT = 1
"""Raise when the layout of an entry, or what an entry of some kind holds, changes."""

STALE_SECONDS = 600.0
"""A temporary file this old belongs to no running write (a write takes milliseconds)."""


def _sweep(directory: Path) -> None:
    """Remove temporary files that writers killed mid-write left behind."""
    now = time.time()
    for leftover in directory.glob(".tmp-*.pickle"):
        with contextlib.suppress(OSError):
            if now - leftover.stat().st_mtime > STALE_SECONDS:
                leftover.unlink()


def cache_directory() -> Path | None:
    """Directory of the cache, or None when `IGNITE_NO_CACHE` (any value but 0) turns it off.

    Read from the environment at every call, so a test can point it elsewhere.
    """
    if os.environ.get("IGNITE_NO_CACHE", "").strip() not in ("", "0"):
        return None
    chosen = os.environ.get("IGNITE_CACHE_DIR")
    if chosen:
        return Path(chosen)
    base = os.environ.get("XDG_CACHE_HOME")
    if base and os.path.isabs(base):
        return Path(base) / "ignite"
    try:
        return Path.home() / ".cache" / "ignite"
    except RuntimeError:  # no home directory to be found: no cache
        return None


_SOURCES = ("vapour.py", "_cache.py")
"""Files (this one and its neighbour) whose code decides what an entry holds."""


@lru_cache(maxsize=1)
def _versions() -> tuple[tuple[str, str], ...]:
    """Versions of the code and libraries whose data and objects the cache holds."""
    import chemicals
    import fluids
    import numpy
    import thermo

    code = hashlib.sha256()
    for name in _SOURCES:
        code.update(Path(__file__).with_name(name).read_bytes())
    return (
        ("format", str(CACHE_FORMAT)),
        ("code", code.hexdigest()),
        ("python", f"{sys.version_info[0]}.{sys.version_info[1]}"),
        ("chemicals", str(chemicals.__version__)),
        ("thermo", str(thermo.__version__)),
        ("fluids", str(fluids.__version__)),
        ("numpy", str(numpy.__version__)),
    )


def prepare() -> None:
    """Work out the versions every entry is read under now (importing the property
    libraries): a process that forks workers does so first, and each begins with them."""
    _versions()


Versions = tuple[tuple[str, str], ...]
"""What an entry depends on besides its key: (name, version or digest) pairs."""


def _header(kind: str, key: Any, versions: Versions | None) -> tuple[Any, ...]:
    return (kind, repr(key), _versions() if versions is None else versions)


def _path(directory: Path, header: tuple[Any, ...]) -> Path:
    digest = hashlib.sha256(repr(header).encode("utf-8")).hexdigest()[:40]
    return directory / f"{header[0]}-{digest}.pickle"


def load(
    kind: str, key: Any, accept: Callable[[Any], bool], versions: Versions | None = None
) -> Any | None:
    """The object stored under (kind, key) for the installed libraries, or None.

    `accept` checks the object's type; an object it rejects counts as a miss. `versions`
    names what the entry depends on (the substance data's libraries when not given).
    """
    directory = cache_directory()
    if directory is None:
        return None
    try:
        header = _header(kind, key, versions)
        path = _path(directory, header)
        with open(path, "rb") as file:
            found, value = pickle.load(file)
        if found == header and accept(value):
            with contextlib.suppress(OSError):
                os.utime(path)  # last used now: `prune` keeps the recently used
            return value
    except Exception:
        pass  # unreadable, corrupt or foreign: a miss, rewritten by the caller
    return None


def store(kind: str, key: Any, value: Any, versions: Versions | None = None) -> None:
    """Keep `value` under (kind, key); any failure leaves the cache as it was."""
    directory = cache_directory()
    if directory is None:
        return
    temporary: str | None = None
    try:
        header = _header(kind, key, versions)
        data = pickle.dumps((header, value), protocol=pickle.HIGHEST_PROTOCOL)
        directory.mkdir(parents=True, exist_ok=True)
        _sweep(directory)
        handle, temporary = tempfile.mkstemp(prefix=".tmp-", suffix=".pickle", dir=directory)
        with os.fdopen(handle, "wb") as file:
            file.write(data)
        os.replace(temporary, _path(directory, header))
        temporary = None
    except Exception:
        return  # the cache is a shortcut: a failure to keep an entry is no error
    finally:
        if temporary is not None:
            with contextlib.suppress(OSError):
                os.unlink(temporary)


def prune(kinds: tuple[str, ...], budget: int) -> None:
    """Remove the entries of `kinds` least recently used until they hold `budget` bytes or
    less (an entry read or written counts as used); any failure leaves the rest alone."""
    directory = cache_directory()
    if directory is None:
        return
    try:
        entries = []
        paths = {path for kind in kinds for path in directory.glob(f"{kind}-*.pickle")}
        for path in paths:  # (a kind may be the prefix of another: each file once)
            with contextlib.suppress(OSError):
                status = path.stat()
                entries.append((status.st_mtime, status.st_size, path))
        total = sum(size for _, size, _ in entries)
        for _, size, path in sorted(entries, key=lambda entry: entry[0]):
            if total <= budget:
                break
            with contextlib.suppress(OSError):
                path.unlink()
                total -= size
    except Exception:
        return  # the cache is a shortcut: a failure to prune it is no error
