"""The patient environment's electrical safety."""

from __future__ import annotations

import math
from collections.abc import Sequence

from ignite.wording.numbers import format_si

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
