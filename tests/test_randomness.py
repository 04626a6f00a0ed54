"""The seeded random source: reproducible, exact, uniform."""

import pytest
from scipy.stats import chisquare

from pfuzz.base.randomness import RandomSource, source


def test_same_seed_same_stream():
    a, b = RandomSource(7), RandomSource(7)
    assert [a.below(10**40) for _ in range(20)] == [b.below(10**40) for _ in range(20)]
    assert [RandomSource(8).below(1000) for _ in range(3)] != [a.below(1000) for _ in range(3)]


def test_stream_is_pinned():
    # Pinned values: PCG64 with seed 0 is a stable bit stream across numpy versions
    # (numpy's documented policy for bit generators). A change here breaks reproducibility.
    r = RandomSource(0)
    assert [r.below(100) for _ in range(5)] == PINNED
    assert RandomSource(0).bits(64) == 11749869230777074271


PINNED = [81, 34, 5, 2, 77]  # recorded from this implementation on numpy 2.4, seed 0


def test_below_is_in_range_for_big_bounds():
    r = RandomSource(1)
    for n in (1, 2, 3, 2**64 - 1, 2**64, 2**64 + 1, 10**40):
        for _ in range(50):
            assert 0 <= r.below(n) < n


def test_below_is_uniform():
    # chi-squared goodness of fit at significance 0.001 (fixed seed, so deterministic)
    r = RandomSource(3)
    counts = [0] * 7
    for _ in range(7000):
        counts[r.below(7)] += 1
    assert chisquare(counts).pvalue > 0.001


def test_weighted_index_exact_proportions():
    r = RandomSource(5)
    counts = [0, 0, 0]
    for _ in range(6000):
        counts[r.weighted_index([1, 2, 3])] += 1
    assert chisquare(counts, [1000, 2000, 3000]).pvalue > 0.001


def test_bad_seed():
    with pytest.raises(ValueError):
        RandomSource(-1)
    assert isinstance(source(3), RandomSource)
    s = RandomSource(2)
    assert source(s) is s
