"""The values in rules/ against the published sources they name.

Each assertion carries its source and flag. These guard against a typo in a rule file:
they compare with the figure as published, not with our own earlier output.
"""

from __future__ import annotations

import pytest

from ignite.physics.floor import window_low_for_supply

AIR = 0.209  # oxygen in dry air, as rules/oxygen.yaml oxygen.ambient (published)


def window_limits(window, supply_voltage):  # type: ignore[no-untyped-def]
    """(lower limit at this supply voltage, upper limit) of a floor window entry."""
    return window_low_for_supply(supply_voltage, window.get("low")), window.get("high")


def test_medical_location_window(book):
    window = book.entry("medical-location")
    # IEC 60364-7-710 as adopted in NEK 400:710: each reading > 50 kΩ at supply ≤ 500 V (published)
    assert window_limits(window, 230.0)[0] == pytest.approx(50e3)
    # ... > 100 kΩ above 500 V (published)
    assert window_limits(window, 690.0)[0] == pytest.approx(100e3)
    # ... and ≤ 25 MΩ (published)
    assert window.get("high") == pytest.approx(25e6)
    assert window.get("low_inclusive") is False and window.get("high_inclusive") is True


def test_conductive_historical_window(book):
    window = book.entry("conductive-historical")
    # NFPA 99 (up to 2005) via DOE-HDBK-1092-98 §5.1.4.5: > 10 kΩ at 220–240 V (published)
    assert window_limits(window, 230.0)[0] == pytest.approx(10e3)
    # ... > 5 kΩ at 110–120 V (published)
    assert window_limits(window, 120.0)[0] == pytest.approx(5e3)
    # ... < 1 MΩ (published)
    assert window.get("high") == pytest.approx(1e6)
    assert window.get("high_inclusive") is False
    # average of five or more readings > 25 kΩ (memory, NFPA 99 annex)
    assert window.get("mean_low") == pytest.approx(25e3)
    assert window.sourced("mean_low").flag == "to confirm"  # `memory` in the rule file
    assert window.get("mean_min_readings") == 5


def test_esd_control_window(book):
    window = book.entry("esd-control")
    # IEC 61340-5-1; ANSI/ESD S20.20-2014: system < 1 GΩ, walking body voltage < 100 V (published)
    assert window.get("system_high") == pytest.approx(1e9)
    assert window.get("walking_voltage_high") == pytest.approx(100.0)


def test_body_model_and_spark_threshold(book):
    # IEC 61000-4-2 human-body model: 150 pF (published)
    assert book.value("body.capacitance") == pytest.approx(150e-12)
    # Paschen minimum of air ~327 V, hard-coded ~330 V (published)
    assert book.value("spark.no_spark_voltage") == pytest.approx(330.0, abs=5.0)
    # IEC TS 60079-32-1 (common statement): brush discharges ~4 mJ (published)
    assert book.value("brush.discharge_energy") == pytest.approx(4e-3)
    # generation current 0.1 µA (published worked example)
    assert book.value("charge.generation_current") == pytest.approx(0.1e-6)


# IEC 60479-1:2005 Table 1, total body impedance, hand to hand, a.c. 50/60 Hz, dry, large
# contact area (memory: confirm in the standard): touch voltage -> 5th, 50th, 95th percentile.
IEC_60479_TABLE_1 = {
    25.0: (1750.0, 3250.0, 6100.0),
    50.0: (1375.0, 2500.0, 4600.0),
    75.0: (1125.0, 2000.0, 3600.0),
    100.0: (990.0, 1725.0, 3125.0),
    125.0: (900.0, 1550.0, 2675.0),
    150.0: (850.0, 1400.0, 2350.0),
    175.0: (825.0, 1325.0, 2175.0),
    200.0: (800.0, 1275.0, 2050.0),
    225.0: (775.0, 1225.0, 1900.0),
    400.0: (700.0, 950.0, 1275.0),
    500.0: (625.0, 850.0, 1150.0),
    700.0: (575.0, 775.0, 1050.0),
    1000.0: (575.0, 775.0, 1050.0),
}


@pytest.mark.parametrize(("column", "percentile"), [(0, 5), (1, 50), (2, 95)])
def test_body_impedance_table(book, column, percentile):
    entry = book.entry(f"body.impedance.p{percentile}")
    points = dict(entry.get("points"))
    assert points.keys() == IEC_60479_TABLE_1.keys()
    for volts, row in IEC_60479_TABLE_1.items():
        # IEC 60479-1:2005 Table 1, hand to hand, dry, large contact area (memory)
        assert points[volts] == pytest.approx(row[column])
    assert "IEC 60479-1" in entry.source and entry.flag == "to confirm"


