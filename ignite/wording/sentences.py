"""Every sentence a user reads, worded once.

Lower layers (physics, the simulations, the findings) return numbers and codes; the text
table, the JSON notes, the worksheet and the audit summary take their words from here, so
the same thing is said the same way everywhere.
"""

from __future__ import annotations

from collections.abc import Sequence

from ignite.wording.numbers import format_duration, format_si

# --- cautions, labels and verdicts (report) ------------------------------------------


# --- notes of the preparations, drying and the drape pocket (simulate) ----------------

# Each function words one `ignite.simulate.notes.Note`, by its code; values come in SI.


def note_component_left_out(name: str) -> str:
    return f"{name}: non-volatile and without UNIFAC groups; left out of the liquid"


def note_component_not_fuel(name: str, sources: tuple[str, ...]) -> str:
    return f"{name}: no LFL in {' or '.join(sources)}; not fuel"


def note_component_without_flash_point(name: str) -> str:
    return f"{name}: no tabulated flash point; left out of the flash-point sum"


def note_drying_time_is_a_floor() -> str:
    return (
        "the model errs towards fast evaporation (no evaporative cooling of the film, no "
        "damping of convection by the vapour's weight): the drying time is a floor"
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
        "in open air, natural convection over the warm film (or diffusion), not the "
        "room's air stream, set the evaporation rate"
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


# --- the room's warnings and the floor, charge and case notes (simulate) --------------

ISOLATED_SUPPLY_SHOCK = (
    "Isolated (IT) supply: a first insulation fault does not close this path; "
    "the current shown would flow after a second fault."
)

CLOSED_AIRWAY = "Closed airway: the pocket is taken at room air (no cuff leak assumed)."

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
    return f"Keep RH at or above {rh_needed:.0%} (humidity table), where the ventilation plant can hold it."


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
    drying_time: float | None,
    label_hair: float | None,
) -> str:
    """The draping advice: the wait, what sets it, and (`wet_where`: "in hair", "where it pooled"
    or "") how long the held liquid stays wet."""
    text = f"Drape no earlier than {format_duration(wait)} after the end of the prep"
    if computed_governs:
        text += " (computed: keeps the drape pocket within the margin of the LFL)."
    else:
        text += f" (the label's minimum; the computed pocket limit is {format_duration(computed_wait)})."
    if wet_where:
        text += (
            f" The liquid {wet_where} is computed to stay wet for {format_duration(drying_time)}"
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
