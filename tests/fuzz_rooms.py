"""Fuzz the room loader and the calculations with mutated room files.

Run:  python tests/fuzz_rooms.py [-n 10000] [--seed 1] [--keep DIR]

Each file is a sample room, a test room or the template, mutated: keys deleted or
duplicated, values swapped for other types, quantities made odd or extreme, YAML tags,
anchors and aliases, other encodings, truncation, lone surrogates, long lists and
strings. Every file must either load into a Room (and then compute to a record whose
every figure is finite and in range) or be refused with problems in `FILE:LINE: key`
form. The script prints its counts: crashes, solves over 10 s, non-finite or
out-of-range figures, and rejections not in that form. `tests/test_fuzz.py` runs a
few hundred of the same files in CI.
"""

from __future__ import annotations

import argparse
import copy
import json
import math
import random
import re
import sys
import tempfile
import time
import traceback
from collections import Counter
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import yaml

ROOT = Path(__file__).resolve().parent.parent
SEEDS = [
    *sorted((ROOT / "sample_rooms").glob("*.yaml")),
    ROOT / "tests" / "rooms" / "valid-full.yaml",
    ROOT / "tests" / "rooms" / "valid-floor-only.yaml",
]
NASTY = ROOT / "tests" / "rooms" / "nasty"
SLOW_S = 10.0

NUMBERS = [
    "0",
    "-1",
    "-0",
    "1e-300",
    "5e-324",
    "1e300",
    "1.7976931348623157e308",
    "1.8e308",
    "1e309",
    "nan",
    "inf",
    "-inf",
    ".5",
    "1" * 400,
    "0.24",
    "68",
    "1e26",
]
UNITS = [
    "",
    "%",
    "degC",
    "degF",
    "K",
    "V",
    "kV",
    "Hz",
    "Ω",
    "TΩ",
    "pF",
    "F",
    "L",
    "mL",
    "m^3",
    "L/min",
    "/h",
    "s",
    "h",
    "cm^2",
    "m/s",
    "kg",
    "deg",
    "ohm ohm",
    "(",
    "%%",
]
ODD_VALUES: list[Any] = [
    None,
    True,
    0,
    -5,
    10**30,
    1.5,
    float("inf"),
    "",
    " ",
    "x" * 3000,
    "\ud800",
    "a\udfffb",
    [],
    ["1 kΩ"],
    {},
    {"a": 1},
    "2026-13-45",
    "none",
]


def _quantity_like(value: Any) -> bool:
    return isinstance(value, str) and bool(re.match(r"\s*[-+]?\.?\d", value))


def _paths(data: Any, prefix: tuple[Any, ...] = ()) -> Iterator[tuple[Any, ...]]:
    """Every key path (tuple of keys and indices) in `data`."""
    if isinstance(data, dict):
        for key, value in data.items():
            yield (*prefix, key)
            yield from _paths(value, (*prefix, key))
    elif isinstance(data, list):
        for index, value in enumerate(data):
            yield (*prefix, index)
            yield from _paths(value, (*prefix, index))


def _parent(data: Any, path: tuple[Any, ...]) -> Any:
    for key in path[:-1]:
        data = data[key]
    return data


def mutate_data(data: Any, rng: random.Random) -> Any:
    """One to three structural or value mutations of plain room data."""
    data = copy.deepcopy(data)
    for _ in range(rng.choice([1, 1, 2, 3])):
        paths = list(_paths(data))
        if not paths:
            break
        path = rng.choice(paths)
        parent = _parent(data, path)
        key = path[-1]
        current = parent[key]
        action = rng.random()
        if action < 0.35 and _quantity_like(current) and " " in current.strip():
            # a plausible value: the same unit, scaled by up to ten either way
            number, unit = current.strip().split(None, 1)
            try:
                scaled = float(number.replace("\u2212", "-")) * 10 ** rng.uniform(-1, 1)
            except ValueError:
                continue
            parent[key] = f"{scaled:.3g} {unit}"
        elif action < 0.45:
            del parent[key]
        elif action < 0.65 and _quantity_like(current):
            number = rng.choice(NUMBERS)
            unit = current.split(None, 1)[1] if " " in current.strip() else ""
            unit = rng.choice([unit, unit, rng.choice(UNITS)])
            parent[key] = f"{number} {unit}".strip()
        elif action < 0.8:
            parent[key] = rng.choice(ODD_VALUES)
        elif action < 0.88 and isinstance(current, list) and current:
            parent[key] = current * rng.choice([2, 60, 300, 1200])
        elif action < 0.94 and isinstance(parent, dict):
            parent[rng.choice(["colour", "Volume", "extra", "count", "\ud801x"])] = current
        else:
            parent[key] = rng.choice(ODD_VALUES)
    return data


