"""The edit-neighbourhood automaton of a DFA, determinised: N_d(L) − L as a DFA.

Construction. Reading a string s, the automaton follows every alignment of
s against a path w through L's minimal DFA at once. A configuration holds,
for every cost e <= d, the set R_e of DFA states reachable by an alignment
of cost <= e (an int bitset), plus the pending halves of transpositions:
for each e < d, a swap table giving, for every class x of the next
character, the states where a swap begun in R_e ends (at cost e + 1): w
reads x then the character just read, s the other way round. Tables are
interned and a configuration holds their numbers, so pending swaps with the
same effect make one configuration (a third fewer configurations than
keeping the class read and the set where the swap began). One step on a
character of class c follows a match (R_e under c), a substitution
(R_{e-1} under any class), an extra character in s (R_{e-1} unchanged), the
end of a pending swap (the table's entry for c), and then characters of w
that s lacks (ε-moves under any class, one cost each). The start
configuration is closed under those too. The configurations are determinised
by ``pfuzz.automata.dfa.explore`` (the subset construction, Rabin & Scott 1959) and
minimised by ``pfuzz.automata.minimise.minimise`` (Hopcroft 1971). R_0 is L's own run, so
"s is not in L" is read off the same configuration: the product with the
complement of L is folded in rather than built as a second product.

Why the DFA's own symbol classes suffice. A substitution with a character
of the class it replaces (or with the very same character), or a swap of two
equal characters or of two characters of one class, leads the DFA to the
same state as plain matches at a higher cost. Such moves are dominated by
the cheaper matches, so allowing them never changes which strings lie within
distance d. Only "which class did the witness read" matters, and that is
what the transitions carry. ``tests/external/test_nearmiss_bruteforce.py``
checks the result against the definition with ``re`` and an OSA program.

Antichains. A state q in R_e (e >= 1) adds nothing when R_e also holds a
state p that simulates q for the edits still allowed from there, so each
such set is cut to its maximal states (``pfuzz.automata.simulation``, after De Wulf,
Doyen, Henzinger & Raskin, CAV 2006). From R_d no edit is left, so there
the preorder is language inclusion, L_q ⊆ L_p, in every mode. Below d it is
inclusion too, except in edges mode, where what may be written depends on
the state's transition labels and not only on its language: there R_e is
cut by the simulation graded by the d − e edits left, which also matches
written characters and insertion points (an edit's target one grade
down). The cut leaves the language unchanged (the configurations
stand for the same future) and makes far fewer configurations: 5,980
instead of more than 262,144 for the 968-state password field of
``profiles/password-policy.toml`` at distance 2. R_0 is never cut (it
decides membership in L). The simulation's matrices are quadratic in the
states, so a DFA of more than ``SIMULATION_STATES`` states is not cut at all
(same language, more configurations, still bounded by the state cap).

Range edges. For every live transition q → t of the minimal DFA, its label
(the union of the classes leading from q to t) is a set of code-point
ranges; the characters lo−1 and hi+1 just outside each range (within U) are
the classic off-by-one values. In edges mode a substitution may write only
an edge character of the transition it replaces, and an extra character
only an edge character of some transition leaving the state where it
stands; the other edits, which write no new character, are unchanged. The
classes are refined so that each edge character is a class of its own, and
refined classes that act alike merged again.

Cost: configurations are tuples of 2d + 1 ints; a step costs O(d) memoised
lookups (set images per class and set, cuts per set). Before minimisation
the automaton has one state per distinct configuration, in practice 1.0 to
3 times the minimal near-miss DFA (3,084 configurations for the 2,819-state
distance-1 language of the password field above, 17,602 for its
13,767-state edges-mode language). Edges mode at distance 2 is the costly
case, because the simulation that respects transition labels cuts little:
235,000 configurations for that field (74,934 minimal states). Build times:
``python -m pfuzz.benchmarks components``. Exponential blow-up is possible in principle
(bounded repeats on both sides of overlapping separators come close: a
bounded e-mail pattern has a 9,500-state minimal near-miss DFA at distance
1), and the state cap of ``explore`` guards against it.
"""

from __future__ import annotations

from pfuzz.base.charset import CharSet, partition
from pfuzz.automata.dfa import DEFAULT_STATE_CAP, DFA, explore, transitions
from pfuzz.automata.minimise import minimise


#: Automata of more states are not cut by simulation: its boolean matrices hold (n + 1)²
#: cells, a few copies at once. Uncut sets keep the language (the cut only saves
#: configurations), and the state cap still bounds the construction.
SIMULATION_STATES = 6_000


def simulation(*args, **options):
    """``pfuzz.automata.simulation.simulation``, imported on first use (it needs numpy)."""
    from pfuzz.automata import simulation as module
    return module.simulation(*args, **options)


def beaten(sim):
    """``pfuzz.automata.simulation.beaten``, imported on first use (it needs numpy)."""
    from pfuzz.automata import simulation as module
    return module.beaten(sim)

