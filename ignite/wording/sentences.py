"""Every sentence a user reads, worded once.

Lower layers (physics, the simulations, the findings) return numbers and codes; the text
table, the JSON notes, the worksheet and the audit summary take their words from here, so
the same thing is said the same way everywhere.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence

from ignite.records.results import SEVERITIES
from ignite.wording.numbers import NO_VALUE, format_duration, format_si

# --- cautions, labels and verdicts (report) ------------------------------------------
# The terminal table (report/text.py), the worksheet's view model and renderer
# (report/worksheet/) and the CLI's caution read these; where the table and the
# worksheet say the same thing, they say it with the same words.

SEVERITY_WORDS = dict(zip(SEVERITIES, ("HIGH", "MEDIUM", "LOW", "NOTE"), strict=True))
SEVERITY_MARKS = dict(zip(SEVERITIES, ("■■■", "■■□", "■□□", "□□□"), strict=True))
"""Severity in words and in a three-step mark: readable in black and white."""

TICK_BOX = "☐"
PRESENT_MARK, ABSENT_MARK = "●", "○"
PRESENT, ABSENT = "present", "absent"
NONE = "none"
NONE_LISTED = "none listed"
NONE_FOUND = "none found"
EMPTY_FILE = "(empty)"


def severity_word(severity: str) -> str:
    """ "HIGH" for `high`; an unknown severity in capitals."""
    return SEVERITY_WORDS.get(severity, severity.upper())


def severity_mark(severity: str) -> str:
    """ "■■■" for `high`; "?" for an unknown severity."""
    return SEVERITY_MARKS.get(severity, "?")


def severity_label(severity: str) -> str:
    """Mark and word: "■■■ HIGH"."""
    return f"{severity_mark(severity)} {severity_word(severity)}"


def severity_key() -> str:
    """What the marks mean: "■■■ high, ■■□ medium, ■□□ low, □□□ note"."""
    return ", ".join(f"{SEVERITY_MARKS[s]} {s}" for s in SEVERITIES)


def _plural(count: int, word: str, plural: str | None = None) -> str:
    return f"{count} {word if count == 1 else (plural or word + 's')}"


def findings_tally(counts: Mapping[str, int]) -> str:
    """Every severity with its mark and count, worst first, zeros included."""
    return " · ".join(f"{SEVERITY_MARKS[s]} {counts.get(s, 0)} {s}" for s in SEVERITIES)


def verdict(counts: Mapping[str, int]) -> str:
    """The overall verdict in one line, from the number of findings of each severity."""
    high, medium, low, note = (counts.get(s, 0) for s in SEVERITIES)
    if high:
        them = "it is" if high == 1 else "they are"
        return f"{_plural(high, 'high finding')}: do not start the list until {them} addressed."
    if medium:
        them = "it" if medium == 1 else "them"
        return (
            f"No high findings; {_plural(medium, 'medium finding')}: address {them} before "
            f"the list, or record who accepted {them} and why."
        )
    if low:
        return f"No findings above low; {_plural(low, 'low finding')} to review with the team."
    if note:
        return f"No findings at or above low; {_plural(note, 'note')} for information."
    return "No findings at or above low."


NO_FINDINGS = "No rule gave a finding for this room and list."
NO_CASES = "No cases on the list: this is an assessment of the room alone."


def source_with_flag(source: str, flag: str) -> str:
    """A rule's source and its provenance flag: "NFPA 99 (published)"."""
    return f"{source} ({flag})"


# cautions: every output carries them (README, CLI, worksheet)
CAUTION_FIGURES = (
    "These figures support, and never replace, local codes, the manufacturer's instructions "
    "for every device and preparation, and licensed professional judgement."
)
CAUTION_LABEL_MINIMUM = (
    "Label drying times remain the minimum: at least 3 min on hairless skin and up to 1 h "
    "in hair for alcohol-based preparations (published, product labels)."
)
CAUTIONS = (
    CAUTION_FIGURES + " The people who sign this worksheet remain responsible for the "
    "decision to start the list.",
    CAUTION_LABEL_MINIMUM + " A computed drying time shorter than the label never shortens "
    "the wait; a longer one lengthens it.",
    "Skin-model trials are recalled to have found prep visibly dry after about 40 to 60 s, "
    "yet fires still occurred after 3 min in some of them (to confirm): a film "
    "that looks dry is no proof that it is. The computed drying time errs long (the film is "
    "cooled by its own evaporation, its vapour is heavier than air, the skin's stored heat "
    "is left out), and it never shortens the label's wait.",
    "Never drape over pooled preparation; remove soaked linen and pads before draping "
    "(common practice).",
    "MIE is the least energy over all mixtures, at a 50 % ignition probability: a margin "
    "above it is not proof of safety. The drape pocket is treated as well mixed; real "
    "pockets have richer corners near the oxygen outlet.",
)
"""The worksheet's cautions, one paragraph each."""

TEXT_CAUTION = f"Caution: {CAUTION_FIGURES} {CAUTION_LABEL_MINIMUM}"
"""The caution under the terminal table: the worksheet's first words on both."""

AUDIT_SUMMARY_CAUTION = (
    "The figures support, and never replace, local codes, the manufacturer's instructions and "
    "licensed professional judgement. Each room's worksheet carries its own inputs, methods, "
    "sources and cautions; read it before acting on a line of this summary."
)

AUDIT_SUMMARY_SEVERITY_WORDS = {
    "high": "HIGH",
    "medium": "MEDIUM",
    "low": "low",
    "note": "note",
    "none": "none",
}
"""Worst-finding words of the audit summary's room table (high and medium stand out)."""

CLI_CAUTION = (
    "The figures support, and never replace, local codes, the manufacturer's instructions "
    "and licensed professional judgement."
)
"""The CLI's caution (its help, its messages, and the JSON record's `caution` key)."""

# the worksheet: title, header, sections
WORKSHEET_HEADING = "Fire and static-ignition worksheet"


def tool_label(version: str) -> str:
    return f"ignite {version}"


def worksheet_title(room_id: str) -> str:
    """The PDF's title in its metadata."""
    return f"ignite worksheet — {room_id}"


def worksheet_subheading(room_name: str, room_id: str) -> str:
    return f"{room_name} — room {room_id}"


