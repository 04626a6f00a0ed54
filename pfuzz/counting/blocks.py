"""Fast enumeration of a rank range: prefixes walked in order, suffixes copied from tables.

Method: strings of one length in shortlex (code-point) order are ranked by the
recursive method (Nijenhuis & Wilf, 1978; see ``pfuzz.counting.tables``). A block
of consecutive ranks is made in two parts. The last ``k`` characters come from
*suffix tables*: for a state ``s``, every string of length ``k`` leading from ``s``
to acceptance, in order, as one array of code points, built bottom-up from the
tables of length ``k − 1`` (``k`` is the largest depth whose tables stay small).
The first ``length − k`` characters are a *prefix*: the prefix holding the first
rank is found by the unranking descent, and each next prefix by stepping to its
successor in the DFA's order (the next character, at the deepest position that
has one, whose target still has completions). Every prefix then owns a
contiguous run of ranks, filled by one array copy of its state's suffix table,
so the Python cost is paid once per prefix, not once per character.

Exactness: counts and ranks are Python integers, so any length and any number of
strings is handled exactly; the tables hold only code points.

Cost: O(length) Python steps per prefix plus array copies of the strings
themselves; the suffix tables hold at most ``SUFFIX_ROWS`` strings per state and
length. Peak memory is a block of ``BLOCK`` strings as code points.
"""

from __future__ import annotations

from typing import Iterator

from pfuzz.automata.dfa import DFA, transitions
from pfuzz.errors import ArgumentError

__all__ = ["BLOCK", "SUFFIX_ROWS", "RankBlocks"]

#: Strings made per call of ``_fill``; keeps a block's array to a few MB.
BLOCK = 1 << 16
#: Most strings one state's suffix table may hold (and so rows copied per prefix).
SUFFIX_ROWS = 1 << 12
#: Most strings all suffix tables of one depth may hold together.
SUFFIX_TOTAL = 1 << 17