#: The edit kinds, as edits that turn a valid string into a reject.


class _Images:
    """Images of state sets (int bitsets) under per-class relations, memoised."""

    def __init__(self, columns: list[list[int]]):
        self.columns = columns  # columns[c][q]: bitset of the states q relates to under c
        self.memo: list[dict[int, int]] = [{} for _ in columns]

    def __call__(self, c: int, states: int) -> int:
        hit = self.memo[c].get(states)
        if hit is not None:
            return hit
        column = self.columns[c]
        out, rest = 0, states
        while rest:
            low = rest & -rest
            out |= column[low.bit_length() - 1]
            rest ^= low
        self.memo[c][states] = out
        return out


class _Cut:
    """The maximal states of a set under a preorder given by ``beaten`` bitsets, memoised."""

    def __init__(self, beaten: list[int]):
        self.beaten = beaten
        self.memo: dict[int, int] = {}

    def __call__(self, states: int) -> int:
        hit = self.memo.get(states)
        if hit is None:
            hit, rest, beaten = states, states, self.beaten
            while rest:
                low = rest & -rest
                if states & beaten[low.bit_length() - 1]:
                    hit ^= low
                rest ^= low
            self.memo[states] = hit
        return hit


def _bit(t: int) -> int:
    return 1 << t if t >= 0 else 0


# -- range edges -------------------------------------------------------------------------

def _edges_of(label: CharSet, alphabet: CharSet) -> set[int]:
    points = set()
    for lo, hi in label.ranges:
        points.update(p for p in (lo - 1, hi + 1) if p in alphabet)
    return points


def edge_characters(dfa: DFA) -> dict[int, dict[int, frozenset[int]]]:
    """Per state and live target, the code points just outside the transition's ranges."""
    return {q: {t: frozenset(_edges_of(label, dfa.alphabet)) for label, t in row}
            for q, row in enumerate(transitions(dfa))}


# -- the edit-neighbourhood automaton ---------------------------------------------------

