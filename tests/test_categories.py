"""The \\d \\w \\s tables equal what re matches, code point by code point, over all of Unicode."""

from __future__ import annotations

import re

import pytest

from pfuzz.syntax.categories import category, every_code_point_text
from pfuzz.base.charset import ALL, CharSet, MAX_CODE_POINT


@pytest.mark.parametrize("letter", "dsw")
def test_unicode_tables_match_re_on_every_code_point(letter):
    # Reference: Python's re, asked one code point at a time with fullmatch.
    matcher = re.compile("\\" + letter).fullmatch
    expected = CharSet.from_chars(p for p in range(MAX_CODE_POINT + 1) if matcher(chr(p)))
    assert category(letter) == expected
    assert category(letter.upper()) == expected.complement()


def test_ascii_tables_are_res_documented_sets():
    # Reference: the re module documentation for re.ASCII: [0-9], [a-zA-Z0-9_], [ \t\n\r\f\v].
    assert category("d", ascii_only=True) == CharSet.range("0", "9")
    assert category("w", ascii_only=True) == CharSet.from_chars("_0123456789abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ")
    assert category("s", ascii_only=True) == CharSet.from_chars(" \t\n\r\f\v")
    assert category("D", ascii_only=True) == ALL - CharSet.range("0", "9")


def test_every_code_point_text_is_in_order_and_complete():
    text = every_code_point_text()
    assert len(text) == MAX_CODE_POINT + 1
    assert all(ord(text[p]) == p for p in (0, 0x7F, 0xD800, 0xDFFF, 0xFFFF, 0x10000, MAX_CODE_POINT))


def test_bad_letter():
    with pytest.raises(ValueError):
        category("q")
