"""Exact counts per length, shortlex ranking and enumeration, over a DFA.

Method: the recursive method of Nijenhuis & Wilf (*Combinatorial
Algorithms*, 1978), in the form Flajolet, Zimmermann & Van Cutsem give it
for decomposable structures ("A calculus for the random generation of
labelled combinatorial structures", TCS 132, 1994). For every state ``s`` and
remaining length ``r`` the table holds ``T[r][s]``, the number of strings of
length ``r`` that lead from ``s`` to acceptance:

    T[0][s] = 1 if s accepts else 0
    T[r][s] = sum over live targets t of  width(s, t) * T[r-1][t]

where ``width(s, t)`` is the number of characters leading from ``s`` to ``t``.
Counts are Python integers, so they never overflow (``[0-9]{40}`` has 10**40
strings).

Ranking works in shortlex order: by length, then character by character by
code point. A symbol class may be made of several ranges interleaved with
other classes (``[a-c x-z]`` next to ``[d-w]``), so each state keeps its
outgoing *pieces*, the maximal code-point ranges with one target, sorted by
code point, together with how many characters of each target lie before
each piece. The strings below a piece then number
``sum_t before[piece][t] * T[r-1][t]``, found by binary search over the
pieces; rank and unrank cost O(length × d × log pieces) big-integer steps
for out-degree d.

Cost and limits: the tables up to length L hold states × L integers of up
to L·log2(|alphabet|) bits, O(states × L²) bits in all (``python -m
pfuzz.benchmarks sampling`` measures a 100-state DFA at L = 1000). Long lengths are what the
floating-point tables of ``pfuzz.counting.bulk`` are for. Uniform sampling by length
lives in ``pfuzz.counting.sampler``; ``Counter.sample`` forwards there, and that
module's docstring states the reproducibility guarantee (same seed, pattern,
alphabet and versions give the same strings; over ASCII alphabets
independently of the Python version).
"""

from __future__ import annotations

import bisect
from itertools import islice
from typing import Iterator

from pfuzz.automata import algebra
from pfuzz.automata.dfa import DFA, transitions
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.errors import ArgumentError, NotInLanguageError, RankOutOfRangeError



