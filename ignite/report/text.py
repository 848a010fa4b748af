"""Results as a readable plain-text table for the terminal (`ignite check`).

Its words come from `ignite.wording.sentences`: where the table and the worksheet say the
same thing (severities, the findings tally, the floor's verdict, the fire triad, sources
and the caution), they say it the same way.
"""

from __future__ import annotations

import math

from ignite.records.results import (
    SEVERITIES,
    CardiacCaseResult,
    ChargeResult,
    ElectricalResult,
    Finding,
    Results,
    Spread,
    severity_rank,
)
from ignite.simulate.drying import HORIZON
from ignite.wording import sentences as say
from ignite.wording.numbers import NO_VALUE, format_against_limit, format_duration, format_si


def _table(headers: list[str], rows: list[list[str]], indent: str = "  ") -> list[str]:
    widths = [
        max(len(h), *(len(r[i]) for r in rows)) if rows else len(h) for i, h in enumerate(headers)
    ]
    lines = [indent + "  ".join(h.ljust(w) for h, w in zip(headers, widths, strict=True)).rstrip()]
    for row in rows:
        lines.append(
            indent + "  ".join(c.ljust(w) for c, w in zip(row, widths, strict=True)).rstrip()
        )
    return lines


def _spark(charge: ChargeResult, no_spark_V: float) -> str:
    """The spark energy, or that no spark can happen at this voltage."""
    if charge.body_voltage_V <= no_spark_V:
        return say.no_spark_at_voltage(no_spark_V)
    return format_si(charge.spark_energy_J, "J")


def _case_mie(
    mie_J: float | None, fuel: str, largest_spark_J: float | None, no_spark_V: float
) -> str:
    """The case's MIE against the largest spark, or that no spark can happen in the room."""
    if largest_spark_J == 0.0:
        return say.text_case_mie_without_spark(mie_J, fuel, no_spark_V)
    return say.text_case_mie(mie_J, fuel, largest_spark_J)


def _charges(
    title: str, charges: tuple[ChargeResult, ...], label: str, no_spark_V: float
) -> list[str]:
    if not charges:
        return []
    rows = [
        [
            c.label,
            str(c.count),
            c.footwear or NO_VALUE,
            format_si(c.leak_resistance_ohm, "Ω"),
            format_si(c.capacitance_F, "F"),
            format_si(c.time_constant_s, "s"),
            format_si(c.body_voltage_V, "V"),
            format_si(c.stored_charge_C, "C"),
            _spark(c, no_spark_V),
            format_duration(c.settle_time_s),
        ]
        for c in charges
    ]
    return [title, *_table([label, *say.TEXT_CHARGES_HEADERS], rows), ""]


def finding_lines(finding: Finding) -> list[str]:
    lines = [
        f"  {say.text_finding_heading(finding.severity, finding.rule, finding.subject)}",
        f"      {finding.title}",
    ]
    if finding.measured.value is not None and finding.limit.value is not None:
        measured, limit = format_against_limit(
            finding.measured.value, finding.limit.value, finding.measured.unit
        )
        if finding.measured.unit == "s" and math.isinf(finding.measured.value):
            measured = say.beyond_horizon(HORIZON)  # only a drying time can be infinite
        lines.append(f"      {say.measured_against_limit(measured, finding.comparison, limit)}")
    if finding.detail:
        lines.append(f"      {finding.detail}")
    lines.append(f"      {say.text_source(finding.source, finding.flag)}")
    lines.extend(f"      {say.text_mitigation(m)}" for m in finding.mitigations)
    return lines


def _spread_lines(spread: Spread | None, indent: str = "  ") -> list[str]:
    """A case's or a person's figures over the samples: `median (p5–p95)`, the
    probabilities, the decisions and what to measure first."""
    if spread is None:
        return []
    lines = [f"{indent}{say.SPREAD_HEADING} ({spread.samples} samples):"]
    for name, band in spread.bands:
        label, unit = say.SPREAD_FIGURES[name]
        lines.append(f"{indent}  {label}: {say.spread_text(band.p50, band.p5, band.p95, unit)}")
    for name, probability in spread.probabilities:
        lines.append(
            f"{indent}  {say.SPREAD_PROBABILITY_COLUMN} of {say.SPREAD_PROBABILITIES[name]}: "
            f"{say.probability_text(probability)}"
        )
    for name, _ in spread.bands:
        drivers = spread.drivers_of(name)
        if drivers and name in say.SPREAD_DRIVEN:
            label = say.SPREAD_FIGURES[name][0]
            lines.append(
                f"{indent}  "
                + say.narrow_first(
                    label, [(d.label, d.rank_correlation, d.measurable) for d in drivers]
                )
            )
    return lines


