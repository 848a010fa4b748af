"""Results as a readable plain-text table for the terminal (`ignite check`)."""

from __future__ import annotations

from ignite.records.results import ChargeResult, Finding, Results, severity_rank
from ignite.wording.numbers import format_against_limit, format_duration, format_si

CAUTION = (
    "Caution: these figures support, and never replace, local codes, the manufacturer's "
    "instructions and licensed professional judgement. Label drying times for skin "
    "preparations remain the minimum."
)

SEVERITY_MARK = {"high": "!!! HIGH", "medium": "!!  MEDIUM", "low": "!   LOW", "note": "-   NOTE"}


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


def _charges(title: str, charges: tuple[ChargeResult, ...], label: str) -> list[str]:
    if not charges:
        return []
    rows = [
        [
            c.label,
            str(c.count),
            c.footwear or "—",
            format_si(c.leak_resistance_ohm, "Ω"),
            format_si(c.capacitance_F, "F"),
            format_si(c.time_constant_s, "s"),
            format_si(c.body_voltage_V, "V"),
            format_si(c.stored_charge_C, "C"),
            format_si(c.spark_energy_J, "J"),
            format_duration(c.settle_time_s),
        ]
        for c in charges
    ]
    headers = [
        label,
        "n",
        "footwear",
        "leak path",
        "C",
        "τ",
        "voltage",
        "charge",
        "spark",
        "settle",
    ]
    return [title, *_table(headers, rows), ""]


def finding_lines(finding: Finding) -> list[str]:
    lines = [
        f"  {SEVERITY_MARK[finding.severity]}  {finding.rule}  ({finding.subject})",
        f"      {finding.title}",
    ]
    if finding.measured.value is not None and finding.limit.value is not None:
        measured, limit = format_against_limit(
            finding.measured.value, finding.limit.value, finding.measured.unit
        )
        lines.append(f"      measured {measured}, {finding.comparison} the limit {limit}")
    if finding.detail:
        lines.append(f"      {finding.detail}")
    lines.append(f"      source: {finding.source} [{finding.flag}]")
    lines.extend(f"      -> {m}" for m in finding.mitigations)
    return lines


def render_text(results: Results) -> str:
    r = results
    env = r.environment
    fl = r.floor
    out = [
        f"{r.room.name} ({r.room.id}): {r.room.purpose}, {r.room.assessed_on}, {r.room.assessor}",
        f"Input {r.input_name}  sha256 {r.input_sha256[:16]}…  ignite {r.tool_version}",
        (
            f"Environment: {format_si(env.temperature_K, 'K')}, RH {format_si(env.relative_humidity_fraction, 'fraction')}, "
            f"{env.air_changes_per_s * 3600:.3g} air changes/h, {env.volume_m3:.3g} m³; "
            f"mains {format_si(env.mains_voltage_V, 'V')} {env.mains_frequency_Hz:.0f} Hz {env.mains_system}"
        ),
        "",
    ]
    window = " and ".join(
        part
        for part in (
            f"above {format_si(fl.window_low_ohm, 'Ω')}" if fl.window_low_ohm is not None else "",
            f"up to {format_si(fl.window_high_ohm, 'Ω')}" if fl.window_high_ohm is not None else "",
        )
        if part
    )
    out += [
        f"Floor ({fl.criteria}: {window or 'no limits'}): {'within the window' if fl.passed else 'OUTSIDE THE WINDOW'}",
        "  readings "
        + "  ".join(
            format_si(v, "Ω") + ("*" if i in fl.readings_outside else "")
            for i, v in enumerate(fl.readings_ohm)
        )
        + ("   (* outside)" if fl.readings_outside else ""),
        (
            f"  lowest {format_si(fl.min_ohm, 'Ω')}  highest {format_si(fl.max_ohm, 'Ω')}  "
            f"mean {format_si(fl.mean_ohm, 'Ω')}  geometric mean {format_si(fl.geometric_mean_ohm, 'Ω')}"
        ),
        (
            f"  shock: {format_si(fl.touch_voltage_V, 'V')} across {format_si(fl.shock_path_ohm, 'Ω')} "
            f"(lowest reading + body {format_si(fl.body_impedance_ohm, 'Ω')}) -> {format_si(fl.shock_current_A, 'A')}"
        ),
    ]
    if fl.shock_note:
        out.append(f"  {fl.shock_note}")
    out.append("")
    out += _charges("People", r.people, "role")
    out += _charges("Trolleys", r.trolleys, "name")
    if r.lowest_site_mie_J is not None:
        out += [
            f"Lowest MIE in the room: {format_si(r.lowest_site_mie_J, 'J')} ({r.lowest_site_mie_fuel})",
            "",
        ]
    if r.preparations:
        rows = [
            [
                p.id,
                format_si(p.flash_point_K, "K"),
                format_si(p.lfl_fraction, "fraction"),
                format_si(p.saturated_vapour_fraction, "fraction"),
                format_si(p.film_temperature_K, "K"),
            ]
            for p in r.preparations
        ]
        out += [
            "Preparations",
            *_table(["id", "flash point", "LFL", "saturated vapour", "film at"], rows),
            "",
        ]
    for case in r.cases:
        triad = case.triad
        sides = ", ".join(
            name
            for name, present in (
                ("oxidant", triad.oxidant),
                ("fuel", triad.fuel),
                ("ignition", triad.ignition),
            )
            if present
        )
        out += [
            f"Case {case.id}: {case.procedure} ({case.site})",
            f"  fire triad: {'COMPLETE' if triad.complete else 'incomplete'} ({sides or 'no side present'})",
            (
                f"  oxidant at the site {format_si(case.oxidant_fraction, 'fraction')}, at activation "
                f"{format_si(case.oxidant_at_activation_fraction, 'fraction')}; washout to the enriched limit "
                f"{format_duration(case.washout_s)} (stop planned {format_duration(case.stop_before_activation_s)} before)"
            ),
            f"  MIE at the site {format_si(case.mie_J, 'J')} ({case.mie_fuel or 'no fuel'}); "
            f"largest spark in the room {format_si(case.largest_spark_J, 'J')}",
        ]
        if case.preparation and not case.prep_flammable:
            out.append(f"  prep {case.preparation}: no flammable component")
        elif case.drying_time_s is not None:
            out.append(
                f"  prep dries in {format_duration(case.drying_time_s)}; drapes at "
                f"{format_duration(case.draping_after_s)}, first activation at {format_duration(case.first_activation_after_s)}; "
                f"pocket peak {format_si(case.pocket_vapour_peak_fraction_of_lfl, 'fraction')} of LFL; "
                f"safe to drape after {format_duration(case.safe_draping_after_s)}"
            )
        out.append(
            "  materials that would keep burning: "
            + (", ".join(case.materials_sustain_burning) or "none")
        )
        out.append("")
    counts = {
        s: sum(1 for f in r.findings if f.severity == s) for s in ("high", "medium", "low", "note")
    }
    summary = ", ".join(f"{n} {s}" for s, n in counts.items() if n) or "none"
    out.append(f"Findings: {summary}")
    for finding in sorted(r.findings, key=lambda f: severity_rank(f.severity)):
        out += finding_lines(finding)
    if r.warnings:
        out += ["", "Warnings:"] + [f"  {w}" for w in r.warnings]
    out += ["", CAUTION, ""]
    return "\n".join(out)
