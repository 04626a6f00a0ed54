"""Deterministic finite automata over symbol classes: the value and its construction.

A ``DFA`` is an immutable value: an alphabet (the alphabet, a ``CharSet``), a
partition of that alphabet into disjoint symbol classes, and a *partial*
transition table ``table[state][class] -> state`` where ``-1`` is the implicit
dead state. State 0 is the start state. Working over classes instead of
characters keeps ``[^x]`` or ``\\w`` over all of Unicode at a handful of
columns. Products, complement, concatenation and the length questions live in
``pfuzz.automata.algebra``.

Constructions, each with its source:

- ``explore``: the subset construction of Rabin & Scott (1959), written over
  arbitrary hashable configurations so that callers (the pattern compiler, the
  edit-neighbourhood builder, products) supply only a step function. States
  are numbered in breadth-first order, so results are deterministic.

Cost: ``explore`` is O(states × classes) steps in pure Python (about a
microsecond per table cell); Moore's refinement is O(rounds × n × k) numpy
work, Hopcroft's O(k n log n) pure Python. The 2**17-state automaton of
``(a|b)*a(a|b){16}`` minimises in under a second.
"""

from __future__ import annotations

import bisect
from dataclasses import dataclass, field
from typing import Callable, Container, Hashable, Iterable, Optional

from pfuzz.base.charset import CharSet
from pfuzz.errors import StateLimitError

#: The most DFA states any construction may build before it stops with an error.
DEFAULT_STATE_CAP = 2**18

DEAD = -1
#: Characters whose class one automaton remembers for ``DFA.run``.
SEEN_LIMIT = 1 << 16


@dataclass(frozen=True, eq=False)
class DFA:
    """A partial DFA over disjoint symbol classes that partition ``alphabet``."""

    alphabet: CharSet
    classes: tuple[CharSet, ...]
    table: tuple[tuple[int, ...], ...]
    accepting: frozenset[int]
    _index: tuple = field(default=(), repr=False, compare=False)
    _seen: dict = field(default_factory=dict, repr=False, compare=False)  # character → class

    def __post_init__(self):
        starts, owners = [], []
        for c, cls in enumerate(self.classes):
            for lo, hi in cls.ranges:
                starts.append(lo)
                owners.append((lo, hi, c))
        order = sorted(range(len(starts)), key=starts.__getitem__)
        object.__setattr__(
            self, "_index", (tuple(starts[i] for i in order), tuple(owners[i] for i in order))
        )

    # -- basic queries --------------------------------------------------------
    @property
    def n_states(self) -> int:
        return len(self.table)

    @property
    def start(self) -> int:
        return 0

    def class_of(self, char: str | int) -> int:
        """Index of the class holding ``char``, or -1 when it is outside the alphabet."""
        point = char if isinstance(char, int) else ord(char)
        starts, owners = self._index
        i = bisect.bisect_right(starts, point) - 1
        if i >= 0:
            lo, hi, c = owners[i]
            if lo <= point <= hi:
                return c
        return -1

    def run(self, text: str, state: int = 0) -> int:
        """The state reached after reading ``text`` (-1 once dead). Classes of the characters
        met are remembered (up to ``SEEN_LIMIT`` of them): a dictionary lookup instead of a
        binary search per character, which matters for long strings over wide alphabets."""
        table, seen = self.table, self._seen
        for ch in text:
            if state < 0:
                return DEAD
            c = seen.get(ch)
            if c is None:
                c = self.class_of(ch)
                if len(seen) < SEEN_LIMIT:
                    seen[ch] = c
            if c < 0:
                return DEAD
            state = table[state][c]
        return state

    def accepts(self, text: str) -> bool:
        return self.run(text) in self.accepting

    def signature(self) -> tuple:
        """A hashable value equal for equal (canonical) automata."""
        return (self.alphabet.ranges, tuple(c.ranges for c in self.classes), self.table,
                tuple(sorted(self.accepting)))

    def __eq__(self, other):
        return isinstance(other, DFA) and self.signature() == other.signature()

    def __hash__(self):
        return hash(self.signature())

    # -- structure ------------------------------------------------------------
    def predecessors(self) -> list[set[int]]:
        """``predecessors()[t]``: the states with a move into ``t`` (the dead state has none)."""
        preds: list[set[int]] = [set() for _ in self.table]
        for s, row in enumerate(self.table):
            for t in row:
                if t >= 0:
                    preds[t].add(s)
        return preds

    def live_states(self) -> set[int]:
        """States from which some accepting state is reachable."""
        return reachable(self.predecessors(), self.accepting)

    def is_empty(self) -> bool:
        return 0 not in self.live_states()


