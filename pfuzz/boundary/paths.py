"""Shortest paths through a DFA's live part: the raw material of boundary suites.

``Guide`` reads a DFA once and answers, for its live states (those that can
still reach acceptance): the transitions as (label, target) pairs, where a
label is the set of all characters leading from one state to the other; the
shortlex-least prefix reaching each state (breadth-first search, characters
in increasing order); the shortlex-least completion from each state to
acceptance (backward breadth-first distances, then the smallest character
that keeps to a shortest path); and a greedy transition cover. ``Lengths``
says which string lengths are valid and builds the shortlex-least valid string
of a given length.

Transition cover (greedy). For each transition not yet taken, in breadth-first
order of states: walk backwards from its source along transitions not yet
taken while there are any (then the shortest prefix to where the walk
stopped), take the transition, walk forwards along transitions not yet taken,
looking a few steps ahead (``LOOKAHEAD``) for one when the current state has
none, and finish with the shortest completion. Every string takes at least one
new transition, so the cover has at most one string per transition. On a
layered automaton (a bounded length) this comes close to the lower bound, the
largest number of transitions between two consecutive lengths.

Cost: O(states × classes) to build; the cover O(transitions × classes ×
string length) with a bounded look-ahead; ``Lengths`` O(Σ|S_n| × classes) over
the scanned lengths, and O(n × transitions) for a string of exact interior
length n (backward reachable sets).
"""

from __future__ import annotations

from collections import deque
from functools import cached_property

from pfuzz.automata import algebra
from pfuzz.base.charset import CharSet
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.automata.dfa import DFA, transitions


__all__ = ["LOOKAHEAD", "Guide", "Lengths"]

#: How many transitions the transition cover looks ahead for one not yet taken.
LOOKAHEAD = 3


class Guide:
    """Transitions, shortest prefixes and shortest completions of a DFA's live part."""

    def __init__(self, dfa: DFA):
        self.dfa = dfa
        self.live = dfa.live_states()
        self.edges = transitions(dfa, self.live)
        self.reachable, self._parent = self._breadth_first()
        self._next = self._completion_steps()
        self._prefix: dict[int, str] = {0: ""}
        self._completion: dict[int, str] = {}

    def _breadth_first(self) -> tuple[list[int], dict[int, tuple[int, str]]]:
        """States in breadth-first order from the start; parent links of shortlex-least prefixes."""
        if 0 not in self.live:
            return [], {}
        order, parent = [0], {}
        queue = deque([0])
        while queue:
            s = queue.popleft()
            for label, t in self.edges[s]:
                if t != 0 and t not in parent:
                    parent[t] = (s, chr(label.min))
                    order.append(t)
                    queue.append(t)
        return order, parent

    def _completion_steps(self) -> dict[int, tuple[str, int]]:
        """Per non-accepting live state, the first step of its shortlex-least completion."""
        preds: dict[int, list[int]] = {}
        for s in self.live:
            for _, t in self.edges[s]:
                preds.setdefault(t, []).append(s)
        distance = {s: 0 for s in self.dfa.accepting if s in self.live}
        queue = deque(sorted(distance))
        while queue:
            t = queue.popleft()
            for s in preds.get(t, ()):
                if s not in distance:
                    distance[s] = distance[t] + 1
                    queue.append(s)
        steps = {}
        for s in self.live:
            if distance[s]:
                label, t = next((l, t) for l, t in self.edges[s] if distance[t] == distance[s] - 1)
                steps[s] = (chr(label.min), t)
        return steps

    def prefix(self, state: int) -> str:
        """The shortlex-least string leading from the start to ``state``."""
        chain, s = [], state
        while s not in self._prefix:
            s, ch = self._parent[s]
            chain.append(ch)
        text = self._prefix[s]
        for ch in reversed(chain):
            text += ch
        self._prefix[state] = text
        return text

    def completion(self, state: int) -> str:
        """The shortlex-least string leading from ``state`` to acceptance."""
        if state not in self._completion:
            chars, s = [], state
            while s in self._next:
                ch, s = self._next[s]
                chars.append(ch)
            self._completion[state] = "".join(chars)
        return self._completion[state]

    def allowed(self, state: int) -> CharSet:
        """Characters that keep a string live from ``state``."""
        return CharSet.of(r for label, _ in self.edges[state] for r in label.ranges)

    def cover(self) -> list[tuple[str, int]]:
        """Greedy transition cover: (valid string, number of transitions it takes first)."""
        taken: set[tuple[int, int]] = set()
        out = []
        for s in self.reachable:
            for label, t in self.edges[s]:
                if (s, t) not in taken:
                    text = self._covering_string(s, chr(label.min), t, taken)
                    before = len(taken)
                    taken.update(_path(self.dfa, text))
                    out.append((text, len(taken) - before))
        return out

    def _covering_string(self, s: int, ch: str, t: int, taken: set) -> str:
        used = {(s, t)}

        def fresh(pair):
            return pair not in taken and pair not in used

        back, v = [ch], s
        while v != 0:
            step = next(((l, p) for l, p in self._predecessors[v] if fresh((p, v))), None)
            if step is None:
                break
            used.add((step[1], v))
            back.append(chr(step[0].min))
            v = step[1]
        text = self.prefix(v) + "".join(reversed(back))
        while True:
            route = self._route_to_fresh(t, fresh)
            if route is None:
                return text + self.completion(t)
            for point, u in route:
                used.add((t, u))
                text += chr(point)
                t = u

    def _route_to_fresh(self, state: int, fresh) -> list[tuple[int, int]] | None:
        """The shortest walk (at most LOOKAHEAD steps) from ``state`` ending in a fresh transition."""
        frontier = [(state, ())]
        for _ in range(LOOKAHEAD):
            after = []
            for u, route in frontier:
                for label, w in self.edges[u]:
                    if fresh((u, w)):
                        return [*route, (label.min, w)]
                    after.append((w, (*route, (label.min, w))))
            frontier = after
        return None

    @cached_property
    def _predecessors(self) -> dict[int, list[tuple[CharSet, int]]]:
        preds: dict[int, list[tuple[CharSet, int]]] = {}
        for s in self.reachable:
            for label, t in self.edges[s]:
                preds.setdefault(t, []).append((label, s))
        return preds


