"""Regression tests for the on-disk substance cache (ignite.physics._cache).

The reference for every check is the same calculation with the cache turned off: the
cache may only ever make things faster, never change a number.
"""

from __future__ import annotations

import os
import pickle
import subprocess
import sys
from pathlib import Path

import pytest
from conftest import PREP_ASSUMPTIONS

from ignite.physics import _cache, vapour
from ignite.simulate.drying import DrapePlan, DrapePocket, Film, RoomAir, simulate_prep
from ignite.simulate.preparation import PreparationAnalysis, analyse_preparation

PREPARATIONS = [
    ([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15),
    ([("ethanol", 0.62), ("water", 0.38)], "mass", 303.15),
    ([("ethanol", 0.45), ("isopropyl alcohol", 0.18), ("water", 0.37)], "mass", 306.0),
    ([("67-63-0", 1.0)], "volume", 293.15),
    # glycerol has no Dortmund groups: this liquid goes through original UNIFAC
    ([("glycerol", 0.1), ("ethanol", 0.6), ("water", 0.3)], "mass", 305.15),
    ([("water", 1.0)], "volume", 305.15),
]

PREP_CONDITIONS = (
    Film(volume=10e-6, area=0.04, temperature=305.15),
    RoomAir(temperature=293.15, relative_humidity=0.3, speed=0.2),
    DrapePlan(draping_after=180.0, first_activation_after=360.0),
    DrapePocket(volume=0.030, exchange=10e-3 / 60),
    PREP_ASSUMPTIONS,
)


@pytest.fixture(autouse=True)
def _private_cache(tmp_path_factory: pytest.TempPathFactory, monkeypatch: pytest.MonkeyPatch):
    """No test here reads or writes the user's own cache."""
    monkeypatch.setenv("IGNITE_CACHE_DIR", str(tmp_path_factory.mktemp("ignite-cache")))


def _forget() -> None:
    """Drop what this process holds in memory, so the next call goes to the disk cache."""
    for cached in (
        vapour.substance,
        vapour._vapour_pressure_model,
        vapour._liquid_volume_model,
        vapour._unifac,
        vapour._activity_model,
        vapour.activity_model_at,
    ):
        cached.cache_clear()


def _analyses() -> list[PreparationAnalysis]:
    return [analyse_preparation(c, basis, t) for c, basis, t in PREPARATIONS]


def _files(root: Path) -> set[Path]:
    return {p for p in root.rglob("*") if p.is_file()}


@pytest.fixture
def sandbox(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """A cache dir inside tmp_path, with HOME and XDG_CACHE_HOME also moved into tmp_path."""
    monkeypatch.setenv("HOME", str(tmp_path / "home"))
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "xdg"))
    monkeypatch.setenv("IGNITE_CACHE_DIR", str(tmp_path / "cache"))
    monkeypatch.delenv("IGNITE_NO_CACHE", raising=False)
    _forget()
    yield tmp_path / "cache"
    _forget()


@pytest.fixture(scope="module")
def reference() -> tuple[list[PreparationAnalysis], object]:
    """The analyses and one simulate_prep outcome computed without any cache."""
    mp = pytest.MonkeyPatch()
    mp.setenv("IGNITE_NO_CACHE", "1")
    _forget()
    try:
        analyses = _analyses()
        outcome = simulate_prep(analyses[0], *PREP_CONDITIONS)
    finally:
        _forget()
        mp.undo()
    return analyses, outcome


def _assert_identical(found, expected) -> None:
    assert found == expected  # every field, floats compared exactly
    assert repr(found) == repr(expected)


def test_cold_then_warm_cache_gives_identical_results(sandbox, reference, monkeypatch):
    expected, expected_outcome = reference
    _assert_identical(_analyses(), expected)  # cold: computed, then written
    _assert_identical(simulate_prep(_analyses()[0], *PREP_CONDITIONS), expected_outcome)
    written = _files(sandbox)
    kinds = {p.name.split("-")[0] for p in written}
    assert {"substance", "vapour", "liquid", "unifac"} <= kinds
    assert {a.methods[0].split(" ")[0] for a in expected} >= {"modified", "UNIFAC"}

    _forget()

    def no_lookup(*args, **kwargs):
        raise AssertionError("a warm cache must not resolve substances again")

    import thermo
    import thermo.unifac

    monkeypatch.setattr(vapour, "_resolve", no_lookup)
    monkeypatch.setattr(thermo, "VaporPressure", no_lookup)
    monkeypatch.setattr(thermo, "VolumeLiquid", no_lookup)
    # (thermo.unifac.UNIFAC itself must stay: unpickling looks the class up there)
    monkeypatch.setattr(thermo.unifac.UNIFAC, "from_subgroups", no_lookup)
    _assert_identical(_analyses(), expected)  # warm: everything from disk
    _assert_identical(simulate_prep(_analyses()[0], *PREP_CONDITIONS), expected_outcome)
    assert _files(sandbox) == written
    # and worked out again (not read back whole) from the substances on disk
    monkeypatch.setenv("IGNITE_SOLVE_AGAIN", "1")
    _assert_identical(_analyses(), expected)
    _assert_identical(simulate_prep(_analyses()[0], *PREP_CONDITIONS), expected_outcome)
    assert _files(sandbox) == written


