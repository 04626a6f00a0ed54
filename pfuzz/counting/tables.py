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

Cost and limits: the tables up to length L hold up to states × L integers of
up to L·log2(|alphabet|) bits, O(states × L²) bits in all (``python -m
pfuzz.benchmarks sampling`` measures a 100-state DFA at L = 1000). Levels with
few non-zero entries are kept sparse (``pfuzz.counting.levels``): a chain such as
``[0-9]{5000}`` costs one entry per level. An automaton of at most
``POWER_STATES`` states counts a length far beyond its levels by matrix powering,
keeping no levels. ``exact_table_bytes`` bounds what exact tables up to a length
would take, before they are built. Which lengths have strings (``has_strings``,
``lengths``) comes from a yes/no recurrence, without counts. Long lengths are what
the floating-point tables of ``pfuzz.counting.bulk`` are for. Uniform sampling by length
lives in ``pfuzz.counting.sampler``; ``Counter.sample`` forwards there, and that
module's docstring states the reproducibility guarantee (same seed, pattern,
alphabet and versions give the same strings; over ASCII alphabets
independently of the Python version).
"""

from __future__ import annotations

import bisect
from itertools import accumulate, islice
from typing import Iterator

from pfuzz.automata import algebra
from pfuzz.automata.dfa import DFA, transitions
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.counting.levels import (POWER_STATES, first_level, forward_sets, next_level,
                                   nonempty_lengths, power_count)
from pfuzz.errors import ArgumentError, NotInLanguageError, RankOutOfRangeError, ResourceLimitError

#: Counting a length this far beyond the levels built uses matrix powering (small automata).
POWER_GAP = 1024
#: Exact levels past this many bytes are not built: ranking, enumeration and exact sampling
#: refuse with ResourceLimitError. Counting alone builds levels up to a sixteenth of it and
#: beyond goes forward, keeping one level.
LEVELS_BUDGET = 1 << 30


class Counter:
    """Exact counting, ranking, enumeration and sampling for one DFA."""

    def __init__(self, dfa: DFA):
        self.dfa = dfa
        live = dfa.live_states()
        self.empty = 0 not in live
        self.min_length = algebra.min_length(dfa)
        longest = algebra.longest_completions(dfa)  # one search for max_length and finiteness
        self.finite = longest is not None
        self.max_length = None if longest is None or longest[0] < 0 else longest[0]
        rows = transitions(dfa, live)
        self.groups = [[(t, label.ranges) for label, t in row] for row in rows]
        self._pieces = _LazyPieces(self.groups)
        self._edges = [tuple((t, len(label)) for label, t in row) for row in rows]
        self._into: list | None = None
        self._levels: list = [first_level(dfa.accepting, dfa.n_states)]
        self._nonempty: list[bool] = []
        self._level_bytes: list[int] = []  # [r]: bytes of the exact levels 0..r, at most
        self._forward: tuple = (0, {0: 1}, [])  # (next length, its level, counts so far)
        self._bulk = None

    # -- tables ----------------------------------------------------------------------
    def _table(self, length: int):
        """``T[length]``: per state, the strings of that length leading to acceptance
        (a list, or a sparse ``Level``; both give 0 for a state without strings)."""
        levels, edges = self._levels, self._edges
        if len(levels) <= length:
            needed = self._levels_bytes(length)
            if needed > LEVELS_BUDGET:
                raise ResourceLimitError(
                    f"exact count tables up to length {length:,} would take about "
                    f"{needed / 2**20:,.0f} MB (limit {LEVELS_BUDGET / 2**20:,.0f} MB); ranking, "
                    "enumeration and exact sampling need them: ask for shorter strings, or "
                    "sample with method='bulk'")
        while len(levels) <= length:
            levels.append(next_level(levels[-1], edges, self._incoming()))
        return levels[length]

    def _incoming(self) -> list:
        """Per state, its (source, width) pairs: the edges into it."""
        if self._into is None:
            self._into = [[] for _ in self._edges]
            for s, out in enumerate(self._edges):
                for t, w in out:
                    self._into[t].append((s, w))
        return self._into

    def count(self, length: int) -> int:
        """The number of accepted strings of exactly ``length`` characters."""
        if length < 0:
            raise ArgumentError(f"length must be >= 0, got {length}")
        if self.empty or (self.finite and length > self.max_length):
            return 0
        if length < len(self._levels):
            return self._levels[length][0]
        if len(self._edges) <= POWER_STATES and length >= len(self._levels) + POWER_GAP:
            return power_count(self._edges, self.dfa.accepting, length)
        if self._levels_bytes(length) <= LEVELS_BUDGET // 16:
            return self._table(length)[0]
        return self._forward_count(length)

    def _forward_count(self, length: int) -> int:
        """count(length) by the forward recurrence: per state, the strings of each length
        that lead there from the start; one level is kept (and the counts met on the way)."""
        at, level, counts = self._forward
        edges, final = self._edges, self.dfa.accepting
        while at <= length:
            counts.append(sum(v for s, v in level.items() if s in final))
            nxt: dict[int, int] = {}
            for s, v in level.items():
                for t, w in edges[s]:
                    nxt[t] = nxt.get(t, 0) + w * v
            at, level = at + 1, nxt
        self._forward = (at, level, counts)
        return counts[length]

    def exact_table_bytes(self, length: int) -> int:
        """An upper bound of the memory the exact levels up to ``length`` would take beyond
        those built: one integer below (largest out-width)^r per state that has strings of
        length r (those states come from a yes/no recurrence, without counts)."""
        built = len(self._levels)
        if length < built or self.empty:
            return 0
        return self._levels_bytes(length) - self._levels_bytes(built - 1)

    def _levels_bytes(self, length: int) -> int:
        """The bound of ``exact_table_bytes`` for all the levels 0..length."""
        if self.empty:
            return 0
        total = self._level_bytes
        if len(total) <= length:
            sources = [[s for s, _ in into] for into in self._incoming()]
            high = max(length, 2 * len(total))
            states = forward_sets(sources, high, float("inf"), start=self.dfa.accepting,
                                  keep=False)
            widest = max((sum(w for _, w in out) for out in self._edges), default=1)
            bits = max(widest, 2).bit_length()
            total[:] = list(accumulate(size * (32 + bits * r // 8) for r, size in enumerate(states)))
        return total[length]

    def has_strings(self, length: int) -> bool:
        """Whether some string of exactly ``length`` characters is accepted (no counts)."""
        if length < 0 or self.empty or (self.finite and length > self.max_length):
            return False
        if length >= len(self._nonempty):
            successors = [[t for t, _ in out] for out in self._edges]
            high = max(length, 2 * len(self._nonempty), 64)
            if self.finite:
                high = min(high, self.max_length)
            self._nonempty = nonempty_lengths(successors, self.dfa.accepting, high)
        return self._nonempty[length]

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
        return [n for n in range(low, high + 1) if self.has_strings(n)]

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

    def float_tables(self, lengths):
        """The floating-point tables of ``pfuzz.counting.bulk`` for walks to ``lengths`` (an
        iterable of lengths, or an int L for every length up to L); the last ones are kept
        and reused while they hold every length asked."""
        from pfuzz.counting.bulk import FloatTables
        wanted = set(range(lengths + 1)) if isinstance(lengths, int) else {int(m) for m in lengths}
        if self._bulk is None or not self._bulk.covers(wanted):
            self._bulk = FloatTables(self, sorted(wanted))
        return self._bulk


class _LazyPieces:
    """``_pieces(groups[s])`` per state, made on first use (ranking and enumeration visit
    few states of a large automaton)."""

    def __init__(self, groups):
        self.groups = groups
        self.made: list = [None] * len(groups)

    def __getitem__(self, state: int) -> "_Pieces":
        hit = self.made[state]
        if hit is None:
            hit = self.made[state] = _pieces(self.groups[state])
        return hit


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
