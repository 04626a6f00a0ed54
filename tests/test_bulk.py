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
from pfuzz.automata.dfa import transitions
from pfuzz.counting import bulk
from pfuzz.counting.bulk import FloatTables, robin_hood, vose
from pfuzz.counting.walk import uniform_draws
from pfuzz.errors import ResourceLimitError

PATTERNS = [
    r"\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])",
    r"a[0-9]{3}|[b-z]{4}",
    r"[a-z0-9._]{1,6}@[a-z]{1,5}\.(com|org|net)",
    r"(0|1[01]*)(\.[0-9]+)?",
]


def exact_step(counter, remaining: int, state: int) -> dict[int, Fraction]:
    """Target → exact probability that the next character from ``state`` leads there, with
    ``remaining`` characters to go (the targets of the DFA's edges are distinct per state)."""
    below, here = counter._table(remaining - 1), counter._table(remaining)[state]
    return {t: Fraction(len(label) * below[t], here)
            for label, t in transitions(counter.dfa)[state] if below[t]}


def computed_step(tables, remaining: int, state: int) -> dict[int, Fraction]:
    """Target → the probability q̂ the tables computed for the edge there."""
    return {int(tables.tgt[e]): Fraction(q) for e, q in tables.transition_law(remaining, state).items()}


def drawn_step(tables, remaining: int, state: int) -> dict[int, Fraction]:
    """Target → the probability the alias table draws an edge there (summed over its slots)."""
    law: dict[int, Fraction] = {}
    for edge, probability in tables.step_distribution(remaining, state):
        target = int(tables.tgt[edge])
        law[target] = law.get(target, Fraction(0)) + Fraction(probability)
    return law


@pytest.mark.parametrize("pattern", PATTERNS)
def test_transition_probabilities_within_the_stated_relative_bound(pattern):
    counter = pfuzz.compile(pattern).counter
    top = 24
    tables = FloatTables(counter, top)
    for r in range(1, top + 1):
        bound = Fraction(tables.transition_bound(r))
        for state in range(counter.dfa.n_states):
            if not counter._table(r)[state]:
                continue
            exact, computed = exact_step(counter, r, state), computed_step(tables, r, state)
            assert computed.keys() == exact.keys()
            for target, x in exact.items():
                assert abs(computed[target] - x) <= x * bound


@pytest.mark.parametrize("pattern", PATTERNS)
@pytest.mark.parametrize("per_character, pairing", [(True, "robin hood"), (False, "robin hood"),
                                                    (True, "vose"), (False, "vose")])
def test_alias_tables_draw_the_exact_law_within_the_step_bound(pattern, per_character, pairing,
                                                               monkeypatch):
    if not per_character:
        monkeypatch.setattr(bulk, "CHARACTER_SLOT_BUDGET", 0)
    if pairing == "vose":  # every row of two slots or more through the linear pairing
        monkeypatch.setattr(bulk, "ROBIN_HOOD_FANOUT", 1)
    counter = pfuzz.compile(pattern).counter
    top = 16
    tables = FloatTables(counter, top)
    assert tables.per_character == per_character
    for r in range(1, top + 1):
        for state in range(counter.dfa.n_states):
            if not counter._table(r)[state]:
                continue
            exact, drawn = exact_step(counter, r, state), drawn_step(tables, r, state)
            if tables.kind[r] == bulk.UNIFORM:  # the walk draws the character exactly
                assert list(exact.values()) == [1]
                continue
            variation = sum(abs(drawn.get(t, 0) - x) for t, x in exact.items()) / 2
            assert variation <= Fraction(tables.step_bound(r))


def test_string_bound_is_small_for_everyday_patterns():
    date = FloatTables(pfuzz.compile(PATTERNS[0]).counter, 10)
    assert date.string_bound(10) < 1e-11
    plate = FloatTables(pfuzz.compile(r"[A-Z]{2}[0-9]{4}").counter, [6])
    assert plate.string_bound(6) == 0  # every level uniform: exact draws


@pytest.mark.parametrize("pairing", [robin_hood, vose])
def test_alias_rows_reproduce_their_weights(pairing):
    weights = np.array([[0.0, 0.5, 2.5], [1.0, 1.0, 1.0], [3.0, 0.0, 0.0], [0.2, 1.3, 1.5]])
    wide = np.random.default_rng(5).exponential(size=(3, 1000)) * np.array([[1.0], [0.0], [1.0]])
    wide[1, 7] = 1.0  # one row with all its weight on one slot
    wide[2, ::3] = 0.0
    wide *= 1000 / wide.sum(axis=1, keepdims=True)
    for rows in (weights, wide):
        k = rows.shape[1]
        prob, alias = pairing(rows)
        assert prob.min() >= 0 and prob.max() <= 1
        for row, p, a in zip(rows, prob, alias):
            law = np.bincount(np.arange(k), weights=p, minlength=k) + np.bincount(a, weights=1 - p, minlength=k)
            assert np.allclose(law, row, atol=1e-9)


