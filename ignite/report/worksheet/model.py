"""The worksheet as a view model: every number already formatted, no layout, no reportlab.

`build_view` turns `Results` (plus the rules and methods appendix rows and the room
file's text) into a `WorksheetView` of strings, small tables and chart specifications.
All rounding happens here, through `ignite.wording.numbers`: a value compared with a limit
is printed with `format_against_limit`, so it never rounds across the limit. The
renderer (`ignite.report.worksheet.pdf`) only lays these strings out.

Charts carry numbers (in the units their axes are labelled in) because they must be
drawn; their axes, tick labels and line labels are decided here too.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ignite.records.results import (
    SEVERITIES,
    CaseResult,
    ChargeResult,
    Finding,
    MethodRef,
    PreparationResult,
    Results,
    RuleRow,
    severity_rank,
)
from ignite.wording.numbers import (
    NO_VALUE,
    format_against_limit,
    format_duration,
    format_si,
)

SEVERITY_WORDS = {"high": "HIGH", "medium": "MEDIUM", "low": "LOW", "note": "NOTE"}
SEVERITY_MARKS = {"high": "■■■", "medium": "■■□", "low": "■□□", "note": "□□□"}
"""Severity in words and in a three-step mark: readable in black and white."""

TICK_BOX = "☐"

CAUTIONS = (
    "These figures support, and never replace, local codes, the manufacturer's instructions "
    "for every device and preparation, and licensed professional judgement. The people "
    "who sign this worksheet remain responsible for the decision to start the list.",
    "Label drying times remain the minimum: at least 3 min on hairless skin and up to 1 h "
    "in hair for alcohol-based preparations (published, product labels). A computed drying "
    "time shorter than the label never shortens the wait; a longer one lengthens it.",
    "Skin-model trials found prep visibly dry after about 40 to 60 s, yet fires still "
    "occurred after 3 min in some of them (published, Jones et al. 2017; Ryan et al. 2020): "
    "a computed time is a floor, never a licence.",
    "Never drape over pooled preparation; remove soaked linen and pads before draping "
    "(common practice).",
    "MIE is the least energy over all mixtures, at a 50 % ignition probability: a margin "
    "above it is not proof of safety. The drape pocket is treated as well mixed; real "
    "pockets have richer corners near the oxygen outlet.",
)

SIGN_OFF_ROLES = ("Prepared by", "Reviewed by")
SIGN_OFF_DECISIONS = (
    "Start the list as planned",
    "Start the list once the ticked mitigations are in place",
    "Do not start the list",
)


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
class Chart:
    title: str
    x: Axis
    y: Axis
    series: tuple[Series, ...]
    lines: tuple[RefLine, ...] = ()
    caption: str = ""


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


@dataclass(frozen=True)
class Footer:
    room_id: str
    input_sha256: str
    tool_version: str
    rules_digest: str


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
    findings = tuple(
        _finding_view(number, finding)
        for number, finding in enumerate(_worst_first(results.findings), start=1)
    )
    verdict, worst = _verdict(results.findings)
    people_and_trolleys = (*results.people, *results.trolleys)
    return WorksheetView(
        title=f"ignite worksheet — {room.id}",
        heading="Fire and static-ignition worksheet",
        subheading=f"{room.name} — room {room.id}",
        author=room.assessor,
        subject=f"{room.name}; input SHA-256 {results.input_sha256}",
        creation_date=_iso_date(room.assessed_on),
        header=(
            ("Room", room.id),
            ("Site", room.name),
            ("Purpose", room.purpose),
            ("Assessed on", room.assessed_on),
            ("Assessor", room.assessor),
            ("Room file", results.input_name),
            ("Tool", f"ignite {results.tool_version}"),
        ),
        verdict=verdict,
        verdict_severity=worst,
        tally=_tally(results.findings),
        warnings=tuple(results.warnings),
        findings=findings,
        no_findings_text="No rule gave a finding for this room and list.",
        cases=tuple(_case_view(case, results, enriched) for case in results.cases),
        no_cases_text="No cases on the list: this is an assessment of the room alone.",
        floor_summary=_floor_summary(results),
        floor_readings=_floor_readings(results),
        floor_chart=_floor_chart(results),
        shock=_shock_table(results),
        shock_note=results.floor.shock_note,
        charges=_charges_table(
            people_and_trolleys, results.no_spark_voltage_V, results.lowest_site_mie_J
        ),
        charges_note=(
            "† capped by the humidity-limited saturation voltage of the floor surface; "
            "otherwise set by the charge generation current times the leak path. "
            f"Settle time: standing still, until below the no-spark voltage "
            f"({format_si(results.no_spark_voltage_V, 'V')})."
        ),
        voltage_chart=_voltage_chart(results),
        preparations=_preparations_table(results.preparations),
        preparation_notes=_preparation_notes(results.preparations),
        environment=_environment_table(results),
        cautions=CAUTIONS,
        sign_off_roles=SIGN_OFF_ROLES,
        sign_off_decisions=SIGN_OFF_DECISIONS,
        rules=Table(
            headers=("Rule\nkind", "Title", "Threshold", "Source", "Flag"),
            rows=tuple(
                (f"{r.id}\n{r.kind}", r.title, r.threshold, r.source, r.flag) for r in rules
            ),
            widths=(2.3, 2.3, 1.6, 2.2, 1.0),
            empty_text="No rules were listed for this run.",
        ),
        methods=Table(
            headers=("Method", "Published reference"),
            rows=tuple((m.name, m.reference) for m in methods),
            widths=(1.0, 1.6),
            empty_text="No methods were listed for this run.",
        ),
        input_name=results.input_name,
        input_lines=tuple(line.expandtabs(4) for line in input_text.splitlines()),
        footer=Footer(
            room_id=room.id,
            input_sha256=results.input_sha256,
            tool_version=results.tool_version,
            rules_digest=results.rules_digest,
        ),
    )


def _iso_date(text: str) -> str | None:
    from datetime import date

    try:
        return date.fromisoformat(str(text).strip()).isoformat()
    except ValueError:
        return None


def _plural(count: int, word: str, plural: str | None = None) -> str:
    return f"{count} {word if count == 1 else (plural or word + 's')}"


# --------------------------------------------------------------------------- findings


def _worst_first(findings: Sequence[Finding]) -> list[Finding]:
    # sorted() is stable: findings of one severity keep the order evaluate.py gave them.
    return sorted(findings, key=lambda f: severity_rank(f.severity))


def _counts(findings: Sequence[Finding]) -> dict[str, int]:
    return {s: sum(1 for f in findings if f.severity == s) for s in SEVERITIES}


def _tally(findings: Sequence[Finding]) -> str:
    counts = _counts(findings)
    return " · ".join(f"{SEVERITY_MARKS[s]} {counts[s]} {s}" for s in SEVERITIES)


def _verdict(findings: Sequence[Finding]) -> tuple[str, str | None]:
    """One line in words, and the worst severity (None when there are no findings)."""
    counts = _counts(findings)
    high, medium, low, note = (counts[s] for s in SEVERITIES)
    if high:
        them = "it is" if high == 1 else "they are"
        return (
            f"{_plural(high, 'high finding')}: do not start the list until {them} addressed.",
            "high",
        )
    if medium:
        them = "it" if medium == 1 else "them"
        return (
            f"No high findings; {_plural(medium, 'medium finding')}: address {them} before "
            f"the list, or record who accepted {them} and why.",
            "medium",
        )
    if low:
        return (
            f"No findings above low; {_plural(low, 'low finding')} to review with the team.",
            "low",
        )
    if note:
        return (
            f"No findings at or above low; {_plural(note, 'note')} for information.",
            "note",
        )
    return "No findings at or above low.", None


def _amounts(finding: Finding) -> tuple[str, str]:
    """(measured, limit) as printed; the limit is "" when the rule states none."""
    measured, limit = finding.measured, finding.limit
    if limit.value is None and measured.unit in ("", "1") and measured.value in (0.0, 1.0):
        # a finding about presence (fire triad, a material that burns): 1 = present, 0 = absent
        present = measured.value == 1.0
        return (finding.comparison or "present") if present else "absent", ""
    if limit.value is None:
        return format_si(measured.value, measured.unit), ""
    if (
        measured.value is not None
        and limit.value is not None
        and measured.unit == limit.unit
        and not (math.isnan(measured.value) or math.isnan(limit.value))
    ):
        return format_against_limit(measured.value, limit.value, measured.unit)
    return format_si(measured.value, measured.unit), format_si(limit.value, limit.unit)


def _finding_view(number: int, finding: Finding) -> FindingView:
    measured, limit = _amounts(finding)
    return FindingView(
        number=number,
        severity=finding.severity,
        severity_word=SEVERITY_WORDS.get(finding.severity, finding.severity.upper()),
        severity_mark=SEVERITY_MARKS.get(finding.severity, "?"),
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
            "Oxidant at the site while oxygen flows",
            site,
            f"enriched above {site_limit}",
            "enriched" if case.oxygen_enriched else "not enriched",
        )
    )
    if case.buildup_s is not None:
        rows.append(
            (
                f"Time to reach {limit_text} after oxygen starts",
                format_duration(case.buildup_s),
                "",
                "",
            )
        )
    rows.append(
        (f"Washout to {limit_text} after oxygen stops", format_duration(case.washout_s), "", "")
    )
    if case.stop_before_activation_s is not None:
        needed = case.required_stop_s if case.required_stop_s is not None else case.washout_s
        planned, needed_text = format_against_limit(case.stop_before_activation_s, needed, "s")
        rows.append(
            (
                "Oxygen stopped before activation (planned)",
                planned,
                f"needed {needed_text}",
                _relation(
                    needed, case.stop_before_activation_s, "shorter than needed", "long enough"
                ),
            )
        )
    at_activation, activation_limit = format_against_limit(
        case.oxidant_at_activation_fraction, enriched, "fraction"
    )
    rows.append(
        (
            "Oxidant at the site at first activation",
            at_activation,
            f"enriched above {activation_limit}",
            _relation(case.oxidant_at_activation_fraction, enriched, "enriched", "not enriched"),
        )
    )
    if case.drying_time_s is not None and case.first_activation_after_s is not None:
        drying, activation = format_against_limit(
            case.drying_time_s, case.first_activation_after_s, "s"
        )
        rows.append(
            (
                "Prep drying time (flammable part gone)",
                drying,
                f"first activation at {activation}",
                _relation(
                    case.drying_time_s,
                    case.first_activation_after_s,
                    "still wet at activation",
                    "dry by activation",
                ),
            )
        )
    elif case.drying_time_s is not None:
        rows.append(
            ("Prep drying time (flammable part gone)", format_duration(case.drying_time_s), "", "")
        )
    if case.pocket_vapour_peak_fraction_of_lfl is not None:
        rows.append(
            (
                "Peak vapour in the drape pocket",
                format_si(case.pocket_vapour_peak_fraction_of_lfl, "fraction") + " of LFL",
                "",
                "",
            )
        )
    if case.draping_after_s is not None and case.safe_draping_after_s is not None:
        planned, safe = format_against_limit(case.draping_after_s, case.safe_draping_after_s, "s")
        rows.append(
            (
                "Drapes on after the end of prep (planned)",
                planned,
                f"pocket below the vapour margin if after {safe}",
                _relation(
                    case.safe_draping_after_s,
                    case.draping_after_s,
                    "too early for the pocket",
                    "late enough for the pocket",
                ),
            )
        )
    elif case.safe_draping_after_s is not None:
        rows.append(
            (
                "Draping that keeps the pocket below the vapour margin, after",
                format_duration(case.safe_draping_after_s),
                "",
                "",
            )
        )
    elif case.draping_after_s is not None:
        rows.append(
            (
                "Drapes on after the end of prep (planned)",
                format_duration(case.draping_after_s),
                "",
                "",
            )
        )
    if case.first_activation_after_s is not None:
        rows.append(
            (
                "First activation after the end of prep (planned)",
                format_duration(case.first_activation_after_s),
                "",
                "",
            )
        )
    spark = results.largest_spark_J if results.largest_spark_J is not None else case.largest_spark_J
    fuel = f" ({case.mie_fuel})" if case.mie_fuel else ""
    if case.mie_J is not None and spark is not None:
        mie_text, spark_text = format_against_limit(case.mie_J, spark, "J")
        rows.append(
            (
                f"MIE at the site at activation{fuel}",
                mie_text,
                f"largest static spark {spark_text}",
                "spark can ignite" if spark >= case.mie_J else "spark below the MIE",
            )
        )
    else:
        rows.append((f"MIE at the site at activation{fuel}", format_si(case.mie_J, "J"), "", ""))

    lists = (
        ("Materials that would keep burning", _names(case.materials_sustain_burning)),
        ("Materials holding charge at this RH", _names(case.materials_holding_charge)),
        ("Ignition sources", _names(case.ignition_sources)),
    )
    return CaseView(
        heading=f"Case {case.id}: {case.procedure}",
        triad=_triad(case, limit_text),
        triad_summary=_triad_summary(case),
        quantities=Table(
            headers=("Quantity", "Value", "Compared with", "Reading"),
            rows=tuple(rows),
            widths=(2.5, 1.1, 1.9, 1.1),
        ),
        lists=(("Site", case.site), *lists),
        notes=tuple(case.notes),
        oxygen_chart=_oxygen_chart(case, enriched),
        film_chart=_film_chart(case),
    )


def _names(names: Sequence[str]) -> str:
    return ", ".join(names) if names else "none"


def _triad(case: CaseResult, limit_text: str) -> tuple[TriadElement, ...]:
    triad = case.triad
    oxidant_why = (
        f"{format_si(case.oxidant_fraction, 'fraction')} while oxygen flows, "
        f"{format_si(case.oxidant_at_activation_fraction, 'fraction')} at activation; "
        f"enriched means above {limit_text}"
    )
    fuel_parts = []
    if case.drying_time_s is not None:
        fuel_parts.append(f"prep dries in {format_duration(case.drying_time_s)}")
    if case.materials_sustain_burning:
        fuel_parts.append(
            "materials that keep burning: " + ", ".join(case.materials_sustain_burning)
        )
    ignition_why = ", ".join(case.ignition_sources) if case.ignition_sources else "none listed"
    return (
        TriadElement("Oxidant", triad.oxidant, _state(triad.oxidant), oxidant_why),
        TriadElement("Fuel", triad.fuel, _state(triad.fuel), "; ".join(fuel_parts) or "none found"),
        TriadElement("Ignition source", triad.ignition, _state(triad.ignition), ignition_why),
    )


def _state(present: bool) -> str:
    return "present" if present else "absent"


def _triad_summary(case: CaseResult) -> str:
    triad = case.triad
    if triad.complete:
        return "Fire triad complete: oxidant, fuel and ignition source can meet at the site."
    missing = [
        name
        for name, present in (
            ("oxidant", triad.oxidant),
            ("fuel", triad.fuel),
            ("ignition source", triad.ignition),
        )
        if not present
    ]
    return f"Fire triad incomplete as planned: no {' and no '.join(missing)} at the site."


# --------------------------------------------------------------------------- room


def _window_text(low: float | None, high: float | None) -> str:
    if low is None and high is None:
        return "no limits"
    if low is None:
        return f"up to {format_si(high, 'Ω')}"
    if high is None:
        return f"above {format_si(low, 'Ω')}"
    return f"{format_si(low, 'Ω')} to {format_si(high, 'Ω')}"


def _floor_summary(results: Results) -> Table:
    floor = results.floor
    outside = len(floor.readings_outside)
    if floor.passed:
        result = "every reading within the window"
    elif outside:
        result = f"{outside} of {len(floor.readings_ohm)} readings outside the window"
    else:
        result = "outside the window"
    rows = [
        (
            "Window",
            f"{floor.criteria}: {_window_text(floor.window_low_ohm, floor.window_high_ohm)}",
        ),
        (
            "Test voltage",
            format_si(floor.test_voltage_V, "V") if floor.test_voltage_V else NO_VALUE,
        ),
        ("Readings, point to ground", str(len(floor.readings_ohm))),
        ("Lowest (worst for shock)", _against(floor.min_ohm, floor.window_low_ohm, "Ω")),
        ("Highest (worst for static)", _against(floor.max_ohm, floor.window_high_ohm, "Ω")),
        ("Mean", format_si(floor.mean_ohm, "Ω")),
        ("Geometric mean", format_si(floor.geometric_mean_ohm, "Ω")),
        ("Result", result),
    ]
    if floor.point_to_point_ohm:
        rows.append(
            ("Point to point", ", ".join(format_si(r, "Ω") for r in floor.point_to_point_ohm))
        )
    return Table(headers=("Floor", ""), rows=tuple(rows), widths=(1.0, 2.2))


def _floor_readings(results: Results) -> Table:
    floor = results.floor
    low, high = floor.window_low_ohm, floor.window_high_ohm
    rows = []
    for index, reading in enumerate(floor.readings_ohm):
        text, against = _reading_against_window(reading, low, high)
        if index in floor.readings_outside:
            below = low is not None and (
                high is None or _log_distance(reading, low) < _log_distance(reading, high)
            )
            state = f"outside: below {against}" if below else f"outside: above {against}"
        else:
            state = "within"
        rows.append((str(index + 1), text, state))
    return Table(
        headers=("#", "Reading", "Against the window"),
        rows=tuple(rows),
        widths=(0.35, 1.0, 1.85),
        empty_text="No floor readings.",
    )


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
        ("Supply system", floor.supply_system),
        (
            "Touch voltage",
            format_si(floor.touch_voltage_V, "V") if floor.touch_voltage_V else NO_VALUE,
        ),
        ("Lowest floor reading", _against(floor.min_ohm, floor.window_low_ohm, "Ω")),
        (
            "Body impedance (IEC 60479-1)",
            format_si(floor.body_impedance_ohm, "Ω") if floor.body_impedance_ohm else NO_VALUE,
        ),
        ("Shock path: floor + body, no footwear credit", format_si(floor.shock_path_ohm, "Ω")),
        ("Shock current (Ohm's law)", format_si(floor.shock_current_A, "A")),
    ]
    return Table(headers=("Shock", ""), rows=tuple(rows), widths=(1.6, 1.6))


def _charges_table(
    charges: Sequence[ChargeResult], no_spark_V: float, lowest_mie_J: float | None
) -> Table:
    rows = []
    for charge in charges:
        who = charge.label if charge.count == 1 else f"{charge.label} ×{charge.count}"
        voltage = _against(charge.body_voltage_V, no_spark_V, "V")
        if not charge.generation_limited:
            voltage += " †"
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
                _against(charge.spark_energy_J, lowest_mie_J, "J"),
                format_duration(charge.settle_time_s),
            )
        )
    return Table(
        headers=(
            "Who",
            "Kind",
            "Footwear",
            "Leak path",
            "C",
            "τ = RC",
            "Voltage",
            "Charge",
            "Spark energy",
            "Settle time",
        ),
        rows=tuple(rows),
        widths=(1.7, 0.75, 1.0, 0.85, 0.7, 0.8, 0.85, 0.8, 0.85, 0.85),
        empty_text="No people or trolleys described.",
    )


def _preparations_table(preparations: Sequence[PreparationResult]) -> Table:
    rows = []
    for prep in preparations:
        parts = ", ".join(
            f"{c.name} {format_si(c.mole_fraction, 'fraction')} "
            f"(γ {format_si(c.activity_coefficient, '')})"
            for c in prep.components
        )
        if prep.flash_point_K is not None:
            flash, film = format_against_limit(prep.flash_point_K, prep.film_temperature_K, "K")
        else:
            flash, film = "none", format_si(prep.film_temperature_K, "K")
        if prep.saturated_vapour_fraction is not None and prep.lfl_fraction is not None:
            vapour, lfl = format_against_limit(
                prep.saturated_vapour_fraction, prep.lfl_fraction, "fraction"
            )
        else:
            vapour = format_si(prep.saturated_vapour_fraction, "fraction")
            lfl = format_si(prep.lfl_fraction, "fraction")
        rows.append((f"{prep.label} [{prep.id}]", parts or NO_VALUE, flash, lfl, vapour, film))
    return Table(
        headers=(
            "Preparation",
            "Liquid, mole fraction (UNIFAC γ)",
            "Flash point",
            "LFL",
            "Saturated vapour",
            "Film temperature",
        ),
        rows=tuple(rows),
        widths=(1.6, 2.2, 0.8, 0.6, 0.9, 0.9),
        empty_text="No flammable preparations stocked.",
    )


def _preparation_notes(preparations: Sequence[PreparationResult]) -> tuple[str, ...]:
    notes = []
    for prep in preparations:
        if prep.methods:
            notes.append(f"{prep.id}: methods: " + "; ".join(prep.methods) + ".")
        notes.extend(f"{prep.id}: {note}" for note in prep.notes)
    return tuple(notes)


def _environment_table(results: Results) -> Table:
    env = results.environment
    rows = (
        ("Temperature", format_si(env.temperature_K, "K")),
        ("Relative humidity", format_si(env.relative_humidity_fraction, "fraction")),
        ("Air changes", format_si(env.air_changes_per_s, "per_s")),
        ("Room volume", format_si(env.volume_m3, "m3")),
        (
            "Mains",
            f"{format_si(env.mains_voltage_V, 'V')}, {format_si(env.mains_frequency_Hz, 'Hz')}, "
            f"{env.mains_system}",
        ),
        (
            "Whole-room oxidant rise from open delivery",
            format_si(env.room_oxidant_rise_fraction, "fraction", sig=2),
        ),
    )
    return Table(headers=("Environment", ""), rows=rows, widths=(1.6, 1.6))


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


def _time_scale(seconds: float) -> tuple[float, str]:
    """(seconds per axis unit, unit name) for a time axis reaching `seconds`."""
    if seconds <= 180:
        return 1.0, "s"
    if seconds <= 3 * 3600:
        return 60.0, "min"
    return 3600.0, "h"


def _finite_points(points: Sequence[tuple[float, float]]) -> list[tuple[float, float]]:
    return [(x, y) for x, y in points if math.isfinite(x) and math.isfinite(y)]


def _floor_chart(results: Results) -> Chart | None:
    floor = results.floor
    readings = [(i + 1, r) for i, r in enumerate(floor.readings_ohm) if r > 0 and math.isfinite(r)]
    if not readings:
        return None
    limits = [x for x in (floor.window_low_ohm, floor.window_high_ohm) if x is not None and x > 0]
    values = [r for _, r in readings] + limits
    y = log_axis("point to ground", min(values) / 2, max(values) * 2, "Ω")
    count = len(floor.readings_ohm)
    every = max(1, math.ceil(count / 20))
    x = Axis(
        label="reading number",
        low=0.5,
        high=count + 0.5,
        log=False,
        ticks=tuple((float(n), str(n)) for n in range(1, count + 1) if (n - 1) % every == 0),
    )
    inside = tuple((float(n), r) for n, r in readings if n - 1 not in floor.readings_outside)
    outside = tuple((float(n), r) for n, r in readings if n - 1 in floor.readings_outside)
    series = []
    if inside:
        series.append(Series("within the window", inside, 0, line=False, marker="dot"))
    if outside:
        series.append(Series("outside the window", outside, 1, line=False, marker="cross"))
    lines = []
    if floor.window_low_ohm is not None and floor.window_low_ohm > 0:
        lines.append(
            RefLine(
                "h", floor.window_low_ohm, f"lower limit {format_si(floor.window_low_ohm, 'Ω')}"
            )
        )
    if floor.window_high_ohm is not None and floor.window_high_ohm > 0:
        lines.append(
            RefLine(
                "h", floor.window_high_ohm, f"upper limit {format_si(floor.window_high_ohm, 'Ω')}"
            )
        )
    return Chart(
        title=f"Floor readings against the {floor.criteria} window",
        x=x,
        y=y,
        series=tuple(series),
        lines=tuple(lines),
        caption=(
            "Logarithmic scale. Shock checks use the lowest reading, static checks the highest."
        ),
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
    lines = [
        RefLine(
            "h",
            results.no_spark_voltage_V,
            f"no spark below {format_si(results.no_spark_voltage_V, 'V')}",
        )
    ]
    mie = results.lowest_site_mie_J
    if mie is not None and mie > 0:
        capacitances = {_capacitance_of(results, label) for label, _ in curves}
        # E = ½·C·V² solved for V: the voltage whose spark carries the site MIE. One
        # line per capacitance, highest first; one label for them all, on the top line,
        # listing the voltages in the order the lines run down the chart.
        energy_lines = sorted(
            ((math.sqrt(2 * mie / c), c) for c in capacitances if c is not None and c > 0),
            reverse=True,
        )
        listing = ", ".join(f"{format_si(v, 'V')} at {format_si(c, 'F')}" for v, c in energy_lines)
        for index, (voltage, _) in enumerate(energy_lines):
            label = f"lowest site MIE {format_si(mie, 'J')}: {listing}" if index == 0 else ""
            lines.append(RefLine("h", voltage, label))
    fuel = results.lowest_site_mie_fuel
    rh_now = results.environment.relative_humidity_fraction
    lines.append(
        RefLine("v", rh_now * 100, f"room RH {format_si(rh_now, 'fraction')}", kind="event")
    )
    xs = [rh * 100 for _, pts in curves for rh, _ in pts] + [rh_now * 100]
    ys = [v for _, pts in curves for _, v in pts] + [
        line.at for line in lines if line.orientation == "h"
    ]
    return Chart(
        title="Body voltage against relative humidity",
        x=linear_axis("relative humidity [%]", min(xs), max(xs)),
        y=log_axis("voltage", min(ys) / 1.5, max(ys) * 1.5, "V"),
        series=tuple(
            Series(label, tuple((rh * 100, v) for rh, v in pts), style)
            for style, (label, pts) in enumerate(curves)
        ),
        lines=tuple(lines),
        caption=(
            "Each person or trolley on the room's leak path, walking or pushed. A spark needs "
            "more than the no-spark voltage; above a site-MIE line (one per capacitance) it "
            "can ignite the most easily ignited fuel at a site" + (f": {fuel}." if fuel else ".")
        ),
    )


def _oxygen_chart(case: CaseResult, enriched: float) -> Chart | None:
    points = _finite_points(case.oxygen_curve)
    if len(points) < 2:
        return None
    # The curve's clock starts when the oxygen stops (calculations.py), so the first
    # activation falls at the planned stop-before-activation time.
    events = []
    if case.stop_before_activation_s is not None and math.isfinite(case.stop_before_activation_s):
        events.append((case.stop_before_activation_s, "first activation"))
    t_max = max([t for t, _ in points] + [t for t, _ in events])
    scale, unit = _time_scale(t_max)
    top = max([x for _, x in points] + [enriched]) * 100
    return Chart(
        title=f"Case {case.id}: oxidant at the site after oxygen stops",
        x=linear_axis(
            f"time after oxygen stops [{unit}]", min(t for t, _ in points) / scale, t_max / scale
        ),
        y=linear_axis("oxidant [%]", 20.0, max(top, 25.0), count=4),
        series=(Series("oxidant at the site", tuple((t / scale, x * 100) for t, x in points), 0),),
        lines=(
            RefLine("h", enriched * 100, f"enriched above {format_si(enriched, 'fraction')}"),
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
            (case.draping_after_s, "drapes on"),
            (case.first_activation_after_s, "first activation"),
        )
        if t is not None and math.isfinite(t)
    ]
    t_max = max([t for t, _ in points] + [t for t, _ in events])
    scale, unit = _time_scale(t_max)
    top = max(x for _, x in points) * 100
    return Chart(
        title=f"Case {case.id}: flammable liquid left on the skin",
        x=linear_axis(
            f"time after the end of prep [{unit}]", min(t for t, _ in points) / scale, t_max / scale
        ),
        y=linear_axis("of the flammable liquid applied [%]", 0.0, max(top, 10.0), count=4),
        series=(
            Series("flammable liquid left", tuple((t / scale, x * 100) for t, x in points), 0),
        ),
        lines=tuple(RefLine("v", t / scale, label, kind="event") for t, label in events),
    )