def worksheet_subject(room_name: str, input_sha256: str) -> str:
    """The PDF's subject in its metadata."""
    return f"{room_name}; input SHA-256 {input_sha256}"


HEADER_ROOM = "Room"
HEADER_SITE = "Location"
HEADER_PURPOSE = "Purpose"
HEADER_ASSESSED_ON = "Assessed on"
HEADER_ASSESSOR = "Assessor"
HEADER_ROOM_FILE = "Room file"
HEADER_TOOL = "Tool"
OVERALL = "Overall"
WARNINGS_INTRO = "The room file was accepted with these warnings:"

SECTION_FINDINGS = "1  Findings, worst first"
SECTION_CASES = "2  Cases on the list"
SECTION_ROOM = "3  The room"
SECTION_CAUTIONS = "4  Cautions"
SECTION_SIGN_OFF = "5  Sign-off"
HEADING_FLOOR_AND_SHOCK = "Floor and shock current"
HEADING_PEOPLE_AND_TROLLEYS = "People and trolleys"
HEADING_PREPARATIONS = "Preparations stocked"
APPENDIX_RULES = "Appendix A  Rules evaluated"
APPENDIX_RULES_INTRO = (
    "Every check and parameter in force, and the windows, tables, footwear classes, fuels, "
    "materials, ignition sources and sites this room uses, each with its threshold, source "
    "and provenance flag. `ignite rules` lists the rest; the rules SHA-256 in the footer "
    "covers them all."
)
APPENDIX_METHODS = "Appendix B  Methods"
APPENDIX_ROOM_FILE = "Appendix C  The room file as read"


def room_file_caption(input_name: str, input_sha256: str) -> str:
    return f"{input_name} — SHA-256 {input_sha256}"


# the page footer
def footer_room(room_id: str) -> str:
    return f"Room {room_id}"


def footer_page(number: int, total: int) -> str:
    return f"Page {number} of {total}"


def footer_input(input_sha256: str) -> str:
    return f"Input SHA-256  {input_sha256}"


def footer_rules(rules_digest: str) -> str:
    return f"Rules SHA-256  {rules_digest}"


# findings
SEVERITY_KEY_NOTE = (
    f"Severity is printed in words and as a mark ({severity_key()}). Each finding's "
    "actions are in the numbered list on page 1, where they are ticked."
)
CARD_RULE = "Rule"
CARD_SUBJECT = "Subject"
CARD_MEASURED = "Measured"
CARD_LIMIT = "Limit"
CARD_WHY = "Why"
CARD_SOURCE = "Source"
CARD_MITIGATIONS = "Mitigations"


def finding_heading(number: int, mark: str, word: str, title: str) -> str:
    """ "1. ■■■ HIGH — title": the head of a finding's card."""
    return f"{number}. {mark} {word} — {title}"


def limit_with_comparison(limit: str, comparison: str) -> str:
    return f"{limit} (measured is {comparison} the limit)"


def measured_against_limit(measured: str, comparison: str, limit: str) -> str:
    """One line of the terminal table: "measured 37.1 %, above the limit 23.5 %"."""
    return f"measured {measured}, {comparison} the limit {limit}"


# cases: the fire triad
TRIAD_OXIDANT = "Oxidant"
TRIAD_FUEL = "Fuel"
TRIAD_IGNITION = "Ignition source"


def presence(present: bool) -> str:
    return PRESENT if present else ABSENT


def triad_element(present: bool, name: str) -> str:
    """ "● Oxidant: present"."""
    return f"{PRESENT_MARK if present else ABSENT_MARK} {name}: {presence(present)}"


def triad_summary(oxidant: bool, fuel: bool, ignition: bool) -> str:
    """The fire triad of a case in one line, each side in words with a mark."""
    return triad_in_words(oxidant, fuel, ignition)


def triad_oxidant_why(while_flowing: str, at_activation: str, enriched_limit: str) -> str:
    return (
        f"{while_flowing} while oxygen flows, {at_activation} at activation; "
        f"enriched means above {enriched_limit}"
    )


def drying_time(seconds: float | None, horizon_s: float) -> str:
    """A computed drying time; an infinite one says the model found the prep still wet."""
    if seconds is not None and math.isinf(seconds):
        return f"over {format_duration(horizon_s)} (still wet at the end of the model's horizon)"
    return format_duration(seconds)


def beyond_horizon(horizon_s: float) -> str:
    """A computed time that does not come within the model's horizon (a prep still wet)."""
    return f"over {format_duration(horizon_s)} (the end of the model's horizon)"


def open_air_drying(seconds: float | None, horizon_s: float) -> str:
    """The prep's drying time if the site stays uncovered."""
    if seconds is None:
        return NO_VALUE
    if math.isinf(seconds):
        return beyond_horizon(horizon_s)
    return format_duration(seconds)


def activation_wait(seconds: float | None, horizon_s: float) -> str:
    """How long to wait before the first activation, from the computed drying time."""
    if seconds is not None and math.isinf(seconds):
        return (
            "the prep is seen to be dry: the model finds it still wet "
            f"{format_duration(horizon_s)} after the prep"
        )
    return f"{format_duration(seconds)} after the prep"


def prep_dries_in(seconds: float | None, horizon_s: float) -> str:
    return f"prep dries in {drying_time(seconds, horizon_s)}"


def materials_keep_burning(names: str) -> str:
    return f"materials that keep burning: {names}"


def case_heading(case_id: str, procedure: str) -> str:
    return f"Case {case_id}: {procedure}"


def names_or_none(names: Sequence[str]) -> str:
    return ", ".join(names) if names else NONE


ON_THIS_CASE = "On this case"
CASE_SITE = "Site"
CASE_MATERIALS_BURNING = "Materials that would keep burning"
CASE_MATERIALS_CHARGE = "Materials holding charge at this RH"
CASE_IGNITION_SOURCES = "Ignition sources"
CASE_TABLE_HEADERS = ("Quantity", "Computed or planned", "Compared with", "Result")

