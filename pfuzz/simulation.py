"""Simulation preorders between the states of a DFA, for antichain cuts of subset constructions.

A state p simulates a state q when q accepting implies p accepting and
every move of q is matched by a move of p into a simulating pair. For the
moves of a DFA alone (one target per class) this is exactly language
inclusion, L_q ⊆ L_p. Constructions that also move by other relations (the
range-edge edits of ``pfuzz.neighbourhood``, which write characters chosen
by the state's own transition labels) add those relations: every move of q
under one must be matched by some move of p under the same one, and static
marks (sets of states where a move is allowed at all) must carry from q to p.
A set of states that stands for a future (a configuration of a subset
construction) keeps that future when its states simulated by another of its
states are cut: the antichain pruning of De Wulf, Doyen, Henzinger & Raskin,
"Antichains: a new algorithm for checking universality of finite automata",
CAV 2006.

Method: the greatest fixpoint, refined one row (all p for one q) at a time
with numpy, successors first (depth-first postorder from the start), rows
revisited when a successor's row shrinks. Cost: O(n (k + m)) vector
operations of length n per pass, for n states, k classes and m extra moves
per state; O(n^2) bytes for the boolean matrix (a million for 1,000 states).
"""

from __future__ import annotations

from collections import deque

import numpy as np

from .dfa import DEAD, DFA


def dominators(dfa: DFA, written: "list[list[int]] | None" = None,
               marks: "list[int] | None" = None) -> list[int]:
    """beaten[q]: bitset of the states p ≠ q that simulate q (ties to the lower index).

    p simulates q when q accepting implies p accepting, every live move of q
    under a class is matched by p's move into a simulating pair, every
    ``written`` move of q (``written[r][q]``: a bitset of targets) by some
    ``written`` move of p under the same relation into a simulating pair,
    and q in a ``marks`` bitset implies p in it. Without ``written`` and
    ``marks`` this is language inclusion, L_q ⊆ L_p. The greatest fixpoint,
    one row (all p for one q) at a time with numpy, rows revisited when a
    successor's row shrinks. Equivalent states beat each other only downward
    in index, so cutting every beaten state leaves one of each.
    """
    n, k = dfa.n_states, len(dfa.classes)
    table = np.full((n + 1, k), n, dtype=np.int64)  # index n: the dead state
    if k:
        table[:n] = np.array(dfa.table, dtype=np.int64).reshape(n, k)
        table[table < 0] = n
    inc = _static_conditions(dfa, marks or [])
    moves = [_pairs(column, n) for column in written or []]
    preds = _predecessors(dfa, [out for _, _, out in moves])
    queue = deque(_successors_first(dfa))
    queued = [True] * n
    while queue:
        q = queue.popleft()
        queued[q] = False
        row = inc[q].copy()
        for c in range(k):
            if table[q, c] != n:
                row &= inc[table[q, c], table[:, c]]
        for sources, targets, out in moves:
            for t in out[q]:
                matched = np.zeros(n + 1, dtype=bool)
                matched[sources[inc[t, targets]]] = True
                row &= matched
        if not np.array_equal(row, inc[q]):
            inc[q] = row
            for p in sorted(preds[q]):
                if not queued[p]:
                    queued[p] = True
                    queue.append(p)
    inc = inc[:n, :n]
    lower = np.arange(n)[None, :] < np.arange(n)[:, None]
    beaten = (inc & ~inc.T) | (inc & inc.T & lower)
    packed = np.packbits(beaten, axis=1, bitorder="little")
    return [int.from_bytes(packed[q].tobytes(), "little") for q in range(n)]


def _predecessors(dfa: DFA, extra: list[list[list[int]]]) -> list[set[int]]:
    """preds[t]: the states with a move into t, by a class or by an extra relation."""
    preds: list[set[int]] = [set() for _ in range(dfa.n_states)]
    for q, row in enumerate(dfa.table):
        for t in row:
            if t != DEAD:
                preds[t].add(q)
    for out in extra:
        for q, targets in enumerate(out):
            for t in targets:
                preds[t].add(q)
    return preds


def _static_conditions(dfa: DFA, marks: list[int]) -> np.ndarray:
    """inc[q, p] before the fixpoint: acceptance and marks carried from q to p."""
    n = dfa.n_states
    final = np.zeros(n + 1, dtype=bool)
    final[sorted(dfa.accepting)] = True
    inc = ~(final[:, None] & ~final[None, :])
    for mark in marks:
        held = _bits(mark, n + 1)
        inc &= ~(held[:, None] & ~held[None, :])
    inc[:n, n] = False  # a live state's language is not inside the empty one
    inc[n, :] = True
    return inc


def _bits(states: int, size: int) -> np.ndarray:
    held = np.zeros(size, dtype=bool)
    held[list(_members(states))] = True
    return held


def _members(states: int) -> list[int]:
    out = []
    while states:
        low = states & -states
        out.append(low.bit_length() - 1)
        states ^= low
    return out


def _pairs(column: list[int], n: int):
    """A relation given as target bitsets: (sources, targets) arrays and per-state targets."""
    out = [_members(column[q]) for q in range(n)]
    sources = np.array([q for q in range(n) for _ in out[q]], dtype=np.int64)
    targets = np.array([t for q in range(n) for t in out[q]], dtype=np.int64)
    return sources, targets, out


def _successors_first(dfa: DFA) -> list[int]:
    """The states in depth-first postorder from the start (unreachable ones last)."""
    order, seen = [], {0}
    stack = [(0, iter(dfa.table[0]))]
    while stack:
        q, moves = stack[-1]
        for t in moves:
            if t != DEAD and t not in seen:
                seen.add(t)
                stack.append((t, iter(dfa.table[t])))
                break
        else:
            stack.pop()
            order.append(q)
    return order + [q for q in range(dfa.n_states) if q not in seen]
