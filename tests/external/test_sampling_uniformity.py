"""Uniformity of sampling by length: chi-squared goodness of fit (scipy.stats.chisquare).

Reference: Pearson's chi-squared test as implemented by SciPy, against the
distribution that exact uniformity implies (each cell's expected share is
its exact string count over the count of the length). Seeds are fixed, so
each test is deterministic; the significance level ALPHA = 0.001 means a
correct sampler would fail a given seed one time in a thousand, while the
biased alternatives below fail with p-values under 10^-12, which shows the
tests have the power to see a real bias.
"""

from __future__ import annotations

from collections import Counter

import numpy as np
import pytest
from scipy.stats import chisquare

import pfuzz

ALPHA = 1e-3


def p_value(observed: dict, expected_share: dict, n: int) -> float:
    cells = sorted(expected_share)
    assert set(observed) <= set(cells)
    f_obs = [observed.get(c, 0) for c in cells]
    f_exp = [expected_share[c] * n for c in cells]
    return chisquare(f_obs, f_exp).pvalue


@pytest.mark.parametrize("method,per_cell", [("exact", 40), ("bulk", 120)])
def test_every_string_of_a_small_language_equally_often(method, per_cell):
    # 100 + 4 * 26 * 3 = 412 strings of length 3, in two branches of unequal size.
    lang = pfuzz.compile(r"x[0-9]{2}|[a-d][a-z][0-2]")
    size = lang.count(3)
    assert size == 412
    n = size * per_cell
    drawn = lang.sample(n, seed=21, method=method)
    observed = Counter(lang.rank(s) for s in drawn)
    assert p_value(observed, {i: 1 / size for i in range(size)}, n) > ALPHA


def first_letter_shares(lang) -> dict[str, float]:
    size = lang.count(4)
    return {c: (1000 if c == "a" else 25**3) / size for c in "abcdefghijklmnopqrstuvwxyz"}


@pytest.mark.parametrize("method,n", [("exact", 20_000), ("bulk", 200_000)])
def test_unequal_branches_of_one_length(method, n):
    # a[0-9]{3} has 1000 strings, [b-z]{4} has 390625: a walk over the syntax tree
    # that picks a branch evenly would start half its strings with 'a'.
    lang = pfuzz.compile(r"a[0-9]{3}|[b-z]{4}")
    drawn = lang.sample(n, seed=5, method=method)
    observed = Counter(s[0] for s in drawn)
    assert p_value(observed, first_letter_shares(lang), n) > ALPHA
    digits = Counter(s[3] for s in drawn if s[0] == "a")
    assert p_value(digits, {str(d): 0.1 for d in range(10)}, sum(digits.values())) > ALPHA


def test_the_test_sees_a_syntax_tree_walk_bias():
    lang = pfuzz.compile(r"a[0-9]{3}|[b-z]{4}")
    rng = np.random.default_rng(5)
    n = 20_000
    branch_a = rng.random(n) < 0.5
    letters = rng.integers(ord("b"), ord("z") + 1, size=n)
    naive = Counter("a" if take else chr(c) for take, c in zip(branch_a, letters))
    assert p_value(naive, first_letter_shares(lang), n) < 1e-12


@pytest.mark.parametrize("method", ["exact", "bulk"])
def test_split_points_follow_the_counts(method):
    # Length 9 of [a-z]{1,6}@[0-9]{1,4}\.org: local part of 1, 2 or 3 letters with
    # 3, 2 or 1 digits: 26 * 1000, 26^2 * 100 and 26^3 * 10 strings.
    lang = pfuzz.compile(r"[a-z]{1,6}@[0-9]{1,4}\.org")
    sizes = {1: 26 * 1000, 2: 26**2 * 100, 3: 26**3 * 10}
    assert lang.count(9) == sum(sizes.values())
    n = 30_000
    drawn = lang.sample(n, lengths=[9], seed=8, method=method)
    observed = Counter(s.index("@") for s in drawn)
    shares = {k: v / lang.count(9) for k, v in sizes.items()}
    assert p_value(observed, shares, n) > ALPHA


@pytest.mark.parametrize("mode,shares", [
    ("even", {1: 1 / 3, 2: 1 / 3, 3: 1 / 3}),
    ("proportional", {1: 10 / 1110, 2: 100 / 1110, 3: 1000 / 1110}),
])
@pytest.mark.parametrize("method", ["exact", "bulk"])
def test_length_modes(mode, shares, method):
    lang = pfuzz.compile(r"[0-9]{1,3}")
    n = 6000
    drawn = lang.sample(n, lengths=mode, seed=13, method=method)
    assert p_value(Counter(map(len, drawn)), shares, n) > ALPHA


def test_a_biased_length_choice_is_seen():
    # Choosing lengths evenly where proportional shares are expected must fail the test.
    lang = pfuzz.compile(r"[0-9]{1,3}")
    drawn = lang.sample(6000, lengths="even", seed=13)
    proportional = {1: 10 / 1110, 2: 100 / 1110, 3: 1000 / 1110}
    assert p_value(Counter(map(len, drawn)), proportional, 6000) < 1e-12


def test_proportional_lengths_beyond_the_exact_tables():
    # [ab]* has 2^n strings of length n, so lengths 1500, 1501, 1502 weigh 1 : 2 : 4;
    # at these lengths the bulk path weighs them from its float tables.
    lang = pfuzz.compile(r"[ab]*")
    n = 3500
    drawn = lang.sample(n, min_length=1500, max_length=1502, lengths="proportional", seed=4)
    shares = {1500: 1 / 7, 1501: 2 / 7, 1502: 4 / 7}
    assert p_value(Counter(map(len, drawn)), shares, n) > ALPHA


@pytest.mark.parametrize("pattern,lengths,size", [
    (r"[ab][0-2][xyz]{2}", [4], 54),            # one length, every level uniform: columns
    (r"[a-e]{3}", [3], 125),                    # one character set everywhere: one draw
    (r"[ab]{1,3}[0-2]", [2, 3, 4], 6 + 12 + 24),  # several lengths, uniform levels: staircase
])
def test_uniform_levels_draw_every_string_equally_often(pattern, lengths, size):
    lang = pfuzz.compile(pattern)
    assert sum(lang.count(m) for m in lengths) == size
    n = 200 * size
    drawn = lang.sample(n, lengths=lengths, seed=17, method="bulk")
    for m in lengths:
        of_length = [s for s in drawn if len(s) == m]
        observed = Counter(lang.rank(s) for s in of_length)
        cells = lang.count(m)
        assert p_value(observed, {i: 1 / cells for i in range(cells)}, len(of_length)) > ALPHA


def test_edge_alias_tables_are_uniform_too(monkeypatch):
    # The same check with one slot per edge (the layout for tables too large for one
    # slot per character): the edge by its alias table, the character uniformly inside it.
    from pfuzz.counting import bulk

    monkeypatch.setattr(bulk, "CHARACTER_SLOT_BUDGET", 0)
    lang = pfuzz.compile(r"x[0-9]{2}|[a-d][a-z][0-2]")
    size = lang.count(3)
    n = size * 120
    drawn = lang.sample(n, seed=21, method="bulk")
    assert not lang.counter._bulk.per_character
    observed = Counter(lang.rank(s) for s in drawn)
    assert p_value(observed, {i: 1 / size for i in range(size)}, n) > ALPHA