# cases: the quantities table (label, comparison and reading of each row)
OXIDANT_WHILE_FLOWING = "Oxidant at the site while oxygen flows"
OXIDANT_AT_ACTIVATION = "Oxidant at the site at first activation"
ENRICHED, NOT_ENRICHED = "enriched", "not enriched"
STOP_PLANNED = "Oxygen stopped before activation (planned)"
STOP_SHORT, STOP_LONG_ENOUGH = "shorter than needed", "long enough"
DRYING_TIME = "Prep drying time (flammable part gone)"
WET_AT_ACTIVATION, DRY_BY_ACTIVATION = "still wet at activation", "dry by activation"
POCKET_PEAK = "Peak vapour in the drape pocket"
DRAPES_PLANNED = "Drapes on after the end of prep (planned)"
POCKET_TOO_EARLY, POCKET_LATE_ENOUGH = "too early for the pocket", "late enough for the pocket"
SAFE_DRAPING_AFTER = "Draping that keeps the pocket below the vapour margin, after"
ACTIVATION_PLANNED = "First activation after the end of prep (planned)"
SPARK_CAN_IGNITE, SPARK_BELOW_MIE = "spark can ignite", "spark below the MIE"


def enriched_above(limit: str) -> str:
    return f"enriched above {limit}"


def buildup_to(limit: str) -> str:
    return f"Time to reach {limit} after oxygen starts"


def washout_to(limit: str) -> str:
    return f"Washout to {limit} after oxygen stops"


def needed(duration: str) -> str:
    return f"needed {duration}"


def first_activation_at(duration: str) -> str:
    return f"first activation at {duration}"


def of_lfl(fraction: str) -> str:
    return f"{fraction} of LFL"


def pocket_safe_if_after(duration: str) -> str:
    return f"pocket below the vapour margin if after {duration}"


def mie_at_activation(fuel: str) -> str:
    """The MIE row's label; `fuel` may be ""."""
    return "MIE at the site at activation" + (f" ({fuel})" if fuel else "")


def largest_static_spark(energy: str) -> str:
    return f"largest static spark {energy}"


# the room: floor, shock, people and trolleys, preparations, environment
def window_text(low: float | None, high: float | None) -> str:
    """A floor's resistance window: "50 kΩ to 25 MΩ", "up to 1 MΩ", "no limits"."""
    if low is None and high is None:
        return "no limits"
    if low is None:
        return f"up to {format_si(high, 'Ω')}"
    if high is None:
        return f"above {format_si(low, 'Ω')}"
    return f"{format_si(low, 'Ω')} to {format_si(high, 'Ω')}"


def floor_window(criteria: str, low: float | None, high: float | None) -> str:
    return f"{criteria}: {window_text(low, high)}"


def floor_result(passed: bool, outside: int, readings: int) -> str:
    """The floor's verdict: "every reading within the window", "2 of 5 readings outside..."."""
    if passed:
        return "every reading within the window"
    if outside:
        return f"{outside} of {readings} readings outside the window"
    return "outside the window"


FLOOR = "Floor"
FLOOR_WINDOW = "Window"
FLOOR_TEST_VOLTAGE = "Test voltage"
FLOOR_READINGS = "Readings, point to ground"
FLOOR_LOWEST = "Lowest (worst for shock)"
FLOOR_HIGHEST = "Highest (worst for static)"
FLOOR_MEAN = "Mean"
FLOOR_GEOMETRIC_MEAN = "Geometric mean"
FLOOR_RESULT = "Result"
FLOOR_POINT_TO_POINT = "Point to point"
READINGS_HEADERS = ("#", "Reading", "Against the window")
NO_READINGS = "No floor readings."
WITHIN = "within"
WITHIN_WINDOW, OUTSIDE_WINDOW = "within the window", "outside the window"


def reading_outside(below: bool, limit: str) -> str:
    return f"outside: below {limit}" if below else f"outside: above {limit}"


def readings_summarised(count: int, outside: int, listed: int) -> str:
    """Under a long list of floor readings: what the worksheet shows of them instead."""
    text = f"{count} readings: the figures above and the chart below summarise them; "
    if not outside:
        return text + "none is outside the window."
    if listed < outside:
        return (
            text + f"the first {listed} of the {outside} outside the window are listed "
            f"(… and {outside - listed} more, on the chart)."
        )
    return text + f"the {outside} outside the window are listed."


def readings_statistics(
    count: int, lowest: str, lowest_at: int, highest: str, highest_at: int, mean: str, gmean: str
) -> str:
    """A long list of readings in one line: count, extremes with their point numbers, means."""
    return (
        f"{count} readings: lowest {lowest} (point {lowest_at}), highest {highest} "
        f"(point {highest_at}), mean {mean}, geometric mean {gmean}"
    )


def names_cut(names: Sequence[str], more: int) -> str:
    """A list of names cut short, with how many are left out."""
    return f"{', '.join(names)} … and {more} more"


SHOCK = "Shock"
SHOCK_SUPPLY = "Supply system"
SHOCK_TOUCH_VOLTAGE = "Touch voltage"
SHOCK_LOWEST_READING = "Lowest floor reading"
SHOCK_BODY = "Body impedance (IEC 60479-1)"
SHOCK_PATH = "Shock path: floor + body, no footwear credit"
SHOCK_CURRENT = "Shock current (Ohm's law)"

CHARGES_HEADERS = (
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
)
NO_CHARGES = "No people or trolleys described."
SATURATION_MARK = " †"


def who(label: str, count: int) -> str:
    return label if count == 1 else f"{label} ×{count}"


def no_spark_below(voltage_V: float) -> str:
    """The no-spark line on the voltage chart."""
    return f"no spark below {format_si(voltage_V, 'V')}"


def charges_note(no_spark_voltage_V: float) -> str:
    return (
        "† capped by the humidity-limited saturation voltage of the floor surface; "
        "otherwise set by the charge generation current times the leak path. "
        f"Settle time: standing still, until below the no-spark voltage "
        f"({format_si(no_spark_voltage_V, 'V')})."
    )


PREPARATIONS_HEADERS = (
    "Preparation",
    "Liquid, mole fraction (UNIFAC γ)",
    "Flash point",
    "LFL",
    "Saturated vapour",
    "Film temperature",
)
NO_PREPARATIONS = "No flammable preparations stocked."
NO_FLASH_POINT = NONE


def preparation_label(label: str, prep_id: str) -> str:
    return f"{label} [{prep_id}]"


def component_text(name: str, mole_fraction: str, gamma: str) -> str:
    return f"{name} {mole_fraction} (γ {gamma})"


