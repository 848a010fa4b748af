"""Notes as codes: every code has its sentence, worded as the results have always said it.

Regression tests (our own earlier wording): the JSON record and the worksheet carry these
sentences, so a code's wording must not drift when the code moves.
"""

from __future__ import annotations

from typing import get_args

import pytest

from ignite.physics.vapour import FIRE_DATA_METHODS
from ignite.simulate import notes
from ignite.simulate.notes import Note, NoteCode, worded

EXAMPLES: list[tuple[Note, str]] = [
    (
        Note.of("component-left-out", name="chlorhexidine"),
        "chlorhexidine: non-volatile and without UNIFAC groups; left out of the liquid",
    ),
    (
        Note.of("component-not-fuel", name="glycerol", sources=FIRE_DATA_METHODS),
        "glycerol: no LFL in IEC 60079-20-1 (2010) or NFPA 497 (2008); not fuel",
    ),
    (
        Note.of("component-without-flash-point", name="dimethyl ether"),
        "dimethyl ether: no tabulated flash point; left out of the flash-point sum",
    ),
    (
        Note.of("drying-errs-long"),
        "the film cools as it evaporates and its vapour's weight damps convection; the "
        "model errs towards slow drying (a long drying time), and the drape pocket is fed "
        "at the fastest rate the film could have (a high pocket peak)",
    ),
    (Note.of("no-flammable-component"), "no flammable component"),
    (
        Note.of("hair", exposed_fraction=0.5, still_layer=0.005),
        "hair: liquid evaporates from 50% of the area through 5 mm of still air "
        "(modelling assumption)",
    ),
    (
        Note.of("pooling", volume_fraction=0.5, area_fraction=0.1),
        "pooling: 50% of the liquid pools on 10% of the area, out of the air stream "
        "(modelling assumption)",
    ),
    (
        Note.of("diffusivity-estimated", name="ethanol"),
        "ethanol: diffusivity in air by Fuller-Schettler-Giddings",
    ),
    (
        Note.of("open-air-not-forced"),
        "in open air, natural convection or diffusion, not the room's air stream alone, "
        "set the evaporation rate",
    ),
    (
        Note.of("wet-at-activation", left_fraction=0.4213, surface_fraction_of_lfl=2.449),
        "42% of the flammable liquid is still on the skin at first activation: the vapour "
        "at its surface is 2.4 times the LFL, whatever the pocket's average",
    ),
    (Note.of("not-dry-within-horizon", horizon=12 * 3600.0), "not dry within 12 h"),
]


def test_every_code_has_a_sentence_and_an_example():
    codes = set(get_args(NoteCode))
    assert set(notes._WORDING) == codes
    assert {note.code for note, _ in EXAMPLES} == codes


@pytest.mark.parametrize(("note", "sentence"), EXAMPLES, ids=[n.code for n, _ in EXAMPLES])
def test_each_note_is_worded_as_before(note, sentence):
    assert worded([note]) == (sentence,)


def test_notes_keep_their_order():
    assert worded([note for note, _ in EXAMPLES]) == tuple(s for _, s in EXAMPLES)


def test_a_note_without_its_values_cannot_be_worded():
    with pytest.raises(TypeError):
        worded([Note.of("hair", exposed_fraction=0.5)])
