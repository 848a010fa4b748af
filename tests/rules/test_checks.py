"""One-line cases: this room fragment gives these findings."""

from __future__ import annotations

import pytest


def rules_of(results):  # type: ignore[no-untyped-def]
    return {f.rule for f in results.findings}


def test_compliant_floor_and_antistatic_footwear_give_only_the_shock_note(room_data, assess_data):
    # 230 V across 200 kΩ + 541 Ω (body hand to feet) is 1.1 mA: above perception (0.5 mA), below let-go (10 mA)
    assert rules_of(assess_data(room_data)) == {"shock.current-perception"}


def test_low_reading_is_a_high_finding(room_data, assess_data):
    room_data["floor"]["point_to_ground"] = ["200 kΩ", "40 kΩ", "400 kΩ"]
    results = assess_data(room_data)
    finding = next(f for f in results.findings if f.rule == "floor.reading-below-window")
    assert finding.severity == "high"
    assert finding.measured.value == 40e3 and finding.limit.value == 50e3
    assert "NEK 400:710" in finding.source
    assert not results.floor.passed


def test_reading_equal_to_an_exclusive_lower_limit_is_outside(room_data, assess_data):
    # medical-location: each reading must be *above* 50 kΩ
    room_data["floor"]["point_to_ground"] = ["50 kΩ", "400 kΩ"]
    assert "floor.reading-below-window" in rules_of(assess_data(room_data))


def test_reading_equal_to_an_inclusive_upper_limit_is_inside(room_data, assess_data):
    # medical-location: each reading ≤ 25 MΩ
    room_data["floor"]["point_to_ground"] = ["25 MΩ", "400 kΩ"]
    results = assess_data(room_data)
    assert "floor.reading-above-window" not in rules_of(results)
    assert results.floor.passed


def test_high_reading_is_a_medium_finding(room_data, assess_data):
    room_data["floor"]["point_to_ground"] = ["200 kΩ", "30 MΩ"]
    finding = next(
        f for f in assess_data(room_data).findings if f.rule == "floor.reading-above-window"
    )
    assert finding.severity == "medium"


def test_very_low_floor_gives_one_shock_finding_at_the_worst_level(room_data, assess_data):
    # body hand to feet at 230 V: 0.7 × 773 Ω (IEC 60479-1:2005 Table 1, 5th percentile,
    # memory) = 541 Ω; 230 V across 3 kΩ + 541 Ω = 65 mA: at or above 50 mA (IEC 60479-1)
    room_data["floor"]["point_to_ground"] = ["3 kΩ", "400 kΩ"]
    shock = [f for f in assess_data(room_data).findings if f.rule.startswith("shock.")]
    assert [f.rule for f in shock] == ["shock.current-fibrillation"]
    assert shock[0].severity == "high"
    # mitigation: a floor of at least U/I_let-go − R_body = 230/0.01 − 541 = 22.5 kΩ
    assert any("22.5 kΩ" in m for m in shock[0].mitigations)


def test_insulating_footwear_can_spark(room_data, assess_data):
    room_data["people"][0]["footwear"] = "insulating"
    results = assess_data(room_data)
    finding = next(f for f in results.findings if f.rule == "static.spark-possible")
    # saturation on vinyl at 40 % RH is 5 kV (ESD industry table, published)
    assert finding.measured.value == 5e3
    # footwear ≤ (330 V / 0.1 µA) − 400 kΩ ≈ 3.3 GΩ keeps the voltage below the no-spark voltage
    assert any("3.3 GΩ" in m for m in finding.mitigations)
    assert results.people[0].settle_time_s > 0


def test_esd_control_floor_checks_the_system_and_walking_voltage(room_data, assess_data):
    room_data["floor"]["criteria"] = "esd-control"
    rules = rules_of(assess_data(room_data))
    # antistatic 1 GΩ + floor 400 kΩ ≥ 1 GΩ, and 0.1 µA × 1.0004 GΩ > 100 V
    assert {"static.system-resistance", "static.walking-voltage"} <= rules


def test_conductive_historical_average_rule(room_data, assess_data):
    room_data["floor"]["criteria"] = "conductive-historical"
    room_data["floor"]["point_to_ground"] = ["20 kΩ"] * 5
    results = assess_data(room_data)
    assert "floor.mean-below-window" in rules_of(results)
    assert not results.floor.passed


def test_findings_are_sorted_worst_first(room_data, assess_data):
    room_data["floor"]["point_to_ground"] = ["3 kΩ", "30 MΩ"]
    room_data["people"][0]["footwear"] = "insulating"
    ranks = [f.severity for f in assess_data(room_data).findings]
    order = ["high", "medium", "low", "note"]
    assert ranks == sorted(ranks, key=order.index)


