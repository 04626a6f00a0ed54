"""Automaton back to a pattern: state elimination.

``pattern_of(dfa)`` writes a Python ``re`` pattern for the language of a DFA
by state elimination (Brzozowski & McCluskey, "Signal flow graph techniques
for sequential circuit state diagrams", IEEE Trans. Electronic Computers,
1963): add a new start and a new final state, label every edge with an
expression, then remove the inner states one at a time, replacing each path
p → k → q by ``R(p,k) R(k,k)* R(k,q)``. The state removed next is the one
with the fewest (predecessors × successors), ties broken by the size of its
labels (a common heuristic: it keeps the number and size of new labels low).
The expressions simplify themselves as they are built (``pfuzz.automata.expression``),
so counted repeats come back as ``x{m,n}`` and finite sets as factored
alternatives.

The result is exact (it denotes the same language over the alphabet as the
DFA, with flags 0) but not minimal: state elimination is order-dependent and
the shortest pattern of a language is hard to find in general; languages such
as ``(a|b)*a(a|b){k}`` have no short expression this method finds. Cost:
O(n³) expression operations for n states in the worst case. Every node is
charged against ``WORK_BUDGET`` (its text plus ``NODE_CHARGE``) and no label may
exceed ``WORK_FACTOR`` × ``limit`` characters; past either, the work stops and
None is returned (about a second at most). None therefore means "no pattern
within the limit was found this way", not "no short pattern exists".
"""

from __future__ import annotations

import heapq

from pfuzz.automata.dfa import DFA, transitions
from pfuzz.automata.expression import EMPTY, NODE_CHARGE, NOTHING, NOTHING_TEXT, Algebra, Expr, TooLarge

__all__ = ["DEFAULT_LIMIT", "NOTHING_TEXT", "pattern_of", "eliminate"]

#: Longest pattern ``pattern_of`` returns by default (characters).
DEFAULT_LIMIT = 1000
#: Intermediate labels may grow to this multiple of the limit before giving up.
WORK_FACTOR = 4
#: Total characters of expression text one elimination may render before giving up
#: (this bounds the running time: about a second at most).
WORK_BUDGET = 2_000_000


# -- state elimination ----------------------------------------------------------------

def pattern_of(dfa: DFA, limit: int | None = None) -> str | None:
    """A Python ``re`` pattern (flags 0) for the DFA's language over its alphabet.

    Returns None when the pattern found is longer than ``limit`` characters
    (default ``DEFAULT_LIMIT``). The empty language gives ``NOTHING_TEXT``;
    the language {""} gives the empty pattern.
    """
    limit = DEFAULT_LIMIT if limit is None else limit
    if (dfa.n_states - 1) * NODE_CHARGE > WORK_BUDGET:
        return None  # every state but the start has an incoming edge: over budget already
    algebra = Algebra(dfa.alphabet, work_limit=max(limit, 64) * WORK_FACTOR, budget=WORK_BUDGET)
    try:
        text = algebra.polish(eliminate(dfa, algebra)).text
    except (TooLarge, RecursionError):  # nested too deeply to write is too large to show
        return None
    return text if len(text) <= limit else None


class _Graph:
    """The generalised automaton being reduced: labelled edges, both directions.

    ``size[s]`` is the total text length of the labels touching s, kept up to
    date edge by edge, so the elimination order costs O(1) per state to rank.
    """

    START, FINAL = -1, -2

    def __init__(self, dfa: DFA, algebra: Algebra):
        live = dfa.live_states()
        edges = [(s, label, t) for s, row in enumerate(transitions(dfa, live)) for label, t in row]
        states = {s for s, _, _ in edges} | {t for _, _, t in edges} | ({0} & live)
        self.succ: dict[int, dict[int, Expr]] = {s: {} for s in (*states, self.START, self.FINAL)}
        self.pred: dict[int, dict[int, Expr]] = {s: {} for s in self.succ}
        self.size = dict.fromkeys(self.succ, 0)
        for s, label, t in edges:
            self.put(s, t, algebra.charge(algebra.sym(label)))
        for s in states & dfa.accepting:
            self.put(s, self.FINAL, EMPTY)
        if states:
            self.put(self.START, 0, EMPTY)

    def put(self, p: int, q: int, label: Expr) -> None:
        old = self.succ[p].get(q)
        delta = len(label.text) - (0 if old is None else len(old.text))
        self.succ[p][q] = self.pred[q][p] = label
        self.size[p] += delta
        self.size[q] += delta

    def drop(self, p: int, q: int) -> Expr:
        label = self.succ[p].pop(q)
        del self.pred[q][p]
        self.size[p] -= len(label.text)
        self.size[q] -= len(label.text)
        return label

    def cost(self, k: int) -> tuple[int, int, int]:
        """Fewest (predecessors × successors) first, then the smallest labels; loops do not count."""
        ins = len(self.pred[k]) - (k in self.pred[k])
        outs = len(self.succ[k]) - (k in self.succ[k])
        return ins * outs, self.size[k], k

    def remove(self, k: int, algebra: Algebra) -> set[int]:
        """Eliminate state k, rerouting every path through it; return its neighbours."""
        loop = self.drop(k, k) if k in self.succ[k] else None
        star = EMPTY if loop is None else algebra.rep(loop, 0, None)
        ins = [(p, self.drop(p, k)) for p in list(self.pred[k])]
        outs = [(q, self.drop(k, q)) for q in list(self.succ[k])]
        for p, into in ins:
            for q, out in outs:
                path = algebra.cat(into, star, out)
                old = self.succ[p].get(q)
                self.put(p, q, path if old is None else algebra.alt(old, path))
        del self.succ[k], self.pred[k], self.size[k]
        return {p for p, _ in ins} | {q for q, _ in outs}


def eliminate(dfa: DFA, algebra: Algebra) -> Expr:
    """The expression for the DFA's language, by eliminating every state.

    The next state is taken from a heap of costs; entries made stale by an
    elimination are skipped when popped (the costs of the neighbours of the
    eliminated state are pushed again).
    """
    graph = _Graph(dfa, algebra)
    current = {s: graph.cost(s) for s in graph.succ if s >= 0}
    heap = list(current.values())
    heapq.heapify(heap)
    while heap:
        entry = heapq.heappop(heap)
        k = entry[-1]
        if current.get(k) != entry:
            continue
        del current[k]
        for s in graph.remove(k, algebra):
            if s in current:
                current[s] = graph.cost(s)
                heapq.heappush(heap, current[s])
    return graph.succ[graph.START].get(graph.FINAL, NOTHING)
