"""The audit summary PDF: every room against its verdict, the worst findings of the
site and, given an earlier register, what changed since, with a chart of each room's
floor readings then and now.

Black-and-white first: verdicts and severities are words and symbols (✔ PASS, ✘ FAIL,
HIGH in bold capitals), chart series differ by marker and dash, never by colour alone.
The same report gives the same bytes (reportlab's invariant mode, no clock). The
document, its fonts and the floor charts come from the worksheet's layout module
(`pdf`): a chart of readings then and now is a `model.Chart` drawn by `draw_chart`.
"""

from __future__ import annotations

import io
import math
from collections.abc import Sequence
from dataclasses import replace
from pathlib import Path
from typing import TYPE_CHECKING, Any
from xml.sax.saxutils import escape

from ignite.records.register import (
    ASSESSED,
    ERROR,
    INVALID,
    AuditReport,
    FindingKey,
    RegisterRow,
    RoomChange,
    severity_order,
)
from ignite.records.results import SEVERITIES
from ignite.report.worksheet.model import Axis, Chart, RefLine, Series, log_axis
from ignite.wording import sentences
from ignite.wording.numbers import NO_VALUE, format_against_limit, format_si

if TYPE_CHECKING:
    from reportlab.lib.styles import ParagraphStyle
    from reportlab.platypus import Flowable

FONT = "IgniteSans"  # registered by ignite.report.worksheet.pdf.register_fonts
BOLD = "IgniteSans-Bold"
MONO = "IgniteMono"

CAUTION = sentences.AUDIT_SUMMARY_CAUTION

MAX_SITE_FINDINGS = 40
MAX_PROBLEM_LINES = 6

PASS_MARK, FAIL_MARK = "✔ PASS", "✘ FAIL"
SEVERITY_WORDS = sentences.AUDIT_SUMMARY_SEVERITY_WORDS

THEN_STYLE, NOW_STYLE = 2, 0
"""Chart line styles (the worksheet's dash patterns): dotted for the previous audit, solid now."""

MM = 72 / 25.4
MARGIN_SIDE = 16 * MM
MARGIN_TOP = 16 * MM
MARGIN_BOTTOM = 20 * MM


# --------------------------------------------------------------------------- fonts, styles


def _styles() -> dict[str, ParagraphStyle]:
    from reportlab.lib.styles import ParagraphStyle

    body = ParagraphStyle("summary-body", fontName=FONT, fontSize=8.5, leading=11, spaceAfter=3)
    return {
        "body": body,
        "small": ParagraphStyle(
            "summary-small", parent=body, fontSize=7.2, leading=9, spaceAfter=2
        ),
        "cell": ParagraphStyle("summary-cell", parent=body, fontSize=7.3, leading=9, spaceAfter=0),
        "mono": ParagraphStyle(
            "summary-mono", parent=body, fontName=MONO, fontSize=6.4, leading=8, spaceAfter=0
        ),
        "title": ParagraphStyle(
            "summary-title", parent=body, fontName=BOLD, fontSize=15, leading=18, spaceAfter=3
        ),
        "h2": ParagraphStyle(
            "summary-h2",
            parent=body,
            fontName=BOLD,
            fontSize=11.5,
            leading=14,
            spaceBefore=10,
            spaceAfter=5,
        ),
        "caution": ParagraphStyle(
            "summary-caution", parent=body, fontName=BOLD, fontSize=8.5, leading=11, spaceAfter=0
        ),
    }


def _p(text: str, style: ParagraphStyle) -> Any:
    """A paragraph of plain text: markup characters escaped, newlines kept."""
    from ignite.report.worksheet.pdf import Para  # lazy: pdf imports reportlab

    return Para(escape(text).replace("\n", "<br/>"), style)


def _markup(markup: str, style: ParagraphStyle) -> Any:
    from ignite.report.worksheet.pdf import Para  # lazy: pdf imports reportlab

    return Para(markup, style)


# --------------------------------------------------------------------------- words


