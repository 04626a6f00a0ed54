"""Simulation preorders between the states of a DFA, for antichain cuts of subset constructions.

A state p simulates a state q when q accepting implies p accepting and
every move of q is matched by a move of p into a simulating pair. For the
moves of a DFA alone (one target per class) this is exactly language
inclusion, L_q ⊆ L_p. A set of states that stands for a future (a
configuration of a subset construction) keeps that future when its states
simulated by another of its states are cut: the antichain pruning of De
Wulf, Doyen, Henzinger & Raskin, "Antichains: a new algorithm for checking
universality of finite automata", CAV 2006.

Graded simulations, for edits that cost. The range-edge edits of
``pfuzz.nearmiss.neighbourhood`` write characters chosen by a state's own transition
labels, so language inclusion is not enough where edits remain. With k
edits left, p simulates q (q ≤_k p) when acceptance carries from q to p,
every class move of q is matched by p's into a pair related at grade k,
every edit move of q (``written``: a relation per class, a bitset of
targets per state) is matched by an edit move of p under the same relation
into a pair related at grade k − 1, and q in a ``marks`` set (where an
insertion may stand) implies p in it; ≤_0 is language inclusion. Since an
edit spends one of the k, its targets need only the coarser grade, given as
``inner``; so the edit conditions are fixed before the fixpoint and only
the class moves are iterated. By induction ≤_k ⊆ ≤_{k−1}, and a state cut
at grade k has a simulating state whose futures with at most k edits
include its own.

Method: the greatest fixpoint, refined one row (all p for one q) at a time
with numpy, successors first (depth-first postorder from the start), rows
revisited when a successor's row shrinks. Cost: O(n k) vector operations of
length n per pass, for n states and k classes, plus one per edit move for
the fixed conditions; O(n^2) bytes for the boolean matrix (a million for
1,000 states).
"""

from __future__ import annotations

from collections import deque

import numpy as np

from pfuzz.automata.dfa import DEAD, DFA


def simulation(dfa: DFA, written: "list[list[int]] | None" = None,
               marks: "list[int] | None" = None, inner: "np.ndarray | None" = None) -> np.ndarray:
    """sim[q, p]: whether p simulates q (index n: the dead state, simulated by all).

    Without ``written`` and ``marks`` this is language inclusion. With them,
    edit moves of q must be matched by edit moves of p into pairs of
    ``inner`` (the grade below; language inclusion when None).
    """
    n, k = dfa.n_states, len(dfa.classes)
    table = np.full((n + 1, k), n, dtype=np.int64)
    if k:
        table[:n] = np.array(dfa.table, dtype=np.int64).reshape(n, k)
        table[table < 0] = n
    sim = _static_conditions(dfa, marks or [])
    if written:
        below = simulation(dfa) if inner is None else inner
        for column in written:
            sim &= _matched_moves(column, n, below)
    preds = dfa.predecessors()
    queue = deque(_successors_first(dfa))
    queued = [True] * n
    while queue:
        q = queue.popleft()
        queued[q] = False
        row = sim[q].copy()
        for c in range(k):
            if table[q, c] != n:
                row &= sim[table[q, c], table[:, c]]
        if not np.array_equal(row, sim[q]):
            sim[q] = row
            for p in sorted(preds[q]):
                if not queued[p]:
                    queued[p] = True
                    queue.append(p)
    return sim


def beaten(sim: np.ndarray) -> list[int]:
    """beaten[q]: bitset of the states p ≠ q that simulate q, from a ``simulation``.

    Equivalent states beat each other only downward in index, so cutting
    every beaten state leaves one of each.
    """
    n = sim.shape[0] - 1
    inc = sim[:n, :n]
    lower = np.arange(n)[None, :] < np.arange(n)[:, None]
    strict = (inc & ~inc.T) | (inc & inc.T & lower)
    packed = np.packbits(strict, axis=1, bitorder="little")
    return [int.from_bytes(packed[q].tobytes(), "little") for q in range(n)]


def _matched_moves(column: list[int], n: int, below: np.ndarray) -> np.ndarray:
    """ok[q, p]: every move of q under one relation is matched by one of p into ``below``."""
    out = [_members(column[q]) for q in range(n)]
    sources = np.array([q for q in range(n) for _ in out[q]], dtype=np.int64)
    targets = np.array([t for q in range(n) for t in out[q]], dtype=np.int64)
    ok = np.ones((n + 1, n + 1), dtype=bool)
    for q in range(n):
        for t in out[q]:
            matched = np.zeros(n + 1, dtype=bool)
            matched[sources[below[t, targets]]] = True
            ok[q] &= matched
    return ok


def _static_conditions(dfa: DFA, marks: list[int]) -> np.ndarray:
    """sim[q, p] before the fixpoint: acceptance and marks carried from q to p."""
    n = dfa.n_states
    final = np.zeros(n + 1, dtype=bool)
    final[sorted(dfa.accepting)] = True
    sim = ~(final[:, None] & ~final[None, :])
    for mark in marks:
        held = _bits(mark, n + 1)
        sim &= ~(held[:, None] & ~held[None, :])
    sim[:n, n] = False  # a live state's language is not inside the empty one
    sim[n, :] = True
    return sim


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
