"""Speed figures for ignite, printed, never asserted (machines are shared and noisy).

Run:  python tests/benchmark.py [--repeat N]

Figures are compared as ratios within one run:
- `ignite check` on one room, cold (a fresh process), against a bare import of the
  dependencies it needs (click, yaml, pint): target well under 2 s;
- one case's prep drying, drape-pocket and safe-draping solve: target well under 0.5 s;
- one sample room's worksheet, cold: target about 1.5 s;
- an audit of generated rooms (when `ignite audit` exists): rooms per second;
- ranges (issue 12): one case's drying over 1000 samples, warm (target 1 s), and a room
  with three cases sampled, cold, against the same room at its central values (target 3x).

The figures before the ranges section run the sample rooms at their central values
(`--nominal`, ranges replaced in generated rooms), as they were measured before ranges.
"""

from __future__ import annotations

import argparse
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "sample_rooms"


def timed(command: list[str], repeat: int) -> float:
    """Median wall time of a command in a fresh process."""
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        subprocess.run(command, check=False, capture_output=True, cwd=ROOT)
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    py = sys.executable
    floor_room = str(SAMPLES / "recommissioning-refurbished.yaml")
    list_room = str(SAMPLES / "day-surgery-head-neck.yaml")

    bare = timed([py, "-c", "import click, yaml, pint"], args.repeat)
    heavy = timed([py, "-c", "import click, yaml, pint, chemicals, thermo, reportlab"], args.repeat)
    check_floor = timed([py, "-m", "ignite", "check", floor_room], args.repeat)
    check_list = timed([py, "-m", "ignite", "check", list_room, "--nominal"], args.repeat)
    print(f"bare import click+yaml+pint          {bare:6.2f} s")
    print(f"bare import incl. chemicals/thermo   {heavy:6.2f} s")
    print(
        f"ignite check, floor-only room, cold  {check_floor:6.2f} s  ({check_floor / bare:.1f}x bare import)"
    )
    print(
        f"ignite check, room with 3 cases      {check_list:6.2f} s  ({check_list / heavy:.1f}x import incl. chemicals/thermo)"
    )

    sys.path.insert(0, str(ROOT))
    from ignite.pipeline import open_rulebook, vocabulary
    from ignite.room.load import load_room
    from ignite.rules.bind import bind
    from ignite.simulate.compute import compute

    book = open_rulebook()
    room = load_room(list_room, vocabulary(book))
    bound = bind(room, book)
    compute(room, bound)  # warm the substance caches
    start = time.perf_counter()
    for _ in range(args.repeat):
        compute(room, bound)
    per_room = (time.perf_counter() - start) / args.repeat
    per_case = per_room / max(len(room.cases), 1)
    print(f"compute, warm, per case              {per_case:6.3f} s  (target well under 0.5 s)")

    with_pdf = ROOT / "output" / "benchmark-worksheet.pdf"
    assess = timed(
        [py, "-m", "ignite", "assess", list_room, "-o", str(with_pdf), "--force", "--nominal"],
        args.repeat,
    )
    print(
        f"ignite assess (worksheet), cold      {assess:6.2f} s  ({assess / check_list:.2f}x check)"
    )
    with_pdf.unlink(missing_ok=True)

    # ------------------------------------------------------------------ long lists (issue 14)
    # The 3-case sample room with N point-to-ground and N point-to-point readings, assessed
    # cold; the readings' share should grow about linearly with N (the list limit is 1000).
    import tempfile

    import big_rooms
    import yaml

    with tempfile.TemporaryDirectory(prefix="ignite-bench-readings-") as scratch:
        base = central(yaml.safe_load(SAMPLES.joinpath("day-surgery-head-neck.yaml").read_text()))
        figures = []
        for count in (10, 100, 1000):
            data = dict(base, floor=dict(base["floor"]))
            data["floor"]["point_to_ground"] = big_rooms.readings(count, 1)
            data["floor"]["point_to_point"] = big_rooms.readings(count, 2)
            room = Path(scratch) / f"readings-{count}.yaml"
            room.write_text(yaml.safe_dump(data, allow_unicode=True), encoding="utf-8")
            out = Path(scratch) / f"readings-{count}.pdf"
            figures.append(
                (count, timed([py, "-m", "ignite", "assess", str(room), "-o", str(out)], 1))
            )
            out.unlink(missing_ok=True)
        for count, seconds in figures:
            print(
                f"ignite assess, {count:4d}+{count:<4d} readings     {seconds:6.2f} s  "
                f"(+{seconds - figures[0][1]:.2f} s over 10)"
            )

    # ------------------------------------------------------------------ audit (issue 6)
    # 100 generated rooms (the sample rooms in turn, each with its own id and its floor
    # readings scaled by 0.5 to 2), audited cold into a temporary folder with the default
    # --jobs (one process per CPU). Aim: 100 rooms in 15 s or less on a 2-core machine.
    import os

    def scaled(reading: str, factor: float) -> str:
        number, _, unit = reading.strip().partition(" ")
        return f"{float(number) * factor:.4g} {unit}"

    with tempfile.TemporaryDirectory(prefix="ignite-audit-bench-") as scratch:
        rooms_dir, out_dir = Path(scratch) / "rooms", Path(scratch) / "out"
        samples = sorted(SAMPLES.glob("*.yaml"))
        for number in range(100):
            source = samples[number % len(samples)]
            data = central(yaml.safe_load(source.read_text(encoding="utf-8")))
            data["room"]["id"] = f"GEN-{number:03d}"
            factor = 0.5 + (number % 7) * 0.25
            floor = data["floor"]
            floor["point_to_ground"] = [scaled(r, factor) for r in floor["point_to_ground"]]
            target = rooms_dir / f"block-{number // 25}" / f"{number:03d}-{source.stem}.yaml"
            target.parent.mkdir(parents=True, exist_ok=True)
            text = yaml.safe_dump(data, allow_unicode=True, sort_keys=False)
            target.write_text(text, encoding="utf-8")
        start = time.perf_counter()
        done = subprocess.run(
            [py, "-m", "ignite", "audit", str(rooms_dir), "-o", str(out_dir)],
            check=False,
            capture_output=True,
            text=True,
            cwd=ROOT,
        )
        audit_s = time.perf_counter() - start
        worksheets = len([p for p in out_dir.glob("*.pdf") if p.name != "audit-summary.pdf"])
        per_room = audit_s / 100
        print(
            f"ignite audit, 100 rooms, {os.cpu_count()} CPU(s)  {audit_s:6.2f} s  "
            f"({100 / audit_s:.1f} rooms/s; aim 100 rooms in 15 s or less)"
        )
        print(
            f"  per room {per_room:.3f} s = {per_room / assess:.2f}x one cold ignite assess; "
            f"{worksheets} worksheets, exit code {done.returncode}"
        )
        if done.returncode not in (0, 1):
            print("  " + "\n  ".join(done.stderr.strip().splitlines()[-5:]))

    ranges_section(py, list_room, args.repeat)