def severity_word(severity: str) -> str:
    """A severity as the summary writes it: the two worst in capitals.

    >>> severity_word("high"), severity_word("low"), severity_word("")
    ('HIGH', 'low', '—')
    """
    return SEVERITY_WORDS.get(severity, severity or NO_VALUE)


def _severity_markup(severity: str) -> str:
    word = escape(severity_word(severity))
    return f"<b>{word}</b>" if severity == "high" else word


def verdict_words(verdict: str) -> str:
    """✔ PASS, ✘ FAIL, or "not assessed".

    >>> verdict_words("pass"), verdict_words("fail"), verdict_words("")
    ('✔ PASS', '✘ FAIL', 'not assessed')
    """
    return {"pass": PASS_MARK, "fail": FAIL_MARK}.get(verdict, "not assessed")


def _against(value: float | None, limit: float | None) -> str:
    """A reading printed so that one outside its limit never looks inside it."""
    if value is None:
        return NO_VALUE
    if limit is None:
        return format_si(value, "Ω")
    return format_against_limit(value, limit, "Ω")[0]


def _window(low: float | None, high: float | None) -> str:
    if low is None and high is None:
        return NO_VALUE
    if low is None:
        return f"up to {format_si(high, 'Ω')}"
    if high is None:
        return f"from {format_si(low, 'Ω')}"
    return f"{format_si(low, 'Ω')} – {format_si(high, 'Ω')}"


POINTS_SHOWN = 12  # test points named in the rooms table; more are counted


def _points(points: Sequence[int]) -> str:
    """The test points outside the window; past POINTS_SHOWN, the rest counted.

    >>> _points([3]), _points(range(1, 15))
    ('point 3', 'points 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12 … and 2 more')
    """
    shown = ", ".join(str(p) for p in list(points)[:POINTS_SHOWN])
    if len(points) > POINTS_SHOWN:
        shown += f" … and {len(points) - POINTS_SHOWN} more"
    return ("point " if len(points) == 1 else "points ") + shown


def _amount(value: float | None, unit: str, limit: float | None = None) -> tuple[str, str]:
    if limit is None and not unit and value:  # a yes/no finding: the condition is present
        return "present", "—"
    if value is not None and limit is not None and not isinstance(value, bool):
        return format_against_limit(value, limit, unit)
    return format_si(value, unit), format_si(limit, unit)


# --------------------------------------------------------------------------- the document


def render_summary(report: AuditReport) -> bytes:
    """The summary of an audit as PDF bytes (A4 or letter, as `report.paper` says)."""
    from reportlab.lib.pagesizes import A4, letter

    from ignite.report.worksheet.pdf import new_document, register_fonts  # lazy: reportlab

    register_fonts()
    st = _styles()
    size = letter if report.paper.lower() == "letter" else A4
    buffer = io.BytesIO()
    folder_name = Path(report.folder).name or report.folder
    doc = new_document(
        buffer,
        size,
        title=f"Audit summary: {folder_name}",
        author="ignite",
        subject="Floor, static-ignition and fire findings of a folder of rooms",
        creator=f"ignite {report.tool_version}",
        margin_top=MARGIN_TOP,
        margin_bottom=MARGIN_BOTTOM,
    )
    width = doc.width
    story: list[Flowable] = []
    story += _opening(report, folder_name, width, st)
    story += _rooms(report, width, st)
    story += _not_assessed(report, width, st)
    story += _warnings(report, width, st)
    story += _worst_findings(report, width, st)
    if report.previous is not None:
        story += _changes(report, width, st)
    story += _sign_off(width, st)
    doc.build(story, canvasmaker=_canvas_maker(report, folder_name))
    return buffer.getvalue()


