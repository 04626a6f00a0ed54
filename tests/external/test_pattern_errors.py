"""Refused constructs and syntax errors give ``pfuzz.PatternError`` at the right column.

References: Python's ``re`` module. For a pattern that ``re`` itself rejects,
the expected position is ``re.error.pos``. For a construct that ``re`` accepts
but pfuzz refuses (a backreference to a group of unbounded width), the expected
position is the index of the construct's first character, and
the construct is placed after other pattern text so that the position is really
checked. The command line (``pfuzz info``) must exit with status 2, print no
traceback, and show the pattern with a caret under that column.
"""

from __future__ import annotations

import re

import pytest
from click.testing import CliRunner

import pfuzz
from pfuzz.cli import main

#: Cases are written with a marker, MARK, just before the character the error
#: must point at; the pattern is the text without the marker.
MARK = "\u2038"  # CARET INSERTION POINT

#: Constructs pfuzz refuses, keyed by a word the message must contain. Python 3.11's re
#: accepts every one of these patterns.
UNSUPPORTED = {
    "any length": [r"(a+)b‸\1", r"(x)(y*)z‸\2+", r"(a*)(?:b|c‸\1)", "(?P<q>['\"]+)[^'\"]*‸(?P=q)",
                   r"(\d+)-‸\1", r"(?:(a)|(b+))‸\2"],
}

#: Constructs that used to be refused and now compile (re accepts each; pfuzz must too).
COMPILED = [r"(a)b\1", "(<)?[a-z]+(?(1)>|)", "[0-9]*+", "ab(?>c|cd)e", "ab(?<=c)d", r"cat\b", r"\w+\Bx"]

#: Patterns Python's re rejects, keyed by re's message; the marker is the hand
#: count of the position, which the test checks against re.error.pos.
SYNTAX_ERRORS = {
    "missing ), unterminated subpattern": ["ab‸(c", "x‸(?:y|(z)"],
    "unbalanced parenthesis": ["ab‸)c"],
    "bad escape": [r"ab‸\q", r"[a-z]\d‸\q"],
    "bad character range": ["ab[‸z-a]", r"x[‸\d-z]"],
    "nothing to repeat": ["ab|‸*c", "(?:‸*a)"],
    "unterminated character set": ["ab‸[cd", "ab‸[^]"],
    "min repeat greater than max repeat": ["x{‸3,1}"],
    "multiple repeat": ["ab*‸*"],
    "incomplete escape": [r"ab‸\x4"],
    "unknown extension": ["a(‸?z)b"],
    "undefined character name": [r"ab‸\N{NO SUCH NAME}"],
    "unexpected end of pattern": ["abc(?‸"],
    "unknown group name": ["ab(?P=‸nope)"],
    "invalid group reference": [r"ab\‸2"],
    "global flags not at the start": ["a‸(?i)b"],
}


def marked_cases(table: dict[str, list[str]]) -> list:
    """pytest params (pattern, position, key) from marked strings."""
    return [pytest.param(text.replace(MARK, ""), text.index(MARK), key, id=text)
            for key, texts in table.items() for text in texts]


def compile_error(pattern: str) -> pfuzz.PatternError:
    with pytest.raises(pfuzz.PatternError) as caught:
        pfuzz.compile(pattern)
    return caught.value


@pytest.mark.parametrize("pattern, position, word", marked_cases(UNSUPPORTED))
def test_unsupported_construct_is_refused_at_its_first_character(pattern, position, word):
    re.compile(pattern)  # the reference: Python's re accepts the pattern
    error = compile_error(pattern)
    assert isinstance(error, ValueError)
    assert error.position == position
    assert word in error.message.lower()
    assert error.pattern == pattern


@pytest.mark.parametrize("pattern, position, message", marked_cases(SYNTAX_ERRORS))
def test_syntax_error_position_matches_re(pattern, position, message):
    with pytest.raises(re.error) as reference:
        re.compile(pattern)
    assert message in str(reference.value)
    assert reference.value.pos == position  # the hand count agrees with re
    error = compile_error(pattern)
    assert isinstance(error, ValueError)
    assert error.position == reference.value.pos


@pytest.mark.parametrize("pattern", COMPILED)
def test_regular_constructs_compile(pattern):
    re.compile(pattern)  # the reference: Python's re accepts the pattern
    assert pfuzz.compile(pattern, alphabet="ascii").states >= 0


def test_backspace_inside_a_class_is_not_a_boundary():
    # re docs: inside a character class \b is the backspace character.
    assert re.fullmatch(r"a[\b]", "a\b")
    lang = pfuzz.compile(r"a[\b]", alphabet="ascii")
    assert lang.accepts("a\b") and not lang.accepts("ab")


def caret_column(stderr: str, pattern: str) -> int | None:
    """Column (in pattern coordinates) of the caret shown under the pattern line."""
    lines = stderr.splitlines()
    for line, below in zip(lines, lines[1:]):
        if line.rstrip().endswith(pattern) and below.strip() == "^":
            return below.index("^") - line.rindex(pattern)
    return None


#: A few of the cases above, through the command line.
CLI_CASES = [r"(\d+)-‸\1", r"(?x) (a*)  ‸\1", r"ab‸\q", "ab‸[cd", "ab|‸*c"]


@pytest.mark.parametrize("pattern, position, _", marked_cases({"cli": CLI_CASES}))
def test_info_reports_the_column_without_a_traceback(pattern, position, _):
    result = CliRunner().invoke(main, ["info", pattern])
    assert result.exit_code == 2
    assert isinstance(result.exception, SystemExit)
    assert "Traceback" not in result.output
    assert result.stdout == ""
    assert caret_column(result.stderr, pattern) == position, result.stderr