def preparation_methods(prep_id: str, methods: Sequence[str]) -> str:
    return f"{prep_id}: methods: " + "; ".join(methods) + "."


def preparation_note(prep_id: str, note: str) -> str:
    return f"{prep_id}: {note}"


ENVIRONMENT = "Environment"
ENV_TEMPERATURE = "Temperature"
ENV_RH = "Relative humidity"
ENV_AIR_CHANGES = "Air changes"
ENV_VOLUME = "Room volume"
ENV_MAINS = "Mains"
ENV_ROOM_RISE = "Whole-room oxidant rise from open delivery"

# sign-off
SIGN_OFF_ROLES = ("Prepared by", "Reviewed by")
SIGN_OFF_DECISIONS = (
    "Start the list as planned",
    "Start the list once the ticked mitigations are in place",
    "Do not start the list",
)
SIGN_OFF_PROMPT = "Decision for the list (tick one):"
SIGN_OFF_HEADERS = ("", "Name", "Signature", "Date")

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


def triad_in_words(oxidant: bool, fuel: bool, ignition: bool) -> str:
    """ "oxidant ✓ · fuel ✓ · ignition source ✗ (not all three: no fire path as planned)"."""
    marks = " · ".join(
        f"{name} {'✓' if on else '✗'}"
        for name, on in (("oxidant", oxidant), ("fuel", fuel), ("ignition source", ignition))
    )
    if oxidant and fuel and ignition:
        return f"Fire triad: {marks}: all three can meet at the site."
    return f"Fire triad: {marks}: not all three as planned."


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


# --- notes of the preparations, drying and the drape pocket (simulate) ----------------

# Each function words one `ignite.simulate.notes.Note`, by its code; values come in SI.


def note_component_left_out(name: str) -> str:
    return f"{name}: non-volatile and without UNIFAC groups; left out of the liquid"


def note_component_not_fuel(name: str, sources: tuple[str, ...]) -> str:
    return f"{name}: no LFL in {' or '.join(sources)}; not fuel"


def note_component_without_flash_point(name: str) -> str:
    return f"{name}: no tabulated flash point; left out of the flash-point sum"


def note_drying_errs_long() -> str:
    return (
        "the film cools as it evaporates and its vapour's weight damps convection; the "
        "model errs towards slow drying (a long drying time), and the drape pocket is fed "
        "at the fastest rate the film could have (a high pocket peak)"
    )


FILM_TEMPERATURE_MIN = "Coldest film until dry"
FILM_TEMPERATURE_MIN_READING = "below skin temperature: the film cools as it evaporates"
MASS_TRANSFER_REGIME = "Vapour carried off by"

MASS_TRANSFER_REGIME_WORDS = {
    "forced": "the room's air stream",
    "natural": "natural convection",
    "mixed": "air stream and natural convection",
    "diffusion-limited": "diffusion alone",
    "": "no evaporation",
}
"""How the mass-transfer regimes of the record read."""


def mass_transfer_regimes(open_air: str, under_drapes: str) -> str:
    """The regimes in open air (end of prepping) and under the drapes (at draping)."""
    words = MASS_TRANSFER_REGIME_WORDS
    if not under_drapes:
        return f"{words.get(open_air, open_air)} in open air"
    return (
        f"{words.get(open_air, open_air)} in open air; "
        f"{words.get(under_drapes, under_drapes)} under the drapes"
    )


def text_film_surface(coldest_K: float | None, open_air: str, under_drapes: str) -> str:
    """The terminal table's line on the film: its coldest temperature and the regimes."""
    coldest = "n/a" if coldest_K is None else f"{coldest_K - 273.15:.1f} °C"
    return (
        f"film at its coldest {coldest} until dry; vapour carried off by "
        f"{mass_transfer_regimes(open_air, under_drapes)}"
    )


def note_no_flammable_component() -> str:
    return "no flammable component"


def note_hair(exposed_fraction: float, still_layer: float) -> str:
    return (
        f"hair: liquid evaporates from {exposed_fraction:.0%} of the "
        f"area through {still_layer * 1e3:g} mm of still air "
        "(modelling assumption)"
    )


def note_pooling(volume_fraction: float, area_fraction: float) -> str:
    return (
        f"pooling: {volume_fraction:.0%} of the liquid pools on "
        f"{area_fraction:.0%} of the area, out of the air stream "
        "(modelling assumption)"
    )


def note_diffusivity_estimated(name: str) -> str:
    return f"{name}: diffusivity in air by Fuller-Schettler-Giddings"


def note_open_air_not_forced() -> str:
    return (
        "in open air, natural convection or diffusion, not the room's air stream alone, "
        "set the evaporation rate"
    )


def note_wet_at_activation(left_fraction: float, surface_fraction_of_lfl: float) -> str:
    return (
        f"{left_fraction:.0%} of the flammable liquid is still on the skin at first "
        f"activation: the vapour at its surface is {surface_fraction_of_lfl:.1f}"
        " times the LFL, whatever the pocket's average"
    )


def note_not_dry_within_horizon(horizon: float) -> str:
    """horizon : the longest time simulated [s]."""
    return f"not dry within {horizon / 3600:g} h"


def solve_subject(case_id: str, preparation: str, what: str) -> str:
    """What a solve that ran out of steps was computing, for its error."""
    return f"case {case_id}: {what} of preparation {preparation}"


# --- the room's warnings and the floor, charge and case notes (simulate) --------------

ISOLATED_SUPPLY_SHOCK = (
    "Isolated (IT) supply: a first insulation fault does not close this path; "
    "the current shown would flow after a second fault."
)

CLOSED_AIRWAY = "Closed airway: the pocket is taken at room air (no cuff leak assumed)."

NITROUS_OXIDE_OXIDANT_SIDE = (
    "Nitrous oxide is delivered: it supports burning, so the fire triad counts the oxidant "
    "side as present although the site's oxidant is not above the enriched limit."
)

NO_MIE_FOR_FLAMMABLE_COMPONENTS = (
    "no MIE in rules/fuels.yaml for the flammable components; static ignition not assessed"
)


def body_impedance_outside_table(voltage: float) -> str:
    return f"Body impedance taken at the nearest tabulated voltage; {voltage:.0f} V lies outside the table."