def _case(site: str, delivery: str = "nasal-cannula", stop: str = "60 s") -> dict:
    return {
        "id": 1,
        "procedure": "excision of a lesion",
        "site": site,
        "oxygen": {
            "delivery": delivery,
            "flow": "4 L/min" if delivery != "closed-airway" else "0 L/min",
            "fraction": "100 %",
            "nitrous_oxide_flow": "0 L/min",
            "stop_before_activation": stop,
        },
        "drape_pocket": {"volume": "30 L", "exchange": "10 L/min"},
        "prep": "none",
        "air_speed": "0.2 m/s",
        "draping_after": "3 min",
        "first_activation_after": "6 min",
        "materials": ["nonwoven polypropylene"],
        "ignition_sources": ["monopolar electrosurgery"],
    }


def test_cannula_at_a_head_neck_site_with_one_minute_stop_is_high(room_data, assess_data):
    room_data["cases"] = [_case("head-neck")]
    results = assess_data(room_data)
    case = results.cases[0]
    # well-mixed pocket: (4·1 + 10·0.209)/(4 + 10) = 0.435 while oxygen flows
    assert case.oxidant_fraction == pytest.approx((4 * 1.0 + 10 * 0.209) / 14, rel=1e-6)
    finding = next(f for f in results.findings if f.rule == "oxygen.enriched-at-activation")
    assert finding.severity == "high"
    # washout to 23.5 %: (30 L / 10 L/min)·ln((0.435 − 0.209)/(0.235 − 0.209)) = 6.49 min → 6.5 min
    assert any("at least 6.5 min" in m for m in finding.mitigations)


def test_longer_stop_clears_the_oxygen_finding(room_data, assess_data):
    room_data["cases"] = [_case("head-neck", stop="7 min")]
    rules = rules_of(assess_data(room_data))
    assert "oxygen.enriched-at-activation" not in rules


def test_closed_airway_gives_no_oxygen_finding(room_data, assess_data):
    room_data["cases"] = [_case("head-neck", delivery="closed-airway", stop="0 s")]
    results = assess_data(room_data)
    assert results.cases[0].oxidant_fraction == pytest.approx(0.209)
    assert not any(f.rule.startswith("oxygen.") for f in results.findings)


def test_face_mask_does_not_feed_a_limb_pocket(room_data, assess_data):
    room_data["cases"] = [_case("limb", delivery="face-mask", stop="0 s")]
    results = assess_data(room_data)
    assert results.cases[0].oxidant_fraction == pytest.approx(0.209)
    assert any("does not reach" in n or "not to reach" in n for n in results.cases[0].notes)
    assert not any(f.rule.startswith("oxygen.") for f in results.findings)


ETHANOL_PREP = {
    "id": "chg-eth",
    "label": "chlorhexidine in 70 % ethanol",
    "basis": "volume",
    "components": {"ethanol": "70 %", "water": "30 %"},
}
AQUEOUS_PREP = {
    "id": "pvi-aq",
    "label": "povidone-iodine, aqueous",
    "basis": "mass",
    "components": {"water": "90 %"},
}


def _prep(preparation: str) -> dict:
    return {
        "preparation": preparation,
        "volume": "10 mL",
        "area": "400 cm^2",
        "hair": False,
        "pooling": False,
    }


def test_trolley_below_the_no_spark_voltage_in_96_percent_oxidant_gives_no_spark(
    room_data, assess_data
):
    # 300 pF trolley on 3 GΩ + 400 kΩ: 0.1 µA × 3.0004 GΩ = 300 V, below the ~330 V Paschen
    # minimum of air (published): no spark, though ½·C·V² = 13.5 µJ is stored and ethanol's
    # MIE at 96 % oxidant is 0.28 mJ × (0.962/0.209)^−3 ≈ 2.9 µJ (rules/fuels.yaml)
    room_data["trolleys"] = [
        {"name": "instrument trolley", "capacitance": "300 pF", "path_to_floor": "3 GΩ"}
    ]
    room_data["preparations"] = [ETHANOL_PREP]
    case = _case("head-neck", delivery="face-mask", stop="0 s")
    case["oxygen"]["flow"] = "10 L/min"
    case["drape_pocket"]["exchange"] = "0.5 L/min"
    case["prep"] = _prep("chg-eth")
    room_data["cases"] = [case]
    results = assess_data(room_data)
    assert results.cases[0].oxidant_at_activation_fraction == pytest.approx(0.962, abs=1e-3)
    trolley = results.trolleys[0]
    assert trolley.body_voltage_V == pytest.approx(300.0, rel=1e-3)
    assert trolley.spark_energy_J == 0.0
    assert trolley.stored_charge_C == pytest.approx(300e-12 * trolley.body_voltage_V)
    assert results.lowest_site_mie_J is not None and results.lowest_site_mie_J < 13.5e-6
    assert not any(f.rule.startswith("static.spark") for f in results.findings)


