"""Documents by purpose: headings, decisions, sign-off, glossary and the plan."""

from __future__ import annotations

from collections.abc import Mapping, Sequence

from ignite.records.results import SEVERITIES
from ignite.wording.numbers import format_duration, format_si
from ignite.wording.sentences.labels import (
    CAUTION_FIGURES,
    CAUTIONS,
    SIGN_OFF_DECISIONS,
    SIGN_OFF_PROMPT,
    WORKSHEET_HEADING,
    _plural,
    case_heading,
    findings_tally,
    floor_result,
    floor_window,
    prep_dries_in,
    severity_label,
    source_with_flag,
    tool_label,
    verdict,
)

# --- documents by purpose: headings, decisions, sign-off, glossary, the plan (report) ----

PURPOSE_PRE_LIST, PURPOSE_RECOMMISSIONING, PURPOSE_AUDIT = (
    "pre-list",
    "recommissioning",
    "periodic-audit",
)

DOCUMENT_HEADINGS = {
    PURPOSE_PRE_LIST: "List plan: fire and static ignition",
    PURPOSE_RECOMMISSIONING: "Commissioning record: floor, static and fire safety",
    PURPOSE_AUDIT: "Audit record: fire and static ignition",
}


def document_heading(purpose: str) -> str:
    """The worksheet's heading for its purpose (the old heading for an unknown one)."""
    return DOCUMENT_HEADINGS.get(purpose, WORKSHEET_HEADING)


def purpose_verdict(counts: Mapping[str, int], purpose: str) -> str:
    """The overall verdict in one line, worded for the decision the document is for."""
    if purpose == PURPOSE_PRE_LIST or purpose not in DOCUMENT_HEADINGS:
        return verdict(counts)
    high, medium, low, note = (counts.get(s, 0) for s in SEVERITIES)
    them = "it" if (high or medium) == 1 else "them"
    if purpose == PURPOSE_RECOMMISSIONING:
        if high:
            are = "it is" if high == 1 else "they are"
            return f"{_plural(high, 'high finding')}: do not accept the room until {are} addressed."
        if medium:
            return (
                f"No high findings; {_plural(medium, 'medium finding')}: accept the room only "
                f"with conditions that address {them}, or record who accepted {them} and why."
            )
    else:
        if high:
            return (
                f"{_plural(high, 'high finding')}: act before the next list in this room; "
                f"record an owner and a date for each action."
            )
        if medium:
            return (
                f"No high findings; {_plural(medium, 'medium finding')}: record an action, an "
                f"owner and a date for {them} before the next audit."
            )
    if low:
        return f"No findings above low; {_plural(low, 'low finding')} to review."
    if note:
        return f"No findings at or above low; {_plural(note, 'note')} for information."
    return "No findings at or above low."


SIGN_OFF_BY_PURPOSE: dict[str, tuple[str, tuple[str, ...]]] = {
    PURPOSE_PRE_LIST: (SIGN_OFF_PROMPT, SIGN_OFF_DECISIONS),
    PURPOSE_RECOMMISSIONING: (
        "Decision on the room (tick one):",
        (
            "Accept the room",
            "Accept the room with conditions: the actions listed, each with an owner and a date",
            "Do not accept the room",
        ),
    ),
    PURPOSE_AUDIT: (
        "Outcome of the audit (tick one):",
        (
            "No action needed",
            "Actions needed: the actions listed, each with an owner and a date",
            "Stop lists in this room until the actions are done",
        ),
    ),
}


def sign_off(purpose: str) -> tuple[str, tuple[str, ...]]:
    """The sign-off's prompt and decisions for a document's purpose."""
    return SIGN_OFF_BY_PURPOSE.get(purpose, SIGN_OFF_BY_PURPOSE[PURPOSE_PRE_LIST])


_RESPONSIBLE_FOR = {
    PURPOSE_PRE_LIST: "the decision to start the list",
    PURPOSE_RECOMMISSIONING: "the decision to accept the room",
    PURPOSE_AUDIT: "the audit's outcome and its actions",
}


def cautions(purpose: str) -> tuple[str, ...]:
    """The worksheet's cautions, the first worded for the decision the document is for."""
    decision = _RESPONSIBLE_FOR.get(purpose, _RESPONSIBLE_FOR[PURPOSE_PRE_LIST])
    first = (
        CAUTION_FIGURES + f" The people who sign this worksheet remain responsible for {decision}."
    )
    return (first, *CAUTIONS[1:])