class RankBlocks:
    """Strings of one DFA by rank range, one length at a time."""

    def __init__(self, dfa: DFA):
        import numpy as np

        self._np = np
        self.dfa = dfa
        rows = transitions(dfa, dfa.live_states())
        self._pieces = [sorted((lo, hi, t) for label, t in row for lo, hi in label.ranges)
                        for row in rows]
        self._levels: list[list[int]] = [[1 if s in dfa.accepting else 0
                                          for s in range(dfa.n_states)]]
        self._suffixes: dict[tuple[int, int], object] = {}

    # -- exact tables --------------------------------------------------------------------
    def count(self, length: int) -> int:
        """Accepted strings of exactly ``length`` characters (exact)."""
        return self._level(length)[0] if self._pieces else 0

    def _level(self, remaining: int) -> list[int]:
        while len(self._levels) <= remaining:
            prev = self._levels[-1]
            self._levels.append([sum((hi - lo + 1) * prev[t] for lo, hi, t in row)
                                 for row in self._pieces])
        return self._levels[remaining]

    def _suffix_depth(self, length: int) -> int:
        """The deepest ``k <= length`` whose suffix tables stay within the limits."""
        k = 0
        while k < length:
            level = self._level(k + 1)
            if max(level) > SUFFIX_ROWS or sum(level) > SUFFIX_TOTAL:
                break
            k += 1
        return k

    def _suffix(self, remaining: int, state: int):
        """All strings of ``remaining`` characters from ``state`` to acceptance, in order,
        as a (count, remaining) array of code points."""
        key = (remaining, state)
        if key not in self._suffixes:
            np = self._np
            if remaining == 0:
                table = np.zeros((self._levels[0][state], 0), dtype=np.uint32)
            else:
                parts = []
                for lo, hi, target in self._pieces[state]:
                    below = self._suffix(remaining - 1, target)
                    if len(below):
                        chars = np.arange(lo, hi + 1, dtype=np.uint32)
                        head = np.repeat(chars, len(below))[:, None]
                        parts.append(np.hstack([head, np.tile(below, (hi - lo + 1, 1))]))
                table = (np.vstack(parts) if parts
                         else np.zeros((0, remaining), dtype=np.uint32))
            self._suffixes[key] = table
        return self._suffixes[key]

    # -- blocks --------------------------------------------------------------------------
    def strings(self, length: int, start: int, stop: int) -> list[str]:
        """The accepted strings of ``length`` with ranks ``start <= rank < stop``, in order."""
        size = self.count(length)
        if not 0 <= start <= stop <= size:
            raise ArgumentError(f"need 0 <= start <= stop <= {size} for length {length}")
        out: list[str] = []
        for first in range(start, stop, BLOCK):
            out.extend(self._fill(length, first, min(stop, first + BLOCK)))
        return out

    def _fill(self, length: int, start: int, stop: int) -> list[str]:
        np = self._np
        k = self._suffix_depth(length)
        m = length - k
        points = np.empty((stop - start, length), dtype=np.uint32)
        at = 0
        for prefix, state, skip in self._prefixes(length, m, start):
            table = self._suffix(k, state)
            take = min(len(table) - skip, stop - start - at)
            points[at:at + take, :m] = prefix
            points[at:at + take, m:] = table[skip:skip + take]
            at += take
            if at == stop - start:
                break
        return _to_strings(points)

    def _prefixes(self, length: int, m: int, rank: int) -> Iterator[tuple[list[int], int, int]]:
        """Prefixes of ``m`` characters in order from the one holding ``rank``: each with its
        end state and how many of its completions to skip (only the first is partial)."""
        path = self._descend(length, m, rank)
        skip = rank
        for depth, (state, j, point) in enumerate(path):
            skip -= self._before(state, j, point, length - depth - 1)
        while True:
            yield [p for _, _, p in path], self._end(path), skip
            skip = 0
            if not self._advance(path, length):
                return

    def _before(self, state: int, j: int, point: int, remaining: int) -> int:
        """Strings of the remaining length that start before ``point`` (piece ``j``) at ``state``."""
        below = self._level(remaining)
        pieces = self._pieces[state]
        total = sum((hi - lo + 1) * below[t] for lo, hi, t in pieces[:j])
        return total + (point - pieces[j][0]) * below[pieces[j][2]]

    def _descend(self, length: int, m: int, rank: int) -> list[tuple[int, int, int]]:
        path, state = [], 0
        for depth in range(m):
            below = self._level(length - depth - 1)
            for j, (lo, hi, t) in enumerate(self._pieces[state]):
                weight = (hi - lo + 1) * below[t]
                if rank < weight:
                    offset, rank = divmod(rank, below[t])
                    path.append((state, j, lo + offset))
                    state = t
                    break
                rank -= weight
        return path

    def _end(self, path) -> int:
        if not path:
            return 0
        state, j, _ = path[-1]
        return self._pieces[state][j][2]

    def _advance(self, path: list, length: int) -> bool:
        """Step ``path`` to the next prefix with completions; False after the last."""
        depth = len(path) - 1
        while depth >= 0:
            state, j, point = path[depth]
            step = self._next(state, j, point, length - depth - 1)
            if step is not None:
                break
            depth -= 1
        else:
            return False
        path[depth] = (state, *step)
        for deeper in range(depth + 1, len(path)):
            state = self._pieces[path[deeper - 1][0]][path[deeper - 1][1]][2]
            path[deeper] = (state, *self._next(state, -1, 0, length - deeper - 1))
        return True

    def _next(self, state: int, j: int, point: int, remaining: int):
        """The next (piece, code point) after ``point`` in piece ``j`` whose target has completions."""
        pieces = self._pieces[state]
        if j >= 0 and point < pieces[j][1]:
            return j, point + 1
        below = self._level(remaining)
        for k in range(j + 1, len(pieces)):
            if below[pieces[k][2]]:
                return k, pieces[k][0]
        return None

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
    if length == 0:
        return [""] * len(points)
    texts = points.view(f"<U{length}").ravel().tolist()
    if (points[:, -1] == 0).any():
        for row in (points[:, -1] == 0).nonzero()[0].tolist():
            texts[row] = "".join(map(chr, points[row].tolist()))
    return texts
