"""Speed figures for ignite, printed, never asserted (machines are shared and noisy).

Run:  python tests/benchmark.py [--repeat N]

Figures are compared as ratios within one run, each command in a fresh process, the two
commands of a ratio run in turn (A B A B ...) so that a drift of the machine's speed hits
both; the ratio quoted is the median of the pairs' ratios, in CPU time (user + system, the
operating system's accounting of the finished child) and in wall time:
- `ignite check` on one floor-only room, cold (a fresh process; the cache folder of the rule
  book and the unit registry filled, as after the first run), against a bare import of the
  libraries ignite needs (`yaml, click, pint, reportlab, thermo, chemicals`): target 1.5 or
  less; and the same with an empty cache folder (the first run after an install);
- `ignite check` on the room with three cases, against the same import: with its drying
  solves kept from an earlier run (`ignite.simulate.kept`), and solved again
  (`IGNITE_SOLVE_AGAIN=1`, as for a room never run before: the solves are the bulk of it);
- one case's prep drying, drape-pocket and safe-draping solve: target well under 0.5 s;
- one sample room's worksheet, cold: target about 1.5 s; and the sample rooms' worksheets
  drawn in one process in turn (the evaluated rooms at hand), per room, first and after;
- an audit of 100 generated rooms with the default --jobs (one process per CPU): target 8 s
  or less on 2 cores; solved again, then with the solves kept (three runs, the median
  printed; the generated rooms repeat the sample rooms' cases, so kept solves serve most
  of them even in the first run).
- ranges (issue 12): one case's drying over 1000 samples, warm (target 1 s), and a room
  with three cases sampled, cold, against the same room at its central values (target 3x).

Every command runs with Python's bytecode cache on, as on a user's machine after the first
run: `PYTHONDONTWRITEBYTECODE` is dropped from the children's environment (the libraries'
bytecode was written when they were installed; without this, ignite alone would be compiled
from source on every run, about 0.15 s of a cold `check`).

The figures before the ranges section run the sample rooms at their central values
(`--nominal`, ranges replaced in generated rooms), as they were measured before ranges.
"""

from __future__ import annotations

import argparse
import os
import resource
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "sample_rooms"
BARE_IMPORT = "import yaml, click, pint, reportlab, thermo, chemicals"


def _children_cpu() -> float:
    usage = resource.getrusage(resource.RUSAGE_CHILDREN)
    return usage.ru_utime + usage.ru_stime


def run_once(command: list[str], env: dict[str, str] | None = None) -> tuple[float, float]:
    """(CPU seconds, wall seconds) of one run of `command` in a fresh process."""
    cpu = _children_cpu()
    start = time.perf_counter()
    subprocess.run(command, check=False, capture_output=True, cwd=ROOT, env=env)
    return _children_cpu() - cpu, time.perf_counter() - start


def timed(command: list[str], repeat: int, env: dict[str, str] | None = None) -> float:
    """Median wall time of a command in a fresh process."""
    return statistics.median(run_once(command, env)[1] for _ in range(repeat))


def paired(
    a: list[str],
    b: list[str],
    repeat: int,
    env_a=None,  # type: ignore[no-untyped-def]
) -> dict[str, float]:
    """Medians of A's and B's CPU and wall times and of the pair-by-pair ratios A/B.

    `env_a` is called before each run of A for its environment (None: inherit).
    """
    run_once(a, env_a() if env_a else None)  # warm-up, not counted
    run_once(b)
    rows: list[tuple[float, float, float, float]] = []
    for _ in range(repeat):
        a_cpu, a_wall = run_once(a, env_a() if env_a else None)
        b_cpu, b_wall = run_once(b)
        rows.append((a_cpu, a_wall, b_cpu, b_wall))
    return {
        "a_cpu": statistics.median(r[0] for r in rows),
        "a_wall": statistics.median(r[1] for r in rows),
        "b_cpu": statistics.median(r[2] for r in rows),
        "b_wall": statistics.median(r[3] for r in rows),
        "cpu_ratio": statistics.median(r[0] / r[2] for r in rows),
        "wall_ratio": statistics.median(r[1] / r[3] for r in rows),
    }


