"""The worksheet as a view model: every number already formatted, no layout, no reportlab.

`build_view` turns `Results` (plus the rules and methods appendix rows and the room
file's text) into a `WorksheetView` of strings, small tables and chart specifications.
All rounding happens here, through `ignite.wording.numbers`: a value compared with a limit
is printed with `format_against_limit`, so it never rounds across the limit. Every word
comes from `ignite.wording.sentences`, as the terminal table's do. The renderer
(`ignite.report.worksheet.pdf`) only lays these strings out.

Charts carry numbers (in the units their axes are labelled in) because they must be
drawn; their axes, tick labels and line labels are decided here too.
"""

from __future__ import annotations

import dataclasses
import math
import re
from collections.abc import Iterator, Sequence
from dataclasses import dataclass, replace

from ignite.findings.cases import decided, round_up
from ignite.records.results import (
    SEVERITIES,
    CardiacCaseResult,
    CaseResult,
    ChargeResult,
    ElectricalResult,
    Finding,
    FloorResult,
    MethodRef,
    PreparationResult,
    Results,
    RuleRow,
    severity_rank,
)
from ignite.report.worksheet.plan import Action, Plan, build_plan, list_actions, time_scale
from ignite.simulate.compute import ELECTRICAL_METHODS
from ignite.simulate.drying import HORIZON
from ignite.wording import sentences as say
from ignite.wording.numbers import (
    NO_VALUE,
    format_against_limit,
    format_duration,
    format_si,
)

# How much of a long list the worksheet lays out row by row; beyond it, a summary. A list
# the loader accepts (ignite.room.bounds.LISTS) then always fits the pages.
SHORT_LIST = 24  # floor readings listed one per row; more are summarised
LISTED_OUTSIDE = 24  # readings outside the window listed under a summary
NAMES_SHOWN = 10  # names printed in one cell before "… and N more"
NAMES_CHARACTERS = 300  # nor more characters of names than this in one cell
CURVES_SHOWN = 8  # curves on the body-voltage chart: the highest at the room's RH
LABEL_CHARACTERS = 60  # a chart legend's label is cut past this, with "…"

# --------------------------------------------------------------------------- views


@dataclass(frozen=True)
class Table:
    """Rows of already-formatted cells; `widths` are relative column widths."""

    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]
    widths: tuple[float, ...]
    empty_text: str = ""  # printed instead of the table when there are no rows


@dataclass(frozen=True)
class FindingView:
    number: int  # 1 for the worst
    severity: str  # high | medium | low | note
    severity_word: str  # "HIGH"
    severity_mark: str  # "■■■"
    rule: str
    title: str
    subject: str
    measured: str
    limit: str
    comparison: str  # "above", "at or below", ... ("" when not stated)
    source: str
    flag: str
    detail: str
    mitigations: tuple[str, ...]
    # plain words (page 1's action list carries the mitigations, once each)
    value_label: str = ""  # Computed | Measured | Planned
    value_text: str = ""  # "37.1 %, above the threshold 23.5 %"
    actions: tuple[int, ...] = ()  # numbers in the action list


@dataclass(frozen=True)
class Axis:
    label: str
    low: float
    high: float
    log: bool
    ticks: tuple[tuple[float, str], ...]


@dataclass(frozen=True)
class Series:
    label: str
    points: tuple[tuple[float, float], ...]
    style: int  # 0, 1, 2, ...: the renderer maps it to a dash pattern and a marker shape
    line: bool = True
    marker: str = ""  # "" (by style), "dot" or "cross"


@dataclass(frozen=True)
class RefLine:
    orientation: str  # "h": at a y value; "v": at an x value
    at: float
    label: str
    kind: str = "limit"  # "limit" (a threshold) | "event" (a moment, a room condition)


@dataclass(frozen=True)
class BandArea:
    """A shaded band between two curves (the 5th and 95th percentiles over the samples)."""

    label: str
    lower: tuple[tuple[float, float], ...]
    upper: tuple[tuple[float, float], ...]


@dataclass(frozen=True)
class Chart:
    title: str
    x: Axis
    y: Axis
    series: tuple[Series, ...]
    lines: tuple[RefLine, ...] = ()
    caption: str = ""
    bands: tuple[BandArea, ...] = ()


@dataclass(frozen=True)
class BarChart:
    """Horizontal bars from zero, signed (a small 'what drives it' chart)."""

    title: str
    bars: tuple[tuple[str, float], ...]  # (label, value in -1..1)
    axis_label: str
    caption: str = ""


@dataclass(frozen=True)
class SpreadView:
    """A case over the spread of its inputs: the figures, what to measure, what drives it."""

    heading: str
    table: Table
    advice: tuple[str, ...]
    drivers: BarChart | None


@dataclass(frozen=True)
class TriadElement:
    name: str  # "Oxidant", "Fuel", "Ignition source"
    present: bool
    state: str  # "present" | "absent"
    why: str


@dataclass(frozen=True)
class CaseView:
    heading: str
    triad: tuple[TriadElement, ...]
    triad_summary: str
    quantities: Table
    lists: tuple[tuple[str, str], ...]
    notes: tuple[str, ...]
    oxygen_chart: Chart | None
    film_chart: Chart | None
    spread: SpreadView | None = None


@dataclass(frozen=True)
class Footer:
    room_id: str
    input_sha256: str
    tool_version: str
    rules_digest: str


@dataclass(frozen=True)
class ElectricalView:
    """The patient environment's electrical section (rooms with an `electrical` section)."""

    leads: bool  # a recommissioning record: the section comes before the cases
    intro: str
    supply: Table | None
    bonding: Table
    bonding_heading: str
    equipment: Table
    cases: Table
    basis: str  # the microshock limits and the cardiac path's impedance
    notes: tuple[str, ...]
    caution: str


@dataclass(frozen=True)
class WorksheetView:
    title: str  # document metadata: "ignite worksheet — T4"
    heading: str
    subheading: str
    author: str
    subject: str
    creation_date: str | None  # ISO date, or None when the room file's date is unusable
    header: tuple[tuple[str, str], ...]
    verdict: str
    verdict_severity: str | None
    tally: str
    warnings: tuple[str, ...]
    findings: tuple[FindingView, ...]
    no_findings_text: str
    cases: tuple[CaseView, ...]
    no_cases_text: str
    floor_summary: Table
    floor_readings: Table
    floor_readings_note: str  # under a long list: what is shown of it ("" for a short one)
    floor_chart: Chart | None
    shock: Table
    shock_note: str
    charges: Table
    charges_note: str
    voltage_chart: Chart | None
    preparations: Table
    preparation_notes: tuple[str, ...]
    environment: Table
    cautions: tuple[str, ...]
    sign_off_roles: tuple[str, ...]
    sign_off_decisions: tuple[str, ...]
    rules: Table
    methods: Table
    input_name: str
    input_lines: tuple[str, ...]
    footer: Footer
    # the document's purpose and page 1 (issue 13)
    purpose: str = ""
    sign_off_prompt: str = ""
    actions: tuple[Action, ...] = ()
    plan: Plan | None = None
    glossary: tuple[tuple[str, str], ...] = ()
    flags: tuple[str, ...] = ()  # each provenance flag used, with its meaning
    preparation_methods: tuple[str, ...] = ()  # per preparation, in the methods appendix
    electrical: ElectricalView | None = None  # rooms with an `electrical` section
    spread_summary: str = ""  # how the ranges were sampled, and the percentile waits are read at


