"""Registers: what a pattern's groups captured, carried through the NFA by expansion.

A backreference or a conditional makes the language depend on which way a match
went. pfuzz keeps that finite: a *memory* holds, for each group something refers
to, whether it has captured and, for a group a backreference reads, the symbol
classes it captured (a group of bounded width has finitely many); for each of
``re``'s zero-width guards in progress, whether the current copy has read a
character. ``expand`` then builds the plain NFA whose states are (NFA state,
memory) pairs reachable from the start (the product construction): a group's
open and close, a guard's begin, test and end become ε-edges that change the
memory, a conditional an ε-edge to the branch the memory selects, a
backreference a chain of character edges that read what the group captured, and
a character edge read inside a capturing group splits by the class it records.

What ``re`` does is followed to the letter (CPython's ``sre``): a group keeps the
capture of the last copy that passed through it; a backreference to a group that
has not captured fails; under IGNORECASE a backreference compares characters by
``re``'s lower-casing (``_sre.unicode_tolower``, or ``ascii_tolower`` under ASCII),
not by the case folding of literals, so ``(?i)(s)\\1`` refuses "sſ" though
``(?i)s`` matches "ſ"; a conditional inside its own group sees the group as
captured only when the group reopened right where it last closed (``sre``
compares the new start mark with the old end mark).

Each state keeps only the registers a run from it may still read (``live_groups``, a
backward liveness fixpoint), and states from which no final state can be reached are
cut, so threads that differ only in what no later step reads are one thread: a search
for ``\\d{4}([-/.])\\d{2}\\1\\d{2}`` does not carry every separator it has seen.

Cost: the expanded NFA has one state per reachable (state, memory) pair; it is
bounded by ``limit`` (``StateLimitError``). Memories are interned and their
operations memoised.
"""

from __future__ import annotations

from collections import deque
from dataclasses import dataclass
from typing import Callable, Hashable

from pfuzz.automata.construction.obligations import Interned
from pfuzz.automata.dfa import reachable
from pfuzz.automata.nfa import (ASSERT, BACKREF, CHAR, CLOSE, CONDITION, EPSILON, FINAL, LOOP_BEGIN,
                                LOOP_END, LOOP_TEST, NFA, OPEN, Priority, make_any_suffix)
from pfuzz.errors import StateLimitError

#: The register of a group that has not captured: (value, partial, bit).
UNSET = (None, None, False)
#: A lookbehind's own group before the lookbehind sets it (kept as it was outside).
UNTOUCHED = ("untouched", None, False)


@dataclass(frozen=True)
class Layout:
    """The groups a compilation keeps registers for."""

    groups: tuple[int, ...]
    valued: frozenset[int] = frozenset()
    adjacency: frozenset[int] = frozenset()


@dataclass(frozen=True, eq=False)
class PriorityCheck:
    """Assertion label of an expanded NFA: no run from ``targets`` (NFA states of ``nfa``,
    with memory ``memory``) reaches the end of atomic scope ``scope``."""

    nfa: NFA
    scope: int
    targets: tuple[int, ...]
    memory: int

    def __eq__(self, other):
        return (isinstance(other, PriorityCheck) and self.nfa is other.nfa and self.scope == other.scope
                and self.targets == other.targets and self.memory == other.memory)

    def __hash__(self):
        return hash((id(self.nfa), self.scope, self.targets, self.memory))


