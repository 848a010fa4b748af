"""Results of static charge on people and trolleys: body voltage, spark energy, leak path."""

from __future__ import annotations

from collections.abc import Iterator

from ignite.findings.floor import humidity_advice
from ignite.findings.registry import Context, Item, Scope, result
from ignite.physics import electrostatics
from ignite.records.results import ChargeResult
from ignite.wording import sentences
from ignite.wording.numbers import format_duration, format_si


def _charges(scope: Scope) -> Iterator[ChargeResult]:
    yield from scope.results.people
    yield from scope.results.trolleys


@result("charge.body_voltage", "voltage")
def _body_voltage(scope: Scope) -> Iterator[Item]:
    for charge in _charges(scope):
        yield Item(charge.label, charge.body_voltage_V, _context(scope, charge))


@result("charge.spark_energy", "energy")
def _spark_energy(scope: Scope) -> Iterator[Item]:
    for charge in _charges(scope):
        yield Item(charge.label, charge.spark_energy_J, _context(scope, charge))


@result("charge.system_resistance", "resistance")
def _system_resistance(scope: Scope) -> Iterator[Item]:
    for charge in scope.results.people:
        yield Item(charge.label, charge.leak_resistance_ohm, _context(scope, charge))


@result("room.lowest_mie", "energy")
def _room_lowest_mie(scope: Scope) -> Iterator[Item]:
    yield Item("room", scope.results.lowest_site_mie_J, {})


def _leak_advice(scope: Scope, charge: ChargeResult, v_limit: float, target: str) -> str:
    """The leak path that keeps this person or trolley below `v_limit`."""
    gen = scope.bound.charge.generation_current
    floor_max = scope.results.floor.max_ohm
    if charge.kind == "person":
        r = electrostatics.max_footwear_resistance(v_limit, gen, floor_max)
        classes = [c.id for c in scope.bound.footwear if c.resistance <= r] if r is not None else []
        return sentences.footwear_advice(r, floor_max, charge.label, target, classes)
    path = electrostatics.max_leak_resistance(v_limit, gen) - floor_max
    return sentences.trolley_path_advice(path, charge.label, target)


def _context(scope: Scope, charge: ChargeResult) -> Context:
    res = scope.results
    gen = scope.bound.charge.generation_current
    no_spark = res.no_spark_voltage_V
    mie = res.lowest_site_mie_J
    v_mie = electrostatics.voltage_for_energy(mie, charge.capacitance_F) if mie else None
    no_spark_target = sentences.no_spark_target(no_spark)
    context: dict[str, str | int] = {
        "body_voltage": format_si(charge.body_voltage_V, "V"),
        "spark_energy": format_si(charge.spark_energy_J, "J"),
        "leak_path": format_si(charge.leak_resistance_ohm, "Ω"),
        "settle_time": format_duration(charge.settle_time_s),
        "lowest_mie": format_si(mie, "J"),
        "mie_fuel": res.lowest_site_mie_fuel or sentences.NO_FUEL_IN_TABLE,
        "rh_advice_no_spark": humidity_advice(scope, no_spark),
        "leak_mitigation_no_spark": _leak_advice(scope, charge, no_spark, no_spark_target),
    }
    if v_mie is not None and mie is not None:
        # no spark at or below the no-spark voltage, whatever the MIE: humidity that keeps
        # the voltage below either is enough to keep a spark from reaching the MIE
        context["rh_advice_mie"] = humidity_advice(scope, max(v_mie, no_spark))
        # aim for no spark at all; say what merely keeps the spark below the MIE as well
        advice = _leak_advice(scope, charge, no_spark, no_spark_target)
        r_mie = electrostatics.max_leak_resistance(v_mie, gen) - res.floor.max_ohm
        if v_mie > no_spark and r_mie > 0:
            advice += sentences.below_mie_only(r_mie, mie)
        context["leak_mitigation_mie"] = advice
    walking = scope.bound.window.walking_voltage_high
    if walking is not None:
        context["leak_mitigation_esd"] = _leak_advice(
            scope, charge, walking.value, sentences.ESD_WALKING_TARGET
        )
    return context