def rh_outside_humidity_table(rh: float, table_id: str) -> str:
    return (
        f"RH {rh:.0%} lies outside the humidity table "
        f"({table_id}); its end value was used, not an extrapolation"
    )


def room_oxidant_rise(rise: float, air_changes_per_s: float) -> str:
    return (
        f"Open oxygen raises the whole room's oxidant by {rise:.1%} at {air_changes_per_s * 3600:.0f} air changes/h: "
        "not negligible; check the ventilation."
    )


def open_delivery_away_from_site(delivery: str, site: str) -> str:
    return (
        f"Open {delivery} delivery at the face is taken not to reach the drape pocket at a "
        f"{site} site (rules/sites.yaml); the site is at room air."
    )


def fuel_in_room_air(fuel: str) -> str:
    return f"{fuel} in room air"


def fuel_at_case_oxidant(fuel: str, oxidant: float, case_id: str) -> str:
    return f"{fuel} at {oxidant:.1%} oxidant (case {case_id})"


def no_spark_at_voltage(no_spark_voltage_V: float) -> str:
    """The spark column of a person or trolley at or below the no-spark voltage."""
    return f"no spark (below {format_si(no_spark_voltage_V, 'V')})"


def no_static_spark(no_spark_voltage_V: float) -> str:
    """A case's spark comparison when no person or trolley is above the no-spark voltage."""
    return f"no static spark (every person and trolley at or below {format_si(no_spark_voltage_V, 'V')})"


NO_SPARK = "no spark"


def text_case_mie_without_spark(mie_J: float | None, fuel: str, no_spark_voltage_V: float) -> str:
    return (
        f"MIE at the site {format_si(mie_J, 'J')} ({fuel or TEXT_NO_FUEL}); "
        f"{no_static_spark(no_spark_voltage_V)}"
    )


def _ordinal(n: int) -> str:
    suffix = "th" if 10 <= n % 100 <= 20 else {1: "st", 2: "nd", 3: "rd"}.get(n % 10, "th")
    return f"{n}{suffix}"


def body_impedance_basis(
    percentile: float, path: str, path_factor: float, hand_to_hand_ohm: float
) -> str:
    """Which body impedance the shock current uses: "5th percentile, hand to feet (0.7 × 773 Ω hand to hand)"."""
    return (
        f"{_ordinal(round(percentile * 100))} percentile, {path} "
        f"({path_factor:g} × {format_si(hand_to_hand_ohm, 'Ω')} hand to hand)"
    )


def text_body_impedance(basis: str) -> str:
    return f"body impedance: IEC 60479-1, {basis}"


# --- findings: details and mitigations (findings) --------------------------------------

NO_MATERIAL_BURNS = "No listed material would keep burning at the site's oxidant."

SITE_NOT_ENRICHED_AT_ACTIVATION = (
    "The site is at or below the enriched limit when the ignition source is first used."
)

NO_FLAMMABLE_PREP = "No flammable prep in this case."

ESD_WALKING_TARGET = "the ESD walking-voltage limit"

NO_FUEL = "no fuel"

NO_FUEL_IN_TABLE = "no fuel in the rules' table"

NONE_PLANNED = "none planned"


def shock_path(touch_voltage: float, path_ohm: float) -> str:
    return f"{format_si(touch_voltage, 'V')} across {format_si(path_ohm, 'Ω')}"


def humidity_advice(rh_needed: float | None, table: Sequence[tuple[float, float]]) -> str:
    """Advice on the humidity that keeps the walking voltage low enough (`rh_needed` None: none does)."""
    if rh_needed is None:
        return (
            f"Humidity alone cannot do it: the humidity table still gives {format_si(table[-1][1], 'V')} "
            f"at {table[-1][0]:.0%} RH, its highest point."
        )
    if rh_needed <= table[0][0]:
        return "Humidity is not the limiting factor here (any RH in the table keeps the voltage low enough)."
    # rounded up to the whole percent: a humidity to hold must not be printed below the need
    percent = math.ceil(rh_needed * 100 - 1e-6)
    return (
        f"Keep RH at or above {percent}% (humidity table), where the ventilation plant can hold it."
    )


def no_spark_target(no_spark_voltage: float) -> str:
    return f"the no-spark voltage ({format_si(no_spark_voltage, 'V')})"


def footwear_advice(
    max_footwear: float | None, floor_max: float, label: str, target: str, classes: Sequence[str]
) -> str:
    """The largest sole resistance that keeps a person below `target` (None: the floor alone is too resistive)."""
    if max_footwear is None:
        return (
            f"The floor alone ({format_si(floor_max, 'Ω')} at its highest) is too resistive to keep "
            f"{label} below {target}: restore the floor."
        )
    fits = f" Footwear classes that meet it: {', '.join(classes)}." if classes else ""
    return (
        f"Footwear of at most {format_si(max_footwear, 'Ω')} through the soles (with the floor's highest reading) "
        f"keeps {label} below {target}.{fits}"
    )


def trolley_path_advice(max_path: float, label: str, target: str) -> str:
    """The largest castor or drag-chain path that keeps a trolley below `target` (<= 0: none does)."""
    if max_path <= 0:
        return f"The floor alone is too resistive to keep the {label} below {target}: restore the floor."
    return (
        f"A castor or drag-chain path of at most {format_si(max_path, 'Ω')} to the floor keeps the "
        f"{label} below {target}."
    )


def below_mie_only(max_leak: float, mie: float) -> str:
    return (
        f" (Up to {format_si(max_leak, 'Ω')} would keep the spark below the site MIE, "
        f"{format_si(mie, 'J')}, without preventing it.)"
    )


def materials_swap(burning: str, oxidant: float, loi_needed: float) -> str:
    return (
        f"{burning} would keep burning at {format_si(oxidant, 'fraction')} oxidant; "
        f"where the site stays enriched, choose materials whose LOI is above "
        f"{format_si(loi_needed, 'fraction')}, or bring the oxidant down."
    )


def stop_oxygen(
    required_stop: float | None, planned_stop: float | None, at_activation: float
) -> str:
    return (
        f"Stop open oxygen at least {format_duration(required_stop)} before the first "
        f"activation (computed washout of this pocket to the enriched limit); the planned "
        f"{format_duration(planned_stop)} leaves "
        f"{format_si(at_activation, 'fraction')} at the site."
    )


