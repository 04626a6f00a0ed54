"""Difference languages of two patterns (pfuzz.audit.comparison), against brute force.

The reference is Python's ``re``: over a two- or three-letter alphabet, every
string up to length ``N`` is tried with ``re.fullmatch`` on both patterns, and
the sets A − B and B − A so found must match pfuzz's counts per length, its
shortest examples, and the language of the pattern it writes for each side.
"""

from __future__ import annotations

import re

from hypothesis import given, settings, strategies as st

import pfuzz
from helpers import strings_upto
from pfuzz.base.charset import CharSet
from pfuzz.base.constants import COUNT_SPAN
from pfuzz.audit.comparison import compare, count_bound, lift, summarise

N = 6


def patterns(alphabet: str):
    atoms = st.sampled_from([*alphabet, f"[{alphabet}]", "", f"[^{alphabet[0]}]"])

    def extend(inner):
        return st.one_of(
            st.tuples(inner, inner).map(lambda p: p[0] + p[1]),
            st.tuples(inner, inner).map(lambda p: f"(?:{p[0]}|{p[1]})"),
            inner.map(lambda p: f"(?:{p})*"),
            inner.map(lambda p: f"(?:{p})?"),
            st.tuples(inner, st.integers(0, 2), st.integers(0, 2)).map(
                lambda p: f"(?:{p[0]}){{{min(p[1], p[2])},{max(p[1], p[2])}}}"),
        )

    return st.recursive(atoms, extend, max_leaves=5)


def brute(pattern: str, alphabet: str) -> set[str]:
    """Reference: every string up to length N that re.fullmatch accepts."""
    compiled = re.compile(pattern)
    return {w for w in strings_upto(alphabet, N) if compiled.fullmatch(w)}


def shortlex(strings) -> list[str]:
    return sorted(strings, key=lambda s: (len(s), s))


pairs = st.sampled_from(["ab", "abc"]).flatmap(
    lambda abc: st.tuples(st.just(abc), patterns(abc), patterns(abc)))


@settings(max_examples=80, deadline=None, database=None)
@given(pairs)
def test_differences_match_brute_force(case):
    letters, pattern_a, pattern_b = case
    alphabet = f"[{letters}]"
    a, b = pfuzz.compile(pattern_a, alphabet), pfuzz.compile(pattern_b, alphabet)
    result = compare(a, b, max_length=N, examples=4)
    in_a, in_b = brute(pattern_a, letters), brute(pattern_b, letters)
    for side, expected in ((result.only_a, in_a - in_b), (result.only_b, in_b - in_a)):
        per_length = {n: sum(1 for s in expected if len(s) == n) for n in range(N + 1)}
        assert side.counts == {n: c for n, c in per_length.items() if c}
        first = shortlex(expected)[:4]
        if len(first) == 4 or side.finite and (side.language.max_length or 0) <= N:
            assert list(side.examples) == first
        assert side.pattern is not None
        assert brute(side.pattern, letters) == expected
    if result.equal:
        assert in_a == in_b
    if in_a != in_b:
        assert not result.equal
    if result.distinguishing is not None and len(result.distinguishing) <= N:
        assert result.distinguishing == shortlex(in_a ^ in_b)[0]


def test_equal_patterns_have_empty_sides():
    a, b = pfuzz.compile(r"\d{3}"), pfuzz.compile(r"[0-9]{3}")
    result = compare(a, b)
    assert result.equal and result.only_a.empty and result.only_b.empty
    assert result.only_a.total == 0 and result.only_a.counts == {}


def test_month_field_difference():
    spec = pfuzz.compile(r"(0[1-9]|1[0-2])/[0-9]{2}")
    implementation = pfuzz.compile(r"[01][0-9]/[0-9]{2}")
    result = compare(spec, implementation)
    assert result.only_a.empty
    # Worked by hand: months 00 and 13-19 (8 two-digit prefixes) times 100 years.
    assert result.only_b.total == 800 and result.only_b.counts == {5: 800}
    assert result.only_b.examples[0] == "00/00"
    assert pfuzz.compile(result.only_b.pattern).equivalent(implementation - spec)


def test_unbounded_differences_are_counted_to_a_bound():
    lang = pfuzz.compile("[a-z]+") - pfuzz.compile("[a-z]{1,3}")
    side = summarise(lang)
    assert side.total is None and not side.finite
    assert side.bound == 4 + COUNT_SPAN == count_bound(lang, None)
    assert side.counts[4] == 26**4 and max(side.counts) == side.bound
    assert summarise(lang, max_length=2).counts == {}


def test_too_large_patterns_are_not_shown():
    lang = pfuzz.compile("[ab]*a[ab]{6}", "[ab]")
    side = summarise(lang, limit=200)
    assert side.pattern is None and "too large" in side.note


def test_lift_keeps_the_language_and_rejects_new_characters():
    lang = pfuzz.compile("[0-9]{2}")
    wider = lift(lang, pfuzz.ALPHABETS["latin1"])
    assert wider.alphabet == pfuzz.ALPHABETS["latin1"]
    assert wider.accepts("42") and not wider.accepts("4\u00b2") and not wider.accepts("4\n")
    assert wider.count(2) == 100
    assert lift(lang, lang.alphabet) is lang
    narrow = pfuzz.compile("[0-9]{2}", CharSet.range("0", "9"))
    assert lift(narrow, lang.alphabet).equivalent(lang)
