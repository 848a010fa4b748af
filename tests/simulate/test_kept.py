"""Kept drying solves (ignite.simulate.kept): read back only for the very same inputs and
code, identical to solving again, and never in the way (regression tests of our own
behaviour)."""

from __future__ import annotations

from pathlib import Path

import pytest
from conftest import PREP_ASSUMPTIONS

from ignite.simulate import drying
from ignite.simulate.preparation import analyse_preparation

ASSUMPTIONS = PREP_ASSUMPTIONS


def _solve(volume: float = 5e-6) -> drying.PrepOutcome:
    analysis = analyse_preparation([("ethanol", 0.7), ("water", 0.3)], "volume", 305.15)
    return drying.simulate_prep(
        analysis,
        drying.Film(volume, 0.04, 305.15),
        drying.RoomAir(293.15, 0.4, 0.2),
        drying.DrapePlan(180.0, 360.0),
        drying.DrapePocket(0.03, 10e-3 / 60),
        ASSUMPTIONS,
    )


@pytest.fixture
def own_cache(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    monkeypatch.setenv("IGNITE_CACHE_DIR", str(tmp_path))
    monkeypatch.delenv("IGNITE_NO_CACHE", raising=False)
    return tmp_path


def _count_solves(monkeypatch: pytest.MonkeyPatch) -> list[int]:
    calls = [0]
    solve = drying._simulate_prep

    def counted(*args, **kwargs):  # type: ignore[no-untyped-def]
        calls[0] += 1
        return solve(*args, **kwargs)

    monkeypatch.setattr(drying, "_simulate_prep", counted)
    return calls


def test_a_repeated_solve_is_read_back_identical(
    own_cache: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    calls = _count_solves(monkeypatch)
    first = _solve()
    again = _solve()
    assert calls == [1]
    assert again == first
    assert list(own_cache.glob("drying-*.pickle"))


def test_any_change_of_input_solves_again(own_cache: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    calls = _count_solves(monkeypatch)
    _solve(5e-6)
    _solve(5.000001e-6)
    assert calls == [2]
    monkeypatch.setattr(drying, "MAX_EVALUATIONS", 50_000)  # the solver's constants count too
    _solve(5e-6)
    assert calls == [3]


def test_a_corrupt_entry_is_solved_again(own_cache: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    first = _solve()
    for entry in own_cache.glob("drying-*.pickle"):
        entry.write_bytes(b"not a pickle")
    calls = _count_solves(monkeypatch)
    assert _solve() == first
    assert calls == [1]


def test_no_cache_solves_every_time(own_cache: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("IGNITE_NO_CACHE", "1")
    calls = _count_solves(monkeypatch)
    _solve()
    _solve()
    assert calls == [2]
    assert not list(own_cache.glob("drying-*.pickle"))


def test_solve_again_solves_and_still_keeps(
    own_cache: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    first = _solve()
    monkeypatch.setenv("IGNITE_SOLVE_AGAIN", "1")
    calls = _count_solves(monkeypatch)
    assert _solve() == first
    assert calls == [1]
    monkeypatch.delenv("IGNITE_SOLVE_AGAIN")
    _solve()
    assert calls == [1]


def test_the_least_recently_used_go_past_the_budget(
    own_cache: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import os

    from ignite.simulate import kept

    for volume in (4e-6, 5e-6, 6e-6):
        _solve(volume)
    entries = sorted(own_cache.glob("drying-*.pickle"), key=lambda p: p.stat().st_mtime)
    assert len(entries) == 3
    for age, entry in enumerate(entries):  # oldest first, a minute apart
        os.utime(entry, (1_000_000 + 60 * age, 1_000_000 + 60 * age))
    _solve(4e-6)  # read back: now the most recently used
    size = entries[0].stat().st_size
    monkeypatch.setattr(kept, "BUDGET", 2 * size + size // 2)
    _solve(7e-6)  # a new solve prunes to the budget: the two least recently used go
    left = {p.name for p in own_cache.glob("drying-*.pickle")}
    assert entries[0].name in left  # read back just before
    assert entries[1].name not in left and entries[2].name not in left
    assert len(left) == 2
