"""Room and bound rules -> Results: the one place that feeds the physics.

Everything here is SI floats read from the room and from `Bound` (never the rule book).
The findings are added afterwards by `ignite.findings`.
"""

from __future__ import annotations

from pathlib import Path

from ignite import __version__
from ignite.physics import electrostatics, oxygen
from ignite.records.results import (
    EnvironmentResult,
    MethodRef,
    Results,
    RoomInfo,
)
from ignite.room.model import Room
from ignite.rules.bound import Bound
from ignite.simulate.cases import OPEN_DELIVERY, case_result, lowest_mie, preparations, room_fuels
from ignite.simulate.charge import Charging, person_charge, trolley_charge, voltage_curve
from ignite.simulate.electrical import compute_electrical
from ignite.simulate.floor import compute_floor
from ignite.wording import sentences

METHODS: tuple[MethodRef, ...] = (
    MethodRef(
        "Floor window check (highest reading for static, lowest for shock)",
        "IEC 60364-7-710 / NEK 400:710; NFPA 99 (editions up to 2005); IEC 61340-5-1",
    ),
    MethodRef(
        "Shock current by Ohm's law, I = U / (R_floor,min + R_body)",
        "IEC 60479-1:2005 Table 1 (body impedance, 5th percentile, log-linear in U; hand to feet 30 % below hand to hand)",
    ),
    MethodRef(
        "Leaky-capacitor charging, V = I_g·R·(1 − e^(−t/τ)), capped by the humidity saturation voltage",
        "electrostatics texts; ESD industry table of typical voltages",
    ),
    MethodRef(
        "Spark energy E = ½·C·V², charge Q = C·V; no spark below the Paschen minimum",
        "IEC 61000-4-2 body model",
    ),
    MethodRef(
        "MIE against oxidant, MIE(x) = MIE_air·(x/0.209)^(−n), bounded by MIE in O₂",
        "power law fitted to air/O₂ pairs (Lewis & von Elbe; Blanc et al. 1949)",
    ),
    MethodRef(
        "Activity coefficients by modified UNIFAC (Dortmund); original UNIFAC where a component has no Dortmund groups",
        "Weidlich & Gmehling (1987), parameters to 2016; Fredenslund, Jones & Prausnitz (1975); via thermo",
    ),
    MethodRef(
        "Mixture flash point, shown only (no decision reads it); about 2 K above the published value for 91 % isopropanol",
        "Liaw et al. (2002)",
    ),
    MethodRef("Mixture lower flammable limit", "Le Chatelier's rule"),
    MethodRef(
        "Pure-component data (vapour pressure, LFL, flash point, autoignition)",
        "IEC 60079-20-1:2010 and NFPA 497:2008 via the chemicals package; vapour pressure by IAPWS-95 (water), DIPPR 101 (isopropanol), Wagner, Poling et al. (ethanol, methanol, acetone) via thermo",
    ),
    MethodRef(
        "Film evaporation, mixed convection Sh = (Sh_F³ + Sh_N³)^⅓, Sh_F = 0.664·Re^½·Sc^⅓, floored by diffusion 8D/(πd)",
        "Pohlhausen laminar plate; Churchill & Usagi (1972); diffusivities Welty–Wicks–Wilson, else Fuller–Schettler–Giddings (Poling et al. eq. 11-4.4)",
    ),
    MethodRef(
        "Natural convection over the film, Sh_N = 0.54·Ra^¼, Ra from Δρ/ρ of temperature and vapour together; none where the gas at the film is the heavier",
        "McAdams, Heat Transmission (via ht); ideal-gas law",
    ),
    MethodRef(
        "Film temperature from its heat balance: tissue conductance + convection (Chilton–Colburn, h = k·ρ·c_p·Le^⅔, a little colder than the Lewis relation: slower drying) + radiation = Σ N_i·ΔH_vap,i",
        "Chilton & Colburn (1934); ΔH_vap by DIPPR / VDI-PPDS correlations via thermo",
    ),
    MethodRef(
        "Drape-pocket source bounded above: the film's liquid on the slow timeline evaporating at skin temperature with warm-film convection",
        "ignite's bounding choice: each figure errs on its safe side",
    ),
    MethodRef("Drape pocket, well mixed: V·dc/dt = source − Q·c", "continuous stirred volume"),
    MethodRef("Oxygen under drapes, C(t) = 0.209 + (C0 − 0.209)·e^(−Q·t/V)", "well-mixed washout"),
    MethodRef(
        "Materials that sustain burning: LOI less 2 points", "ISO 4589-2 / ASTM D2863; NFPA 53"
    ),
)


