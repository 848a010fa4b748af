"""Ranges in, probabilities out: the words of a run over the spread of its inputs."""

from __future__ import annotations

from collections.abc import Sequence

from ignite.wording.numbers import format_si

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
