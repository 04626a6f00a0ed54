"""Minimisation of partial DFAs: trimming, partition refinement, canonical numbering.

Trimming (drop states that cannot reach acceptance), then partition refinement
on the completed automaton. Moore's refinement (1956), vectorised with numpy
one class column per pass, runs first: it needs one round per symbol of the
longest shortest distinguishing suffix, so it is the fast choice for the wide
automata patterns produce. When its rounds exceed a budget (long chains),
Hopcroft's algorithm, "An n log n algorithm for minimizing states in a finite
automaton" (1971), takes over. The dead block is dropped afterwards, which
handles partial DFAs (Valmari & Lehtinen, STACS 2008) the simple way, at the
cost of one extra state. Classes that every state treats alike are then
merged, and states renumbered canonically (breadth-first from the start,
classes in order of their smallest character), so equal languages over equal
alphabets give equal values.

Cost: Moore's refinement is O(rounds × n × k) numpy work, Hopcroft's O(k n log n) pure Python.
From ``ARRAY_STATES`` states on, ``pfuzz.automata.refinement`` does the same job on arrays
(Moore's rounds restricted to the states whose successors changed block) and gives the
same canonical DFA.
"""

from __future__ import annotations

from collections import deque
from typing import Optional

from pfuzz.automata.dfa import DEAD, DFA, empty
from pfuzz.base.charset import CharSet


def trim(dfa: DFA) -> DFA:
    """Redirect transitions into states that cannot reach acceptance to the dead state."""
    live = dfa.live_states()
    table = tuple(tuple(t if t in live else DEAD for t in row) for row in dfa.table)
    return _renumber(DFA(dfa.alphabet, dfa.classes, table, dfa.accepting))


def _renumber(dfa: DFA) -> DFA:
    """Keep the states reachable from the start, numbered breadth-first."""
    order = {0: 0}
    queue = deque([0])
    seen = [0]
    while queue:
        s = queue.popleft()
        for t in dfa.table[s]:
            if t >= 0 and t not in order:
                order[t] = len(seen)
                seen.append(t)
                queue.append(t)
    table = tuple(tuple(order[t] if t >= 0 else DEAD for t in dfa.table[s]) for s in seen)
    accepting = frozenset(order[s] for s in seen if s in dfa.accepting)
    return DFA(dfa.alphabet, dfa.classes, table, accepting)


def _hopcroft_blocks(dfa: DFA) -> list[int]:
    """Block number of every state of the completed DFA (dead state = index n)."""
    n, k = dfa.n_states, len(dfa.classes)
    total = n + 1  # explicit dead state
    dead = n
    inverse: list[list[list[int]]] = [[[] for _ in range(total)] for _ in range(k)]
    for s, row in enumerate(dfa.table):
        for c, t in enumerate(row):
            inverse[c][t if t >= 0 else dead].append(s)
    for c in range(k):
        inverse[c][dead].append(dead)

    finals = [s for s in range(n) if s in dfa.accepting]
    others = [s for s in range(total) if s not in dfa.accepting]
    blocks: list[set[int]] = [set(b) for b in (finals, others) if b]
    block_of = [0] * total
    for b, members in enumerate(blocks):
        for s in members:
            block_of[s] = b
    waiting: set[tuple[int, int]] = set()
    if len(blocks) == 2:
        smaller = 0 if len(blocks[0]) <= len(blocks[1]) else 1
        waiting = {(smaller, c) for c in range(k)}
    work = deque(sorted(waiting))
    while work:
        splitter, c = work.popleft()
        waiting.discard((splitter, c))
        inv = inverse[c]
        hit: dict[int, list[int]] = {}
        for t in blocks[splitter]:
            for s in inv[t]:
                hit.setdefault(block_of[s], []).append(s)
        for b, members in hit.items():
            block = blocks[b]
            if len(members) == len(block):
                continue
            new = set(members)
            block -= new
            nb = len(blocks)
            blocks.append(new)
            for s in new:
                block_of[s] = nb
            for d in range(k):
                if (b, d) in waiting:
                    waiting.add((nb, d))
                    work.append((nb, d))
                else:
                    pick = nb if len(new) <= len(block) else b
                    waiting.add((pick, d))
                    work.append((pick, d))
    return block_of


