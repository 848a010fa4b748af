"""Page 1 of the worksheet as a view model: the case timelines, the action list, the glossary.

The plan puts every case on one time axis from the end of the prep: when the prep is wet,
when the drape pocket's vapour is above its margin of the LFL, when the site's oxidant is
above the oxygen-enriched limit, and the planned marks (drapes on, oxygen stopped, first
activation). A planned time that comes too early (or an oxygen stop too late) is marked,
with the earliest (latest) safe time beside it: the same figure, rounded the same way, as
the finding's action (`ignite.findings.cases.decided`: over a spread, the percentile the
decisions use; then `round_up`), so the page never gives two values for one quantity.

The action list gives each distinct mitigation once, in the order of the worst finding
that asks for it, with the numbers of the findings it answers.
"""

from __future__ import annotations

import dataclasses
import math
import re
from collections.abc import Iterable, Sequence
from dataclasses import dataclass

from ignite.findings.cases import OPEN_DELIVERY, decided, round_up
from ignite.records.results import CaseResult, Finding, Results
from ignite.wording import sentences as say
from ignite.wording.numbers import format_duration

LEAST_AXIS_S = 600.0  # the plan's axis runs to at least 10 min
AXIS_MARGIN = 1.15  # and a little past its last planned or safe time


@dataclass(frozen=True)
class Span:
    """A stretch of time [s from the end of the prep]; `open_end`: it runs past the axis."""

    start: float
    end: float
    open_end: bool = False
    text: str = ""  # printed past an open end: where the span really ends ("2.95 h")


@dataclass(frozen=True)
class Mark:
    kind: str  # drape | stop | activate
    letter: str  # D | S | A
    at: float  # s, planned
    wrong: bool  # too early (drape, activate) or too late (stop)
    safe_at: float | None  # s, the earliest (latest for stop) safe time, when wrong
    note: str  # "drapes at 3 min: too early, no earlier than 18 min" ("" when right)
    safe_text: str = ""  # the safe time as printed ("18 min")


@dataclass(frozen=True)
class PlanCase:
    label: str
    wet: tuple[Span, ...]
    pocket: tuple[Span, ...]
    oxidant: tuple[Span, ...]
    marks: tuple[Mark, ...]


@dataclass(frozen=True)
class Plan:
    axis_high_s: float  # the shared axis runs from 0 to here
    scale: float  # s per axis unit
    unit: str  # s | min | h
    cases: tuple[PlanCase, ...]
    ticks: tuple[tuple[float, str], ...] = ()  # (axis units, label), set by the view model
    axis_label: str = ""


@dataclass(frozen=True)
class Action:
    number: int
    text: str
    findings: tuple[int, ...]  # numbers of the findings it answers


# --------------------------------------------------------------------------- actions


def list_actions(
    findings: Sequence[Finding],
) -> tuple[tuple[Action, ...], tuple[tuple[int, ...], ...]]:
    """The distinct mitigations, numbered, and for each finding the numbers of its actions.

    `findings` are in the worksheet's order (worst first, numbered from 1).
    """
    order: dict[str, int] = {}
    answers: dict[str, list[int]] = {}
    per_finding: list[tuple[int, ...]] = []
    for number, finding in enumerate(findings, start=1):
        mine: list[int] = []
        for text in finding.mitigations:
            key = _same(text)
            if key not in order:
                order[key] = len(order) + 1
                answers[key] = []
            if number not in answers[key]:
                answers[key].append(number)
            if order[key] not in mine:
                mine.append(order[key])
        per_finding.append(tuple(mine))
    texts: dict[str, str] = {}
    for finding in findings:
        for text in finding.mitigations:
            texts.setdefault(_same(text), text)
    listed = tuple(
        Action(order[key], texts[key], tuple(answers[key]))
        for key in sorted(order, key=lambda k: order[k])
    )
    return listed, tuple(per_finding)


def _same(text: str) -> str:
    """Two mitigations are the same action when their words are (case and spacing aside)."""
    return re.sub(r"\s+", " ", text).strip().casefold()


# --------------------------------------------------------------------------- timelines


def build_plan(results: Results) -> Plan | None:
    """The shared-axis timelines of the cases; None when the list has no cases."""
    if not results.cases:
        return None
    enriched = results.oxygen_enriched_limit_fraction
    drafts = [_draft(case, enriched) for case in results.cases]
    ends = [t for draft in drafts for t in draft[1]]
    high = max([LEAST_AXIS_S, *ends]) * AXIS_MARGIN
    scale, unit = time_scale(high)
    cases = tuple(_clip(draft[0], high) for draft in drafts)
    return Plan(
        axis_high_s=high,
        scale=scale,
        unit=unit,
        cases=cases,
        axis_label=say.plan_axis_label(unit),
    )


def time_scale(seconds: float) -> tuple[float, str]:
    """(seconds per axis unit, unit name) for a time axis reaching `seconds`: the plan's
    axis and the worksheet's time charts."""
    if seconds <= 180:
        return 1.0, "s"
    if seconds <= 3 * 3600:
        return 60.0, "min"
    return 3600.0, "h"


def _draft(case: CaseResult, enriched: float) -> tuple[PlanCase, list[float]]:
    """A case's plan, and the times the shared axis should reach to show it."""
    wet = _wet(case)
    pocket = _above(case.pocket_curve, case.pocket_margin_fraction_of_lfl)
    oxidant = _enriched(case, enriched)
    marks = _marks(case)
    reach = [m.at for m in marks]
    reach += [m.safe_at for m in marks if m.safe_at is not None and m.kind != "activate"]
    reach += [s.end for s in (*pocket, *oxidant) if math.isfinite(s.end)]
    # The wet band and a late first activation stretch the axis no further than twice the
    # rest: a prep that stays wet for hours runs off the right edge, marked open, and its
    # safe time is written beside the arrow.
    last = max([LEAST_AXIS_S, *[t for t in reach if math.isfinite(t)]])
    reach += [
        m.safe_at
        for m in marks
        if m.kind == "activate" and m.safe_at is not None and m.safe_at <= 2.0 * last
    ]
    return (
        PlanCase(say.plan_case_label(case.id, case.procedure), wet, pocket, oxidant, marks),
        [t for t in reach if math.isfinite(t) and t >= 0.0],
    )


