"""Tests for pfuzz.strategies: drawn strings are accepted, and shrinking reaches the minimum.

Acceptance is checked with Python's ``re.fullmatch`` (the reference matcher).
Shrinking is checked with ``hypothesis.find`` and the example database off,
so that no stored example for another condition is replayed.
"""

from __future__ import annotations

import re

import pytest
from hypothesis import find, given, settings

import pfuzz
from pfuzz.errors import EmptyLanguageError
from pfuzz.strategies import accepted

QUIET = settings(max_examples=300, deadline=None, database=None)
EMAIL = r"[a-z]{1,8}@[a-z]{1,8}\.(com|org)"


@settings(max_examples=100, deadline=None, database=None)
@given(accepted(EMAIL))
def test_drawn_strings_are_accepted(text):
    assert re.fullmatch(EMAIL, text)  # reference: re.fullmatch


@settings(max_examples=50, deadline=None, database=None)
@given(accepted(r"[0-9]+", min_length=3, max_length=5))
def test_length_bounds_hold(text):
    assert 3 <= len(text) <= 5 and text.isdigit()


def test_shrinks_to_the_shortest_string():
    assert find(accepted(r"[a-c]+"), lambda s: len(s) >= 3, settings=QUIET) == "aaa"


def test_shrinks_to_the_shortlex_smallest_counterexample():
    # The shortest numerals above 500 have 3 digits; the smallest of them is "501".
    assert find(accepted(r"[0-9]{2,5}"), lambda s: int(s) > 500, settings=QUIET) == "501"
    # Every length has strings from "m" on; the shortest strings have 7 characters.
    assert find(accepted(EMAIL), lambda s: s >= "m", settings=QUIET) == "m@a.com"


def test_failing_property_reports_the_minimal_example():
    seen = []

    @settings(max_examples=300, deadline=None, database=None)
    @given(accepted(r"[A-Z]{2}[0-9]{2,4}"))
    def property_that_fails(code):
        seen.append(code)
        assert code < "M"

    with pytest.raises(AssertionError):
        property_that_fails()
    assert seen[-1] == "MA00"


def test_accepts_a_language_and_a_universe():
    lang = pfuzz.compile(r"[ab]{2}", universe="[ab]")
    assert find(accepted(lang), lambda s: s.endswith("b"), settings=QUIET) == "ab"
    wide = accepted(r"\w", universe="latin1")
    assert find(wide, lambda s: not s.isascii(), settings=QUIET) == "\u00aa"


def test_empty_language_is_a_clear_error():
    with pytest.raises(EmptyLanguageError):
        accepted(r"a{3}", max_length=2)
