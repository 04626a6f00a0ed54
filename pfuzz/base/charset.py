"""Sets of code points as sorted, disjoint, non-adjacent inclusive ranges.

A ``CharSet`` is an immutable interval set: ``[^x]`` over the whole of
Unicode is two ranges, not a million characters. Union, intersection and
difference are linear merges over the range lists. ``partition`` splits many
sets into the coarsest family of disjoint classes such that every input set is
a union of classes (a sweep over the sorted range boundaries, O(b log b) for b
boundaries); automata then label their transitions with class indexes.

The named alphabets (the alphabets pfuzz works over) live here too, so that
there is one place that says what "printable" means.
"""

from __future__ import annotations

import bisect
from dataclasses import dataclass
from types import MappingProxyType
from typing import Iterable, Iterator, Mapping

from pfuzz.base.escaping import escape_point

MAX_CODE_POINT = 0x10FFFF
SURROGATES = (0xD800, 0xDFFF)


@dataclass(frozen=True, slots=True)
class CharSet:
    """An immutable set of code points stored as sorted disjoint ranges."""

    ranges: tuple[tuple[int, int], ...] = ()

    # -- construction -------------------------------------------------------
    @staticmethod
    def of(ranges: Iterable[tuple[int, int]]) -> "CharSet":
        """Normalise any iterable of inclusive (lo, hi) pairs."""
        items = sorted((lo, hi) for lo, hi in ranges if lo <= hi)
        if not items:
            return CharSet()
        merged: list[tuple[int, int]] = []
        low, high = items[0]
        for lo, hi in items:
            if lo <= high + 1:
                if hi > high:
                    high = hi
            else:
                merged.append((low, high))
                low, high = lo, hi
        merged.append((low, high))
        return CharSet(tuple(merged))

    @staticmethod
    def from_chars(chars: Iterable[str | int]) -> "CharSet":
        points = [c if isinstance(c, int) else ord(c) for c in chars]
        return CharSet.of((p, p) for p in points)

    @staticmethod
    def single(char: str | int) -> "CharSet":
        point = char if isinstance(char, int) else ord(char)
        return CharSet(((point, point),))

    @staticmethod
    def range(lo: str | int, hi: str | int) -> "CharSet":
        lo = lo if isinstance(lo, int) else ord(lo)
        hi = hi if isinstance(hi, int) else ord(hi)
        return CharSet.of([(lo, hi)])

    # -- queries -------------------------------------------------------------
    def __bool__(self) -> bool:
        return bool(self.ranges)

    def __len__(self) -> int:
        return sum(hi - lo + 1 for lo, hi in self.ranges)

    def __contains__(self, char: str | int) -> bool:
        point = char if isinstance(char, int) else ord(char)
        i = bisect.bisect_right(self.ranges, (point, MAX_CODE_POINT + 1)) - 1
        return i >= 0 and self.ranges[i][0] <= point <= self.ranges[i][1]

    def __iter__(self) -> Iterator[int]:
        """Every code point, in increasing order (beware of large sets)."""
        for lo, hi in self.ranges:
            yield from range(lo, hi + 1)

    def chars(self) -> Iterator[str]:
        return (chr(p) for p in self)

    @property
    def min(self) -> int:
        return self.ranges[0][0]

    @property
    def max(self) -> int:
        return self.ranges[-1][1]

    def nth(self, index: int) -> int:
        """The code point at 0-based ``index`` in increasing order."""
        for lo, hi in self.ranges:
            width = hi - lo + 1
            if index < width:
                return lo + index
            index -= width
        raise IndexError("CharSet index out of range")

    def index(self, char: str | int) -> int:
        """Position of ``char`` in increasing order (inverse of ``nth``)."""
        point = char if isinstance(char, int) else ord(char)
        offset = 0
        for lo, hi in self.ranges:
            if lo <= point <= hi:
                return offset + point - lo
            offset += hi - lo + 1
        raise ValueError(f"{point:#x} is not in the set")

    # -- algebra -------------------------------------------------------------
    def __or__(self, other: "CharSet") -> "CharSet":
        return CharSet.union([self, other])

    @staticmethod
    def union(sets: "Iterable[CharSet]") -> "CharSet":
        """The union of the sets: the ranges of the others inserted into the largest
        (cheap when a small set joins a category of hundreds of ranges)."""
        sets = list(sets)
        if not sets:
            return CharSet()
        largest = max(sets, key=lambda s: len(s.ranges))
        ranges = list(largest.ranges)
        for other in sets:
            if other is not largest:
                for low, high in other.ranges:
                    _insert(ranges, low, high)
        return CharSet(tuple(ranges))

    def __and__(self, other: "CharSet") -> "CharSet":
        out: list[tuple[int, int]] = []
        a, b = self.ranges, other.ranges
        i = j = 0
        while i < len(a) and j < len(b):
            lo = max(a[i][0], b[j][0])
            hi = min(a[i][1], b[j][1])
            if lo <= hi:
                out.append((lo, hi))
            if a[i][1] < b[j][1]:
                i += 1
            else:
                j += 1
        return CharSet(tuple(out))

    def __sub__(self, other: "CharSet") -> "CharSet":
        return self & other.complement()

    def complement(self, within: "CharSet | None" = None) -> "CharSet":
        """Code points not in self, within ``within`` (default: all code points)."""
        out: list[tuple[int, int]] = []
        nxt = 0
        for lo, hi in self.ranges:
            if lo > nxt:
                out.append((nxt, lo - 1))
            nxt = hi + 1
        if nxt <= MAX_CODE_POINT:
            out.append((nxt, MAX_CODE_POINT))
        result = CharSet(tuple(out))
        return result & within if within is not None else result

    def isdisjoint(self, other: "CharSet") -> bool:
        return not (self & other)

    def issubset(self, other: "CharSet") -> bool:
        return not (self - other)

    # -- display -------------------------------------------------------------
    def describe(self, limit: int = 6) -> str:
        """A short readable label such as ``[0-9A-F]`` (used by draw and info)."""
        parts = []
        for lo, hi in self.ranges[:limit]:
            if lo == hi:
                parts.append(escape_point(lo, "class"))
            elif hi == lo + 1:
                parts.append(escape_point(lo, "class") + escape_point(hi, "class"))
            else:
                parts.append(f"{escape_point(lo, 'class')}-{escape_point(hi, 'class')}")
        more = "…" if len(self.ranges) > limit else ""
        body = "".join(parts) + more
        if len(self.ranges) == 1 and self.ranges[0][0] == self.ranges[0][1]:
            return body
        return f"[{body}]"

    def __repr__(self) -> str:
        return f"CharSet({self.describe(limit=8)})"


