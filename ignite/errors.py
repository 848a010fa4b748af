"""The errors a user can cause, each carrying the data to say exactly what went wrong.

A `Problem` names the file, the 1-based line, the key path and what was expected and
found; it prints as ``room.yaml:14: floor.point_to_ground[3]: expected a resistance
(e.g. '250 kΩ'), got '5 kg'``. Loaders collect every problem in a file and raise one
`InputError` (or `RuleFileError` for `rules/`) holding all of them, so the user fixes
everything in one pass. Each error carries the exit code the command line ends with
(`exit_code`, as click's own exceptions do); nothing here prints.
"""

from __future__ import annotations

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


EXIT_USAGE = 2  # usage error, or an output exists and --force was not given
EXIT_INVALID = 3  # invalid room or rule file


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


class UnitError(ValueError):
    """A quantity string could not be read as the dimension asked for.

    `message` says what was expected (with an example) and what was found; the loader
    adds the file, line and key path (and so it ends as an `InputError`, exit code 3).
    """

    exit_code = EXIT_INVALID

    def __init__(self, message: str) -> None:
        self.message = message
        super().__init__(message)
