"""Core physics and its data checked against published values.

Each check names its source and flag (published | memory | common practice) beside
the assertion. The tables passed to the functions are the published points themselves,
so these tests check the methods, not values tuned to pass.
"""

from __future__ import annotations

from itertools import pairwise
from pathlib import Path
from typing import Any

import pytest
import yaml

from ignite.physics.electrostatics import (
    body_voltage,
    max_leak_resistance,
    saturation_voltage,
    spark_energy,
    spark_energy_if_sparking,
    stored_charge,
)
from ignite.physics.ignition import fitted_exponent, materials_sustaining, mie_at_oxidant
from ignite.physics.oxygen import (
    buildup_time,
    fraction_after_stop,
    pocket_fraction,
    pocket_outflow,
    pocket_steady_state,
    washout_time,
)
from ignite.physics.shock import body_impedance, path_impedance, shock_current

AIR = 0.209  # oxygen in dry air, as rules/oxygen.yaml oxygen.ambient (published)

RULES = Path(__file__).resolve().parents[2] / "rules"
LPM = 1e-3 / 60.0  # one litre per minute in m³/s

# --- Shock: IEC 60479-1 ---------------------------------------------------------------

# IEC 60479-1:2005 Table 1, total body impedance, hand to hand, a.c. 50/60 Hz, dry, large
# contact area (memory: confirm in the standard; as quoted in the project's physics guide).
BODY_TABLE_P5 = [
    (25.0, 1750.0),
    (50.0, 1375.0),
    (75.0, 1125.0),
    (100.0, 990.0),
    (125.0, 900.0),
    (150.0, 850.0),
    (175.0, 825.0),
    (200.0, 800.0),
    (225.0, 775.0),
    (400.0, 700.0),
    (500.0, 625.0),
    (700.0, 575.0),
    (1000.0, 575.0),
]
BODY_TABLE_P50 = [
    (25.0, 3250.0),
    (50.0, 2500.0),
    (75.0, 2000.0),
    (100.0, 1725.0),
    (125.0, 1550.0),
    (150.0, 1400.0),
    (175.0, 1325.0),
    (200.0, 1275.0),
    (225.0, 1225.0),
    (400.0, 950.0),
    (500.0, 850.0),
    (700.0, 775.0),
    (1000.0, 775.0),
]
HAND_TO_FEET = 0.7  # IEC 60479-1:2005: hand to foot some 10 % to 30 % lower (memory)


def test_body_impedance_reproduces_iec_60479_points() -> None:
    for u, z in BODY_TABLE_P5:
        assert body_impedance(u, BODY_TABLE_P5) == (z, False)  # IEC 60479-1:2005 T.1, memory


def test_body_impedance_between_points_lies_below_the_chord() -> None:
    # Log-linear interpolation between IEC 60479-1:2005 Table 1 points (memory): within
    # the neighbours, and never above the straight line between them (the lower
    # impedance, the higher current: the safe side).
    for (u0, z0), (u1, z1) in pairwise(BODY_TABLE_P5):
        for share in (0.25, 0.5, 0.75):
            u = u0 + share * (u1 - u0)
            z, clamped = body_impedance(u, BODY_TABLE_P5)
            assert min(z0, z1) <= z <= max(z0, z1) and not clamped
            assert z <= z0 + share * (z1 - z0) + 1e-9


def test_touch_on_a_compliant_floor_is_perceptible_but_below_let_go() -> None:
    # 230 V on a floor at the IEC 60364-7-710 lower limit (> 50 kΩ, published), the
    # 5th-percentile body at 230 V (IEC 60479-1:2005 T.1, 775 Ω at 225 V, 700 Ω at 400 V,
    # memory), hand to feet 30 % lower (memory).
    hand, clamped = body_impedance(230.0, BODY_TABLE_P5)
    assert 700.0 < hand < 775.0 and not clamped
    body = path_impedance(hand, HAND_TO_FEET)
    assert body == pytest.approx(541.0, abs=1.0)
    current = shock_current(230.0, 50e3, body)
    # independent arithmetic: 230 V / (50 kΩ + 541 Ω) = 4.55 mA
    assert current == pytest.approx(230.0 / 50541.0, rel=1e-3)
    assert current > 0.5e-3  # IEC 60479-1 perception ~0.5 mA, published
    assert current < 10e-3  # IEC 60479-1 let-go ~10 mA, published


