"""Asking ``re`` about every code point: the scan behind the generated tables, and their check.

``re`` decides ``\\d``, ``\\w`` and ``\\s`` through the interpreter's Unicode database (and a
small fixed table under ``re.ASCII``), and case-insensitive matching through its own simple
case mappings plus a table of extra case pairs. Rather than re-deriving those rules from
``unicodedata``, the scan asks ``re`` itself: it decodes one string holding every code point
0..``sys.maxunicode`` (surrogates included, via UTF-32 with ``surrogatepass``) and reads the
maximal runs of ``re.finditer(r"\\d+", ...)`` as ranges; the case-sensitive code points are
those ``_sre`` (``re``'s engine) calls cased, with their simple and full case mappings.

``problems`` checks a table against the running interpreter's ``re`` for every code point,
by other calls than the scan's: ``\\d*`` must match the whole string of the table's members
and ``\\d`` nothing in the string of the other code points, and the same for ``\\D``; the
case-sensitive set must equal the engine's answer, and ``(?i)`` classes of the set and of its
complement must match exactly the set and exactly the rest. The last checks catch a member
missing whose case partner is present, not a whole case pair missing (the first check does).

Cost: linear in the number of code points (1,114,112): one 4.4 MB string, one pass of ``re``
per category, one Python-level pass over the code points for the case set. This module uses
the standard library only, so that another interpreter can load it by path to check a table.
"""

from __future__ import annotations

import array
import re
import sys
from typing import Mapping

import _sre

__all__ = ["CASE_SENSITIVE", "TABLE_NAMES", "case_sensitive_ranges", "category_ranges",
           "compute", "every_code_point_text", "flat", "pairs", "problems", "table_name"]

Ranges = tuple[tuple[int, int], ...]

#: The category letters and the table each one is stored in (``ASCII_`` prefixed under re.ASCII).
_CATEGORY_TABLES = {"d": "DIGIT", "w": "WORD", "s": "SPACE"}
CASE_SENSITIVE = "CASE_SENSITIVE"
#: Every range table a generated module holds.
TABLE_NAMES = tuple(prefix + name for prefix in ("", "ASCII_") for name in
                    _CATEGORY_TABLES.values()) + (CASE_SENSITIVE,)


def table_name(letter: str, ascii_only: bool) -> str:
    """The table that holds ``\\<letter>`` (one of ``dws``), under re.ASCII if ``ascii_only``."""
    return ("ASCII_" if ascii_only else "") + _CATEGORY_TABLES[letter]


def every_code_point_text() -> str:
    """One string holding every code point from U+0000 to ``sys.maxunicode``, in order."""
    typecode = next(code for code in "IL" if array.array(code).itemsize == 4)
    points = array.array(typecode, range(sys.maxunicode + 1))
    return points.tobytes().decode(f"utf-32-{sys.byteorder[0]}e", "surrogatepass")


def category_ranges(letter: str, ascii_only: bool, text: str | None = None) -> Ranges:
    """The ranges ``\\<letter>`` matches, as the maximal runs ``re`` finds in every code point."""
    runs = re.finditer(f"\\{letter}+", text or every_code_point_text(),
                       re.ASCII if ascii_only else 0)
    return tuple((match.start(), match.end() - 1) for match in runs)


def case_sensitive_ranges() -> Ranges:
    """Every code point whose IGNORECASE match may differ from its case-sensitive one."""
    cased = [point for point in range(sys.maxunicode + 1) if _sre.unicode_iscased(point)]
    points = set(cased)
    for point in cased:
        char = chr(point)
        points.add(_sre.unicode_tolower(point))
        points.add(_sre.ascii_tolower(point))
        for mapped in (char.lower(), char.upper(), char.casefold()):
            if len(mapped) == 1:
                points.add(ord(mapped))
    return _runs(sorted(points))


def compute(name: str, text: str | None = None) -> Ranges:
    """The table ``name`` (one of ``TABLE_NAMES``) as the running interpreter's ``re`` has it."""
    if name == CASE_SENSITIVE:
        return case_sensitive_ranges()
    return category_ranges(_letter(name), name.startswith("ASCII_"), text)