def _path(dfa: DFA, text: str) -> list[tuple[int, int]]:
    """The (state, next state) pairs a string takes."""
    pairs, s = [], 0
    for ch in text:
        t = dfa.table[s][dfa.class_of(ch)]
        pairs.append((s, t))
        s = t
    return pairs


# -- lengths ---------------------------------------------------------------------------

class Lengths:
    """Which lengths are valid, up to the bound or until the pattern of lengths repeats."""

    def __init__(self, guide: Guide, max_length: int | None):
        self.guide = guide
        dfa = guide.dfa
        self.min = len(guide.completion(0))
        self.finite_max = algebra.max_length(dfa)
        if max_length is not None:
            self.bound = max_length
        else:
            self.bound = self.finite_max if self.finite_max is not None else self.min + UNBOUNDED_SPAN
        self.valid: list[bool] = []
        self.period: tuple[int, int] | None = None
        seen: dict[frozenset, int] = {}
        current = frozenset({0})
        while len(self.valid) <= self.bound + 1:
            n = len(self.valid)
            self.valid.append(bool(current & dfa.accepting))
            if not current:
                break
            if current in seen:
                self.period = (seen[current], n - seen[current])
                break
            seen[current] = n
            current = frozenset(t for s in current for _, t in guide.edges[s])
        self._reach: list[frozenset] = []

    def is_valid(self, n: int) -> bool:
        if n < len(self.valid):
            return self.valid[n]
        if self.period is None:
            return False
        first, period = self.period
        return self.valid[first + (n - first) % period]

    def longest_within_bound(self) -> int | None:
        top = min(self.bound, self.finite_max) if self.finite_max is not None else self.bound
        return next((n for n in range(top, self.min - 1, -1) if self.is_valid(n)), None)

    def string_of_length(self, n: int) -> str:
        """The shortlex-least valid string of length ``n`` (which must be a valid length)."""
        if n == self.min:
            return self.guide.completion(0)
        if n == self.finite_max:
            return _longest_string(self.guide)
        reach = self._reaching(n)
        s, chars = 0, []
        for remaining in range(n, 0, -1):
            label, s = next((l, t) for l, t in self.guide.edges[s] if t in reach[remaining - 1])
            chars.append(chr(label.min))
        return "".join(chars)

    def _reaching(self, n: int) -> list[frozenset]:
        """reach[r]: live states from which acceptance is reachable in exactly r steps."""
        guide = self.guide
        if not self._reach:
            self._reach.append(frozenset(s for s in guide.dfa.accepting if s in guide.live))
        while len(self._reach) <= n:
            after = self._reach[-1]
            self._reach.append(frozenset(s for s in guide.live
                                         if any(t in after for _, t in guide.edges[s])))
        return self._reach


def _longest_string(guide: Guide) -> str:
    """The shortlex-least valid string of the greatest length (finite languages)."""
    best = algebra.longest_completions(guide.dfa)
    s, chars = 0, []
    while best[s] > 0:
        label, s = next((l, t) for l, t in guide.edges[s] if best[t] == best[s] - 1)
        chars.append(chr(label.min))
    return "".join(chars)