def _charge_spreads(charges: tuple[ChargeResult, ...]) -> list[str]:
    lines = []
    for charge in charges:
        if charge.spread is not None and any(b.p5 != b.p95 for _, b in charge.spread.bands):
            lines.append(f"  {charge.label}")
            lines += _spread_lines(charge.spread, "    ")
    return [*lines, ""] if lines else []


def render_text(results: Results) -> str:
    r = results
    env = r.environment
    fl = r.floor
    out = [
        say.text_room(r.room.name, r.room.id, r.room.purpose, r.room.assessed_on, r.room.assessor),
        say.text_input(r.input_name, r.input_sha256, r.tool_version),
        say.text_environment(
            env.temperature_K,
            env.relative_humidity_fraction,
            env.air_changes_per_s,
            env.volume_m3,
            env.mains_voltage_V,
            env.mains_frequency_Hz,
            env.mains_system,
        ),
        "",
    ]
    if r.uncertainty is not None:
        u = r.uncertainty
        out += [say.spread_summary(u.samples, u.confidence, len(u.inputs)), ""]
    readings = [
        format_si(v, "Ω") + (say.TEXT_OUTSIDE_MARK if i in fl.readings_outside else "")
        for i, v in enumerate(fl.readings_ohm)
    ]
    out += [
        say.text_floor(
            fl.criteria,
            fl.window_low_ohm,
            fl.window_high_ohm,
            fl.passed,
            len(fl.readings_outside),
            len(fl.readings_ohm),
        ),
        "  " + say.text_readings(readings, bool(fl.readings_outside)),
        "  "
        + say.text_floor_statistics(fl.min_ohm, fl.max_ohm, fl.mean_ohm, fl.geometric_mean_ohm),
        "  "
        + say.text_shock(
            fl.touch_voltage_V, fl.shock_path_ohm, fl.body_impedance_ohm, fl.shock_current_A
        ),
    ]
    if fl.body_current_path:
        basis = say.body_impedance_basis(
            fl.body_impedance_percentile_fraction,
            fl.body_current_path,
            fl.body_path_factor_fraction,
            fl.body_impedance_hand_to_hand_ohm,
        )
        out.append(f"  {say.text_body_impedance(basis)}")
    if fl.shock_note:
        out.append(f"  {fl.shock_note}")
    out.append("")
    out += _charges(say.TEXT_PEOPLE, r.people, say.TEXT_ROLE, r.no_spark_voltage_V)
    out += _charges(say.TEXT_TROLLEYS, r.trolleys, say.TEXT_NAME, r.no_spark_voltage_V)
    out += _charge_spreads(r.people + r.trolleys)
    if r.lowest_site_mie_J is not None:
        out += [say.text_lowest_mie(r.lowest_site_mie_J, r.lowest_site_mie_fuel), ""]
    if r.preparations:
        rows = [
            [
                p.id,
                format_si(p.flash_point_K, "K")
                if p.flash_point_K is not None
                else say.NO_FLASH_POINT,
                format_si(p.lfl_fraction, "fraction"),
                format_si(p.saturated_vapour_fraction, "fraction"),
                format_si(p.film_temperature_K, "K"),
            ]
            for p in r.preparations
        ]
        out += [
            say.HEADING_PREPARATIONS,
            *_table(list(say.TEXT_PREPARATIONS_HEADERS), rows),
            "",
        ]
    for case in r.cases:
        triad = case.triad
        out += [
            say.text_case_heading(case.id, case.procedure, case.site),
            "  " + say.triad_summary(triad.oxidant, triad.fuel, triad.ignition),
            "  "
            + say.text_case_oxygen(
                case.oxidant_fraction,
                case.oxidant_at_activation_fraction,
                case.washout_s,
                case.stop_before_activation_s,
            ),
            "  " + _case_mie(case.mie_J, case.mie_fuel, case.largest_spark_J, r.no_spark_voltage_V),
        ]
        if case.preparation and not case.prep_flammable:
            out.append("  " + say.text_prep_not_flammable(case.preparation))
        elif case.drying_time_s is not None:
            out.append(
                "  "
                + say.text_prep_drying(
                    case.drying_time_s,
                    case.draping_after_s,
                    case.first_activation_after_s,
                    case.pocket_vapour_peak_fraction_of_lfl,
                    case.safe_draping_after_s,
                    HORIZON,
                )
            )
            out.append(
                "  "
                + say.text_film_surface(
                    case.film_temperature_min_K,
                    case.mass_transfer_regime,
                    case.mass_transfer_regime_under_drapes,
                )
            )
        out.append(
            f"  {say.CASE_MATERIALS_BURNING}: {say.names_or_none(case.materials_sustain_burning)}"
        )
        out += _spread_lines(case.spread)
        out.append("")
    if r.electrical is not None:
        out += electrical_lines(r.electrical)
    counts = {s: sum(1 for f in r.findings if f.severity == s) for s in SEVERITIES}
    out.append(say.text_findings(counts))
    if not r.findings:
        out.append(f"  {say.NO_FINDINGS}")
    for finding in sorted(r.findings, key=lambda f: severity_rank(f.severity)):
        out += finding_lines(finding)
    if r.warnings:
        out += ["", say.TEXT_WARNINGS] + [f"  {w}" for w in r.warnings]
    out += ["", say.TEXT_CAUTION, ""]
    if r.electrical is not None:
        out[-1:] = [say.ELECTRICAL_CAUTION, ""]
    return "\n".join(out)