def _show(label: str, figures: dict[str, float], target: str = "") -> None:
    print(
        f"{label:<44} {figures['a_cpu']:5.2f} s CPU {figures['a_wall']:5.2f} s wall;  "
        f"ratio {figures['cpu_ratio']:.2f} CPU, {figures['wall_ratio']:.2f} wall{target}"
    )


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__)
    parser.add_argument("--repeat", type=int, default=7)
    args = parser.parse_args()
    os.environ.pop("PYTHONDONTWRITEBYTECODE", None)  # as a user's machine: see the note above
    py = sys.executable
    floor_room = str(SAMPLES / "recommissioning-refurbished.yaml")
    list_room = str(SAMPLES / "day-surgery-head-neck.yaml")
    bare_command = [py, "-c", BARE_IMPORT]

    bare = paired(bare_command, bare_command, args.repeat)
    print(f"bare import ({BARE_IMPORT[7:]}): {bare['a_cpu']:.2f} s CPU {bare['a_wall']:.2f} s wall")
    check_floor = [py, "-m", "ignite", "check", floor_room]
    with tempfile.TemporaryDirectory(prefix="ignite-bench-cache-") as scratch:
        cache = {**os.environ, "IGNITE_CACHE_DIR": scratch}
        cache.pop("IGNITE_NO_CACHE", None)
        warm = paired(check_floor, bare_command, args.repeat, lambda: cache)
        _show("ignite check, floor-only room, cold", warm, "  (target <= 1.5)")
        counter = iter(range(10**6))

        def empty() -> dict[str, str]:
            return {**cache, "IGNITE_CACHE_DIR": str(Path(scratch) / f"empty-{next(counter)}")}

        first = paired(check_floor, bare_command, args.repeat, empty)
        _show("  the same, empty cache folder (first run)", first)
        with_cases = paired(
            [py, "-m", "ignite", "check", list_room, "--nominal"], bare_command, 3, lambda: cache
        )
        _show("ignite check, room with 3 cases, cold, solves kept", with_cases)
        solved = paired(
            [py, "-m", "ignite", "check", list_room, "--nominal"],
            bare_command,
            3,
            lambda: {**cache, "IGNITE_SOLVE_AGAIN": "1"},
        )
        _show("  the same, solved again (a new room)", solved, "  (mostly the drying solves)")
    check_list = solved["a_wall"]

    sys.path.insert(0, str(ROOT))
    from ignite.pipeline import open_rulebook, vocabulary
    from ignite.room.load import load_room
    from ignite.rules.bind import bind
    from ignite.simulate.compute import compute

    os.environ["IGNITE_SOLVE_AGAIN"] = "1"  # time the solves, not the kept results
    book = open_rulebook()
    room = load_room(list_room, vocabulary(book))
    bound = bind(room, book)
    compute(room, bound)  # warm the substance caches
    start = time.perf_counter()
    for _ in range(args.repeat):
        compute(room, bound)
    per_room = (time.perf_counter() - start) / args.repeat
    per_case = per_room / max(len(room.cases), 1)
    del os.environ["IGNITE_SOLVE_AGAIN"]
    print(f"compute, warm, per case              {per_case:6.3f} s  (target well under 0.5 s)")

    # One process drawing the sample rooms' worksheets in turn, as an audit's worker does:
    # the first round lays out every paragraph, the later ones reuse the texts they share.
    from ignite.pipeline import evaluate_room, rule_rows
    from ignite.report.worksheet import render_worksheet
    from ignite.room.ranges import Sampling
    from ignite.simulate.compute import METHODS

    drawn = []
    for sample in sorted(SAMPLES.glob("*.yaml")):
        sample_bound, sample_results = evaluate_room(sample, book, Sampling(nominal=True))
        rules = rule_rows(book, set(sample_bound.consulted))
        drawn.append((sample_results, rules, sample.read_text(encoding="utf-8")))
    rounds = []
    for _ in range(1 + args.repeat):
        start = time.perf_counter()
        for sample_results, rules, text in drawn:
            render_worksheet(sample_results, rules, METHODS, text)
        rounds.append((time.perf_counter() - start) / len(drawn))
    print(
        f"worksheet drawing, one process, a room  {rounds[0] * 1000:4.0f} ms first, "
        f"{statistics.median(rounds[1:]) * 1000:4.0f} ms after  (solves kept)"
    )

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
    # --jobs (one process per CPU). Target: 100 rooms in 8 s or less on a 2-core machine.

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
        for label, extra, times in (
            ("solved again", {"IGNITE_SOLVE_AGAIN": "1"}, 1),
            ("solves kept", {}, 3),  # the median of three (a shared machine drifts)
        ):
            walls = []
            for _ in range(times):
                shutil.rmtree(out_dir, ignore_errors=True)
                start = time.perf_counter()
                done = subprocess.run(
                    [py, "-m", "ignite", "audit", str(rooms_dir), "-o", str(out_dir)],
                    check=False,
                    capture_output=True,
                    text=True,
                    cwd=ROOT,
                    env={**os.environ, **extra},
                )
                walls.append(time.perf_counter() - start)
            audit_s = statistics.median(walls)
            if times > 1:
                label += f", median of {times} (fastest {min(walls):.2f} s)"
            worksheets = len([p for p in out_dir.glob("*.pdf") if p.name != "audit-summary.pdf"])
            per_room = audit_s / 100
            print(
                f"ignite audit, 100 rooms, {os.cpu_count()} CPU(s), {label}  {audit_s:6.2f} s  "
                f"({100 / audit_s:.1f} rooms/s; target 100 rooms in 8 s or less)"
            )
            print(
                f"  per room {per_room:.3f} s = {per_room / assess:.2f}x one cold ignite assess; "
                f"{worksheets} worksheets, exit code {done.returncode}"
            )
            if done.returncode not in (0, 1):
                print("  " + "\n  ".join(done.stderr.strip().splitlines()[-5:]))
        print("  (the generated rooms repeat the sample rooms' cases: kept solves serve them)")

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
    from ignite.simulate.batch import BatchInputs
    from ignite.simulate.batch import _dry_batch as solve_batch

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
    solve_batch(
        analysis,
        BatchInputs(
            **{k: v[:2] if isinstance(v, np.ndarray) else v for k, v in vars(given).items()}
        ),
        a,
    )  # warm the tables
    runs = []
    for _ in range(3):  # solved each time, not read from the kept results
        start = time.perf_counter()
        solve_batch(analysis, given, a)
        runs.append(time.perf_counter() - start)
    print(
        f"ranges: one case's drying, {n} samples, warm  {statistics.median(runs):6.2f} s "
        f"median of 3 (fastest {min(runs):.2f} s; target 1 s)"
    )
    again = {**os.environ, "IGNITE_SOLVE_AGAIN": "1"}  # every solve run, none read back
    nominal = timed([py, "-m", "ignite", "check", list_room, "--nominal"], repeat, again)
    for samples in (100, 1000):
        command = [py, "-m", "ignite", "check", list_room, "--samples", str(samples)]
        sampled = timed(command, 1, again)
        print(
            f"ranges: 3-case room, {samples:4d} samples, cold  {sampled:6.2f} s  "
            f"({sampled / nominal:.1f}x the room at its central values, {nominal:.2f} s; target 3x)"
        )


if __name__ == "__main__":
    main()
