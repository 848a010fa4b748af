"""Start-up: the built unit registry is kept between runs, and scipy's solvers are loaded
only by rooms that need a solve. Each check runs ignite in a fresh process."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
FLOOR_ROOM = ROOT / "sample_rooms" / "recommissioning-refurbished.yaml"

PROBE = """
import json, sys
from ignite.room.units import parse_quantity, registry
values = [parse_quantity(t, d) for t, d in (("1.3 MΩ", "resistance"), ("68 degF", "temperature"),
          ("4 L/min", "flow"), ("25 /h", "rate"), ("28 %", "fraction"))]
print(json.dumps({"values": values, "folder": str(registry().cache_folder)}))
"""


def _probe(cache: Path | None) -> dict[str, object]:
    env = dict(os.environ)
    env.pop("IGNITE_NO_CACHE", None)
    if cache is None:
        env["IGNITE_NO_CACHE"] = "1"
    else:
        env["IGNITE_CACHE_DIR"] = str(cache)
    done = subprocess.run(
        [sys.executable, "-c", PROBE], capture_output=True, text=True, env=env, check=True
    )
    return json.loads(done.stdout)  # type: ignore[no-any-return]


def test_the_unit_registry_is_kept_and_converts_as_without_it(tmp_path):
    cache = tmp_path / "cache"
    plain = _probe(None)
    assert plain["folder"] == "None"
    first = _probe(cache)  # builds and keeps
    (folder,) = cache.glob("pint-*")
    assert (folder / "complete").is_file()
    assert not list(cache.glob(".tmp-*"))  # filled in a private folder, moved whole
    second = _probe(cache)  # reads it
    assert first["values"] == second["values"] == plain["values"]
    assert second["folder"] == str(folder)


def test_a_deleted_or_broken_unit_cache_is_only_a_missed_shortcut(tmp_path):
    cache = tmp_path / "cache"
    plain = _probe(None)
    _probe(cache)
    (folder,) = cache.glob("pint-*")
    for kept in folder.glob("*.pickle"):
        kept.write_bytes(b"broken")
    assert _probe(cache)["values"] == plain["values"]  # built without it, and set it aside
    assert not list(cache.glob(".tmp-*"))
    assert _probe(cache)["values"] == plain["values"]  # filled again
    (folder,) = cache.glob("pint-*")
    assert (folder / "complete").is_file()
    assert all(kept.read_bytes() != b"broken" for kept in folder.glob("*.pickle"))
    for kept in folder.iterdir():
        kept.unlink()
    folder.rmdir()
    assert _probe(cache)["values"] == plain["values"]


def test_a_floor_only_room_loads_no_solver():
    # at its central values: the sample's humidity is a range, and sampling it (scipy's
    # Latin hypercube) loads scipy.stats, which loads scipy.optimize
    probe = (
        "import sys\n"
        "from ignite.cli import main\n"
        f"sys.argv = ['ignite', 'check', {str(FLOOR_ROOM)!r}, '--nominal']\n"
        "try:\n    main()\nexcept SystemExit:\n    pass\n"
        "heavy = [m for m in ('scipy.optimize', 'scipy.integrate', 'thermo', 'chemicals',"
        " 'reportlab') if m in sys.modules]\n"
        "print('HEAVY', heavy)\n"
    )
    done = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, cwd=ROOT)
    assert "HEAVY []" in done.stdout, done.stdout[-300:] + done.stderr[-300:]
