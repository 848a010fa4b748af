"""Results of the patient environment's electrical safety: bonding readings, the insulation
monitor, equipment leakage against its limits, and the current that can reach a patient's
heart through a direct cardiac path (microshock)."""

from __future__ import annotations

from collections.abc import Iterator

from ignite.findings.registry import Item, Scope, result
from ignite.physics import electrical
from ignite.records.results import CardiacCaseResult, ElectricalResult, EquipmentResult
from ignite.wording import sentences
from ignite.wording.numbers import format_si


def _electrical(scope: Scope) -> ElectricalResult | None:
    return scope.results.electrical


@result("electrical.bonding_resistance", "resistance", "measured")
def _bonding(scope: Scope) -> Iterator[Item]:
    found = _electrical(scope)
    if found is None:
        return
    micro, impedance = found.microshock_limit_A, found.cardiac_path_impedance_ohm
    at_limit = electrical.fault_current_for_cardiac_current(
        micro, impedance, found.bonding_limit_ohm
    )
    for point in found.bonding:
        context = {
            "point": point.point,
            "kind": sentences.BONDED_PART_WORDS.get(point.kind, point.kind),
            "fault_current": format_si(point.fault_current_for_microshock_A, "A"),
            "fault_current_advice": sentences.bonding_fault_current(
                point.point,
                point.resistance_ohm,
                point.fault_current_for_microshock_A,
                micro,
                impedance,
            ),
            "at_limit_advice": sentences.bonding_at_limit(found.bonding_limit_ohm, at_limit),
        }
        yield Item(sentences.bonding_subject(point.point), point.resistance_ohm, context)


def _monitor_context(found: ElectricalResult) -> dict[str, str | int]:
    supply = found.supply
    setting = supply.imd_alarm_setting_ohm if supply else None
    minimum = supply.imd_alarm_min_ohm if supply else None
    return {
        "setting": format_si(setting, "Ω"),
        "imd_advice": sentences.imd_advice(setting, minimum or 0.0),
    }


def _monitor_reading(scope: Scope, field: str) -> Iterator[Item]:
    """The insulation monitor's reading `field` of an isolated supply, when given."""
    found = _electrical(scope)
    if found is None or found.supply is None or found.supply.system != "isolated":
        return
    reading = getattr(found.supply, field)
    if reading is not None:
        yield Item(sentences.IMD_SUBJECT, reading, _monitor_context(found))


@result("electrical.imd_alarm_setting", "resistance", "measured")
def _imd_setting(scope: Scope) -> Iterator[Item]:
    return _monitor_reading(scope, "imd_alarm_setting_ohm")


@result("electrical.imd_alarm_tested", "resistance", "measured")
def _imd_tested(scope: Scope) -> Iterator[Item]:
    return _monitor_reading(scope, "imd_tested_alarm_at_ohm")


def _readings(scope: Scope, test: str, limits: bool) -> Iterator[Item]:
    """Each reading of the devices tested by `test`: its value, or (`limits`) its limit."""
    found = _electrical(scope)
    if found is None:
        return
    for device in found.equipment:
        if device.test != test:
            continue
        for reading in device.readings:
            if reading.limit_A is None:
                continue
            subject = sentences.device_subject(
                device.id, device.kind, reading.quantity, reading.condition
            )
            if limits:
                yield Item(subject, reading.limit_A)
                continue
            context = _device_context(device) | {
                "reading": sentences.reading_label(reading.quantity, reading.condition),
                "limit_rule": reading.limit_rule,
                "excess_advice": sentences.leakage_excess(
                    reading.measured_A, reading.limit_A, reading.quantity, reading.condition
                ),
            }
            yield Item(subject, reading.measured_A, context)


def _device_context(device: EquipmentResult) -> dict[str, str | int]:
    return {
        "device": device.id,
        "device_kind": device.kind,
        "applied_part": device.applied_part,
        "protection_class": device.protection_class,
        "withdraw_advice": sentences.leakage_withdraw(device.id),
    }


@result("electrical.leakage_type_test", "current", "measured")
def _type_test(scope: Scope) -> Iterator[Item]:
    yield from _readings(scope, "type", limits=False)


@result("electrical.leakage_type_test_limit", "current")
def _type_test_limit(scope: Scope) -> Iterator[Item]:
    yield from _readings(scope, "type", limits=True)


@result("electrical.leakage_recurrent", "current", "measured")
def _recurrent(scope: Scope) -> Iterator[Item]:
    yield from _readings(scope, "recurrent", limits=False)


@result("electrical.leakage_recurrent_limit", "current")
def _recurrent_limit(scope: Scope) -> Iterator[Item]:
    yield from _readings(scope, "recurrent", limits=True)


def _cases(scope: Scope) -> Iterator[tuple[CardiacCaseResult, ElectricalResult]]:
    found = _electrical(scope)
    if found is None:
        return
    for case in found.cases:
        yield case, found


@result("electrical.non_cf_on_cardiac_path", "flag")
def _non_cf(scope: Scope) -> Iterator[Item]:
    """One item per case with a direct cardiac path and B or BF devices connected."""
    for case, found in _cases(scope):
        if not case.non_cf_connected:
            continue
        parts = {device.id: device.applied_part for device in found.equipment}
        devices = sentences.devices_with_applied_parts(
            [(name, parts.get(name, "")) for name in case.non_cf_connected]
        )
        context = {
            "devices": devices,
            "cardiac_path": sentences.CARDIAC_PATH_WORDS.get(case.cardiac_path, case.cardiac_path),
            "non_cf_advice": sentences.non_cf_advice(devices, case.cardiac_path),
        }
        yield Item(sentences.cardiac_subject(case.case, case.procedure), True, context)


def _cardiac_items(scope: Scope, single_fault: bool) -> Iterator[Item]:
    for case, found in _cases(scope):
        total = (
            case.cardiac_current_single_fault_A if single_fault else case.cardiac_current_normal_A
        )
        if total is None:
            continue
        limit = found.microshock_single_fault_limit_A if single_fault else found.microshock_limit_A
        context = {
            "cardiac_path": sentences.CARDIAC_PATH_WORDS.get(case.cardiac_path, case.cardiac_path),
            "connected": ", ".join(case.connected) or sentences.NONE,
            "patient_leakage": format_si(
                case.patient_leakage_single_fault_A
                if single_fault
                else case.patient_leakage_normal_A,
                "A",
            ),
            "touch_current": format_si(case.touch_cardiac_current_A, "A"),
            "microshock_advice": sentences.microshock_advice(
                total,
                limit,
                case.worst_fault_device if single_fault else case.largest_device,
                case.worst_fault_device_A if single_fault else case.largest_device_A,
            ),
            "counted_at_limit": sentences.counted_at_limit(case.counted_at_limit),
        }
        yield Item(sentences.cardiac_subject(case.case, case.procedure), total, context)


@result("electrical.cardiac_current_normal", "current")
def _cardiac_normal(scope: Scope) -> Iterator[Item]:
    yield from _cardiac_items(scope, single_fault=False)


@result("electrical.cardiac_current_single_fault", "current")
def _cardiac_fault(scope: Scope) -> Iterator[Item]:
    yield from _cardiac_items(scope, single_fault=True)
