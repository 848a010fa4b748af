"""The room's warnings and the floor, charge and case notes."""

from __future__ import annotations

from ignite.wording.numbers import format_si
from ignite.wording.sentences.documents import TEXT_NO_FUEL

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
