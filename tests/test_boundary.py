"""Tests for pfuzz.boundary.suite: verdicts, transition coverage, determinism, size, cost.

Two references outside the module: Python's ``re.fullmatch`` for compiled
patterns, and brute-force enumeration of every string over a small alphabet
for automata built directly from a Python predicate (so these do not depend
on the pattern compiler either).
"""

from __future__ import annotations

import re
import time

import pytest
from hypothesis import given, settings, strategies as st

import pfuzz
from helpers import flat_transitions, strings_upto
from pfuzz.boundary import suite as boundary
from pfuzz.boundary.suite import coverage, suite
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.base.charset import CharSet
from pfuzz.automata.dfa import explore
from pfuzz.automata.minimise import minimise
from pfuzz.automata.algebra import from_strings
from pfuzz.boundary.paths import Guide

#: Realistic validator patterns; every case's verdict is checked against re.fullmatch.
PATTERNS = [
    r"[0-9]{4}-[0-9]{2}-[0-9]{2}",
    r"(0[1-9]|1[0-2])/(0[1-9]|[12][0-9]|3[01])",
    r"([01][0-9]|2[0-3]):[0-5][0-9]",
    r"[A-Z]{2}[0-9]{2}[A-Z0-9]{4}[0-9]{7}([A-Z0-9]?){0,16}",
    r"[A-Za-z_][A-Za-z0-9_]{0,30}",
    r"[a-z0-9._%+-]+@[a-z0-9.-]+\.[a-z]{2,6}",
    r"\+[1-9][0-9]{0,2}[0-9]{4,12}",
    r"#([0-9a-fA-F]{3}|[0-9a-fA-F]{6})",
    r"(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])(\.(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])){3}",
    r"(0|[1-9][0-9]*)\.(0|[1-9][0-9]*)\.(0|[1-9][0-9]*)",
    r"[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}",
    r"[A-Z]{1,2}[0-9][A-Z0-9]? ?[0-9][A-Z]{2}",
    r"[0-9]{5}(-[0-9]{4})?",
    r"-?(0|[1-9][0-9]{0,8})(\.[0-9]{1,2})?",
    r"(?i)[a-f0-9]{2}(:[a-f0-9]{2}){5}",
    r"[a-z]+(-[a-z]+)*",
    r"(ab)+",
    r"a{3,5}|b{7}",
    r"[0-9]{3} [0-9]{3} [0-9]{4}",
    r"(?=.*[0-9])(?=.*[a-z])[a-z0-9]{6,12}",
    r"(?!.*  ).{1,20}",
    r"[A-Z][a-z]+( [A-Z][a-z]+)?",
    r"v?[0-9]+(\.[0-9]+){0,2}",
    r"[0-9]{1,3}(,[0-9]{3})*(\.[0-9]{2})?",
    r"(true|false|yes|no|on|off)",
    r"[a-z]{2}(-[A-Z]{2})?",
    r"\d{2}\.\d{2}\.\d{4}",
    r"[^,;\s]{1,10}",
    r"x*y?x{2}",
    r"(foo|foobar|bar)baz?",
]


def compiled(pattern):
    return pfuzz.compile(pattern)


# -- automata built from predicates, checked by brute force --------------------------

AB = CharSet.range("a", "c")


def dfa_of(words):
    return from_strings(words, AB)


def mod_dfa(modulus, residue, letter="a"):
    """Strings over a-c whose count of ``letter`` is ``residue`` modulo ``modulus`` (infinite)."""
    classes = [CharSet.single(c) for c in "abc"]

    def step(k, c):
        return (k + (1 if "abc"[c] == letter else 0)) % modulus

    return minimise(explore(0, step, lambda k: k == residue, classes, AB)), \
        (lambda s: s.count(letter) % modulus == residue)


FINITE_PREDICATES = [
    lambda s: 2 <= len(s) <= 5 and s.count("a") % 2 == 0,
    lambda s: s in {"ab", "abc", "b", "ca", "cab", "ccccc"},
    lambda s: len(s) in (1, 4, 5) and s.startswith("a"),
    lambda s: len(s) <= 4 and "bb" not in s,
    lambda s: len(s) == 3 and s[1] != "c",
    lambda s: s == "",
]


def brute_facts(member, upto):
    valid = [s for s in strings_upto("abc", upto) if member(s)]
    lengths = sorted({len(s) for s in valid})
    shortest = min(valid, key=lambda s: (len(s), s))
    longest = min(valid, key=lambda s: (-len(s), s))
    return valid, lengths, shortest, longest


