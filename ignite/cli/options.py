"""Options shared by `check`, `assess` and `audit`: how ranges are sampled."""

from __future__ import annotations

import click

from ignite.room.ranges import DEFAULT_SAMPLES, Sampling

samples_option = click.option(
    "--samples",
    type=click.IntRange(10, 100_000),
    default=None,
    help=f"Latin hypercube samples over the ranges (default {DEFAULT_SAMPLES}); also samples "
    "the rules' ranges for a room that gives none.",
)
nominal_option = click.option(
    "--nominal", is_flag=True, help="Central values only: do not sample the ranges."
)
confidence_option = click.option(
    "--confidence",
    type=click.FloatRange(50.0, 99.9),
    default=None,
    metavar="PERCENT",
    help="Percentile at which waits are read from their spread (default from rules/, 95).",
)


def sampling_of(samples: int | None, nominal: bool, confidence: float | None) -> Sampling:
    """The `Sampling` the three options ask for (the confidence given in percent)."""
    return Sampling(
        samples=samples,
        nominal=nominal,
        confidence=None if confidence is None else confidence / 100.0,
    )
