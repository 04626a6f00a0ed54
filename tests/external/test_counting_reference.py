"""Counts, ranks, enumeration and samples against brute force with Python's ``re``.

Reference matcher: CPython's ``re.fullmatch`` (the standard library). For
random small patterns over a 2- or 3-letter alphabet, every string up to
length 8 is tried with ``re.fullmatch``; the
accepted ones, sorted, must be exactly what pfuzz counts, ranks and
enumerates, and every sampled string must be accepted by ``re.fullmatch``.
"""

from __future__ import annotations

import itertools
import re

from hypothesis import given, settings, strategies as st

import pfuzz

QUANTIFIERS = ["*", "+", "?", "{2}", "{0,2}", "{1,3}", "{2,}"]


def patterns(letters: str) -> st.SearchStrategy[str]:
    """Pattern text from a small grammar: letters, classes, groups, alternation, repeats."""
    atom = st.one_of(
        st.sampled_from(list(letters)),
        st.lists(st.sampled_from(letters), min_size=1, max_size=2, unique=True).map(
            lambda cs: "[" + "".join(sorted(cs)) + "]"),
        st.sampled_from(letters).map(lambda c: f"[^{c}]"),
        st.just("."),
    )

    def extend(inner):
        return st.one_of(
            st.lists(inner, min_size=2, max_size=3).map("".join),
            st.lists(inner, min_size=2, max_size=3).map(lambda xs: "(" + "|".join(xs) + ")"),
            st.tuples(inner, st.sampled_from(QUANTIFIERS)).map(lambda p: f"(?:{p[0]}){p[1]}"),
        )

    return st.recursive(atom, extend, max_leaves=6)


def accepted_by_re(pattern: str, letters: str, length: int) -> list[str]:
    rx = re.compile(pattern)
    return [s for s in map("".join, itertools.product(sorted(letters), repeat=length))
            if rx.fullmatch(s)]  # reference: re.fullmatch


def check(pattern: str, letters: str, longest: int) -> None:
    lang = pfuzz.compile(pattern, alphabet=f"[{letters}]")
    for length in range(longest + 1):
        expected = accepted_by_re(pattern, letters, length)
        assert lang.count(length) == len(expected), (pattern, length)
        assert list(lang.enumerate(length, length)) == expected
        assert [lang.rank(s) for s in expected] == list(range(len(expected)))
    if lang.lengths(max_length=longest):
        for method in ["exact", "bulk"]:
            drawn = lang.sample(200, max_length=longest, seed=0, method=method)
            assert all(re.fullmatch(pattern, s) for s in drawn), (pattern, method)


@settings(max_examples=60, deadline=None, database=None)
@given(patterns("ab"))
def test_two_letters_up_to_length_8(pattern):
    check(pattern, "ab", 8)


@settings(max_examples=20, deadline=None, database=None)
@given(patterns("abc"))
def test_three_letters_up_to_length_8(pattern):
    check(pattern, "abc", 8)


REALISTIC = [
    r"[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])",
    r"[a-z0-9._%+-]+@[a-z0-9-]+\.[a-z]{2,6}",
    r"(?i)[a-f0-9]{2}(:[a-f0-9]{2}){5}",
    r"(?=.*[0-9])(?=.*[A-Z])[A-Za-z0-9]{8,12}",
    r"\+[1-9][0-9]{6,13}",
    r"[ \t]*#?[^\n]*",
]


def test_samples_of_realistic_patterns_are_accepted_by_re():
    for pattern in REALISTIC:
        lang = pfuzz.compile(pattern)
        rx = re.compile(pattern)
        for method in ["exact", "bulk"]:
            drawn = lang.sample(1500, seed=3, method=method, max_length=30)
            assert all(rx.fullmatch(s) for s in drawn), (pattern, method)  # reference: re.fullmatch
            assert all(lang.unrank(len(s), lang.rank(s)) == s for s in drawn[:200])
