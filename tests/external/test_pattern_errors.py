"""Unsupported constructs and syntax errors give ``pfuzz.PatternError`` at the right column.

References: Python's ``re`` module. For a pattern that ``re`` itself rejects,
the expected position is ``re.error.pos``. For a construct that ``re`` accepts
but that is not regular (or not supported), the expected position is the index
of the construct's first character, and the construct is placed after other
pattern text so that the position is really checked. The command line
(``pfuzz info``) must exit with status 2, print no traceback, and show the
pattern with a caret under that column.
"""

from __future__ import annotations

import re

import pytest
from click.testing import CliRunner

import pfuzz
from pfuzz.cli import main

#: (text before, construct, text after, a word the message must contain).
#: Every pattern here is accepted by Python 3.11's re; the error is pfuzz's
#: refusal of a construct outside the regular subset.
UNSUPPORTED = [
    ("(a)b", r"\1", "", "backreference"),
    ("(x)(y)z", r"\2", "+", "backreference"),
    ("(a)(?:b|c", r"\1", ")", "backreference"),
    ("(?P<q>['\"])[^'\"]*", "(?P=q)", "", "backreference"),
    ("(<)?[a-z]+", "(?(1)>|)", "", "conditional"),
    ("(?P<open>\\()?\\d+", "(?(open)\\))", "", "conditional"),
    ("[0-9]", "*+", "", "possessive"),
    ("ab", "++", "c", "possessive"),
    ("ab", "?+", "c", "possessive"),
    ("id-\\d", "{2}+", "", "possessive"),
    ("a", "{2,5}+", "z", "possessive"),
    ("(?:ab)", "*+", "c", "possessive"),
    ("ab", "(?>c|cd)", "e", "atomic"),
    ("ab", "(?<=c)", "d", "lookbehind"),
    ("price: ", "(?<!-)", "\\d+", "lookbehind"),
    ("x(?:y|", "(?<=y)", "z)", "lookbehind"),
    ("cat", r"\b", "", "boundary"),
    (r"\w+", r"\B", "x", "boundary"),
    ("(?=.*", r"\b", "x).*", "boundary"),
]

#: (pattern, hand-counted position of the error). Python's re rejects each of
#: them; the test checks that re.error.pos agrees with the hand count and that
#: pfuzz reports the same position.
SYNTAX_ERRORS = [
    ("ab(c", 2),            # unbalanced: missing )
    ("ab)c", 2),            # unbalanced: stray )
    ("x(?:y|(z)", 1),       # unbalanced: outer group never closed
    (r"ab\q", 2),           # bad escape
    (r"[a-z]\d\q", 7),      # bad escape after other atoms
    ("ab[z-a]", 3),         # bad range: re points at the range start
    ("ab|*c", 3),           # nothing to repeat
    ("(?:*a)", 3),          # nothing to repeat inside a group
    ("ab[cd", 2),           # unterminated class
    ("ab[^]", 2),           # unterminated class: ] right after ^ is literal
    ("x{3,1}", 2),          # min greater than max
    ("ab**", 3),            # multiple repeat
    (r"ab\x4", 2),          # incomplete \x escape
    ("a(?z)b", 2),          # unknown extension
    (r"ab\N{NO SUCH NAME}", 2),  # undefined character name
    ("abc(?", 5),           # unexpected end of pattern
    ("ab(?P=nope)", 6),     # unknown group name: re points at the name
    (r"ab\2", 3),           # invalid group reference
    ("a(?i)b", 1),          # global flags not at the start (an error since 3.11)
    (r"x[\d-z]", 2),        # bad range from a category
]


def unsupported_cases() -> list:
    return [pytest.param(before + construct + after, len(before), word,
                         id=before + construct + after)
            for before, construct, after, word in UNSUPPORTED]


def compile_error(pattern: str) -> pfuzz.PatternError:
    with pytest.raises(pfuzz.PatternError) as caught:
        pfuzz.compile(pattern)
    return caught.value


@pytest.mark.parametrize("pattern, position, word", unsupported_cases())
def test_unsupported_construct_is_refused_at_its_first_character(pattern, position, word):
    re.compile(pattern)  # the reference: Python's re accepts the pattern
    error = compile_error(pattern)
    assert isinstance(error, ValueError)
    assert error.position == position
    assert word in error.message.lower()
    assert error.pattern == pattern


@pytest.mark.parametrize("pattern, position", SYNTAX_ERRORS, ids=[p for p, _ in SYNTAX_ERRORS])
def test_syntax_error_position_matches_re(pattern, position):
    with pytest.raises(re.error) as reference:
        re.compile(pattern)
    assert reference.value.pos == position  # the hand count agrees with re
    error = compile_error(pattern)
    assert isinstance(error, ValueError)
    assert error.position == reference.value.pos


def test_backspace_inside_a_class_is_not_a_boundary():
    # re docs: inside a character class \b is the backspace character.
    assert re.fullmatch(r"a[\b]", "a\b")
    lang = pfuzz.compile(r"a[\b]", universe="ascii")
    assert lang.accepts("a\b") and not lang.accepts("ab")


def caret_column(stderr: str, pattern: str) -> int | None:
    """Column (in pattern coordinates) of the caret shown under the pattern line."""
    lines = stderr.splitlines()
    for line, below in zip(lines, lines[1:]):
        if line.rstrip().endswith(pattern) and below.strip() == "^":
            return below.index("^") - line.rindex(pattern)
    return None


CLI_CASES = [
    ("ab(?<=c)d", 2),
    (r"(\d+)-\1", 6),
    (r"[a-z]+\b", 6),
    ("id-[0-9]++", 8),
    (r"ab\q", 2),
    ("ab[cd", 2),
    ("ab|*c", 3),
    ("ab[z-a]", 3),
]


@pytest.mark.parametrize("pattern, position", CLI_CASES, ids=[p for p, _ in CLI_CASES])
def test_info_reports_the_column_without_a_traceback(pattern, position):
    result = CliRunner().invoke(main, ["info", pattern])
    assert result.exit_code == 2
    assert isinstance(result.exception, SystemExit)
    assert "Traceback" not in result.output
    assert result.stdout == ""
    assert caret_column(result.stderr, pattern) == position, result.stderr