SECTION_PLAN = "The plan, case by case"
PLAN_INTRO = (
    "Time runs from the end of the prep. Bars: the prep wet, the drape pocket's vapour "
    "above its margin of the LFL, the site's oxidant above the oxygen-enriched limit; an "
    "arrow where a bar runs past the axis, with the time it ends. Marks: D drapes on, S oxygen stopped, A first "
    "activation, as planned; ✗ a planned time that comes too early, with the earliest safe "
    "time (▲) beside it."
)
PLAN_ROW_WET = "prep wet"
PLAN_ROW_POCKET = "pocket > margin"
PLAN_ROW_OXIDANT = "O₂ enriched"
PLAN_MARK_DRAPE, PLAN_MARK_STOP, PLAN_MARK_ACTIVATE = "D", "S", "A"
PLAN_TOO_EARLY, PLAN_EARLIEST = "✗", "▲"
PLAN_NO_CASES = "No cases on the list: the plan is the room's own checks below."


def plan_axis_label(unit: str) -> str:
    return f"time from the end of the prep [{unit}]"


def plan_case_label(case_id: str, procedure: str) -> str:
    return f"Case {case_id}: {procedure}"


def plan_too_early(what: str, planned: str, earliest: str) -> str:
    """ "drapes at 3 min: too early, no earlier than 18 min"."""
    return f"{what} at {planned}: too early, no earlier than {earliest}"


def plan_stop_too_late(planned_before: str, needed_before: str) -> str:
    """ "oxygen stop 1 min before the first activation: too late, at least 6.5 min before"."""
    return (
        f"oxygen stop {planned_before} before the first activation: too late, "
        f"at least {needed_before} before it"
    )


PLAN_WHAT = {"drape": "drapes", "stop": "oxygen stop", "activate": "first activation"}

SECTION_ACTIONS = "Actions"
ACTIONS_INTRO = (
    "Each action once, worst finding first; tick it when it is in place. The numbers in "
    "brackets are the findings it answers."
)
NO_ACTIONS = "No actions: no finding asks for one."


def action_answers(numbers: Sequence[int]) -> str:
    """ "(findings 1, 4)"."""
    word = "finding" if len(numbers) == 1 else "findings"
    return f"({word} {', '.join(str(n) for n in numbers)})"


def finding_actions(numbers: Sequence[int]) -> str:
    """The actions a finding asks for, by their numbers in the action list."""
    if not numbers:
        return "none"
    word = "action" if len(numbers) == 1 else "actions"
    return f"{word} {', '.join(str(n) for n in numbers)} of the list"


CARD_ACTIONS = "Actions"


def finding_body(
    *, subject: str, value_label: str, value: str, why: str, source: str, actions: str
) -> str:
    """A finding's card in one paragraph: what, the value, why, the source, the actions."""
    parts = [f"{subject}.", f"{value_label}: {value}."]
    if why:
        parts.append(f"Why: {why}")
    parts += [f"Source: {source}.", f"Actions: {actions}."]
    return " ".join(parts)


def labelled_line(title: str, pairs: Sequence[Sequence[str]]) -> str:
    """ "On this case: Site head-neck; Ignition sources monopolar electrosurgery"."""
    return f"{title}: " + "; ".join(" ".join(pair) for pair in pairs) + "."


def card_source(source: str, flag: str, rule: str) -> str:
    """ "NFPA 99 (published) · rule oxygen.enriched-at-activation"."""
    return f"{source} ({flag}) · rule {rule}"


VALUE_LABELS = {"measured": "Measured", "planned": "Planned", "computed": "Computed"}
LIMIT_LABELS = {"threshold": "Threshold", "planned": "Planned", "computed": "Computed"}


def value_label(kind: str) -> str:
    """The head of a finding's value: measured only for a reading a person took."""
    return VALUE_LABELS.get(kind, "Computed")


def limit_label(kind: str) -> str:
    return LIMIT_LABELS.get(kind, "Threshold")


