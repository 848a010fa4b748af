"""Notes of the preparations, their drying and the drape pocket."""

from __future__ import annotations

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