# --------------------------------------------------------------------------- build


def build_view(
    results: Results,
    rules: Sequence[RuleRow],
    methods: Sequence[MethodRef],
    input_text: str,
) -> WorksheetView:
    """Everything the worksheet prints, as strings (and chart specifications)."""
    room = results.room
    enriched = results.oxygen_enriched_limit_fraction
    ordered = _worst_first(results.findings)
    actions, per_finding = list_actions(ordered)
    findings = tuple(
        _finding_view(number, finding, numbers)
        for number, (finding, numbers) in enumerate(zip(ordered, per_finding, strict=True), 1)
    )
    verdict, worst = _verdict(results.findings, room.purpose)
    prompt, decisions = say.sign_off(room.purpose)
    people_and_trolleys = (*results.people, *results.trolleys)
    if results.electrical is not None:
        methods = (*methods, *ELECTRICAL_METHODS)
    view = WorksheetView(
        title=say.worksheet_title(room.id),
        heading=say.document_heading(room.purpose),
        subheading=say.worksheet_subheading(room.name, room.id),
        author=room.assessor,
        subject=say.worksheet_subject(room.name, results.input_sha256),
        creation_date=_iso_date(room.assessed_on),
        header=(
            (say.HEADER_ROOM, room.id),
            (say.HEADER_SITE, room.name),
            (say.HEADER_PURPOSE, room.purpose),
            (say.HEADER_ASSESSED_ON, room.assessed_on),
            (say.HEADER_ASSESSOR, room.assessor),
            (say.HEADER_ROOM_FILE, results.input_name),
            (say.HEADER_TOOL, say.tool_label(results.tool_version)),
        ),
        verdict=verdict,
        verdict_severity=worst,
        tally=_tally(results.findings),
        warnings=tuple(results.warnings),
        findings=findings,
        no_findings_text=say.NO_FINDINGS,
        cases=tuple(_case_view(case, results, enriched) for case in results.cases),
        no_cases_text=say.NO_CASES,
        floor_summary=_floor_summary(results),
        floor_readings=_floor_readings(results),
        floor_readings_note=_floor_readings_note(results),
        floor_chart=_floor_chart(results),
        shock=_shock_table(results),
        shock_note=results.floor.shock_note,
        charges=_charges_table(
            people_and_trolleys, results.no_spark_voltage_V, results.lowest_site_mie_J
        ),
        charges_note=say.charges_note(results.no_spark_voltage_V),
        voltage_chart=_voltage_chart(results),
        preparations=_preparations_table(results.preparations),
        preparation_notes=_preparation_notes(results.preparations),
        preparation_methods=_preparation_methods(results.preparations),
        environment=_environment_table(results),
        cautions=say.cautions(room.purpose)
        + ((say.ELECTRICAL_CAUTION,) if results.electrical else ()),
        sign_off_roles=say.SIGN_OFF_ROLES,
        sign_off_decisions=decisions,
        rules=Table(
            headers=say.RULES_HEADERS,
            rows=tuple(
                (f"{r.id}\n{r.kind}", r.title, r.threshold, r.source, r.flag) for r in rules
            ),
            widths=(2.3, 2.3, 1.6, 2.2, 1.0),
            empty_text=say.NO_RULES,
        ),
        methods=Table(
            headers=say.METHODS_HEADERS,
            rows=tuple((m.name, m.reference) for m in methods),
            widths=(1.0, 1.6),
            empty_text=say.NO_METHODS,
        ),
        input_name=results.input_name,
        input_lines=tuple(line.expandtabs(4) for line in input_text.splitlines()),
        footer=Footer(
            room_id=room.id,
            input_sha256=results.input_sha256,
            tool_version=results.tool_version,
            rules_digest=results.rules_digest,
        ),
        purpose=room.purpose,
        sign_off_prompt=prompt,
        actions=actions,
        plan=_with_ticks(build_plan(results)),
        flags=tuple(
            say.flag_meaning(flag)
            for flag in _in_order([f.flag for f in findings] + [r.flag for r in rules])
        ),
        electrical=_electrical_view(results),
        spread_summary=spread_summary(results),
    )
    return dataclasses.replace(view, glossary=_glossary(view))


def _with_ticks(found: Plan | None) -> Plan | None:
    if found is None:
        return None
    axis = linear_axis(found.axis_label, 0.0, found.axis_high_s / found.scale)
    return dataclasses.replace(found, ticks=axis.ticks)


def _in_order(items: Sequence[str]) -> list[str]:
    return list(dict.fromkeys(item for item in items if item))


def _strings(value: object) -> Iterator[str]:
    """Every string a view holds (its words, to find the abbreviations it uses)."""
    if isinstance(value, str):
        yield value
    elif dataclasses.is_dataclass(value) and not isinstance(value, type):
        for item in dataclasses.fields(value):
            yield from _strings(getattr(value, item.name))
    elif isinstance(value, tuple | list):
        for item in value:
            yield from _strings(item)


def _glossary(view: WorksheetView) -> tuple[tuple[str, str], ...]:
    """The abbreviations the worksheet uses, each with its meaning."""
    text = " ".join(_strings(view))
    if view.plan is not None:  # the timelines' row names are drawn, not held as strings
        text += f" {say.PLAN_ROW_WET} {say.PLAN_ROW_POCKET} {say.PLAN_ROW_OXIDANT}"
    return tuple(
        (term, meaning)
        for term, meaning in say.GLOSSARY
        if re.search(rf"(?<![\w]){re.escape(term)}(?![\w])", text)
    )


def _iso_date(text: str) -> str | None:
    from datetime import date

    try:
        return date.fromisoformat(str(text).strip()).isoformat()
    except ValueError:
        return None


# --------------------------------------------------------------------------- findings


def _worst_first(findings: Sequence[Finding]) -> list[Finding]:
    # sorted() is stable: findings of one severity keep the order ignite.findings gave them.
    return sorted(findings, key=lambda f: severity_rank(f.severity))


def _counts(findings: Sequence[Finding]) -> dict[str, int]:
    return {s: sum(1 for f in findings if f.severity == s) for s in SEVERITIES}


def _tally(findings: Sequence[Finding]) -> str:
    return say.findings_tally(_counts(findings))


def _verdict(findings: Sequence[Finding], purpose: str) -> tuple[str, str | None]:
    """One line in words, and the worst severity (None when there are no findings)."""
    counts = _counts(findings)
    worst = next((s for s in SEVERITIES if counts[s]), None)
    return say.purpose_verdict(counts, purpose), worst