def mutate_text(text: str, rng: random.Random) -> str | bytes:
    """A text-level mutation: YAML features, duplicated lines, encodings, truncation."""
    lines = text.splitlines(keepends=True)
    action = rng.randrange(9)
    index = rng.randrange(len(lines)) if lines else 0
    if action == 0 and lines:  # duplicate a line: a duplicated key, or a list item
        lines.insert(index, lines[index])
    elif action == 1 and lines:  # delete a line
        del lines[index]
    elif action == 2 and lines:  # an anchor and an alias
        line = lines[index]
        if ": " in line:
            key, value = line.split(": ", 1)
            lines[index] = f"{key}: &a {value}"
            lines.append("extra: *a\n")
    elif action == 3 and lines:  # a tag
        line = lines[index]
        if ": " in line:
            key, value = line.split(": ", 1)
            tag = rng.choice(["!!python/object:os.system", "!!binary", "!custom", "!!set", "!!str"])
            lines[index] = f"{key}: {tag} {value}"
    elif action == 4:  # truncation
        return text[: rng.randrange(len(text) + 1)]
    elif action == 5:  # another encoding
        encoding = rng.choice(["utf-16", "latin-1", "utf-8-sig", "cp1252"])
        return text.encode(encoding, "replace")
    elif action == 6:  # a byte-level cut inside a multi-byte character, or a bad byte
        raw = text.encode("utf-8")
        cut = rng.randrange(len(raw) + 1)
        return raw[:cut] + rng.choice([b"\xff", b"\xc3", b"\x00", b""]) + raw[cut:]
    elif action == 7 and lines:  # indentation changed
        lines[index] = rng.choice(["  ", "\t", ""]) + lines[index].lstrip()
    elif action == 8 and lines:  # a lone surrogate written as a YAML escape
        line = lines[index]
        if ": " in line:
            key, _ = line.split(": ", 1)
            lines[index] = f'{key}: "\\ud800 x"\n'
    return "".join(lines)


def generate(count: int, seed: int) -> Iterator[tuple[str, bytes]]:
    """`count` (name, bytes) room files, deterministic for a seed."""
    from ignite.room.template import TEMPLATE

    rng = random.Random(seed)
    texts = [path.read_text(encoding="utf-8") for path in SEEDS] + [TEMPLATE]
    datas = [yaml.safe_load(text) for text in texts]
    for number in range(count):
        which = rng.randrange(len(texts))
        if rng.random() < 0.6:
            data = mutate_data(datas[which], rng)
            try:
                text = yaml.dump(data, allow_unicode=True, sort_keys=False)
            except yaml.YAMLError:
                continue
            body: str | bytes = text if rng.random() < 0.7 else mutate_text(text, rng)
        else:
            body = mutate_text(texts[which], rng)
        raw = body if isinstance(body, bytes) else body.encode("utf-8", "surrogatepass")
        yield f"fuzz-{seed}-{number:05d}.yaml", raw


# -- checking one file ---------------------------------------------------------------------

_SIGNED = ("_rise_fraction",)
_NON_NEGATIVE = ("_s", "_ohm", "_F", "_J", "_C", "_A", "_V", "_K", "_m3", "_m3_per_s", "_per_s")


def figure_problems(record: Any, path: str = "") -> Iterator[str]:
    """Figures of a JSON record that are not finite numbers in their key's range."""
    if isinstance(record, dict):
        for key, value in record.items():
            where = f"{path}.{key}" if path else key
            if isinstance(value, float) and not isinstance(value, bool):
                if not math.isfinite(value):
                    yield f"{where}: not finite ({value})"
                elif key.endswith(_SIGNED):
                    if not -1.0 <= value <= 1.0:
                        yield f"{where}: {value} outside -1..1"
                elif key.endswith("_fraction") and not 0.0 <= value <= 1.0:
                    yield f"{where}: {value} outside 0..1"
                elif key.endswith(_NON_NEGATIVE) and value < 0.0:
                    yield f"{where}: {value} negative"
            elif value is None and f"{key}_note" in record and not record.get(f"{key}_note"):
                yield f"{where}: null without a reason"
            else:
                yield from figure_problems(value, where)
    elif isinstance(record, list):
        for index, value in enumerate(record):
            if isinstance(value, float) and not math.isfinite(value):
                yield f"{path}[{index}]: not finite ({value})"
            else:
                yield from figure_problems(value, f"{path}[{index}]")


def _count_notes(record: Any) -> int:
    """Null figures with a reason beside them (`washout_s: null, washout_note: ...`)."""
    from ignite.records.results import _note_key

    if isinstance(record, dict):
        own = sum(
            1
            for key, value in record.items()
            if value is None and record.get(_note_key(key, {}), None) is not None
        )
        return own + sum(_count_notes(value) for value in record.values())
    if isinstance(record, list):
        return sum(_count_notes(value) for value in record)
    return 0