def test_fifth_percentile_hand_to_feet_gives_the_largest_current() -> None:
    # IEC 60479-1:2005 T.1 (memory): the 5th percentile lies below the 50th at every
    # voltage, and hand to feet below hand to hand, so the current used is the larger.
    for u in (25.0, 120.0, 230.0, 400.0, 690.0):
        p5, _ = body_impedance(u, BODY_TABLE_P5)
        p50, _ = body_impedance(u, BODY_TABLE_P50)
        assert p5 < p50
        assert shock_current(u, 0.0, path_impedance(p5, HAND_TO_FEET)) > shock_current(u, 0.0, p5)


@pytest.mark.parametrize(("supply", "floor_low"), [(500.0, 50e3), (1000.0, 100e3)])
def test_window_steps_keep_the_current_below_let_go(supply: float, floor_low: float) -> None:
    # At the top of each IEC 60364-7-710 supply step (50 kΩ up to 500 V, 100 kΩ above;
    # published) even a body impedance of zero keeps the current at the ~10 mA let-go
    # threshold of IEC 60479-1 (published); any real body keeps it below.
    assert shock_current(supply, floor_low, 0.0) == pytest.approx(10e-3, rel=1e-12)
    assert shock_current(supply, floor_low, 500.0) < 10e-3


# --- Electrostatics ---------------------------------------------------------------------

# ESD industry table of typical walking body voltages (published) at 10, 40 and 55 % RH;
# above 55 % RH its two-column form's 65-90 % RH column (ESD Association; DOD-HDBK-263;
# memory): vinyl 250 V, carpet 1.5 kV, placed at 65 % and held to 90 %.
VINYL = [(0.10, 12e3), (0.40, 5e3), (0.55, 3e3), (0.65, 250.0), (0.90, 250.0)]
CARPET = [(0.10, 35e3), (0.40, 15e3), (0.55, 7.5e3), (0.65, 1.5e3), (0.90, 1.5e3)]


@pytest.mark.parametrize("table", [VINYL, CARPET], ids=["vinyl", "carpet"])
def test_saturation_table_points_reproduced_exactly(table: list[tuple[float, float]]) -> None:
    for rh, v in table:
        assert saturation_voltage(rh, table) == (v, False)  # ESD industry table, see above


@pytest.mark.parametrize("table", [VINYL, CARPET], ids=["vinyl", "carpet"])
def test_saturation_monotone_between_points(table: list[tuple[float, float]]) -> None:
    grid = [0.10 + 0.80 * i / 1600 for i in range(1601)]
    values = [saturation_voltage(rh, table)[0] for rh in grid]
    assert all(b <= a for a, b in pairwise(values))
    assert values[0] == table[0][1] and values[-1] == pytest.approx(table[-1][1], rel=1e-12)


def test_carpet_charges_more_than_vinyl_at_every_humidity() -> None:
    # ESD industry table (published; high-humidity column memory): carpet above vinyl.
    for i in range(101):
        rh = i / 100
        assert saturation_voltage(rh, CARPET)[0] > saturation_voltage(rh, VINYL)[0]


def test_high_humidity_uses_the_two_column_form_not_the_55_percent_value() -> None:
    # Two-column table (ESD Association; DOD-HDBK-263; memory): at 65-90 % RH walking
    # across vinyl gives 250 V, across carpet 1.5 kV; inside that range nothing is clamped.
    for rh in (0.65, 0.75, 0.90):
        assert saturation_voltage(rh, VINYL) == (250.0, False)  # memory, see above
        assert saturation_voltage(rh, CARPET) == (1.5e3, False)  # memory, see above
    # between 55 % (3 kV, published) and 65 % (250 V, memory) the value lies between
    v60, clamped = saturation_voltage(0.60, VINYL)
    assert 250.0 < v60 < 3e3 and not clamped
    # only outside the table's real range (10-90 % RH) is the end value flagged
    assert saturation_voltage(0.95, VINYL) == (250.0, True)
    assert saturation_voltage(0.05, VINYL) == (12e3, True)
    # ... and at 10-20 % RH the two columns agree with the table: vinyl 12 kV, carpet 35 kV
    assert saturation_voltage(0.10, VINYL)[0] == 12e3  # DOD-HDBK-263, memory
    assert saturation_voltage(0.10, CARPET)[0] == 35e3  # DOD-HDBK-263, memory