def central(data: object) -> object:
    """Room data with every range replaced by its central value written plainly."""
    import re

    if isinstance(data, dict):
        if set(data) == {"low", "likely", "high"}:
            return data["likely"]
        return {key: central(value) for key, value in data.items()}
    if isinstance(data, list):
        return [central(value) for value in data]
    if isinstance(data, str):
        if "±" in data or "+/-" in data:
            return re.split(r"\s*(?:±|\+/-)\s*", data)[0]
        found = re.fullmatch(r"\s*([\d.]+)\s*(\S*)\s+to\s+([\d.]+)\s*(.+)", data)
        if found:
            low, _, high, unit = found.groups()
            return f"{(float(low) + float(high)) / 2:g} {unit.strip()}"
    return data


def ranges_section(py: str, list_room: str, repeat: int) -> None:
    """Issue 12: sampling over ranges."""
    import numpy as np

    from ignite.pipeline import open_rulebook, vocabulary
    from ignite.room.load import load_room
    from ignite.rules.bind import bind
    from ignite.simulate import cases as simulate_cases
    from ignite.simulate.batch import BatchInputs, dry_batch

    book = open_rulebook()
    room = load_room(list_room, vocabulary(book))
    bound = bind(room, book, uncertain=True)
    _, analyses = simulate_cases.preparations(room, bound)
    case = room.cases[0]
    assert case.prep is not None and bound.prep is not None
    a = bound.prep
    rng = np.random.default_rng(1)
    n = 1000

    def spread(value: float, share: float) -> np.ndarray:
        return value * (1.0 + share * (rng.random(n) - 0.5))

    given = BatchInputs(
        spread(case.prep.volume, 0.4),
        spread(case.prep.area, 0.2),
        np.full(n, case.prep.skin_temperature or a.skin_temperature_default),
        np.full(n, room.environment.temperature),
        spread(room.environment.relative_humidity, 0.3),
        spread(case.air_speed, 0.3),
        np.full(n, case.draping_after),
        np.full(n, case.first_activation_after),
        np.full(n, case.drape_pocket.volume),
        spread(case.drape_pocket.exchange, 0.6),
        np.full(n, a.hair_still_layer),
        np.full(n, a.hair_exposed_fraction),
        np.full(n, a.pooling_volume_fraction),
        np.full(n, a.pooling_area_fraction),
        spread(a.tissue_conductance, 0.5),
        case.prep.hair,
        case.prep.pooling,
    )
    analysis = analyses[case.prep.preparation]
    dry_batch(
        analysis,
        BatchInputs(
            **{k: v[:2] if isinstance(v, np.ndarray) else v for k, v in vars(given).items()}
        ),
        a,
    )  # warm the tables
    start = time.perf_counter()
    dry_batch(analysis, given, a)
    warm = time.perf_counter() - start
    print(f"ranges: one case's drying, {n} samples, warm  {warm:6.2f} s  (target 1 s)")
    nominal = timed([py, "-m", "ignite", "check", list_room, "--nominal"], repeat)
    for samples in (100, 1000):
        sampled = timed([py, "-m", "ignite", "check", list_room, "--samples", str(samples)], 1)
        print(
            f"ranges: 3-case room, {samples:4d} samples, cold  {sampled:6.2f} s  "
            f"({sampled / nominal:.1f}x the room at its central values, {nominal:.2f} s; target 3x)"
        )


if __name__ == "__main__":
    main()
