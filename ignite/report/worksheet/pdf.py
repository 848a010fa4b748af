"""Lay out a `WorksheetView` as a PDF. The only module in ignite that imports reportlab.

Nothing here rounds or words a number: the view model did that. This module chooses
fonts, sizes, page furniture and draws the charts with reportlab's own graphics.

The DejaVu fonts shipped in `ignite/fonts/` are embedded (TrueType subsets), so Ω, µ,
₂, ≤, ° and the severity marks print everywhere. Documents are built in reportlab's
invariant mode with a fixed creation date (the assessment date), so the same view
gives the same bytes. Every page's footer carries the room, page x of y, the input's
SHA-256, the tool version and the rules digest.
"""

from __future__ import annotations

import calendar
import dataclasses
import functools
import hashlib
import io
import itertools
import math
import re
import time
from collections.abc import Callable, Sequence
from datetime import date
from pathlib import Path
from typing import Any
from xml.sax.saxutils import escape

from reportlab.graphics.shapes import Circle, Drawing, Line, Polygon, PolyLine, Rect, String
from reportlab.lib import colors
from reportlab.lib.pagesizes import A4, LETTER
from reportlab.lib.styles import ParagraphStyle
from reportlab.lib.units import mm
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont
from reportlab.pdfgen.canvas import Canvas
from reportlab.platypus import (
    BaseDocTemplate,
    CondPageBreak,
    Flowable,
    Frame,
    KeepTogether,
    LongTable,
    PageBreak,
    PageTemplate,
    Paragraph,
    Preformatted,
    Spacer,
    Table,
    TableStyle,
)

from ignite.report.worksheet import model
from ignite.report.worksheet.plan import Plan
from ignite.wording import sentences as say

FONT = "IgniteSans"
BOLD = "IgniteSans-Bold"
MONO = "IgniteMono"
FONT_DIR = Path(__file__).resolve().parents[2] / "fonts"

PAPERS = {"a4": A4, "letter": LETTER}

MARGIN_SIDE = 16 * mm
MARGIN_TOP = 15 * mm
MARGIN_BOTTOM = 21 * mm  # room for the three-line footer

GRID = colors.Color(0.55, 0.55, 0.55)
SHADE = colors.Color(0.9, 0.9, 0.9)  # header rows: light enough to print as grey on any printer
FAINT = colors.Color(0.82, 0.82, 0.82)
BAND_GREY = colors.Color(0.88, 0.88, 0.88)
BAR_GREY = colors.Color(0.6, 0.6, 0.6)

# Series styles: black lines told apart by dash pattern and marker shape.
DASHES: tuple[tuple[float, ...] | None, ...] = (None, (4, 2), (1, 1.6), (6, 2, 1, 2), (2.5, 2.5))
MARKERS = ("dot", "square", "triangle", "diamond", "cross")
MARKER_SIZE = 2.2  # half-width of a marker [pt]


# --------------------------------------------------------------------------- fonts, styles


def new_document(
    buffer: Any,
    pagesize: tuple[float, float],
    *,
    title: str,
    author: str,
    subject: str,
    creator: str,
    margin_top: float = MARGIN_TOP,
    margin_bottom: float = MARGIN_BOTTOM,
) -> BaseDocTemplate:
    """A one-frame document in invariant mode (same input, same bytes)."""
    doc = BaseDocTemplate(
        buffer,
        pagesize=pagesize,
        leftMargin=MARGIN_SIDE,
        rightMargin=MARGIN_SIDE,
        topMargin=margin_top,
        bottomMargin=margin_bottom,
        title=title,
        author=author,
        subject=subject,
        creator=creator,
        invariant=1,
    )
    frame = Frame(
        doc.leftMargin,
        doc.bottomMargin,
        doc.width,
        doc.height,
        id="body",
        leftPadding=0,
        rightPadding=0,
        topPadding=0,
        bottomPadding=0,
    )
    doc.addPageTemplates([PageTemplate(id="page", frames=[frame])])
    return doc


def register_fonts() -> None:
    """Register the bundled DejaVu fonts once (embedded in every PDF the project writes)."""
    if FONT in pdfmetrics.getRegisteredFontNames():
        return
    pdfmetrics.registerFont(TTFont(FONT, str(FONT_DIR / "DejaVuSans.ttf")))
    pdfmetrics.registerFont(TTFont(BOLD, str(FONT_DIR / "DejaVuSans-Bold.ttf")))
    mono = FONT_DIR / "DejaVuSansMono.ttf"
    pdfmetrics.registerFont(
        TTFont(MONO, str(mono if mono.exists() else FONT_DIR / "DejaVuSans.ttf"))
    )
    pdfmetrics.registerFontFamily(FONT, normal=FONT, bold=BOLD, italic=FONT, boldItalic=BOLD)


@functools.cache
def _styles() -> dict[str, ParagraphStyle]:
    """The worksheet's paragraph styles, made once a process (nothing changes them)."""
    body = ParagraphStyle(
        "body", fontName=FONT, fontSize=8.5, leading=11, spaceAfter=3, bulletFontName=FONT
    )
    return {
        "body": body,
        "small": ParagraphStyle("small", parent=body, fontSize=7.2, leading=9, spaceAfter=2),
        "cell": ParagraphStyle("cell", parent=body, fontSize=7.5, leading=9.2, spaceAfter=0),
        "cellbold": ParagraphStyle(
            "cellbold", parent=body, fontName=BOLD, fontSize=7.5, leading=9.2, spaceAfter=0
        ),
        "tick": ParagraphStyle(
            "tick",
            parent=body,
            fontSize=7.5,
            leading=9.2,
            spaceAfter=1,
            leftIndent=11,
            bulletIndent=0,
            bulletFontName=FONT,
            bulletFontSize=9,
        ),
        "bullet": ParagraphStyle(
            "bullet", parent=body, leftIndent=10, bulletIndent=0, bulletFontName=FONT
        ),
        "caution": ParagraphStyle(
            "caution",
            parent=body,
            fontSize=7.8,
            leading=9.8,
            spaceAfter=2,
            leftIndent=10,
            bulletIndent=0,
            bulletFontName=FONT,
        ),
        "title": ParagraphStyle(
            "title", parent=body, fontName=BOLD, fontSize=15, leading=18, spaceAfter=2
        ),
        "subtitle": ParagraphStyle("subtitle", parent=body, fontSize=10, leading=13, spaceAfter=6),
        "h2": ParagraphStyle(
            "h2",
            parent=body,
            fontName=BOLD,
            fontSize=11.5,
            leading=14,
            spaceBefore=10,
            spaceAfter=5,
        ),
        "h3": ParagraphStyle(
            "h3", parent=body, fontName=BOLD, fontSize=9.5, leading=12, spaceBefore=7, spaceAfter=3
        ),
        "verdict": ParagraphStyle(
            "verdict", parent=body, fontName=BOLD, fontSize=10, leading=13, spaceAfter=0
        ),
        "mono": ParagraphStyle("mono", fontName=MONO, fontSize=6.6, leading=8.2),
    }


LAID_OUT_MOST = 4096
"""Paragraphs whose parse and first line breaks a process keeps (the oldest go first)."""

_PARSED: dict[tuple[Any, ...], tuple[Any, ...]] = {}
_BROKEN: dict[tuple[Any, ...], tuple[Any, ...]] = {}


def _keep(store: dict[tuple[Any, ...], tuple[Any, ...]], key: tuple[Any, ...], value: Any) -> None:
    if len(store) >= LAID_OUT_MOST:
        del store[next(iter(store))]
    store[key] = value


