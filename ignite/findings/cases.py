"""Results of the planned cases: oxygen at the site, the prep's drying and the drape pocket,
materials, and the fire triad."""

from __future__ import annotations

import math
from collections.abc import Iterator

from ignite.findings.registry import Context, Item, Scope, result
from ignite.records.results import CaseResult
from ignite.simulate.drying import HORIZON
from ignite.wording import sentences
from ignite.wording.numbers import format_duration, format_si

OPEN_DELIVERY = ("nasal-cannula", "face-mask")


def round_up(seconds: float | None) -> float | None:
    """Waits are given to the next 15 s (to the next minute past 10 min): never shorter than computed."""
    if seconds is None or math.isinf(seconds):
        return seconds
    step = 60.0 if seconds > 600 else 15.0
    return math.ceil(seconds / step - 1e-9) * step


def _subject(case: CaseResult) -> str:
    return f"case {case.id}: {case.procedure}"


def decided(case: CaseResult, name: str, nominal: float | None) -> float | None:
    """A wait a person acts on: over a spread, read at the confidence percentile
    (`ignite.simulate.uncertainty`), never below the central value's; else the central value."""
    found = case.spread.decision(name) if case.spread is not None else None
    if found is None or nominal is None:
        return nominal
    return max(found, nominal)


def _stop_advice(case: CaseResult) -> str:
    required = decided(case, "stop_oxygen_at_least_s", case.required_stop_s)
    if required is not None and required > 0:
        return sentences.stop_oxygen(
            round_up(required),
            case.stop_before_activation_s,
            case.oxidant_at_activation_fraction,
        )
    return sentences.SITE_NOT_ENRICHED_AT_ACTIVATION


def _drape_advice(case: CaseResult, scope: Scope) -> str:
    prep = scope.bound.prep
    safe = decided(case, "drape_no_earlier_than_s", case.safe_draping_after_s)
    if safe is None or not case.prep_flammable:
        return sentences.NO_FLAMMABLE_PREP
    label_minimum = prep.label_minimum_hairless if prep else None
    label_hair = prep.label_maximum_hair if prep else None
    wet_where = ("in hair" if case.hair else "where it pooled") if case.hair or case.pooling else ""
    return sentences.drape_no_earlier_than(
        wait=round_up(max(safe, label_minimum or 0.0)),
        computed_governs=safe >= (label_minimum or 0.0),
        computed_wait=round_up(safe),
        wet_where=wet_where,
        drying_time=sentences.drying_time(case.drying_time_s, HORIZON),
        label_hair=label_hair if case.hair and label_hair else None,
    )


def _materials_advice(case: CaseResult, scope: Scope) -> str:
    if not case.materials_sustain_burning:
        return sentences.NO_MATERIAL_BURNS
    return sentences.materials_swap(
        ", ".join(case.materials_sustain_burning),
        case.oxidant_fraction,
        case.oxidant_fraction + scope.bound.loi_allowance,
    )


def _context(scope: Scope, case: CaseResult) -> Context:
    prep = scope.bound.prep
    res = scope.results
    return {
        "procedure": case.procedure,
        "oxidant_site": format_si(case.oxidant_fraction, "fraction"),
        "oxidant_at_activation": format_si(case.oxidant_at_activation_fraction, "fraction"),
        "planned_stop": format_duration(case.stop_before_activation_s),
        "required_stop": format_duration(
            round_up(decided(case, "stop_oxygen_at_least_s", case.required_stop_s))
        ),
        "ceiling_stop": format_duration(round_up(case.ceiling_stop_s)),
        "stop_mitigation": _stop_advice(case),
        "draping_mitigation": _drape_advice(case, scope),
        "materials_mitigation": _materials_advice(case, scope),
        "materials": ", ".join(case.materials_sustain_burning) or "none",
        "holding_charge": ", ".join(case.materials_holding_charge) or "none",
        "drying_time": sentences.drying_time(case.drying_time_s, HORIZON),
        "activation_wait": sentences.activation_wait(case.drying_time_s, HORIZON),
        "open_air_drying": sentences.open_air_drying(case.open_air_drying_time_s, HORIZON),
        "safe_draping": format_duration(
            round_up(decided(case, "drape_no_earlier_than_s", case.safe_draping_after_s))
        ),
        "draping_after": format_duration(case.draping_after_s),
        "first_activation": format_duration(case.first_activation_after_s),
        "pocket_peak": format_si(case.pocket_vapour_peak_fraction_of_lfl, "fraction"),
        "label_minimum": format_duration(prep.label_minimum_hairless if prep else None),
        "label_hair": format_duration(prep.label_maximum_hair if prep else None),
        "mie": format_si(case.mie_J, "J"),
        "mie_fuel": case.mie_fuel or sentences.NO_FUEL,
        "largest_spark": format_si(res.largest_spark_J, "J"),
        "sources": ", ".join(case.ignition_sources) or sentences.NONE_PLANNED,
        "rh": format_si(res.environment.relative_humidity_fraction, "fraction"),
        "triad_sides": sentences.triad_sides(
            case.triad.oxidant, case.triad.fuel, case.triad.ignition
        ),
    }


case_context = _context
case_subject = _subject


def _cases(scope: Scope) -> Iterator[tuple[CaseResult, Context]]:
    for case in scope.results.cases:
        yield case, _context(scope, case)


@result("case.oxidant_at_activation", "fraction")
def _oxidant_at_activation(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_subject(case), case.oxidant_at_activation_fraction, context)


@result("case.open_delivery_oxidant", "fraction")
def _open_delivery_oxidant(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.delivery in OPEN_DELIVERY:
            yield Item(_subject(case), case.oxidant_fraction, context)


@result("case.triad_complete", "flag")
def _triad_complete(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_subject(case), case.triad.complete, context)


@result("case.draping_after", "time", "planned")
def _draping_after(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_subject(case), case.draping_after_s, context)


@result("case.first_activation_after", "time", "planned")
def _first_activation_after(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_subject(case), case.first_activation_after_s, context)


@result("case.drying_time", "time")
def _drying_time(scope: Scope) -> Iterator[Item]:
    """Drying time of a flammable prep on plain skin (hair and pooling read their own result)."""
    for case, context in _cases(scope):
        if case.prep_flammable and not (case.hair or case.pooling):
            yield Item(_subject(case), case.drying_time_s, context)


@result("case.drying_time_hair_or_pooling", "time")
def _drying_time_hair(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.prep_flammable and (case.hair or case.pooling):
            yield Item(_subject(case), case.drying_time_s, context)


@result("case.flammable_draping_after", "time", "planned")
def _flammable_draping_after(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.prep_flammable:
            yield Item(_subject(case), case.draping_after_s, context)


@result("case.pooled_flammable_prep", "flag")
def _pooled(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.prep_flammable:
            yield Item(_subject(case), case.pooling, context)


@result("case.pocket_peak", "fraction")
def _pocket_peak(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_subject(case), case.pocket_vapour_peak_fraction_of_lfl, context)


@result("case.enriched_materials_burning", "flag")
def _enriched_materials(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.oxygen_enriched:
            yield Item(_subject(case), bool(case.materials_sustain_burning), context)


@result("case.site_mie_with_charged_materials", "energy")
def _site_mie_charged(scope: Scope) -> Iterator[Item]:
    """Site MIE where some of the case's materials hold charge at the room's RH and a fuel is present."""
    for case, context in _cases(scope):
        if case.materials_holding_charge and case.prep_flammable and case.mie_J is not None:
            yield Item(_subject(case), case.mie_J, context)
