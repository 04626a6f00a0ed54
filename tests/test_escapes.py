"""Backslash escapes: every decoded character agrees with what re matches for the same escape."""

from __future__ import annotations

import re
import string

import pytest

from pfuzz.errors import PatternError
from pfuzz.syntax.escapes import read_escape


def decoded(escape: str, in_class: bool = False) -> int:
    result = read_escape(escape, 0, in_class)
    assert (result.kind, result.start, result.end) == ("char", 0, len(escape))
    return result.value


def test_hex_escapes_of_every_byte():
    for value in range(256):
        for escape in (f"\\x{value:02x}", f"\\x{value:02X}", f"\\u{value:04x}", f"\\U{value:08x}"):
            assert decoded(escape) == value
            assert re.fullmatch(escape, chr(value))  # reference: Python's re


def test_octal_escapes_up_to_0o377_outside_and_inside_classes():
    for value in range(0o400):
        digits = f"{value:o}"
        outside = "\\0" + digits if len(digits) < 3 else "\\" + digits
        assert decoded(outside) == value
        assert re.fullmatch(outside, chr(value))  # reference: Python's re
        assert decoded("\\" + digits, in_class=True) == value
        assert re.fullmatch(f"[\\{digits}]", chr(value))  # reference: Python's re


def test_simple_named_and_punctuation_escapes():
    for escape, value in [(r"\a", 7), (r"\f", 12), (r"\n", 10), (r"\r", 13), (r"\t", 9), (r"\v", 11),
                          ("\\\\", 92), (r"\0", 0), (r"\N{EM DASH}", 0x2014), (r"\U0001F600", 0x1F600)]:
        assert decoded(escape) == value
        assert re.fullmatch(escape, chr(value))  # reference: Python's re
    for char in string.punctuation + " é\n":
        assert decoded("\\" + char) == ord(char)


def test_letters_are_known_escapes_or_errors_exactly_as_in_re():
    for letter in string.ascii_letters:
        for in_class in (False, True):
            pattern = f"[\\{letter}]" if in_class else "\\" + letter
            try:
                re.compile(pattern)  # reference: Python's re decides what is a bad escape
                re_accepts = True
            except re.error:
                re_accepts = False
            try:
                read_escape("\\" + letter + "{X}0000000", 0, in_class)
                ours = True
            except PatternError:
                ours = False
            if letter in "xuUN":
                continue  # need digits or a name; covered above
            assert ours == re_accepts, (letter, in_class)


def test_kinds_other_than_characters():
    assert read_escape(r"\d", 0, False).kind == "category"
    assert read_escape(r"\A", 0, False).kind == "anchor"
    assert read_escape(r"\b", 0, False).kind == "boundary"
    assert read_escape(r"\b", 0, True).value == 8
    reference = read_escape(r"\12", 0, False)
    assert (reference.kind, reference.value, reference.end) == ("backreference", 12, 3)
    assert read_escape(r"\123", 0, False).value == 0o123
    assert read_escape(r"\18", 0, False).kind == "backreference"


@pytest.mark.parametrize("escape, position", [(r"\x4", 0), (r"\u12g", 0), (r"\U00110000", 0), (r"\N", 2),
                                              (r"\N{}", 3), (r"\N{NO SUCH NAME}", 0), ("\\", 0), (r"\777", 0)])
def test_malformed_escapes(escape, position):
    with pytest.raises(PatternError) as caught:
        read_escape(escape, 0, False)
    assert caught.value.position == position
