"""Tests for pfuzz.counting.sampler: length plans, methods, distinct strings, reproducibility, errors.

Uniformity itself is tested with chi-squared statistics in
tests/external/test_sampling_uniformity.py; acceptance by ``re.fullmatch``
in tests/external/test_counting_reference.py.
"""

from __future__ import annotations

import re
import warnings
from fractions import Fraction

import pytest
from scipy.stats import chisquare

import pfuzz
from pfuzz.errors import ArgumentError, EmptyLanguageError, PfuzzWarning
from pfuzz.base.randomness import RandomSource
from pfuzz.counting.sampler import BULK_MIN_SAMPLES, plan


def lang(pattern: str, alphabet: str = "printable") -> pfuzz.Language:
    return pfuzz.compile(pattern, alphabet=alphabet)


@pytest.mark.parametrize("method", ["exact", "bulk"])
def test_same_seed_same_strings(method):
    x = lang(r"[a-z]{1,6}@[a-z]{2,4}\.(org|net)")
    first = x.sample(300, seed=11, method=method)
    assert first == x.sample(300, seed=11, method=method)
    assert first != x.sample(300, seed=12, method=method)


def test_exact_path_decodes_one_uniform_rank_per_string():
    x = lang(r"[A-Z]{2}[0-9]{4}")
    replay = RandomSource(4)
    expected = [x.unrank(6, replay.below(x.count(6))) for _ in range(50)]
    assert x.sample(50, seed=4, method="exact") == expected


def test_auto_method_switches_to_bulk_at_the_documented_size():
    x = lang(r"[0-9]{2}[a-f]{2}")
    below = BULK_MIN_SAMPLES - 1
    assert x.sample(below, seed=1) == x.sample(below, seed=1, method="exact")
    assert x.sample(BULK_MIN_SAMPLES, seed=1) == x.sample(BULK_MIN_SAMPLES, seed=1, method="bulk")


def test_length_plans():
    c = lang(r"[0-9]{1,3}").counter
    assert plan(c, None, None, "even") == ([1, 2, 3], None)
    assert plan(c, 2, None, "proportional") == ([2, 3], [100, 1000])
    assert plan(c, None, None, 2) == ([2], None)
    assert plan(c, None, None, [3, 1, 3]) == ([1, 3], [1, 2])
    assert plan(c, None, None, {1: 0.5, 2: 0.25, 3: 0}) == ([1, 2], [2, 1])


def test_sampled_lengths_follow_the_plan():
    x = lang(r"[0-9]{1,3}")
    assert {len(s) for s in x.sample(200, lengths=[1, 3], seed=0)} == {1, 3}
    assert {len(s) for s in x.sample(200, min_length=2, max_length=2, seed=0)} == {2}
    assert {len(s) for s in x.sample(2000, lengths={2: 1}, seed=0)} == {2}


@pytest.mark.parametrize("arguments,error", [
    (dict(lengths="uniformly"), ValueError),
    (dict(lengths=[4]), EmptyLanguageError),
    (dict(lengths={1: -1}), ValueError),
    (dict(lengths=[-1]), ValueError),
    (dict(min_length=4, max_length=9), EmptyLanguageError),
    (dict(min_length=3, max_length=2), EmptyLanguageError),
    (dict(method="fast"), ValueError),
])
def test_bad_arguments_give_clear_errors(arguments, error):
    with pytest.raises(error):
        lang(r"[0-9]{1,3}").sample(5, **arguments)


def test_negative_or_zero_counts():
    x = lang(r"a")
    assert x.sample(0) == []
    with pytest.raises(ValueError):
        x.sample(-1)


def test_empty_language_cannot_be_sampled():
    with pytest.raises(EmptyLanguageError):
        lang(r"a(?=b)").sample(3)


@pytest.mark.parametrize("n", [40, 300, 1100])
def test_unique_strings_are_distinct(n):
    x = lang(r"[0-9]{1,3}|[a-c]{4}")
    strings = x.sample(n, unique=True, seed=9)
    assert len(strings) == n == len(set(strings))
    assert all(x.accepts(s) for s in strings)


def test_unique_with_a_dense_length_uses_a_random_subset_of_ranks():
    x = lang(r"[a-d]{3}")
    strings = x.sample(60, unique=True, seed=1)
    assert len(set(strings)) == 60 and set(strings) < set(x.enumerate(3, 3))
    assert strings != sorted(strings)


def test_unique_with_too_few_strings_returns_all_and_warns():
    x = lang(r"ab?c?")
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        strings = x.sample(10, unique=True, seed=0)
    assert sorted(strings) == sorted(["a", "ab", "ac", "abc"])
    assert [w.category for w in caught] == [PfuzzWarning]
    assert "only 4 distinct strings" in str(caught[0].message)


def test_progress_is_reported_for_every_string():
    x = lang(r"[a-z]{2,5}")
    for method, n in [("exact", 2100), ("bulk", 70_000)]:
        seen = []
        x.counter.sample(n, seed=0, method=method, progress=seen.append)
        assert sum(seen) == n


def test_length_weights_too_large_for_exact_integer_draws():
    # 10^20 strings of length 20 exceed 2^62: the bulk path draws lengths from rounded shares.
    # Reference (closed form): [0-9]{k} holds 10^k strings, so proportional sampling gives
    # length k the share 10^k / (10 + 100 + ... + 10^20). Chi-squared goodness of fit
    # (scipy.stats.chisquare) at a fixed seed, alpha = 0.001; lengths 1-17 share one bin so
    # every bin expects at least 5 draws (common practice for the chi-squared approximation).
    n, alpha = 20_000, 0.001
    drawn = lang(r"[0-9]{1,20}").sample(n, lengths="proportional", seed=6, method="bulk")
    assert all(re.fullmatch(r"[0-9]{1,20}", s) for s in drawn)    # Python's re
    total = sum(10**k for k in range(1, 21))
    bins = [range(1, 18), range(18, 19), range(19, 20), range(20, 21)]
    expected = [n * float(Fraction(sum(10**k for k in b), total)) for b in bins]
    observed = [sum(len(s) in b for s in drawn) for b in bins]
    assert min(expected) >= 5 and sum(observed) == n
    assert chisquare(observed, expected).pvalue > alpha, (observed, expected)


@pytest.mark.parametrize("arguments", [
    dict(n=-1), dict(n=5, lengths="uniformly"), dict(n=5, lengths={1: -1}), dict(n=5, lengths=[-1]),
    dict(n=5, lengths={1: 0}), dict(n=5, method="fast"), dict(n=5, seed=-1),
])
def test_bad_arguments_are_pfuzz_errors(arguments):
    # A library user's mistake is a pfuzz error (ArgumentError is also a ValueError).
    with pytest.raises(ArgumentError):
        lang(r"[0-9]{1,3}").sample(**arguments)
