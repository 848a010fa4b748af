"""Notes of the simulations as codes and values; their sentences live in `ignite.wording`.

A simulation says what a reader should know about its result (a component left out of
the liquid, a film still wet at first activation) as a `Note`: a code from `NoteCode`
and the values its sentence needs, in SI. `worded` turns notes into the sentences of
`ignite.wording.sentences` when a result record is built.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable
from dataclasses import dataclass
from typing import Literal

from ignite.wording import sentences

__all__ = ["Note", "NoteCode", "NoteValue", "worded"]

NoteCode = Literal[
    "component-left-out",
    "component-not-fuel",
    "component-without-flash-point",
    "drying-errs-long",
    "no-flammable-component",
    "hair",
    "pooling",
    "diffusivity-estimated",
    "open-air-not-forced",
    "wet-at-activation",
    "not-dry-within-horizon",
]
"""Every note a preparation's analysis or its drying can carry."""

NoteValue = float | str | tuple[str, ...]


@dataclass(frozen=True)
class Note:
    """Something a result should say: a code and the values (SI) its sentence needs.

    >>> Note.of("diffusivity-estimated", name="ethanol")
    Note(code='diffusivity-estimated', values=(('name', 'ethanol'),))
    """

    code: NoteCode
    values: tuple[tuple[str, NoteValue], ...] = ()

    @classmethod
    def of(cls, code: NoteCode, **values: NoteValue) -> Note:
        return cls(code, tuple(values.items()))


_WORDING: dict[NoteCode, Callable[..., str]] = {
    "component-left-out": sentences.note_component_left_out,
    "component-not-fuel": sentences.note_component_not_fuel,
    "component-without-flash-point": sentences.note_component_without_flash_point,
    "drying-errs-long": sentences.note_drying_errs_long,
    "no-flammable-component": sentences.note_no_flammable_component,
    "hair": sentences.note_hair,
    "pooling": sentences.note_pooling,
    "diffusivity-estimated": sentences.note_diffusivity_estimated,
    "open-air-not-forced": sentences.note_open_air_not_forced,
    "wet-at-activation": sentences.note_wet_at_activation,
    "not-dry-within-horizon": sentences.note_not_dry_within_horizon,
}


def worded(notes: Iterable[Note]) -> tuple[str, ...]:
    """The sentence of each note, in order.

    >>> worded([Note.of("not-dry-within-horizon", horizon=43200.0)])
    ('not dry within 12 h',)
    """
    return tuple(_WORDING[note.code](**dict(note.values)) for note in notes)