def _amounts(finding: Finding) -> tuple[str, str]:
    """(measured, limit) as printed; the limit is "" when the rule states none."""
    measured, limit = finding.measured, finding.limit
    if limit.value is None and measured.unit in ("", "1") and measured.value in (0.0, 1.0):
        # a finding about presence (fire triad, a material that burns): 1 = present, 0 = absent
        present = measured.value == 1.0
        return (finding.comparison or say.PRESENT) if present else say.ABSENT, ""
    if limit.value is None:
        return format_si(measured.value, measured.unit), ""
    if (
        measured.value is not None
        and limit.value is not None
        and measured.unit == limit.unit
        and not (math.isnan(measured.value) or math.isnan(limit.value))
    ):
        shown, limit_shown = format_against_limit(measured.value, limit.value, measured.unit)
        if measured.unit == "s" and math.isinf(measured.value):
            shown = say.beyond_horizon(HORIZON)  # only a drying time can be infinite
        return shown, limit_shown
    return format_si(measured.value, measured.unit), format_si(limit.value, limit.unit)


def _finding_view(number: int, finding: Finding, actions: tuple[int, ...] = ()) -> FindingView:
    measured, limit = _amounts(finding)
    return FindingView(
        value_label=say.value_label(finding.value_kind),
        value_text=say.value_against(
            measured, finding.value_kind, finding.comparison, limit, finding.limit_kind
        ),
        actions=actions,
        number=number,
        severity=finding.severity,
        severity_word=say.severity_word(finding.severity),
        severity_mark=say.severity_mark(finding.severity),
        rule=finding.rule,
        title=finding.title,
        subject=finding.subject,
        measured=measured,
        limit=limit,
        comparison=finding.comparison,
        source=finding.source,
        flag=finding.flag,
        detail=finding.detail,
        mitigations=tuple(finding.mitigations),
    )


# --------------------------------------------------------------------------- cases


def _relation(value: float | None, reference: float | None, above: str, not_above: str) -> str:
    if value is None or reference is None or math.isnan(value) or math.isnan(reference):
        return ""
    return above if value > reference else not_above


def _case_view(case: CaseResult, results: Results, enriched: float) -> CaseView:
    limit_text = format_si(enriched, "fraction")
    rows: list[tuple[str, str, str, str]] = []

    site, site_limit = format_against_limit(case.oxidant_fraction, enriched, "fraction")
    rows.append(
        (
            say.OXIDANT_WHILE_FLOWING,
            site,
            say.enriched_above(site_limit),
            say.ENRICHED if case.oxygen_enriched else say.NOT_ENRICHED,
        )
    )
    if case.buildup_s is not None:
        rows.append(
            (
                say.buildup_to(limit_text),
                format_duration(case.buildup_s),
                "",
                "",
            )
        )
    # one value per quantity: the washout as the stop-oxygen action gives it (rounded up)
    rows.append((say.washout_to(limit_text), format_duration(round_up(case.washout_s)), "", ""))
    if case.stop_before_activation_s is not None:
        needed = round_up(
            decided(
                case,
                "stop_oxygen_at_least_s",
                case.required_stop_s if case.required_stop_s is not None else case.washout_s,
            )
        )
        assert needed is not None  # round_up keeps a number a number
        planned, needed_text = format_against_limit(case.stop_before_activation_s, needed, "s")
        rows.append(
            (
                say.STOP_PLANNED,
                planned,
                say.needed(needed_text),
                _relation(
                    needed, case.stop_before_activation_s, say.STOP_SHORT, say.STOP_LONG_ENOUGH
                ),
            )
        )
    at_activation, activation_limit = format_against_limit(
        case.oxidant_at_activation_fraction, enriched, "fraction"
    )
    rows.append(
        (
            say.OXIDANT_AT_ACTIVATION,
            at_activation,
            say.enriched_above(activation_limit),
            _relation(
                case.oxidant_at_activation_fraction, enriched, say.ENRICHED, say.NOT_ENRICHED
            ),
        )
    )
    if case.drying_time_s is not None and case.first_activation_after_s is not None:
        drying, activation = format_against_limit(
            case.drying_time_s, case.first_activation_after_s, "s"
        )
        if math.isinf(case.drying_time_s):
            drying = say.drying_time(case.drying_time_s, HORIZON)
        rows.append(
            (
                say.DRYING_TIME,
                drying,
                say.first_activation_at(activation),
                _relation(
                    case.drying_time_s,
                    case.first_activation_after_s,
                    say.WET_AT_ACTIVATION,
                    say.DRY_BY_ACTIVATION,
                ),
            )
        )
    elif case.drying_time_s is not None:
        rows.append((say.DRYING_TIME, say.drying_time(case.drying_time_s, HORIZON), "", ""))
    if case.drying_time_s is not None and case.mass_transfer_regime:
        coldest = case.film_temperature_min_K
        rows.append(
            (
                say.FILM_TEMPERATURE_MIN,
                "" if coldest is None else format_si(coldest, "K"),
                say.FILM_TEMPERATURE_MIN_READING,
                "",
            )
        )
        rows.append(
            (
                say.MASS_TRANSFER_REGIME,
                say.mass_transfer_regimes(
                    case.mass_transfer_regime, case.mass_transfer_regime_under_drapes
                ),
                "",
                "",
            )
        )
    if case.pocket_vapour_peak_fraction_of_lfl is not None:
        rows.append(
            (
                say.POCKET_PEAK,
                say.of_lfl(format_si(case.pocket_vapour_peak_fraction_of_lfl, "fraction")),
                "",
                "",
            )
        )
    # as the drape action gives it
    safe_draping = round_up(decided(case, "drape_no_earlier_than_s", case.safe_draping_after_s))
    if case.draping_after_s is not None and safe_draping is not None:
        planned, safe = format_against_limit(case.draping_after_s, safe_draping, "s")
        rows.append(
            (
                say.DRAPES_PLANNED,
                planned,
                say.pocket_safe_if_after(safe),
                _relation(
                    safe_draping,
                    case.draping_after_s,
                    say.POCKET_TOO_EARLY,
                    say.POCKET_LATE_ENOUGH,
                ),
            )
        )
    elif safe_draping is not None:
        rows.append(
            (
                say.SAFE_DRAPING_AFTER,
                format_duration(safe_draping),
                "",
                "",
            )
        )
    elif case.draping_after_s is not None:
        rows.append(
            (
                say.DRAPES_PLANNED,
                format_duration(case.draping_after_s),
                "",
                "",
            )
        )
    if case.first_activation_after_s is not None:
        rows.append(
            (
                say.ACTIVATION_PLANNED,
                format_duration(case.first_activation_after_s),
                "",
                "",
            )
        )
    spark = results.largest_spark_J if results.largest_spark_J is not None else case.largest_spark_J
    mie_label = say.mie_at_activation(case.mie_fuel)
    if case.mie_J is not None and spark == 0.0:
        no_spark = say.no_static_spark(results.no_spark_voltage_V)
        rows.append((mie_label, format_si(case.mie_J, "J"), no_spark, say.NO_SPARK))
    elif case.mie_J is not None and spark is not None:
        mie_text, spark_text = format_against_limit(case.mie_J, spark, "J")
        rows.append(
            (
                mie_label,
                mie_text,
                say.largest_static_spark(spark_text),
                say.SPARK_CAN_IGNITE if spark >= case.mie_J else say.SPARK_BELOW_MIE,
            )
        )
    else:
        rows.append((mie_label, format_si(case.mie_J, "J"), "", ""))

    rows += microshock_rows(case.id, results.electrical)
    lists = (
        (say.CASE_MATERIALS_BURNING, names_or_none(case.materials_sustain_burning)),
        (say.CASE_MATERIALS_CHARGE, names_or_none(case.materials_holding_charge)),
        (say.CASE_IGNITION_SOURCES, names_or_none(case.ignition_sources)),
    )
    return CaseView(
        heading=say.case_heading(case.id, case.procedure),
        triad=_triad(case, limit_text),
        triad_summary=say.triad_summary(case.triad.oxidant, case.triad.fuel, case.triad.ignition),
        quantities=with_probabilities(
            Table(
                headers=say.CASE_TABLE_HEADERS,
                rows=tuple(rows),
                widths=(2.5, 1.1, 1.9, 1.1),
            ),
            case,
            mie_label,
        ),
        lists=((say.CASE_SITE, case.site), *lists),
        notes=tuple(case.notes),
        oxygen_chart=with_band(_oxygen_chart(case, enriched), case.oxygen_curve, case, "oxygen"),
        film_chart=with_band(_film_chart(case), case.film_curve, case, "film"),
        spread=spread_view(case),
    )