def _limit_text(value: float, limit: float | None, unit: str) -> tuple[str, str]:
    if limit is None:
        return format_si(value, unit), say.NO_LIMIT
    return format_against_limit(value, limit, unit)


def electrical_lines(found: ElectricalResult) -> list[str]:
    """The patient environment's electrical section of the terminal table."""
    out = [say.TEXT_ELECTRICAL]
    supply = found.supply
    if supply is not None:
        alarm = say.supply_alarm(supply.imd_alarm_setting_ohm, supply.imd_alarm_min_ohm)
        out.append(
            "  "
            + say.text_supply(
                supply.system,
                supply.transformer_rating_VA,
                alarm,
                format_si(supply.imd_tested_alarm_at_ohm, "Ω")
                if supply.imd_tested_alarm_at_ohm is not None
                else NO_VALUE,
                format_si(supply.insulation_reading_ohm, "Ω")
                if supply.insulation_reading_ohm is not None
                else NO_VALUE,
            )
        )
    if found.bonding:
        out.append("  " + say.text_bonding_heading(found.bonding_limit_ohm))
        rows = []
        for number, point in enumerate(found.bonding, start=1):
            reading, limit = format_against_limit(
                point.resistance_ohm, found.bonding_limit_ohm, "Ω"
            )
            rows.append(
                [
                    str(number),
                    point.point,
                    reading,
                    say.within_or_above(point.above_limit, limit),
                    format_si(point.fault_current_for_microshock_A, "A"),
                ]
            )
        out += _table(list(say.BONDING_HEADERS), rows, indent="    ")
    if found.equipment:
        rows = []
        for device in found.equipment:
            readings = []
            for item in device.readings:
                measured, limit = _limit_text(item.measured_A, item.limit_A, "A")
                mark = say.TEXT_OUTSIDE_MARK if item.above_limit else ""
                readings.append(
                    f"{say.reading_label(item.quantity, item.condition)} {measured}{mark} ({limit})"
                )
            rows.append(
                [
                    f"{device.id} ({device.kind})",
                    device.protection_class,
                    device.applied_part,
                    device.test,
                    "; ".join(readings) or NO_VALUE,
                ]
            )
        out.append("  " + say.HEADING_EQUIPMENT)
        out += _table(list(say.EQUIPMENT_HEADERS), rows, indent="    ")
    for case in found.cases:
        out.append("  " + _cardiac_line(case, found))
    if found.cases:
        out.append(
            "  "
            + say.microshock_basis(
                found.microshock_limit_A,
                found.microshock_single_fault_limit_A,
                found.cardiac_path_impedance_ohm,
            )
        )
    out.append("")
    return out


def _cardiac_line(case: CardiacCaseResult, found: ElectricalResult) -> str:
    patient = (
        f"{format_si(case.patient_leakage_normal_A, 'A')} / "
        f"{format_si(case.patient_leakage_single_fault_A, 'A')}"
    )
    touch = f"{say.volts(case.touch_voltage_V)} -> {format_si(case.touch_cardiac_current_A, 'A')}"
    if case.cardiac_current_normal_A is None or case.cardiac_current_single_fault_A is None:
        heart = say.microshock_no_direct_path()
    else:
        normal, limit = format_against_limit(
            case.cardiac_current_normal_A, found.microshock_limit_A, "A"
        )
        fault, fault_limit = format_against_limit(
            case.cardiac_current_single_fault_A, found.microshock_single_fault_limit_A, "A"
        )
        heart = f"{normal} (limit {limit}) / {fault} (limit {fault_limit})"
    return say.text_cardiac_case(
        case.case, case.cardiac_path, case.connected, patient, touch, heart
    )