def test_wide_classes_get_one_slot_per_edge():
    # A pair with 133,548 characters (\w over Unicode) once got one slot per character, and
    # its alias row cost quadratic time (24 s): slots are per edge past PER_CHARACTER_FANOUT.
    wide = FloatTables(pfuzz.compile(r"中\w\Z", alphabet="unicode").counter, 2)
    assert not wide.per_character
    narrow = FloatTables(pfuzz.compile(r"[a-z][0-9a-f]").counter, 2)
    assert narrow.per_character
    assert wide.step_bound(1) < 1e-10 and wide.string_bound(2) < 1e-10


def test_counts_beyond_float_range_keep_their_exponents():
    # Over Unicode, a{60} then 200 more characters: about 10^1208 strings, far beyond float64.
    counter = pfuzz.compile(r"a{60}.*", alphabet="unicode").counter
    tables = counter.float_tables([260])
    assert tables.has_strings(260) and tables.start_exponent(260) > 1208 * 3.3
    assert not counter.has_strings(59)
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


def test_tables_hold_only_the_pairs_a_walk_can_meet():
    # A chain: the walk to length m is at state min(i, 5000) after i characters (or in the
    # state after the final c), so the tables need about two pairs per drawn length and
    # remaining length, not 5,002 x 5,033.
    lang = pfuzz.compile(r"[ab]{5000,}c?")
    strings = lang.sample(40, seed=4)
    assert all(len(s) >= 5000 and re.fullmatch(r"[ab]{5000,}c?", s) for s in strings)
    tables = lang.counter._bulk
    assert not tables.dense and not tables.single_path
    assert tables.n_pairs <= 2 * len(tables.lengths) * 5033
    dense = FloatTables(pfuzz.compile(r"[ab]{50,}c?").counter, 60)
    sparse = FloatTables(pfuzz.compile(r"[ab]{50,}c?").counter, [55, 60])
    assert dense.dense and not sparse.dense
    for m in (55, 60):
        assert sparse.start_count(m) == dense.start_count(m)


def test_a_single_path_needs_no_tables():
    # Every state has one edge, all over the same characters: strings are independent picks.
    lang = pfuzz.compile(r".{2000,}?")
    strings = lang.sample(5, seed=2)
    assert all(len(s) >= 2000 and "\n" not in s for s in strings)
    tables = lang.counter._bulk
    assert tables.single_path and not hasattr(tables, "n_pairs")
    assert tables.string_bound(2010) == 0
    for m in (0, 1999, 2000, 2031):
        mantissa, exponent = tables.start_count(m)
        exact = lang.count(m)  # 95^m from the exact tables, 0 below 2000
        assert (mantissa > 0) == (exact > 0)
        if exact:
            assert exponent == exact.bit_length()
            assert abs(Fraction(mantissa) * 2**exponent - exact) <= exact * Fraction(2) ** -52


def test_tables_past_the_budget_raise_before_allocating(monkeypatch):
    monkeypatch.setattr(bulk, "TABLE_BUDGET", 1 << 16)
    lang = pfuzz.compile(r"([a-f][0-9]{0,99})*")  # 100 states, all reachable at most depths
    with pytest.raises(ResourceLimitError, match="max_length"):
        lang.sample(10, lengths=[5_000], seed=1)


@pytest.mark.parametrize("width", [2, 3, 10, 16, 26, 95, 200, 256, 300])
def test_uniform_draws_are_uniform_and_independent_in_pairs(width):
    # Pearson's chi-squared test of goodness of fit (common practice), on single picks
    # and on consecutive pairs (two picks may come from one random byte).
    table = np.arange(width).astype(np.uint8 if width <= 256 else np.uint32)
    count = 60 * width * width if width <= 26 else 200 * width
    picks = uniform_draws(table, count, np.random.Generator(np.random.PCG64(7))).astype(np.int64)
    assert picks.min() >= 0 and picks.max() < width
    for cells, observed in [(width, np.bincount(picks, minlength=width)),
                            (width * width, np.bincount(picks[:len(picks) // 2 * 2:2] * width
                                                        + picks[1:len(picks) // 2 * 2:2],
                                                        minlength=width * width))]:
        if len(picks) / 2 < 5 * cells and cells > width:
            continue  # too few pairs for the test
        expected = observed.sum() / cells
        statistic = float(((observed - expected) ** 2 / expected).sum())
        # 5 standard deviations above the mean of the chi-squared law (cells - 1 degrees)
        assert statistic < (cells - 1) + 5 * (2 * (cells - 1)) ** 0.5