def _triad(case: CaseResult, limit_text: str) -> tuple[TriadElement, ...]:
    triad = case.triad
    oxidant_why = say.triad_oxidant_why(
        format_si(case.oxidant_fraction, "fraction"),
        format_si(case.oxidant_at_activation_fraction, "fraction"),
        limit_text,
    )
    fuel_parts = []
    if case.drying_time_s is not None:
        fuel_parts.append(say.prep_dries_in(case.drying_time_s, HORIZON))
    if case.materials_sustain_burning:
        fuel_parts.append(say.materials_keep_burning(names(case.materials_sustain_burning)))
    ignition_why = names(case.ignition_sources) if case.ignition_sources else say.NONE_LISTED
    return (
        TriadElement(say.TRIAD_OXIDANT, triad.oxidant, say.presence(triad.oxidant), oxidant_why),
        TriadElement(
            say.TRIAD_FUEL,
            triad.fuel,
            say.presence(triad.fuel),
            "; ".join(fuel_parts) or say.NONE_FOUND,
        ),
        TriadElement(
            say.TRIAD_IGNITION, triad.ignition, say.presence(triad.ignition), ignition_why
        ),
    )


# --------------------------------------------------------------------------- room


def _floor_summary(results: Results) -> Table:
    floor = results.floor
    result = say.floor_result(floor.passed, len(floor.readings_outside), len(floor.readings_ohm))
    rows = [
        (
            say.FLOOR_WINDOW,
            say.floor_window(floor.criteria, floor.window_low_ohm, floor.window_high_ohm),
        ),
        (
            say.FLOOR_TEST_VOLTAGE,
            format_si(floor.test_voltage_V, "V") if floor.test_voltage_V else NO_VALUE,
        ),
        (say.FLOOR_READINGS, str(len(floor.readings_ohm))),
        (say.FLOOR_LOWEST, _against(floor.min_ohm, floor.window_low_ohm, "Ω")),
        (say.FLOOR_HIGHEST, _against(floor.max_ohm, floor.window_high_ohm, "Ω")),
        (say.FLOOR_MEAN, format_si(floor.mean_ohm, "Ω")),
        (say.FLOOR_GEOMETRIC_MEAN, format_si(floor.geometric_mean_ohm, "Ω")),
        (say.FLOOR_RESULT, result),
    ]
    if floor.point_to_point_ohm:
        rows.append((say.FLOOR_POINT_TO_POINT, _point_to_point(floor.point_to_point_ohm)))
    return Table(headers=(say.FLOOR, ""), rows=tuple(rows), widths=(1.0, 2.2))


def _point_to_point(readings: Sequence[float]) -> str:
    """A few readings one by one; a long list as its statistics."""
    if len(readings) <= SHORT_LIST:
        return ", ".join(format_si(r, "Ω") for r in readings)
    finite = [(r, n) for n, r in enumerate(readings, start=1) if math.isfinite(r)]
    if not finite:
        return say.readings_statistics(len(readings), NO_VALUE, 0, NO_VALUE, 0, NO_VALUE, NO_VALUE)
    lowest, lowest_at = min(finite)
    highest, highest_at = max(finite, key=lambda item: (item[0], -item[1]))
    values = [r for r, _ in finite]
    mean = math.fsum(values) / len(values)
    positive = [r for r in values if r > 0]
    gmean = (
        math.exp(math.fsum(math.log(r) for r in positive) / len(positive))
        if len(positive) == len(values)
        else None
    )
    return say.readings_statistics(
        len(readings),
        format_si(lowest, "Ω"),
        lowest_at,
        format_si(highest, "Ω"),
        highest_at,
        format_si(mean, "Ω"),
        format_si(gmean, "Ω"),
    )


def _floor_readings(results: Results) -> Table:
    """Every reading when there are a few; beyond SHORT_LIST, those outside the window only
    (at most LISTED_OUTSIDE), the statistics and the chart standing for the rest."""
    floor = results.floor
    low, high = floor.window_low_ohm, floor.window_high_ohm
    indices: Sequence[int] = range(len(floor.readings_ohm))
    if len(floor.readings_ohm) > SHORT_LIST:
        indices = sorted(floor.readings_outside)[:LISTED_OUTSIDE]
    rows = []
    for index in indices:
        reading = floor.readings_ohm[index]
        text, against = _reading_against_window(reading, low, high)
        if index in floor.readings_outside:
            below = low is not None and (
                high is None or _log_distance(reading, low) < _log_distance(reading, high)
            )
            state = say.reading_outside(below, against)
        else:
            state = say.WITHIN
        rows.append((str(index + 1), text, state))
    return Table(
        headers=say.READINGS_HEADERS,
        rows=tuple(rows),
        widths=(0.35, 1.0, 1.85),
        # a long list with none outside the window lists nothing: its note says so
        empty_text=say.NO_READINGS if len(floor.readings_ohm) <= SHORT_LIST else "",
    )


def _floor_readings_note(results: Results) -> str:
    floor = results.floor
    count = len(floor.readings_ohm)
    if count <= SHORT_LIST:
        return ""
    outside = len(floor.readings_outside)
    return say.readings_summarised(count, outside, min(outside, LISTED_OUTSIDE))


