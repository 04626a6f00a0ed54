"""Subset construction over NFA threads that carry obligations on the rest of the input.

The determiniser of ``pfuzz.automata.construction`` (the subset construction of Rabin &
Scott, 1959, run by ``pfuzz.automata.dfa.explore``). A *thread* is an NFA state plus
a set of *obligations* (``pfuzz.automata.construction.obligations``): constraints on
the rest of the input, one per assertion taken, that must all accept at its end.
What an assertion adds is asked of a ``Judge`` (``protocol``), given the look-back
state (``lookback``) of the position.

A configuration is a tuple (ending, look-back state, (obligation set id, state
set id), ...), sorted by id, with state sets interned; the look-back state is 0
when the look-back is memoryless (then the context of a position is fixed by the
class just read). Threads that share their obligations (all of them, after a
lookahead at the start of a pattern) move together: one step advances each
obligation set once and moves each state set once, both memoised per (class,
look-back state), so the product of a pattern with its lookaheads costs a few
dictionary lookups per step. A thread at a final state only decides acceptance
and is kept as the ``ending`` flag; in *recording* mode (the trackers of
``lookback``) ``ending`` is instead the set of (final state's label, obligation
set) pairs, so a lookbehind can read how its body ended. Configurations of plain
threads alone take the classic path, a union of per-state moves. A thread is
dropped when another thread at the same NFA state carries a proper subset of its
obligations (it accepts no more).

Cost: a few dictionary lookups per step for lookahead products and one union of
per-state moves per plain subset step (``python -m pfuzz.benchmarks compile`` gives
the figures on a machine); every ε-closure step and the size of every new state set
are charged to the judge's work budget, which bounds time and memory where
configurations grow large although there are few of them (a search for ``.{65535}``). Memory: the
memo tables hold one entry per (class, look-back state, obligation set) and
(class, look-back state, state set) met.
"""

from __future__ import annotations

from pfuzz.automata.construction.obligations import BLOCKED, NO_OBLIGATIONS, Interned
from pfuzz.automata.construction.protocol import Judge
from pfuzz.automata.nfa import ASSERT, CHAR, FINAL, NFA

_NO_STATES: frozenset = frozenset()


class _Moves:
    """What reading one class does from each NFA state, in one look-back state: the plain
    states reached, the rest (ends and obligation-carrying threads), and a memo."""

    __slots__ = ("plain", "other", "enders", "movers", "moved")

    def __init__(self, plain: dict, other: dict, enders: set):
        self.plain = plain
        self.other = other
        self.enders = enders  # states that reach a final state with no obligations
        self.movers = frozenset(other)
        self.moved: dict[int, tuple] = {}


