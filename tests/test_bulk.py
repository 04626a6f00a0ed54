"""Tests for pfuzz.counting.bulk: float tables against exact fractions, alias laws, decoding.

The reference for every probability is the exact count table of
``pfuzz.counting.tables`` (Python integers, compared as ``fractions.Fraction``);
the bounds checked are the ones the module docstring states.
"""

from __future__ import annotations

import re
from fractions import Fraction

import numpy as np
import pytest

import pfuzz
from pfuzz.counting.bulk import FloatTables, robin_hood

PATTERNS = [
    r"\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])",
    r"a[0-9]{3}|[b-z]{4}",
    r"[a-z0-9._]{1,6}@[a-z]{1,5}\.(com|org|net)",
    r"(0|1[01]*)(\.[0-9]+)?",
]


def exact_step(counter, tables, remaining: int, state: int) -> list[Fraction]:
    """The exact law of the next edge from ``state`` with ``remaining`` characters to go."""
    below, here = counter._table(remaining - 1), counter._table(remaining)[state]
    edges = np.flatnonzero(tables.src == state)
    return [Fraction(int(tables.width[e]) * below[int(tables.tgt[e])], here) for e in edges]


@pytest.mark.parametrize("pattern", PATTERNS)
def test_transition_probabilities_within_the_stated_relative_bound(pattern):
    counter = pfuzz.compile(pattern).counter
    top = 24
    tables = FloatTables(counter, top)
    q = tables.probabilities(top)[0]
    for r in range(1, top + 1):
        bound = Fraction(tables.transition_bound(r))
        for state in range(counter.dfa.n_states):
            if not counter._table(r)[state]:
                continue
            edges = np.flatnonzero(tables.src == state)
            for e, exact in zip(edges, exact_step(counter, tables, r, state)):
                assert abs(Fraction(float(q[r, e])) - exact) <= exact * bound


@pytest.mark.parametrize("pattern", PATTERNS)
def test_alias_tables_draw_the_exact_law_within_the_step_bound(pattern):
    counter = pfuzz.compile(pattern).counter
    top = 16
    tables = FloatTables(counter, top)
    for r in range(1, top + 1):
        for state in range(counter.dfa.n_states):
            if not counter._table(r)[state]:
                continue
            law = tables.step_distribution(r, state)
            exact = exact_step(counter, tables, r, state)
            variation = sum(abs(Fraction(float(p)) - x) for p, x in zip(law, exact)) / 2
            assert variation <= Fraction(tables.step_bound(r))


def test_string_bound_is_small_for_everyday_patterns():
    date = FloatTables(pfuzz.compile(PATTERNS[0]).counter, 10)
    assert date.string_bound(10) < 2e-13


def test_robin_hood_rows_reproduce_their_weights():
    weights = np.array([[0.0, 0.5, 2.5], [1.0, 1.0, 1.0], [3.0, 0.0, 0.0], [0.2, 1.3, 1.5]])
    prob, alias = robin_hood(weights)
    for row, p, a in zip(weights, prob, alias):
        law = np.zeros(3)
        for j in range(3):
            law[j] += p[j]
            law[a[j]] += 1 - p[j]
        assert np.allclose(law, row, atol=1e-12)


def test_counts_beyond_float_range_keep_their_exponents():
    # Over Unicode, a{60} then 200 more characters: about 10^1208 strings, far beyond float64.
    counter = pfuzz.compile(r"a{60}.*", alphabet="unicode").counter
    tables = counter.float_tables(260)
    assert tables.has_strings(260) and not tables.has_strings(59)
    strings = counter.sample(3, lengths=[260], seed=1, method="bulk")
    assert all(len(s) == 260 and re.fullmatch(r"a{60}.*", s, re.S) for s in strings)


def test_nul_characters_survive_decoding():
    lang = pfuzz.compile(r"[\x00a]{3}\x00?", alphabet="ascii")
    strings = lang.sample(4000, seed=2, method="bulk")
    assert set(strings) == set(lang.enumerate(3, 4))
    assert all(re.fullmatch(r"[\x00a]{3}\x00?", s) for s in strings)


@pytest.mark.parametrize("pattern,alphabet", [
    (r"[a-cx-z]{2}[\x00-\x7f]", "ascii"),         # several ranges per edge, direct table
    (r"[^a]{2}a", "unicode"),                     # Unicode-wide edges, searched ranges
    (r"[A-Z]{2}[0-9]{4}", "printable"),            # no branching at all
    (r"(\u00e9|[\u4e00-\u4e0f])+", "bmp"),         # wide code points, UTF-32 decoding
])
def test_bulk_strings_are_accepted_and_in_the_alphabet(pattern, alphabet):
    lang = pfuzz.compile(pattern, alphabet=alphabet)
    strings = lang.sample(3000, seed=5, method="bulk", max_length=6)
    assert all(re.fullmatch(pattern, s, re.S) for s in strings)
    assert all(ch in lang.alphabet for s in strings for ch in s)


def test_long_strings_take_the_bulk_path_with_bounded_tables():
    lang = pfuzz.compile(r"[ab]*c[ab]*")
    strings = lang.sample(2, lengths=[10_000], seed=3)
    assert [len(s) for s in strings] == [10_000, 10_000]
    assert all(s.count("c") == 1 for s in strings)
    assert lang.counter._bulk.max_length >= 10_000
