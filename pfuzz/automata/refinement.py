"""Minimisation on arrays for large DFAs: batched partition refinement, then canonical numbering.

Method. Moore's refinement (1956) computes the coarsest partition of the
completed DFA (dead state added) that separates accepting from rejecting
states and is stable: two states stay together while, for every class, their
successors do. Each round splits every block by the signature (own block,
block of each successor). Done naively a round costs O(n k); here a round
looks only at the *dirty* states, those with a successor whose block number
changed in the previous round, as in the worklist formulations of partition
refinement (Hopcroft 1971; Valmari & Lehtinen, STACS 2008). Within a block the
clean members keep their signature, and every dirty member differs from them
(its successor left the block the clean members' successor is still in), so
the clean part keeps the block number and the dirty members are grouped by
their full signature into new blocks (when no clean member is left, the
largest group keeps the number). The rounds are exactly Moore's; a round
costs O(dirty × k), so chains (one dirty state per round) are cheap.

A round with many dirty states is done with numpy (signatures folded into
one integer key, grouped by one sort); a round with few is done in Python
over lists, where a numpy call would cost more than the work. The data
switch between the two forms when the work changes scale.

Then states that cannot reach acceptance share the dead state's block and
are dropped; blocks unreachable from the start are dropped by the
breadth-first numbering (level by level, with numpy for wide levels and
Python for narrow ones), which visits classes in order of their smallest
character; classes that every state treats alike are merged last. The
result is the same canonical DFA as ``pfuzz.automata.minimise`` gives on
its small-automaton path (checked by ``tests/test_minimality.py``).

Cost: O(k × Σ dirty) for the refinement (Σ dirty is at most rounds × n and
usually far less: the 131,072-state DFA of ``(a|b)*a(a|b){16}`` takes 17 wide
rounds, a chain one dirty state per round), O(n k) for the rest; memory O(n k)
integers. ``python -m pfuzz.benchmarks compile`` times it.
"""

from __future__ import annotations

from itertools import chain

import numpy as np

from pfuzz.automata.dfa import DEAD, DFA, empty
from pfuzz.base.charset import CharSet

__all__ = ["minimise_arrays"]

#: Rounds with fewer dirty candidates than this run in Python ...
NARROW = 256
#: ... and the data go back to numpy once a round has more than this many.
WIDE = 4096
#: Table cells whose conversion to Python lists costs about one narrow numpy round: narrow
#: rounds gather with numpy until they have cost as much as converting once.
LIST_COST = 400
_KEY_LIMIT = 1 << 62


def minimise_arrays(dfa: DFA) -> DFA:
    """The canonical minimal partial DFA of the same language (``dfa`` has at least one
    accepting state and one class)."""
    n, k = dfa.n_states, len(dfa.classes)
    flat = np.fromiter(chain.from_iterable(dfa.table), dtype=np.int64, count=n * k)
    succ = np.empty((n + 1, k), dtype=np.int64)
    succ[:n] = flat.reshape(n, k)
    succ[:n][succ[:n] < 0] = n
    succ[n] = n
    accepting = np.zeros(n + 1, dtype=bool)
    accepting[sorted(dfa.accepting)] = True
    block = _Refinement(succ, accepting).run()
    if block[0] == block[n]:
        return empty(dfa.alphabet)
    return _quotient(dfa, succ, block)


# -- refinement ----------------------------------------------------------------------------