class Determiniser:
    """The configurations and step function of the subset construction (see the module
    docstring) of ``nfa``, asking ``judge`` about assertions in ``lookback``'s states."""

    def __init__(self, judge: Judge, nfa: NFA, lookback, recording: bool = False):
        self.judge = judge
        self.sets = judge.obligations
        self.nfa = nfa
        self.lookback = lookback
        self.stored = lookback.stored
        self.recording = recording
        self.closures: dict[tuple[int, int], tuple[frozenset, dict[int, frozenset]]] = {}
        #: The interned id of a set of NFA states; ``state_sets[id]`` the set.
        self.states_id = Interned()
        self.state_sets: list[frozenset] = self.states_id.values
        self.dead = (frozenset() if recording else False, 0)
        self.sink = None
        self.final_moves = nfa.kinds[nfa.final] == CHAR
        if self.final_moves:  # L·U*: once the final state is reached, anything
            self.sink = (False, 0, (NO_OBLIGATIONS, self.states_id(frozenset({nfa.final}))))
        self.readers: list[list[tuple[int, int]]] = [[] for _ in self.sets.classes]
        for s, kind in enumerate(nfa.kinds):
            if kind == CHAR:
                (target,) = nfa.targets[s]
                for c in nfa.labels[s]:
                    self.readers[c].append((s, target))
        self.tables: dict[tuple[int, int], _Moves] = {}
        self.unions: dict[tuple[int, int], int] = {}
        self.prunes: dict[tuple, tuple] = {}

    def intern(self, states: frozenset) -> int:
        """The id of a state set; a new one is charged its size to the judge's work budget."""
        known = self.states_id.ids.get(states)
        if known is None:
            self.judge.charge(len(states))
            known = self.states_id(states)
        return known

    # -- closures ---------------------------------------------------------------------
    def start(self, back: int):
        ends, groups = self.closure(self.nfa.start, back)
        return self.configuration(self.ending(ends, NO_OBLIGATIONS), back, groups)

    def closure(self, state: int, back: int) -> tuple[frozenset, dict[int, frozenset]]:
        """Threads reachable by ε and assertion edges: the (final state, obligation set)
        pairs of those that end, and the others grouped by obligation set."""
        key = (state, back)
        if key not in self.closures:
            self.closures[key] = self._closure(state, back)
        return self.closures[key]

    def _closure(self, state: int, back: int) -> tuple[frozenset, dict[int, frozenset]]:
        kinds, labels, targets = self.nfa.kinds, self.nfa.labels, self.nfa.targets
        judge, lookback, union = self.judge, self.lookback, self.sets.union
        groups: dict[int, set] = {}
        ends = set()
        seen = set()
        stack = [(state, NO_OBLIGATIONS)]
        while stack:
            thread = stack.pop()
            if thread in seen:
                continue
            seen.add(thread)
            s, obligations = thread
            kind = kinds[s]
            if kind == CHAR:
                groups.setdefault(obligations, set()).add(s)
                continue
            if kind == FINAL:
                ends.add(thread)
                continue
            if kind == ASSERT:
                extra = judge.assertion(labels[s], lookback, back)
                if extra is BLOCKED:
                    continue
                if type(extra) is tuple:
                    stack.extend((targets[s][0], union(obligations, e)) for e in extra)
                    continue
                obligations = union(obligations, extra)
            stack.extend((t, obligations) for t in targets[s])
        judge.charge(len(seen))
        if len(groups) > 1:
            groups = self.sets.prune(groups)
        return frozenset(ends), {oid: frozenset(states) for oid, states in groups.items()}

    def ending(self, ends, carried: int):
        """What threads ending with ``ends`` (final state, extra set) pairs mean here."""
        union = self.sets.union
        if self.recording:
            labels = self.nfa.labels
            return frozenset((labels[f], union(carried, extra)) for f, extra in ends)
        satisfied = self.sets.satisfied
        return bool(ends) and satisfied(carried) and any(satisfied(extra) for _, extra in ends)

    # -- moves --------------------------------------------------------------------------
    def table(self, c: int, back: int) -> _Moves:
        moves = self.tables.get((c, back))
        if moves is None:
            moves = self.tables[(c, back)] = self._table(c, back)
        return moves

    def _table(self, c: int, back: int) -> _Moves:
        plain, other, enders = {}, {}, set()
        for s, target in self.readers[c]:
            ends, groups = self.closure(target, back)
            plain[s] = groups.get(NO_OBLIGATIONS, _NO_STATES)
            if not self.recording and any(extra == NO_OBLIGATIONS for _, extra in ends):
                enders.add(s)
                ends = frozenset(end for end in ends if end[1] != NO_OBLIGATIONS)
            others = {oid: states for oid, states in groups.items() if oid}
            if ends or others:
                other[s] = (ends, others)
        return _Moves(plain, other, enders)

    def move(self, moves: _Moves, sid: int) -> tuple:
        """What a state set reaches under one class, leaving aside the obligations its
        threads carried: (plain end?, other ends, ((extra set, state set id), ...)),
        memoised (state sets recur with many obligation sets)."""
        hit = moves.moved.get(sid)
        if hit is None:
            hit = moves.moved[sid] = self.reach(moves, sid)
        return hit

    def reach(self, moves: _Moves, sid: int) -> tuple:
        """``move`` without the memo."""
        states = self.state_sets[sid]
        plain = frozenset().union(*filter(None, map(moves.plain.get, states)))
        groups: dict[int, set] = {NO_OBLIGATIONS: set(plain)} if plain else {}
        ends = set()
        for s in moves.movers.intersection(states):
            found, reached = moves.other[s]
            ends |= found
            for oid, targets in reached.items():
                groups.setdefault(oid, set()).update(targets)
        if len(groups) > 1:
            groups = self.sets.prune(groups)
        return (not moves.enders.isdisjoint(states), frozenset(ends),
                tuple(sorted((oid, self.intern(frozenset(targets))) for oid, targets in groups.items())))

    def step(self, config: tuple, c: int):
        back = self.lookback.next(config[1], c)
        moves = self.table(c, back)
        keep = back if self.stored else 0
        if len(config) == 3 and not config[2][0] and not self.recording:
            states = self.state_sets[config[2][1]]
            if moves.movers.isdisjoint(states):  # plain threads that stay plain: the subset step
                plain = frozenset().union(*filter(None, map(moves.plain.get, states)))
                ending = not moves.enders.isdisjoint(states)
                if not plain:
                    return (True, keep) if ending else None
                if self.sink is not None and self.nfa.final in plain:
                    return self.sink
                known = self.states_id.ids.get(plain)
                return (ending, keep, (NO_OBLIGATIONS, self.intern(plain) if known is None else known))
        return self.general_step(config, c, moves, keep)

    def general_step(self, config: tuple, c: int, moves: _Moves, keep: int):
        sets = self.sets
        pieces: dict[int, int] = {}
        ending = frozenset() if self.recording else False
        for oid, sid in config[2:]:
            carried = sets.advance(oid, c) if oid else NO_OBLIGATIONS
            if carried is BLOCKED:
                continue
            plain_end, ends, groups = self.move(moves, sid)
            if self.recording:
                ending = ending | self.ending(ends, carried)
            elif not ending and (plain_end or ends):
                ending = sets.satisfied(carried) and (plain_end or any(sets.satisfied(e) for _, e in ends))
            for extra, states in groups:
                key = sets.union(carried, extra)
                before = pieces.get(key)
                pieces[key] = states if before is None else self.union_states(before, states)
        if not pieces:
            return (ending, keep) if ending else None
        if self.sink is not None and NO_OBLIGATIONS in pieces \
                and self.nfa.final in self.state_sets[pieces[NO_OBLIGATIONS]]:
            return self.sink
        config = (ending, keep, *sorted(pieces.items()))
        return self.pruned(config) if len(config) > 3 else config

    def union_states(self, a: int, b: int) -> int:
        key = (a, b) if a < b else (b, a)
        hit = self.unions.get(key)
        if hit is None:
            hit = self.unions[key] = self.intern(self.state_sets[a] | self.state_sets[b])
        return hit

    def pruned(self, config: tuple) -> tuple:
        """A configuration of several groups with subsumed threads dropped (memoised)."""
        hit = self.prunes.get(config)
        if hit is None:
            groups = {oid: self.state_sets[sid] for oid, sid in config[2:]}
            hit = self.prunes[config] = self.configuration(config[0], config[1], groups, stored=True)
        return hit

    def configuration(self, ending, back: int, groups: dict, stored: bool = False):
        """The canonical configuration of the ending and the threads by obligation set."""
        if self.sink is not None and self.nfa.final in groups.get(NO_OBLIGATIONS, ()):
            return self.sink
        if len(groups) > 1:
            groups = self.sets.prune(groups)
        if not groups and not ending:
            return None
        keep = back if stored or self.stored else 0
        return (ending, keep, *sorted((oid, self.intern(frozenset(states)))
                                      for oid, states in groups.items()))

    def is_accepting(self, config) -> bool:
        if config[0]:
            return True
        if not self.final_moves:
            return False
        final, satisfied = self.nfa.final, self.sets.satisfied
        return any(final in self.state_sets[sid] and satisfied(oid) for oid, sid in config[2:])
