"""Near-miss languages: the strings one edit (or d edits) away from a language.

For a language L over a universe U and a distance d >= 1, the near-miss
language is N_d(L) − L: the strings s over U that L rejects and for which
some w in L has OSA(s, w) <= d. OSA is the optimal string alignment
(restricted Damerau–Levenshtein) distance: insertion, deletion, substitution
and transposition of two adjacent characters, where no substring is edited
twice. Neighbourhoods of a regular language under such an additive distance
are regular; this module builds the automaton.

Construction (the edit-neighbourhood automaton). Reading s, the automaton
follows every alignment of s against a path w through L's minimal DFA at
once. A configuration holds, for every cost e <= d, the set R_e of DFA
states reachable by an alignment of cost <= e (an int bitset), plus the
pending half of a transposition: the class x of the character just read and
the sets P_e of states where a swap began. One step on a character of class
c follows a match (R_e under c), a substitution (R_{e-1} under any class),
an insertion into s (R_{e-1} unchanged), the second half of a swap (P_e
under c, then under x: w reads the two characters in the other order), and
then deletions from w (ε-moves under any class, one cost each). The start
configuration is closed under deletions too. These configurations are
determinised by ``pfuzz.dfa.explore`` (the subset construction) and
minimised by ``pfuzz.dfa.minimise`` (Hopcroft). R_0 is L's own run, so
"s is not in L" is read off the same configuration: the product with the
complement of L is folded in rather than built as a second product.

Why the DFA's own symbol classes suffice. A substitution with a character
of the same class as the one it replaces, a substitution with the very same
character, or a swap of two equal characters or of two characters of one
class, each leads the DFA to the same state as plain matches at a higher
cost. Such moves are always dominated by the cheaper matches, so allowing
them never changes which strings lie within distance d. Only "which class
did the witness read" matters, and that is what the transitions carry. The
brute-force tests in ``tests/external/test_nearmiss_bruteforce.py`` check
the result against the definition.

Kinds. ``kinds`` is a subset of ``KINDS`` = delete, insert, replace, swap,
named as edits that turn a valid string w into the reject s: ``delete`` drops
a character of w ("one digit short"), ``insert`` adds one, ``replace``
substitutes one, ``swap`` transposes two adjacent ones. With ``kinds`` given,
alignments may use only those operations: for d = 1 this is "one edit of one
of these kinds"; for d >= 2 it is "OSA distance <= d counting only these
operations", e.g. ``kinds=["swap"], distance=2`` is up to two disjoint
adjacent swaps.

Range edges (``edges=True``). For every live transition q → t of the minimal
DFA, its label (the union of the classes leading from q to t) is a set of
code-point ranges; the characters lo−1 and hi+1 just outside each range
(within U) are the classic off-by-one values. In edges mode a substitution
may write only an edge character of the transition it replaces, and an
insertion only an edge character of some transition leaving the state where
it happens; deletions and swaps, which write no new character, are
unchanged. The classes are refined so that each edge character is a class
of its own.

Cost: configurations are tuples of 2d + 2 bitsets; a step costs O(d) set
images, memoised per (class, set). The automaton before minimisation has at
most as many states as there are distinct reachable configurations, in
practice a few times the DFA's states for d = 1. Exponential blow-up is
possible in principle, and the state cap of ``explore`` guards against it.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterable, Sequence

from . import randomness, witness
from .charset import CharSet, partition
from .dfa import DEAD, DEFAULT_STATE_CAP, DFA, explore, minimise
from .errors import EmptyLanguageError, PfuzzError
from .witness import Edit, Explanation, by_identity, corrector, explain, nearest

__all__ = ["KINDS", "Edit", "Explanation", "Reject", "edge_characters", "explain",
           "kinds_of", "near_miss_dfa", "sample_rejects"]

#: The edit kinds, as edits that turn a valid string into a reject.
KINDS = ("delete", "insert", "replace", "swap")


# -- arguments -------------------------------------------------------------------------

def check_distance(distance) -> int:
    if isinstance(distance, bool) or not isinstance(distance, int) or distance < 1:
        raise PfuzzError(f"the near-miss distance must be an integer >= 1, got {distance!r}")
    return distance


def check_kinds(kinds: "Iterable[str] | None") -> tuple[str, ...]:
    """The kinds asked for, validated, in the order of ``KINDS`` (all when None)."""
    if kinds is None:
        return KINDS
    if isinstance(kinds, str):
        kinds = [kinds]
    asked = set(kinds)
    unknown = sorted(asked - set(KINDS))
    if unknown:
        raise PfuzzError(f"unknown edit kind {unknown[0]!r}: use {', '.join(KINDS)}")
    if not asked:
        raise PfuzzError(f"give at least one edit kind ({', '.join(KINDS)})")
    return tuple(k for k in KINDS if k in asked)


# -- set images -------------------------------------------------------------------------

class _Images:
    """Images of state sets (int bitsets) under per-class relations, memoised."""

    def __init__(self, columns: list[list[int]]):
        self.columns = columns  # columns[c][q]: bitset of the states q relates to under c
        self.memo: dict[tuple[int, int], int] = {}

    def __call__(self, c: int, states: int) -> int:
        key = (c, states)
        hit = self.memo.get(key)
        if hit is not None:
            return hit
        column = self.columns[c]
        out, rest = 0, states
        while rest:
            low = rest & -rest
            out |= column[low.bit_length() - 1]
            rest ^= low
        self.memo[key] = out
        return out


def _bit(t: int) -> int:
    return 1 << t if t >= 0 else 0


# -- range edges -------------------------------------------------------------------------

def _labels(dfa: DFA, q: int) -> dict[int, CharSet]:
    """For state q, each live target and the characters leading there."""
    ranges: dict[int, list] = {}
    for c, t in enumerate(dfa.table[q]):
        if t != DEAD:
            ranges.setdefault(t, []).extend(dfa.classes[c].ranges)
    return {t: CharSet.of(rs) for t, rs in ranges.items()}


def _edges_of(label: CharSet, universe: CharSet) -> set[int]:
    points = set()
    for lo, hi in label.ranges:
        points.update(p for p in (lo - 1, hi + 1) if p in universe)
    return points


def edge_characters(dfa: DFA) -> dict[int, dict[int, frozenset[int]]]:
    """Per state and live target, the code points just outside the transition's ranges."""
    return {q: {t: frozenset(_edges_of(label, dfa.universe))
                for t, label in _labels(dfa, q).items()}
            for q in range(dfa.n_states)}


