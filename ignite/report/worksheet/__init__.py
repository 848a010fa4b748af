"""The worksheet PDF: compute the strings (`model`), then lay them out (`pdf`).

`render_worksheet` returns the PDF as bytes; `write_worksheet` puts bytes on disk
through a temporary file in the same folder and an atomic rename, and refuses to
replace an existing file unless asked. reportlab is imported only when a worksheet
is rendered, so importing this package stays cheap.
"""

from __future__ import annotations

import os
import secrets
from collections.abc import Sequence
from pathlib import Path

from ignite.errors import OutputExistsError
from ignite.records.results import MethodRef, Results, RuleRow
from ignite.report.worksheet.model import WorksheetView, build_view

__all__ = [
    "OutputExistsError",
    "WorksheetView",
    "build_view",
    "prepare_drawing",
    "render_worksheet",
    "write_worksheet",
]


def render_worksheet(
    results: Results,
    rules: Sequence[RuleRow],
    methods: Sequence[MethodRef],
    input_text: str,
    paper: str = "A4",
) -> bytes:
    """The worksheet for `results` as PDF bytes (A4 or "letter"); the same input gives the
    same bytes."""
    from ignite.report.worksheet.pdf import render

    return render(build_view(results, rules, methods, input_text), paper=paper)


def prepare_drawing() -> None:
    """Import reportlab and register the embedded fonts now rather than at the first
    worksheet. An audit does so before it starts its worker processes: forked, each
    begins with them, and the audit's own summary needs them anyway."""
    import reportlab.graphics.renderPDF  # noqa: F401  (drawn charts; imported at the first)

    from ignite.report.worksheet.pdf import register_fonts

    register_fonts()


def write_worksheet(path: Path, data: bytes, force: bool = False) -> None:
    """Write `data` to `path` whole or not at all.

    The bytes go to a temporary file beside `path`, then take its name in one step.
    Without `force`, an existing `path` raises `OutputExistsError` and is left as it
    was, even if it appears while the data are being written.
    """
    path = Path(path)
    if path.exists() and not force:
        raise OutputExistsError(path)
    temporary = _write_temporary(path, data)
    try:
        if force:
            os.replace(temporary, path)
            return
        try:
            # A hard link never replaces an existing file: the last-moment check is atomic.
            os.link(temporary, path)
        except FileExistsError:
            raise OutputExistsError(path) from None
        except OSError:
            # No hard links on this file system: fall back to a checked rename.
            if path.exists():
                raise OutputExistsError(path) from None
            os.replace(temporary, path)
    finally:
        if temporary.exists():
            temporary.unlink()


def _write_temporary(path: Path, data: bytes) -> Path:
    folder = path.parent
    while True:
        temporary = folder / f".{path.name}.{secrets.token_hex(4)}.tmp"
        try:
            # 0o666 filtered by the umask: the same permissions as any new file.
            descriptor = os.open(temporary, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666)
        except FileExistsError:
            continue
        break
    try:
        with os.fdopen(descriptor, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
    except BaseException:
        temporary.unlink(missing_ok=True)
        raise
    return temporary