def names(items: Sequence[str]) -> str:
    """Names joined by commas, cut with "… and N more" past NAMES_SHOWN names or
    NAMES_CHARACTERS characters (the first name is always given)."""
    shown: list[str] = []
    used = 0
    for name in items:
        if shown and (len(shown) >= NAMES_SHOWN or used + len(name) > NAMES_CHARACTERS):
            break
        shown.append(name)
        used += len(name) + 2
    if len(shown) == len(items):
        return ", ".join(items)
    return say.names_cut(shown, len(items) - len(shown))


def names_or_none(items: Sequence[str]) -> str:
    return names(items) if items else say.NONE


def _log_distance(a: float, b: float) -> float:
    if a <= 0 or b <= 0:
        return abs(a - b)
    return abs(math.log10(a) - math.log10(b))


def _reading_against_window(
    reading: float, low: float | None, high: float | None
) -> tuple[str, str]:
    """The reading, printed against the nearer limit so that it never rounds across it."""
    limits = [x for x in (low, high) if x is not None]
    if not limits:
        return format_si(reading, "Ω"), ""
    nearest = min(limits, key=lambda x: _log_distance(reading, x))
    return format_against_limit(reading, nearest, "Ω")


def _against(value: float, limit: float | None, unit: str) -> str:
    """`value` alone, but with the figures it needs never to print equal to `limit`."""
    if limit is None:
        return format_si(value, unit)
    return format_against_limit(value, limit, unit)[0]


def _shock_table(results: Results) -> Table:
    floor = results.floor
    rows = [
        (say.SHOCK_SUPPLY, floor.supply_system),
        (
            say.SHOCK_TOUCH_VOLTAGE,
            format_si(floor.touch_voltage_V, "V") if floor.touch_voltage_V else NO_VALUE,
        ),
        (say.SHOCK_LOWEST_READING, _against(floor.min_ohm, floor.window_low_ohm, "Ω")),
        (say.SHOCK_BODY, _body_impedance(floor)),
        (say.SHOCK_PATH, format_si(floor.shock_path_ohm, "Ω")),
        (say.SHOCK_CURRENT, format_si(floor.shock_current_A, "A")),
    ]
    return Table(headers=(say.SHOCK, ""), rows=tuple(rows), widths=(1.6, 1.6))


def _body_impedance(floor: FloorResult) -> str:
    """The body impedance with its percentile and current path."""
    if not floor.body_impedance_ohm:
        return NO_VALUE
    text = format_si(floor.body_impedance_ohm, "Ω")
    if floor.body_current_path:
        basis = say.body_impedance_basis(
            floor.body_impedance_percentile_fraction,
            floor.body_current_path,
            floor.body_path_factor_fraction,
            floor.body_impedance_hand_to_hand_ohm,
        )
        text += f", {basis}"
    return text


def _spark(charge: ChargeResult, no_spark_V: float, lowest_mie_J: float | None) -> str:
    """The spark energy against the MIE, or that no spark can happen at this voltage."""
    if charge.body_voltage_V <= no_spark_V:
        return say.no_spark_at_voltage(no_spark_V)
    return _against(charge.spark_energy_J, lowest_mie_J, "J")


def _charges_table(
    charges: Sequence[ChargeResult], no_spark_V: float, lowest_mie_J: float | None
) -> Table:
    rows = []
    for charge in charges:
        who = say.who(charge.label, charge.count)
        voltage = _against(charge.body_voltage_V, no_spark_V, "V")
        if not charge.generation_limited:
            voltage += say.SATURATION_MARK
        rows.append(
            (
                who,
                charge.kind,
                charge.footwear or NO_VALUE,
                format_si(charge.leak_resistance_ohm, "Ω"),
                format_si(charge.capacitance_F, "F"),
                format_duration(charge.time_constant_s),
                voltage,
                format_si(charge.stored_charge_C, "C"),
                _spark(charge, no_spark_V, lowest_mie_J),
                format_duration(charge.settle_time_s),
            )
        )
    return Table(
        headers=say.CHARGES_HEADERS,
        rows=tuple(rows),
        widths=(1.7, 0.75, 1.0, 0.85, 0.7, 0.8, 0.85, 0.8, 0.85, 0.85),
        empty_text=say.NO_CHARGES,
    )


def _preparations_table(preparations: Sequence[PreparationResult]) -> Table:
    rows = []
    for prep in preparations:
        parts = ", ".join(
            say.component_text(
                c.name,
                format_si(c.mole_fraction, "fraction"),
                format_si(c.activity_coefficient, ""),
            )
            for c in prep.components
        )
        if prep.flash_point_K is not None:
            flash, film = format_against_limit(prep.flash_point_K, prep.film_temperature_K, "K")
        else:
            flash, film = say.NO_FLASH_POINT, format_si(prep.film_temperature_K, "K")
        if prep.saturated_vapour_fraction is not None and prep.lfl_fraction is not None:
            vapour, lfl = format_against_limit(
                prep.saturated_vapour_fraction, prep.lfl_fraction, "fraction"
            )
        else:
            vapour = format_si(prep.saturated_vapour_fraction, "fraction")
            lfl = format_si(prep.lfl_fraction, "fraction")
        rows.append(
            (
                say.preparation_label(prep.label, prep.id),
                parts or NO_VALUE,
                flash,
                lfl,
                vapour,
                film,
            )
        )
    return Table(
        headers=say.PREPARATIONS_HEADERS,
        rows=tuple(rows),
        widths=(1.6, 2.2, 0.8, 0.6, 0.9, 0.9),
        empty_text=say.NO_PREPARATIONS,
    )


def _preparation_notes(preparations: Sequence[PreparationResult]) -> tuple[str, ...]:
    """What the reader should know of each preparation (its methods go to the appendix)."""
    return tuple(say.preparation_note(p.id, note) for p in preparations for note in p.notes)


def _preparation_methods(preparations: Sequence[PreparationResult]) -> tuple[str, ...]:
    return tuple(say.preparation_methods(p.id, p.methods) for p in preparations if p.methods)


def _environment_table(results: Results) -> Table:
    env = results.environment
    rows = (
        (say.ENV_TEMPERATURE, format_si(env.temperature_K, "K")),
        (say.ENV_RH, format_si(env.relative_humidity_fraction, "fraction")),
        (say.ENV_AIR_CHANGES, format_si(env.air_changes_per_s, "per_s")),
        (say.ENV_VOLUME, format_si(env.volume_m3, "m3")),
        (
            say.ENV_MAINS,
            f"{format_si(env.mains_voltage_V, 'V')}, {format_si(env.mains_frequency_Hz, 'Hz')}, "
            f"{env.mains_system}",
        ),
        (
            say.ENV_ROOM_RISE,
            format_si(env.room_oxidant_rise_fraction, "fraction", sig=2),
        ),
    )
    return Table(headers=(say.ENVIRONMENT, ""), rows=rows, widths=(1.6, 1.6))


# --------------------------------------------------------------------------- charts