def _sign_off(width: float, st: dict[str, ParagraphStyle]) -> list[Any]:
    """The audit's own decision and signatures, kept on one page."""
    from reportlab.platypus import KeepTogether

    rows: list[list[Any]] = [[_p(h, st["cell"]) for h in sentences.SIGN_OFF_HEADERS]]
    rows += [[_p(role, st["cell"]), "", "", ""] for role in sentences.SIGN_OFF_ROLES]
    heights = [None, *[28.0] * len(sentences.SIGN_OFF_ROLES)]  # room to sign
    signatures = _table(rows, [width * w for w in (0.18, 0.32, 0.32, 0.18)], heights=heights)
    decisions = [
        _p(f"{sentences.TICK_BOX} {decision}", st["body"])
        for decision in sentences.SIGN_OFF_SUMMARY_DECISIONS
    ]
    return [
        KeepTogether(
            [
                _p(sentences.SIGN_OFF_SUMMARY_HEADING, st["h2"]),
                _p(sentences.SIGN_OFF_SUMMARY_PROMPT, st["body"]),
                *decisions,
                signatures,
            ]
        )
    ]


def _canvas_maker(report: AuditReport, folder_name: str) -> Any:
    from reportlab.lib import colors

    from ignite.report.worksheet.pdf import PagedCanvas  # lazy: pdf imports reportlab

    class SummaryCanvas(PagedCanvas):
        def page_furniture(self, number: int, total: int) -> None:
            width, _ = self._pagesize
            left, right = MARGIN_SIDE, width - MARGIN_SIDE
            top = MARGIN_BOTTOM - 6
            self.saveState()
            self.setStrokeColor(colors.black)
            self.setLineWidth(0.4)
            self.line(left, top, right, top)
            self.setFont(BOLD, 7)
            self.drawString(left, top - 9, f"Audit summary: {folder_name}")
            self.drawRightString(right, top - 9, f"Page {number} of {total}")
            self.setFont(FONT, 6.3)
            self.drawCentredString((left + right) / 2, top - 9, f"ignite {report.tool_version}")
            self.drawString(left, top - 18, f"Rules SHA-256  {report.rules_digest}")
            self.drawString(
                left,
                top - 26,
                "Supports, never replaces, local codes, the manufacturer's "
                "instructions and licensed professional judgement.",
            )
            self.restoreState()

    return SummaryCanvas


def _table(
    rows: list[list[Any]],
    widths: Sequence[float],
    header: bool = True,
    heights: Sequence[float | None] | None = None,
) -> Any:
    from reportlab.lib import colors
    from reportlab.platypus import TableStyle

    from ignite.report.worksheet.pdf import SplitTable  # lazy: pdf imports reportlab

    style: list[tuple[Any, ...]] = [
        ("FONTNAME", (0, 0), (-1, -1), FONT),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("LEFTPADDING", (0, 0), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ("TOPPADDING", (0, 0), (-1, -1), 1.5),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
        ("BOX", (0, 0), (-1, -1), 0.6, colors.black),
        ("INNERGRID", (0, 0), (-1, -1), 0.25, colors.Color(0.55, 0.55, 0.55)),
    ]
    if header:
        style += [
            ("BACKGROUND", (0, 0), (-1, 0), colors.Color(0.9, 0.9, 0.9)),
            ("LINEBELOW", (0, 0), (-1, 0), 0.8, colors.black),
        ]
    table = SplitTable(
        rows, colWidths=list(widths), rowHeights=heights, repeatRows=1 if header else 0
    )
    table.setStyle(TableStyle(style))
    return table


def _opening(
    report: AuditReport, folder_name: str, width: float, st: dict[str, ParagraphStyle]
) -> list[Any]:
    from reportlab.lib import colors
    from reportlab.platypus import Spacer, Table, TableStyle

    rows = report.rows
    assessed = [row for row in rows if row.status == ASSESSED or row.room_id]
    dates = sorted(row.assessed_on for row in assessed if row.assessed_on)
    passed = sum(1 for row in assessed if row.floor_passed)
    failed = sum(1 for row in assessed if row.floor_passed is False)
    counts = {s: sum(row.count(s) for row in rows) for s in SEVERITIES}
    out: list[Any] = [
        _p(f"Audit summary: {folder_name}", st["title"]),
        _p(
            f"{len(rows)} room file(s) under {report.folder}: "
            f"{sum(1 for r in rows if r.status == ASSESSED)} assessed with a worksheet, "
            f"{sum(1 for r in rows if r.status == INVALID)} invalid, "
            f"{sum(1 for r in rows if r.status == ERROR)} not completed because of an error."
            + (f" Rooms assessed from {dates[0]} to {dates[-1]}." if dates else ""),
            st["body"],
        ),
        _markup(
            f"Floor: <b>{escape(PASS_MARK)}</b> {passed} room(s) with every reading inside the "
            "window, "
            f"<b>{escape(FAIL_MARK)}</b> {failed} with a reading outside it. Findings: "
            + ", ".join(f"{_severity_markup(s)} {counts[s]}" for s in SEVERITIES)
            + ".",
            st["body"],
        ),
    ]
    previous = report.previous
    if previous is not None:
        text = (
            f"Compared with the previous register {previous.path.name} "
            f"(SHA-256 {previous.sha256[:16]}…, {len(previous.rows)} room file(s))."
        )
        if previous.rules_digest and previous.rules_digest != report.rules_digest:
            text += (
                " The rules in force differ from those of the previous audit: a finding may have "
                "appeared or cleared because a rule changed, not the room."
            )
        out.append(_p(text, st["body"]))
    caution = Table([[_p(CAUTION, st["caution"])]], colWidths=[width])
    caution.setStyle(
        TableStyle(
            [
                ("FONTNAME", (0, 0), (-1, -1), FONT),
                ("BOX", (0, 0), (-1, -1), 1.2, colors.black),
                ("LEFTPADDING", (0, 0), (-1, -1), 6),
                ("RIGHTPADDING", (0, 0), (-1, -1), 6),
                ("TOPPADDING", (0, 0), (-1, -1), 4),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 5),
            ]
        )
    )
    out += [Spacer(1, 4), caution, Spacer(1, 4)]
    out.append(
        _p(
            "How to read: a floor passes when every point-to-ground reading lies inside its window "
            "(rules/ names the window and its source); readings outside are listed by test point. "
            "Severities are written out, worst first: HIGH (bold), MEDIUM, low, note.",
            st["small"],
        )
    )
    return out