def test_corrupt_and_foreign_entries_are_ignored_and_rewritten(sandbox, reference):
    expected, _ = reference
    _analyses()
    entries = sorted(_files(sandbox))
    good = {p: p.read_bytes() for p in entries}
    spoilers = [
        b"",
        b"not a pickle at all",
        lambda data: data[: len(data) // 2],
        pickle.dumps(("another header", "another value")),
        pickle.dumps("no header at all"),
    ]
    for i, path in enumerate(entries):
        spoil = spoilers[i % len(spoilers)]
        path.write_bytes(spoil(good[path]) if callable(spoil) else spoil)
    _forget()
    _assert_identical(_analyses(), expected)
    for path in entries:  # every spoilt entry written afresh
        assert path.read_bytes() == good[path]


def test_an_entry_of_the_wrong_type_is_a_miss(sandbox, reference):
    expected, _ = reference
    _analyses()
    # A well-formed entry for the right key whose object is not a Substance.
    for path in _files(sandbox):
        if path.name.startswith("substance-"):
            header, _value = pickle.loads(path.read_bytes())
            path.write_bytes(pickle.dumps((header, "a string, not a Substance")))
    _forget()
    _assert_identical(_analyses(), expected)


@pytest.mark.parametrize("changed", ["format", "code", "chemicals", "thermo", "numpy"])
def test_entries_of_other_code_or_library_versions_miss(sandbox, monkeypatch, changed):
    _cache.store("substance", "water", "kept")
    assert _cache.load("substance", "water", lambda value: True) == "kept"
    real = _cache._versions()
    assert changed in dict(real)
    other = tuple((name, "other" if name == changed else value) for name, value in real)
    monkeypatch.setattr(_cache, "_versions", lambda: other)
    assert _cache.load("substance", "water", lambda value: True) is None


def test_no_cache_switch_writes_nothing(sandbox, reference, monkeypatch):
    expected, expected_outcome = reference
    monkeypatch.setenv("IGNITE_NO_CACHE", "1")
    _assert_identical(_analyses(), expected)
    _assert_identical(simulate_prep(_analyses()[0], *PREP_CONDITIONS), expected_outcome)
    assert not sandbox.exists()
    assert _files(sandbox.parent) == set()


def test_unwritable_cache_dir_is_skipped(sandbox, reference, monkeypatch):
    expected, _ = reference
    blocker = sandbox.parent / "a-file"
    blocker.write_text("in the way")
    monkeypatch.setenv("IGNITE_CACHE_DIR", str(blocker / "cache"))  # parent is a file
    _assert_identical(_analyses(), expected)
    assert _files(sandbox.parent) == {blocker}


def test_cache_writes_only_inside_its_dir(sandbox):
    before = _files(sandbox.parent)
    _analyses()
    created = _files(sandbox.parent) - before
    assert created
    assert all(p.parent == sandbox for p in created)
    assert not any(p.name.startswith(".tmp-") for p in created)  # no temporary left behind


def test_a_stale_temporary_from_a_killed_writer_is_swept_by_the_next_write(sandbox):
    # a writer killed mid-write (SIGKILL: no finally runs) leaves its temporary behind
    sandbox.mkdir(parents=True, exist_ok=True)
    stale = sandbox / ".tmp-killed.pickle"
    fresh = sandbox / ".tmp-running.pickle"
    for leftover in (stale, fresh):
        leftover.write_bytes(b"half a pickle")
    old = os.stat(stale).st_mtime - _cache.STALE_SECONDS - 1.0
    os.utime(stale, (old, old))
    _cache.store("test", "key", 1)
    assert not stale.exists()
    assert fresh.exists()  # another process may be writing it right now
    assert _cache.load("test", "key", lambda value: value == 1) == 1


def test_cache_directory_follows_the_environment(monkeypatch, tmp_path):
    monkeypatch.delenv("IGNITE_NO_CACHE", raising=False)
    monkeypatch.setenv("IGNITE_CACHE_DIR", str(tmp_path / "mine"))
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "xdg"))
    monkeypatch.setenv("HOME", str(tmp_path / "home"))
    assert _cache.cache_directory() == tmp_path / "mine"
    monkeypatch.delenv("IGNITE_CACHE_DIR")
    assert _cache.cache_directory() == tmp_path / "xdg" / "ignite"
    monkeypatch.delenv("XDG_CACHE_HOME")
    assert _cache.cache_directory() == tmp_path / "home" / ".cache" / "ignite"
    monkeypatch.setenv("IGNITE_NO_CACHE", "0")
    assert _cache.cache_directory() == tmp_path / "home" / ".cache" / "ignite"
    monkeypatch.setenv("IGNITE_NO_CACHE", "1")
    assert _cache.cache_directory() is None


_FRESH_PROCESS = """
from ignite.simulate.preparation import analyse_preparation
a = analyse_preparation([("isopropanol", 0.7), ("water", 0.3)], "volume", 305.15)
b = analyse_preparation([("ethanol", 0.62), ("water", 0.38)], "mass", 303.15)
print(repr(a)); print(repr(b))
"""


def _fresh_process(env: dict[str, str]) -> str:
    done = subprocess.run(
        [sys.executable, "-c", _FRESH_PROCESS],
        env={**os.environ, **env},
        capture_output=True,
        text=True,
        check=True,
        timeout=120,
    )
    return done.stdout


def test_fresh_process_with_warm_cache_matches_one_without(tmp_path):
    """Objects read back in a new process (the case the cache is for) give the same numbers."""
    cache = str(tmp_path / "cache")
    without = _fresh_process({"IGNITE_NO_CACHE": "1", "IGNITE_CACHE_DIR": cache})
    assert not (tmp_path / "cache").exists()
    cold = _fresh_process({"IGNITE_NO_CACHE": "0", "IGNITE_CACHE_DIR": cache})
    warm = _fresh_process({"IGNITE_NO_CACHE": "0", "IGNITE_CACHE_DIR": cache})
    assert without == cold == warm
    assert "PreparationAnalysis(" in warm