class Registers:
    """Interned memories (group registers, guard flags) and their operations.

    A group register is (value, partial, bit): ``value`` None (not captured), True
    (captured; its text unused) or the tuple of classes captured; ``partial`` None
    when closed, else what the open group has read so far; ``bit`` for a group that a
    conditional inside it reads: while closed, "nothing read since it closed", while
    open, "reopened where it last closed". Guards are sorted (loop, flag) pairs."""

    def __init__(self, layout: Layout, keys: dict[int, tuple]):
        self.layout = layout
        self.keys = keys  # backreference comparison key of each class, by flags
        self.slot = {group: i for i, group in enumerate(layout.groups)}
        self.memories = Interned(((UNSET,) * len(layout.groups), ()))
        self.values = self.memories.values
        self.memo: dict[tuple, int] = {}
        self.matching: dict[tuple, frozenset] = {}

    def _remember(self, key: tuple, make: Callable[[], tuple]) -> int:
        hit = self.memo.get(key)
        if hit is None:
            hit = self.memo[key] = self.memories(make())
        return hit

    def _set_group(self, mid: int, group: int, register: tuple) -> tuple:
        groups, loops = self.values[mid]
        i = self.slot[group]
        return groups[:i] + (register,) + groups[i + 1:], loops

    # -- groups ------------------------------------------------------------------------
    def open(self, mid: int, group: int) -> int:
        def make():
            value, _, bit = self.values[mid][0][self.slot[group]]
            partial = () if group in self.layout.valued else True
            adjacent = value is not None and bit if group in self.layout.adjacency else False
            return self._set_group(mid, group, (value, partial, adjacent))
        return self._remember(("open", mid, group), make)

    def close(self, mid: int, group: int) -> int:
        def make():
            _, partial, _ = self.values[mid][0][self.slot[group]]
            return self._set_group(mid, group, (partial, None, group in self.layout.adjacency))
        return self._remember(("close", mid, group), make)

    def is_set(self, mid: int, group: int) -> bool:
        value, partial, bit = self.values[mid][0][self.slot[group]]
        if value is UNTOUCHED[0]:
            return False
        return value is not None if partial is None else bit

    def value(self, mid: int, group: int):
        value, partial, _ = self.values[mid][0][self.slot[group]]
        return value if partial is None and value is not UNTOUCHED[0] else None

    def matches(self, captured: int, flags: int) -> frozenset:
        """The classes a backreference with ``flags`` accepts where the group read ``captured``."""
        hit = self.matching.get((captured, flags))
        if hit is None:
            keys = self.keys[flags]
            hit = frozenset(c for c, key in enumerate(keys) if key == keys[captured])
            self.matching[(captured, flags)] = hit
        return hit

    # -- reading ----------------------------------------------------------------------
    def reads(self, mid: int, label: frozenset) -> list[tuple[int, frozenset]]:
        """The memories after reading each class of ``label``, with the classes that give each."""
        groups, _ = self.values[mid]
        if not any(type(partial) is tuple for _, partial, _ in groups):
            return [(self.read(mid, next(iter(label))), label)] if label else []
        found: dict[int, set] = {}
        for c in label:
            found.setdefault(self.read(mid, c), set()).add(c)
        return [(after, frozenset(classes)) for after, classes in found.items()]

    def read(self, mid: int, c: int) -> int:
        def make():
            groups, loops = self.values[mid]
            moved = tuple((value, partial + (c,), bit) if type(partial) is tuple
                          else (value, partial, bit and partial is not None)
                          for value, partial, bit in groups)
            return moved, tuple((loop, 1) for loop, _ in loops)
        return self._remember(("read", mid, c), make)

    # -- zero-width guards --------------------------------------------------------------
    def begin(self, mid: int, loop: int) -> int:
        def make():
            groups, loops = self.values[mid]
            return groups, tuple(sorted({**dict(loops), loop: 0}.items()))
        return self._remember(("begin", mid, loop), make)

    def end(self, mid: int, loop: int) -> int:
        def make():
            groups, loops = self.values[mid]
            return groups, tuple(pair for pair in loops if pair[0] != loop)
        return self._remember(("end", mid, loop), make)

    def has_read(self, mid: int, loop: int) -> bool:
        return dict(self.values[mid][1]).get(loop, 1) == 1

    # -- lookarounds -----------------------------------------------------------------
    def given(self, mid: int) -> int:
        """The memory a lookaround's body starts from: the groups, no guards."""
        return self.memories((self.values[mid][0], ()))

    def outcome(self, mid: int, groups: tuple[int, ...]) -> tuple:
        """What a lookaround's body captured in ``groups``: (group, register) pairs."""
        registers = self.values[mid][0]
        found = []
        for group in groups:
            value, partial, _ = registers[self.slot[group]]
            if value is not UNTOUCHED[0]:
                found.append((group, (value, partial, False)))
        return tuple(found)

    def apply(self, mid: int, outcome: tuple) -> int:
        groups, loops = self.values[mid]
        groups = list(groups)
        for group, register in outcome:
            groups[self.slot[group]] = register
        return self.memories((tuple(groups), loops))

    def restrict(self, mid: int, live: frozenset) -> int:
        """The memory with the groups outside ``live`` forgotten (no later step reads them)."""
        def make():
            groups, loops = self.values[mid]
            return tuple(r if g in live else UNSET for g, r in zip(self.layout.groups, groups)), loops
        return self._remember(("restrict", mid, live), make)

    def with_groups(self, registers: dict[int, tuple]) -> int:
        """The memory whose groups have ``registers`` (others unset) and no guards."""
        return self.memories((tuple(registers.get(g, UNSET) for g in self.layout.groups), ()))


