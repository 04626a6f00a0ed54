"""Character classes: members, ranges, negation, and the fast union."""

from __future__ import annotations

import re

import pytest
from hypothesis import given, settings, strategies as st

from pfuzz.syntax.categories import category
from pfuzz.base.charset import CharSet
from pfuzz.syntax.classes import read_class
from pfuzz.errors import PatternError

spans = st.tuples(st.integers(0, 80), st.integers(0, 6)).map(lambda t: (t[0], t[0] + t[1]))
sets = st.lists(spans, min_size=0, max_size=6).map(CharSet.of)


@settings(max_examples=300, deadline=None, database=None)
@given(st.lists(sets, min_size=1, max_size=5))
def test_union_equals_the_normalised_union(members):
    assert CharSet.union(members) == CharSet.of(r for s in members for r in s.ranges)


def test_union_with_a_large_category():
    assert CharSet.union([category("w"), CharSet.from_chars("!@#"), CharSet.range(0x10000, 0x10010)]) == \
        category("w") | CharSet.from_chars("!@#") | CharSet.range(0x10000, 0x10010)


@pytest.mark.parametrize("text, members, negated", [
    ("[]a]", "]a", False), ("[^]a]", "]a", True), ("[a-]", "a-", False), ("[-a]", "-a", False),
    ("[a-c-e]", "abc-e", False), ("[\\b]", "\b", False), ("[\\]]", "]", False), ("[ #]", " #", False),
    ("[\\x41-\\x43]", "ABC", False), ("[\\0\\1\\77]", "\x00\x01?", False), ("[--/]", "-./", False),
])
def test_members(text, members, negated):
    found = read_class(text + "tail", 0, ascii_only=False)
    expected = CharSet.from_chars(members)
    assert found.chars == (expected.complement() if negated else expected)
    assert (found.negated, found.end) == (negated, len(text))
    for char in members:
        # Reference: Python's re agrees on each member.
        assert bool(re.fullmatch(text, char)) != negated


def test_categories_inside_classes_follow_the_mode():
    assert read_class(r"[\w-]", 0, False).chars == category("w") | CharSet.single("-")
    assert read_class(r"[\W\d]", 0, True).chars == category("W", True) | category("d", True)


@pytest.mark.parametrize("text, position", [("[a", 0), ("[", 0), ("[a-", 0), ("[z-a]", 1), (r"[\d-z]", 1),
                                            (r"[a-\d]", 1), (r"[\A]", 1)])
def test_errors_at_res_positions(text, position):
    with pytest.raises(re.error) as expected:
        re.compile(text)  # reference: Python's re reports the same position
    with pytest.raises(PatternError) as caught:
        read_class(text, 0, False)
    assert caught.value.position == position == expected.value.pos