def _nice_step(span: float, count: int) -> float:
    raw = span / max(count, 1)
    magnitude = 10 ** math.floor(math.log10(raw))
    for multiple in (1.0, 2.0, 2.5, 5.0, 10.0):
        if raw <= multiple * magnitude * (1 + 1e-9):
            return multiple * magnitude
    return 10 * magnitude


def _tick_text(value: float, step: float) -> str:
    decimals = max(0, -math.floor(math.log10(step) + 1e-9))
    if abs(step * 10**decimals - round(step * 10**decimals)) > 1e-6:
        decimals += 1
    text = f"{value:.{decimals}f}"
    return "0" if float(text) == 0 else text.replace("-", "−")


def linear_axis(label: str, low: float, high: float, count: int = 6) -> Axis:
    """An axis from `low` to `high`, widened to round ticks.

    >>> [t for _, t in linear_axis("RH [%]", 10, 70).ticks]
    ['10', '20', '30', '40', '50', '60', '70']
    """
    if not (math.isfinite(low) and math.isfinite(high)):
        raise ValueError("axis limits must be finite")
    if high <= low:
        high = low + (abs(low) or 1.0)
    step = _nice_step(high - low, count)
    start = math.floor(low / step + 1e-9) * step
    stop = math.ceil(high / step - 1e-9) * step
    ticks = tuple(
        (start + i * step, _tick_text(start + i * step, step))
        for i in range(round((stop - start) / step) + 1)
    )
    return Axis(label=label, low=start, high=stop, log=False, ticks=ticks)


def log_axis(label: str, low: float, high: float, unit: str) -> Axis:
    """A logarithmic axis spanning whole decades, ticks labelled with SI prefixes.

    >>> [t for _, t in log_axis("R", 80e3, 2e6, "Ω").ticks]
    ['10 kΩ', '100 kΩ', '1 MΩ', '10 MΩ']
    """
    if not (low > 0 and high > 0):
        raise ValueError("a logarithmic axis needs positive limits")
    first = math.floor(math.log10(low) + 1e-9)
    last = math.ceil(math.log10(high) - 1e-9)
    if last <= first:
        last = first + 1
    every = 1 if last - first <= 7 else 2
    ticks = tuple(
        (10.0**k, format_si(10.0**k, unit, sig=1))
        for k in range(first, last + 1)
        if (k - first) % every == 0
    )
    return Axis(label=label, low=10.0**first, high=10.0**last, log=True, ticks=ticks)


def _finite_points(points: Sequence[tuple[float, float]]) -> list[tuple[float, float]]:
    return [(x, y) for x, y in points if math.isfinite(x) and math.isfinite(y)]


def _floor_chart(results: Results) -> Chart | None:
    floor = results.floor
    readings = [(i + 1, r) for i, r in enumerate(floor.readings_ohm) if r > 0 and math.isfinite(r)]
    if not readings:
        return None
    limits = [x for x in (floor.window_low_ohm, floor.window_high_ohm) if x is not None and x > 0]
    values = [r for _, r in readings] + limits
    y = log_axis(say.FLOOR_CHART_AXIS_Y, min(values) / 2, max(values) * 2, "Ω")
    count = len(floor.readings_ohm)
    every = max(1, math.ceil(count / 20))
    x = Axis(
        label=say.FLOOR_CHART_AXIS_X,
        low=0.5,
        high=count + 0.5,
        log=False,
        ticks=tuple((float(n), str(n)) for n in range(1, count + 1) if (n - 1) % every == 0),
    )
    inside = tuple((float(n), r) for n, r in readings if n - 1 not in floor.readings_outside)
    outside = tuple((float(n), r) for n, r in readings if n - 1 in floor.readings_outside)
    series = []
    if inside:
        series.append(Series(say.WITHIN_WINDOW, inside, 0, line=False, marker="dot"))
    if outside:
        series.append(Series(say.OUTSIDE_WINDOW, outside, 1, line=False, marker="cross"))
    lines = []
    if floor.window_low_ohm is not None and floor.window_low_ohm > 0:
        lines.append(RefLine("h", floor.window_low_ohm, say.lower_limit(floor.window_low_ohm)))
    if floor.window_high_ohm is not None and floor.window_high_ohm > 0:
        lines.append(RefLine("h", floor.window_high_ohm, say.upper_limit(floor.window_high_ohm)))
    return Chart(
        title=say.floor_chart_title(floor.criteria),
        x=x,
        y=y,
        series=tuple(series),
        lines=tuple(lines),
        caption=say.FLOOR_CHART_CAPTION,
    )


def _capacitance_of(results: Results, label: str) -> float | None:
    for charge in (*results.people, *results.trolleys):
        if charge.label == label:
            return charge.capacitance_F
    return None


def _voltage_chart(results: Results) -> Chart | None:
    curves = [(label, _finite_points(points)) for label, points in results.voltage_vs_rh]
    curves = [(label, [(rh, v) for rh, v in pts if v > 0]) for label, pts in curves]
    curves = [(label, pts) for label, pts in curves if pts]
    if not curves:
        return None
    rh_now = results.environment.relative_humidity_fraction
    total = len(curves)
    if total > CURVES_SHOWN:
        # the worst first: the highest voltage at (the point nearest) the room's humidity
        def now(points: Sequence[tuple[float, float]]) -> float:
            return min(points, key=lambda p: abs(p[0] - rh_now))[1]

        kept = sorted(range(total), key=lambda i: -now(curves[i][1]))[:CURVES_SHOWN]
        curves = [curves[i] for i in sorted(kept)]
    lines = [
        RefLine("h", results.no_spark_voltage_V, say.no_spark_below(results.no_spark_voltage_V))
    ]
    mie = results.lowest_site_mie_J
    if mie is not None and mie > 0:
        capacitances = {_capacitance_of(results, label) for label, _ in curves}
        # E = ½·C·V² solved for V: the voltage whose spark carries the site MIE. One
        # line per capacitance, highest first; one label for them all, on the top line,
        # listing the voltages in the order the lines run down the chart. A line at or
        # below the no-spark voltage is not drawn: no spark happens there.
        energy_lines = sorted(
            (
                (v, c)
                for v, c in (
                    (math.sqrt(2 * mie / c), c) for c in capacitances if c is not None and c > 0
                )
                if v > results.no_spark_voltage_V
            ),
            reverse=True,
        )
        listing = ", ".join(say.voltage_at_capacitance(v, c) for v, c in energy_lines)
        for index, (voltage, _) in enumerate(energy_lines):
            label = say.site_mie_line(mie, listing) if index == 0 else ""
            lines.append(RefLine("h", voltage, label))
    fuel = results.lowest_site_mie_fuel
    lines.append(RefLine("v", rh_now * 100, say.room_rh(rh_now), kind="event"))
    xs = [rh * 100 for _, pts in curves for rh, _ in pts] + [rh_now * 100]
    ys = [v for _, pts in curves for _, v in pts] + [
        line.at for line in lines if line.orientation == "h"
    ]
    return Chart(
        title=say.VOLTAGE_CHART_TITLE,
        x=linear_axis(say.VOLTAGE_CHART_AXIS_X, min(xs), max(xs)),
        y=log_axis(say.VOLTAGE_CHART_AXIS_Y, min(ys) / 1.5, max(ys) * 1.5, "V"),
        series=tuple(
            Series(_short(label), tuple((rh * 100, v) for rh, v in pts), style)
            for style, (label, pts) in enumerate(curves)
        ),
        lines=tuple(lines),
        caption=say.voltage_chart_caption(fuel)
        + (say.curves_shown(len(curves), total) if total > len(curves) else ""),
    )