Lookarounds = Callable[[Hashable, int], list]


def expand(nfa: NFA, registers: Registers, starts: list[tuple[int, int]], stop: int,
           accept: Callable[[int], Hashable | None], lookarounds: Lookarounds, *, n_classes: int,
           limit: int, any_suffix: bool = False, recording: bool = False,
           ignored: int | None = None, live: list[frozenset] | None = None) -> NFA:
    """The plain NFA of the (state, memory) pairs reachable from ``starts`` up to ``stop``.

    At ``stop`` with memory m the run ends if ``accept(m)`` is not None: all accepted
    runs share one final state, or, with ``recording``, one FINAL state per distinct
    ``accept(m)``, which becomes its label. ``lookarounds(node, m)`` gives the
    (label, memory after) pairs of a lookaround edge. The Priority assertions of
    scope ``ignored`` become plain ε-edges: whether some run from a point of a scope
    reaches its end does not depend on them (the first such run in ``re``'s order
    satisfies them all), while the scopes nested inside still restrict the runs. With
    ``live`` (of ``live_groups``), each state keeps only the registers it may still read."""
    return _Expander(nfa, registers, stop, accept, lookarounds, limit, ignored, live).run(
        starts, n_classes, any_suffix, recording)


class _Expander:
    def __init__(self, nfa, registers, stop, accept, lookarounds, limit, ignored, live):
        self.nfa, self.registers, self.stop = nfa, registers, stop
        self.accept, self.lookarounds, self.limit = accept, lookarounds, limit
        self.ignored, self.live = ignored, live
        self.kinds: list[str] = []
        self.labels: list = []
        self.targets: list[list[int]] = []
        self.ids: dict[tuple, int] = {}
        self.queue: deque = deque()
        self.finals: dict[Hashable, int] = {}

    def new(self, kind: str = EPSILON, label=None, targets=None) -> int:
        if len(self.kinds) >= self.limit:
            raise StateLimitError(
                f"what the pattern's groups capture needs more than {self.limit:,} automaton "
                "states before determinisation; simplify the pattern or raise the cap")
        self.kinds.append(kind)
        self.labels.append(label)
        self.targets.append(list(targets or ()))
        return len(self.kinds) - 1

    def node(self, state: int, mid: int, progress: int = 0) -> int:
        if self.live is not None:
            mid = self.registers.restrict(mid, self.live[state])
        key = (state, mid, progress)
        found = self.ids.get(key)
        if found is None:
            found = self.ids[key] = self.new()
            self.queue.append(key)
        return found

    def run(self, starts, n_classes: int, any_suffix: bool, recording: bool) -> NFA:
        start = self.new(targets=[self.node(s, m) for s, m in starts])
        while self.queue:
            key = self.queue.popleft()
            self.visit(self.ids[key], *key, recording)
        final = self.finals.get(True, None) if not recording else None
        if final is None:
            final = self.new(FINAL)
        self.trim()
        if any_suffix:
            make_any_suffix(self.kinds, self.labels, self.targets, final, n_classes)
        return NFA(tuple(self.kinds), tuple(self.labels), tuple(map(tuple, self.targets)), start, final)

    def trim(self) -> None:
        """Cut the edges into states from which no final state can be reached (a reference to
        a group that did not capture, a branch a memory rules out): fewer threads to carry."""
        back: list[list[int]] = [[] for _ in self.kinds]
        for s, targets in enumerate(self.targets):
            for t in targets:
                back[t].append(s)
        live = reachable(back, (s for s, kind in enumerate(self.kinds) if kind == FINAL))
        for s, targets in enumerate(self.targets):
            if any(t not in live for t in targets):
                targets[:] = [t for t in targets if t in live]
                if not targets and self.kinds[s] in (CHAR, ASSERT):
                    self.kinds[s], self.labels[s] = EPSILON, None

    def final(self, outcome: Hashable, recording: bool) -> int:
        key = outcome if recording else True
        if key not in self.finals:
            self.finals[key] = self.new(FINAL, outcome if recording else None)
        return self.finals[key]

    def visit(self, here: int, state: int, mid: int, progress: int, recording: bool) -> None:
        nfa, registers = self.nfa, self.registers
        kind, label, targets = nfa.kinds[state], nfa.labels[state], nfa.targets[state]
        out = self.targets[here]
        if state == self.stop:
            outcome = self.accept(mid)
            if outcome is not None:
                out.append(self.final(outcome, recording))
        elif kind == CHAR:
            self.reading(here, registers.reads(mid, label), targets[0], 0)
        elif kind == EPSILON:
            out.extend(self.node(t, mid) for t in targets)
        elif kind == ASSERT:
            self.assertion(here, label, mid, targets[0])
        elif kind == BACKREF:
            self.backreference(here, state, label, mid, progress)
        elif kind == CONDITION:
            out.append(self.node(targets[0] if registers.is_set(mid, label) else targets[1], mid))
        elif kind == LOOP_TEST:
            out.append(self.node(targets[0] if registers.has_read(mid, label) else targets[1], mid))
        elif kind in (OPEN, CLOSE, LOOP_BEGIN, LOOP_END):
            operation = {OPEN: registers.open, CLOSE: registers.close,
                         LOOP_BEGIN: registers.begin, LOOP_END: registers.end}[kind]
            out.append(self.node(targets[0], operation(mid, label)))

    def reading(self, here: int, reads: list, target: int, progress: int, state: int | None = None) -> None:
        """Character edges from ``here``: one, or one per memory the classes lead to."""
        edges = [(self.node(target if state is None else state, after, progress), classes)
                 for after, classes in reads]
        if len(edges) == 1:
            self.kinds[here], self.labels[here] = CHAR, edges[0][1]
            self.targets[here].append(edges[0][0])
            return
        for target_id, classes in edges:
            self.targets[here].append(self.new(CHAR, classes, [target_id]))

    def assertion(self, here: int, label, mid: int, target: int) -> None:
        if isinstance(label, Priority) and label.scope == self.ignored:
            self.targets[here].append(self.node(target, mid))
            return
        if isinstance(label, Priority):
            check = PriorityCheck(self.nfa, label.scope, label.targets, mid)
            pairs = [(check, mid)]
        else:
            pairs = self.lookarounds(label, mid)
        out = self.targets[here]
        if len(pairs) == 1:
            self.kinds[here], self.labels[here] = ASSERT, pairs[0][0]
            out.append(self.node(target, pairs[0][1]))
            return
        for check, after in pairs:
            out.append(self.new(ASSERT, check, [self.node(target, after)]))

    def backreference(self, here: int, state: int, node, mid: int, progress: int) -> None:
        value = self.registers.value(mid, node.index)
        if value is None:
            return  # the group has not captured: the reference fails
        if value is True:
            raise TypeError("a backreference reads a group whose text is not kept")
        if progress == len(value):
            self.targets[here].append(self.node(self.nfa.targets[state][0], mid))
            return
        label = self.registers.matches(value[progress], node.flags)
        self.reading(here, self.registers.reads(mid, label), 0, progress + 1, state)
