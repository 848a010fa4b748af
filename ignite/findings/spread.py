"""Probabilities over the spread of a room's inputs: the chance that a case meets a hazard.

Registered only as results; their checks (rules/checks-uncertainty.yaml) are bound for a
room assessed with ranges (`ignite.rules.bind`), and read the fraction of the samples in
which the hazard holds. Their texts quote the case's context (`ignite.findings.cases`)
with the probability and what to measure first to narrow it.
"""

from __future__ import annotations

from collections.abc import Iterator

from ignite.findings.cases import case_context, case_subject
from ignite.findings.registry import Item, Scope, result
from ignite.records.results import CaseResult
from ignite.wording import sentences

# the figure whose drivers say what would narrow each probability
_DRIVEN_BY = {
    "prep_wet_at_activation": "drying_time_s",
    "pocket_above_margin_at_draping": "pocket_vapour_peak_fraction_of_lfl",
    "oxidant_enriched_at_activation": "oxidant_at_activation_fraction",
    "spark_above_site_mie": "oxidant_at_activation_fraction",
}


def narrow_advice(case: CaseResult, probability: str) -> str:
    """Which one or two inputs to measure to narrow the figure behind a probability."""
    if case.spread is None:
        return ""
    figure = _DRIVEN_BY[probability]
    drivers = case.spread.drivers_of(figure)
    label = sentences.SPREAD_FIGURES[figure][0]
    return sentences.narrow_first(
        label, [(d.label, d.rank_correlation, d.measurable) for d in drivers]
    )


def _items(scope: Scope, probability: str) -> Iterator[Item]:
    for case in scope.results.cases:
        if case.spread is None:
            continue
        value = case.spread.probability(probability)
        if value is None:
            continue
        context = dict(case_context(scope, case))
        context["probability"] = sentences.probability_text(value)
        context["narrow_advice"] = narrow_advice(case, probability)
        yield Item(case_subject(case), value, context)


@result("case.probability_wet_at_activation", "fraction")
def _wet_at_activation(scope: Scope) -> Iterator[Item]:
    yield from _items(scope, "prep_wet_at_activation")


@result("case.probability_pocket_above_margin", "fraction")
def _pocket_above_margin(scope: Scope) -> Iterator[Item]:
    yield from _items(scope, "pocket_above_margin_at_draping")


@result("case.probability_enriched_at_activation", "fraction")
def _enriched_at_activation(scope: Scope) -> Iterator[Item]:
    yield from _items(scope, "oxidant_enriched_at_activation")


@result("case.probability_spark_above_mie", "fraction")
def _spark_above_mie(scope: Scope) -> Iterator[Item]:
    yield from _items(scope, "spark_above_site_mie")