def _room_order(row: RegisterRow) -> tuple[int, int, str, str]:
    rank = severity_order(row.worst_severity)
    return (0 if row.floor_passed is False else 1, rank, row.room_id, row.file)


def _rooms(report: AuditReport, width: float, st: dict[str, ParagraphStyle]) -> list[Any]:
    rows = sorted((row for row in report.rows if row.room_id), key=_room_order)
    out: list[Any] = [_p("Rooms and their verdicts", st["h2"])]
    if not rows:
        return [*out, _p("No room could be assessed.", st["body"])]
    out.append(
        _p("Rooms with a floor outside its window first, then by their worst finding.", st["small"])
    )
    cell, mono = st["cell"], st["mono"]
    table: list[list[Any]] = [
        [
            _p(h, cell)
            for h in (
                "Room, date assessed",
                "Floor",
                "Lowest",
                "Highest",
                "Window",
                "Worst finding",
                "Findings high · medium · low · note",
                "Worksheet",
            )
        ]
    ]
    for row in rows:
        floor = escape(verdict_words(row.verdict))
        if row.floor_passed is False:
            floor = f"<b>{floor}</b>"
            if row.points_outside:
                floor += "<br/>" + escape(_points(row.points_outside))
        room = (
            f"<b>{escape(row.room_id)}</b>  {escape(row.assessed_on)}<br/>{escape(row.room_name)}"
        )
        if row.purpose:
            room += f" ({escape(row.purpose)})"
        counts = " · ".join(str(row.count(s)) for s in SEVERITIES)
        table.append(
            [
                _markup(room, cell),
                _markup(floor, cell),
                _p(_against(row.lowest_ohm, row.window_low_ohm), cell),
                _p(_against(row.highest_ohm, row.window_high_ohm), cell),
                _p(_window(row.window_low_ohm, row.window_high_ohm), cell),
                _markup(_severity_markup(row.worst_severity), cell),
                _p(counts, cell),
                _p(row.worksheet or "not written", mono),
            ]
        )
    fractions = (0.25, 0.11, 0.08, 0.08, 0.12, 0.08, 0.10, 0.18)
    out.append(_table(table, [width * f for f in fractions]))
    return out