def _short(label: str) -> str:
    """A label cut to LABEL_CHARACTERS with a mark, so that a chart's legend fits."""
    if len(label) <= LABEL_CHARACTERS:
        return label
    return label[: LABEL_CHARACTERS - 1].rstrip() + "…"


def _oxygen_chart(case: CaseResult, enriched: float) -> Chart | None:
    points = _finite_points(case.oxygen_curve)
    if len(points) < 2:
        return None
    if not case.oxygen_enriched and max(x for _, x in points) <= enriched:
        return None  # the site never reaches the enriched limit: no chart of a flat line
    # The curve's clock starts when the oxygen stops (ignite/simulate/cases.py), so the first
    # activation falls at the planned stop-before-activation time.
    events = []
    if case.stop_before_activation_s is not None and math.isfinite(case.stop_before_activation_s):
        events.append((case.stop_before_activation_s, say.EVENT_FIRST_ACTIVATION))
    t_max = max([t for t, _ in points] + [t for t, _ in events])
    scale, unit = time_scale(t_max)
    top = max([x for _, x in points] + [enriched]) * 100
    return Chart(
        title=say.oxygen_chart_title(case.id),
        x=linear_axis(
            say.oxygen_chart_axis_x(unit), min(t for t, _ in points) / scale, t_max / scale
        ),
        y=linear_axis(say.OXYGEN_CHART_AXIS_Y, 20.0, max(top, 25.0), count=4),
        series=(
            Series(say.OXYGEN_CHART_SERIES, tuple((t / scale, x * 100) for t, x in points), 0),
        ),
        lines=(
            RefLine("h", enriched * 100, say.enriched_above(format_si(enriched, "fraction"))),
            *(RefLine("v", t / scale, label, kind="event") for t, label in events),
        ),
    )


def _film_chart(case: CaseResult) -> Chart | None:
    points = _finite_points(case.film_curve)
    if len(points) < 2:
        return None
    events = [
        (t, label)
        for t, label in (
            (case.draping_after_s, say.EVENT_DRAPES_ON),
            (case.first_activation_after_s, say.EVENT_FIRST_ACTIVATION),
        )
        if t is not None and math.isfinite(t)
    ]
    t_max = max([t for t, _ in points] + [t for t, _ in events])
    scale, unit = time_scale(t_max)
    top = max(x for _, x in points) * 100
    return Chart(
        title=say.film_chart_title(case.id),
        x=linear_axis(
            say.film_chart_axis_x(unit), min(t for t, _ in points) / scale, t_max / scale
        ),
        y=linear_axis(say.FILM_CHART_AXIS_Y, 0.0, max(top, 10.0), count=4),
        series=(Series(say.FILM_CHART_SERIES, tuple((t / scale, x * 100) for t, x in points), 0),),
        lines=tuple(RefLine("v", t / scale, label, kind="event") for t, label in events),
    )


# --------------------------------------------------------------------------- electrical


def _cardiac_of(case_id: str, found: ElectricalResult | None) -> CardiacCaseResult | None:
    if found is None:
        return None
    return next((c for c in found.cases if c.case == case_id), None)


def microshock_rows(
    case_id: str, found: ElectricalResult | None
) -> list[tuple[str, str, str, str]]:
    """A case's microshock lines for its quantities table (none without a cardiac path)."""
    cardiac = _cardiac_of(case_id, found)
    if found is None or cardiac is None:
        return []
    rows = []
    for label, value, limit in (
        (say.MICROSHOCK_NORMAL, cardiac.cardiac_current_normal_A, found.microshock_limit_A),
        (
            say.MICROSHOCK_SINGLE_FAULT,
            cardiac.cardiac_current_single_fault_A,
            found.microshock_single_fault_limit_A,
        ),
    ):
        if value is None:
            continue
        measured, limit_text = format_against_limit(value, limit, "A")
        state = say.AT_OR_ABOVE_LIMIT if value >= limit else say.BELOW_LIMIT
        rows.append((label, measured, say.limit_of(limit_text), state))
    return rows


def _ohms_at_least(value: float, minimum: float | None) -> str:
    """A resistance, with the minimum it must reach beside it when there is one."""
    if minimum is None:
        return format_si(value, "Ω")
    shown, least = format_against_limit(value, minimum, "Ω")
    return f"{shown} ({say.limit_of('≥ ' + least)})"