class _Neighbourhood:
    """Configurations and the step function of the edit-neighbourhood automaton.

    A configuration is the tuple (R_0, ..., R_d, S_0, ..., S_{d-1}) of ints:
    the level bitsets, then for each level j < d the number of an interned
    swap table, which gives for every class x of the next character the
    states a swap pending from R_j completes to (at level j + 1) when x is
    read. Two pending swaps with the same effect are one configuration.
    """

    def __init__(self, dfa: DFA, distance: int, kinds: tuple[str, ...], edges: bool):
        self.d = distance
        self.delete, self.insert = "delete" in kinds, "insert" in kinds
        self.replace, self.swap = "replace" in kinds, "swap" in kinds
        n, k = dfa.n_states, len(dfa.classes)
        self.final = sum(1 << f for f in dfa.accepting)
        self.match = _Images([[_bit(dfa.table[q][c]) for q in range(n)] for c in range(k)])
        any_column = [0] * n
        for q in range(n):
            for t in dfa.table[q]:
                any_column[q] |= _bit(t)
        self.anywhere = _Images([any_column])
        if edges:
            written, self.insert_mask = self._edge_relations(dfa)
        else:
            self.classes, self.base = dfa.classes, list(range(k))
            written, self.insert_mask = [any_column] * k, [(1 << n) - 1] * k
        self.written = _Images(written)
        self.cuts = self._cuts(dfa, written, edges)
        self.heads = [[{} for _ in self.classes] for _ in range(distance)]  # per level
        self.closes: dict[int, int] = {}
        self.tables: list[tuple[int, ...]] = [(0,) * k]  # table 0: no swap pending
        self.table_number: dict[tuple, int] = {self.tables[0]: 0}
        self.swap_memo: dict[tuple, int] = {}

    def _cuts(self, dfa: DFA, written: list[list[int]], edges: bool) -> list[_Cut]:
        """The cut of each level e = 1..d: by the simulation with d − e edits left (no cut
        past ``SIMULATION_STATES``, whose n × n matrices would take quadratic memory)."""
        if dfa.n_states > SIMULATION_STATES:
            return [_Cut([0] * dfa.n_states)] * self.d
        grades = [simulation(dfa)]  # no edit left: language inclusion
        moves = [w for w in written if any(w)]
        for _ in range(1, self.d if edges else 1):
            grades.append(simulation(dfa, moves, self.insert_mask, inner=grades[-1]))
        cuts = [_Cut(beaten(sim)) for sim in grades]
        return [cuts[min(self.d - e, len(cuts) - 1)] for e in range(1, self.d + 1)]

    def _edge_relations(self, dfa: DFA) -> tuple[list[list[int]], list[int]]:
        """Refine the classes by the edge characters; relations for writing only edges.

        Refined classes that act alike (same class of the DFA, same edges
        written, same states where they may be inserted) are merged again.
        Returns the substitution relation and the insertion masks per class.
        """
        edges = edge_characters(dfa)
        points = sorted({p for per in edges.values() for e in per.values() for p in e})
        n = dfa.n_states
        acts: dict[tuple, list[CharSet]] = {}
        for cls in partition(list(dfa.classes) + [CharSet.single(p) for p in points],
                             dfa.alphabet):
            p = cls.min if len(cls) == 1 else None
            column = tuple(sum(1 << t for t, e in edges[q].items() if p in e) for q in range(n))
            mask = sum(1 << q for q in range(n) if any(p in e for e in edges[q].values()))
            acts.setdefault((dfa.class_of(cls.min), column, mask), []).append(cls)
        merged = [(CharSet.of(r for cls in group for r in cls.ranges), act)
                  for act, group in acts.items()]
        merged.sort(key=lambda m: m[0].min)
        self.classes = tuple(cls for cls, _ in merged)
        self.base = [act[0] for _, act in merged]
        return [list(act[1]) for _, act in merged], [act[2] for _, act in merged]

    # -- memoised pieces of a step ---------------------------------------------------------
    def close(self, states: int) -> int:
        """The states plus one character of w that s lacks (a deletion), when allowed."""
        hit = self.closes.get(states)
        if hit is None:
            hit = states | self.anywhere(0, states) if self.delete else states
            self.closes[states] = hit
        return hit

    def head(self, c: int, states: int, level: int) -> tuple[int, int, int, int]:
        """For a level's set R and class c: (R under c, the close of that, the states an
        edit writing a character of c reaches from R, the swap table left by R and c)."""
        b = self.base[c]
        moved = self.match(b, states)
        spread = 0
        if self.replace:
            spread |= self.written(c, states)
        if self.insert:
            spread |= states & self.insert_mask[c]
        hit = (moved, self.close(moved), spread, self.swap_table(b, states, level))
        self.heads[level][c][states] = hit
        return hit

    def swap_table(self, b: int, states: int, level: int) -> int:
        """The number of the table of swaps begun in ``states`` before a character of
        base class b: for each class x, the states reached by reading x then b."""
        if not (self.swap and states):
            return 0
        key = (b, states, level)
        hit = self.swap_memo.get(key)
        if hit is None:
            cut, match = self.cuts[level], self.match
            table = tuple(cut(match(b, match(x, states)))
                          for x in range(len(self.tables[0])))
            hit = self.table_number.setdefault(table, len(self.tables))
            if hit == len(self.tables):
                self.tables.append(table)
            self.swap_memo[key] = hit
        return hit

    # -- the automaton ---------------------------------------------------------------------
    def start(self) -> tuple:
        levels = [1]
        for _ in range(self.d):
            levels.append(self.close(levels[-1]))
        return (1, *[cut(v) for cut, v in zip(self.cuts, levels[1:])], *(0,) * self.d)

    def step(self, config: tuple, c: int):
        d, b, heads = self.d, self.base[c], self.heads
        tables = self.tables
        h = heads[0][c].get(config[0]) or self.head(c, config[0], 0)
        new, swaps = [h[0]], [h[3]]
        closed, spread, v = h[1], h[2], 0
        for e in range(1, d + 1):
            if e < d:
                h = heads[e][c].get(config[e]) or self.head(c, config[e], e)
                moved = h[0]
            else:
                moved = self.match(b, config[e])
            v = moved | closed | spread | tables[config[d + e]][b]
            new.append(self.cuts[e - 1](v))
            if e < d:
                closed, spread = self.close(v), h[2]
                swaps.append(h[3])
        if not v and not any(swaps):
            return None
        return (*new, *swaps)

    def step_one(self, config: tuple, c: int):
        """``step`` for distance 1, unrolled (the common case)."""
        r0, r1, table = config
        h = self.heads[0][c].get(r0) or self.head(c, r0, 0)
        b = self.base[c]
        moved = self.match.memo[b].get(r1)
        if moved is None:
            moved = self.match(b, r1)
        v = moved | h[1] | h[2] | self.tables[table][b]
        if not v and not h[3]:
            return None
        cut = self.cuts[0]
        kept = cut.memo.get(v)
        return (h[0], cut(v) if kept is None else kept, h[3])

    def is_accepting(self, config: tuple) -> bool:
        return bool(config[self.d] & self.final) and not config[0] & self.final


def build(dfa: DFA, distance: int, kinds: tuple[str, ...], edges: bool,
          cap: int = DEFAULT_STATE_CAP) -> DFA:
    """Minimal DFA of N_d(L) − L restricted to ``kinds`` (and to range edges)."""
    plan = _Neighbourhood(dfa, distance, kinds, edges)
    step = plan.step_one if distance == 1 else plan.step
    return minimise(explore(plan.start(), step, plan.is_accepting, plan.classes,
                            dfa.alphabet, cap))
