"""The user's reference in docs/ covers every key the loader accepts and every method.

The keys come from the loader itself (`ignite.room.schema.room_keys()` walks the loader's
key tables), never from a list kept here, so a key added to the loader without a line in
docs/ fails this test. A key counts as documented when its full path, in backticks, is in
any docs/*.md (other pages may document their own keys). Where docs/room-file.md gives a
quantity's line, that line must quote the accepted and usual ranges of
`ignite.room.bounds`, so the page cannot drift from the table the loader checks against.
"""

from __future__ import annotations

import re
from pathlib import Path

from ignite.room import load as loader
from ignite.room.bounds import BOUNDS, LISTS
from ignite.room.schema import SECTIONS, key_tables, kind_of, room_keys
from ignite.room.source import join, parse_yaml
from ignite.room.template import TEMPLATE
from ignite.rules.rulebook import FLAGS
from ignite.simulate.compute import METHODS

ROOT = Path(__file__).resolve().parent.parent
DOCS = ROOT / "docs"


def _docs_text() -> str:
    return "\n".join(page.read_text(encoding="utf-8") for page in sorted(DOCS.glob("*.md")))


def undocumented(paths: list[str], text: str) -> list[str]:
    """The key paths not written, in backticks, anywhere in `text`."""
    return [path for path in paths if f"`{path}`" not in text]


def test_every_key_the_loader_accepts_is_in_docs():
    paths = [key.path for key in room_keys()]
    assert len(paths) > 50  # the walk found the loader's tables
    assert undocumented(paths, _docs_text()) == []


def test_the_check_fails_for_a_key_missing_from_docs():
    text = _docs_text().replace("`cases[].drape_pocket.exchange`", "drape pocket exchange")
    assert undocumented([key.path for key in room_keys()], text) == [
        "cases[].drape_pocket.exchange"
    ]


def test_every_key_table_of_the_loader_is_placed_in_the_file():
    """A new key table in load.py must be given its place in schema.SECTIONS (and docs)."""
    placed = {id(table) for table in SECTIONS.values()}
    unplaced = [name for name, table in key_tables().items() if id(table) not in placed]
    assert unplaced == []


def test_every_key_of_the_template_is_a_key_of_the_loader():
    paths = {key.path for key in room_keys()}
    data = parse_yaml(TEMPLATE, "template.yaml").data

    def walk(value: object, path: str) -> None:
        if isinstance(value, dict) and kind_of(path) not in ("components",):
            for key, child in value.items():
                child_path = join(path, key) if path else key
                assert child_path in paths, child_path
                walk(child, child_path)
        elif isinstance(value, list):
            for child in value:
                walk(child, path + "[]")

    walk(data, "")


def _line_of(text: str, path: str) -> str | None:
    for line in text.splitlines():
        if line.startswith(f"| `{path}` |"):
            return line
    return None


def test_room_file_page_quotes_the_ranges_of_the_bounds_table():
    page = (DOCS / "room-file.md").read_text(encoding="utf-8")
    checked = 0
    for path, bound in BOUNDS.items():
        shown = path.removesuffix("[]").replace(".*", ".<substance>")
        line = _line_of(page, shown)
        if line is None:
            continue
        checked += 1
        assert bound.hard.text in line, (path, bound.hard.text)
        if bound.usual is not None:
            assert bound.usual.text in line, (path, bound.usual.text)
        else:
            assert "usual" not in line
    assert checked == len(BOUNDS)


def test_room_file_page_quotes_the_list_limits():
    page = (DOCS / "room-file.md").read_text(encoding="utf-8")
    for path, limit in LISTS.items():
        line = _line_of(page, path)
        if line is None:  # `materials` is described in a paragraph
            match = re.search(rf"`{re.escape(path)}` lists[^#]*?at most (\d+)", page)
            assert match is not None and int(match.group(1)) == limit.most, path
        else:
            assert f"at most {limit.most}" in line, (path, limit.most)


def test_room_file_page_names_every_word_the_loader_accepts():
    page = (DOCS / "room-file.md").read_text(encoding="utf-8")
    for words in (loader.PURPOSES, loader.SYSTEMS, loader.SITES, loader.DELIVERIES, loader.BASES):
        for word in words:
            assert f"`{word}`" in page, word


def test_the_example_of_the_room_file_page_loads(book):
    from ignite.pipeline import vocabulary
    from ignite.room.load import load_room_text

    page = (DOCS / "room-file.md").read_text(encoding="utf-8")
    example = re.search(r"## Example.*?```yaml\n(.*?)```", page, re.DOTALL)
    assert example is not None
    room = load_room_text(example.group(1), "example.yaml", vocabulary(book))
    assert room.warnings == ()


def test_every_method_of_the_worksheet_has_a_paragraph_with_source_and_flag():
    page = (DOCS / "methods.md").read_text(encoding="utf-8")
    sections = page.split("\n### ")[1:]
    titles = [section.split("\n", 1)[0] for section in sections]
    assert titles == [method.name for method in METHODS]
    flag = re.compile(r"flag:\s+(" + "|".join(FLAGS) + ")")
    for section in sections:
        assert "Source:" in section and flag.search(section), section[:60]


def test_readme_links_the_docs():
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    assert "docs/room-file.md" in readme and "docs/methods.md" in readme


def test_readme_and_room_file_page_show_page_one_of_the_sample_list_plan():
    image = DOCS / "images" / "page-one.png"
    assert image.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    assert image.stat().st_size < 200_000  # kept small (60 dpi)
    assert "docs/images/page-one.png" in (ROOT / "README.md").read_text(encoding="utf-8")
    assert "images/page-one.png" in (DOCS / "room-file.md").read_text(encoding="utf-8")
    assert (DOCS / "make_page_one.py").exists()