class _Refinement:
    """Moore's rounds over dirty states, in numpy or in Python as the work's size asks."""

    def __init__(self, succ: np.ndarray, accepting: np.ndarray):
        self.succ = succ
        self.size = len(succ)
        self.block = accepting.astype(np.int64)
        self.count = int(self.block.max()) + 1
        self.sizes = np.zeros(self.size + 1, dtype=np.int64)
        self.sizes[:self.count] = np.bincount(self.block)
        targets = succ.ravel()
        self.pred = np.argsort(targets) // succ.shape[1]  # sources, grouped by target
        self.ptr = np.concatenate(([0], np.cumsum(np.bincount(targets, minlength=self.size))))
        self._lists = None  # Python forms of the arrays, made once narrow rounds add up
        self._narrow_budget = self.size * succ.shape[1] // LIST_COST

    def run(self) -> np.ndarray:
        changed = np.arange(self.size)
        python = False
        while len(changed):
            if python and len(changed) > WIDE:
                changed, python = self._to_arrays(changed), False
            elif not python and len(changed) < NARROW:
                if self._narrow_budget > 0:
                    self._narrow_budget -= 1
                    changed = self._round_narrow(changed)
                    continue
                changed, python = self._to_lists(changed), True
            changed = self._round_python(changed) if python else self._round_numpy(changed)
        if python:
            self._to_arrays(changed)
        return self.block

    def _round_narrow(self, changed: np.ndarray) -> np.ndarray:
        """A round with few dirty states: gathered with numpy, grouped in Python."""
        dirty = self._dirty(changed)
        block = self.block
        keys = np.column_stack((block[dirty], block[self.succ[dirty]])).tolist()
        groups: dict[tuple, list[int]] = {}
        for i, key in enumerate(keys):
            groups.setdefault(tuple(key), []).append(i)
        moved, ids = self._split(groups, self.sizes)
        if not moved:
            return dirty[:0]
        moved_states = dirty[moved]
        block[moved_states] = ids
        return moved_states

    def _split(self, groups: dict, sizes) -> tuple[list[int], list[int]]:
        """New block numbers for groups of dirty members (keyed by signature, own block
        first): every group gets one, but for the largest of a block without clean members.
        Returns the members moved and their new numbers; ``sizes`` is updated."""
        by_block: dict[int, list[list[int]]] = {}
        for key, members in groups.items():
            by_block.setdefault(key[0], []).append(members)
        moved: list[int] = []
        ids: list[int] = []
        for b, parts in by_block.items():
            if sizes[b] == sum(map(len, parts)):
                parts.remove(max(parts, key=len))
            for members in parts:
                new = self.count
                self.count += 1
                sizes[new] = len(members)
                sizes[b] -= len(members)
                moved.extend(members)
                ids.extend([new] * len(members))
        return moved, ids

    # -- numpy rounds ----------------------------------------------------------------------
    def _dirty(self, changed: np.ndarray) -> np.ndarray:
        if len(changed) == self.size:
            return changed
        starts = self.ptr[changed]
        lengths = self.ptr[changed + 1] - starts
        offsets = np.repeat(starts - np.cumsum(lengths) + lengths, lengths)
        return _distinct(self.pred[offsets + np.arange(len(offsets))], self.size)

    def _round_numpy(self, changed: np.ndarray) -> np.ndarray:
        dirty = self._dirty(changed)
        block, count = self.block, self.count
        key, bound = block[dirty], count
        for column in self.succ[dirty].T:
            if bound * count >= _KEY_LIMIT:
                key, bound = _dense_rank(key), len(dirty)
            key = key * count + block[column]
            bound *= count
        order = np.argsort(key)
        key, members = key[order], dirty[order]
        cut = np.flatnonzero(key[1:] != key[:-1]) + 1
        starts = np.concatenate(([0], cut))
        sizes = np.diff(np.concatenate((starts, [len(key)])))
        owner = block[members[starts]]
        fresh = self._fresh_groups(owner, sizes)
        if not fresh.any():
            return dirty[:0]
        ids = np.full(len(starts), -1, dtype=np.int64)
        ids[fresh] = count + np.arange(int(fresh.sum()))
        per_member = np.repeat(ids, sizes)
        moved = members[per_member >= 0]
        block[moved] = per_member[per_member >= 0]
        self.sizes[ids[fresh]] = sizes[fresh]
        np.subtract.at(self.sizes, owner[fresh], sizes[fresh])
        self.count = count + int(fresh.sum())
        return moved

    def _fresh_groups(self, owner: np.ndarray, sizes: np.ndarray) -> np.ndarray:
        """Which groups get a new block number: all of them when their block keeps clean
        members, else all but the first largest group of the block."""
        run = np.concatenate(([0], np.flatnonzero(owner[1:] != owner[:-1]) + 1))
        dirty_in = np.add.reduceat(sizes, run)
        whole = self.sizes[owner[run]] == dirty_in
        largest = np.maximum.reduceat(sizes, run)
        which = np.repeat(np.arange(len(run)), np.diff(np.concatenate((run, [len(owner)]))))
        candidate = np.where(sizes == largest[which], np.arange(len(owner)), len(owner))
        keeper = np.minimum.reduceat(candidate, run)
        fresh = np.ones(len(owner), dtype=bool)
        fresh[keeper[whole]] = False
        return fresh

    # -- Python rounds ---------------------------------------------------------------------
    def _to_lists(self, changed: np.ndarray) -> list[int]:
        if self._lists is None:
            self._lists = (self.succ.tolist(), self.ptr.tolist(), self.pred.tolist())
        self.block_list, self.sizes_list = self.block.tolist(), self.sizes.tolist()
        return changed.tolist()

    def _to_arrays(self, changed: list[int]) -> np.ndarray:
        self.block = np.array(self.block_list, dtype=np.int64)
        self.sizes = np.array(self.sizes_list, dtype=np.int64)
        return np.array(changed, dtype=np.int64)

    def _round_python(self, changed: list[int]) -> list[int]:
        rows, ptr, pred = self._lists
        block = self.block_list
        dirty = {p for t in changed for p in pred[ptr[t]:ptr[t + 1]]}
        groups: dict[tuple, list[int]] = {}
        for p in sorted(dirty):
            groups.setdefault((block[p], *[block[t] for t in rows[p]]), []).append(p)
        moved, ids = self._split(groups, self.sizes_list)
        for p, new in zip(moved, ids):
            block[p] = new
        return moved