class Counter:
    """Exact counting, ranking, enumeration and sampling for one DFA."""

    def __init__(self, dfa: DFA):
        self.dfa = dfa
        live = dfa.live_states()
        self.empty = 0 not in live
        self.min_length = algebra.min_length(dfa)
        self.max_length = algebra.max_length(dfa)
        self.finite = algebra.is_finite(dfa)
        rows = transitions(dfa, live)
        self.groups = [[(t, label.ranges) for label, t in row] for row in rows]
        self._pieces = [_pieces(groups) for groups in self.groups]
        self._edges = [tuple((t, len(label)) for label, t in row) for row in rows]
        self._levels: list[list[int]] = [[1 if s in dfa.accepting else 0
                                          for s in range(dfa.n_states)]]
        self._bulk = None

    # -- tables ----------------------------------------------------------------------
    def _table(self, length: int) -> list[int]:
        """``T[length]``: per state, the strings of that length leading to acceptance."""
        levels, edges = self._levels, self._edges
        while len(levels) <= length:
            prev = levels[-1]
            levels.append([sum(w * prev[t] for t, w in out) for out in edges])
        return levels[length]

    def count(self, length: int) -> int:
        """The number of accepted strings of exactly ``length`` characters."""
        if length < 0:
            raise ArgumentError(f"length must be >= 0, got {length}")
        if self.empty or (self.finite and length > self.max_length):
            return 0
        return self._table(length)[0]

    def default_max_length(self, min_length: int | None = None) -> int:
        """The longest length considered when none is given (documented bound)."""
        low = min_length or 0
        if self.empty:
            return low
        if self.finite:
            return self.max_length
        return max(low, self.min_length) + UNBOUNDED_SPAN

    def bounds(self, min_length: int | None, max_length: int | None) -> tuple[int, int]:
        """The length range asked for, with the documented defaults filled in."""
        low = min_length if min_length is not None else (self.min_length or 0)
        high = max_length if max_length is not None else self.default_max_length(low)
        if low < 0 or high < 0:
            raise ArgumentError("lengths must be >= 0")
        return low, high

    def counts(self, min_length: int = 0, max_length: int | None = None) -> dict[int, int]:
        """Length → count for every length in the range (zeros included)."""
        low, high = self.bounds(min_length, max_length)
        return {n: self.count(n) for n in range(low, high + 1)}

    def total(self) -> int | None:
        """The number of strings in the language, or None when it is infinite."""
        if self.empty:
            return 0
        if not self.finite:
            return None
        return sum(self.count(n) for n in range(self.max_length + 1))

    def lengths(self, max_length: int | None = None, min_length: int | None = None) -> list[int]:
        """The lengths up to ``max_length`` (default: as ``bounds``) that have strings."""
        low, high = self.bounds(min_length, max_length)
        return [n for n in range(low, high + 1) if self.count(n)]

    # -- ranking ---------------------------------------------------------------------
    def rank(self, text: str) -> int:
        """Position of ``text`` among the accepted strings of its length, in code-point order."""
        if self.count(len(text)) == 0:
            raise NotInLanguageError(f"{text!r} is not in the language (no strings of its length)")
        state, index = 0, 0
        for depth, char in enumerate(text):
            below = self._table(len(text) - depth - 1)
            pieces = self._pieces[state]
            point = ord(char)
            j = bisect.bisect_right(pieces.los, point) - 1
            if j < 0 or point > pieces.his[j] or not below[pieces.targets[j]]:
                raise NotInLanguageError(f"{text!r} is not in the language")
            index += pieces.before_weight(j, below) + (point - pieces.los[j]) * below[pieces.targets[j]]
            state = pieces.targets[j]
        if state not in self.dfa.accepting:
            raise NotInLanguageError(f"{text!r} is not in the language")
        return index

    def unrank(self, length: int, index: int) -> str:
        """The accepted string of ``length`` with rank ``index`` (inverse of ``rank``)."""
        size = self.count(length)
        if not 0 <= index < size:
            raise RankOutOfRangeError(f"index {index} out of range: length {length} has {size} strings")
        return "".join(chr(p) for _, _, p in self._descend(length, index))

    def completions(self, state: int, length: int) -> int:
        """``T[length][state]``: the strings of ``length`` that lead from ``state`` to acceptance."""
        return self._table(length)[state] if length >= 0 else 0

    def step(self, state: int, length: int, index: int) -> tuple[str, int, int]:
        """Decode the first character of the completion of rank ``index`` among the
        ``completions(state, length)`` ones: (character, next state, rank left below it)."""
        below = self._table(length - 1)
        pieces = self._pieces[state]
        j = pieces.locate(index, below)
        offset, index = divmod(index - pieces.before_weight(j, below), below[pieces.targets[j]])
        return chr(pieces.los[j] + offset), pieces.targets[j], index

    def _descend(self, length: int, index: int) -> list[tuple[int, int, int]]:
        """The path (state, piece, code point) to the string of rank ``index``."""
        path, state = [], 0
        for depth in range(length):
            below = self._table(length - depth - 1)
            pieces = self._pieces[state]
            j = pieces.locate(index, below)
            index -= pieces.before_weight(j, below)
            block = below[pieces.targets[j]]
            offset, index = divmod(index, block)
            path.append((state, j, pieces.los[j] + offset))
            state = pieces.targets[j]
        return path

    # -- enumeration -----------------------------------------------------------------
    def enumerate(self, min_length: int = 0, max_length: int | None = None,
                  start: int = 0, stop: int | None = None) -> Iterator[str]:
        """Strings in shortlex order; ``start``/``stop`` index the whole length range.

        Shards of one exhaustive run are ``enumerate(a, b, k * m, (k + 1) * m)``.
        """
        if start < 0 or (stop is not None and stop < start):
            raise ArgumentError("need 0 <= start <= stop")
        low, high = self.bounds(min_length, max_length)
        position = 0
        for length in range(low, high + 1):
            if stop is not None and position >= stop:
                return
            size = self.count(length)
            if size and position + size > start:
                first = max(start - position, 0)
                last = size if stop is None else min(size, stop - position)
                yield from islice(self._walk(length, first), last - first)
            position += size

    def _walk(self, length: int, index: int) -> Iterator[str]:
        """Strings of ``length`` in code-point order from rank ``index`` to the last."""
        path = self._descend(length, index)
        chars = [chr(p) for _, _, p in path]
        while True:
            yield "".join(chars)
            depth = length - 1
            while depth >= 0:
                state, j, point = path[depth]
                step = self._pieces[state].after(j, point, self._table(length - depth - 1))
                if step is not None:
                    break
                depth -= 1
            if depth < 0:
                return
            while True:
                path[depth] = (state, *step)
                chars[depth] = chr(step[1])
                depth += 1
                if depth == length:
                    break
                state = self._pieces[state].targets[step[0]]
                step = self._pieces[state].after(-1, 0, self._table(length - depth - 1))

    # -- sampling --------------------------------------------------------------------
    def sample(self, n: int, *, min_length: int | None = None, max_length: int | None = None,
               seed=None, lengths="even", unique: bool = False, method: str = "auto",
               progress=None) -> list[str]:
        """``n`` accepted strings, uniform within each length; see ``pfuzz.counting.sampler``."""
        from pfuzz.counting.sampler import sample
        return sample(self, n, min_length=min_length, max_length=max_length, seed=seed,
                      lengths=lengths, unique=unique, method=method, progress=progress)

    def float_tables(self, max_length: int):
        """The floating-point tables of ``pfuzz.counting.bulk`` up to ``max_length`` (cached, grown by doubling)."""
        from pfuzz.counting.bulk import FloatTables
        if self._bulk is None or self._bulk.max_length < max_length:
            grown = max(max_length, 2 * self._bulk.max_length if self._bulk else 0)
            self._bulk = FloatTables(self, grown)
        return self._bulk