# -- the edit-neighbourhood automaton ---------------------------------------------------

class _Neighbourhood:
    """Configurations and the step function of the edit-neighbourhood automaton."""

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
            self._edge_relations(dfa)
        else:
            self.classes, self.base = dfa.classes, list(range(k))
            self.written = _Images([any_column] * k)
            self.insert_mask = [(1 << n) - 1] * k

    def _edge_relations(self, dfa: DFA) -> None:
        """Refine the classes by the edge characters; relations for writing only edges."""
        edges = edge_characters(dfa)
        points = sorted({p for per in edges.values() for e in per.values() for p in e})
        self.classes = tuple(partition(list(dfa.classes) + [CharSet.single(p) for p in points],
                                       dfa.universe))
        self.base = [dfa.class_of(c.min) for c in self.classes]
        n = dfa.n_states
        written, masks = [], []
        for cls in self.classes:
            p = cls.min if len(cls) == 1 else None
            column = [sum(1 << t for t, e in edges[q].items() if p in e) for q in range(n)]
            written.append(column)
            masks.append(sum(1 << q for q in range(n)
                             if any(p in e for e in edges[q].values())))
        self.written = _Images(written)
        self.insert_mask = masks

    def start(self) -> tuple:
        levels = [1]
        for _ in range(self.d):
            below = levels[-1]
            levels.append(below | (self.anywhere(0, below) if self.delete else 0))
        return (*levels, -1, *([0] * self.d))

    def step(self, config: tuple, c: int):
        d = self.d
        b = self.base[c]
        pending_class = config[d + 1]
        new: list[int] = []
        for e in range(d + 1):
            v = self.match(b, config[e])
            if e:
                prev, below = config[e - 1], new[e - 1]
                v |= below
                if self.replace:
                    v |= self.written(c, prev)
                if self.insert:
                    v |= prev & self.insert_mask[c]
                if pending_class >= 0:
                    v |= self.match(pending_class, self.match(b, config[d + 1 + e]))
                if self.delete:
                    v |= self.anywhere(0, below)
            new.append(v)
        pending = config[:d] if self.swap and any(config[:d]) else (0,) * d
        marker = b if any(pending) else -1
        if not new[d] and marker < 0:
            return None
        return (*new, marker, *pending)

    def is_accepting(self, config: tuple) -> bool:
        return bool(config[self.d] & self.final) and not config[0] & self.final


_CACHE: dict[tuple, DFA] = {}
_CACHE_SIZE = 64


def clear_caches() -> None:
    """Forget every cached near-miss automaton, counter and correction table (benchmarks)."""
    _CACHE.clear()
    _COUNTERS.clear()
    witness.clear_caches()