class Para(Paragraph):
    """A Paragraph that is parsed and broken into lines as few times as the layout allows.

    reportlab asks a paragraph for its size several times at the same width: a table
    sizes its cells when it is wrapped, again each time it is split or wrapped anew
    (KeepTogether, a page's frame), and once more when it draws them. The lines depend
    only on the text, the style and the width (never on the height offered), so:

    - a wrap at the width of this paragraph's last one returns that one's size and leaves
      its lines in place (a split that gives up on the paragraph drops its lines, and it
      is broken again);
    - the parse of a text in a style, and its first line breaks at a width, are kept for
      the process (at most `LAID_OUT_MOST` of each): a worksheet repeats many texts (the
      column heads, the cautions, the rules), and so do the rooms of an audit. A kept
      result is what reportlab would make again; the lists it changes as it breaks and
      splits lines are copied, the fragments themselves it never changes.

    What is drawn is the same, to the byte.
    """

    text: Any  # reportlab's own attributes, set by Paragraph
    style: ParagraphStyle
    bulletText: Any
    frags: list[Any]
    _wrapped: tuple[float, Any, float, float] | None = None  # width, lines, size
    _fresh = False  # parsed and not yet broken into lines: a kept first wrap may serve

    def __init__(
        self,
        text: str | None,
        style: ParagraphStyle,
        bulletText: str | None = None,
        frags: list[Any] | None = None,
    ) -> None:
        if frags is not None:  # a piece of a split paragraph (reportlab makes them so)
            super().__init__(text, style, bulletText, frags)
            return
        self._key = (text, style, bulletText)
        parsed = _PARSED.get(self._key)
        if parsed is None:
            super().__init__(text, style, bulletText)
            _keep(_PARSED, self._key, (self.text, self.style, self.bulletText, self.frags))
        else:
            self.caseSensitive = 1
            self.encoding = "utf8"
            self.text, self.style, self.bulletText, frags = parsed
            self.frags = list(frags)
            self.debug = 0
        self._fresh = True

    def wrap(self, availWidth: float, availHeight: float) -> tuple[float, float]:
        last = self._wrapped
        lines = self.__dict__.get("blPara")
        if last is not None and last[0] == availWidth and last[1] is lines:
            self.width, self.height = last[2], last[3]
            return last[2], last[3]
        fresh, self._fresh, self._wrapped = self._fresh, False, None
        kept = _BROKEN.get((self._key, availWidth)) if fresh else None
        if kept is not None:
            (
                self.frags,
                self.blPara,
                wrap_widths,
                self._width_max,
                self._splitLongWordCount,
                self._hyphenations,
                self.width,
                self.height,
            ) = kept
            self.frags = list(self.frags)
            self._wrapWidths = list(wrap_widths)
            self._wrapped = (availWidth, self.blPara, self.width, self.height)
            return self.width, self.height
        width, height = super().wrap(availWidth, availHeight)
        lines = self.__dict__.get("blPara")
        if lines is not None and self.width == availWidth:  # not when the width was too small
            self._wrapped = (availWidth, lines, width, height)
            if fresh:
                _keep(
                    _BROKEN,
                    (self._key, availWidth),
                    (
                        list(self.frags),
                        lines,
                        list(self._wrapWidths),
                        self._width_max,
                        self._splitLongWordCount,
                        self._hyphenations,
                        width,
                        height,
                    ),
                )
        return width, height


def _p(text: str, style: ParagraphStyle, **kwargs: Any) -> Paragraph:
    """A paragraph of plain text: markup characters are escaped, newlines kept."""
    return Para(escape(text).replace("\n", "<br/>"), style, **kwargs)


# --------------------------------------------------------------------------- page furniture


def _timestamp(iso: str | None) -> Any:
    """A reportlab TimeStamp at 00:00 UTC of the assessment date (or the invariant date)."""
    from reportlab.lib.utils import TimeStamp

    stamp = TimeStamp(invariant=1)
    seconds = 946684800  # 2000-01-01, reportlab's own invariant date
    if iso:
        seconds = calendar.timegm(date.fromisoformat(iso).timetuple())
    moment = time.gmtime(seconds)
    stamp.t = seconds
    stamp.lt = tuple(moment)
    stamp.YMDhms = tuple(moment)[:6]
    stamp.dhh = stamp.dmm = 0
    stamp.tzname = "UTC"
    return stamp


class PagedCanvas(Canvas):
    """Holds every page back until the end, so each page's furniture can say 'page x of y'.

    Invariant mode; every page starts in the embedded font (reportlab's default,
    Helvetica, would be listed in the page's resources without being embedded).
    """

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        kwargs["invariant"] = 1
        kwargs["initialFontName"] = FONT
        kwargs["initialFontSize"] = 8.5
        kwargs["initialLeading"] = 11
        super().__init__(*args, **kwargs)
        self._held_pages: list[dict[str, Any]] = []

    def showPage(self) -> None:  # reportlab's name
        self._held_pages.append(dict(self.__dict__))
        self._startPage()

    def save(self) -> None:
        total = len(self._held_pages)
        for number, state in enumerate(self._held_pages, start=1):
            self.__dict__.update(state)
            self.page_furniture(number, total)
            Canvas.showPage(self)
        Canvas.save(self)

    def page_furniture(self, number: int, total: int) -> None:
        """Headers and footers of page `number` of `total`."""


def _canvas_maker(view: model.WorksheetView) -> type[Canvas]:
    footer = view.footer

    class WorksheetCanvas(PagedCanvas):
        def __init__(self, *args: Any, **kwargs: Any) -> None:
            super().__init__(*args, **kwargs)
            # The document's dates come from the room file, never from the clock or the
            # environment, so that the same input gives the same bytes.
            stamp = _timestamp(view.creation_date)
            self._doc._timeStamp = stamp
            # The file identifier is a digest seeded with the time stamp (reportlab reads
            # SOURCE_DATE_EPOCH for it): seed it again from the fixed stamp.
            self._doc.signature = hashlib.md5(b"a reportlab document", usedforsecurity=False)
            self._doc.signature.update(ascii(stamp.t).encode("ascii"))

        def page_furniture(self, number: int, total: int) -> None:
            width, height = self._pagesize
            left, right = MARGIN_SIDE, width - MARGIN_SIDE
            self.saveState()
            self.setStrokeColor(colors.black)
            self.setLineWidth(0.4)
            if number > 1:
                self.setFont(FONT, 7)
                self.drawString(
                    left,
                    height - MARGIN_TOP + 5,
                    fit(f"{view.heading} — {view.subheading}", FONT, 7, right - left),
                )
                self.line(left, height - MARGIN_TOP + 2, right, height - MARGIN_TOP + 2)
            top = MARGIN_BOTTOM - 5
            self.line(left, top, right, top)
            self.setFont(BOLD, 7)
            self.drawString(left, top - 9, say.footer_room(footer.room_id))
            self.drawRightString(right, top - 9, say.footer_page(number, total))
            self.setFont(FONT, 6.3)
            self.drawCentredString((left + right) / 2, top - 9, say.tool_label(footer.tool_version))
            self.drawString(left, top - 18, say.footer_input(footer.input_sha256))
            self.drawString(left, top - 26, say.footer_rules(footer.rules_digest))
            self.restoreState()

    return WorksheetCanvas


def fit(text: str, font: str, size: float, width: float) -> str:
    """`text` as it is if it fits `width` on one line, else cut with "…" to fit."""
    if pdfmetrics.stringWidth(text, font, size) <= width:
        return text
    low, high = 0, len(text)  # the longest prefix that fits with the mark
    while low < high:
        middle = (low + high + 1) // 2
        if pdfmetrics.stringWidth(text[:middle] + "…", font, size) <= width:
            low = middle
        else:
            high = middle - 1
    return text[:low].rstrip() + "…"


