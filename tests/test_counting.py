"""Tests for pfuzz.counting.tables: count tables, bounds, rank/unrank, shortlex enumeration.

External references (OEIS, brute force with ``re.fullmatch``) live in
tests/external/test_counting_oeis.py and test_counting_reference.py; these
tests check the module's own invariants and edge cases.
"""

from __future__ import annotations

import itertools

import pytest

import pfuzz
from pfuzz.base.charset import CharSet
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.counting.tables import Counter
from pfuzz.automata.dfa import empty, explore
from pfuzz.automata.minimise import minimise


def counter(pattern: str, alphabet="printable") -> Counter:
    return pfuzz.compile(pattern, alphabet=alphabet).counter


def test_counts_are_exact_big_integers():
    c = counter(r"[0-9]{40}")
    assert c.count(40) == 10**40
    assert c.count(39) == 0 and c.count(41) == 0
    assert c.total() == 10**40


def test_counts_table_includes_zero_lengths_and_defaults():
    c = counter(r"ab|[xy]{3}")
    assert c.counts() == {0: 0, 1: 0, 2: 1, 3: 8}
    assert c.counts(None) == {2: 1, 3: 8}
    assert c.counts(0, 4) == {0: 0, 1: 0, 2: 1, 3: 8, 4: 0}
    assert c.total() == 9
    assert c.lengths() == [2, 3]


def test_unbounded_language_uses_the_documented_default_bound():
    c = counter(r"x[0-9]+")
    assert c.total() is None
    assert c.bounds(None, None) == (2, 2 + UNBOUNDED_SPAN)
    assert c.bounds(10, None) == (10, 10 + UNBOUNDED_SPAN)
    assert c.lengths() == list(range(2, 3 + UNBOUNDED_SPAN))


def test_empty_language():
    c = Counter(empty(CharSet.range("a", "b")))
    assert c.count(0) == 0 and c.total() == 0 and c.lengths() == []
    with pytest.raises(pfuzz.EmptyLanguageError):
        c.sample(1)


def test_empty_string_language():
    c = counter(r"")
    assert c.count(0) == 1 and c.total() == 1
    assert c.unrank(0, 0) == "" and c.rank("") == 0
    assert list(c.enumerate(0, 3)) == [""]


def test_rank_orders_by_code_point_across_interleaved_classes():
    # After "a" the classes [b-c x-z] and [d-w] interleave: "q" sorts between "c" and "x".
    c = counter(r"a[b-cx-z]1|a[d-w]22")
    strings = [c.unrank(3, i) for i in range(c.count(3))]
    assert strings == sorted(strings)
    assert [c.rank(s) for s in strings] == list(range(len(strings)))
    mixed = counter(r"[ace]x{2}|[bdf]yy|[bdf]z|q..")
    for length in mixed.lengths():
        listed = [mixed.unrank(length, i) for i in range(mixed.count(length))]
        assert listed == sorted(listed)


def test_rank_rejects_strings_outside_the_language():
    c = counter(r"[a-c]{2}")
    for text in ["", "a", "ad", "abc", "A1", "a" * 10**6]:
        with pytest.raises(ValueError):
            c.rank(text)
    with pytest.raises(IndexError):
        c.unrank(2, 9)
    with pytest.raises(IndexError):
        c.unrank(3, 0)