def test_trolley_above_the_no_spark_voltage_in_96_percent_oxidant_is_high(room_data, assess_data):
    # the same trolley on 4 GΩ: 400 V > 330 V, ½·300 pF·(400 V)² = 24 µJ ≥ 2.9 µJ
    room_data["trolleys"] = [
        {"name": "instrument trolley", "capacitance": "300 pF", "path_to_floor": "4 GΩ"}
    ]
    room_data["preparations"] = [ETHANOL_PREP]
    case = _case("head-neck", delivery="face-mask", stop="0 s")
    case["oxygen"]["flow"] = "10 L/min"
    case["drape_pocket"]["exchange"] = "0.5 L/min"
    case["prep"] = _prep("chg-eth")
    room_data["cases"] = [case]
    finding = next(f for f in assess_data(room_data).findings if f.rule == "static.spark-above-mie")
    assert finding.subject == "instrument trolley" and finding.severity == "high"


@pytest.mark.parametrize("prep", ["none", "pvi-aq"])
def test_a_case_without_a_flammable_prep_has_no_preparation_fuel_or_mie(
    room_data, assess_data, prep
):
    # the room stocks an ethanol prep, but this case uses none (or the aqueous one):
    # no MIE from preparations, and the fuel side only from materials that burn
    room_data["preparations"] = [ETHANOL_PREP, AQUEOUS_PREP]
    case = _case("head-neck", delivery="closed-airway", stop="0 s")
    case["materials"] = []
    case["prep"] = "none" if prep == "none" else _prep(prep)
    room_data["cases"] = [case]
    results = assess_data(room_data)
    result = results.cases[0]
    assert result.mie_J is None and result.mie_fuel == ""
    assert not result.triad.fuel and not result.prep_flammable
    # the room's lowest MIE still covers the stocked ethanol prep, in room air
    assert results.lowest_site_mie_J == pytest.approx(0.28e-3)  # ethanol, rules/fuels.yaml
    assert "case.fire-triad" not in rules_of(results)


def test_a_case_takes_its_mie_from_its_own_preparation(room_data, assess_data):
    # isopropanol 0.65 mJ, ethanol 0.28 mJ in air (rules/fuels.yaml): the isopropanol
    # case is not given ethanol's lower MIE because the room also stocks ethanol
    room_data["preparations"] = [
        ETHANOL_PREP,
        {
            "id": "chg-ipa",
            "label": "chlorhexidine in 70 % isopropanol",
            "basis": "volume",
            "components": {"isopropanol": "70 %", "water": "30 %"},
        },
    ]
    case = _case("head-neck", delivery="closed-airway", stop="0 s")
    case["prep"] = _prep("chg-ipa")
    room_data["cases"] = [case]
    result = assess_data(room_data).cases[0]
    assert result.mie_J == pytest.approx(0.65e-3)
    assert "sopropanol" in result.mie_fuel


def test_open_cannula_at_room_air_gives_no_oxidant_side(room_data, assess_data):
    # cannula at 21 % near the airway: the site stays at ~20.9 %, below the 23.5 % limit
    case = _case("head-neck")
    case["oxygen"]["fraction"] = "21 %"
    room_data["cases"] = [case]
    results = assess_data(room_data)
    assert results.cases[0].oxidant_at_activation_fraction < 0.235
    assert not results.cases[0].triad.oxidant
    assert "case.fire-triad" not in rules_of(results)


def test_nitrous_oxide_gives_the_oxidant_side(room_data, assess_data):
    # N₂O is an oxidant: delivered at all, the oxidant side is present even where the
    # site's oxygen stays at room air (a limb site the face's gases are taken not to reach)
    case = _case("limb", delivery="face-mask")
    case["oxygen"]["fraction"] = "21 %"
    case["oxygen"]["nitrous_oxide_flow"] = "2 L/min"
    room_data["cases"] = [case]
    result = assess_data(room_data).cases[0]
    assert result.oxidant_at_activation_fraction < 0.235
    assert result.triad.oxidant
    assert any("Nitrous oxide" in note for note in result.notes)


@pytest.mark.parametrize(("rh", "volts", "warned"), [("70 %", 250.0, False), ("95 %", 250.0, True)])
def test_high_humidity_reads_the_two_column_table_and_warns_only_outside_it(
    room_data, assess_data, rh, volts, warned
):
    # insulating footwear on vinyl: the voltage is the saturation voltage, 250 V at 65-90 %
    # RH (ESD Association two-column table; DOD-HDBK-263; memory): below the no-spark
    # voltage, so no static finding; only above 90 % RH is the table's end value flagged
    room_data["environment"]["relative_humidity"] = rh
    room_data["people"][0]["footwear"] = "insulating"
    results = assess_data(room_data)
    assert results.people[0].body_voltage_V == pytest.approx(volts)
    assert results.people[0].spark_energy_J == 0.0
    assert not any(f.rule.startswith("static.") for f in results.findings)
    assert any("outside the humidity table" in w for w in results.warnings) == warned