def test_body_impedance_percentile_and_path_factor(book):
    # the 5th percentile: 5 % of people have a lower impedance (IEC 60479-1:2005 Table 1,
    # memory), the conservative side for the shock current
    assert book.value("body.impedance_percentile") == pytest.approx(0.05)
    assert book.entry("body.impedance_percentile").flag == "to confirm"
    # hand to feet some 10 % to 30 % lower than hand to hand (IEC 60479-1:2005, memory):
    # the 30 % reduction, the safe side
    assert book.value("body.impedance_path_factor") == pytest.approx(0.70)
    assert book.entry("body.impedance_path_factor").flag == "to confirm"


def test_shock_thresholds(book):
    # IEC 60479-1 (published): perception ~0.5 mA, let-go ~10 mA, fibrillation from ~50 mA
    assert book.value("shock.perception") == pytest.approx(0.5e-3)
    assert book.value("shock.let_go") == pytest.approx(10e-3)
    assert book.value("shock.fibrillation") == pytest.approx(50e-3)


@pytest.mark.parametrize(
    ("curve", "expected"),
    [
        # ESD industry table of typical voltages (published): vinyl 12, 5, 3 kV at 10, 40,
        # 55 % RH; its two-column form (ESD Association; DOD-HDBK-263), 65-90 % RH column:
        # 250 V walking across vinyl (memory), placed at 65 % and held to 90 %
        ("saturation.vinyl", {0.10: 12e3, 0.40: 5e3, 0.55: 3e3, 0.65: 250.0, 0.90: 250.0}),
        # ... carpet 35, 15, 7.5 kV (published); 65-90 % RH column 1.5 kV (memory)
        ("saturation.carpet", {0.10: 35e3, 0.40: 15e3, 0.55: 7.5e3, 0.65: 1.5e3, 0.90: 1.5e3}),
    ],
)
def test_humidity_tables(book, curve, expected):
    points = dict(book.points(curve))
    assert points.keys() == expected.keys()
    for rh, volts in expected.items():
        assert points[rh] == pytest.approx(volts)
    # the high-humidity column is memory, so the table as a whole is flagged memory
    assert book.entry(curve).flag == "to confirm" and "DOD-HDBK-263" in book.entry(curve).source


@pytest.mark.parametrize(
    ("fuel", "mie_air_mJ", "mie_o2_mJ"),
    [
        ("hydrogen", 0.017, 0.0012),  # air published; O₂ memory (Lewis & von Elbe)
        ("methane", 0.28, 0.003),  # air published; O₂ memory
        ("propane", 0.25, 0.002),  # air published; O₂ memory (Blanc et al. 1949)
        ("diethyl-ether", 0.19, 0.0013),  # memory (Calcote et al. 1952; Blanc et al. 1949)
        ("cyclopropane", 0.17, 0.001),  # memory
        ("isopropanol", 0.65, None),  # memory (Calcote et al. 1952; NFPA 77 Annex B)
        ("ethanol", 0.28, None),  # published (compilation citing NFPA 497/921)
        ("methanol", 0.14, None),  # memory
        ("acetone", 0.55, None),  # published (compilation)
        ("n-hexane", 0.24, None),  # memory
        ("n-heptane", 0.24, None),  # memory
    ],
)
def test_fuel_mie(book, fuel, mie_air_mJ, mie_o2_mJ):
    entry = book.entry(fuel)
    assert entry.get("mie_air") == pytest.approx(mie_air_mJ * 1e-3)
    if mie_o2_mJ is None:
        assert entry.get("mie_oxygen") is None
    else:
        assert entry.get("mie_oxygen") == pytest.approx(mie_o2_mJ * 1e-3)


def test_fuel_exponents_match_their_pairs(book):
    """The exponent written for each fuel with an air/O₂ pair is the pair's fit (derived; pairs memory)."""
    from ignite.physics.ignition import fitted_exponent

    for fuel in book.of_kind("fuels"):
        if fuel.get("mie_oxygen") is not None:
            fitted = fitted_exponent(fuel.get("mie_air"), fuel.get("mie_oxygen"), air_fraction=AIR)
            assert fuel.get("exponent") == pytest.approx(fitted, abs=0.06), fuel.id


def test_oxygen_limits(book):
    # NFPA 99: oxygen-enriched atmosphere above 23.5 % (published)
    assert book.value("oxygen.enriched_limit") == pytest.approx(0.235)
    # surgical-fire prevention guidance: ≤ 30 % O₂ for open delivery; stop ≥ 1 min before (published)
    assert book.value("oxygen.open_delivery_ceiling") == pytest.approx(0.30)
    assert book.value("oxygen.stop_advice") == pytest.approx(60.0)
    # NFPA 53: flag materials from 2 points below their LOI (published)
    assert book.value("materials.loi_allowance") == pytest.approx(0.02)


def test_footwear_classes(book):
    # representative upper resistances (common practice; confirm against EN ISO 20345, IEC 61340-4-3)
    expected = {"conductive": 100e3, "esd": 35e6, "antistatic": 1e9, "insulating": 1e12}
    for name, ohms in expected.items():
        assert book.entry(name).get("resistance") == pytest.approx(ohms)