# --------------------------------------------------------------------------- tables


TALL_ROW = 600.0  # [pt] a row taller than this may not fit a page's frame (A4 or letter)
LEAST_PIECE = 36.0  # [pt] the least height of a row's piece left at the foot of a page


class _RowSplitting:
    """A table that splits inside a row only where it must: when no whole row fits and a
    row is taller than a page could hold. Other tables break between rows, as before."""

    splitInRow: int
    _rowHeights: list[float]

    def split(self, availWidth: float, availHeight: float) -> list[Flowable]:
        parts: list[Flowable] = super().split(availWidth, availHeight)  # type: ignore[misc]
        if parts or self.splitInRow or max(self._rowHeights or [0.0]) <= TALL_ROW:
            return parts
        self.splitInRow = int(LEAST_PIECE)
        try:
            return super().split(availWidth, availHeight)  # type: ignore[misc]
        finally:
            self.splitInRow = 0


class SplitTable(_RowSplitting, Table):
    pass


class SplitLongTable(_RowSplitting, LongTable):
    pass


def _table_style(header: bool = True) -> list[tuple[Any, ...]]:
    style: list[tuple[Any, ...]] = [
        ("FONTNAME", (0, 0), (-1, -1), FONT),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("LEFTPADDING", (0, 0), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ("TOPPADDING", (0, 0), (-1, -1), 1.5),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
        ("BOX", (0, 0), (-1, -1), 0.6, colors.black),
        ("INNERGRID", (0, 0), (-1, -1), 0.25, GRID),
    ]
    if header:
        style += [
            ("BACKGROUND", (0, 0), (-1, 0), SHADE),
            ("LINEBELOW", (0, 0), (-1, 0), 0.8, colors.black),
        ]
    return style


def _widths(weights: Sequence[float], width: float) -> list[float]:
    total = sum(weights)
    return [width * w / total for w in weights]


def _grid(table: model.Table, width: float, st: dict[str, ParagraphStyle]) -> Flowable:
    """A table with a header row repeated on every page it runs over."""
    if not table.rows:
        return _p(table.empty_text, st["body"]) if table.empty_text else Spacer(1, 0)
    widths = _widths(table.widths, width)
    data = [[_p(h, st["cellbold"]) for h in table.headers]]
    data += [
        [_cell(cell, st["cell"], w) for cell, w in zip(row, widths, strict=True)]
        for row in table.rows
    ]
    grid = SplitLongTable(data, colWidths=widths, repeatRows=1, hAlign="LEFT")
    cell = st["cell"]
    grid.setStyle(
        TableStyle(
            [
                *_table_style(),
                ("FONTSIZE", (0, 1), (-1, -1), cell.fontSize),
                ("LEADING", (0, 1), (-1, -1), cell.leading),
            ]
        )
    )
    return grid


def _cell(text: str, style: ParagraphStyle, width: float) -> Any:
    """Short one-line text as a plain table string (laid out once); anything else wraps."""
    if (
        "\n" not in text
        and pdfmetrics.stringWidth(text, style.fontName, style.fontSize) <= width - 7
    ):
        return text
    return _p(breakable(text, style.fontName, style.fontSize, width - 7), style)


_JOINTS = re.compile(r"(?<=[._/-])")  # an identifier or file name may break after . _ / -


@functools.lru_cache(maxsize=LAID_OUT_MOST)  # the same cell texts come again and again
def breakable(text: str, font: str, size: float, width: float) -> str:
    """`text` with each word too wide for `width` broken after its dots, dashes, underscores
    or slashes, so that the wrapping never splits an identifier mid-name ("prep.wet-at-
    draping" may break after "prep." or "wet-", never inside "draping"). A piece that is
    itself too wide is left for the paragraph to split."""
    lines = []
    for line in text.split("\n"):
        words = []
        for word in line.split(" "):
            if pdfmetrics.stringWidth(word, font, size) <= width:
                words.append(word)
                continue
            pieces, current = [], ""
            for piece in _JOINTS.split(word):
                if current and pdfmetrics.stringWidth(current + piece, font, size) > width:
                    pieces.append(current)
                    current = piece
                else:
                    current += piece
            pieces.append(current)
            words.append("\n".join(pieces))
        lines.append(" ".join(words))
    return "\n".join(lines)


def _pairs(table: model.Table, width: float, st: dict[str, ParagraphStyle]) -> Flowable:
    """A two-column label/value table under a title row."""
    data = [[_p(table.headers[0], st["cellbold"]), ""]]
    data += [[_p(label, st["cell"]), _p(value, st["cell"])] for label, value in table.rows]
    grid = SplitTable(data, colWidths=_widths(table.widths, width), hAlign="LEFT")
    grid.setStyle(TableStyle([*_table_style(), ("SPAN", (0, 0), (-1, 0))]))
    return grid


# --------------------------------------------------------------------------- sections


def _header(
    view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    story: list[Flowable] = [_p(view.heading, st["title"]), _p(view.subheading, st["subtitle"])]
    pairs = list(view.header)
    rows = []
    for index in range(0, len(pairs), 2):
        row: list[Any] = []
        for key, value in pairs[index : index + 2]:
            row += [_p(key, st["cellbold"]), _p(value, st["cell"])]
        rows.append(row + [""] * (4 - len(row)))
    label = 22 * mm
    half = width / 2 - label
    block = SplitTable(rows, colWidths=[label, half, label, half], hAlign="LEFT")
    block.setStyle(TableStyle(_table_style(header=False)))
    story.append(block)
    story.append(Spacer(1, 6))
    mark = say.SEVERITY_MARKS.get(view.verdict_severity or "", "")
    verdict_text = f"{mark}  {view.verdict}" if mark else view.verdict
    verdict = Table(
        [
            [_p(say.OVERALL, st["cellbold"]), _p(verdict_text, st["verdict"])],
            ["", _p(view.tally, st["cell"])],
        ],
        colWidths=[28 * mm, width - 28 * mm],
        hAlign="LEFT",
    )
    verdict.setStyle(
        TableStyle(
            [
                ("FONTNAME", (0, 0), (-1, -1), FONT),
                (
                    "BOX",
                    (0, 0),
                    (-1, -1),
                    1.6 if view.verdict_severity == "high" else 0.9,
                    colors.black,
                ),
                ("SPAN", (0, 0), (0, 1)),
                ("VALIGN", (0, 0), (-1, -1), "MIDDLE"),
                ("TOPPADDING", (0, 0), (-1, -1), 3),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 3),
            ]
        )
    )
    story.append(verdict)
    if view.warnings:
        story.append(Spacer(1, 4))
        story.append(_p(say.WARNINGS_INTRO, st["body"]))
        story += [_p(w, st["bullet"], bulletText="•") for w in view.warnings]
    return story


def _finding_card(
    finding: model.FindingView, width: float, st: dict[str, ParagraphStyle]
) -> Flowable:
    head = say.finding_heading(
        finding.number, finding.severity_mark, finding.severity_word, finding.title
    )
    body = say.finding_body(
        subject=finding.subject,
        value_label=finding.value_label or say.CARD_MEASURED,
        value=finding.value_text or finding.measured,
        why=finding.detail,
        source=say.card_source(finding.source, finding.flag, finding.rule),
        actions=say.finding_actions(finding.actions),
    )
    rows: list[list[Any]] = [
        [_p(head, st["cellbold"])],
        [_p(body, st["cell"])],
    ]
    card = SplitTable(rows, colWidths=[width], hAlign="LEFT")
    weight = {"high": 1.8, "medium": 1.2}.get(finding.severity, 0.7)
    card.setStyle(
        TableStyle(
            [
                *_table_style(),
                ("BOX", (0, 0), (-1, -1), weight, colors.black),
            ]
        )
    )
    return KeepTogether([card, Spacer(1, 4)])


def _findings(
    view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    story: list[Flowable] = [_p(say.SECTION_FINDINGS, st["h2"])]
    if not view.findings:
        return [*story, _p(view.no_findings_text, st["body"])]
    story.append(_p(say.SEVERITY_KEY_NOTE, st["small"]))
    story += [_finding_card(f, width, st) for f in view.findings]
    return story


def _triad(case: model.CaseView, width: float, st: dict[str, ParagraphStyle]) -> Flowable:
    """The triad's three sides in one paragraph, each with its mark and why."""
    text = " · ".join(
        f"{say.triad_element(element.present, element.name)} ({element.why})"
        for element in case.triad
    )
    return _p(text, st["cell"])


def _charts_row(
    charts: Sequence[model.Chart], width: float, st: dict[str, ParagraphStyle]
) -> Flowable | None:
    if not charts:
        return None
    if len(charts) == 1:
        return _chart_block(charts[0], width, 135, st)
    gap = 8
    half = (width - gap) / 2
    row = [_chart_parts(c, half, 135, st) for c in charts]
    grid = Table([row], colWidths=[half + gap / 2, half + gap / 2], hAlign="LEFT")
    grid.setStyle(
        TableStyle(
            [
                ("FONTNAME", (0, 0), (-1, -1), FONT),
                ("VALIGN", (0, 0), (-1, -1), "TOP"),
                ("LEFTPADDING", (0, 0), (-1, -1), 0),
                ("RIGHTPADDING", (0, 0), (-1, -1), 0),
                ("TOPPADDING", (0, 0), (-1, -1), 0),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 0),
            ]
        )
    )
    return grid


def _cases(
    view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    story: list[Flowable] = [CondPageBreak(60 * mm), _p(say.SECTION_CASES, st["h2"])]
    if view.spread_summary:
        story.append(_p(view.spread_summary, st["body"]))
    if not view.cases:
        return [*story, _p(view.no_cases_text, st["body"])]
    for index, case in enumerate(view.cases):
        if index:
            story.append(CondPageBreak(90 * mm))
        story.append(
            KeepTogether(
                [
                    _p(case.heading, st["h3"]),
                    _triad(case, width, st),
                    Spacer(1, 3),
                    _p(case.triad_summary, st["cellbold"]),
                    Spacer(1, 4),
                ]
            )
        )
        story.append(_p(say.labelled_line(say.ON_THIS_CASE, case.lists), st["cell"]))
        story.append(Spacer(1, 4))
        story.append(_grid(case.quantities, width, st))
        story += [_p(note, st["small"], bulletText="–") for note in case.notes]
        charts = [c for c in (case.oxygen_chart, case.film_chart) if c is not None]
        block = _charts_row(charts, width, st)
        if block is not None:
            story += [Spacer(1, 5), block]
        story += _spread_block(case.spread, width, st)
        story.append(Spacer(1, 8))
    return story


def _room(view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]) -> list[Flowable]:
    story: list[Flowable] = [CondPageBreak(70 * mm), _p(say.SECTION_ROOM, st["h2"])]
    gap = 8
    half = (width - gap) / 2
    pair = Table(
        [[_pairs(view.floor_summary, half, st), _pairs(view.shock, half, st)]],
        colWidths=[half + gap, half],
        hAlign="LEFT",
    )
    pair.setStyle(
        TableStyle(
            [
                ("FONTNAME", (0, 0), (-1, -1), FONT),
                ("VALIGN", (0, 0), (-1, -1), "TOP"),
                ("LEFTPADDING", (0, 0), (-1, -1), 0),
                ("RIGHTPADDING", (0, 0), (-1, -1), 0),
                ("TOPPADDING", (0, 0), (-1, -1), 0),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 0),
            ]
        )
    )
    story += [KeepTogether([_p(say.HEADING_FLOOR_AND_SHOCK, st["h3"]), pair])]
    if view.shock_note:
        story.append(Spacer(1, 3))
        story.append(_p(view.shock_note, st["small"]))
    story.append(Spacer(1, 5))
    readings = _grid(view.floor_readings, half, st)
    # a short list of readings stays on one page; a long one runs on, header repeated
    if view.floor_readings_note:
        story += [_p(view.floor_readings_note, st["small"]), Spacer(1, 2)]
    story.append(KeepTogether([readings]) if len(view.floor_readings.rows) <= 15 else readings)
    if view.floor_chart is not None:
        story += [Spacer(1, 5), _chart_block(view.floor_chart, width, 120, st)]

    story += [
        CondPageBreak(50 * mm),
        _p(say.HEADING_PEOPLE_AND_TROLLEYS, st["h3"]),
        _grid(view.charges, width, st),
    ]
    if view.charges.rows:
        story.append(Spacer(1, 2))
        story.append(_p(view.charges_note, st["small"]))
    if view.voltage_chart is not None:
        # a legend of more than three rows takes its room from below, not from the plot
        rows = len(_legend_rows(view.voltage_chart, width - 50))
        height = 160 + 10 * max(0, rows - 3)
        story += [Spacer(1, 5), _chart_block(view.voltage_chart, width, height, st)]

    story += [
        CondPageBreak(40 * mm),
        _p(say.HEADING_PREPARATIONS, st["h3"]),
        _grid(view.preparations, width, st),
    ]
    story += [_p(note, st["small"], bulletText="–") for note in view.preparation_notes]
    story += [
        Spacer(1, 6),
        _p(say.labelled_line(view.environment.headers[0], view.environment.rows), st["cell"]),
    ]
    return story