ELECTRICAL_METHODS: tuple[MethodRef, ...] = (
    MethodRef(
        "Touch voltage of a current through a bonding conductor, U = I·R; the current at which "
        "it drives the microshock limit through a direct cardiac path, I = I_heart·Z / R",
        "Ohm's law; IEC 60364-7-710 (supplementary equipotential bonding)",
    ),
    MethodRef(
        "Current through a direct cardiac path: patient leakage of the connected devices summed "
        "in phase (one device at a time in single fault), plus U_touch / Z",
        "IEC 60601-1 (leakage currents, single-fault condition); in-phase sum, the upper bound",
    ),
)
"""Added to the worksheet's methods for a room with an `electrical` section."""


def compute(room: Room, bound: Bound) -> Results:
    """Every quantity of the result record, without findings."""
    env = room.environment
    mains = room.room.mains
    floor_result = compute_floor(room, bound)
    model = Charging(
        generation_current=bound.charge.generation_current,
        no_spark_voltage=bound.charge.no_spark_voltage,
        saturation_points=bound.charge.saturation_points,
        floor_max=floor_result.max_ohm,
    )
    default_c = bound.charge.default_capacitance
    people = tuple(
        person_charge(p, model, env.relative_humidity, default_c, bound) for p in room.people
    )
    trolleys = tuple(trolley_charge(t, model, env.relative_humidity) for t in room.trolleys)
    charges = people + trolleys
    largest_spark = max((c.spark_energy_J for c in charges), default=None)
    warnings = list(room.warnings)
    _, clamped = electrostatics.saturation_voltage(
        env.relative_humidity, list(model.saturation_points)
    )
    if clamped and charges:
        warnings.append(
            sentences.rh_outside_humidity_table(
                env.relative_humidity, bound.charge.saturation_curve_id
            )
        )

    prepared, analyses = preparations(room, bound)
    ambient = bound.oxygen.ambient
    cases = tuple(case_result(case, room, bound, analyses, largest_spark) for case in room.cases)
    lowest, lowest_fuel = lowest_mie(room_fuels(room, bound), ambient, ambient)
    if lowest_fuel:
        lowest_fuel = sentences.fuel_in_room_air(lowest_fuel)
    for case in cases:
        if case.mie_J is not None and (lowest is None or case.mie_J < lowest):
            lowest = case.mie_J
            lowest_fuel = sentences.fuel_at_case_oxidant(
                case.mie_fuel, case.oxidant_at_activation_fraction, case.id
            )

    rise = max(
        (
            oxygen.room_oxidant_rise(
                planned.oxygen.flow,
                planned.oxygen.fraction,
                planned.oxygen.nitrous_oxide_flow,
                env.volume,
                env.air_changes,
                ambient,
            )
            for planned in room.cases
            if planned.oxygen.delivery in OPEN_DELIVERY
        ),
        default=0.0,
    )
    if rise > ROOM_RISE_WORTH_SAYING:
        warnings.append(sentences.room_oxidant_rise(rise, env.air_changes))
    return Results(
        tool_version=__version__,
        input_sha256=room.sha256,
        input_name=Path(room.path).name,
        rules_digest=bound.rules_digest,
        room=RoomInfo(
            room.room.id,
            room.room.name,
            room.room.purpose,
            room.room.assessed_on,
            room.room.assessor,
        ),
        environment=EnvironmentResult(
            temperature_K=env.temperature,
            relative_humidity_fraction=env.relative_humidity,
            air_changes_per_s=env.air_changes,
            volume_m3=env.volume,
            mains_voltage_V=mains.voltage,
            mains_frequency_Hz=mains.frequency,
            mains_system=mains.system,
            room_oxidant_rise_fraction=rise,
        ),
        floor=floor_result,
        people=people,
        trolleys=trolleys,
        preparations=prepared,
        cases=cases,
        warnings=tuple(warnings),
        lowest_site_mie_J=lowest,
        lowest_site_mie_fuel=lowest_fuel,
        largest_spark_J=largest_spark,
        no_spark_voltage_V=model.no_spark_voltage,
        oxygen_enriched_limit_fraction=bound.oxygen.enriched_limit,
        voltage_vs_rh=tuple((c.label, voltage_curve(c, model)) for c in charges),
        electrical=compute_electrical(room, bound),
    )


ROOM_RISE_WORTH_SAYING = 0.005
"""A rise of the whole room's oxidant (fraction) worth a warning: a presentation threshold,
not a safety limit (the findings compare the site's oxidant with the enriched limit)."""
