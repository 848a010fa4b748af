"""Every sentence a user reads, worded once.

Lower layers (physics, the simulations, the findings) return numbers and codes; the text
table, the JSON notes, the worksheet and the audit summary take their words from here, so
the same thing is said the same way everywhere.
"""

from __future__ import annotations

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


# --- findings: details and mitigations (findings) --------------------------------------