def near_miss_dfa(dfa: DFA, distance: int = 1, kinds: "Sequence[str] | None" = None, *,
                  edges: bool = False, cap: int = DEFAULT_STATE_CAP) -> DFA:
    """Minimal DFA of N_d(L) − L under the OSA distance, over the same universe.

    ``kinds`` restricts the edit operations the alignments may use (see the
    module docstring); ``edges`` restricts written characters to range edges.
    Results are cached per (DFA, distance, kinds, edges).
    """
    distance, kinds = check_distance(distance), check_kinds(kinds)
    key = (dfa, distance, kinds, bool(edges))
    hit = _CACHE.get(key)
    if hit is None:
        plan = _Neighbourhood(dfa, distance, kinds, bool(edges))
        hit = minimise(explore(plan.start(), plan.step, plan.is_accepting, plan.classes,
                               dfa.universe, cap))
        if len(_CACHE) >= _CACHE_SIZE:
            _CACHE.pop(next(iter(_CACHE)))
        _CACHE[key] = hit
    return hit


# -- rejects ---------------------------------------------------------------------------

@dataclass(frozen=True)
class Reject:
    """A near-miss reject, the kinds of single edit that reach it, and its nearest witness.

    ``kinds`` lists every kind K (in the order of ``KINDS``) whose own
    language, ``near_miss_dfa(dfa, distance, [K])``, holds the text: for
    distance 1, every kind of one edit that makes it from some valid string.
    For distance >= 2 a reject reachable only by mixing kinds has no kinds.
    ``witness``, ``edits`` and ``distance`` are those of ``explain``.
    """

    text: str
    kinds: tuple[str, ...]
    witness: str
    edits: tuple[Edit, ...]
    distance: int

    def __str__(self) -> str:
        return self.text

    def as_dict(self) -> dict:
        return {"text": self.text, "kinds": list(self.kinds), "witness": self.witness,
                "distance": self.distance, "edits": [e.as_dict() for e in self.edits]}


def kinds_of(dfa: DFA, text: str, distance: int = 1) -> tuple[str, ...]:
    """The kinds K whose near-miss language at ``distance`` holds ``text``."""
    found = []
    for kind in KINDS:
        tables = corrector(near_miss_dfa(dfa, distance, [kind]))
        if tables.accepts(tables.classes_of(text)):
            found.append(kind)
    return tuple(found)


def sample_rejects(dfa: DFA, n: int, *, distance: int = 1, kinds: "Sequence[str] | None" = None,
                   seed=None, min_length: int | None = None, max_length: int | None = None,
                   edges: bool = False, progress=None) -> list[Reject]:
    """``n`` near-miss rejects, uniform by length, each with its kinds and nearest witness.

    With ``kinds`` None the texts are drawn from the whole near-miss language;
    with kinds given, each kind's own language gets an equal share (kinds
    whose language has no strings in the length range give their share to
    the others), and the strata are interleaved in the order of ``KINDS``.
    Within a stratum, a length is chosen uniformly among the lengths in range
    that have strings, then a string uniformly at that length
    (``pfuzz.counting``). ``edges`` draws from the range-edge languages (see
    the module docstring). ``progress``, if given, is called with the number
    of rejects finished since its last call. Same seed, same output.
    """
    if isinstance(n, bool) or not isinstance(n, int) or n < 0:
        raise PfuzzError(f"the number of rejects must be an integer >= 0, got {n!r}")
    distance = check_distance(distance)
    strata = [None] if kinds is None else [[k] for k in check_kinds(kinds)]
    rng = randomness.source(seed)
    counters = [_counter(near_miss_dfa(dfa, distance, kinds, edges=edges)) for kinds in strata]
    filled = [c for c in counters if c.lengths(max_length, min_length)]
    if not filled:
        raise EmptyLanguageError(_nothing_to_draw(distance, min_length, max_length))
    draws = [c.sample(share, min_length=min_length, max_length=max_length, seed=rng)
             for c, share in zip(filled, _shares(n, len(filled)))]
    texts = [batch[i] for i in range(max(map(len, draws))) for batch in draws if i < len(batch)]
    rejects = []
    for text in texts:
        rejects.append(_reject(dfa, text, distance))
        if progress is not None and len(rejects) % _PROGRESS_STEP == 0:
            progress(_PROGRESS_STEP)
    if progress is not None and len(rejects) % _PROGRESS_STEP:
        progress(len(rejects) % _PROGRESS_STEP)
    return rejects


_PROGRESS_STEP = 1024


def _shares(n: int, parts: int) -> list[int]:
    return [n // parts + (1 if i < n % parts else 0) for i in range(parts)]


def _nothing_to_draw(distance: int, min_length, max_length) -> str:
    where = ""
    if min_length is not None or max_length is not None:
        where = f" with length {min_length or 0} to {'any' if max_length is None else max_length}"
    return f"there are no near-miss rejects at distance {distance}{where}"


def _reject(dfa: DFA, text: str, distance: int) -> Reject:
    why = nearest(dfa, text, distance)
    return Reject(text, kinds_of(dfa, text, distance), why.witness, why.edits, why.distance)


_COUNTERS: dict = {}


def _counter(dfa: DFA):
    """The cached ``pfuzz.counting.Counter`` of a (cached) near-miss DFA."""
    from .counting import Counter
    return by_identity(_COUNTERS, dfa, Counter)