def drape_no_earlier_than(
    wait: float | None,
    computed_governs: bool,
    computed_wait: float | None,
    wet_where: str,
    drying_time: str,
    label_hair: float | None,
) -> str:
    """The draping advice: the wait, what sets it, and (`wet_where`: "in hair", "where it pooled"
    or "") how long the held liquid stays wet (`drying_time`, worded by `drying_time()`)."""
    if wait is not None and math.isinf(wait):
        return (
            "Do not drape over this prep while it is wet: whenever the drapes go on, the model "
            "finds the pocket's vapour above the margin of the LFL. Blot it, and let it dry in "
            "open air before draping."
        )
    text = f"Drape no earlier than {format_duration(wait)} after the end of the prep"
    if computed_governs:
        text += " (computed: keeps the drape pocket within the margin of the LFL)."
    else:
        text += f" (the label's minimum; the computed pocket limit is {format_duration(computed_wait)})."
    if wet_where:
        text += (
            f" The liquid {wet_where} is computed to stay wet for {drying_time}"
            + (
                f" (the label allows up to {format_duration(label_hair)} in hair)"
                if label_hair is not None
                else ""
            )
            + ": blot it, and keep ignition sources away until it is dry."
        )
    return text


def triad_sides(oxidant: bool, fuel: bool, ignition: bool) -> str:
    return ", ".join(
        name for name, on in (("oxidant", oxidant), ("fuel", fuel), ("ignition", ignition)) if on
    )


# --- the patient environment's electrical safety (findings, report) ---------------------
# Words of the `electrical` section: the findings' placeholders (ignite/findings/electrical.py),
# the terminal table, the worksheet's section and its caution.

ELECTRICAL_CAUTION = (
    "The electrical figures support, and never replace, the local electrical code, the "
    "manufacturer's instructions and the judgement of a qualified electrical or biomedical "
    "engineer. The limits are recalled (flag: to confirm) until checked against the edition of "
    "IEC 60364-7-710, IEC 60601-1 and IEC 62353 in force; currents to the heart are summed "
    "in phase, the largest they can add up to."
)
"""Beside every electrical figure: the terminal table, the worksheet and the README."""

SECTION_ELECTRICAL = "Patient environment: electrical safety"
ELECTRICAL_LEADS = (
    "A recommissioning record: the supply, the bonding and the equipment readings come first."
)
HEADING_SUPPLY = "Supply and insulation monitor"
HEADING_BONDING = "Supplementary equipotential bonding"
HEADING_EQUIPMENT = "Equipment in the patient environment"
HEADING_MICROSHOCK = "Cases: current that can reach the heart (microshock)"
NO_BONDING = "No bonding readings given."
NO_EQUIPMENT = "No equipment given."
NO_CARDIAC_CASES = "No case's cardiac path given."
SUPPLY_SYSTEM = "Supply"
SUPPLY_TRANSFORMER = "Isolating transformer"
SUPPLY_ALARM = "Insulation monitor alarm setting"
SUPPLY_TESTED = "Monitor alarmed on test at"
SUPPLY_INSULATION = "Insulation resistance as read"
BONDING_HEADERS = (
    "#",
    "Bonded part",
    "Reading",
    "Against the limit",
    "Fault current to microshock",
)
EQUIPMENT_HEADERS = ("Device", "Class", "Applied part", "Test", "Readings against limits")
MICROSHOCK_HEADERS = (
    "Case",
    "Cardiac path",
    "Connected",
    "Patient leakage, normal / single fault",
    "Touch voltage, its current",
    "To the heart, normal / single fault",
)
TEXT_ELECTRICAL = "Patient environment (electrical)"
WITHIN_LIMIT = "within"
ABOVE_LIMIT = "ABOVE the limit"
NO_LIMIT = "no limit"
ASSUMED_MARK = " (limit)"

QUANTITY_WORDS = {
    "earth_leakage": "earth leakage",
    "touch_current": "touch current",
    "patient_leakage": "patient leakage",
}
CONDITION_WORDS = {"normal": "normal condition", "single_fault": "single fault"}
CARDIAC_PATH_WORDS = {
    "central-line": "central line",
    "pacing-wires": "pacing wires",
    "none": "none",
}
TEST_WORDS = {"type": "type test (IEC 60601-1)", "recurrent": "recurrent test (IEC 62353)"}
BONDED_PART_WORDS = {"exposed": "exposed", "extraneous": "extraneous"}


def volts(value: float) -> str:
    """A touch voltage, in mV below 1 V: '2 V', '0.7 mV'."""
    if value != 0 and abs(value) < 1:
        return f"{value * 1e3:.3g} mV"
    return format_si(value, "V")


def volt_amperes(value: float | None) -> str:
    if value is None:
        return "—"
    return f"{value / 1e3:.3g} kVA" if value >= 1e3 else f"{value:.3g} VA"


def reading_label(quantity: str, condition: str) -> str:
    """ "patient leakage, single fault" """
    return f"{QUANTITY_WORDS.get(quantity, quantity)}, {CONDITION_WORDS.get(condition, condition)}"


def device_subject(device: str, kind: str, quantity: str, condition: str) -> str:
    return f"{device} ({kind}): {reading_label(quantity, condition)}"


def bonding_subject(point: str) -> str:
    return f"bonding: {point}"


IMD_SUBJECT = "insulation monitor"


def cardiac_subject(case: str, procedure: str) -> str:
    return f"case {case}: {procedure}" if procedure else f"case {case}"


def bonding_fault_current(
    point: str, reading: float, fault_current: float, microshock: float, impedance: float
) -> str:
    """The computed mitigation of a bonding reading: the current its touch voltage tolerates."""
    if math.isinf(fault_current):
        return f"{point} reads 0 Ω: no current through it lifts it off the bonding bar."
    return (
        f"At {format_si(reading, 'Ω')}, a current of {format_si(fault_current, 'A')} through this "
        f"conductor (earth leakage of the equipment bonded here, or a fault) lifts {point} "
        f"far enough to drive {format_si(microshock, 'A')} through a "
        f"{format_si(impedance, 'Ω')} cardiac path; a 10 A fault would lift it by "
        f"{volts(10.0 * reading)}. Until it is re-made, keep patients with a central line or "
        "pacing wires away from it."
    )


