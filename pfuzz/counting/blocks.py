"""Fast enumeration of a rank range: many strings of one length unranked at once with arrays.

Method: the rank of a string among the accepted strings of its length, in
shortlex (code-point) order, is the recursive method's ranking (Nijenhuis &
Wilf, 1978; see ``pfuzz.counting.tables``). For a block of consecutive ranks
``start .. start+n`` this module runs the unranking descent for the whole block
at once: at depth ``d`` every string of the block is at some state ``s`` with a
remaining rank ``i``; the outgoing pieces of ``s`` (maximal code-point ranges
with one target, sorted) carry cumulative weights ``W[s, j]`` (strings that
start with a character before piece ``j``), so the piece is the last non-empty
one with ``W[s, j] <= i``, and ``divmod(i - W[s, j], T[r][target])`` gives the
character inside the piece and the rank that remains. Every step is a numpy
operation over the block, so the Python cost is paid once per depth per block,
not once per character.

Exactness: ranks and weights are int64. A length whose weights do not all fit
below 2**62 is enumerated by the exact big-integer walk of
``pfuzz.counting.tables.Counter.enumerate`` instead, so the output is the same
either way, only slower.

Cost: O(length × pieces) array work per string, in blocks of ``BLOCK`` strings
(peak memory about ``BLOCK × (length + pieces) × 8`` bytes). The weights of one
remaining length take states × pieces integers and are cached per length.
"""

from __future__ import annotations

from typing import Iterator

from pfuzz.automata.dfa import DFA, transitions
from pfuzz.errors import ArgumentError

__all__ = ["BLOCK", "RankBlocks"]

#: Strings unranked together; keeps a block's arrays to a few MB.
BLOCK = 1 << 15
#: Weights must stay below this to be exact in int64 (headroom for one addition).
_INT_LIMIT = 1 << 62


class RankBlocks:
    """Strings of one DFA by rank range, one length at a time, with numpy arrays."""

    def __init__(self, dfa: DFA):
        import numpy as np

        self._np = np
        self.dfa = dfa
        live = dfa.live_states()
        rows = transitions(dfa, live)
        pieces = [sorted((lo, hi, t) for label, t in row for lo, hi in label.ranges) for row in rows]
        width = max((len(p) for p in pieces), default=0) or 1
        n = dfa.n_states
        self.lo = np.zeros((n, width), dtype=np.int64)
        self.size = np.zeros((n, width), dtype=np.int64)
        self.target = np.zeros((n, width), dtype=np.int64)
        for s, row in enumerate(pieces):
            for j, (lo, hi, t) in enumerate(row):
                self.lo[s, j], self.size[s, j], self.target[s, j] = lo, hi - lo + 1, t
        self._pieces = pieces
        self._levels: list[list[int]] = [[1 if s in dfa.accepting else 0 for s in range(n)]]
        self._weights: dict[int, tuple | None] = {}

    # -- exact tables --------------------------------------------------------------------
    def count(self, length: int) -> int:
        """Accepted strings of exactly ``length`` characters (exact)."""
        return self._level(length)[0] if self.dfa.n_states else 0

    def _level(self, remaining: int) -> list[int]:
        while len(self._levels) <= remaining:
            prev = self._levels[-1]
            self._levels.append([sum((hi - lo + 1) * prev[t] for lo, hi, t in row)
                                 for row in self._pieces])
        return self._levels[remaining]

    def _weights_for(self, remaining: int):
        """(cumulative weight before each piece, non-empty mask, counts) at ``remaining``, or None."""
        if remaining not in self._weights:
            np = self._np
            below = self._level(remaining)
            if max(below, default=0) >= _INT_LIMIT:
                self._weights[remaining] = None
                return None
            counts = np.array(below, dtype=np.int64)
            sub = self.size * counts[self.target]
            sub[self.size == 0] = 0
            before = np.cumsum(sub, axis=1) - sub
            self._weights[remaining] = (before, sub > 0, counts)
        return self._weights[remaining]

    # -- blocks --------------------------------------------------------------------------
    def strings(self, length: int, start: int, stop: int) -> list[str]:
        """The accepted strings of ``length`` with ranks ``start <= rank < stop``, in order."""
        size = self.count(length)
        if not 0 <= start <= stop <= size:
            raise ArgumentError(f"need 0 <= start <= stop <= {size} for length {length}")
        if start == stop:
            return []
        if length == 0:
            return [""]
        tables = [self._weights_for(length - d - 1) for d in range(length)]
        if any(t is None for t in tables) or size >= _INT_LIMIT:
            return self._exact(length, start, stop)
        out: list[str] = []
        for first in range(start, stop, BLOCK):
            out.extend(self._block(length, first, min(stop, first + BLOCK), tables))
        return out

    def _block(self, length: int, start: int, stop: int, tables) -> list[str]:
        np = self._np
        index = np.arange(start, stop, dtype=np.int64)
        state = np.zeros(len(index), dtype=np.int64)
        points = np.empty((len(index), length), dtype=np.uint32)
        columns = np.arange(self.lo.shape[1], dtype=np.int64)
        for depth in range(length):
            before, nonempty, counts = tables[depth]
            fits = (before[state] <= index[:, None]) & nonempty[state]
            piece = np.max(np.where(fits, columns, -1), axis=1)
            target = self.target[state, piece]
            offset, index = np.divmod(index - before[state, piece], counts[target])
            points[:, depth] = self.lo[state, piece] + offset
            state = target
        return _to_strings(points)

    def _exact(self, length: int, start: int, stop: int) -> list[str]:
        from pfuzz.counting.tables import Counter

        counter = Counter(self.dfa)
        below = sum(counter.count(n) for n in range(length))
        return list(counter.enumerate(length, length, below + start, below + stop))

    def walk(self, min_length: int, max_length: int, start: int = 0,
             stop: int | None = None) -> Iterator[list[str]]:
        """Blocks of strings in shortlex order over the length window, ranks ``start..stop``
        counted across the whole window (as ``Counter.enumerate`` counts them)."""
        position = 0
        for length in range(min_length, max_length + 1):
            size = self.count(length)
            if stop is not None and position >= stop:
                return
            if size and position + size > start:
                first = max(start - position, 0)
                last = size if stop is None else min(size, stop - position)
                for low in range(first, last, BLOCK):
                    yield self.strings(length, low, min(last, low + BLOCK))
            position += size


def _to_strings(points) -> list[str]:
    """Rows of code points to ``str``; numpy's fixed-width strings drop trailing NULs, so
    rows that end in U+0000 are rebuilt one by one."""
    length = points.shape[1]
    texts = points.view(f"<U{length}").ravel().tolist()
    if length and (points[:, -1] == 0).any():
        for row in (points[:, -1] == 0).nonzero()[0].tolist():
            texts[row] = "".join(map(chr, points[row].tolist()))
    return texts