def test_no_spark_energy_at_or_below_the_paschen_minimum() -> None:
    # Paschen minimum of air ~327 V (published), taken as 330 V: a 300 pF trolley at
    # 300 V stores ½·C·V² = 13.5 µJ but cannot spark, so no energy meets an MIE.
    assert spark_energy(300e-12, 300.0) == pytest.approx(13.5e-6, rel=1e-12)  # ½CV², worked
    assert spark_energy_if_sparking(300e-12, 300.0, 330.0) == 0.0
    assert spark_energy_if_sparking(300e-12, 330.0, 330.0) == 0.0
    # above it the whole stored energy is counted (the safe side)
    assert spark_energy_if_sparking(300e-12, 400.0, 330.0) == pytest.approx(24e-6, rel=1e-12)


def test_human_body_model_charge_and_energy() -> None:
    c_body = 150e-12  # IEC 61000-4-2 human-body model, published
    assert stored_charge(c_body, 10e3) == pytest.approx(1.5e-6, rel=1e-12)  # Q = CV, worked
    assert spark_energy(c_body, 10e3) == pytest.approx(7.5e-3, rel=1e-12)  # ½CV², worked


def test_walking_current_pairs_one_gigaohm_with_one_hundred_volts() -> None:
    # I_g ≈ 0.1 µA (published worked example in electrostatics texts); IEC 61340-5-1
    # pairs < 1 GΩ person + footwear + floor with < 100 V walking voltage (published).
    assert max_leak_resistance(100.0, 0.1e-6) == pytest.approx(1e9, rel=1e-12)
    assert body_voltage(0.1e-6, 1e9, 150e-12, 12e3) == pytest.approx(100.0, rel=1e-12)


# --- Minimum ignition energy ------------------------------------------------------------

# (fuel, MIE in air [J] - published, MIE in O2 [J] - memory; physics guide §3)
MIE_PAIRS = [
    ("methane", 0.28e-3, 0.003e-3),  # air published; O2 memory (Lewis & von Elbe)
    ("propane", 0.25e-3, 0.002e-3),  # air published; O2 memory (Blanc et al. 1949)
    ("hydrogen", 0.017e-3, 0.0012e-3),  # air published; O2 memory (Lewis & von Elbe)
]


@pytest.mark.parametrize(("fuel", "air", "oxygen"), MIE_PAIRS, ids=[p[0] for p in MIE_PAIRS])
def test_mie_end_points(fuel: str, air: float, oxygen: float) -> None:
    n = fitted_exponent(air, oxygen, air_fraction=AIR)
    assert mie_at_oxidant(air, 0.209, n, oxygen, air_fraction=AIR) == air  # MIE in air, published
    # Without the lower bound, so that the power law itself must land on the O2 value.
    assert mie_at_oxidant(air, 1.0, n, air_fraction=AIR) == pytest.approx(
        oxygen, rel=1e-12
    )  # O2, memory


def test_fitted_exponents_match_the_quoted_values() -> None:
    # Physics guide §3 (derived from the memory pairs): n ≈ 1.7 for hydrogen, ≈ 3 for
    # organic vapours.
    assert fitted_exponent(0.017e-3, 0.0012e-3, air_fraction=AIR) == pytest.approx(
        1.7, abs=0.05
    )  # hydrogen
    assert fitted_exponent(0.28e-3, 0.003e-3, air_fraction=AIR) == pytest.approx(
        3.0, abs=0.2
    )  # methane
    assert fitted_exponent(0.25e-3, 0.002e-3, air_fraction=AIR) == pytest.approx(
        3.0, abs=0.2
    )  # propane


def test_mie_in_oxygen_enriched_pocket_falls_below_a_person_spark() -> None:
    # Methane at 45 % oxidant (Barnes & Frantz 2000, published) against the 7.5 mJ of a
    # 150 pF person at 10 kV (IEC 61000-4-2, published): already far below in air.
    air, oxygen = MIE_PAIRS[0][1], MIE_PAIRS[0][2]
    mie = mie_at_oxidant(
        air, 0.45, fitted_exponent(air, oxygen, air_fraction=AIR), oxygen, air_fraction=AIR
    )
    assert oxygen < mie < air / 5
    assert mie < spark_energy(150e-12, 10e3)


# --- Oxygen under the drapes ------------------------------------------------------------