def value_against(value: str, value_kind: str, comparison: str, limit: str, limit_kind: str) -> str:
    """ "37.1 %, above the threshold 23.5 %"; "2.95 h, after the planned 6 min"."""
    if not limit:
        return value
    if limit_kind == "planned":  # planned limits are times
        later = _LATER.get(comparison, comparison)
        return f"{value}, {later} the planned {limit}"
    return f"{value}, {comparison} the {limit_label(limit_kind).lower()} {limit}"


_LATER = {
    "above": "later than",
    "at or above": "at or later than",
    "below": "earlier than",
    "at or below": "at or earlier than",
}


GLOSSARY_HEADING = "Words used here"
GLOSSARY = (
    ("MIE", "minimum ignition energy: the least spark energy that ignites a vapour"),
    ("LFL", "lower flammable limit: the least vapour in air that can burn"),
    ("LOI", "limiting oxygen index: the least oxygen in which a material keeps burning"),
    ("RH", "relative humidity"),
    ("O₂ enriched", "oxidant above the oxygen-enriched limit of the rules"),
    ("N₂O", "nitrous oxide, an oxidant like oxygen"),
)
FLAG_MEANINGS = {
    "published": "taken from the standard, handbook or paper named beside it",
    "memory": "recalled from the source named beside it, not yet checked against it",
    "to confirm": "recalled from the source named beside it, not yet checked against it",
    "common practice": "a fact of the trade, not from one source",
    "assumption": "a modelling choice of ignite, stated so that it can be challenged",
}


def flags_intro(meanings: str) -> str:
    return f"Each source carries a flag of where its value comes from: {meanings}."


def flag_meaning(flag: str) -> str:
    return f"{flag}: {FLAG_MEANINGS.get(flag, 'provenance as stated in the rule file')}"


SIGN_OFF_SUMMARY_HEADING = "Sign-off of the audit"
SIGN_OFF_SUMMARY_PROMPT = "Decision on this audit (tick one):"
SIGN_OFF_SUMMARY_DECISIONS = (
    "The rooms may be used as they are",
    "The rooms may be used once the actions in their worksheets are in place",
    "The rooms marked HIGH are not to be used until their actions are done",
)


# what each result a check reads is, in plain words (the rules appendix, `ignite rules`)
RESULT_WORDS = {
    "case.oxidant_at_activation": "the site's oxidant at the first activation",
    "case.open_delivery_oxidant": "the site's oxidant while open delivery flows",
    "case.triad_complete": "a complete fire triad at the site",
    "case.draping_after": "the planned draping time",
    "case.first_activation_after": "the planned first activation",
    "case.drying_time": "the computed drying time of the prep",
    "case.drying_time_hair_or_pooling": "the computed drying time of prep in hair or pooled",
    "case.flammable_draping_after": "the planned draping time over a flammable prep",
    "case.pooled_flammable_prep": "flammable prep planned to pool",
    "case.pocket_peak": "the drape pocket's peak vapour, as a share of the LFL",
    "case.enriched_materials_burning": "materials that keep burning at the site's oxidant",
    "case.site_mie_with_charged_materials": "the site's MIE, with materials that hold charge",
    "charge.body_voltage": "the body voltage of a person or trolley",
    "charge.spark_energy": "the spark energy of a person or trolley",
    "charge.system_resistance": "person + footwear + floor resistance",
    "room.lowest_mie": "the lowest MIE of the fuels at the sites",
    "floor.lowest_reading": "the lowest floor reading",
    "floor.highest_reading": "the highest floor reading",
    "floor.mean_reading": "the average floor reading",
    "floor.shock_current": "the shock current through a person",
    "case.probability_wet_at_activation": "the chance the prep is still wet at the first "
    "activation, over the ranges",
    "case.probability_pocket_above_margin": "the chance the drape pocket exceeds its margin of "
    "the LFL, over the ranges",
    "case.probability_enriched_at_activation": "the chance the site is oxygen-enriched at the "
    "first activation, over the ranges",
    "case.probability_spark_above_mie": "the chance a spark exceeds the site's MIE, over the "
    "ranges",
    "electrical.bonding_resistance": "a bonding reading to the equipotential bonding bar",
    "electrical.imd_alarm_setting": "the insulation monitor's alarm setting",
    "electrical.imd_alarm_tested": "the insulation monitor's tested alarm point",
    "electrical.leakage_type_test": "a device's leakage reading (type test)",
    "electrical.leakage_type_test_limit": "the type-test leakage limit of the device's class",
    "electrical.leakage_recurrent": "a device's leakage reading (recurrent test)",
    "electrical.leakage_recurrent_limit": "the recurrent-test leakage limit of the device's class",
    "electrical.non_cf_on_cardiac_path": "a type B or BF device on a direct cardiac path",
    "electrical.cardiac_current_normal": "the current a case's cardiac path can carry, normal",
    "electrical.cardiac_current_single_fault": "the current a case's cardiac path can carry, "
    "single fault",
}


