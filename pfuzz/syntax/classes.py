"""Character classes ``[...]`` of Python ``re`` syntax, read into one CharSet.

``read_class`` follows ``re/_parser.py`` (Python 3.11): a ``]`` right after
``[`` or ``[^`` is a literal, so is a ``-`` first or last; a range needs a
character at both ends (a category such as ``\\d`` at either end is an error)
and low <= high; inside a class ``\\b`` is a backspace and ``\\1`` an octal
escape (``pfuzz.syntax.escapes``). White space counts even in verbose mode.

The members are combined by inserting each range of the smaller sets into the
largest one (two binary searches and one slice assignment per range), so
``[\\w!@#]`` costs microseconds although ``\\w`` has about 700 ranges: O(k·n)
element moves done by C list operations for k inserted ranges into n.
Negation complements over all code points 0..0x10FFFF.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.syntax.categories import category
from pfuzz.base.charset import CharSet
from pfuzz.errors import PatternError
from pfuzz.syntax.escapes import Escape, read_escape


@dataclass(frozen=True)
class CharClass:
    """The class ``pattern[start:end]``; ``chars`` already accounts for ``negated``."""

    chars: CharSet
    negated: bool
    end: int


def read_class(pattern: str, start: int, ascii_only: bool) -> CharClass:
    """Read the class whose ``[`` is at ``pattern[start]``."""
    index = start + 1
    negated = pattern.startswith("^", index)
    index += negated
    members: list[CharSet] = []
    while not (pattern.startswith("]", index) and members):
        if index >= len(pattern):
            raise PatternError("unterminated character set", pattern, start)
        member, index = _member(pattern, index, start, ascii_only)
        members.append(member)
    chars = CharSet.union(members)
    return CharClass(chars.complement() if negated else chars, negated, index + 1)


def escape_chars(escape: Escape, ascii_only: bool) -> CharSet:
    """The characters a character or category escape stands for."""
    if escape.kind == "category":
        return category(escape.value, ascii_only)
    return CharSet.single(escape.value)


def _member(pattern: str, index: int, start: int, ascii_only: bool) -> tuple[CharSet, int]:
    """One member (a character, a category or a range) and the index after it; ``[`` is at ``start``."""
    low_start = index
    low, low_code, index = _atom(pattern, index, ascii_only)
    if not pattern.startswith("-", index) or pattern.startswith("]", index + 1):
        return low, index
    if index + 1 >= len(pattern):
        raise PatternError("unterminated character set", pattern, start)
    _, high_code, index = _atom(pattern, index + 1, ascii_only)
    if low_code is None or high_code is None or high_code < low_code:
        raise PatternError(f"bad character range {pattern[low_start:index]}", pattern, low_start)
    return CharSet.range(low_code, high_code), index


def _atom(pattern: str, index: int, ascii_only: bool) -> tuple[CharSet, int | None, int]:
    """A character (its set and code point) or a category (its set, no code point), and the index after."""
    if pattern[index] != "\\":
        return CharSet.single(pattern[index]), ord(pattern[index]), index + 1
    escape = read_escape(pattern, index, in_class=True)
    code = escape.value if escape.kind == "char" else None
    return escape_chars(escape, ascii_only), code, escape.end