def _solve_pocket(
    volume: float, inflow_oxidant: float, outflow: float, c0: float, times: list[float]
) -> Any:
    """V dC/dt = inflow_oxidant - outflow·C, integrated numerically (scipy)."""
    from scipy.integrate import solve_ivp

    def rhs(_t: float, c: Any) -> Any:
        return (inflow_oxidant - outflow * c) / volume

    return solve_ivp(
        rhs, (0.0, times[-1]), [c0], t_eval=times, rtol=1e-10, atol=1e-13, method="LSODA"
    )


def test_pocket_build_up_matches_the_numerical_mass_balance() -> None:
    # Invented pocket: 30 L, cannula 3 L/min at 100 % O2, 0.5 L/min N2O, 7 L/min air.
    volume, q_o, q_n, q_e = 0.030, 3 * LPM, 0.5 * LPM, 7 * LPM
    c_ss = pocket_steady_state(q_o, 1.0, q_n, q_e, ambient=AIR)
    total = pocket_outflow(q_o, q_n, q_e)
    times = [0.0, 10.0, 60.0, 180.0, 600.0, 3600.0]
    sol = _solve_pocket(volume, q_o * 1.0 + q_n + q_e * 0.209, total, 0.209, times)
    assert sol.success
    for t, c_num in zip(times, sol.y[0], strict=True):
        # exact closed form vs numerical ODE solution
        assert pocket_fraction(t, 0.209, c_ss, volume, total) == pytest.approx(c_num, abs=1e-8)
    assert sol.y[0][-1] == pytest.approx(c_ss, abs=1e-8)
    t_enriched = buildup_time(0.235, 0.209, c_ss, volume, total)
    check = _solve_pocket(volume, q_o + q_n + q_e * 0.209, total, 0.209, [0.0, t_enriched])
    assert check.y[0][-1] == pytest.approx(0.235, abs=1e-8)


def test_washout_matches_the_numerical_mass_balance() -> None:
    # Invented pocket: 50 L at 45 % O2 when the oxygen stops, 10 L/min fresh air; the
    # target is the NFPA 99 oxygen-enriched limit, 23.5 % (published).
    volume, q_e, c0 = 0.050, 10 * LPM, 0.45
    t_wash = washout_time(c0, 0.235, volume, q_e, ambient=AIR)
    times = [0.0, 60.0, t_wash]
    sol = _solve_pocket(volume, q_e * 0.209, q_e, c0, times)
    assert sol.success
    assert sol.y[0][-1] == pytest.approx(0.235, abs=1e-8)
    assert fraction_after_stop(c0, 60.0, volume, q_e, ambient=AIR) == pytest.approx(
        sol.y[0][1], abs=1e-8
    )
    # One minute of stopping (published guidance) is not enough for this pocket.
    assert t_wash > 60.0


def test_plausible_pocket_gives_the_barnes_frantz_order() -> None:
    # Barnes & Frantz (2000), published: up to ~45 % O2 under drapes with a nasal cannula
    # at 4 L/min. A pocket of tens of litres with a few L/min of fresh air (invented,
    # plausible) should give that order, not room air and not pure oxygen.
    q_o = 4 * LPM
    fractions = [
        pocket_steady_state(q_o, 1.0, 0.0, q_e * LPM, ambient=AIR) for q_e in (4, 6, 8, 10, 12)
    ]
    assert all(0.35 < c < 0.65 for c in fractions)
    assert min(fractions) < 0.45 < max(fractions)
    # ... and reaches it within minutes, as measured during surgery.
    c_ss = pocket_steady_state(q_o, 1.0, 0.0, 8 * LPM, ambient=AIR)
    t = buildup_time(0.45, 0.209, c_ss, 0.030, pocket_outflow(q_o, 0.0, 8 * LPM))
    assert 60.0 < t < 600.0


# --- Data files: rules/materials.yaml and rules/ignition_sources.yaml -------------------


def _entries(name: str) -> dict[str, dict[str, Any]]:
    data = yaml.safe_load((RULES / name).read_text(encoding="utf-8"))
    return {entry["id"]: entry for entry in data["entries"]}


def _value(field: Any) -> Any:
    return field["value"] if isinstance(field, dict) else field


def _fraction(field: Any) -> float:
    from ignite.room.units import parse_quantity

    return parse_quantity(str(_value(field)), "fraction")