def _electrical(
    view: model.ElectricalView, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    """The patient environment's electrical section: supply, bonding, equipment, microshock."""
    story: list[Flowable] = [
        CondPageBreak(60 * mm),
        _p(say.SECTION_ELECTRICAL, st["h2"]),
        _p(view.intro, st["body"]),
        _p(view.caution, st["small"]),
        Spacer(1, 4),
    ]
    if view.supply is not None:
        story += [_pairs(view.supply, width * 0.6, st), Spacer(1, 5)]
    story += [_p(view.bonding_heading, st["h3"]), _grid(view.bonding, width, st), Spacer(1, 5)]
    story += [
        CondPageBreak(30 * mm),
        _p(say.HEADING_EQUIPMENT, st["h3"]),
        _grid(view.equipment, width, st),
        Spacer(1, 5),
        CondPageBreak(30 * mm),
        _p(say.HEADING_MICROSHOCK, st["h3"]),
        _grid(view.cases, width, st),
    ]
    if view.cases.rows:
        story.append(_p(view.basis, st["small"]))
    story += [_p(note, st["small"], bulletText="–") for note in view.notes]
    story.append(Spacer(1, 8))
    return story


def _cautions_and_sign_off(
    view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    story: list[Flowable] = [CondPageBreak(30 * mm), _p(say.SECTION_CAUTIONS, st["h2"])]
    story += [_p(c, st["caution"], bulletText="•") for c in view.cautions]
    decisions = [_p(d, st["tick"], bulletText=say.TICK_BOX) for d in view.sign_off_decisions]
    rows: list[list[Any]] = [[_p(h, st["cellbold"]) for h in say.SIGN_OFF_HEADERS]]
    rows += [[_p(role, st["cellbold"]), "", "", ""] for role in view.sign_off_roles]
    signatures = Table(
        rows,
        colWidths=_widths((1.1, 2.0, 2.0, 1.0), width),
        rowHeights=[None] + [24] * len(view.sign_off_roles),
        hAlign="LEFT",
    )
    signatures.setStyle(TableStyle(_table_style()))
    story.append(
        KeepTogether(
            [
                _p(say.SECTION_SIGN_OFF, st["h2"]),
                _p(view.sign_off_prompt or say.SIGN_OFF_PROMPT, st["body"]),
                *decisions,
                Spacer(1, 5),
                signatures,
            ]
        )
    )
    return story


def _input_listing(lines: Sequence[str], width: float, style: ParagraphStyle) -> list[Flowable]:
    """The room file, numbered, wrapped at the frame width, split in page-sized pieces."""
    digits = max(3, len(str(len(lines))))
    char = pdfmetrics.stringWidth("0", style.fontName, style.fontSize)
    per_line = max(20, int(width / char) - digits - 3)
    out: list[str] = []
    for number, line in enumerate(lines, start=1):
        pieces = [line[i : i + per_line] for i in range(0, len(line), per_line)] or [""]
        out.append(f"{number:>{digits}}  {pieces[0]}")
        out += [f"{'':>{digits}} ↪{piece}" for piece in pieces[1:]]
    chunk = 40
    return [Preformatted("\n".join(out[i : i + chunk]), style) for i in range(0, len(out), chunk)]


def _appendix(
    view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    story: list[Flowable] = [
        PageBreak(),
        _p(say.APPENDIX_RULES, st["h2"]),
        _p(say.APPENDIX_RULES_INTRO, st["small"]),
        _grid(view.rules, width, st),
        CondPageBreak(40 * mm),
        _p(say.APPENDIX_METHODS, st["h2"]),
        _grid(view.methods, width, st),
        *[_p(note, st["small"], bulletText="–") for note in view.preparation_methods],
        CondPageBreak(40 * mm),
        _p(say.APPENDIX_ROOM_FILE, st["h2"]),
        _p(say.room_file_caption(view.input_name, view.footer.input_sha256), st["small"]),
        Spacer(1, 3),
    ]
    if view.input_lines:
        story += _input_listing(view.input_lines, width, st["mono"])
    else:
        story.append(_p(say.EMPTY_FILE, st["body"]))
    return story


# --------------------------------------------------------------------------- page 1: the plan

PLAN_LABEL_WIDTH = 62.0  # [pt] the row names at the left of the timelines
PLAN_ROW = 8.0  # [pt] one bar's row
PLAN_CASE_GAP = 9.0  # [pt] between two cases
PLAN_CASE_HEIGHT = 35.0 + 3 * PLAN_ROW + 16.0  # [pt] one case's block of three bars
PLAN_AXIS_ROOM = 30.0  # [pt] the shared axis under a block
PLAN_FILLS = {  # grey levels: the row's name, not its shade, says what a bar is
    "wet": colors.Color(0.55, 0.55, 0.55),
    "pocket": colors.Color(0.35, 0.35, 0.35),
    "oxidant": colors.Color(0.72, 0.72, 0.72),
}


class _Levels:
    """Rows for labels along one line: a label goes to the lowest row where it overlaps
    none already placed (at most three rows; a fourth label shares the third)."""

    def __init__(self, gap: float) -> None:
        self.gap = gap
        self.rows: list[list[tuple[float, float]]] = [[], [], []]

    def place(self, start: float, end: float) -> int:
        for level, row in enumerate(self.rows):
            if all(end + self.gap <= a or start >= b + self.gap for a, b in row):
                row.append((start, end))
                return level
        self.rows[-1].append((start, end))
        return len(self.rows) - 1


def _plan_drawing(plan: Plan, width: float) -> Drawing:
    """The cases' timelines on one shared axis, one block of three bars a case."""
    left, right = PLAN_LABEL_WIDTH, width - 30.0
    axis_room = PLAN_AXIS_ROOM
    height = len(plan.cases) * (PLAN_CASE_HEIGHT + PLAN_CASE_GAP) + axis_room
    drawing = Drawing(width, height)
    drawing.initialFontName = FONT  # the renderer's starting font; the default is not embedded
    span = right - left

    def x_of(seconds: float) -> float:
        return left + min(max(seconds, 0.0), plan.axis_high_s) / plan.axis_high_s * span

    top = height
    for case in plan.cases:
        top -= PLAN_CASE_GAP
        drawing.add(
            String(0, top - 8, fit(case.label, BOLD, 7.5, width), fontName=BOLD, fontSize=7.5)
        )
        rows_top = top - 36
        rows = (
            (say.PLAN_ROW_WET, case.wet, "wet"),
            (say.PLAN_ROW_POCKET, case.pocket, "pocket"),
            (say.PLAN_ROW_OXIDANT, case.oxidant, "oxidant"),
        )
        for index, (name, spans, kind) in enumerate(rows):
            y = rows_top - (index + 1) * PLAN_ROW
            drawing.add(String(4, y + 1.8, name, fontName=FONT, fontSize=6.3))
            drawing.add(Line(left, y, right, y, strokeColor=FAINT, strokeWidth=0.4))
            for piece in spans:
                x0, x1 = x_of(piece.start), x_of(piece.end)
                drawing.add(
                    Rect(
                        x0,
                        y + 1.2,
                        max(x1 - x0, 0.8),
                        PLAN_ROW - 2.4,
                        fillColor=PLAN_FILLS[kind],
                        strokeColor=colors.black,
                        strokeWidth=0.3,
                    )
                )
                if piece.open_end:
                    drawing.add(
                        Polygon(
                            [x1, y + 0.6, x1 + 5, y + PLAN_ROW / 2, x1, y + PLAN_ROW - 0.6],
                            fillColor=colors.black,
                            strokeColor=None,
                        )
                    )
                    if piece.text:
                        drawing.add(
                            String(x1 + 6, y + 1.8, piece.text, fontName=FONT, fontSize=6.3)
                        )
        bottom = rows_top - 3 * PLAN_ROW
        above = _Levels(2.0)  # letters of marks close together stack, rather than overlap
        below = _Levels(0.5)
        for mark in case.marks:
            x = x_of(mark.at)
            drawing.add(
                Line(
                    x,
                    bottom,
                    x,
                    rows_top,
                    strokeColor=colors.black,
                    strokeWidth=1.1 if mark.wrong else 0.6,
                    strokeDashArray=None if mark.wrong else (2, 1.5),
                )
            )
            text = f"{mark.letter}{say.PLAN_TOO_EARLY if mark.wrong else ''}"
            level = above.place(x - 5, x + 5)
            drawing.add(
                String(
                    x,
                    rows_top + 1.2 + 7.2 * level,
                    text,
                    fontName=BOLD,
                    fontSize=7,
                    textAnchor="middle",
                )
            )
            if mark.wrong and mark.safe_at is not None:
                inside = mark.safe_at <= plan.axis_high_s
                sx = x_of(mark.safe_at) if inside else right
                label = f"{say.PLAN_EARLIEST}{mark.letter} {mark.safe_text}"
                if not inside:
                    label += " →"
                width_of = pdfmetrics.stringWidth(label, FONT, 6.3)
                start = sx - width_of / 2 if inside else sx - width_of
                level = below.place(start, start + width_of)
                drawing.add(
                    String(
                        sx,
                        bottom - 8 - 7.2 * level,
                        label,
                        fontName=FONT,
                        fontSize=6.3,
                        textAnchor="middle" if inside else "end",
                    )
                )
        top = bottom - 16.0
    # the shared axis
    axis_y = axis_room - 8
    drawing.add(Line(left, axis_y, right, axis_y, strokeColor=colors.black, strokeWidth=0.6))
    high_units = plan.axis_high_s / plan.scale
    for value, text in plan.ticks:
        if value > high_units + 1e-9:
            continue
        x = left + value / high_units * span
        drawing.add(Line(x, axis_y, x, axis_y - 2.5, strokeColor=colors.black, strokeWidth=0.5))
        drawing.add(String(x, axis_y - 9, text, fontName=FONT, fontSize=6.3, textAnchor="middle"))
    drawing.add(
        String(right, axis_y - 17, plan.axis_label, fontName=FONT, fontSize=6.5, textAnchor="end")
    )
    return drawing


class _PlanTimelines(Flowable):
    """The cases' timelines on one shared axis (`_plan_drawing`), split between two cases
    where a page ends: the cases that fit the space left go there with an axis of their
    own, the rest on the next page (a reportlab Drawing cannot split, so a long list left
    page 1 empty below its header, and one taller than a page stopped the worksheet)."""

    def __init__(self, plan: Plan, width: float) -> None:
        super().__init__()
        self.plan = plan
        self.drawing = _plan_drawing(plan, width)
        self.width, self.height = self.drawing.width, self.drawing.height

    def wrap(self, available_width: float, available_height: float) -> tuple[float, float]:
        return self.width, self.height

    def split(self, available_width: float, available_height: float) -> list[Flowable]:
        cases = self.plan.cases
        fits = int((available_height - PLAN_AXIS_ROOM) // (PLAN_CASE_HEIGHT + PLAN_CASE_GAP))
        if fits < 1 or len(cases) < 2:
            return []  # on the next page
        if fits >= len(cases):
            return [self]
        return [
            _PlanTimelines(dataclasses.replace(self.plan, cases=cases[:fits]), self.width),
            _PlanTimelines(dataclasses.replace(self.plan, cases=cases[fits:]), self.width),
        ]

    def drawOn(self, canvas: Canvas, x: float, y: float, _sW: float = 0) -> None:
        self.drawing.drawOn(canvas, x, y, _sW)


def _plan(view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]) -> list[Flowable]:
    if view.plan is None:
        return []
    story: list[Flowable] = [
        _p(say.SECTION_PLAN, st["h2"]),
        _p(say.PLAN_INTRO, st["small"]),
    ]
    story.append(_PlanTimelines(view.plan, width))
    notes = [
        f"{case.label}: " + "; ".join(m.note for m in case.marks if m.note)
        for case in view.plan.cases
        if any(m.note for m in case.marks)
    ]
    story += [_p(note, st["small"], bulletText=say.PLAN_TOO_EARLY) for note in notes]
    return story


def _actions(
    view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    story: list[Flowable] = [_p(say.SECTION_ACTIONS, st["h2"])]
    if not view.actions:
        return [*story, _p(say.NO_ACTIONS, st["body"])]
    story.append(_p(say.ACTIONS_INTRO, st["small"]))
    rows = [
        [
            _p(say.TICK_BOX, st["cell"]),
            _p(f"{action.number}.", st["cellbold"]),
            _p(f"{action.text} {say.action_answers(action.findings)}", st["cell"]),
        ]
        for action in view.actions
    ]
    table = SplitTable(rows, colWidths=[12, 20, width - 32], hAlign="LEFT")
    table.setStyle(
        TableStyle(
            [
                ("FONTNAME", (0, 0), (-1, -1), FONT),
                ("VALIGN", (0, 0), (-1, -1), "TOP"),
                ("LEFTPADDING", (0, 0), (-1, -1), 1),
                ("RIGHTPADDING", (0, 0), (-1, -1), 2),
                ("TOPPADDING", (0, 0), (-1, -1), 1),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 1.5),
                ("LINEBELOW", (0, 0), (-1, -1), 0.3, FAINT),
            ]
        )
    )
    story.append(table)
    return story


def _glossary(
    view: model.WorksheetView, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    if not view.glossary and not view.flags:
        return []
    words = "; ".join(f"{term}: {meaning}" for term, meaning in view.glossary)
    flags = "; ".join(view.flags)
    parts = [_p(say.GLOSSARY_HEADING, st["cellbold"])]
    if words:
        parts.append(_p(words, st["small"]))
    if flags:
        parts.append(_p(say.flags_intro(flags), st["small"]))
    return [Spacer(1, 4), KeepTogether(parts)]


# --------------------------------------------------------------------------- charts


class _Mapper:
    def __init__(self, axis: model.Axis, start: float, length: float) -> None:
        self.axis, self.start, self.length = axis, start, length
        if axis.log:
            self.low, self.high = math.log10(axis.low), math.log10(axis.high)
        else:
            self.low, self.high = axis.low, axis.high
        if self.high <= self.low:
            self.high = self.low + 1

    def __call__(self, value: float) -> float:
        v = math.log10(value) if self.axis.log else value
        v = min(max(v, self.low), self.high)
        return self.start + (v - self.low) / (self.high - self.low) * self.length


def _marker(shape: str, x: float, y: float, size: float = MARKER_SIZE) -> Any:
    black = colors.black
    if shape == "dot":
        return Circle(x, y, size, fillColor=black, strokeColor=black, strokeWidth=0.5)
    if shape == "square":
        return Rect(
            x - size,
            y - size,
            2 * size,
            2 * size,
            fillColor=colors.white,
            strokeColor=black,
            strokeWidth=0.7,
        )
    if shape == "triangle":
        return Polygon(
            [x - size, y - size, x + size, y - size, x, y + size * 1.1],
            fillColor=black,
            strokeColor=black,
            strokeWidth=0.5,
        )
    if shape == "diamond":
        return Polygon(
            [x, y - size * 1.2, x + size, y, x, y + size * 1.2, x - size, y],
            fillColor=colors.white,
            strokeColor=black,
            strokeWidth=0.7,
        )
    group = []  # cross
    for dx in (-1, 1):
        group.append(
            Line(
                x - size, y - dx * size, x + size, y + dx * size, strokeColor=black, strokeWidth=0.9
            )
        )
    return group


def _add(drawing: Drawing, shape: Any) -> None:
    if isinstance(shape, list):
        for s in shape:
            drawing.add(s)
    else:
        drawing.add(shape)


def _series_look(series: model.Series) -> tuple[tuple[float, ...] | None, str]:
    # Dash and marker advance together, then the markers shift by one for every round of
    # dashes: the first 25 styles are all different pairs.
    dash = DASHES[series.style % len(DASHES)]
    marker = series.marker or MARKERS[(series.style + series.style // len(DASHES)) % len(MARKERS)]
    return dash, marker


def _legend_rows(chart: model.Chart, width: float) -> list[list[model.Series]]:
    rows: list[list[model.Series]] = [[]]
    used = 0.0
    for series in chart.series:
        need = 26 + pdfmetrics.stringWidth(series.label, FONT, 6.5) + 12
        if rows[-1] and used + need > width:
            rows.append([])
            used = 0.0
        rows[-1].append(series)
        used += need
    return [r for r in rows if r]


def draw_chart(
    chart: model.Chart, width: float, height: float, *, mark_every_point: bool = False
) -> Drawing:
    """The chart as a reportlab Drawing: black on white, styles told apart by dash and marker.

    Curves carry a few markers, enough to tell them apart; with `mark_every_point` each
    point of a line gets its marker (measurements joined by a line, as the audit
    summary's floor readings then and now). Series without a line are always marked.
    """
    legend = _legend_rows(chart, width - 50)
    legend_height = 10 * len(legend) if len(chart.series) > 1 or not chart.series[0].line else 0
    left, right, top = 44.0, 8.0, 29.0
    bottom = 26.0 + legend_height
    drawing = Drawing(width, height)
    drawing.initialFontName = FONT  # the renderer's starting font; the default is not embedded
    plot_w, plot_h = width - left - right, height - top - bottom
    # The axes run a few points inside the frame, so that markers at the ends stay whole.
    inset = 4.0
    fx = _Mapper(chart.x, left + inset, plot_w - 2 * inset)
    fy = _Mapper(chart.y, bottom + inset, plot_h - 2 * inset)

    drawing.add(String(0, height - 9, chart.title, fontName=BOLD, fontSize=7.8))
    drawing.add(String(left - 40, height - 22, chart.y.label, fontName=FONT, fontSize=6.5))

    for value, text in chart.y.ticks:
        y = fy(value)
        drawing.add(Line(left, y, left + plot_w, y, strokeColor=FAINT, strokeWidth=0.3))
        drawing.add(Line(left - 2.5, y, left, y, strokeColor=colors.black, strokeWidth=0.5))
        drawing.add(String(left - 4, y - 2.2, text, fontName=FONT, fontSize=6.3, textAnchor="end"))
    for value, text in chart.x.ticks:
        x = fx(value)
        drawing.add(Line(x, bottom, x, bottom + plot_h, strokeColor=FAINT, strokeWidth=0.3))
        drawing.add(Line(x, bottom - 2.5, x, bottom, strokeColor=colors.black, strokeWidth=0.5))
        drawing.add(String(x, bottom - 10, text, fontName=FONT, fontSize=6.3, textAnchor="middle"))
    drawing.add(
        String(
            left + plot_w / 2,
            bottom - 20,
            chart.x.label,
            fontName=FONT,
            fontSize=6.5,
            textAnchor="middle",
        )
    )

    _draw_bands(drawing, chart, fx, fy)
    for series in chart.series:
        dash, marker = _series_look(series)
        points = [(fx(x), fy(y)) for x, y in series.points]
        if series.line and len(points) > 1:
            drawing.add(
                PolyLine(
                    [c for p in points for c in p],
                    strokeColor=colors.black,
                    strokeWidth=1.0,
                    strokeDashArray=list(dash) if dash else None,
                )
            )
        if not series.line or mark_every_point:
            chosen = points
        elif len(chart.series) > 1:
            step = max(1, len(points) // 8)
            chosen = points[(series.style * step // 3) % step :: step]
        else:
            chosen = []
        for x, y in chosen:
            _add(drawing, _marker(marker, x, y))

    _reference_lines(drawing, chart, fx, fy, left, bottom, plot_w, plot_h)
    drawing.add(
        Rect(
            left, bottom, plot_w, plot_h, fillColor=None, strokeColor=colors.black, strokeWidth=0.6
        )
    )

    if legend_height:
        y = 5.0 + 10 * (len(legend) - 1)
        for row in legend:
            x = left
            for series in row:
                dash, marker = _series_look(series)
                if series.line:
                    drawing.add(
                        Line(
                            x,
                            y + 2,
                            x + 18,
                            y + 2,
                            strokeColor=colors.black,
                            strokeWidth=1.0,
                            strokeDashArray=list(dash) if dash else None,
                        )
                    )
                _add(drawing, _marker(marker, x + 9, y + 2))
                drawing.add(String(x + 23, y, series.label, fontName=FONT, fontSize=6.5))
                x += 26 + pdfmetrics.stringWidth(series.label, FONT, 6.5) + 12
            y -= 10
    return drawing


class _Placer:
    """Finds a spot for each label where it hides no curve, marker or other label."""

    def __init__(
        self, bounds: tuple[float, float, float, float], points: list[tuple[float, float, float]]
    ) -> None:
        self.bounds = bounds  # x0, y0, x1, y1 of the plot
        self.points = points
        self.boxes: list[tuple[float, float, float, float]] = []

    def _cost(self, box: tuple[float, float, float, float]) -> float:
        """0 for a free spot; otherwise how much it would hide (labels and edges worst)."""
        x0, y0, x1, y1 = box
        bx0, by0, bx1, by1 = self.bounds
        cost = 0.0
        if x0 < bx0 or x1 > bx1 or y0 < by0 or y1 > by1:
            cost += 1000.0
        cost += 100.0 * sum(
            1 for a0, b0, a1, b1 in self.boxes if not (x1 <= a0 or x0 >= a1 or y1 <= b0 or y0 >= b1)
        )
        cost += sum(
            1 for px, py, r in self.points if x0 - r <= px <= x1 + r and y0 - r <= py <= y1 + r
        )
        return cost

    def place(
        self, candidates: Sequence[tuple[float, float]], width: float, height: float
    ) -> tuple[float, float]:
        """The first free candidate, or else the one that hides least."""
        best, best_cost = candidates[0], math.inf
        for x, y in candidates:
            cost = self._cost((x - 1, y - 1.6, x + width + 1, y + height))
            if cost < best_cost:
                best, best_cost = (x, y), cost
            if cost == 0:
                break
        x, y = best
        self.boxes.append((x - 1, y - 1.6, x + width + 1, y + height))
        return x, y


def _obstacles(
    chart: model.Chart, fx: Callable[[float], float], fy: Callable[[float], float]
) -> list[tuple[float, float, float]]:
    """(x, y, reach) of every marker and of points every ~3 pt along every curve."""
    points: list[tuple[float, float, float]] = []
    for series in chart.series:
        mapped = [(fx(x), fy(y)) for x, y in series.points]
        points += [(x, y, MARKER_SIZE + 0.5) for x, y in mapped]
        if not series.line:
            continue
        for (x0, y0), (x1, y1) in itertools.pairwise(mapped):
            steps = max(1, int(math.hypot(x1 - x0, y1 - y0) / 3))
            points += [
                (x0 + (x1 - x0) * i / steps, y0 + (y1 - y0) * i / steps, 0.8)
                for i in range(1, steps)
            ]
    return points


def _reference_lines(
    drawing: Drawing,
    chart: model.Chart,
    fx: Callable[[float], float],
    fy: Callable[[float], float],
    left: float,
    bottom: float,
    plot_w: float,
    plot_h: float,
) -> None:
    size = 6.2
    placer = _Placer(
        (left + 1, bottom + 1, left + plot_w - 1, bottom + plot_h - 1), _obstacles(chart, fx, fy)
    )
    horizontal = [line for line in chart.lines if line.orientation == "h"]
    vertical = [line for line in chart.lines if line.orientation == "v"]
    for line in horizontal:
        y = fy(line.at)
        drawing.add(
            Line(
                left,
                y,
                left + plot_w,
                y,
                strokeColor=colors.black,
                strokeWidth=0.8,
                strokeDashArray=[3, 2],
            )
        )
    for line in vertical:
        x = fx(line.at)
        drawing.add(
            Line(
                x,
                bottom,
                x,
                bottom + plot_h,
                strokeColor=colors.black,
                strokeWidth=0.8,
                strokeDashArray=[1, 1.5],
            )
        )
    # Lines are drawn first, labels after, so that a label's white patch covers the lines
    # it sits on but each label still sits beside its own line.
    for line in sorted(horizontal, key=lambda item: -item.at):
        if not line.label:
            continue
        y = fy(line.at)
        text_w = pdfmetrics.stringWidth(line.label, FONT, size)
        xs = [
            left + plot_w - 3 - text_w,
            left + 3,
            left + (plot_w - text_w) / 2,
            left + plot_w * 0.75 - text_w / 2,
            left + plot_w * 0.25 - text_w / 2,
        ]
        candidates = [(x, y + 1.8) for x in xs] + [(x, y - size - 1.2) for x in xs]
        _label(drawing, *placer.place(candidates, text_w, size), line.label, size)
    for line in sorted(vertical, key=lambda item: item.at):
        if not line.label:
            continue
        x = fx(line.at)
        text_w = pdfmetrics.stringWidth(line.label, FONT, size)
        rows = [bottom + plot_h - size - 2 - row * (size + 3) for row in range(6)]
        candidates = [(x + 2.5, y) for y in rows] + [(x - 2.5 - text_w, y) for y in rows]
        _label(drawing, *placer.place(candidates, text_w, size), line.label, size)


def _label(drawing: Drawing, x: float, y: float, text: str, size: float) -> None:
    """Text on a white patch, so that grid and curves never run through it."""
    width = pdfmetrics.stringWidth(text, FONT, size)
    drawing.add(
        Rect(x - 1, y - 1.6, width + 2, size + 1.6, fillColor=colors.white, strokeColor=None)
    )
    drawing.add(String(x, y, text, fontName=FONT, fontSize=size))


def _chart_parts(
    chart: model.Chart, width: float, height: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    parts: list[Flowable] = [draw_chart(chart, width, height)]
    if chart.caption:
        parts.append(_p(chart.caption, st["small"]))
    return parts


def _chart_block(
    chart: model.Chart, width: float, height: float, st: dict[str, ParagraphStyle]
) -> Flowable:
    return KeepTogether(_chart_parts(chart, width, height, st))


# --------------------------------------------------------------------------- document


def render(view: model.WorksheetView, paper: str = "A4") -> bytes:
    """The worksheet as PDF bytes; `paper` is "A4" (default) or "letter"."""
    size = PAPERS.get(paper.lower())
    if size is None:
        raise ValueError(f"paper must be one of {', '.join(sorted(PAPERS))}, got {paper!r}")
    register_fonts()
    st = _styles()
    buffer = io.BytesIO()
    doc = new_document(
        buffer,
        size,
        title=view.title,
        author=view.author,
        subject=view.subject,
        creator=f"ignite {view.footer.tool_version}",
    )
    width = doc.width
    story: list[Flowable] = []
    story += _header(view, width, st)
    story += _plan(view, width, st)
    story += _actions(view, width, st)
    story += _glossary(view, width, st)
    story += [CondPageBreak(60 * mm)]
    story += _findings(view, width, st)
    if view.electrical is not None and view.electrical.leads:
        story += _electrical(view.electrical, width, st)
    story += _cases(view, width, st)
    story += _room(view, width, st)
    # a list plan shows the cases' microshock lines (in the case tables) and the electrical
    # findings; the full electrical section belongs to the commissioning and audit records
    if view.electrical is not None and not view.electrical.leads and view.purpose != "pre-list":
        story += _electrical(view.electrical, width, st)
    story += _cautions_and_sign_off(view, width, st)
    story += _appendix(view, width, st)
    doc.build(story, canvasmaker=_canvas_maker(view))
    return buffer.getvalue()


# --------------------------------------------------------------------------- spread


def _draw_bands(drawing: Drawing, chart: model.Chart, fx: _Mapper, fy: _Mapper) -> None:
    """Each band as a light grey area between its lower and upper curve, under the lines."""
    for band in chart.bands:
        if len(band.lower) < 2 or len(band.upper) < 2:
            continue
        outline = [(fx(x), fy(y)) for x, y in band.upper]
        outline += [(fx(x), fy(y)) for x, y in reversed(band.lower)]
        drawing.add(
            Polygon(
                [c for p in outline for c in p],
                fillColor=BAND_GREY,
                strokeColor=None,
                strokeWidth=0,
            )
        )


def draw_bars(chart: model.BarChart, width: float, height: float) -> Drawing:
    """Signed horizontal bars about a zero line, one per input, labelled on the left."""
    drawing = Drawing(width, height)
    drawing.initialFontName = FONT
    drawing.add(String(0, height - 9, chart.title, fontName=BOLD, fontSize=7.8))
    label_w = 0.45 * width
    left, right = label_w + 4, width - 30
    zero = (left + right) / 2
    half = (right - left) / 2
    top = height - 18
    row = min(14.0, (top - 20) / max(len(chart.bars), 1))
    for index, (label, value) in enumerate(chart.bars):
        y = top - (index + 1) * row
        drawing.add(
            String(
                label_w,
                y + 2,
                fit(label, FONT, 6.5, label_w),
                fontName=FONT,
                fontSize=6.5,
                textAnchor="end",
            )
        )
        x0, x1 = sorted((zero, zero + value * half))
        drawing.add(
            Rect(
                x0,
                y,
                max(x1 - x0, 0.5),
                row * 0.6,
                fillColor=BAR_GREY,
                strokeColor=colors.black,
                strokeWidth=0.4,
            )
        )
        end = zero + value * half
        drawing.add(
            String(
                end + (3 if value >= 0 else -3),
                y + 1.5,
                f"{value:+.2f}".replace("-", "−"),
                fontName=FONT,
                fontSize=6.3,
                textAnchor="start" if value >= 0 else "end",
            )
        )
    bottom = top - len(chart.bars) * row - 4
    drawing.add(Line(zero, bottom, zero, top, strokeColor=colors.black, strokeWidth=0.6))
    for tick in (-1.0, -0.5, 0.0, 0.5, 1.0):
        x = zero + tick * half
        drawing.add(Line(x, bottom - 2, x, bottom, strokeColor=colors.black, strokeWidth=0.5))
        drawing.add(
            String(
                x,
                bottom - 9,
                f"{tick:g}".replace("-", "−"),
                fontName=FONT,
                fontSize=6,
                textAnchor="middle",
            )
        )
    drawing.add(Line(left, bottom, right, bottom, strokeColor=colors.black, strokeWidth=0.5))
    drawing.add(String(zero, 1, chart.axis_label, fontName=FONT, fontSize=6.3, textAnchor="middle"))
    return drawing


def _spread_block(
    spread: model.SpreadView | None, width: float, st: dict[str, ParagraphStyle]
) -> list[Flowable]:
    """A case's figures over the samples, what to measure first, and what drives it."""
    if spread is None:
        return []
    heading = _p(spread.heading, st["cellbold"])
    story: list[Flowable] = [Spacer(1, 5)]
    table = _grid(spread.table, width * 0.55 if spread.drivers else width, st)
    if spread.drivers is not None:
        bars = draw_bars(spread.drivers, width * 0.43, 40 + 14 * len(spread.drivers.bars))
        pair = Table([[table, bars]], colWidths=[width * 0.57, width * 0.43], hAlign="LEFT")
        pair.setStyle(
            TableStyle(
                [
                    ("VALIGN", (0, 0), (-1, -1), "TOP"),
                    ("LEFTPADDING", (0, 0), (-1, -1), 0),
                    ("RIGHTPADDING", (0, 0), (-1, -1), 0),
                    ("TOPPADDING", (0, 0), (-1, -1), 0),
                    ("BOTTOMPADDING", (0, 0), (-1, -1), 0),
                ]
            )
        )
        story.append(KeepTogether([heading, pair]))
    else:
        story.append(KeepTogether([heading, table]))
    story += [_p(line, st["small"], bulletText="–") for line in spread.advice]
    return story