def _wet(case: CaseResult) -> tuple[Span, ...]:
    if not case.prep_flammable or case.drying_time_s is None:
        return ()
    if case.drying_time_s <= 0.0:
        return ()
    return (Span(0.0, case.drying_time_s, math.isinf(case.drying_time_s)),)


def _above(curve: Sequence[tuple[float, float]], limit: float | None) -> tuple[Span, ...]:
    """The stretches of a sampled curve that lie above `limit`."""
    if limit is None:
        return ()
    spans: list[Span] = []
    start: float | None = None
    previous: tuple[float, float] | None = None
    for t, value in curve:
        if not (math.isfinite(t) and math.isfinite(value)):
            continue
        over = value > limit
        if over and start is None:
            start = _crossing(previous, (t, value), limit) if previous else t
        elif not over and start is not None:
            assert previous is not None
            spans.append(Span(start, _crossing(previous, (t, value), limit)))
            start = None
        previous = (t, value)
    if start is not None and previous is not None:
        spans.append(Span(start, previous[0]))
    return tuple(spans)


def _crossing(a: tuple[float, float] | None, b: tuple[float, float], limit: float) -> float:
    """Where the straight line from a to b crosses `limit` (b's time when it cannot tell)."""
    if a is None or a[1] == b[1]:
        return b[0]
    fraction = (limit - a[1]) / (b[1] - a[1])
    return a[0] + min(1.0, max(0.0, fraction)) * (b[0] - a[0])


def _stop_at(case: CaseResult) -> float | None:
    """When the oxygen stops, planned [s from the end of the prep]; None without open oxygen."""
    if case.delivery not in OPEN_DELIVERY or case.first_activation_after_s is None:
        return None
    return case.first_activation_after_s - (case.stop_before_activation_s or 0.0)


def _enriched(case: CaseResult, enriched: float) -> tuple[Span, ...]:
    if not case.oxygen_enriched:
        return ()
    stop = _stop_at(case)
    if stop is None:
        return (Span(0.0, math.inf, True),)  # enriched throughout: no planned stop
    end = stop + case.washout_s
    return (Span(0.0, end, math.isinf(end)),)


def _marks(case: CaseResult) -> tuple[Mark, ...]:
    marks: list[Mark] = []
    if case.draping_after_s is not None:
        earliest = _earliest_drape(case)
        wrong = earliest is not None and case.draping_after_s < earliest
        marks.append(_mark("drape", say.PLAN_MARK_DRAPE, case.draping_after_s, wrong, earliest))
    stop = _stop_at(case)
    if stop is not None and case.first_activation_after_s is not None:
        needed = round_up(decided(case, "stop_oxygen_at_least_s", case.required_stop_s))
        latest = None
        if needed is not None and math.isfinite(needed) and case.oxygen_enriched:
            latest = case.first_activation_after_s - needed
        wrong = latest is not None and stop > latest
        mark = _mark("stop", say.PLAN_MARK_STOP, stop, wrong, latest)
        if mark.wrong:
            note = say.plan_stop_too_late(
                format_duration(case.stop_before_activation_s or 0.0), format_duration(needed)
            )
            mark = dataclasses.replace(mark, note=note)
        marks.append(mark)
    if case.first_activation_after_s is not None:
        earliest = _earliest_activation(case)
        wrong = earliest is not None and case.first_activation_after_s < earliest
        marks.append(
            _mark(
                "activate", say.PLAN_MARK_ACTIVATE, case.first_activation_after_s, wrong, earliest
            )
        )
    return tuple(marks)


def _mark(kind: str, letter: str, at: float, wrong: bool, safe: float | None) -> Mark:
    if not wrong or safe is None:
        return Mark(kind, letter, at, False, None, "")
    what = say.PLAN_WHAT[kind]
    note = say.plan_too_early(what, format_duration(at), format_duration(safe))
    return Mark(kind, letter, at, True, max(0.0, safe), note, format_duration(max(0.0, safe)))


def _earliest_drape(case: CaseResult) -> float | None:
    """As the drape action words it: the computed time, never before the label's minimum."""
    safe = decided(case, "drape_no_earlier_than_s", case.safe_draping_after_s)
    if not case.prep_flammable or safe is None:
        return None
    return round_up(max(safe, case.label_minimum_s or 0.0))


def _earliest_activation(case: CaseResult) -> float | None:
    """As the activation action words it: dry, and never before the label's minimum."""
    if not case.prep_flammable or case.drying_time_s is None:
        return None
    return max(case.drying_time_s, case.label_minimum_s or 0.0)


def _clip(case: PlanCase, high: float) -> PlanCase:
    """Spans cut at the axis end, marked open where they run past it."""

    def cut(spans: Iterable[Span]) -> tuple[Span, ...]:
        out = []
        for span in spans:
            if span.start >= high:
                continue
            if span.end > high:
                text = span.text or ("" if math.isinf(span.end) else format_duration(span.end))
                out.append(Span(span.start, high, True, text))
            else:
                out.append(span)
        return tuple(out)

    return dataclasses.replace(
        case, wet=cut(case.wet), pocket=cut(case.pocket), oxidant=cut(case.oxidant)
    )
