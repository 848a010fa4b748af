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
