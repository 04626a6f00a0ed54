"""Length levels of a DFA: exact sparse count levels, matrix powering, and which lengths are non-empty.

Exact levels. ``T[r][s]``, the strings of length r leading from state s to
acceptance (the recursive method of Nijenhuis & Wilf, 1978; see
``pfuzz.counting.tables``), is kept per level with its non-zero entries only
when they are few: a chain such as ``[0-9]{5000}`` has one non-zero entry per
level, so 5,000 levels cost 5,000 big-integer products instead of 25 million.
A sparse level is pushed backward along the predecessors of its entries; a
dense level (more than one entry in ``SPARSE_SHARE``) is a list, computed along
the successors of every state. Both answer ``level[s]`` (0 for a state without
strings).

Matrix powering. For a DFA of at most ``POWER_STATES`` states, the count at a
long length is the start row of M^length times the accepting vector (M the
matrix of edge widths), computed by repeated squaring with Python integers:
O(n³ log length) products instead of length levels, and no levels kept. The
products grow to length × log2(width) bits, so this pays only for small n.

Forward sets. The states reachable at each depth (``forward_sets``) tell the
float tables of ``pfuzz.counting.bulk`` which (remaining length, state) pairs a
walk to a given length can meet: only those are built.

Which lengths are non-empty. Length m has strings when some state reachable
from the start in exactly m steps accepts: a yes/no recurrence over the sets
reachable at each depth (Python sets while they are small, numpy boolean
vectors once they are wide), with no counts at all. It answers "the lengths in
range that have strings" for length plans and near-miss strata in O(depth ×
edges) boolean work, where exact tables would cost O(states × depth²) bits.
"""

from __future__ import annotations

__all__ = ["Level", "POWER_STATES", "SPARSE_SHARE", "first_level", "forward_sets", "next_level",
           "nonempty_lengths", "power_count"]

#: A level with at most one non-zero entry in this many states is kept sparse.
SPARSE_SHARE = 8
#: Automata of at most this many states count long lengths by matrix powering.
POWER_STATES = 8
#: Sets reachable at one depth with more states than this are handled with numpy.
WIDE_FRONTIER = 512


class Level(dict):
    """A sparse level: state -> count for its non-zero entries; other states count 0."""

    __slots__ = ()

    def __missing__(self, state: int) -> int:
        return 0


def next_level(prev, edges: list, into: list):
    """``T[r]`` from ``T[r-1]``: ``edges[s]`` are (target, width) pairs out of s,
    ``into[t]`` (source, width) pairs into t."""
    n = len(edges)
    if isinstance(prev, Level):
        level = Level()
        get = level.get
        for t, value in prev.items():
            for s, w in into[t]:
                level[s] = get(s, 0) + w * value
        return level if SPARSE_SHARE * len(level) <= n else _dense(level, n)
    level = [sum(w * prev[t] for t, w in out) if out else 0 for out in edges]
    filled = n - level.count(0)
    if SPARSE_SHARE * filled <= n:
        return Level((s, v) for s, v in enumerate(level) if v)
    return level


def _dense(level: Level, n: int) -> list[int]:
    out = [0] * n
    for s, v in level.items():
        out[s] = v
    return out


def first_level(accepting, n: int):
    """``T[0]``: 1 for the accepting states."""
    level = Level((s, 1) for s in accepting)
    return level if SPARSE_SHARE * len(level) <= n else _dense(level, n)


# -- matrix powering ------------------------------------------------------------------------

def power_count(edges: list, accepting, length: int) -> int:
    """Strings of ``length`` from state 0 to acceptance, by repeated squaring of the
    width matrix (exact)."""
    n = len(edges)
    matrix = [[0] * n for _ in range(n)]
    for s, out in enumerate(edges):
        for t, w in out:
            matrix[s][t] += w
    vector = [1 if s in accepting else 0 for s in range(n)]
    while length:
        if length & 1:
            vector = [sum(a * b for a, b in zip(row, vector) if a) for row in matrix]
        length >>= 1
        if length:
            matrix = _square(matrix)
    return vector[0]


def _square(matrix: list[list[int]]) -> list[list[int]]:
    columns = list(zip(*matrix))
    return [[sum(a * b for a, b in zip(row, column) if a and b) for column in columns]
            for row in matrix]


# -- which lengths have strings ------------------------------------------------------------

def nonempty_lengths(successors: list[list[int]], accepting, high: int) -> list[bool]:
    """``result[m]``: whether some string of length m (0 <= m <= high) is accepted, from
    the states reachable from state 0 in exactly m steps."""
    final = frozenset(accepting)
    out = [False] * (high + 1)
    frontier: "set[int] | None" = {0}
    wide = None
    for m in range(high + 1):
        if frontier is not None and len(frontier) > WIDE_FRONTIER:
            wide = _Wide(successors, final)
            wide.load(frontier)
            frontier = None
        if frontier is not None:
            out[m] = not final.isdisjoint(frontier)
            frontier = {t for s in frontier for t in successors[s]} if m < high else frontier
            if not frontier:
                break
        else:
            out[m] = wide.accepts()
            if m < high and not wide.advance():
                break
    return out


class _Wide:
    """A reachable set as a numpy boolean vector, stepped along every edge at once."""

    def __init__(self, successors: list[list[int]], final: frozenset):
        import numpy as np

        self.np = np
        n = len(successors)
        self.src = np.repeat(np.arange(n), [len(out) for out in successors])
        self.tgt = np.fromiter((t for out in successors for t in out), dtype=np.int64,
                               count=len(self.src))
        self.final = np.zeros(n, dtype=bool)
        self.final[sorted(final)] = True
        self.held = np.zeros(n, dtype=bool)

    def load(self, states: set[int]) -> None:
        self.held[sorted(states)] = True

    def members(self):
        return self.np.flatnonzero(self.held)

    def size(self) -> int:
        return int(self.np.count_nonzero(self.held))

    def accepts(self) -> bool:
        return bool((self.held & self.final).any())

    def advance(self) -> bool:
        nxt = self.np.zeros_like(self.held)
        nxt[self.tgt[self.held[self.src]]] = True
        self.held = nxt
        return bool(nxt.any())


def forward_sets(successors: list[list[int]], high: int, limit: float, start=(0,),
                 keep: bool = True) -> "list | None":
    """The states reachable from ``start`` in exactly i steps, for i = 0..high, each sorted
    (a list, or a numpy array once wide); None as soon as their sizes add up past ``limit``.
    With ``keep`` false, only their sizes."""
    out: list = []
    total = 0
    frontier: "set[int] | None" = set(start)
    wide = None
    for i in range(high + 1):
        if frontier is not None and len(frontier) > WIDE_FRONTIER:
            wide = _Wide(successors, frozenset())
            wide.load(frontier)
            frontier = None
        if keep:
            members = sorted(frontier) if frontier is not None else wide.members()
            size = len(members)
        else:
            size = len(frontier) if frontier is not None else wide.size()
        total += size
        if total > limit:
            return None
        out.append(members if keep else size)
        if i == high:
            break
        if frontier is not None:
            frontier = {t for s in frontier for t in successors[s]}
        else:
            wide.advance()
    return out
