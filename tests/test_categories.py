"""The \\d \\w \\s tables equal what re matches, code point by code point, over all of Unicode.

``category`` reads the shipped table of the running interpreter where there is one
(pfuzz.syntax.unicode_tables; tests/external/test_unicode_tables.py checks every shipped table
on every interpreter at hand) and the scan otherwise; these tests check what it gives.
"""

from __future__ import annotations

import itertools
import re

import pytest

from pfuzz.base.charset import ALL, CharSet, MAX_CODE_POINT
from pfuzz.syntax import unicode_tables
from pfuzz.syntax.categories import category, every_code_point_text
from pfuzz.syntax.unicode_tables.scan import pairs, table_name


@pytest.mark.parametrize("letter", "dsw")
def test_unicode_tables_match_re_on_every_code_point(letter):
    # Reference: Python's re, asked one code point at a time with fullmatch.
    matcher = re.compile("\\" + letter).fullmatch
    expected = CharSet.from_chars(p for p in range(MAX_CODE_POINT + 1) if matcher(chr(p)))
    assert category(letter) == expected
    assert category(letter.upper()) == expected.complement()


@pytest.mark.parametrize("letter", "dsw")
def test_ascii_tables_match_re_on_every_code_point(letter):
    # Reference: Python's re under re.ASCII; findall over every code point in order lists
    # exactly the characters the category matches, in order.
    found = re.findall("\\" + letter, every_code_point_text(), re.ASCII)
    assert "".join(found) == "".join(category(letter, ascii_only=True).chars())


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


def test_the_scan_gives_the_same_sets_as_the_table(monkeypatch):
    # Reference: Python's re, asked by the scan (re.finditer over every code point); only
    # where a table is shipped is there a second source to compare.
    table = unicode_tables.current()
    if table is None:
        pytest.skip("no table shipped for this interpreter: the scan is the only source")
    monkeypatch.setattr(unicode_tables, "current", lambda: None)
    for letter, ascii_only in itertools.product("dsw", (False, True)):
        name = table_name(letter, ascii_only)
        assert unicode_tables.ranges(name) == pairs(getattr(table, name))


def test_bad_letter():
    with pytest.raises(ValueError):
        category("q")