def test_rank_unrank_round_trip_over_wide_unicode_classes():
    c = counter(r"\w{2}-[^a-z]", alphabet="unicode")
    size = c.count(4)
    for index in [0, 1, size // 3, size // 2, size - 1]:
        text = c.unrank(4, index)
        assert c.rank(text) == index
    assert c.unrank(4, size - 1) > c.unrank(4, 0)


def test_enumerate_matches_unrank_and_counts():
    c = counter(r"(0|1[01]*)(\.[0-9])?")
    low, high = 1, 5
    listed = list(c.enumerate(low, high))
    expected = [c.unrank(n, i) for n in range(low, high + 1) for i in range(c.count(n))]
    assert listed == expected
    assert len(listed) == sum(c.counts(low, high).values())


def test_sharded_enumeration_equals_the_whole():
    c = counter(r"[ab]{1,3}c?")
    whole = list(c.enumerate(0, 4))
    for shard in [1, 3, 7, 100]:
        pieces = [list(c.enumerate(0, 4, start, start + shard))
                  for start in range(0, len(whole), shard)]
        assert list(itertools.chain.from_iterable(pieces)) == whole
    assert list(c.enumerate(0, 4, 5)) == whole[5:]
    assert list(c.enumerate(0, 4, 5, 5)) == []


def test_counter_accepts_an_untrimmed_dfa():
    # A hand-built automaton with a state that cannot reach acceptance (state 2).
    classes = (CharSet.single("a"), CharSet.single("b"))
    alphabet = CharSet.range("a", "b")

    def step(config, c):
        return {(0, 0): 1, (0, 1): 2, (1, 0): 1, (2, 0): 2}.get((config, c))

    raw = explore(0, step, lambda s: s == 1, classes, alphabet)
    c = Counter(raw)
    assert [c.count(n) for n in range(4)] == [0, 1, 1, 1]
    assert Counter(minimise(raw)).counts(0, 5) == c.counts(0, 5)
    assert list(c.enumerate(0, 3)) == ["a", "aa", "aaa"]


def test_bad_lengths_and_slices_are_pfuzz_errors():
    from pfuzz.errors import ArgumentError
    c = counter(r"[a-c]{2}")
    for call in (lambda: c.count(-1), lambda: c.counts(-1, 2), lambda: list(c.enumerate(0, 2, 3, 1))):
        with pytest.raises(ArgumentError):
            call()


# -- sparse levels, matrix powering, yes/no lengths (pfuzz.counting.levels) ----------------

SMALL_PATTERNS = [r"[ab]{2,5}", r"(ab|b)*a?", r"a{3}|b{1,2}c", r"(a|bc)*c{0,2}", r"[abc]*ba"]


@pytest.mark.parametrize("pattern", SMALL_PATTERNS)
def test_sparse_and_dense_levels_count_what_re_accepts(pattern, monkeypatch):
    import re

    from helpers import strings_upto
    from pfuzz.counting import levels

    # Brute force with re.fullmatch over every string up to length 7 (the reference).
    brute = {n: 0 for n in range(8)}
    for text in strings_upto("abc", 7):
        if re.fullmatch(pattern, text):
            brute[len(text)] += 1
    for share in (1, 10**9):  # every level dense, then every level sparse
        monkeypatch.setattr(levels, "SPARSE_SHARE", share)
        c = counter(pattern, alphabet="[abc]")
        assert c.counts(0, 7) == brute
        assert [n for n in range(8) if c.has_strings(n)] == [n for n in range(8) if brute[n]]


def test_a_chain_keeps_one_entry_per_level():
    from pfuzz.counting.levels import Level

    c = counter(r"[0-9]{5000}")
    assert c.count(5000) == 10**5000  # ten choices at each of 5,000 places (common practice)
    assert all(isinstance(level, Level) and len(level) == 1 for level in c._levels)


@pytest.mark.parametrize("pattern", [r"[0-9]*", r"(ab|b)*a?", r"[a-c]+[0-9]?", r"(a[0-9]{0,3})*"])
def test_matrix_powering_equals_the_level_recurrence(pattern):
    from pfuzz.counting.levels import power_count

    c = counter(pattern)
    assert len(c._edges) <= 8
    for length in (0, 1, 2, 7, 64, 301):
        assert power_count(c._edges, c.dfa.accepting, length) == c._table(length)[0]


def test_long_lengths_of_small_automata_are_counted_by_powering():
    c = counter(r"[0-9]*")
    assert c.count(100_000) == 10**100_000
    assert len(c._levels) == 1  # no level was kept


def test_exact_tables_past_the_budget_raise_before_building(monkeypatch):
    from pfuzz.counting import sampler
    from pfuzz.errors import ResourceLimitError

    monkeypatch.setattr(sampler, "EXACT_TABLE_BUDGET", 1 << 12)
    c = counter(r"[a-z]{1,400}")
    assert c.exact_table_bytes(400) > 1 << 12
    with pytest.raises(ResourceLimitError, match="method='bulk'"):
        c.sample(5, seed=1, method="exact")
    assert len(c._levels) == 1
    strings = c.sample(5, seed=1)  # auto: the bulk path instead
    assert all(1 <= len(s) <= 400 for s in strings)


def test_counts_past_the_level_budget_go_forward_and_ranks_refuse(monkeypatch):
    from pfuzz.counting import tables
    from pfuzz.errors import ResourceLimitError

    monkeypatch.setattr(tables, "LEVELS_BUDGET", 1 << 20)
    c = counter(r"[a-z]{1,900}")
    assert c.counts(0, 900) == {n: 26**n if n else 0 for n in range(901)}  # common practice
    assert len(c._levels) < 900  # the forward pass kept one level past the budget
    with pytest.raises(ResourceLimitError, match="method='bulk'"):
        c.rank("a" * 900)
    small = counter(r"[a-z]{1,900}")
    assert [small.count(n) for n in (1, 2, 450)] == [26, 26**2, 26**450]