def _insert(ranges: list[tuple[int, int]], low: int, high: int) -> None:
    """Add [low, high] to sorted disjoint non-adjacent ``ranges``, merging what it touches."""
    first = bisect.bisect_left(ranges, low - 1, key=_high_end)
    stop = bisect.bisect_right(ranges, high + 1, key=_low_end)
    if first < stop:
        low, high = min(low, ranges[first][0]), max(high, ranges[stop - 1][1])
    ranges[first:stop] = [(low, high)]


def _low_end(span: tuple[int, int]) -> int:
    return span[0]


def _high_end(span: tuple[int, int]) -> int:
    return span[1]


EMPTY = CharSet()
ALL = CharSet(((0, MAX_CODE_POINT),))

#: The named alphabets. The default is printable ASCII (95 characters).
ALPHABETS: Mapping[str, CharSet] = MappingProxyType({
    "printable": CharSet(((0x20, 0x7E),)),
    "ascii": CharSet(((0x00, 0x7F),)),
    "latin1": CharSet(((0x00, 0xFF),)),
    "bmp": CharSet(((0x0000, SURROGATES[0] - 1), (SURROGATES[1] + 1, 0xFFFF))),
    "unicode": CharSet(((0x0000, SURROGATES[0] - 1), (SURROGATES[1] + 1, MAX_CODE_POINT))),
})
DEFAULT_ALPHABET = "printable"


def partition(sets: Iterable[CharSet], alphabet: CharSet) -> list[CharSet]:
    """Split ``alphabet`` into the coarsest disjoint classes refining every set.

    Each returned class lies inside the alphabet, the classes cover the whole
    alphabet, and every input set meets each class either fully or not at all.
    Classes are ordered by their smallest code point, so the output is
    deterministic.
    """
    sets = [s & alphabet for s in sets]
    points = {alphabet.min, alphabet.max + 1} if alphabet else set()
    for s in [alphabet, *sets]:
        for lo, hi in s.ranges:
            points.add(lo)
            points.add(hi + 1)
    bounds = sorted(points)
    by_signature: dict[tuple[int, ...], list[tuple[int, int]]] = {}
    cursors = [0] * len(sets)
    for k in range(len(bounds) - 1):
        lo, hi = bounds[k], bounds[k + 1] - 1
        if lo not in alphabet:
            continue
        signature = []
        for i, s in enumerate(sets):
            rs = s.ranges
            c = cursors[i]
            while c < len(rs) and rs[c][1] < lo:
                c += 1
            cursors[i] = c
            if c < len(rs) and rs[c][0] <= lo:
                signature.append(i)
        by_signature.setdefault(tuple(signature), []).append((lo, hi))
    classes = [CharSet.of(rs) for rs in by_signature.values()]
    classes.sort(key=lambda c: c.min)
    return classes