class _Pieces:
    """One state's outgoing code-point ranges, sorted, each with its target."""

    __slots__ = ("los", "his", "targets", "slots", "before", "distinct")

    def __init__(self, items: list[tuple[int, int, int]]):
        self.los = [lo for lo, _, _ in items]
        self.his = [hi for _, hi, _ in items]
        self.targets = [t for _, _, t in items]
        self.distinct = list(dict.fromkeys(self.targets))
        slot_of = {t: k for k, t in enumerate(self.distinct)}
        self.slots = [slot_of[t] for t in self.targets]
        running = [0] * len(self.distinct)
        self.before = []
        for lo, hi, t in items:
            self.before.append(tuple(running))
            running[slot_of[t]] += hi - lo + 1

    def before_weight(self, j: int, below: list[int]) -> int:
        """Strings (of the remaining length) that start with a character before piece ``j``."""
        return sum(c * below[t] for c, t in zip(self.before[j], self.distinct) if c)

    def locate(self, index: int, below: list[int]) -> int:
        """The piece holding the string of rank ``index`` (binary search on prefix weights)."""
        lo, hi = 0, len(self.los) - 1
        while lo < hi:
            mid = (lo + hi + 1) // 2
            if self.before_weight(mid, below) <= index:
                lo = mid
            else:
                hi = mid - 1
        return lo

    def after(self, j: int, point: int, below: list[int]) -> tuple[int, int] | None:
        """The next (piece, code point) after ``point`` in piece ``j`` whose target has strings."""
        if j >= 0 and point < self.his[j]:
            return j, point + 1
        for k in range(j + 1, len(self.los)):
            if below[self.targets[k]]:
                return k, self.los[k]
        return None


def _pieces(groups) -> _Pieces:
    items = sorted((lo, hi, t) for t, rs in groups for lo, hi in rs)
    merged: list[tuple[int, int, int]] = []
    for lo, hi, t in items:
        if merged and merged[-1][2] == t and merged[-1][1] + 1 == lo:
            merged[-1] = (merged[-1][0], hi, t)
        else:
            merged.append((lo, hi, t))
    return _Pieces(merged)
