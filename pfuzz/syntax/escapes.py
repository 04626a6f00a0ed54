"""Backslash escapes of Python ``re`` syntax: what one escape means and where it ends.

One function, ``read_escape``, follows ``re``'s own rules (``re/_parser.py``,
``_escape`` and ``_class_escape``): ``\\xhh`` takes exactly two hex digits,
``\\uhhhh`` four, ``\\Uhhhhhhhh`` eight (at most U+10FFFF), ``\\N{NAME}`` a
Unicode name; ``\\0`` starts an octal escape of up to three digits; outside a
class ``\\1``..``\\99`` are group references unless three octal digits follow
the backslash, inside a class any octal digit starts an octal escape; an
escaped ASCII letter that is not a known escape is an error; any other escaped
character stands for itself. ``\\b`` is a word boundary outside a class and a
backspace inside one. Cost: O(length of the escape).
"""

from __future__ import annotations

import unicodedata
from dataclasses import dataclass

from pfuzz.syntax.categories import CATEGORY_LETTERS
from pfuzz.errors import PatternError

HEX_DIGITS = frozenset("0123456789abcdefABCDEF")
OCTAL_DIGITS = frozenset("01234567")
DECIMAL_DIGITS = frozenset("0123456789")
SIMPLE_ESCAPES = {"a": 0x07, "f": 0x0C, "n": 0x0A, "r": 0x0D, "t": 0x09, "v": 0x0B, "\\": 0x5C}
CATEGORY_ESCAPES = frozenset(CATEGORY_LETTERS)
ANCHOR_ESCAPES = frozenset("AZ")
BOUNDARY_ESCAPES = frozenset("bB")
HEX_WIDTHS = {"x": 2, "u": 4, "U": 8}
MAX_OCTAL = 0o377

#: Kinds of escape: a character, a category (\\d ...), an anchor (\\A \\Z),
#: a word boundary (\\b \\B), a group reference (\\1 ...).
ESCAPE_KINDS = ("char", "category", "anchor", "boundary", "backreference")


@dataclass(frozen=True)
class Escape:
    """The meaning of the escape ``pattern[start:end]``."""

    kind: str
    value: int | str
    start: int
    end: int


def read_escape(pattern: str, start: int, in_class: bool) -> Escape:
    """Decode the escape whose backslash is at ``pattern[start]``."""
    if start + 1 >= len(pattern):
        raise PatternError("bad escape (end of pattern)", pattern, start)
    letter = pattern[start + 1]
    after = start + 2
    if letter in CATEGORY_ESCAPES:
        return Escape("category", letter, start, after)
    if letter == "b" and in_class:
        return Escape("char", 0x08, start, after)
    if not in_class and letter in ANCHOR_ESCAPES | BOUNDARY_ESCAPES:
        kind = "anchor" if letter in ANCHOR_ESCAPES else "boundary"
        return Escape(kind, letter, start, after)
    if letter in SIMPLE_ESCAPES:
        return Escape("char", SIMPLE_ESCAPES[letter], start, after)
    if letter in HEX_WIDTHS:
        return _hex_escape(pattern, start, HEX_WIDTHS[letter])
    if letter == "N":
        return _named_escape(pattern, start)
    if letter in DECIMAL_DIGITS:
        return _digit_escape(pattern, start, in_class)
    if letter.isascii() and letter.isalpha():
        raise PatternError(f"bad escape \\{letter}", pattern, start)
    return Escape("char", ord(letter), start, after)


def _hex_escape(pattern: str, start: int, width: int) -> Escape:
    digits = _take(pattern, start + 2, width, HEX_DIGITS)
    end = start + 2 + len(digits)
    if len(digits) != width:
        raise PatternError(f"incomplete escape {pattern[start:end]}", pattern, start)
    value = int(digits, 16)
    if value > 0x10FFFF:
        raise PatternError(f"bad escape {pattern[start:end]}", pattern, start)
    return Escape("char", value, start, end)


def _named_escape(pattern: str, start: int) -> Escape:
    if not pattern.startswith("{", start + 2):
        raise PatternError("missing {", pattern, start + 2)
    close = pattern.find("}", start + 3)
    if close < 0 or close == start + 3:
        raise PatternError("missing character name", pattern, start + 3)
    name = pattern[start + 3 : close]
    try:
        value = ord(unicodedata.lookup(name))
    except (KeyError, TypeError):
        raise PatternError(f"undefined character name {name!r}", pattern, start) from None
    return Escape("char", value, start, close + 1)


def _digit_escape(pattern: str, start: int, in_class: bool) -> Escape:
    first = pattern[start + 1]
    if first == "0":
        digits = first + _take(pattern, start + 2, 2, OCTAL_DIGITS)
        return Escape("char", int(digits, 8), start, start + 1 + len(digits))
    if in_class:
        if first not in OCTAL_DIGITS:
            raise PatternError(f"bad escape \\{first}", pattern, start)
        digits = first + _take(pattern, start + 2, 2, OCTAL_DIGITS)
        return _octal(pattern, start, digits)
    digits = first + _take(pattern, start + 2, 1, DECIMAL_DIGITS)
    third = pattern[start + 3 : start + 4]
    if len(digits) == 2 and set(digits) <= OCTAL_DIGITS and third in OCTAL_DIGITS:
        return _octal(pattern, start, digits + third)
    return Escape("backreference", int(digits), start, start + 1 + len(digits))


def _octal(pattern: str, start: int, digits: str) -> Escape:
    value = int(digits, 8)
    if value > MAX_OCTAL:
        raise PatternError(f"octal escape value \\{digits} outside of range 0-0o377", pattern, start)
    return Escape("char", value, start, start + 1 + len(digits))


def _take(pattern: str, index: int, limit: int, allowed: frozenset[str]) -> str:
    """Up to ``limit`` characters from ``index`` on, while they are in ``allowed``."""
    end = index
    while end < len(pattern) and end - index < limit and pattern[end] in allowed:
        end += 1
    return pattern[index:end]