def transitions(dfa: DFA, live: Optional[Container[int]] = None) -> list[list[tuple[CharSet, int]]]:
    """Per state, its transitions merged per target: (characters, target), by least character.

    The dead state is left out, and so is every target outside ``live`` when it
    is given. This is the one place where a row over symbol classes becomes one
    character set per target state.
    """
    classes = dfa.classes
    merged: dict[tuple[int, ...], CharSet] = {}  # rows share groupings: merge each once
    out = []
    for row in dfa.table:
        groups: dict[int, list[int]] = {}
        for c, t in enumerate(row):
            if t >= 0 and (live is None or t in live):
                groups.setdefault(t, []).append(c)
        edges = []
        for t, members in groups.items():
            key = tuple(members)
            chars = merged.get(key)
            if chars is None:
                chars = merged[key] = classes[members[0]] if len(members) == 1 else \
                    CharSet.of(r for c in members for r in classes[c].ranges)
            edges.append((chars, t))
        edges.sort(key=lambda edge: edge[0].min)
        out.append(edges)
    return out


def reachable(edges, seeds) -> set[int]:
    """Every node reachable from ``seeds`` along ``edges`` (``edges[n]``: the nodes after n)."""
    found = set(seeds)
    stack = list(found)
    while stack:
        for node in edges[stack.pop()]:
            if node not in found:
                found.add(node)
                stack.append(node)
    return found


# -- construction --------------------------------------------------------------

def explore(
    start: Hashable,
    step: Callable[[Hashable, int], Optional[Hashable]],
    is_accepting: Callable[[Hashable], bool],
    classes: Iterable[CharSet],
    alphabet: CharSet,
    cap: int = DEFAULT_STATE_CAP,
    weigh: Optional[Callable[[Hashable], None]] = None,
) -> DFA:
    """Build the DFA reachable from ``start`` (subset construction, generalised).

    ``step(config, class_index)`` returns the next configuration or None for
    the dead state. Configurations must be hashable; equal ones become one
    state. Raises ``StateLimitError`` past ``cap`` states. ``weigh``, when
    given, is called with each new configuration (it may raise to stop).
    """
    classes = tuple(classes)
    k = len(classes)
    number = {start: 0}
    configs = [start]
    cells: list[int] = []  # the table, row after row
    add, find, letters = cells.append, number.get, range(k)
    for config in configs:  # grows while it is read: breadth-first order
        for c in letters:
            nxt = step(config, c)
            if nxt is None:
                add(DEAD)
                continue
            j = find(nxt)
            if j is None:
                j = number[nxt] = len(configs)
                configs.append(nxt)
                if weigh is not None:
                    weigh(nxt)
                if j >= cap:
                    raise StateLimitError(
                        f"the automaton needs more than {cap:,} states (the state cap); "
                        "simplify the pattern or raise the cap"
                    )
            add(j)
    accepting = frozenset(i for i, config in enumerate(configs) if is_accepting(config))
    columns = [iter(cells)] * k
    table = tuple(zip(*columns)) if k else ((),) * len(configs)
    return DFA(alphabet, classes, table, accepting)


def empty(alphabet: CharSet) -> DFA:
    """The DFA of the empty language over ``alphabet``."""
    classes = (alphabet,) if alphabet else ()
    return DFA(alphabet, classes, ((DEAD,) * len(classes),), frozenset())


def universal(alphabet: CharSet) -> DFA:
    """The DFA of alphabet* (every string)."""
    classes = (alphabet,) if alphabet else ()
    return DFA(alphabet, classes, ((0,) * len(classes),), frozenset({0}))