def _not_assessed(report: AuditReport, width: float, st: dict[str, ParagraphStyle]) -> list[Any]:
    rows = report.not_assessed
    if not rows:
        return []
    cell, mono = st["cell"], st["mono"]
    out: list[Any] = [
        _p("Room files not assessed, or without a worksheet", st["h2"]),
        _p(
            "Each problem names the file, the line and the key; "
            "`ignite check FILE` lists them again.",
            st["small"],
        ),
    ]
    table: list[list[Any]] = [[_p("File", cell), _p("Status", cell), _p("Problems", cell)]]
    for row in rows:
        problems = list(row.problems)
        shown = problems[:MAX_PROBLEM_LINES]
        if len(problems) > len(shown):
            shown.append(f"… and {len(problems) - len(shown)} more (see the register)")
        table.append([_p(row.file, mono), _p(row.status, cell), _p("\n".join(shown), mono)])
    out.append(_table(table, [width * 0.25, width * 0.09, width * 0.66]))
    return out


def _warnings(report: AuditReport, width: float, st: dict[str, ParagraphStyle]) -> list[Any]:
    rows = [row for row in report.rows if row.warnings]
    if not rows:
        return []
    cell, mono = st["cell"], st["mono"]
    out: list[Any] = [
        _p("Unusual input, accepted", st["h2"]),
        _p(
            "Values outside the usual range were used as given; check each reading and its unit.",
            st["small"],
        ),
    ]
    table: list[list[Any]] = [[_p("Room", cell), _p("Warnings", cell)]]
    for row in rows:
        table.append([_p(row.room_id or row.file, cell), _p("\n".join(row.warnings), mono)])
    out.append(_table(table, [width * 0.14, width * 0.86]))
    return out


def _worst_findings(report: AuditReport, width: float, st: dict[str, ParagraphStyle]) -> list[Any]:
    findings = report.site_findings
    out: list[Any] = [_p("The worst findings across the site", st["h2"])]
    if not findings:
        return [*out, _p("No findings in the rooms assessed.", st["body"])]
    shown = findings[:MAX_SITE_FINDINGS]
    rest = findings[len(shown) :]
    cell, mono = st["cell"], st["mono"]
    table: list[list[Any]] = [
        [
            _p(h, cell)
            for h in (
                "Severity",
                "Room",
                "Finding",
                "Subject",
                "Value (measured or computed)",
                "Against limit",
            )
        ]
    ]
    for item in shown:
        finding = item.finding
        measured, limit = _amount(
            finding.measured.value, finding.measured.unit, finding.limit.value
        )
        if finding.limit.unit != finding.measured.unit:
            limit = format_si(finding.limit.value, finding.limit.unit)
        if finding.comparison and limit != NO_VALUE:
            limit = f"{finding.comparison} {limit}"
        table.append(
            [
                _markup(_severity_markup(finding.severity), cell),
                _p(item.room_id, cell),
                [_p(finding.title, cell), _p(finding.rule, mono)],
                _p(finding.subject, cell),
                _p(measured, cell),
                _p(limit, cell),
            ]
        )
    fractions = (0.09, 0.09, 0.40, 0.16, 0.12, 0.14)
    out.append(_table(table, [width * f for f in fractions]))
    if rest:
        by = {s: sum(1 for item in rest if item.finding.severity == s) for s in SEVERITIES}
        text = ", ".join(f"{n} {severity_word(s)}" for s, n in by.items() if n)
        out.append(
            _p(
                f"{len(rest)} further finding(s) not listed here ({text}); each room's worksheet "
                "and the register list them all.",
                st["small"],
            )
        )
    return out


# --------------------------------------------------------------------------- changes


def _then_now(then: str, now: str) -> str:
    return now if then == now else f"{then} → {now}"


