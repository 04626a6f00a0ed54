"""The simplifying expression algebra and its re text (pfuzz.automata.expression).

Texts are checked against Python's ``re``: each escaped character and class
is compiled by ``re`` and tried on the characters around it.
"""

from __future__ import annotations

import re

import pytest

from pfuzz.base.charset import ALPHABETS, CharSet
from pfuzz.automata.expression import Algebra, class_text
from pfuzz.base.escaping import escape_point

PRINTABLE = ALPHABETS["printable"]


def test_class_text_picks_the_shorter_form():
    assert class_text(PRINTABLE - CharSet.single("a"), PRINTABLE) == "[^a]"
    assert class_text(CharSet.range("0", "9"), PRINTABLE) == "[0-9]"
    assert class_text(PRINTABLE - CharSet.single("\n"), PRINTABLE) == "."
    ascii_ = ALPHABETS["ascii"]
    assert class_text(ascii_ - CharSet.single("\n"), ascii_) == "."
    assert class_text(ascii_, ascii_) == r"[\x00-\x7f]"
    bmp = ALPHABETS["bmp"]  # surrogates are outside the alphabet, so the gap is bridged
    assert class_text(bmp, bmp) == r"[\x00-\uffff]"


SPECIALS = ".^$*+?{}[]\\|()-&~ \t\n\r\x00\x7f\u00a0\u200b\uff21\U0001F600é"


@pytest.mark.parametrize("char", list(SPECIALS))
def test_every_special_character_is_escaped_for_re(char):
    """Reference: Python's re reads the escaped text back as the character itself."""
    assert re.fullmatch(escape_point(ord(char)), char)
    alphabet = ALPHABETS["unicode"]
    for chars in (CharSet.single(char), CharSet.single(char) | CharSet.single("a"),
                  CharSet.range(ord(char), ord(char) + 2)):
        text = class_text(chars, alphabet)
        for point in range(max(ord(char) - 2, 0), ord(char) + 4):
            assert bool(re.fullmatch(text, chr(point))) == (point in chars), (text, point)


def test_algebra_laws():
    algebra = Algebra(PRINTABLE)
    a, b = algebra.sym(CharSet.single("a")), algebra.sym(CharSet.single("b"))
    assert algebra.alt(a, b).text == "[ab]"
    assert algebra.cat(a, algebra.rep(a, 0, None)).text == "a+"
    assert algebra.rep(algebra.rep(a, 2, 3), 0, None).text == "(?:a{2,3})*"  # a^1 is not in it
    assert algebra.rep(algebra.rep(a, 2, 3), 2, None).text == "a{4,}"
    assert algebra.rep(algebra.rep(a, 1, 2), 0, 1).text == "a{0,2}"
    assert algebra.alt(algebra.rep(a, 1, 3), algebra.rep(a, 4, 6)).text == "a{1,6}"
    assert algebra.alt(algebra.rep(a, 1, 2), algebra.rep(a, 4, 6)).text == "a{1,2}|a{4,6}"
    ab = algebra.cat(a, b)
    assert algebra.alt(ab, algebra.cat(a, a)).text == "a[ab]"
    assert algebra.rep(algebra.alt(algebra.rep(a, 0, None), b), 0, None).text == "[ab]*"
    assert algebra.alt(a, algebra.cat(a, b)).text == "ab?"
