"""The sampling's own Latin hypercube and ranks against scipy.stats, the reference library
they replace at run time (importing scipy.stats takes about 0.8 s of every sampled run)."""

from __future__ import annotations

import numpy as np
import pytest

from ignite.simulate.uncertainty import latin_hypercube, ranks


@pytest.mark.parametrize(
    ("dimensions", "count", "seed"), [(1, 5, 0), (3, 100, 7), (12, 1000, 2**63)]
)
def test_latin_hypercube_is_scipys_to_the_last_bit(dimensions: int, count: int, seed: int) -> None:
    from scipy.stats import qmc

    expected = qmc.LatinHypercube(d=dimensions, seed=np.random.default_rng(seed)).random(count)
    found = latin_hypercube(dimensions, count, seed)
    assert found.shape == expected.shape
    assert np.array_equal(found, expected)


def test_each_dimension_has_one_point_in_each_stratum() -> None:
    """The defining property of a Latin hypercube (McKay, Beckman and Conover, 1979)."""
    points = latin_hypercube(4, 50, 11)
    for column in points.T:
        assert sorted(np.floor(column * 50).astype(int)) == list(range(50))


@pytest.mark.parametrize(
    "values",
    [
        [3.0, 1.0, 2.0],
        [1.0, 1.0, 1.0],
        [5.0, 2.0, 2.0, 9.0, 5.0, 5.0, -1.0],
        list(np.random.default_rng(3).integers(0, 20, size=500).astype(float)),
    ],
)
def test_ranks_are_scipys_average_ranks(values: list[float]) -> None:
    from scipy.stats import rankdata

    data = np.array(values)
    assert np.array_equal(ranks(data), rankdata(data))


@pytest.mark.parametrize(
    ("central", "spread", "low", "high"),
    [(10.0, 2.0, -np.inf, np.inf), (0.5, 0.1, 0.3, 0.9), (300.0, 5.0, 295.0, 1e9)],
)
def test_a_normal_range_draws_scipys_values(
    central: float, spread: float, low: float, high: float
) -> None:
    """The inverse of the (truncated) normal distribution, drawn with the standard library,
    against scipy.special's ndtr and ndtri (the reference it replaces at run time), to
    within 1e-13 of the spread."""
    from scipy.special import ndtr, ndtri

    from ignite.room.ranges import Distribution

    u = np.concatenate([[0.0, 1e-9, 0.5, 1.0 - 1e-9], np.random.default_rng(4).random(500)])
    found = Distribution("normal", central, low, high, spread).values(u)
    lower, upper = ndtr((low - central) / spread), ndtr((high - central) / spread)
    inside = np.clip(lower + u * (upper - lower), 1e-12, 1.0 - 1e-12)
    expected = np.clip(central + spread * ndtri(inside), low, high)
    assert np.allclose(found, expected, rtol=0.0, atol=1e-13 * spread)