# LOI from ISO 4589-2 / ASTM D2863 tables as quoted in the physics guide §6; for ranges
# the low end (the safer reading).
PUBLISHED_LOI = {
    "polyethylene": 0.174,  # published
    "polypropylene": 0.174,  # published (grades to 21 %)
    "cotton": 0.18,  # published
    "polyester": 0.21,  # published (~21 %)
    "nylon-6-6": 0.24,  # published range 24-29 %, low end
    "rigid-pvc": 0.45,  # published range 45-49 %, low end
    "ptfe": 0.95,  # published
    "polyurethane-foam": 0.165,  # published
    "wool": 0.25,  # memory (~25 %)
    "paper": 0.18,  # memory range 18-19 %, low end
}


def test_material_loi_values_match_the_published_tables() -> None:
    entries = _entries("materials.yaml")
    assert set(entries) == set(PUBLISHED_LOI)
    for material_id, loi in PUBLISHED_LOI.items():
        assert _fraction(entries[material_id]["loi"]) == pytest.approx(loi, abs=1e-12)
    for material_id in ("wool", "paper"):
        assert entries[material_id]["flag"] == "memory"  # physics guide §6 marks these memory


def test_material_humidity_thresholds() -> None:
    # Physics guide §6 (memory): hygroscopic fibres bleed charge above ~30 % RH;
    # polyolefins hardly respond to RH (treated as always holding charge).
    entries = _entries("materials.yaml")
    for material_id in ("cotton", "paper", "wool"):
        assert _fraction(entries[material_id]["holds_charge_below_rh"]) == pytest.approx(0.30)
    for material_id in ("polyethylene", "polypropylene", "ptfe", "polyester", "rigid-pvc"):
        assert _fraction(entries[material_id]["holds_charge_below_rh"]) == 1.0


def test_room_air_flags_the_common_drape_materials() -> None:
    # NFPA 53 (published): materials burn below their LOI when wetted or burning upward;
    # flagged from 2 points below. In room air (20.9 %) that includes polyolefin, cotton,
    # paper and polyester drapes, and not nylon, wool, PVC or PTFE.
    entries = _entries("materials.yaml")
    pairs = [(mid, _fraction(e["loi"])) for mid, e in entries.items()]
    flagged = set(materials_sustaining(0.209, pairs, allowance=0.02))
    assert flagged == {
        "polyethylene",
        "polypropylene",
        "cotton",
        "polyester",
        "polyurethane-foam",
        "paper",
    }


def test_every_data_value_carries_source_and_flag() -> None:
    flags = {"published", "memory", "common practice"}
    for name in ("materials.yaml", "ignition_sources.yaml"):
        for entry in _entries(name).values():
            assert entry["source"] and entry["flag"] in flags
            for field in entry.values():
                if isinstance(field, dict):
                    assert field["source"] and field["flag"] in flags


def test_names_are_unique_across_entries() -> None:
    for name in ("materials.yaml", "ignition_sources.yaml"):
        seen: dict[str, str] = {}
        for entry_id, entry in _entries(name).items():
            for alias in [entry_id, *entry["names"]]:
                key = alias.lower()
                assert seen.setdefault(key, entry_id) == entry_id, f"{alias} in two entries"


def test_ignition_sources_follow_the_physics_guide() -> None:
    from ignite.room.units import parse_quantity

    entries = _entries("ignition_sources.yaml")
    # Physics guide §7: electrosurgery, lasers, burrs and defibrillators are certain.
    for source_id in (
        "monopolar-electrosurgery",
        "bipolar-electrosurgery",
        "argon-enhanced-coagulation",
        "surgical-laser",
        "burr-drill",
        "defibrillator",
    ):
        assert entries[source_id]["mode"] == "certain"
    # Light-cable tips average ~250 °C, up to ~270 °C (published); the upper value is used.
    cable = entries["fibre-optic-light-cable"]
    assert cable["mode"] == "hot-surface"
    assert parse_quantity(str(_value(cable["temperature"])), "temperature") == pytest.approx(543.15)
    # Brush discharges reach ~4 mJ (IEC TS 60079-32-1, published).
    assert parse_quantity(str(_value(entries["brush-discharge"]["energy"])), "energy") == (
        pytest.approx(4e-3)
    )
    # Static from people and trolleys: spark, energy computed per room.
    for source_id in ("static-person", "static-trolley"):
        assert entries[source_id]["mode"] == "spark" and "energy" not in entries[source_id]
    # Any certain source with an energy is far above every MIE in air of the guide's table.
    assert parse_quantity(str(_value(entries["defibrillator"]["energy"])), "energy") > 0.65e-3