def _electrical_view(results: Results) -> ElectricalView | None:
    found = results.electrical
    if found is None:
        return None
    supply = None
    if found.supply is not None:
        s = found.supply
        rows = [(say.SUPPLY_SYSTEM, s.system)]
        if s.transformer_rating_VA is not None:
            rows.append((say.SUPPLY_TRANSFORMER, say.volt_amperes(s.transformer_rating_VA)))
        if s.imd_alarm_setting_ohm is not None:
            rows.append(
                (say.SUPPLY_ALARM, _ohms_at_least(s.imd_alarm_setting_ohm, s.imd_alarm_min_ohm))
            )
        if s.imd_tested_alarm_at_ohm is not None:
            rows.append(
                (say.SUPPLY_TESTED, _ohms_at_least(s.imd_tested_alarm_at_ohm, s.imd_alarm_min_ohm))
            )
        if s.insulation_reading_ohm is not None:
            rows.append((say.SUPPLY_INSULATION, format_si(s.insulation_reading_ohm, "Ω")))
        supply = Table(headers=(say.HEADING_SUPPLY, ""), rows=tuple(rows), widths=(1.6, 1.6))
    bonding_rows = []
    for number, point in enumerate(found.bonding, start=1):
        reading, limit = format_against_limit(point.resistance_ohm, found.bonding_limit_ohm, "Ω")
        bonding_rows.append(
            (
                str(number),
                f"{point.point} ({say.BONDED_PART_WORDS.get(point.kind, point.kind)})",
                reading,
                say.within_or_above(point.above_limit, limit),
                format_si(point.fault_current_for_microshock_A, "A"),
            )
        )
    equipment_rows = []
    for device in found.equipment:
        readings = []
        for r in device.readings:
            if r.limit_A is None:
                text, limit = format_si(r.measured_A, "A"), say.NO_LIMIT
            else:
                text, limit = format_against_limit(r.measured_A, r.limit_A, "A")
                limit = say.within_or_above(r.above_limit, limit)
            readings.append(f"{say.reading_label(r.quantity, r.condition)}: {text} ({limit})")
        equipment_rows.append(
            (
                f"{device.id}\n{device.kind}",
                device.protection_class,
                device.applied_part,
                say.TEST_WORD.get(device.test, device.test),
                "\n".join(readings) or NO_VALUE,
            )
        )
    case_rows = []
    notes = []
    for cardiac in found.cases:
        if (
            cardiac.cardiac_current_normal_A is None
            or cardiac.cardiac_current_single_fault_A is None
        ):
            heart = say.microshock_no_direct_path()
        else:
            normal, limit = format_against_limit(
                cardiac.cardiac_current_normal_A, found.microshock_limit_A, "A"
            )
            fault, fault_limit = format_against_limit(
                cardiac.cardiac_current_single_fault_A, found.microshock_single_fault_limit_A, "A"
            )
            heart = say.pair_of(
                f"{normal} ({say.limit_of(limit)})", f"{fault} ({say.limit_of(fault_limit)})"
            )
        case_rows.append(
            (
                say.cardiac_subject(cardiac.case, cardiac.procedure),
                say.CARDIAC_PATH_WORDS.get(cardiac.cardiac_path, cardiac.cardiac_path),
                names_or_none(cardiac.connected),
                say.pair_of(
                    format_si(cardiac.patient_leakage_normal_A, "A"),
                    format_si(cardiac.patient_leakage_single_fault_A, "A"),
                ),
                f"{say.volts(cardiac.touch_voltage_V)}, "
                f"{format_si(cardiac.touch_cardiac_current_A, 'A')}",
                heart,
            )
        )
        if cardiac.counted_at_limit:
            notes.append(say.counted_at_limit(cardiac.counted_at_limit))
    return ElectricalView(
        leads=results.room.purpose == "recommissioning",
        intro=say.electrical_section_intro(results.room.purpose),
        supply=supply,
        bonding=Table(
            headers=say.BONDING_HEADERS,
            rows=tuple(bonding_rows),
            widths=(0.3, 2.2, 0.8, 1.5, 1.2),
            empty_text=say.NO_BONDING,
        ),
        bonding_heading=say.text_bonding_heading(found.bonding_limit_ohm),
        equipment=Table(
            headers=say.EQUIPMENT_HEADERS,
            rows=tuple(equipment_rows),
            widths=(1.8, 0.5, 0.6, 0.7, 3.2),
            empty_text=say.NO_EQUIPMENT,
        ),
        cases=Table(
            headers=say.MICROSHOCK_HEADERS,
            rows=tuple(case_rows),
            widths=(1.6, 0.8, 1.1, 1.1, 1.0, 1.5),
            empty_text=say.NO_CARDIAC_CASES,
        ),
        basis=say.microshock_basis(
            found.microshock_limit_A,
            found.microshock_single_fault_limit_A,
            found.cardiac_path_impedance_ohm,
        ),
        notes=tuple(notes),
        caution=say.ELECTRICAL_CAUTION,
    )


# --------------------------------------------------------------------------- spread


def spread_summary(results: Results) -> str:
    """How the ranges were sampled and the percentile waits are read at; '' for a nominal run."""
    u = results.uncertainty
    if u is None:
        return ""
    return say.spread_summary(u.samples, u.confidence, len(u.inputs))


def with_probabilities(table: Table, case: CaseResult, mie_label: str) -> Table:
    """The case table with a column of chances over the samples, on the rows they belong to."""
    if case.spread is None:
        return table
    by_label = {
        say.OXIDANT_AT_ACTIVATION: "oxidant_enriched_at_activation",
        say.DRYING_TIME: "prep_wet_at_activation",
        say.DRAPES_PLANNED: "pocket_above_margin_at_draping",
        mie_label: "spark_above_site_mie",
    }
    rows = []
    for row in table.rows:
        name = by_label.get(row[0])
        chance = case.spread.probability(name) if name else None
        rows.append((*row, say.probability_text(chance) if chance is not None else ""))
    return Table(
        headers=(*table.headers, say.SPREAD_PROBABILITY_COLUMN),
        rows=tuple(rows),
        widths=(*table.widths, 0.8),
        empty_text=table.empty_text,
    )


def with_band(
    chart: Chart | None,
    curve: Sequence[tuple[float, float]],
    case: CaseResult,
    which: str,
) -> Chart | None:
    """`chart` with the 5-95 % band over the samples shaded around its curve."""
    if chart is None or case.spread is None or not chart.series:
        return chart
    band = case.spread.oxygen_band if which == "oxygen" else case.spread.film_band
    drawn = chart.series[0].points
    scale = next(
        (t / x for (t, _), (x, _) in zip(_finite_points(curve), drawn, strict=False) if x > 0), None
    )
    if scale is None or not band:
        return chart
    lower = tuple(
        (t / scale, lo * 100) for t, lo, _ in band if math.isfinite(t) and math.isfinite(lo)
    )
    upper = tuple(
        (t / scale, hi * 100) for t, _, hi in band if math.isfinite(t) and math.isfinite(hi)
    )
    top = max([chart.y.high] + [y for _, y in upper])
    y = chart.y if top <= chart.y.high else linear_axis(chart.y.label, chart.y.low, top, count=4)
    return replace(
        chart,
        y=y,
        bands=(BandArea(say.SPREAD_BAND, lower, upper),),
        caption=say.SPREAD_BAND_CAPTION,
    )


def spread_view(case: CaseResult) -> SpreadView | None:
    """The case's figures over the samples, what to measure first, and the drivers chart."""
    spread = case.spread
    if spread is None:
        return None
    rows = []
    for name, band in spread.bands:
        label, unit = say.SPREAD_FIGURES[name]
        rows.append((label, say.spread_text(band.p50, band.p5, band.p95, unit)))
    for name, value in spread.decisions:
        rows.append((say.SPREAD_DECISIONS[name], format_duration(value)))
    for name, probability in spread.probabilities:
        rows.append(
            (
                f"{say.SPREAD_PROBABILITY_COLUMN}: {say.SPREAD_PROBABILITIES[name]}",
                say.probability_text(probability),
            )
        )
    advice = tuple(
        say.narrow_first(
            say.SPREAD_FIGURES[name][0],
            [(d.label, d.rank_correlation, d.measurable) for d in spread.drivers_of(name)],
        )
        for name, _ in spread.bands
        if name in say.SPREAD_DRIVEN and spread.drivers_of(name)
    )
    decisive = next(
        (name for name in ("safe_draping_after_s", "washout_s") if spread.drivers_of(name)),
        None,
    )
    drivers = None
    if decisive is not None:
        drivers = BarChart(
            title=say.drivers_chart_title(case.id, say.SPREAD_FIGURES[decisive][0]),
            bars=tuple((_short(d.label), d.rank_correlation) for d in spread.drivers_of(decisive)),
            axis_label=say.DRIVERS_AXIS,
        )
    return SpreadView(
        heading=say.SPREAD_HEADING,
        table=Table(
            headers=say.SPREAD_TABLE_HEADERS,
            rows=tuple(rows),
            widths=(2.2, 1.8),
        ),
        advice=advice,
        drivers=drivers,
    )
