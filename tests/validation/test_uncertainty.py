"""The sampling over ranges against results outside the sampler.

- Ranges of zero width reproduce the nominal run exactly (every figure, every sample).
- Oxygen washout with the pocket's exchange uniform on an interval: the sampled
  percentiles against the closed form. Washout of a well-mixed pocket (continuously
  stirred volume; common practice, as in the dilution-ventilation box model):
  t(Q) = (V/Q)·ln((C_ss − C_a)/(C_lim − C_a)), C_ss = (Q_o·F_o + Q_e·C_a)/(Q_o + Q_e);
  t falls as Q rises, so its p-th percentile is t at Q's (1 − p)-th, Q_p = a + p·(b − a).
- Widening an input's range never narrows the 5–95 % band of the figure it drives.

The oxygen limits (20.9 % ambient, 23.5 % enriched) are read from rules/oxygen.yaml
(composition of dry air, common practice; NFPA 99, published).
"""

from __future__ import annotations

import copy
import math
import shutil
from pathlib import Path
from typing import Any

import pytest
import yaml
from conftest import BASE_ROOM, ROOT
from conftest import SEDATION_CASE as CASE
from hypothesis import given, settings
from hypothesis import strategies as st

from ignite.pipeline import open_rulebook, run_room
from ignite.room.ranges import Sampling

AMBIENT, LIMIT = 0.209, 0.235  # rules/oxygen.yaml
L_PER_MIN = 1e-3 / 60


def _room(tmp_path: Path, name: str, exchange: str, prep: dict[str, Any] | None = None) -> Path:
    data = copy.deepcopy(BASE_ROOM)
    case = copy.deepcopy(CASE)
    case["drape_pocket"]["exchange"] = exchange
    if prep is not None:
        data["preparations"] = [
            {
                "id": "chg-ipa",
                "label": "2 % chlorhexidine in 70 % isopropanol",
                "basis": "volume",
                "components": {"isopropanol": "70 %", "water": "30 %"},
            }
        ]
        case["prep"] = prep
    data["cases"] = [case]
    path = tmp_path / name
    path.write_text(yaml.safe_dump(data, allow_unicode=True, sort_keys=False), encoding="utf-8")
    return path


def _washout(exchange: float) -> float:
    """The closed form above, for 4 L/min of 100 % oxygen into a 30 L pocket."""
    flow, volume = 4 * L_PER_MIN, 30e-3
    steady = (flow * 1.0 + exchange * AMBIENT) / (flow + exchange)
    return volume / exchange * math.log((steady - AMBIENT) / (LIMIT - AMBIENT))


def test_zero_width_ranges_reproduce_the_nominal_run(tmp_path) -> None:
    # rules without the rule values' ranges: every input of the run is then of zero width
    rules = tmp_path / "rules"
    shutil.copytree(ROOT / "rules", rules)
    (rules / "ranges.yaml").unlink()
    book = open_rulebook(rules)
    prep = {
        "preparation": "chg-ipa",
        "volume": "10 to 10 mL",
        "area": {"low": "400 cm^2", "likely": "400 cm^2", "high": "400 cm^2"},
        "hair": False,
        "pooling": False,
    }
    path = _room(tmp_path, "zero.yaml", "10 L/min ± 0 L/min", prep)
    sampled = run_room(path, book, Sampling(samples=20))
    nominal = run_room(path, book, Sampling(nominal=True))
    (case,) = sampled.cases
    (central,) = nominal.cases
    assert case.spread is not None
    expected = {
        "drying_time_s": central.drying_time_s,
        "safe_draping_after_s": central.safe_draping_after_s,
        "pocket_vapour_peak_fraction_of_lfl": central.pocket_vapour_peak_fraction_of_lfl,
        "oxidant_at_activation_fraction": central.oxidant_at_activation_fraction,
        "washout_s": central.washout_s,
    }
    assert {name for name, _ in case.spread.bands} == set(expected)
    for name, band in case.spread.bands:
        assert band.p5 == band.p50 == band.p95 == expected[name], name
    assert case.spread.decision("drape_no_earlier_than_s") == central.safe_draping_after_s
    assert case.spread.decision("stop_oxygen_at_least_s") == central.washout_s
    # the central fields of the record are the nominal run's
    assert case.drying_time_s == central.drying_time_s
    assert case.spread.probability("prep_wet_at_activation") == float(
        (central.flammable_left_at_activation_fraction or 0.0) > 0.01
    )


def test_washout_percentiles_match_the_closed_form(tmp_path) -> None:
    low, high = 6.0, 14.0  # L/min
    samples = 1000
    path = _room(tmp_path, "washout.yaml", f"{low} to {high} L/min")
    results = run_room(path, open_rulebook(), Sampling(samples=samples))
    spread = results.cases[0].spread
    assert spread is not None
    band = spread.band("washout_s")
    assert band is not None
    # Tolerance from the sample size: a Latin hypercube of N puts exactly one sample in
    # each stratum of width 1/N, so the sample read as the p-th percentile (an order
    # statistic, never interpolated) lies within 2/N of p in probability; in seconds that
    # is the slope of t(Q) times 2/N of the interval (the slope is largest at the low end).
    slope = abs(_washout(low * L_PER_MIN * 1.001) - _washout(low * L_PER_MIN)) / (
        low * L_PER_MIN * 0.001
    )
    tolerance = slope * (high - low) * L_PER_MIN * 2 / samples
    for level, found in ((0.05, band.p5), (0.5, band.p50), (0.95, band.p95)):
        exchange = (low + (1 - level) * (high - low)) * L_PER_MIN
        assert found == pytest.approx(_washout(exchange), abs=tolerance), level


@settings(max_examples=12, deadline=None)
@given(
    centre=st.floats(8.0, 20.0),
    half=st.floats(0.5, 3.0),
    wider=st.floats(1.5, 2.5),
)
def test_widening_a_range_never_narrows_its_band(tmp_path_factory, centre, half, wider) -> None:
    folder = tmp_path_factory.mktemp("widen")
    book = open_rulebook()
    bands = []
    for width in (half, half * wider):
        path = _room(
            folder, f"w{width}.yaml", f"{centre - width:.6g} to {centre + width:.6g} L/min"
        )
        spread = run_room(path, book, Sampling(samples=200)).cases[0].spread
        assert spread is not None
        band = spread.band("washout_s")
        assert band is not None
        bands.append(band.p95 - band.p5)
    assert bands[1] >= bands[0]