def bonding_at_limit(limit: float, fault_current: float) -> str:
    return (
        f"Re-made to the limit of {format_si(limit, 'Ω')}, the same touch voltage needs "
        f"{format_si(fault_current, 'A')}."
    )


def imd_advice(setting: float | None, limit: float) -> str:
    return (
        f"Set the insulation monitor to alarm at {format_si(limit, 'Ω')} or above (it is set to "
        f"{format_si(setting, 'Ω')}), then test it with a test resistor just below the setting "
        "and record the resistance at which it alarmed."
    )


def leakage_excess(reading: float, limit: float, quantity: str, condition: str) -> str:
    ratio = reading / limit if limit else math.inf
    return (
        f"Its {reading_label(quantity, condition)} of {format_si(reading, 'A')} is "
        f"{format_si(reading - limit, 'A')} over the limit of {format_si(limit, 'A')} "
        f"({ratio:.3g} times it)."
    )


def leakage_withdraw(device: str) -> str:
    return (
        f"Take {device} out of the patient environment and out of use; return it only after "
        "repair and a recurrent test within every limit."
    )


DEVICES_SHOWN = 10
"""Devices named in one finding before "… and N more"."""


def devices_with_applied_parts(devices: Sequence[tuple[str, str]]) -> str:
    """ "pump-2 (BF), esu-1 (B)", cut after DEVICES_SHOWN with "… and N more"."""
    named = [f"{name} ({part})" for name, part in devices[:DEVICES_SHOWN]]
    more = len(devices) - len(named)
    return ", ".join(named) + (f" … and {more} more" if more > 0 else "")


def non_cf_advice(devices: str, cardiac_path: str) -> str:
    path = CARDIAC_PATH_WORDS.get(cardiac_path, cardiac_path)
    return (
        f"While the {path} is in place, connect only type CF applied parts to this patient: "
        f"replace {devices} with CF-rated devices, or keep their applied parts off the patient "
        f"and away from the {path}."
    )


def microshock_advice(total: float, limit: float, largest: str, largest_current: float) -> str:
    """The computed mitigation of a case's current to the heart."""
    if total < limit:
        return ""
    excess = total - limit
    text = (
        f"The connected devices can drive {format_si(total, 'A')} to the heart, "
        f"{format_si(excess, 'A')} over {format_si(limit, 'A')}."
    )
    if largest and largest_current > 0:
        rest = total - largest_current
        verdict = "within the limit" if rest < limit else "still at or over the limit"
        text += (
            f" The largest part is {largest} ({format_si(largest_current, 'A')}); without it "
            f"the sum is {format_si(rest, 'A')}, {verdict}."
        )
    return text


def counted_at_limit(devices: Sequence[str]) -> str:
    if not devices:
        return ""
    return (
        f"No patient-leakage reading for {', '.join(devices)}: counted at the limit of its "
        "applied part (type test), the safe side; measure it to replace the assumption."
    )


def supply_alarm(setting: float | None, minimum: float | None) -> str:
    if setting is None:
        return "—"
    if minimum is None:
        return format_si(setting, "Ω")
    return f"{format_si(setting, 'Ω')} (at least {format_si(minimum, 'Ω')})"


def text_supply(
    system: str, transformer: float | None, alarm: str, tested: str, reading: str
) -> str:
    parts = [f"Supply: {system}"]
    if transformer is not None:
        parts.append(f"isolating transformer {volt_amperes(transformer)}")
    if alarm != "—":
        parts.append(f"insulation monitor alarm {alarm}")
    if tested != "—":
        parts.append(f"alarmed on test at {tested}")
    if reading != "—":
        parts.append(f"insulation reads {reading}")
    return "; ".join(parts)


def text_bonding_heading(limit: float) -> str:
    return f"Bonding to the equipotential bonding bar (limit {format_si(limit, 'Ω')})"


def within_or_above(above: bool, limit: str) -> str:
    return f"{ABOVE_LIMIT} {limit}" if above else f"{WITHIN_LIMIT} {limit}"


def microshock_basis(limit: float, fault_limit: float, impedance: float) -> str:
    return (
        f"Limits: {format_si(limit, 'A')} to the heart in normal condition, "
        f"{format_si(fault_limit, 'A')} in single fault (common practice); cardiac path "
        f"{format_si(impedance, 'Ω')} (assumption, the low end: the larger current)."
    )


def microshock_no_direct_path() -> str:
    return "no direct path to the heart: microshock does not apply"


def text_cardiac_case(
    case: str,
    path: str,
    connected: Sequence[str],
    patient: str,
    touch: str,
    heart: str,
) -> str:
    words = CARDIAC_PATH_WORDS.get(path, path)
    devices = ", ".join(connected) or "none"
    return (
        f"Case {case}: {words}; connected {devices}; patient leakage {patient}; "
        f"touch {touch}; to the heart {heart}"
    )


MICROSHOCK_NORMAL = "Current to the heart, normal condition"
MICROSHOCK_SINGLE_FAULT = "Current to the heart, one device in single fault"
AT_OR_ABOVE_LIMIT = "AT OR ABOVE the limit"
BELOW_LIMIT = "below the limit"
TEST_WORD = {"type": "type", "recurrent": "recurrent"}


def limit_of(limit: str) -> str:
    return f"limit {limit}"


def microshock_case_label(case: str, procedure: str, path: str) -> str:
    return f"{cardiac_subject(case, procedure)} ({CARDIAC_PATH_WORDS.get(path, path)})"


def pair_of(first: str, second: str) -> str:
    return f"{first} / {second}"


def electrical_section_intro(purpose: str) -> str:
    if purpose == "recommissioning":
        return ELECTRICAL_LEADS
    return (
        "The supply, the bonding and the equipment of the patient environment, and for each "
        "case given the current that can reach the heart through a central line or pacing wires."
    )


# --- names a room file may use; provenance flags (cli: `ignite rules`, issue 15) ------
NAMES_HEADING = (
    "Names a room file may use, by category (any case), with the keys that take them; "
    "`ignite rules NAME` shows the entry a name reaches."
)
NAMES_FOOTWEAR_NOTE = "or a measured resistance through the soles, e.g. 40 MΩ"
NAMES_SUBSTANCES_NOTE = (
    "any substance the chemicals tables know is accepted, by common name or CAS number; "
    "these have ignition data in rules/"
)


