"""Obligations: constraints on the rest of the input that NFA threads carry.

A thread that takes an assertion about what follows (``$``, ``\\Z``, ``\\b``, a lookahead,
the "no earlier choice could have matched" condition of an atomic group) does not
decide it on the spot: it carries an *obligation*, a (constraint, state) pair of a
small minimal DFA that reads every later character and must accept at the end of the
input. ``Obligations`` interns the constraint DFAs by value and the sets of
obligations as integers, and memoises how a set moves under each symbol class, so that
the determiniser (``pfuzz.automata.construction.determinise``) handles threads by set
id. An obligation whose constraint is universal (U*) is dropped and a dead one kills
its thread, so equal sets are equal ids.

Cost: one dictionary lookup per (set, class) after the first time; ``language`` builds
the DFA of a disjunction of sets by the subset construction over their states.
"""

from __future__ import annotations

from pfuzz.automata.dfa import DEAD, DFA, explore
from pfuzz.automata.minimise import minimise

#: Obligation sets are interned; id 0 is the empty set, None means "blocked".
NO_OBLIGATIONS = 0
BLOCKED = None


class Interned:
    """Values numbered 0, 1, 2, ... in the order first seen: call with a value for its number."""

    def __init__(self, *first):
        self.values = list(first)
        self.ids = {value: i for i, value in enumerate(first)}

    def __call__(self, value) -> int:
        number = self.ids.get(value)
        if number is None:
            number = self.ids[value] = len(self.values)
            self.values.append(value)
        return number


class Obligations:
    """Interned constraint DFAs and obligation sets, and their steps, for one compilation."""

    def __init__(self, classes):
        self.classes = classes
        self.constraints: list[DFA] = []
        self.columns: list[tuple[int, ...]] = []
        self.universal: list[int] = []
        self.interned: dict[DFA, int] = {}
        #: The interned id of a set of (constraint, state) pairs; ``sets[id]`` the set.
        self.set_id = Interned(frozenset())
        self.sets: list[frozenset] = self.set_id.values
        self.advanced: list[dict[int, int | None]] = [{} for _ in classes]
        self.ends: dict[int, bool] = {}
        self.unions: dict[tuple[int, int], int] = {}

    def intern(self, dfa: DFA) -> int:
        cid = self.interned.get(dfa)
        if cid is None:
            cid = len(self.constraints)
            self.interned[dfa] = cid
            self.constraints.append(dfa)
            self.columns.append(tuple(dfa.class_of(cls.min) for cls in self.classes))
            self.universal.append(_universal_state(dfa))
        return cid

    def obligation(self, dfa: DFA):
        """The obligation set a constraint adds: none (universal), BLOCKED (empty), or one pair."""
        cid = self.intern(dfa)
        if self.universal[cid] == 0:
            return NO_OBLIGATIONS
        if self.constraints[cid].is_empty():
            return BLOCKED
        return self.set_id(frozenset({(cid, 0)}))

    def union(self, a: int, b: int) -> int:
        if not a or not b or a == b:
            return a or b
        key = (a, b) if a < b else (b, a)
        oid = self.unions.get(key)
        if oid is None:
            oid = self.unions[key] = self.set_id(self.sets[a] | self.sets[b])
        return oid

    def advance(self, oid: int, c: int):
        """The obligation set after reading class ``c``, or BLOCKED when one of them dies."""
        memo = self.advanced[c]
        if oid in memo:
            return memo[oid]
        kept = []
        for cid, state in self.sets[oid]:
            nxt = self.constraints[cid].table[state][self.columns[cid][c]]
            if nxt == DEAD:
                kept = BLOCKED
                break
            if nxt != self.universal[cid]:
                kept.append((cid, nxt))
        result = memo[oid] = BLOCKED if kept is BLOCKED else self.set_id(frozenset(kept))
        return result

    def satisfied(self, oid: int) -> bool:
        """Whether every obligation of the set accepts the end of the input (memoised)."""
        hit = self.ends.get(oid)
        if hit is None:
            hit = self.ends[oid] = all(state in self.constraints[cid].accepting
                                       for cid, state in self.sets[oid])
        return hit

    def language(self, alternatives, alphabet, cap: int) -> DFA:
        """The minimal DFA of the rests that satisfy at least one of the obligation sets."""
        def step(oids, c):
            moved = frozenset(filter(lambda o: o is not BLOCKED, (self.advance(o, c) for o in oids)))
            return moved or None

        start = frozenset(alternatives)
        is_accepting = lambda oids: any(map(self.satisfied, oids))  # noqa: E731
        return minimise(explore(start, step, is_accepting, self.classes, alphabet, cap))

    def prune(self, groups: dict[int, set]) -> dict[int, set]:
        """Drop threads subsumed by a thread at the same state with fewer obligations.

        ``groups`` maps obligation set ids to NFA states; a thread (state,
        obligations) goes when another obligation set holding the same state
        is a proper subset of its own (plain threads, id 0, subsume all).
        """
        if len(groups) < 2:
            return {oid: states for oid, states in groups.items() if states}
        sets, out = self.sets, {}
        for oid, states in groups.items():
            kept = states
            if oid:
                for other, theirs in groups.items():
                    if other != oid and sets[other] < sets[oid] and not kept.isdisjoint(theirs):
                        kept = kept - theirs
            if kept:
                out[oid] = kept
        return out


def _universal_state(dfa: DFA) -> int:
    """The state of a minimal DFA whose language is U*, or DEAD when there is none."""
    for state, row in enumerate(dfa.table):
        if state in dfa.accepting and all(t == state for t in row):
            return state
    return DEAD
