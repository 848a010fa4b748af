"""Room files at the loader's list limits, for the bounded-work tests and the benchmark.

Built from the day-surgery sample room: every list filled to its limit
(`ignite.room.bounds.LISTS`), every free-text name at its longest, so that the
worksheet's summaries and cuts are exercised on files the loader accepts.
"""

from __future__ import annotations

import copy
import random
from pathlib import Path
from typing import Any

import yaml

from ignite.room.bounds import LISTS, TEXT_LENGTH

SAMPLE = Path(__file__).resolve().parent.parent / "sample_rooms" / "day-surgery-head-neck.yaml"


def long_name(stem: str, spaces: bool = True) -> str:
    """A name of exactly TEXT_LENGTH characters (one unbroken word when not `spaces`)."""
    unit = f"{stem} " if spaces else stem
    return (unit * (TEXT_LENGTH // len(unit) + 1))[:TEXT_LENGTH]


def readings(count: int, seed: int = 1) -> list[str]:
    """`count` floor readings, most within a medical-location window, some outside it."""
    rng = random.Random(seed)
    return [f"{10 ** rng.uniform(4.3, 8.3):.4g} Ω" for _ in range(count)]


def room_data(
    readings_count: int = LISTS["floor.point_to_ground"].most,
    people: int = 5,
    trolleys: int = 2,
    cases: int = 3,
    per_case: int = LISTS["cases[].ignition_sources"].most,
    spaces: bool = True,
    prep: bool = True,
) -> dict[str, Any]:
    """The sample room with long lists and the longest names the loader accepts."""
    data = yaml.safe_load(SAMPLE.read_text(encoding="utf-8"))
    data["room"]["name"] = long_name("Theatre", spaces)
    data["room"]["assessor"] = long_name("Assessor", spaces)
    data["floor"]["point_to_ground"] = readings(readings_count, 1)
    data["floor"]["point_to_point"] = readings(readings_count, 2)
    base_people = data["people"]
    data["people"] = [
        dict(base_people[i % len(base_people)], role=long_name(f"role{i}", spaces))
        for i in range(people)
    ]
    base_trolleys = data["trolleys"]
    data["trolleys"] = [
        dict(base_trolleys[i % len(base_trolleys)], name=long_name(f"trolley{i}", spaces))
        for i in range(trolleys)
    ]
    materials = yaml.safe_load((SAMPLE.parent.parent / "rules" / "materials.yaml").read_text())
    sources = yaml.safe_load((SAMPLE.parent.parent / "rules" / "ignition_sources.yaml").read_text())
    material_names = [name for e in materials["entries"] for name in e["names"]]
    source_names = [name for e in sources["entries"] for name in e["names"]]
    base_cases = data["cases"]
    data["cases"] = []
    for i in range(cases):
        case = copy.deepcopy(base_cases[i % len(base_cases)])
        case["id"] = str(i + 1)
        case["procedure"] = long_name(f"procedure{i}", spaces)
        case["materials"] = [material_names[k % len(material_names)] for k in range(per_case)]
        case["ignition_sources"] = [source_names[k % len(source_names)] for k in range(per_case)]
        if not prep:  # no drying solve: a long list of cases stays quick
            case["prep"] = "none"
        data["cases"].append(case)
    data["electrical"] = _electrical(data["electrical"], [c["id"] for c in data["cases"]], spaces)
    return data


def _electrical(base: dict[str, Any], case_ids: list[str], spaces: bool) -> dict[str, Any]:
    """The sample's electrical section with every list at its limit and the longest names."""
    devices = base["equipment"]
    equipment = [
        dict(devices[i % len(devices)], id=f"device-{i}", kind=long_name(f"kind{i}", spaces))
        for i in range(LISTS["electrical.equipment"].most)
    ]
    connected = [d["id"] for d in equipment[: LISTS["electrical.cases[].connected"].most]]
    return {
        "supply": base["supply"],
        "bonding": [
            {
                "point": long_name(f"point{i}", spaces),
                "kind": "exposed" if i % 2 else "extraneous",
                "resistance": f"{0.02 + (i % 30) / 100:.2f} Ω",
            }
            for i in range(LISTS["electrical.bonding"].most)
        ],
        "equipment": equipment,
        "cases": [
            {"case": case_id, "cardiac_path": "central-line", "connected": list(connected)}
            for case_id in case_ids[: LISTS["electrical.cases"].most]
        ],
    }


def write_room(path: Path, **kwargs: Any) -> Path:
    path.write_text(yaml.safe_dump(room_data(**kwargs), allow_unicode=True), encoding="utf-8")
    return path
