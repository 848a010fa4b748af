"""The errors a user can cause, each carrying the data to say exactly what went wrong.

A `Problem` names the file, the 1-based line, the key path and what was expected and
found; it prints as ``room.yaml:14: floor.point_to_ground[3]: expected a resistance
(e.g. '250 kΩ'), got '5 kg'``. Loaders collect every problem in a file and raise one
`InputError` (or `RuleFileError` for `rules/`) holding all of them, so the user fixes
everything in one pass. Each error carries the exit code the command line ends with
(`exit_code`, as click's own exceptions do); nothing here prints.
"""

from __future__ import annotations

import os
import stat
from collections.abc import Iterable
from dataclasses import dataclass
from pathlib import Path


@dataclass(frozen=True)
class Problem:
    """One thing wrong with an input file.

    >>> str(Problem("room.yaml", 14, "floor.point_to_ground[3]", "expected a resistance"))
    'room.yaml:14: floor.point_to_ground[3]: expected a resistance'
    >>> str(Problem("room.yaml", None, "", "the file is empty"))
    'room.yaml: the file is empty'
    """

    file: str
    line: int | None  # 1-based; None when no line applies (unreadable file)
    path: str  # key path such as "cases[0].oxygen.flow"; "" for the whole file
    message: str

    def __str__(self) -> str:
        where = self.file if self.line is None else f"{self.file}:{self.line}"
        if self.path:
            return f"{where}: {self.path}: {self.message}"
        return f"{where}: {self.message}"


EXIT_USAGE = 2  # usage error, a path that cannot be read or written, or an output exists
EXIT_INVALID = 3  # invalid room or rule file
EXIT_INTERNAL = 4  # an unexpected internal error (a defect of ignite: please report it)


class IgniteError(Exception):
    """Base of every error ignite raises on purpose.

    `exit_code` is the code the command line exits with when this error ends a command:
    by default a usage error (the command cannot do what it was asked, as asked).
    """

    exit_code: int = EXIT_USAGE


class InputError(IgniteError):
    """An input file is invalid; `problems` lists everything found, in file order."""

    exit_code = EXIT_INVALID

    def __init__(self, problems: Iterable[Problem]) -> None:
        self.problems: list[Problem] = list(problems)
        super().__init__(str(self))

    def __str__(self) -> str:
        return "\n".join(str(problem) for problem in self.problems)


class RuleFileError(InputError):
    """A file in `rules/` is invalid (same shape as `InputError`)."""

    exit_code = EXIT_INVALID


class OutputExistsError(IgniteError):
    """An output file exists and overwriting was not asked for."""

    exit_code = EXIT_USAGE

    def __init__(self, path: Path | str) -> None:
        self.path = Path(path)
        super().__init__(f"{self.path} exists; use --force to overwrite it")


class SolveLimitError(IgniteError):
    """A numerical solve used up its step budget without finishing: ignite's own defect
    for a valid room (exit 4), reported with what was being solved, never a hang.

    >>> str(SolveLimitError("the drying of 70 % isopropanol, in open air", 100000))
    'the drying of 70 % isopropanol, in open air: the solve stopped after 100000 steps without finishing; no figures are given for it (please report it with the room file)'
    """

    exit_code = EXIT_INTERNAL

    def __init__(self, what: str, steps: int) -> None:
        self.what = what
        self.steps = steps
        super().__init__(
            f"{what}: the solve stopped after {steps} steps without finishing; no figures "
            "are given for it (please report it with the room file)"
        )


class PathError(IgniteError):
    """A path that cannot be read or written (a usage error): one line naming it and why.

    >>> str(PathError("out/x.pdf", "cannot be written", "Not a directory"))
    'out/x.pdf: cannot be written: Not a directory'
    """

    exit_code = EXIT_USAGE

    def __init__(self, path: Path | str, action: str, reason: str) -> None:
        self.path = Path(path)
        self.action = action
        self.reason = reason
        super().__init__(f"{path}: {action}: {reason}")

    @classmethod
    def from_os_error(cls, exc: OSError, action: str, path: Path | str | None = None) -> PathError:
        """The `PathError` an `OSError` stands for; `path` when the error names none."""
        where = exc.filename if exc.filename is not None else path
        return cls(str(where if where is not None else "?"), action, exc.strerror or str(exc))

    @classmethod
    def unwritable(cls, path: Path | str, exc: OSError) -> PathError:
        """`path` cannot be written because of `exc`; a file in the way is named as such.

        >>> import tempfile
        >>> with tempfile.NamedTemporaryFile() as handle:
        ...     error = PathError.unwritable(Path(handle.name) / "x.pdf", FileExistsError())
        ...     str(error).endswith(f"cannot be written: {handle.name} is a file, not a folder")
        True
        """
        for parent in Path(path).parents:
            if parent.exists() or parent.is_symlink():
                if not parent.is_dir():
                    return cls(path, "cannot be written", f"{parent} is a file, not a folder")
                break
        return cls(path, "cannot be written", exc.strerror or str(exc))


def unreadable(path: Path | str) -> str | None:
    """Why `path` cannot be read as a room file, or None when it can.

    Only regular files are read (a named pipe or a device could block for ever).

    >>> unreadable("/")
    'is a folder, not a file'
    """
    try:
        mode = os.stat(path).st_mode
    except OSError as exc:
        return exc.strerror or str(exc)
    if stat.S_ISDIR(mode):
        return "is a folder, not a file"
    if stat.S_ISFIFO(mode):
        return "is a named pipe, not a regular file"
    if not stat.S_ISREG(mode):
        return "is not a regular file"
    try:
        with open(path, "rb"):
            pass
    except OSError as exc:
        return exc.strerror or str(exc)
    return None


class UnitError(ValueError):
    """A quantity string could not be read as the dimension asked for.

    `message` says what was expected (with an example) and what was found; the loader
    adds the file, line and key path (and so it ends as an `InputError`, exit code 3).
    """

    exit_code = EXIT_INVALID

    def __init__(self, message: str) -> None:
        self.message = message
        super().__init__(message)