def result_words(name: str) -> str:
    """A result's plain words; its name where none are written yet."""
    return RESULT_WORDS.get(name, name)


# appendices
RULES_HEADERS = ("Rule\nkind", "Title", "Threshold", "Source", "Flag")
NO_RULES = "No rules were listed for this run."
METHODS_HEADERS = ("Method", "Published reference")
NO_METHODS = "No methods were listed for this run."

# charts
FLOOR_CHART_AXIS_Y = "point to ground"
FLOOR_CHART_AXIS_X = "reading number"
FLOOR_CHART_CAPTION = (
    "Logarithmic scale. Shock checks use the lowest reading, static checks the highest."
)


def floor_chart_title(criteria: str) -> str:
    return f"Floor readings against the {criteria} window"


def lower_limit(ohm: float) -> str:
    return f"lower limit {format_si(ohm, 'Ω')}"


def upper_limit(ohm: float) -> str:
    return f"upper limit {format_si(ohm, 'Ω')}"


VOLTAGE_CHART_TITLE = "Body voltage against relative humidity"
VOLTAGE_CHART_AXIS_X = "relative humidity [%]"
VOLTAGE_CHART_AXIS_Y = "voltage"


def site_mie_line(mie_J: float, listing: str) -> str:
    return f"lowest site MIE {format_si(mie_J, 'J')}: {listing}"


def voltage_at_capacitance(voltage_V: float, capacitance_F: float) -> str:
    return f"{format_si(voltage_V, 'V')} at {format_si(capacitance_F, 'F')}"


def room_rh(fraction: float) -> str:
    return f"room RH {format_si(fraction, 'fraction')}"


def voltage_chart_caption(fuel: str) -> str:
    return (
        "Each person or trolley on the room's leak path, walking or pushed. A spark needs "
        "more than the no-spark voltage; above a site-MIE line (one per capacitance) it "
        "can ignite the most easily ignited fuel at a site" + (f": {fuel}." if fuel else ".")
    )


def curves_shown(shown: int, total: int) -> str:
    """Added to the body-voltage chart's caption when it leaves curves out."""
    return f" Of {total} curves, the {shown} highest at the room's humidity are drawn."


def oxygen_chart_title(case_id: str) -> str:
    return f"Case {case_id}: oxidant at the site after oxygen stops"


def oxygen_chart_axis_x(unit: str) -> str:
    return f"time after oxygen stops [{unit}]"


OXYGEN_CHART_AXIS_Y = "oxidant [%]"
OXYGEN_CHART_SERIES = "oxidant at the site"
EVENT_FIRST_ACTIVATION = "first activation"
EVENT_DRAPES_ON = "drapes on"


def film_chart_title(case_id: str) -> str:
    return f"Case {case_id}: flammable liquid left on the skin"


def film_chart_axis_x(unit: str) -> str:
    return f"time after the end of prep [{unit}]"


FILM_CHART_AXIS_Y = "of the flammable liquid applied [%]"
FILM_CHART_SERIES = "flammable liquid left"

# the terminal table (`ignite check`): its own compact lines, the shared words above
TEXT_PEOPLE, TEXT_TROLLEYS = "People", "Trolleys"
TEXT_ROLE, TEXT_NAME = "role", "name"
TEXT_CHARGES_HEADERS = (
    "n",
    "footwear",
    "leak path",
    "C",
    "τ",
    "voltage",
    "charge",
    "spark",
    "settle",
)
"""The charge table's columns after the first (`TEXT_ROLE` or `TEXT_NAME`)."""
TEXT_PREPARATIONS_HEADERS = ("id", "flash point", "LFL", "saturated vapour", "film at")
TEXT_WARNINGS = "Warnings:"
TEXT_OUTSIDE_MARK = "*"
TEXT_NO_FUEL = "no fuel"


