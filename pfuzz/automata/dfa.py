"""Deterministic finite automata over symbol classes: the value, its construction, minimisation.

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
- ``minimise``: trimming (drop states that cannot reach acceptance), then
  partition refinement on the completed automaton. Moore's refinement (1956),
  vectorised with numpy one class column per pass, runs first: it needs one
  round per symbol of the longest shortest distinguishing suffix, so it is the
  fast choice for the wide automata patterns produce. When its rounds exceed a
  budget (long chains), Hopcroft's algorithm, "An n log n algorithm for
  minimizing states in a finite automaton" (1971), takes over. The dead block
  is dropped afterwards, which handles partial DFAs (Valmari & Lehtinen,
  STACS 2008) the simple way, at the cost of one extra state. Classes that
  every state treats alike are then merged, and states renumbered
  canonically (breadth-first from the start, classes in order of their
  smallest character), so equal languages over equal alphabets give equal
  values.
- ``from_strings``: the trie of a finite set of words, explored and minimised.

Cost: ``explore`` is O(states × classes) steps in pure Python (about a
microsecond per table cell); Moore's refinement is O(rounds × n × k) numpy
work, Hopcroft's O(k n log n) pure Python. The 2**17-state automaton of
``(a|b)*a(a|b){16}`` minimises in under a second.
"""

from __future__ import annotations

import bisect
from collections import deque
from dataclasses import dataclass, field
from typing import Callable, Container, Hashable, Iterable, Optional

from pfuzz.base.charset import CharSet, partition
from pfuzz.errors import StateLimitError

#: The most DFA states any construction may build before it stops with an error.
DEFAULT_STATE_CAP = 2**18

DEAD = -1


@dataclass(frozen=True, eq=False)
class DFA:
    """A partial DFA over disjoint symbol classes that partition ``alphabet``."""

    alphabet: CharSet
    classes: tuple[CharSet, ...]
    table: tuple[tuple[int, ...], ...]
    accepting: frozenset[int]
    _index: tuple = field(default=(), repr=False, compare=False)

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
        """The state reached after reading ``text`` (-1 once dead)."""
        table = self.table
        for ch in text:
            if state < 0:
                return DEAD
            c = self.class_of(ch)
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
    def live_states(self) -> set[int]:
        """States from which some accepting state is reachable."""
        preds: list[list[int]] = [[] for _ in self.table]
        for s, row in enumerate(self.table):
            for t in row:
                if t >= 0:
                    preds[t].append(s)
        live = set(self.accepting)
        stack = list(live)
        while stack:
            for p in preds[stack.pop()]:
                if p not in live:
                    live.add(p)
                    stack.append(p)
        return live

    def is_empty(self) -> bool:
        return 0 not in self.live_states()


def transitions(dfa: DFA, live: Optional[Container[int]] = None) -> list[list[tuple[CharSet, int]]]:
    """Per state, its transitions merged per target: (characters, target), by least character.

    The dead state is left out, and so is every target outside ``live`` when it
    is given. This is the one place where a row over symbol classes becomes one
    character set per target state.
    """
    classes = dfa.classes
    out = []
    for row in dfa.table:
        groups: dict[int, list[CharSet]] = {}
        for c, t in enumerate(row):
            if t >= 0 and (live is None or t in live):
                groups.setdefault(t, []).append(classes[c])
        edges = [(sets[0] if len(sets) == 1 else CharSet.of(r for cs in sets for r in cs.ranges), t)
                 for t, sets in groups.items()]
        edges.sort(key=lambda edge: edge[0].min)
        out.append(edges)
    return out


# -- construction --------------------------------------------------------------

def explore(
    start: Hashable,
    step: Callable[[Hashable, int], Optional[Hashable]],
    is_accepting: Callable[[Hashable], bool],
    classes: Iterable[CharSet],
    alphabet: CharSet,
    cap: int = DEFAULT_STATE_CAP,
) -> DFA:
    """Build the DFA reachable from ``start`` (subset construction, generalised).

    ``step(config, class_index)`` returns the next configuration or None for
    the dead state. Configurations must be hashable; equal ones become one
    state. Raises ``StateLimitError`` past ``cap`` states.
    """
    classes = tuple(classes)
    number = {start: 0}
    configs = [start]
    rows: list[tuple[int, ...]] = []
    accepting = set()
    k = len(classes)
    i = 0
    while i < len(configs):
        config = configs[i]
        if is_accepting(config):
            accepting.add(i)
        row = []
        for c in range(k):
            nxt = step(config, c)
            if nxt is None:
                row.append(DEAD)
                continue
            j = number.get(nxt)
            if j is None:
                j = len(configs)
                if j >= cap:
                    raise StateLimitError(
                        f"the automaton needs more than {cap:,} states (the state cap); "
                        "simplify the pattern or raise the cap"
                    )
                number[nxt] = j
                configs.append(nxt)
            row.append(j)
        rows.append(tuple(row))
        i += 1
    return DFA(alphabet, classes, tuple(rows), frozenset(accepting))


def empty(alphabet: CharSet) -> DFA:
    """The DFA of the empty language over ``alphabet``."""
    classes = (alphabet,) if alphabet else ()
    return DFA(alphabet, classes, ((DEAD,) * len(classes),), frozenset())


def universal(alphabet: CharSet) -> DFA:
    """The DFA of alphabet* (every string)."""
    classes = (alphabet,) if alphabet else ()
    return DFA(alphabet, classes, ((0,) * len(classes),), frozenset({0}))


def from_strings(strings: Iterable[str], alphabet: CharSet) -> DFA:
    """The minimal DFA of a finite set of strings (those inside the alphabet)."""
    words = [w for w in strings if all(ch in alphabet for ch in w)]
    chars = {ord(ch) for w in words for ch in w}
    classes = partition([CharSet.single(p) for p in chars], alphabet)
    probe = [c.min for c in classes]

    def step(prefix, c):
        nxt = prefix + chr(probe[c])
        return nxt if any(w.startswith(nxt) for w in words) else None

    return minimise(explore("", step, lambda p: p in words, classes, alphabet))


# -- minimisation ---------------------------------------------------------------

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
#: repeats such as [a-z0-9]{1,2048} need one round per state; measured: 143 ms -> 13 ms).
MOORE_ROUNDS = 64


def minimise(dfa: DFA) -> DFA:
    """The canonical minimal partial DFA of the same language."""
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