@pytest.mark.parametrize("index", range(len(FINITE_PREDICATES)))
def test_finite_suites_against_brute_force(index):
    member = FINITE_PREDICATES[index]
    valid, lengths, shortest, longest = brute_facts(member, 6)
    dfa = dfa_of(valid)
    cases = suite(dfa)
    for case in cases:
        assert case.expected == member(case.text), case  # reference: the predicate itself
    by = {c.category: c for c in cases}
    assert cases[0] == by["shortest"] and cases[0].text == shortest
    assert [c.text for c in cases if c.category == "longest"] in ([longest], [])
    assert any(c.text == longest for c in cases)
    # every edge of the set of valid lengths appears: valid at the edge, invalid just outside
    edges = [n for n in lengths if n - 1 not in lengths or n + 1 not in lengths]
    texts = {c.text for c in cases}
    for n in edges:
        assert min((s for s in valid if len(s) == n)) in texts
        outside = [m for m in (n - 1, n + 1) if m >= 0 and m not in lengths]
        for m in outside:
            assert any(len(c.text) == m and not c.expected for c in cases), (n, m)


@pytest.mark.parametrize("modulus,residue,letter", [(3, 0, "a"), (2, 1, "b"), (4, 2, "c")])
def test_unbounded_suite_uses_the_documented_bound(modulus, residue, letter):
    dfa, member = mod_dfa(modulus, residue, letter)
    cases = suite(dfa)
    for case in cases:
        assert case.expected == member(case.text), case
    shortest = min((s for s in strings_upto("abc", 4) if member(s)), key=lambda s: (len(s), s))
    assert cases[0].text == shortest
    (longest,) = [c for c in cases if c.category == "longest"]
    assert len(longest.text) == len(shortest) + UNBOUNDED_SPAN
    assert "no upper limit" in longest.reason
    bounded = suite(dfa, max_length=9)
    (longest,) = [c for c in bounded if c.category == "longest"]
    assert len(longest.text) == 9
    assert longest.text == min(s for s in strings_upto("abc", 9) if len(s) == 9 and member(s))


def test_length_edges_of_a_periodic_language():
    # valid lengths of (ab)+ over a-c: 2, 4, 6, ...: the scan stops once the pattern repeats
    classes = [CharSet.single(c) for c in "abc"]
    dfa = minimise(explore(
        (0, False), lambda st, c: ((st[0] + 1) % 2, True) if "abc"[c] == "ab"[st[0]] else None,
        lambda st: st[1] and st[0] == 0, classes, AB))
    edges = [c for c in suite(dfa) if c.category == "length-edge"]
    assert sorted(len(c.text) for c in edges) == [1, 3]
    assert all(not c.expected for c in edges)


def test_exit_after_a_valid_string_is_kept_apart():
    # '0 ': a trailing character after a complete valid string, a classic validator slip
    cases = suite(dfa_of(["a", "aa", "aaa"]))
    exits = [c for c in cases if c.category == "exit"]
    # 'c' rather than 'b': a rejected character not adjacent to the allowed 'a' is preferred
    assert [(c.text, c.expected) for c in exits] == [("c", False), ("ac", False)]
    assert "after the valid string 'a'" in exits[1].reason
    # the exit after the longest string is the length edge 'aaaa', its reason joined
    (longer,) = [c for c in cases if c.text == "aaaa"]
    assert longer.category == "length-edge" and "nothing may follow" in longer.reason


def test_empty_language_has_an_empty_suite():
    assert suite(dfa_of([])) == []
    assert coverage(dfa_of([])) == []


def test_negative_bound_is_refused():
    with pytest.raises(ValueError, match="max_length"):
        suite(dfa_of(["a"]), max_length=-1)


# -- coverage -------------------------------------------------------------------------

def taken(dfa, text):
    pairs, s = set(), 0
    for ch in text:
        t = dfa.table[s][dfa.class_of(ch)]
        pairs.add((s, t))
        s = t
    return pairs


def live_transitions_from_table(dfa):
    """Every (state, next state) pair of the table between live states (independent of boundary)."""
    live = dfa.live_states()
    return {(s, t) for s in live for t in dfa.table[s] if t >= 0 and t in live}


def assert_covers(dfa):
    strings = coverage(dfa)
    assert all(dfa.accepts(s) for s in strings)
    union = set().union(*(taken(dfa, s) for s in strings)) if strings else set()
    assert union == live_transitions_from_table(dfa)
    assert len(strings) <= len(flat_transitions(dfa))
    return strings


@pytest.mark.parametrize("index", range(len(FINITE_PREDICATES)))
def test_coverage_takes_every_transition_of_small_automata(index):
    valid = [s for s in strings_upto("abc", 6) if FINITE_PREDICATES[index](s)]
    assert_covers(dfa_of(valid))


def test_coverage_of_cyclic_automata():
    for args in [(3, 0, "a"), (5, 2, "b")]:
        assert_covers(mod_dfa(*args)[0])


# -- patterns against re.fullmatch ------------------------------------------------------

@pytest.mark.parametrize("pattern", PATTERNS)
def test_every_case_agrees_with_re(pattern):
    lang = compiled(pattern)
    cases = suite(lang.dfa)
    assert cases, pattern
    for case in cases:
        reference = re.fullmatch(pattern, case.text) is not None  # reference: Python's re
        assert case.expected == reference, (pattern, case)
        assert case.category in boundary.CATEGORIES and case.reason
        assert all(ch in lang.alphabet for ch in case.text)
    assert len({c.text for c in cases}) == len(cases)
    strings = assert_covers(lang.dfa)
    assert sum(c.category == "coverage" for c in cases) <= len(strings)