def _changes(report: AuditReport, width: float, st: dict[str, ParagraphStyle]) -> list[Any]:
    from reportlab.platypus import KeepTogether, Spacer, Table, TableStyle

    from ignite.report.worksheet.pdf import draw_chart  # lazy: pdf imports reportlab

    changes = report.changes
    assert report.previous is not None
    cell = st["cell"]
    out: list[Any] = [_p("Changes since the previous audit", st["h2"])]
    changed = [c for c in changes if c.changed]
    unchanged = [c for c in changes if not c.changed]
    left = [c for c in changes if c.window_event == "left its window"]
    back = [c for c in changes if c.window_event == "re-entered its window"]
    new = [c for c in changes if c.kind == "new"]
    gone = [c for c in changes if c.kind == "gone"]
    out.append(
        _p(
            f"{len(changed)} room(s) changed, {len(unchanged)} unchanged. "
            f"Left their window: {_ids(left)}. Re-entered their window: {_ids(back)}. "
            f"New since then: {_ids(new)}. Gone since then: {_ids(gone)}.",
            st["body"],
        )
    )
    if changed:
        table: list[list[Any]] = [
            [
                _p(h, cell)
                for h in (
                    "Room",
                    "Floor then → now",
                    "Lowest, highest then → now",
                    "Readings that moved",
                    "Findings appeared",
                    "Findings cleared",
                )
            ]
        ]
        for change in changed:
            table.append(_change_row(change, st))
        fractions = (0.10, 0.13, 0.15, 0.18, 0.22, 0.22)
        out.append(_table(table, [width * f for f in fractions]))
    if unchanged:
        out.append(_p(f"Unchanged: {_ids(unchanged)}.", st["small"]))
    with_readings = [c for c in changed + unchanged if c.readings_then or c.readings_now]
    drawn = [(change, floor_chart(change)) for change in with_readings]
    charts = [chart for _, chart in drawn if chart is not None]
    undrawn = [change for change, chart in drawn if chart is None]
    if charts:
        out.append(_p("Floor readings then and now", st["h2"]))
        out.append(
            _p(
                "One chart a room, readings by test point on a logarithmic scale: □ on a dotted "
                "line the previous audit, ● on a solid line this one; dashed lines mark the "
                "window's limits.",
                st["small"],
            )
        )
        half = (width - 8) / 2
        drawings = [
            draw_chart(
                replace(chart, title=_fit(chart.title, BOLD, 7.8, half - 4)),
                half,
                150,
                mark_every_point=True,
            )
            for chart in charts
        ]
        for start in range(0, len(drawings), 2):
            pair = drawings[start : start + 2]
            pair += [Spacer(half, 1)] * (2 - len(pair))
            grid = Table([pair], colWidths=[half + 4, half + 4])
            grid.setStyle(
                TableStyle(
                    [
                        ("FONTNAME", (0, 0), (-1, -1), FONT),
                        ("LEFTPADDING", (0, 0), (-1, -1), 0),
                        ("VALIGN", (0, 0), (-1, -1), "TOP"),
                    ]
                )
            )
            out.append(KeepTogether([grid, Spacer(1, 4)]))
    if undrawn:
        out.append(
            _p(f"No reading to chart (none positive and finite): {_ids(undrawn)}.", st["small"])
        )
    return out


def _ids(changes: Sequence[RoomChange]) -> str:
    return ", ".join(c.room_id or c.file for c in changes) if changes else "none"


