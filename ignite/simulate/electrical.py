"""The patient environment's electrical safety: Room + Bound -> ElectricalResult.

Readings are set against their limits (the limit of each leakage reading chosen by the
device's test, applied part and protection class), and for each case with the patient's
conductive paths given, the current that can reach the heart is summed the way that errs
high: every leakage in phase; a connected device without a reading counted at its limit;
the touch voltage taken across the worst bonding reading (the limit when none was given).
"""

from __future__ import annotations

import math

from ignite.physics import electrical
from ignite.records.results import (
    BondingResult,
    CardiacCaseResult,
    ElectricalResult,
    EquipmentResult,
    LeakageReading,
    SupplyResult,
)
from ignite.room.model import CardiacCase, Equipment, Leakage, Room
from ignite.rules.bound import Bound, ElectricalRules, RuleValue, leakage_selector
from ignite.wording import sentences

QUANTITIES = ("earth_leakage", "touch_current", "patient_leakage")
CONDITIONS = ("normal", "single_fault")
DIRECT_PATHS = ("central-line", "pacing-wires")
"""Cardiac paths that reach the heart directly (microshock applies)."""


def compute_electrical(room: Room, bound: Bound) -> ElectricalResult | None:
    """The electrical results of a room with an `electrical` section; None without one."""
    section, rules = room.electrical, bound.electrical
    if section is None or rules is None:
        return None
    impedance = rules.path_impedance.value
    micro = rules.microshock_limit.value
    bonding = tuple(
        BondingResult(
            point=point.point,
            kind=point.kind,
            resistance_ohm=point.resistance,
            above_limit=point.resistance > rules.bonding_max.value,
            fault_current_for_microshock_A=electrical.fault_current_for_cardiac_current(
                micro, impedance, point.resistance
            ),
            touch_voltage_per_ampere_V=electrical.touch_voltage(1.0, point.resistance),
        )
        for point in section.bonding
    )
    supply = None
    if section.supply is not None:
        monitor = section.supply.insulation_monitor
        supply = SupplyResult(
            system=section.supply.system,
            transformer_rating_VA=section.supply.transformer_rating,
            imd_alarm_setting_ohm=monitor.alarm_setting if monitor else None,
            imd_tested_alarm_at_ohm=monitor.tested_alarm_at if monitor else None,
            insulation_reading_ohm=monitor.insulation_reading if monitor else None,
            imd_alarm_min_ohm=rules.imd_alarm_min.value
            if section.supply.system == "isolated"
            else None,
        )
    equipment = tuple(_equipment(device, rules) for device in section.equipment)
    devices = {device.id: device for device in section.equipment}
    worst_bonding = max(
        (point.resistance for point in section.bonding), default=rules.bonding_max.value
    )
    procedures = {case.id: case.procedure for case in room.cases}
    cases = tuple(
        _case(case, devices, rules, worst_bonding, procedures.get(case.case, ""))
        for case in section.cases
    )
    return ElectricalResult(
        supply=supply,
        bonding_limit_ohm=rules.bonding_max.value,
        bonding=bonding,
        equipment=equipment,
        cases=cases,
        microshock_limit_A=micro,
        microshock_single_fault_limit_A=rules.microshock_single_fault_limit.value,
        cardiac_path_impedance_ohm=impedance,
        caution=sentences.ELECTRICAL_CAUTION,
    )


def reading_limit(
    rules: ElectricalRules, device: Equipment, quantity: str, condition: str
) -> RuleValue | None:
    """The limit of one of a device's readings, by its test, applied part and class."""
    selector = leakage_selector(quantity, device.test, device.applied_part, device.protection_class)
    return rules.leakage.get((device.test, quantity, condition, selector))


def _equipment(device: Equipment, rules: ElectricalRules) -> EquipmentResult:
    readings = []
    for quantity in QUANTITIES:
        leakage: Leakage = getattr(device, quantity)
        for condition in CONDITIONS:
            measured = getattr(leakage, condition)
            if measured is None:
                continue
            limit = reading_limit(rules, device, quantity, condition)
            readings.append(
                LeakageReading(
                    quantity=quantity,
                    condition=condition,
                    measured_A=measured,
                    limit_A=limit.value if limit else None,
                    limit_rule=limit.id if limit else "",
                    above_limit=limit is not None and measured > limit.value,
                )
            )
    return EquipmentResult(
        id=device.id,
        kind=device.kind,
        protection_class=device.protection_class,
        applied_part=device.applied_part,
        test=device.test,
        readings=tuple(readings),
    )