@dataclass
class Tally:
    files: int = 0
    loaded: int = 0
    computed: int = 0
    skipped_slow_kind: int = 0
    rejected: int = 0
    nulls: int = 0  # figures that do not exist (null, with a reason beside them)
    crashes: list[str] = field(default_factory=list)
    slow: list[str] = field(default_factory=list)
    bad_figures: list[str] = field(default_factory=list)
    bad_rejections: list[str] = field(default_factory=list)
    kinds: Counter[str] = field(default_factory=Counter)

    def line(self) -> str:
        return (
            f"{self.files} files: {self.loaded} loaded ({self.computed} computed, "
            f"{self.skipped_slow_kind} with preparations not computed), {self.rejected} "
            f"rejected; {self.nulls} null figures with a reason; {len(self.crashes)} crashes, {len(self.slow)} solves over {SLOW_S:g} s, "
            f"{len(self.bad_figures)} non-finite or out-of-range figures, "
            f"{len(self.bad_rejections)} rejections not in FILE:LINE: key form"
        )


def check_file(path: Path, book: Any, tally: Tally, *, compute_preps: bool = True) -> None:
    """Load (and compute) one file, recording what happened in `tally`."""
    from ignite.errors import InputError
    from ignite.pipeline import evaluate_room, vocabulary
    from ignite.room.load import load_room
    from ignite.room.ranges import Sampling

    tally.files += 1
    shown = str(path)
    form = re.compile(re.escape(shown) + r":\d+: (\S+: )?\S")
    start = time.perf_counter()
    try:
        room = load_room(path, vocabulary(book))
        tally.loaded += 1
        if room.preparations and room.cases and not compute_preps:
            tally.skipped_slow_kind += 1
            return
        # at central values: the fuzz times one solve per room (ranges are sampled in
        # tests/test_ranges.py and tests/validation/test_uncertainty.py)
        _, results = evaluate_room(path, book, Sampling(nominal=True))
        tally.computed += 1
        record = results.to_record()
        json.dumps(record, allow_nan=False, ensure_ascii=False)
        tally.nulls += _count_notes(record)
        problems = list(figure_problems(record))
        tally.bad_figures += [f"{path.name}: {problem}" for problem in problems]
    except InputError as exc:
        tally.rejected += 1
        for problem in exc.problems:
            text = str(problem)
            if not form.match(text):
                tally.bad_rejections.append(f"{path.name}: {text[:200]}")
    except Exception as exc:
        tally.crashes.append(
            f"{path.name}: {type(exc).__name__}: {exc}\n" + "".join(traceback.format_exc(limit=-3))
        )
    finally:
        elapsed = time.perf_counter() - start
        if elapsed > SLOW_S:
            tally.slow.append(f"{path.name}: {elapsed:.1f} s")


def check_corpus(
    directory: Path,
    files: Iterator[tuple[str, bytes]],
    book: Any,
    *,
    compute_preps: bool = True,
    keep: bool = False,
) -> Tally:
    tally = Tally()
    for name, raw in files:
        path = directory / name
        path.write_bytes(raw)
        check_file(path, book, tally, compute_preps=compute_preps)
        if not keep:
            path.unlink()
    return tally


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("-n", type=int, default=10_000, help="files to generate (10000)")
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--keep", type=Path, help="write the files here and keep them")
    parser.add_argument(
        "--no-preparations",
        action="store_true",
        help="load but do not compute rooms with preparations (fast)",
    )
    args = parser.parse_args()
    from ignite.pipeline import open_rulebook

    book = open_rulebook()
    started = time.perf_counter()
    with tempfile.TemporaryDirectory() as temp:
        directory = args.keep or Path(temp)
        directory.mkdir(parents=True, exist_ok=True)
        nasty = [(p.name, p.read_bytes()) for p in sorted(NASTY.glob("*.yaml"))]
        tally = check_corpus(
            directory,
            iter([*nasty, *generate(args.n, args.seed)]),
            book,
            compute_preps=not args.no_preparations,
            keep=args.keep is not None,
        )
    for title, items in (
        ("crashes", tally.crashes),
        (f"solves over {SLOW_S:g} s", tally.slow),
        ("non-finite or out-of-range figures", tally.bad_figures),
        ("rejections not in FILE:LINE: key form", tally.bad_rejections),
    ):
        if items:
            print(f"-- {title} ({len(items)}):")
            for entry in items[:20]:
                print("  " + entry.replace("\n", "\n  "))
    print(tally.line() + f" ({time.perf_counter() - started:.0f} s)")
    bad = tally.crashes or tally.slow or tally.bad_figures or tally.bad_rejections
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