def _change_row(change: RoomChange, st: dict[str, ParagraphStyle]) -> list[Any]:
    cell = st["cell"]
    room = f"<b>{escape(change.room_id or change.file)}</b>"
    if change.kind != "compared":
        room += f"<br/>{'new' if change.kind == 'new' else 'gone'}"
    elif change.status_then != change.status_now:
        room += f"<br/>{escape(_then_now(change.status_then, change.status_now))}"

    def extreme(values: Sequence[float], pick: Any) -> str:
        return format_si(pick(values), "Ω") if values else NO_VALUE

    if change.kind == "compared":
        verdict = escape(
            _then_now(verdict_words(change.verdict_then), verdict_words(change.verdict_now))
        )
        lowest = _then_now(extreme(change.readings_then, min), extreme(change.readings_now, min))
        highest = _then_now(extreme(change.readings_then, max), extreme(change.readings_now, max))
    else:  # one side only: say what is known, no arrows
        side = "now" if change.kind == "new" else "then"
        readings = change.readings_now if change.kind == "new" else change.readings_then
        verdict = escape(f"{side}: " + verdict_words(change.verdict_now or change.verdict_then))
        lowest, highest = extreme(readings, min), extreme(readings, max)
    if change.window_event:
        verdict = f"<b>{verdict}</b><br/>{escape(change.window_event)}"
    extremes = f"lowest {lowest}\nhighest {highest}"
    moved = []
    for point in change.moved:
        before = change.readings_then[point - 1] if point <= len(change.readings_then) else None
        after = change.readings_now[point - 1] if point <= len(change.readings_now) else None
        moved.append(f"#{point}: {format_si(before, 'Ω')} → {format_si(after, 'Ω')}")
    return [
        _markup(room, cell),
        _markup(verdict, cell),
        _p(extremes, cell),
        _p("\n".join(moved) or "none", cell),
        _finding_list(change.appeared, st),
        _finding_list(change.cleared, st),
    ]


def _finding_list(findings: Sequence[FindingKey], st: dict[str, ParagraphStyle]) -> Any:
    if not findings:
        return _p("none", st["cell"])
    lines = [
        f"{_severity_markup(f.severity)} <font name='{MONO}' size='6.4'>{escape(f.rule)}</font>"
        + (f"<br/>  on {escape(f.subject)}" if f.subject else "")
        for f in findings
    ]
    return _markup("<br/>".join(lines), st["cell"])


def _fit(text: str, font: str, size: float, width: float) -> str:
    """`text`, cut with an ellipsis so that it fits `width` points."""
    from reportlab.pdfbase.pdfmetrics import stringWidth

    if stringWidth(text, font, size) <= width:
        return text
    while text and stringWidth(text + "…", font, size) > width:
        text = text[:-1]
    return text.rstrip() + "…"


def _drawable(readings: Sequence[float]) -> tuple[tuple[float, float], ...]:
    """(test point, reading) of the readings a log axis can show (positive, finite)."""
    return tuple((float(i + 1), v) for i, v in enumerate(readings) if v > 0 and math.isfinite(v))


def floor_chart(change: RoomChange) -> Chart | None:
    """A room's floor readings by test point, then and now, against its window, as the
    worksheet's chart code draws it; None when neither side has a reading to draw."""
    then, now = _drawable(change.readings_then), _drawable(change.readings_now)
    if not then and not now:
        return None
    window = [
        (side, limit)
        for side, limit in (("lower", change.window_low_ohm), ("upper", change.window_high_ohm))
        if limit is not None and limit > 0 and math.isfinite(limit)
    ]
    values = [v for _, v in then + now] + [limit for _, limit in window]
    count = max(len(change.readings_then), len(change.readings_now))
    every = max(1, math.ceil(count / 20))
    x = Axis(
        label="test point",
        low=0.5,
        high=count + 0.5,
        log=False,
        ticks=tuple((float(n), str(n)) for n in range(1, count + 1) if (n - 1) % every == 0),
    )
    return Chart(
        title=f"{change.room_id or change.file}: {change.room_name}",
        x=x,
        y=log_axis("point to ground", min(values) / 2, max(values) * 2, "Ω"),
        series=(  # the previous audit first, so that this one is drawn over it
            Series(
                f"then {change.date_then}".rstrip() if then else "then: none",
                then,
                THEN_STYLE,
                marker="square",
            ),
            Series(
                f"now {change.date_now}".rstrip() if now else "now: none",
                now,
                NOW_STYLE,
                marker="dot",
            ),
        ),
        lines=tuple(
            RefLine("h", limit, f"{side} limit {format_si(limit, 'Ω')}") for side, limit in window
        ),
    )
