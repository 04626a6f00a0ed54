"""Errors: PatternError positions against ``re.error`` (the reference), and project error types."""

import re

import pytest

import pfuzz
from pfuzz.errors import ArgumentError, PatternError, ProfileError
from pfuzz.base.randomness import source

BAD_PATTERNS = [
    "ab(c",
    "[a-",
    "(?x)\n  [a-z]+   # letters\n  (?P<x   # broken\n",
    "(?x)\n\n   a{2,1}",
    "x\ny\nz)",
    "ＡＢ(c",
]


@pytest.mark.parametrize("pattern", BAD_PATTERNS)
def test_line_and_column_match_re(pattern):
    # Reference: Python's re.error carries pos, lineno and colno for the same pattern.
    with pytest.raises(re.error) as expected:
        re.compile(pattern)
    with pytest.raises(PatternError) as got:
        pfuzz.compile(pattern)
    assert got.value.position == expected.value.pos
    assert (got.value.lineno, got.value.colno) == (expected.value.lineno, expected.value.colno)


def test_caret_sits_under_the_column_on_its_own_line():
    error = PatternError("boom", "(?x)\nabc\n  de(f", 13)
    line, caret = error.caret().split("\n")
    assert line.strip() == "de(f" and error.where() == "line 3, column 5"
    assert line[caret.index("^")] == "("


def test_caret_counts_full_width_characters_as_two_columns():
    # East Asian Width of U+FF21 is F (full width): Unicode UAX #11.
    error = PatternError("boom", "ＡＢ(c", 2)
    caret = error.caret().split("\n")[1]
    assert caret.index("^") == 2 + 4


def test_bad_library_arguments_are_project_errors():
    with pytest.raises(ArgumentError):
        source(0).below(0)
    with pytest.raises(ArgumentError):
        source(0).weighted_index([0, 0])


def test_unknown_profile_field_is_a_profile_error(tmp_path):
    from pfuzz.profile.loader import load_profile
    path = tmp_path / "p.toml"
    path.write_text('[profile]\ntitle = "t"\n[[field]]\nname = "code"\npattern = "[a-z]"\n')
    with pytest.raises(ProfileError, match="no field named 'nope'.*code"):
        load_profile(path).field("nope")
