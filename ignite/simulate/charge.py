"""Static charge on people and trolleys: leaky-capacitor charging held by the humidity table.

The spark energy recorded is that of a spark that can happen: zero at or below the no-spark
voltage (the stored charge is recorded whatever the voltage).
"""

from __future__ import annotations

from dataclasses import dataclass

from ignite.physics import electrostatics
from ignite.records.results import (
    ChargeResult,
)
from ignite.room.model import Person, Trolley
from ignite.rules.bound import Bound

RH_CHART = tuple(r / 100 for r in range(5, 81, 5))
"""Relative humidities at which the worksheet's body-voltage chart is drawn."""


@dataclass(frozen=True)
class Charging:
    """The bound charge model and the floor's highest reading, which every leak path includes."""

    generation_current: float
    no_spark_voltage: float
    saturation_points: tuple[tuple[float, float], ...]
    floor_max: float


def footwear_resistance(person: Person, bound: Bound) -> tuple[float, str]:
    if person.footwear.resistance is not None:
        return person.footwear.resistance, "measured"
    cls = person.footwear.cls or DEFAULT_FOOTWEAR
    return bound.footwear_resistance(cls), cls


DEFAULT_FOOTWEAR = "insulating"
"""Footwear of unknown class is taken as insulating: the cautious side for static."""


def charge_state(
    kind: str,
    label: str,
    count: int,
    footwear: str,
    leak: float,
    capacitance: float,
    rh: float,
    model: Charging,
) -> ChargeResult:
    v_sat, _ = electrostatics.saturation_voltage(rh, list(model.saturation_points))
    voltage = electrostatics.body_voltage(model.generation_current, leak, capacitance, v_sat)
    tau = electrostatics.time_constant(leak, capacitance)
    return ChargeResult(
        kind=kind,
        label=label,
        count=count,
        footwear=footwear,
        leak_resistance_ohm=leak,
        capacitance_F=capacitance,
        time_constant_s=tau,
        body_voltage_V=voltage,
        stored_charge_C=electrostatics.stored_charge(capacitance, voltage),
        spark_energy_J=electrostatics.spark_energy_if_sparking(
            capacitance, voltage, model.no_spark_voltage
        ),
        settle_time_s=electrostatics.settle_time(voltage, tau, model.no_spark_voltage),
        saturation_voltage_V=v_sat,
        generation_limited=model.generation_current * leak < v_sat,
    )


def person_charge(
    person: Person, model: Charging, rh: float, default_c: float, bound: Bound
) -> ChargeResult:
    footwear_r, footwear = footwear_resistance(person, bound)
    capacitance = person.capacitance if person.capacitance is not None else default_c
    return charge_state(
        "person",
        person.role,
        person.count,
        footwear,
        footwear_r + model.floor_max,
        capacitance,
        rh,
        model,
    )


def trolley_charge(trolley: Trolley, model: Charging, rh: float) -> ChargeResult:
    return charge_state(
        "trolley",
        trolley.name,
        1,
        "",
        trolley.path_to_floor + model.floor_max,
        trolley.capacitance,
        rh,
        model,
    )


def voltage_curve(charge: ChargeResult, model: Charging) -> tuple[tuple[float, float], ...]:
    points = []
    for rh in RH_CHART:
        v_sat, _ = electrostatics.saturation_voltage(rh, list(model.saturation_points))
        points.append(
            (
                rh,
                electrostatics.body_voltage(
                    model.generation_current,
                    charge.leak_resistance_ohm,
                    charge.capacitance_F,
                    v_sat,
                ),
            )
        )
    return tuple(points)
