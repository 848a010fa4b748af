"""Shared fixtures: the packaged rules and a small valid room to vary."""

from __future__ import annotations

import copy
import os
import tempfile
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest
import yaml

from ignite.pipeline import open_rulebook, vocabulary
from ignite.rules.bound import PrepAssumptions
from ignite.rules.rulebook import Rulebook

# Keep the substance cache of the test session apart from the developer's own
# (set at import, before collection, so the doctests in ignite/ use it too).
os.environ.setdefault("IGNITE_CACHE_DIR", tempfile.mkdtemp(prefix="ignite-test-cache-"))

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = sorted((ROOT / "sample_rooms").glob("*.yaml"))

BASE_ROOM: dict[str, Any] = {
    "format": 1,
    "room": {
        "id": "TST-1",
        "name": "Theatre 1, Test Valley Clinic",
        "purpose": "pre-list",
        "assessed_on": "2026-12-01",
        "assessor": "A. Tester",
        "mains": {"voltage": "230 V", "frequency": "50 Hz", "system": "earthed"},
    },
    "environment": {
        "temperature": "20 degC",
        "relative_humidity": "40 %",
        "air_changes": "20 /h",
        "volume": "120 m^3",
    },
    "floor": {
        "finish": "static-dissipative vinyl sheet",
        "criteria": "medical-location",
        "test_voltage": "500 V",
        "point_to_ground": ["200 kΩ", "300 kΩ", "400 kΩ"],
    },
    "people": [{"role": "scrub practitioner", "count": 1, "footwear": "antistatic"}],
    "cases": [],
}


@pytest.fixture(scope="session")
def book() -> Rulebook:
    return open_rulebook()


@pytest.fixture
def room_data() -> dict[str, Any]:
    return copy.deepcopy(BASE_ROOM)


@pytest.fixture
def write_room(tmp_path: Path) -> Callable[[dict[str, Any]], Path]:
    """Write room data as YAML to a temporary file and return its path."""

    def write(data: dict[str, Any], name: str = "room.yaml") -> Path:
        path = tmp_path / name
        path.write_text(yaml.safe_dump(data, allow_unicode=True, sort_keys=False), encoding="utf-8")
        return path

    return write


@pytest.fixture
def assess_data(book: Rulebook, write_room: Callable[[dict[str, Any]], Path]):  # type: ignore[no-untyped-def]
    """Room data -> evaluated Results."""
    from ignite.pipeline import run_room

    def run(data: dict[str, Any]):  # type: ignore[no-untyped-def]
        return run_room(write_room(data), book)

    return run


__all__ = ["BASE_ROOM", "PREP_ASSUMPTIONS", "ROOT", "SAMPLES", "vocabulary"]


PREP_ASSUMPTIONS = PrepAssumptions(
    dry_fraction=0.01,
    pocket_margin=0.25,
    under_drape_air_speed=0.0,
    hair_still_layer=0.005,
    hair_exposed_fraction=0.5,
    pooling_volume_fraction=0.5,
    pooling_area_fraction=0.1,
    diffusivity_reference_temperature=298.15,
    diffusivities={},
    skin_temperature_default=305.15,
    label_minimum_hairless=180.0,
    label_maximum_hair=3600.0,
    tissue_conductance=12.6,
    film_emissivity=0.95,
)
"""The film model's assumptions as in rules/preparations.yaml, with the diffusivities left to
the Fuller estimate (tests/simulate/test_drying.py checks them against the rule file)."""


# A case of the room contract with no preparation: open oxygen on a limb (test_fuzz,
# test_robustness), and at the head and neck under sedation (test_ranges, test_uncertainty).
FOREARM_CASE: dict[str, Any] = {
    "id": 1,
    "procedure": "excision of a lesion on the forearm",
    "site": "limb",
    "oxygen": {
        "delivery": "face-mask",
        "flow": "4 L/min",
        "fraction": "100 %",
        "nitrous_oxide_flow": "0 L/min",
        "stop_before_activation": "60 s",
    },
    "drape_pocket": {"volume": "30 L", "exchange": "10 L/min"},
    "prep": "none",
    "air_speed": "0.2 m/s",
    "draping_after": "3 min",
    "first_activation_after": "6 min",
    "materials": ["cotton"],
    "ignition_sources": ["monopolar electrosurgery"],
}

SEDATION_CASE: dict[str, Any] = {
    "id": "1",
    "procedure": "excision under sedation",
    "site": "head-neck",
    "oxygen": {
        "delivery": "nasal-cannula",
        "flow": "4 L/min",
        "fraction": "100 %",
        "nitrous_oxide_flow": "0 L/min",
        "stop_before_activation": "60 s",
    },
    "drape_pocket": {"volume": "30 L", "exchange": "10 L/min"},
    "prep": "none",
    "air_speed": "0.2 m/s",
    "draping_after": "3 min",
    "first_activation_after": "6 min",
    "materials": ["cotton"],
    "ignition_sources": ["monopolar electrosurgery"],
}
