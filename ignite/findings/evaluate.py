"""(rules, room, results) -> findings. Never prints; never raises on a hazard.

Each check in rules/ reads one named result. `RESULTS` below maps each name to its
dimension and to a function giving the items it is measured on: one per subject
(the floor, each person and trolley, each case), with the context its mitigation
texts may quote.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterator, Mapping
from dataclasses import dataclass, field, replace
from typing import Any

from ignite.physics import electrostatics
from ignite.records.results import Amount, CaseResult, ChargeResult, Finding, Results, severity_rank
from ignite.room.model import Room
from ignite.rules.rulebook import Entry, Limit, Rulebook, limit_dimension
from ignite.wording.numbers import format_duration, format_si

UNITS = {
    "resistance": "Ω",
    "current": "A",
    "voltage": "V",
    "energy": "J",
    "time": "s",
    "fraction": "fraction",
    "flag": "",
    "count": "",
}


@dataclass(frozen=True)
class Item:
    subject: str
    value: float | bool | None
    context: Mapping[str, Any] = field(default_factory=dict)


@dataclass
class Scope:
    """Everything a result function may look at."""

    room: Room
    results: Results
    book: Rulebook
    window: Entry | None


ResultFn = Callable[[Scope], Iterator[Item]]
RESULTS: dict[str, tuple[str, ResultFn]] = {}


def result(name: str, dimension: str) -> Callable[[ResultFn], ResultFn]:
    def register(fn: ResultFn) -> ResultFn:
        RESULTS[name] = (dimension, fn)
        return fn

    return register


def known_results() -> dict[str, str]:
    """Result names a check may read, with their dimension (for the rule loader)."""
    return {name: dim for name, (dim, _) in RESULTS.items()}


# --- results the checks read -----------------------------------------------------


def _floor_context(scope: Scope) -> dict[str, Any]:
    fl = scope.results.floor
    low = fl.window_low_ohm
    outside_low = sum(
        1 for i in fl.readings_outside if low is not None and fl.readings_ohm[i] <= low
    )
    let_go = scope.book.value("shock.let_go")
    floor_for_let_go = max(fl.touch_voltage_V / let_go - fl.body_impedance_ohm, 0.0)
    return {
        "count": len(fl.readings_ohm),
        "outside_low": outside_low,
        "outside_high": len(fl.readings_outside) - outside_low,
        "shock_path": f"{format_si(fl.touch_voltage_V, 'V')} across {format_si(fl.shock_path_ohm, 'Ω')}",
        "shock_note": fl.shock_note,
        "floor_for_let_go": format_si(floor_for_let_go, "Ω"),
        "rh_advice_no_spark": _min_rh_text(scope, scope.results.no_spark_voltage_V),
    }


@result("floor.lowest_reading", "resistance")
def _floor_lowest(scope: Scope) -> Iterator[Item]:
    yield Item("floor", scope.results.floor.min_ohm, _floor_context(scope))


@result("floor.highest_reading", "resistance")
def _floor_highest(scope: Scope) -> Iterator[Item]:
    yield Item("floor", scope.results.floor.max_ohm, _floor_context(scope))


@result("floor.mean_reading", "resistance")
def _floor_mean(scope: Scope) -> Iterator[Item]:
    fl = scope.results.floor
    needed = scope.window.get("mean_min_readings", 1) if scope.window else 1
    if len(fl.readings_ohm) >= needed:
        yield Item("floor", fl.mean_ohm, _floor_context(scope))


@result("floor.shock_current", "current")
def _shock_current(scope: Scope) -> Iterator[Item]:
    yield Item(
        "floor (person touching a live enclosure)",
        scope.results.floor.shock_current_A,
        _floor_context(scope),
    )


def _charges(scope: Scope) -> Iterator[ChargeResult]:
    yield from scope.results.people
    yield from scope.results.trolleys


@result("charge.body_voltage", "voltage")
def _body_voltage(scope: Scope) -> Iterator[Item]:
    for charge in _charges(scope):
        yield Item(charge.label, charge.body_voltage_V, _charge_context(scope, charge))


@result("charge.spark_energy", "energy")
def _spark_energy(scope: Scope) -> Iterator[Item]:
    for charge in _charges(scope):
        yield Item(charge.label, charge.spark_energy_J, _charge_context(scope, charge))


@result("charge.system_resistance", "resistance")
def _system_resistance(scope: Scope) -> Iterator[Item]:
    for charge in scope.results.people:
        yield Item(charge.label, charge.leak_resistance_ohm, _charge_context(scope, charge))


@result("room.lowest_mie", "energy")
def _room_lowest_mie(scope: Scope) -> Iterator[Item]:
    yield Item("room", scope.results.lowest_site_mie_J, {})


def _case_subject(case: CaseResult) -> str:
    return f"case {case.id}: {case.procedure}"


def _case_context(scope: Scope, case: CaseResult) -> dict[str, Any]:
    book = scope.book
    res = scope.results
    label_minimum = (
        book.value("prep.label_minimum_hairless")
        if "prep.label_minimum_hairless" in book.entries
        else None
    )
    label_hair = (
        book.value("prep.label_maximum_hair") if "prep.label_maximum_hair" in book.entries else None
    )
    allowance = book.value("materials.loi_allowance")
    sustain = ", ".join(case.materials_sustain_burning) or "none"
    if case.materials_sustain_burning:
        swap = (
            f"{sustain} would keep burning at {format_si(case.oxidant_fraction, 'fraction')} oxidant; "
            f"where the site stays enriched, choose materials whose LOI is above "
            f"{format_si(case.oxidant_fraction + allowance, 'fraction')}, or bring the oxidant down."
        )
    else:
        swap = "No listed material would keep burning at the site's oxidant."
    if case.required_stop_s is not None and case.required_stop_s > 0:
        stop = (
            f"Stop open oxygen at least {format_duration(_round_up(case.required_stop_s))} before the first "
            f"activation (computed washout of this pocket to the enriched limit); the planned "
            f"{format_duration(case.stop_before_activation_s)} leaves "
            f"{format_si(case.oxidant_at_activation_fraction, 'fraction')} at the site."
        )
    else:
        stop = "The site is at or below the enriched limit when the ignition source is first used."
    if case.safe_draping_after_s is not None and case.prep_flammable:
        wait = _round_up(max(case.safe_draping_after_s, label_minimum or 0.0))
        drape = f"Drape no earlier than {format_duration(wait)} after the end of the prep"
        if case.safe_draping_after_s >= (label_minimum or 0.0):
            drape += " (computed: keeps the drape pocket within the margin of the LFL)."
        else:
            drape += f" (the label's minimum; the computed pocket limit is {format_duration(_round_up(case.safe_draping_after_s))})."
        if case.hair or case.pooling:
            where = "in hair" if case.hair else "where it pooled"
            drape += (
                f" The liquid {where} is computed to stay wet for {format_duration(case.drying_time_s)}"
                + (
                    f" (the label allows up to {format_duration(label_hair)} in hair)"
                    if case.hair and label_hair
                    else ""
                )
                + ": blot it, and keep ignition sources away until it is dry."
            )
    else:
        drape = "No flammable prep in this case."
    context: dict[str, Any] = {
        "procedure": case.procedure,
        "oxidant_site": format_si(case.oxidant_fraction, "fraction"),
        "oxidant_at_activation": format_si(case.oxidant_at_activation_fraction, "fraction"),
        "planned_stop": format_duration(case.stop_before_activation_s),
        "required_stop": format_duration(_round_up(case.required_stop_s)),
        "ceiling_stop": format_duration(_round_up(case.ceiling_stop_s)),
        "stop_mitigation": stop,
        "draping_mitigation": drape,
        "materials_mitigation": swap,
        "materials": sustain,
        "holding_charge": ", ".join(case.materials_holding_charge) or "none",
        "drying_time": format_duration(case.drying_time_s),
        "safe_draping": format_duration(_round_up(case.safe_draping_after_s)),
        "draping_after": format_duration(case.draping_after_s),
        "first_activation": format_duration(case.first_activation_after_s),
        "pocket_peak": format_si(case.pocket_vapour_peak_fraction_of_lfl, "fraction"),
        "label_minimum": format_duration(label_minimum),
        "label_hair": format_duration(label_hair),
        "mie": format_si(case.mie_J, "J"),
        "mie_fuel": case.mie_fuel or "no fuel",
        "largest_spark": format_si(res.largest_spark_J, "J"),
        "sources": ", ".join(case.ignition_sources) or "none planned",
        "rh": format_si(res.environment.relative_humidity_fraction, "fraction"),
        "triad_sides": ", ".join(
            name
            for name, on in (
                ("oxidant", case.triad.oxidant),
                ("fuel", case.triad.fuel),
                ("ignition", case.triad.ignition),
            )
            if on
        ),
    }
    return context


def _round_up(seconds: float | None) -> float | None:
    """Waits are given to the next 15 s (to the next minute past 10 min): never shorter than computed."""
    if seconds is None or math.isinf(seconds):
        return seconds
    step = 60.0 if seconds > 600 else 15.0
    return math.ceil(seconds / step - 1e-9) * step


def _cases(scope: Scope) -> Iterator[tuple[CaseResult, dict[str, Any]]]:
    for case in scope.results.cases:
        yield case, _case_context(scope, case)


@result("case.oxidant_at_activation", "fraction")
def _oxidant_at_activation(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_case_subject(case), case.oxidant_at_activation_fraction, context)


@result("case.open_delivery_oxidant", "fraction")
def _open_delivery_oxidant(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.delivery in ("nasal-cannula", "face-mask"):
            yield Item(_case_subject(case), case.oxidant_fraction, context)


@result("case.triad_complete", "flag")
def _triad_complete(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_case_subject(case), case.triad.complete, context)


@result("case.draping_after", "time")
def _draping_after(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_case_subject(case), case.draping_after_s, context)


@result("case.first_activation_after", "time")
def _first_activation_after(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_case_subject(case), case.first_activation_after_s, context)


@result("case.drying_time", "time")
def _drying_time(scope: Scope) -> Iterator[Item]:
    """Drying time of a flammable prep on plain skin (hair and pooling read their own result)."""
    for case, context in _cases(scope):
        if case.prep_flammable and not (case.hair or case.pooling):
            yield Item(_case_subject(case), case.drying_time_s, context)


@result("case.drying_time_hair_or_pooling", "time")
def _drying_time_hair(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.prep_flammable and (case.hair or case.pooling):
            yield Item(_case_subject(case), case.drying_time_s, context)


@result("case.flammable_draping_after", "time")
def _flammable_draping_after(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.prep_flammable:
            yield Item(_case_subject(case), case.draping_after_s, context)


@result("case.pooled_flammable_prep", "flag")
def _pooled(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.prep_flammable:
            yield Item(_case_subject(case), case.pooling, context)


@result("case.pocket_peak", "fraction")
def _pocket_peak(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        yield Item(_case_subject(case), case.pocket_vapour_peak_fraction_of_lfl, context)


@result("case.enriched_materials_burning", "flag")
def _enriched_materials(scope: Scope) -> Iterator[Item]:
    for case, context in _cases(scope):
        if case.oxygen_enriched:
            yield Item(_case_subject(case), bool(case.materials_sustain_burning), context)


@result("case.site_mie_with_charged_materials", "energy")
def _site_mie_charged(scope: Scope) -> Iterator[Item]:
    """Site MIE where some of the case's materials hold charge at the room's RH and a fuel is present."""
    for case, context in _cases(scope):
        if case.materials_holding_charge and case.prep_flammable and case.mie_J is not None:
            yield Item(_case_subject(case), case.mie_J, context)


def _min_rh_text(scope: Scope, voltage: float) -> str:
    """Advice on humidity that keeps the walking voltage at or below `voltage`."""
    curve = _saturation_points(scope)
    rh = electrostatics.min_rh_for_voltage(voltage, curve)
    if rh is None:
        return (
            f"Humidity alone cannot do it: the humidity table still gives {format_si(curve[-1][1], 'V')} "
            f"at {curve[-1][0]:.0%} RH, its highest point."
        )
    if rh <= curve[0][0]:
        return "Humidity is not the limiting factor here (any RH in the table keeps the voltage low enough)."
    return (
        f"Keep RH at or above {rh:.0%} (humidity table), where the ventilation plant can hold it."
    )


def _saturation_points(scope: Scope) -> list[tuple[float, float]]:
    from ignite.simulate.compute import saturation_curve_for

    return list(saturation_curve_for(scope.room.floor.finish, scope.book).get("points"))


def _charge_context(scope: Scope, charge: ChargeResult) -> dict[str, Any]:
    res = scope.results
    gen = scope.book.value("charge.generation_current")
    no_spark = res.no_spark_voltage_V
    floor_max = res.floor.max_ohm
    mie = res.lowest_site_mie_J
    mie_fuel = res.lowest_site_mie_fuel
    v_mie = electrostatics.voltage_for_energy(mie, charge.capacitance_F) if mie else None

    def leak_text(v_limit: float, what: str) -> str:
        if charge.kind == "person":
            r = electrostatics.max_footwear_resistance(v_limit, gen, floor_max)
            if r is None:
                return (
                    f"The floor alone ({format_si(floor_max, 'Ω')} at its highest) is too resistive to keep "
                    f"{charge.label} below {what}: restore the floor."
                )
            classes = [
                e.id
                for e in sorted(scope.book.of_kind("footwear"), key=lambda e: e.get("resistance"))
                if e.get("resistance") <= r
            ]
            fits = f" Footwear classes that meet it: {', '.join(classes)}." if classes else ""
            return (
                f"Footwear of at most {format_si(r, 'Ω')} through the soles (with the floor's highest reading) "
                f"keeps {charge.label} below {what}.{fits}"
            )
        r_total = electrostatics.max_leak_resistance(v_limit, gen)
        path = r_total - floor_max
        if path <= 0:
            return f"The floor alone is too resistive to keep the {charge.label} below {what}: restore the floor."
        return (
            f"A castor or drag-chain path of at most {format_si(path, 'Ω')} to the floor keeps the "
            f"{charge.label} below {what}."
        )

    context: dict[str, Any] = {
        "body_voltage": format_si(charge.body_voltage_V, "V"),
        "spark_energy": format_si(charge.spark_energy_J, "J"),
        "leak_path": format_si(charge.leak_resistance_ohm, "Ω"),
        "settle_time": format_duration(charge.settle_time_s),
        "lowest_mie": format_si(mie, "J"),
        "mie_fuel": mie_fuel or "no fuel in the rules' table",
        "rh_advice_no_spark": _min_rh_text(scope, no_spark),
        "leak_mitigation_no_spark": leak_text(
            no_spark, f"the no-spark voltage ({format_si(no_spark, 'V')})"
        ),
    }
    if v_mie is not None:
        context["rh_advice_mie"] = _min_rh_text(scope, v_mie)
        # aim for no spark at all; say what merely keeps the spark below the MIE as well
        context["leak_mitigation_mie"] = leak_text(
            no_spark, f"the no-spark voltage ({format_si(no_spark, 'V')})"
        )
        r_mie = electrostatics.max_leak_resistance(v_mie, gen) - floor_max
        if v_mie > no_spark and r_mie > 0:
            context["leak_mitigation_mie"] += (
                f" (Up to {format_si(r_mie, 'Ω')} would keep the spark below the site MIE, "
                f"{format_si(mie, 'J')}, without preventing it.)"
            )
    if scope.window is not None and scope.window.has("walking_voltage_high"):
        context["leak_mitigation_esd"] = leak_text(
            scope.window.get("walking_voltage_high"), "the ESD walking-voltage limit"
        )
    return context


# --- evaluation ------------------------------------------------------------------


def evaluate(book: Rulebook, room: Room, results: Results) -> Results:
    """Results with the findings of every check, worst first."""
    window = book.entries.get(room.floor.criteria)
    scope = Scope(room, results, book, window)
    findings: list[Finding] = []
    for check in book.of_kind("checks"):
        findings.extend(_run_check(check, scope))
    findings = _keep_worst_in_groups(findings, book)
    findings.sort(key=lambda f: (severity_rank(f.severity), f.rule, f.subject))
    return replace(results, findings=tuple(findings))


def _limit_value(limit: Limit, scope: Scope) -> tuple[float | None, str, str]:
    """(SI value or None when the limit does not apply, source, flag)."""
    if limit.kind == "quantity" and limit.value is not None:
        return limit.value.value, limit.value.source, limit.value.flag
    if limit.kind == "param":
        entry = scope.book.entry(limit.ref)
        sourced = entry.sourced("value")
        return sourced.value, sourced.source, sourced.flag
    if limit.kind == "window":
        window = scope.window
        if window is None or not window.has(limit.ref):
            return None, "", ""
        if limit.ref == "low":
            from ignite.simulate.compute import window_limits

            low, _ = window_limits(window, scope.room.room.mains.voltage)
            sourced = window.sourced("low")
            return low, sourced.source, sourced.flag
        sourced = window.sourced(limit.ref)
        return sourced.value, sourced.source, sourced.flag
    items = list(RESULTS[limit.ref][1](scope))
    value = items[0].value if items else None
    return (None if value is None else float(value)), "", ""


def _limit_by_subject(limit: Limit | None, scope: Scope) -> dict[str, float]:
    """For a limit read from another result: its value for each subject."""
    if limit is None or limit.kind != "result":
        return {}
    return {i.subject: float(i.value) for i in RESULTS[limit.ref][1](scope) if i.value is not None}


def _holds(test: str, value: float, limit: float, inclusive_outside: bool | None) -> bool:
    if inclusive_outside is not None:  # window limits: the window says whether equality is outside
        if test in ("below", "at-or-below"):
            return value <= limit if inclusive_outside else value < limit
        return value >= limit if inclusive_outside else value > limit
    return {
        "above": value > limit,
        "at-or-above": value >= limit,
        "below": value < limit,
        "at-or-below": value <= limit,
    }[test]


_COMPARISON_WORDS = {
    "above": "above",
    "at-or-above": "at or above",
    "below": "below",
    "at-or-below": "at or below",
}


def _run_check(check: Entry, scope: Scope) -> Iterator[Finding]:
    dimension, fn = RESULTS[check.get("reads")]
    test = check.get("test")
    limit: Limit | None = check.get("limit")
    limit_value: float | None = None
    source, flag = check.source, check.flag
    inclusive_outside: bool | None = None
    if limit is not None:
        limit_value, limit_source, limit_flag = _limit_value(limit, scope)
        if limit_value is None:
            return
        if limit_source:
            source, flag = limit_source, limit_flag
        if limit.kind == "window" and scope.window is not None:
            if limit.ref == "low":
                inclusive_outside = not scope.window.get("low_inclusive", False)
            elif limit.ref == "high":
                inclusive_outside = not scope.window.get("high_inclusive", True)
            else:
                inclusive_outside = test in ("at-or-above", "at-or-below")
    unit = UNITS[dimension]
    per_subject = _limit_by_subject(limit, scope)
    for item in fn(scope):
        if item.value is None:
            continue
        item_limit = per_subject.get(item.subject, limit_value)
        if test == "is-true":
            if not item.value:
                continue
            measured, limit_amount, comparison = Amount(1.0, ""), Amount(None, ""), "present"
        else:
            if item_limit is None:
                continue
            if not _holds(test, float(item.value), item_limit, inclusive_outside):
                continue
            comparison = _COMPARISON_WORDS[test]
            measured, limit_amount = Amount(float(item.value), unit), Amount(item_limit, unit)
        context = _SafeContext(item.context)
        yield Finding(
            rule=check.id,
            title=check.title,
            severity=check.get("severity"),
            subject=item.subject,
            measured=measured,
            limit=limit_amount,
            comparison=comparison,
            source=source,
            flag=flag,
            mitigations=tuple(
                text
                for text in (m.format_map(context).strip() for m in check.get("mitigations", ()))
                if text
            ),
            detail=check.get("detail", "").format_map(context).strip(),
        )


class _SafeContext(dict[str, Any]):
    """Missing placeholders print as an honest gap rather than raising."""

    def __missing__(self, key: str) -> str:
        return "(not computed)"


def _keep_worst_in_groups(findings: list[Finding], book: Rulebook) -> list[Finding]:
    best: dict[tuple[str, str], Finding] = {}
    kept: list[Finding] = []
    for finding in findings:
        group = book.entry(finding.rule).get("group")
        if not group:
            kept.append(finding)
            continue
        key = (group, finding.subject)
        current = best.get(key)
        if current is None or severity_rank(finding.severity) < severity_rank(current.severity):
            best[key] = finding
    return kept + list(best.values())


def check_dimensions(book: Rulebook) -> list[str]:
    """Checks whose limit dimension differs from what they read (for tests)."""
    known = known_results()
    bad = []
    for check in book.of_kind("checks"):
        limit = check.get("limit")
        if limit is not None and limit_dimension(limit, book.entries, known) not in (
            None,
            known[check.get("reads")],
        ):
            bad.append(check.id)
    return bad