def _distinct(values: np.ndarray, size: int) -> np.ndarray:
    """The distinct values (all below ``size``), increasing."""
    if 16 * len(values) < size:
        ordered = np.sort(values)
        return ordered[np.concatenate(([True], ordered[1:] != ordered[:-1]))[:len(ordered)]]
    seen = np.zeros(size, dtype=bool)
    seen[values] = True
    return np.flatnonzero(seen)


def _first_positions(values: np.ndarray, size: int) -> np.ndarray:
    """For each value below ``size``: the first position where it occurs (``len`` if never)."""
    first = np.full(size, len(values), dtype=np.int64)
    np.minimum.at(first, values, np.arange(len(values)))
    return first


def _dense_rank(key: np.ndarray) -> np.ndarray:
    """Ranks 0, 1, ... of the distinct values of ``key``, in increasing order."""
    order = np.argsort(key)
    ordered = key[order]
    step = np.empty(len(key), dtype=np.int64)
    step[0] = 0
    step[1:] = ordered[1:] != ordered[:-1]
    ranks = np.empty(len(key), dtype=np.int64)
    ranks[order] = np.cumsum(step)
    return ranks


# -- quotient, numbering, classes -------------------------------------------------------------

def _quotient(dfa: DFA, succ: np.ndarray, block: np.ndarray) -> DFA:
    """The quotient by ``block`` without the dead block, numbered breadth-first, classes merged."""
    n = dfa.n_states
    first = _first_positions(block[:n], int(block.max()) + 1)
    labels = np.flatnonzero(first < n)
    first = first[labels]
    number = np.full(len(first) + n + 1, -1, dtype=np.int64)
    number[labels] = np.arange(len(labels))
    number[block[n]] = -1
    by_min = sorted(range(len(dfa.classes)), key=lambda c: dfa.classes[c].min)
    table = number[block[succ[first][:, by_min]]]
    order, seen = _breadth_first(table, int(number[block[0]]))
    rows = np.where(table[seen] >= 0, order[np.maximum(table[seen], 0)], DEAD)
    keep, groups = _column_groups(rows)
    classes = [CharSet.of(r for c in group for r in dfa.classes[by_min[c]].ranges)
               for group in groups]
    accepting_blocks = np.zeros(len(labels), dtype=bool)
    accepting_blocks[number[block[sorted(dfa.accepting)]]] = True
    accepting = frozenset(np.flatnonzero(accepting_blocks[seen]).tolist())
    final = tuple(zip(*rows[:, keep].T.tolist()))  # column lists zipped: faster than rows
    return DFA(dfa.alphabet, tuple(classes), final, accepting)


def _column_groups(rows: np.ndarray) -> tuple[list[int], list[list[int]]]:
    """Identical columns grouped, groups in order of their first column (the least character)."""
    groups: dict[bytes, list[int]] = {}
    for c, column in enumerate(np.ascontiguousarray(rows.T)):
        groups.setdefault(column.tobytes(), []).append(c)
    return [group[0] for group in groups.values()], list(groups.values())


def _breadth_first(table: np.ndarray, start: int) -> tuple[np.ndarray, np.ndarray]:
    """Breadth-first numbers from ``start`` (columns in order): (number per row or -1,
    rows in numbering order). Wide levels with numpy, narrow ones in Python."""
    order = np.full(len(table), -1, dtype=np.int64)
    order[start] = 0
    levels, frontier, count = [np.array([start])], np.array([start]), 1
    while len(frontier):
        if len(frontier) < NARROW:
            frontier, count = _narrow_levels(table, order, frontier.tolist(), count, levels)
            continue
        targets = table[frontier].ravel()
        targets = targets[targets >= 0]
        targets = targets[order[targets] < 0]
        frontier = targets[_first_positions(targets, len(table))[targets] == np.arange(len(targets))]
        order[frontier] = count + np.arange(len(frontier))
        count += len(frontier)
        levels.append(frontier)
    return order, np.concatenate(levels)


def _narrow_levels(table: np.ndarray, order: np.ndarray, frontier: list[int], count: int,
                   levels: list) -> tuple[np.ndarray, int]:
    """Breadth-first levels in Python while they stay narrow; ``order`` and ``levels`` updated."""
    numbers: dict[int, int] = {}
    rows = None
    stretch = 0
    while frontier and len(frontier) < WIDE:
        stretch += 1
        if rows is None and stretch > 64:
            rows = table.tolist()  # a long chain of narrow levels: convert once
        out = [rows[s] for s in frontier] if rows is not None else table[frontier].tolist()
        found: list[int] = []
        for row in out:
            for t in row:
                if t >= 0 and t not in numbers and order[t] < 0:
                    numbers[t] = count
                    count += 1
                    found.append(t)
        frontier = found
    if numbers:
        fresh = np.fromiter(numbers, dtype=np.int64, count=len(numbers))
        order[fresh] = np.fromiter(numbers.values(), dtype=np.int64, count=len(numbers))
        levels.append(fresh)
    return np.array(frontier, dtype=np.int64), count