def _assumed(rules: ElectricalRules, device: Equipment, quantity: str, condition: str) -> float:
    """What a missing reading is counted at: the type-test limit of its kind (for a device
    without an applied part, that of type B and BF), on the safe side."""
    selector = leakage_selector(quantity, "type", device.applied_part, device.protection_class)
    if selector == "none":
        selector = "BF"
    limit = rules.leakage.get(("type", quantity, condition, selector))
    return limit.value if limit else 0.0


def _pair(rules: ElectricalRules, device: Equipment, quantity: str) -> tuple[float, float, bool]:
    """(normal, single fault, counted at a limit) of one current of a device.

    A recurrent test's one reading stands for both conditions' floor; a single fault
    without a reading is counted at the type-test single-fault limit.
    """
    leakage: Leakage = getattr(device, quantity)
    assumed = False
    normal = leakage.normal
    if normal is None:
        if device.test == "recurrent" and quantity == "earth_leakage":
            limit = reading_limit(rules, device, quantity, "normal")
            normal = limit.value if limit else _assumed(rules, device, quantity, "normal")
        else:
            normal = _assumed(rules, device, quantity, "normal")
        assumed = True
    fault = leakage.single_fault
    if fault is None:
        fault = max(normal, _assumed(rules, device, quantity, "single_fault"))
    return normal, max(fault, normal), assumed


def _case(
    case: CardiacCase,
    devices: dict[str, Equipment],
    rules: ElectricalRules,
    bonding_resistance: float,
    procedure: str,
) -> CardiacCaseResult:
    connected = [devices[name] for name in case.connected if name in devices]
    patient = [_pair(rules, device, "patient_leakage") for device in connected]
    # only class I equipment returns its earth leakage through a protective conductor
    earthed = [
        _pair(rules, device, "earth_leakage")
        for device in connected
        if device.protection_class == "I"
    ]
    counted_at_limit = tuple(
        device.id for device, (_, _, assumed) in zip(connected, patient, strict=True) if assumed
    )
    pl_normal = electrical.summed_leakage([n for n, _, _ in patient])
    pl_fault = electrical.summed_leakage_single_fault(
        [n for n, _, _ in patient], [f for _, f, _ in patient]
    )
    earth_normal = electrical.summed_leakage([n for n, _, _ in earthed])
    earth_fault = electrical.summed_leakage_single_fault(
        [n for n, _, _ in earthed], [f for _, f, _ in earthed]
    )
    impedance = rules.path_impedance.value
    touch = electrical.touch_voltage(earth_normal, bonding_resistance)
    touch_current = electrical.cardiac_current(touch, impedance)
    touch_fault_current = electrical.cardiac_current(
        electrical.touch_voltage(earth_fault, bonding_resistance), impedance
    )
    direct = case.cardiac_path in DIRECT_PATHS
    normal_total = pl_normal + touch_current if direct else None
    # one fault at a time: in a device's patient circuit, or in its protective earth
    fault_total = max(pl_fault + touch_current, pl_normal + touch_fault_current) if direct else None
    largest, largest_current = "", 0.0
    faulted, faulted_current, rise = "", 0.0, -1.0
    for device, (normal, fault, _) in zip(connected, patient, strict=True):
        if normal > largest_current or not largest:
            largest, largest_current = device.id, normal
        if fault - normal > rise:
            faulted, faulted_current, rise = device.id, fault, fault - normal
    return CardiacCaseResult(
        case=case.case,
        procedure=procedure,
        cardiac_path=case.cardiac_path,
        connected=tuple(case.connected),
        non_cf_connected=tuple(
            device.id for device in connected if direct and device.applied_part in ("B", "BF")
        ),
        patient_leakage_normal_A=pl_normal,
        patient_leakage_single_fault_A=pl_fault,
        counted_at_limit=counted_at_limit,
        bonding_resistance_ohm=bonding_resistance,
        touch_voltage_V=touch,
        touch_cardiac_current_A=touch_current,
        cardiac_current_normal_A=normal_total,
        cardiac_current_single_fault_A=fault_total,
        largest_device=largest,
        largest_device_A=largest_current if math.isfinite(largest_current) else 0.0,
        worst_fault_device=faulted,
        worst_fault_device_A=faulted_current,
    )
