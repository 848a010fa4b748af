"""Layering: a lower package never imports a higher one, not even lazily inside a function.

Read from the source with `ast` (every `import` and `from ... import` anywhere in a file,
type-checking blocks included), so a lazy import cannot hide an upward dependency.
Regression checks of the project's own structure.
"""

from __future__ import annotations

import ast
from pathlib import Path

PACKAGE = Path(__file__).resolve().parents[1] / "ignite"


def imported_modules(path: Path, package: str) -> set[str]:
    """Every module a source file of `package` imports, as absolute dotted names."""
    found: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"), str(path))):
        if isinstance(node, ast.Import):
            found.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            if node.level:  # relative: resolve against the file's package
                parts = package.split(".")
                base = parts[: len(parts) - node.level + 1]
                module = ".".join([*base, node.module] if node.module else base)
            else:
                module = node.module or ""
            found.add(module)
            found.update(f"{module}.{alias.name}" for alias in node.names)
    return found


def project_imports(folder: str) -> dict[str, set[str]]:
    """{file: the ignite modules it imports} for every file of `ignite/<folder>`."""
    imports = {}
    for path in sorted((PACKAGE / folder).rglob("*.py")):
        package = ".".join(path.relative_to(PACKAGE.parent).parts[:-1])
        names = imported_modules(path, package)
        imports[path.relative_to(PACKAGE.parent).as_posix()] = {
            name for name in names if name.split(".")[0] == "ignite"
        }
    return imports


def test_the_import_reader_sees_lazy_and_relative_imports(tmp_path: Path) -> None:
    source = tmp_path / "probe.py"
    source.write_text(
        "if True:\n    def f():\n        from ignite.audit import run\n"
        "from . import text\nfrom ..records.register import RegisterRow\nimport ignite.errors\n",
        encoding="utf-8",
    )
    assert imported_modules(source, "ignite.report") >= {
        "ignite.audit",
        "ignite.audit.run",
        "ignite.report",
        "ignite.report.text",
        "ignite.records.register",
        "ignite.errors",
    }


def test_the_report_never_imports_the_audit() -> None:
    """The audit renders its summary through the report; the report never reaches back."""
    imports = project_imports("report")
    assert "ignite/report/worksheet/summary.py" in imports
    offenders = {
        file: sorted(name for name in names if name.startswith("ignite.audit"))
        for file, names in imports.items()
    }
    assert {file: names for file, names in offenders.items() if names} == {}


def test_the_records_import_only_records_and_errors() -> None:
    """The register and result records sit at the bottom: plain data, no layer above."""
    allowed = ("ignite.records", "ignite.errors")
    offenders = {
        file: sorted(name for name in names if not name.startswith(allowed))
        for file, names in project_imports("records").items()
    }
    assert {file: names for file, names in offenders.items() if names} == {}