def flat(ranges: Ranges) -> tuple[int, ...]:
    """The ranges as one flat tuple of bounds (low, high, low, high, ...): a table's form."""
    return tuple(bound for pair in ranges for bound in pair)


def pairs(bounds: tuple[int, ...]) -> Ranges:
    """The ranges of a flat tuple of bounds (the inverse of ``flat``)."""
    return tuple(zip(bounds[::2], bounds[1::2]))


def problems(table: Mapping[str, object]) -> list[str]:
    """What in ``table`` (a generated module's namespace) disagrees with the running ``re``."""
    import unicodedata
    found = []
    key = (tuple(sys.version_info[:2]), unicodedata.unidata_version)
    if (tuple(table.get("PYTHON", ())), table.get("UNICODE")) != key:
        found.append(f"table is for {table.get('PYTHON')}/{table.get('UNICODE')}, "
                     f"interpreter is {key}")
    text = every_code_point_text()
    for name in TABLE_NAMES:
        bounds = table.get(name)
        shape = _shape_problem(bounds)
        ranges = () if shape else pairs(bounds)
        if shape:
            found.append(f"{name}: {shape}")
        elif name == CASE_SENSITIVE:
            found += [f"{name}: {p}" for p in _case_problems(ranges, text)]
        else:
            found += [f"{name}: {p}" for p in _category_problems(name, ranges, text)]
    return found


def _category_problems(name: str, ranges: Ranges, text: str) -> list[str]:
    letter = _letter(name)
    flags = re.ASCII if name.startswith("ASCII_") else 0
    inside, outside = _members(ranges, text), _members(_complement(ranges), text)
    found = []
    for escape, members, others in ((letter, inside, outside),
                                    (letter.upper(), outside, inside)):
        if not re.fullmatch(f"\\{escape}*", members, flags):
            found.append(f"\\{escape} does not match every member")
        stray = re.search(f"\\{escape}", others, flags)
        if stray:
            found.append(f"\\{escape} also matches U+{ord(stray.group()):04X}")
    return found


def _case_problems(ranges: Ranges, text: str) -> list[str]:
    if ranges != case_sensitive_ranges():
        return ["differs from the case-sensitive code points _sre reports"]
    inside, outside = _members(ranges, text), _members(_complement(ranges), text)
    found = []
    for pattern, members, others in ((_class(ranges, ""), inside, outside),
                                     (_class(ranges, "^"), outside, inside)):
        if not re.fullmatch(f"(?i){pattern}*", members):
            found.append(f"(?i){pattern[:40]}... does not match every member")
        stray = re.search(f"(?i){pattern}", others)
        if stray:
            found.append(f"(?i) class also matches U+{ord(stray.group()):04X}")
    return found


def _letter(name: str) -> str:
    return next(k for k, v in _CATEGORY_TABLES.items() if v == name.removeprefix("ASCII_"))


def _shape_problem(bounds: object) -> str:
    if not isinstance(bounds, tuple) or len(bounds) % 2 or not all(
            type(bound) is int for bound in bounds):
        return "missing or not a flat tuple of (low, high) bounds"
    if any(not 0 <= bound <= sys.maxunicode for bound in bounds):
        return "a bound outside the code points"
    ranges = pairs(bounds)
    if any(low > high for low, high in ranges) or any(
            ranges[i][1] + 1 >= ranges[i + 1][0] for i in range(len(ranges) - 1)):
        return "ranges not sorted, disjoint and separated"
    return ""


def _runs(points: list[int]) -> Ranges:
    runs: list[tuple[int, int]] = []
    for point in points:
        if runs and runs[-1][1] == point - 1:
            runs[-1] = (runs[-1][0], point)
        else:
            runs.append((point, point))
    return tuple(runs)


def _complement(ranges: Ranges) -> Ranges:
    out, start = [], 0
    for low, high in ranges:
        if low > start:
            out.append((start, low - 1))
        start = high + 1
    if start <= sys.maxunicode:
        out.append((start, sys.maxunicode))
    return tuple(out)


def _members(ranges: Ranges, text: str) -> str:
    return "".join(text[low:high + 1] for low, high in ranges)


def _class(ranges: Ranges, negate: str) -> str:
    return "[" + negate + "".join(f"\\U{low:08x}-\\U{high:08x}" for low, high in ranges) + "]"