@pytest.mark.parametrize("pattern", PATTERNS[:10])
def test_suite_is_deterministic(pattern):
    first = suite(compiled(pattern).dfa)
    again = suite(compiled(pattern).dfa)
    assert first == again
    assert [c.category for c in first] == sorted((c.category for c in first),
                                                  key=boundary.CATEGORIES.index)


@pytest.mark.parametrize("pattern", PATTERNS)
def test_size_bounds(pattern):
    dfa = compiled(pattern).dfa
    cases = suite(dfa)
    edges = flat_transitions(dfa)
    ranges = sum(len(label.ranges) for _, label, _ in edges)
    count = {k: sum(c.category == k for c in cases) for k in boundary.CATEGORIES}
    assert count["shortest"] == 1 and count["longest"] <= 1
    assert count["range-edge"] <= 4 * len({r for _, label, _ in edges for r in label.ranges})
    assert count["coverage"] <= len(edges)
    allowed = {s: CharSet() for s in range(dfa.n_states)}
    for s, label, _ in edges:
        allowed[s] = allowed[s] | label
    kinds = {(allowed[s], s in dfa.accepting) for s in allowed}
    assert count["exit"] <= len(kinds) <= dfa.n_states
    # boundary value analysis keeps suites small: a handful of cases per transition
    assert len(cases) <= 6 * ranges + 2 * dfa.n_states + 8


def test_range_edges_of_a_digit_position():
    cases = suite(compiled(r"[0-9]{3}-x").dfa)
    by_text = {c.text: c for c in cases}
    # '/' and ':' are the neighbours of '0' and '9' in ASCII (common practice: ASCII table)
    assert not by_text["/00-x"].expected and "just below" in by_text["/00-x"].reason
    assert not by_text[":00-x"].expected and "allowed at 0" in by_text[":00-x"].reason
    assert by_text["900-x"].expected
    # the range [0-9] recurs at positions 2 and 3: tested at its first position only
    assert "0:0-x" not in by_text and "09" + "0-x" not in by_text
    assert by_text["000-xx"].category == "length-edge" and not by_text["000-xx"].expected
    assert "one character shorter" in by_text["000-"].reason and not by_text["000-"].expected


@pytest.mark.parametrize("pattern", PATTERNS)
def test_every_distinct_range_is_tested_at_its_first_state(pattern):
    dfa = compiled(pattern).dfa
    guide = Guide(dfa)
    texts = {c.text: c.expected for c in suite(dfa)}
    first: dict[tuple[int, int], tuple[int, int]] = {}
    for s, label, t in flat_transitions(dfa):
        for lo, hi in label.ranges:
            first.setdefault((lo, hi), (s, t))
    for (lo, hi), (s, t) in first.items():
        for point in (lo, hi):
            assert texts[guide.prefix(s) + chr(point) + guide.completion(t)] is True


def test_cost_on_a_large_automaton():
    lang = compiled(r"[A-Z]{2}[0-9]{2}[A-Z0-9]{4}[0-9]{7}([A-Z0-9]?){0,16}|[a-z]{1,60}@[a-z]{1,60}")
    assert lang.dfa.n_states >= 100
    start = time.perf_counter()
    cases = suite(lang.dfa)
    elapsed = time.perf_counter() - start
    assert elapsed < 0.1 * 3, elapsed  # target 100 ms; 3x margin for loaded CI machines
    assert cases


# -- random small patterns (Hypothesis) against re.fullmatch ------------------------------

ATOMS = ["a", "b", "[ab]", "[^a]", ".", "[a-c]", "c"]


@st.composite
def small_patterns(draw, depth=2):
    if depth == 0 or draw(st.booleans()):
        return draw(st.sampled_from(ATOMS))
    kind = draw(st.sampled_from(["seq", "alt", "repeat"]))
    inner = small_patterns(depth - 1)
    if kind == "seq":
        return "".join(draw(st.lists(inner, min_size=2, max_size=3)))
    if kind == "alt":
        return "(" + "|".join(draw(st.lists(inner, min_size=2, max_size=3))) + ")"
    return "(" + draw(inner) + ")" + draw(st.sampled_from(["*", "+", "?", "{2}", "{1,3}", "{0,2}"]))


@settings(max_examples=150, deadline=None, database=None)
@given(small_patterns())
def test_random_patterns_agree_with_re_and_are_covered(pattern):
    lang = pfuzz.compile(pattern, alphabet="[a-d]")
    cases = suite(lang.dfa)
    for case in cases:
        assert case.expected == (re.fullmatch(pattern, case.text) is not None), (pattern, case)
    if not lang.is_empty():
        assert_covers(lang.dfa)
        assert cases[0].text == lang.shortest()