def _moore_blocks(dfa: DFA, budget: int) -> Optional[list[int]]:
    """Block numbers by Moore's refinement, vectorised with numpy; None past ``budget``.

    Each round refines the partition by the blocks of every successor, one
    class column at a time (1-D ``np.unique`` on a pair key). It needs as many
    rounds as the longest shortest distinguishing suffix, so it is fast for
    wide automata and slow for long chains; past ``budget`` cell updates or
    ``MOORE_ROUNDS`` rounds (each round has a fixed numpy cost, so a chain of n
    states would cost O(n) of them) the caller falls back to Hopcroft.
    """
    import numpy as np

    n, k = dfa.n_states, len(dfa.classes)
    dead = n
    full = np.full((n + 1, max(k, 1)), dead, dtype=np.int64)
    if k:
        table = np.array(dfa.table, dtype=np.int64).reshape(n, k)
        full[:n, :k] = np.where(table < 0, dead, table)
    block = np.zeros(n + 1, dtype=np.int64)
    block[list(dfa.accepting)] = 1
    count = len(np.unique(block))
    spent = rounds = 0
    while True:
        for c in range(k):
            key = block * (n + 1) + block[full[:, c]]
            _, block = np.unique(key, return_inverse=True)
            block = block.reshape(-1)
        spent += (n + 1) * max(k, 1)
        new_count = int(block.max()) + 1
        if new_count == count:
            return block.tolist()
        count = new_count
        rounds += 1
        if spent > budget or rounds >= MOORE_ROUNDS:
            return None


#: Cell updates Moore's refinement may spend before minimise switches to Hopcroft.
MOORE_BUDGET = 40_000_000
#: Refinement rounds Moore may run before minimise switches to Hopcroft (bounded
#: repeats such as [a-z0-9]{1,2048} need one round per state; python -m pfuzz.benchmarks
#: components times both).
MOORE_ROUNDS = 64


#: From this many states on, minimisation runs on arrays (``pfuzz.automata.refinement``).
ARRAY_STATES = 2_000


def minimise(dfa: DFA) -> DFA:
    """The canonical minimal partial DFA of the same language."""
    if dfa.n_states >= ARRAY_STATES and dfa.accepting and dfa.classes:
        from pfuzz.automata.refinement import minimise_arrays
        return minimise_arrays(dfa)
    dfa = trim(dfa)
    if not dfa.accepting:
        return empty(dfa.alphabet)
    block_of = _moore_blocks(dfa, MOORE_BUDGET) if dfa.n_states > 64 else None
    if block_of is None:
        block_of = _hopcroft_blocks(dfa)
    dead_block = block_of[dfa.n_states]
    rep: dict[int, int] = {}
    for s in range(dfa.n_states):
        rep.setdefault(block_of[s], s)
    index = {b: i for i, b in enumerate(rep)}
    table = tuple(
        tuple(DEAD if (t < 0 or block_of[t] == dead_block) else index[block_of[t]]
              for t in dfa.table[rep[b]])
        for b in rep
    )
    accepting = frozenset(index[block_of[s]] for s in dfa.accepting)
    # State 0 is the first representative, so the start block is already block 0.
    merged = DFA(dfa.alphabet, dfa.classes, table, accepting)
    return _renumber(merge_classes(merged))


def merge_classes(dfa: DFA) -> DFA:
    """Merge classes whose columns are identical, ordered by smallest character."""
    columns: dict[tuple[int, ...], list[int]] = {}
    for c in range(len(dfa.classes)):
        columns.setdefault(tuple(row[c] for row in dfa.table), []).append(c)
    groups = [(CharSet.of(r for c in cs for r in dfa.classes[c].ranges), col)
              for col, cs in columns.items()]
    groups.sort(key=lambda g: g[0].min)
    classes = tuple(g[0] for g in groups)
    table = tuple(tuple(g[1][s] for g in groups) for s in range(dfa.n_states))
    return DFA(dfa.alphabet, classes, table, dfa.accepting)
