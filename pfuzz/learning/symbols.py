"""Symbol classes: the alphabet cut into classes of characters the validator should treat alike.

A learner over the characters of printable ASCII would ask 95 questions per state and
transition; one over the whole of Unicode could not run at all. Like the learners of symbolic
automata (G. Argyros and L. D'Antoni, "The learnability of symbolic automata", CAV 2018), this
module learns over *classes* of characters, each stood for by one representative (its least
character), and refines the classes only where the validator is seen to tell two members of a
class apart.

- The first classes are those of the specification's minimal DFA (the characters every state
  of the specification treats alike), cut further so that each extra ("hostile") character is
  a class of its own (``initial``).
- Each class is *probed*: at the two edges of each of its ranges (for a class of many ranges,
  of the first and last ``EDGE_RANGES // 2`` of them) and at ``m`` interior characters drawn
  from the seeded random source (``probes``). The learner asks a probe in place of the
  representative and compares.
- Where a character ``x`` and the representative ``r`` of its class get different answers in
  some context ``u·_·v``, ``boundary`` finds, by bisection over the class's code points
  between ``r`` and ``x`` (log2 of the class size queries), two neighbouring members that get
  different answers; ``Symbols.split`` cuts the class there into two intervals (in the order of
  its code points), and both halves are probed afresh.

Honest limit: a class is only as uniform as its probes show. A validator that treats one
interior character of a class differently, where no probe, test or counterexample uses that
character, is not caught; the learned model's guarantee says so in its first condition.
"""

from __future__ import annotations

import bisect
from dataclasses import dataclass
from typing import Iterable

from pfuzz.base.charset import MAX_CODE_POINT, CharSet, partition
from pfuzz.base.randomness import RandomSource
from pfuzz.learning.oracle import Oracle, change_point

__all__ = ["EDGE_RANGES", "SymbolClass", "Symbols", "initial", "probes", "boundary"]

#: A class of more ranges has the edges of only its first and last EDGE_RANGES // 2 ranges probed.
EDGE_RANGES = 16


@dataclass(frozen=True)
class SymbolClass:
    """Characters taken as one symbol, and the characters asked in place of its representative."""

    chars: CharSet
    probes: tuple[str, ...]

    @property
    def representative(self) -> str:
        return chr(self.chars.min)

    def as_dict(self) -> dict:
        return {"chars": self.chars.describe(limit=EDGE_RANGES), "size": len(self.chars),
                "representative": self.representative, "probes": list(self.probes)}


def initial(classes: Iterable[CharSet], alphabet: CharSet, extra: CharSet) -> list[CharSet]:
    """The specification's classes within ``alphabet``, each character of ``extra`` alone."""
    return partition([*classes, *(CharSet.single(p) for p in extra & alphabet)], alphabet)


def probes(chars: CharSet, interior: int, random: RandomSource) -> tuple[str, ...]:
    """The range edges of ``chars`` and ``interior`` other members drawn from ``random``.

    A class with no more than ``interior`` members besides its edges is probed everywhere.
    """
    ranges = chars.ranges
    if len(ranges) > EDGE_RANGES:
        ranges = ranges[:EDGE_RANGES // 2] + ranges[-(EDGE_RANGES // 2):]
    edges = {point for lo, hi in ranges for point in (lo, hi)}
    if len(chars) - len(edges) <= interior:  # a small class: every member is probed
        return tuple(chr(p) for p in chars)
    return tuple(chr(p) for p in sorted(edges | _draw(chars, edges, interior, random)))


def _draw(chars: CharSet, edges: set[int], interior: int, random: RandomSource) -> set[int]:
    """``interior`` distinct members of ``chars`` outside ``edges``, uniformly (by rejection)."""
    chosen: set[int] = set()
    size = len(chars)
    while len(chosen) < interior:
        point = chars.nth(random.below(size))
        if point not in edges:
            chosen.add(point)
    return chosen


class Symbols:
    """The current classes, numbered in order of creation (a split appends the new half)."""

    def __init__(self, classes: Iterable[CharSet], interior: int, random: RandomSource):
        self.interior, self.random = interior, random
        self.classes: list[SymbolClass] = [self._make(c) for c in classes]
        self._reindex()

    def _make(self, chars: CharSet) -> SymbolClass:
        return SymbolClass(chars, probes(chars, self.interior, self.random))

    def _reindex(self) -> None:
        spans = sorted((lo, hi, s) for s, cls in enumerate(self.classes) for lo, hi in cls.chars.ranges)
        self._starts = [lo for lo, _, _ in spans]
        self._spans = spans

    def __len__(self) -> int:
        return len(self.classes)

    def symbol_of(self, char: str) -> int:
        """The symbol whose class holds ``char``, or -1 outside the alphabet."""
        point = ord(char)
        i = bisect.bisect_right(self._starts, point) - 1
        if i >= 0 and self._spans[i][1] >= point:
            return self._spans[i][2]
        return -1

    def representative(self, symbol: int) -> str:
        return self.classes[symbol].representative

    def abstract(self, text: str) -> str:
        """``text`` with each character replaced by its class's representative (outside kept)."""
        out = []
        for ch in text:
            symbol = self.symbol_of(ch)
            out.append(ch if symbol < 0 else self.classes[symbol].representative)
        return "".join(out)

    def ordered(self) -> list[int]:
        """The symbols in order of their least character (the order a DFA's classes take)."""
        return sorted(range(len(self.classes)), key=lambda s: self.classes[s].chars.min)

    def split(self, symbol: int, point: int) -> int:
        """Cut ``symbol``'s class before code point ``point``; the upper half becomes a new symbol."""
        chars = self.classes[symbol].chars
        low, high = chars & CharSet.range(0, point - 1), chars & CharSet.range(point, MAX_CODE_POINT)
        self.classes[symbol] = self._make(low)
        self.classes.append(self._make(high))
        self._reindex()
        return len(self.classes) - 1


def boundary(symbols: Symbols, char: str, before: str, after: str, oracle: Oracle) -> int:
    """The least code point of ``char``'s class that answers like ``char`` in ``before·_·after``
    while its predecessor in the class answers like the representative (bisection).

    Requires ``char`` and its class's representative to get different answers in that context.
    """
    chars = symbols.classes[symbols.symbol_of(char)].chars

    def value(index: int) -> bool:
        return oracle.accepts(before + chr(chars.nth(index)) + after)

    return chars.nth(change_point(0, chars.index(char), value) + 1)
