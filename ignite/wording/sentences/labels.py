"""Cautions, labels and verdicts: the text table, the worksheet and the audit summary."""

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


def triad_in_words(oxidant: bool, fuel: bool, ignition: bool) -> str:
    """ "oxidant ✓ · fuel ✓ · ignition source ✗ (not all three: no fire path as planned)"."""
    marks = " · ".join(
        f"{name} {'✓' if on else '✗'}"
        for name, on in (("oxidant", oxidant), ("fuel", fuel), ("ignition source", ignition))
    )
    if oxidant and fuel and ignition:
        return f"Fire triad: {marks}: all three can meet at the site."
    return f"Fire triad: {marks}: not all three as planned."


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
