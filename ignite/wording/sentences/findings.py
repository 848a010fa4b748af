"""Findings: their details and mitigations."""

from __future__ import annotations

import math
from collections.abc import Sequence

from ignite.wording.numbers import format_duration, format_si

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
