"""The exact code-point sets of ``\\d``, ``\\w`` and ``\\s``, as ``re`` itself has them.

``re`` defines its categories through the interpreter's Unicode database
(``\\d`` is a decimal digit, ``\\w`` alphanumeric or ``_``, ``\\s`` white
space), and through a small fixed table under ``re.ASCII``. Rather than
re-deriving those rules, pfuzz asks ``re``: ``pfuzz.syntax.unicode_tables``
ships, per Python minor version and Unicode version, the ranges a scan of every
code point with ``re.finditer(r"\\d+", ...)`` found, checked against ``re`` for
every code point by the generator and by tests/external/test_unicode_tables.py.
On an interpreter with no shipped table the same scan runs here instead.

Cost: with a shipped table, one import of its data module per process and a
``CharSet`` wrapped around a tuple of at most a few hundred ranges; without
one, a pass of ``re`` over a 4.4 MB string of all 1,114,112 code points per
table (three categories, two modes), once per process, the string not kept.
Limits: the tables follow the running interpreter's Unicode database, as ``re`` does.
"""

from __future__ import annotations

import functools

from pfuzz.base.charset import CharSet
from pfuzz.syntax.unicode_tables import ranges
from pfuzz.syntax.unicode_tables.scan import every_code_point_text, table_name

__all__ = ["CATEGORY_LETTERS", "category", "every_code_point_text"]

#: The category escapes; the upper-case letter is the complement of the lower-case one.
CATEGORY_LETTERS = "dDsSwW"


@functools.cache
def category(letter: str, ascii_only: bool = False) -> CharSet:
    """The set ``\\<letter>`` matches (letter one of ``dDsSwW``), under re.ASCII if ``ascii_only``."""
    if letter not in CATEGORY_LETTERS:
        raise ValueError(f"not a category escape: \\{letter}")
    positive = _positive(letter.lower(), ascii_only)
    return positive if letter.islower() else positive.complement()


@functools.cache
def _positive(letter: str, ascii_only: bool) -> CharSet:
    return CharSet(ranges(table_name(letter, ascii_only)))
