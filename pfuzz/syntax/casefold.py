"""What a case-insensitive atom matches, asked of ``re`` itself for the cased code points.

Under IGNORECASE ``re`` does not compare ``str.lower()``: it lower-cases with
its own simple mapping (``_sre.unicode_tolower``, or ``_sre.ascii_tolower``
under re.ASCII), adds extra case pairs (the Kelvin sign U+212A, the long s
U+017F, ...), and tests a class that mixes categories and literals on the
lower-cased character while a lone category ignores case. Re-deriving those
rules would be fragile, so this module splits the characters in two:

* characters that no case mapping touches (not cased in ``_sre``'s sense and
  not the simple lower or upper case of a cased character) match exactly as
  without IGNORECASE: ``node.chars`` already says whether they match;
* the others, about 3,000 code points in all of Unicode (52 in printable
  ASCII), are asked of ``re`` directly: one ``re.finditer(node.source, ...)``
  over a string of those characters that lie in the alphabet. An atom always
  matches exactly one character, so the matches are the members.

Cost: about 30 ms once per process to find the cased code points; then, per
(atom, flags, alphabet), ``re``'s compile of the atom (about 0.3 ms) and one
C-level scan of at most ~3,000 characters, cached.
The split is checked against ``re.fullmatch`` over all code points in
tests/test_casefold.py.
"""

from __future__ import annotations

import functools
import re

import _sre

from pfuzz.base.charset import MAX_CODE_POINT, CharSet
from pfuzz.syntax.tree import Chars


def resolve(node: Chars, alphabet: CharSet) -> CharSet:
    """The exact set of characters within ``alphabet`` that the atom matches under its flags."""
    if not node.ignore_case:
        return node.chars & alphabet
    asked = case_sensitive_points() & alphabet
    untouched = (node.chars & alphabet) - asked
    return untouched | _matched(node.source, node.flags, asked)


@functools.cache
def case_sensitive_points() -> CharSet:
    """Every code point whose IGNORECASE match may differ from its case-sensitive one."""
    cased = [point for point in range(MAX_CODE_POINT + 1) if _sre.unicode_iscased(point)]
    points = set(cased)
    for point in cased:
        char = chr(point)
        points.add(_sre.unicode_tolower(point))
        points.add(_sre.ascii_tolower(point))
        for mapped in (char.lower(), char.upper(), char.casefold()):
            if len(mapped) == 1:
                points.add(ord(mapped))
    return CharSet.from_chars(points)


@functools.lru_cache(maxsize=4096)
def _matched(source: str, flags: int, candidates: CharSet) -> CharSet:
    found = [match.group() for match in re.finditer(source, _text(candidates), flags)]
    if any(len(char) != 1 for char in found):
        raise ValueError(f"atom {source!r} does not match single characters")
    return CharSet.from_chars(found)


@functools.lru_cache(maxsize=16)
def _text(candidates: CharSet) -> str:
    return "".join(candidates.chars())