# --- ranges in, probabilities out (simulate/uncertainty, findings, report) -----------------
# The words of a run over the spread of its inputs: what each sampled input and figure is
# called, a spread as `median (p5–p95)`, the probabilities, and what to measure first.

_SPREAD_KEYS: dict[str, str] = {
    "environment.temperature": "room air temperature",
    "environment.relative_humidity": "relative humidity",
    "footwear": "sole resistance",
    "capacitance": "capacitance",
    "path_to_floor": "path to floor",
    "oxygen.flow": "oxygen flow",
    "oxygen.fraction": "oxygen fraction delivered",
    "oxygen.nitrous_oxide_flow": "nitrous oxide flow",
    "oxygen.stop_before_activation": "oxygen stop before activation",
    "drape_pocket.volume": "drape pocket volume",
    "drape_pocket.exchange": "drape pocket air exchange",
    "prep.volume": "volume of prep applied",
    "prep.area": "area prepped",
    "prep.skin_temperature": "skin temperature",
    "air_speed": "air speed over the site",
    "draping_after": "time to draping",
    "first_activation_after": "time to first activation",
}

SPREAD_FIGURES: dict[str, tuple[str, str]] = {
    # record key -> (label, unit for format_si)
    "drying_time_s": ("Drying time", "s"),
    "safe_draping_after_s": ("Safe draping time", "s"),
    "pocket_vapour_peak_fraction_of_lfl": ("Pocket vapour peak (of LFL)", "fraction"),
    "oxidant_at_activation_fraction": ("Oxidant at activation", "fraction"),
    "washout_s": ("Oxygen washout", "s"),
    "body_voltage_V": ("Body voltage", "V"),
    "spark_energy_J": ("Spark energy", "J"),
}

SPREAD_PROBABILITIES: dict[str, str] = {
    "prep_wet_at_activation": "prep still wet at first activation",
    "pocket_above_margin_at_draping": "pocket above its margin with drapes as planned",
    "oxidant_enriched_at_activation": "site oxygen-enriched at activation",
    "spark_above_site_mie": "a static spark above the site's MIE",
}

SPREAD_DRIVEN = (
    "drying_time_s",
    "safe_draping_after_s",
    "pocket_vapour_peak_fraction_of_lfl",
    "washout_s",
    "body_voltage_V",
)
"""The figures whose drivers the text names (what to measure first to narrow them)."""

SPREAD_HEADING = "Over the spread of the inputs"
SPREAD_PROBABILITY_COLUMN = "Chance"
SPREAD_DRIVERS_HEADING = "What drives it"
SPREAD_NOMINAL = "Central values only (--nominal): the ranges given were not sampled."


def spread_input_label(subject: str, key: str) -> str:
    """A sampled room-file input as a reader names it: 'case 1: volume of prep applied'.

    `subject` is '' for a room-wide key, else 'case 1', a role or a trolley's name; `key`
    the key path below it (prep.volume)."""
    words = _SPREAD_KEYS.get(key, key.replace("_", " ").replace(".", " "))
    return f"{subject}: {words}" if subject else words


def spread_text(p50: float | None, p5: float | None, p95: float | None, unit: str) -> str:
    """A spread as `median (p5–p95)`; one value when the three print the same."""
    middle, low, high = (format_si(v, unit) for v in (p50, p5, p95))
    if low == high == middle:
        return middle
    return f"{middle} ({low}–{high})"


def probability_text(probability: float | None) -> str:
    """A probability over the samples: '12 %', '< 0.1 %' when none of them, '—' when none."""
    if probability is None:
        return "—"
    if probability == 0.0:
        return "0 %"
    if probability < 0.001:
        return "< 0.1 %"
    return format_si(probability, "fraction", 2)


def spread_summary(samples: int, confidence: float, inputs: int) -> str:
    return (
        f"{inputs} uncertain input(s), {samples} Latin hypercube samples. Figures read "
        f"median (5th–95th percentile); waits are read at the {_percentile(confidence)} "
        "percentile (drape no earlier than, stop oxygen at least)."
    )


def _percentile(confidence: float) -> str:
    number = f"{confidence * 100:.4g}"
    suffix = "th"
    if number.endswith("1") and not number.endswith("11"):
        suffix = "st"
    elif number.endswith("2") and not number.endswith("12"):
        suffix = "nd"
    elif number.endswith("3") and not number.endswith("13"):
        suffix = "rd"
    return f"{number}{suffix}"


def confidence_stated(confidence: float) -> str:
    """The line every sampled output carries: the percentile decisions were read at."""
    return f"Waits read at the {_percentile(confidence)} percentile of their spread."


def narrow_first(figure: str, drivers: Sequence[tuple[str, float, bool]]) -> str:
    """What to measure first to narrow a figure: drivers are (label, Spearman ρ, measurable),
    strongest first; the first one or two are named."""
    if not drivers:
        return f"{figure}: the inputs given do not move it."
    named = []
    for label, rho, measurable in drivers[:2]:
        how = "measure" if measurable else "pin down (a rule value)"
        named.append(f"{how} {label} (ρ = {rho:+.2f})")
    return f"To narrow the {figure[:1].lower()}{figure[1:]}: " + "; then ".join(named) + "."


def spread_wait_note(confidence: float) -> str:
    return f" (the {_percentile(confidence)} percentile over the spread of the inputs)"


SPREAD_BAND = "5–95 % over the samples"
SPREAD_BAND_CAPTION = (
    "Shaded: 5th to 95th percentile over the spread of the inputs; line: central values."
)
SPREAD_TABLE_HEADERS = ("Figure", "Median (5th–95th percentile)")
SPREAD_DECISIONS: dict[str, str] = {
    "drape_no_earlier_than_s": "Drape no earlier than (at the confidence percentile)",
    "stop_oxygen_at_least_s": "Stop oxygen at least (at the confidence percentile)",
}
DRIVERS_AXIS = "Spearman rank correlation with the figure"


def drivers_chart_title(case_id: str, figure: str) -> str:
    return f"Case {case_id}: what drives the {figure[:1].lower()}{figure[1:]}"
