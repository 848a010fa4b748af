"""Speed figures for ignite, printed, never asserted (machines are shared and noisy).

Run:  python tests/benchmark.py [--repeat N]

Figures are compared as ratios within one run:
- `ignite check` on one room, cold (a fresh process), against a bare import of the
  dependencies it needs (click, yaml, pint): target well under 2 s;
- one case's prep drying, drape-pocket and safe-draping solve: target well under 0.5 s;
- one sample room's worksheet, cold: target about 1.5 s;
- an audit of generated rooms (when `ignite audit` exists): rooms per second.
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
    check_list = timed([py, "-m", "ignite", "check", list_room], args.repeat)
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
        [py, "-m", "ignite", "assess", list_room, "-o", str(with_pdf), "--force"], args.repeat
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
        base = yaml.safe_load(SAMPLES.joinpath("day-surgery-head-neck.yaml").read_text())
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
            data = yaml.safe_load(source.read_text(encoding="utf-8"))
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


if __name__ == "__main__":
    main()
