"""The exact code-point sets of ``\\d``, ``\\w`` and ``\\s``, asked of ``re`` itself.

``re`` defines its categories through the interpreter's Unicode database
(``\\d`` is a decimal digit, ``\\w`` alphanumeric or ``_``, ``\\s`` white
space), and through a small fixed table under ``re.ASCII``. Rather than
re-deriving those rules, this module asks ``re``: it decodes one string that
holds every code point 0..0x10FFFF (surrogates included, via UTF-32 with
``surrogatepass``) and scans it with ``re.finditer(r"\\d+", ...)``; each
match is one maximal run, so the matches are the ranges of the set directly.

Cost: about 30 ms to build the string and 10 ms to scan it, so about 40 ms
per table (three categories, two modes), paid once per process on first use
only; the 4.4 MB string is not kept. Limits: the tables follow the running
interpreter's Unicode database, as ``re`` does.
"""

from __future__ import annotations

import array
import functools
import re
import sys

from pfuzz.base.charset import MAX_CODE_POINT, CharSet

#: The category escapes; the upper-case letter is the complement of the lower-case one.
CATEGORY_LETTERS = "dDsSwW"


@functools.cache
def category(letter: str, ascii_only: bool = False) -> CharSet:
    """The set ``\\<letter>`` matches (letter one of ``dDsSwW``), under re.ASCII if ``ascii_only``."""
    if letter not in CATEGORY_LETTERS:
        raise ValueError(f"not a category escape: \\{letter}")
    positive = _positive(letter.lower(), ascii_only)
    return positive if letter.islower() else positive.complement()


def every_code_point_text() -> str:
    """One string holding every code point from U+0000 to U+10FFFF, in order."""
    typecode = next(code for code in "IL" if array.array(code).itemsize == 4)
    points = array.array(typecode, range(MAX_CODE_POINT + 1))
    return points.tobytes().decode(f"utf-32-{sys.byteorder[0]}e", "surrogatepass")


@functools.cache
def _positive(letter: str, ascii_only: bool) -> CharSet:
    runs = re.finditer(f"\\{letter}+", every_code_point_text(), re.ASCII if ascii_only else 0)
    return CharSet(tuple((match.start(), match.end() - 1) for match in runs))