def text_room(name: str, room_id: str, purpose: str, assessed_on: str, assessor: str) -> str:
    return f"{name} ({room_id}): {purpose}, {assessed_on}, {assessor}"


def text_input(input_name: str, input_sha256: str, version: str) -> str:
    return f"Input {input_name}  sha256 {input_sha256[:16]}…  {tool_label(version)}"


def text_environment(
    temperature_K: float,
    rh_fraction: float,
    air_changes_per_s: float,
    volume_m3: float,
    mains_V: float,
    mains_Hz: float,
    mains_system: str,
) -> str:
    return (
        f"Environment: {format_si(temperature_K, 'K')}, RH {format_si(rh_fraction, 'fraction')}, "
        f"{air_changes_per_s * 3600:.3g} air changes/h, {volume_m3:.3g} m³; "
        f"mains {format_si(mains_V, 'V')} {mains_Hz:.0f} Hz {mains_system}"
    )


def text_floor(
    criteria: str,
    low: float | None,
    high: float | None,
    passed: bool,
    outside: int,
    readings: int,
) -> str:
    return f"Floor ({floor_window(criteria, low, high)}): {floor_result(passed, outside, readings)}"


def text_readings(readings: Sequence[str], any_outside: bool) -> str:
    """The readings line; those outside the window already carry `TEXT_OUTSIDE_MARK`."""
    return (
        "readings "
        + "  ".join(readings)
        + (f"   ({TEXT_OUTSIDE_MARK} outside)" if any_outside else "")
    )


def text_floor_statistics(low: float, high: float, mean: float, geometric_mean: float) -> str:
    return (
        f"lowest {format_si(low, 'Ω')}  highest {format_si(high, 'Ω')}  "
        f"mean {format_si(mean, 'Ω')}  geometric mean {format_si(geometric_mean, 'Ω')}"
    )


def text_shock(touch_V: float, path_ohm: float, body_ohm: float, current_A: float) -> str:
    return (
        f"shock: {format_si(touch_V, 'V')} across {format_si(path_ohm, 'Ω')} "
        f"(lowest reading + body {format_si(body_ohm, 'Ω')}) -> {format_si(current_A, 'A')}"
    )


def text_lowest_mie(mie_J: float | None, fuel: str) -> str:
    return f"Lowest MIE in the room: {format_si(mie_J, 'J')} ({fuel})"


def text_case_heading(case_id: str, procedure: str, site: str) -> str:
    return f"{case_heading(case_id, procedure)} ({site})"


def text_case_oxygen(
    at_site: float, at_activation: float, washout_s: float, stop_before_s: float | None
) -> str:
    return (
        f"oxidant at the site {format_si(at_site, 'fraction')}, at activation "
        f"{format_si(at_activation, 'fraction')}; washout to the enriched limit "
        f"{format_duration(washout_s)} (stop planned {format_duration(stop_before_s)} before)"
    )


def text_case_mie(mie_J: float | None, fuel: str, largest_spark_J: float | None) -> str:
    return (
        f"MIE at the site {format_si(mie_J, 'J')} ({fuel or TEXT_NO_FUEL}); "
        f"largest spark in the room {format_si(largest_spark_J, 'J')}"
    )


def text_prep_not_flammable(prep_id: str) -> str:
    return f"prep {prep_id}: no flammable component"


def text_prep_drying(
    drying_s: float | None,
    draping_s: float | None,
    activation_s: float | None,
    pocket_peak_of_lfl: float | None,
    safe_draping_s: float | None,
    horizon_s: float,
) -> str:
    return (
        f"{prep_dries_in(drying_s, horizon_s)}; drapes at "
        f"{format_duration(draping_s)}, first activation at {format_duration(activation_s)}; "
        f"pocket peak {format_si(pocket_peak_of_lfl, 'fraction')} of LFL; "
        f"safe to drape after {format_duration(safe_draping_s)}"
    )


def text_findings(counts: Mapping[str, int]) -> str:
    return f"Findings: {findings_tally(counts)}"


def text_finding_heading(severity: str, rule: str, subject: str) -> str:
    return f"{severity_label(severity)}  {rule}  ({subject})"


def text_source(source: str, flag: str) -> str:
    return f"source: {source_with_flag(source, flag)}"


def text_mitigation(mitigation: str) -> str:
    return f"-> {mitigation}"
