"""Near-miss rejects: the strings a language rejects within a few edits of one it accepts.

For a language L over an alphabet U and a distance d >= 1, the near-miss
language is N_d(L) − L: the strings s over U that L rejects and for which
some w in L has OSA(s, w) <= d. OSA is the optimal string alignment
(restricted Damerau–Levenshtein) distance: insertion, deletion, substitution
and transposition of two adjacent characters, where no substring is edited
twice (for d >= 2 this is not "d edits in sequence"). Neighbourhoods of a
regular language under such an additive distance are regular;
``pfuzz.nearmiss.neighbourhood`` builds the automaton, ``pfuzz.nearmiss.witness`` finds each
reject's nearest valid string, and this module puts them together.

Kinds. ``kinds`` is a subset of ``EDIT_KINDS`` = delete, insert, replace, swap,
named as edits that turn a valid string w into the reject s: ``delete`` drops
a character of w ("one digit short"), ``insert`` adds one, ``replace``
substitutes one, ``swap`` transposes two adjacent ones. With ``kinds`` given,
alignments may use only those operations: for d = 1 this is "one edit of one
of these kinds"; for d >= 2 it is "OSA distance <= d counting only these
operations", e.g. ``kinds=["swap"], distance=2`` is up to two disjoint
adjacent swaps.

Range edges (``edges=True``): substitutions and extra characters write only
the characters just outside the ranges of the DFA's transitions (lo−1 and
hi+1, the classic off-by-one values); see ``pfuzz.nearmiss.neighbourhood``.

Sampling. ``sample_rejects`` draws texts uniformly by length from the
near-miss language (``pfuzz.counting.tables``), stratified by kind when several
kinds are asked, and pairs each with its kinds, witness and edit script.
Automata and count tables are cached per DFA.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterable, Sequence

from pfuzz.base import randomness
from pfuzz.nearmiss import witness
from pfuzz.automata.dfa import DEFAULT_STATE_CAP, DFA
from pfuzz.errors import ArgumentError, EmptyLanguageError
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.nearmiss.neighbourhood import build, edge_characters
from pfuzz.nearmiss.edits import Edit, Explanation
from pfuzz.nearmiss.witness import by_identity, corrector, explain

__all__ = ["Reject", "edge_characters", "explain", "kinds_of", "length_range", "near_miss_dfa", "sample_rejects"]


# -- arguments -------------------------------------------------------------------------

def check_distance(distance) -> int:
    if isinstance(distance, bool) or not isinstance(distance, int) or distance < 1:
        raise ArgumentError(f"the near-miss distance must be an integer >= 1, got {distance!r}")
    return distance


def check_kinds(kinds: "Iterable[str] | None") -> tuple[str, ...]:
    """The kinds asked for, validated, in the order of ``EDIT_KINDS`` (all when None)."""
    if kinds is None:
        return EDIT_KINDS
    if isinstance(kinds, str):
        kinds = [kinds]
    asked = set(kinds)
    unknown = sorted(asked - set(EDIT_KINDS))
    if unknown:
        raise ArgumentError(f"unknown edit kind {unknown[0]!r}: use {', '.join(EDIT_KINDS)}")
    if not asked:
        raise ArgumentError(f"give at least one edit kind ({', '.join(EDIT_KINDS)})")
    return tuple(k for k in EDIT_KINDS if k in asked)


_CACHE: dict[tuple, DFA] = {}
_CACHE_SIZE = 64


def clear_caches() -> None:
    """Forget every cached near-miss automaton, counter and correction table (benchmarks)."""
    _CACHE.clear()
    _COUNTERS.clear()
    witness.clear_caches()


def near_miss_dfa(dfa: DFA, distance: int = 1, kinds: "Sequence[str] | None" = None, *,
                  edges: bool = False, cap: int = DEFAULT_STATE_CAP) -> DFA:
    """Minimal DFA of N_d(L) − L under the OSA distance, over the same alphabet.

    ``kinds`` restricts the edit operations the alignments may use (see the
    module docstring); ``edges`` restricts written characters to range edges.
    Results are cached per (DFA, distance, kinds, edges, cap); past ``cap`` states the
    construction stops with ``StateLimitError``.
    """
    distance, kinds = check_distance(distance), check_kinds(kinds)
    key = (dfa, distance, kinds, bool(edges), cap)
    hit = _CACHE.get(key)
    if hit is None:
        hit = build(dfa, distance, kinds, bool(edges), cap)
        if len(_CACHE) >= _CACHE_SIZE:
            _CACHE.pop(next(iter(_CACHE)))
        _CACHE[key] = hit
    return hit


# -- rejects ---------------------------------------------------------------------------

@dataclass(frozen=True)
class Reject:
    """A near-miss reject, the kinds of single edit that reach it, and its nearest witness.

    ``kinds`` lists every kind K (in the order of ``EDIT_KINDS``) whose own
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


def kinds_of(dfa: DFA, text: str, distance: int = 1, cap: int = DEFAULT_STATE_CAP
             ) -> tuple[str, ...]:
    """The kinds K whose near-miss language at ``distance`` holds ``text``."""
    return _Rejecter(dfa, distance, cap).kinds(text)


class _Rejecter:
    """Makes ``Reject`` values for one DFA and distance.

    At distance 1 the kinds are read off the one-edit candidates of
    ``pfuzz.nearmiss.witness`` (every valid string one edit away, with its kind);
    beyond, each kind's own near-miss DFA is asked.
    """

    def __init__(self, dfa: DFA, distance: int, cap: int = DEFAULT_STATE_CAP):
        self.dfa, self.distance = dfa, check_distance(distance)
        self.tables = corrector(dfa)
        self.by_kind = [] if distance == 1 else [
            (kind, corrector(near_miss_dfa(dfa, distance, [kind], cap=cap)))
            for kind in EDIT_KINDS]

    def kinds(self, text: str) -> tuple[str, ...]:
        if self.distance == 1:
            found = self.tables.one_edit(text)
            return () if found is None else found[1]
        return tuple(kind for kind, tables in self.by_kind
                     if tables.accepts(tables.classes_of(text)))

    def reject(self, text: str) -> Reject:
        found = self.tables.one_edit(text) if self.distance == 1 else None
        if found is not None:
            why, kinds = found
        else:
            why, kinds = self.tables.nearest(text, self.distance), self.kinds(text)
        return Reject(text, kinds, why.witness, why.edits, why.distance)


def sample_rejects(dfa: DFA, n: int, *, distance: int = 1, kinds: "Sequence[str] | None" = None,
                   seed=None, min_length: int | None = None, max_length: int | None = None,
                   edges: bool = False, progress=None, cap: int = DEFAULT_STATE_CAP
                   ) -> list[Reject]:
    """``n`` near-miss rejects, uniform by length, each with its kinds and nearest witness.

    With ``kinds`` None the texts are drawn from the whole near-miss language;
    with kinds given, each kind's own language gets an equal share (kinds
    whose language has no strings in the length range give their share to
    the others), and the strata are interleaved in the order of ``EDIT_KINDS``.
    Within a stratum, a length is chosen uniformly among the lengths in range
    (``length_range``) that have strings, then a string uniformly at that
    length (``pfuzz.counting.tables``). ``edges`` draws from the range-edge languages (see
    the module docstring). ``progress``, if given, is called with the number
    of rejects finished since its last call. ``cap`` is the state cap of every near-miss
    automaton built. Same seed, same output.
    """
    if isinstance(n, bool) or not isinstance(n, int) or n < 0:
        raise ArgumentError(f"the number of rejects must be an integer >= 0, got {n!r}")
    distance = check_distance(distance)
    strata = [None] if kinds is None else [[k] for k in check_kinds(kinds)]
    low, high = length_range(dfa, distance, kinds, min_length, max_length, edges=edges, cap=cap)
    rng = randomness.source(seed)
    counters = [_counter(near_miss_dfa(dfa, distance, stratum, edges=edges, cap=cap))
                for stratum in strata]
    filled = [c for c in counters if c.lengths(high, low)]
    if not filled:
        raise EmptyLanguageError(_nothing_to_draw(distance, min_length, max_length))
    draws = [c.sample(share, min_length=low, max_length=high, seed=rng)
             for c, share in zip(filled, _shares(n, len(filled)))]
    texts = [batch[i] for i in range(max(map(len, draws))) for batch in draws if i < len(batch)]
    rejects, rejecter = [], _Rejecter(dfa, distance, cap)
    for text in texts:
        rejects.append(rejecter.reject(text))
        if progress is not None and len(rejects) % _PROGRESS_STEP == 0:
            progress(_PROGRESS_STEP)
    if progress is not None and len(rejects) % _PROGRESS_STEP:
        progress(len(rejects) % _PROGRESS_STEP)
    return rejects


_PROGRESS_STEP = 1024


def length_range(dfa: DFA, distance: int = 1, kinds: "Sequence[str] | None" = None,
                 min_length: int | None = None, max_length: int | None = None, *,
                 edges: bool = False, cap: int = DEFAULT_STATE_CAP) -> tuple[int, int]:
    """The lengths ``sample_rejects`` draws from: the bounds given, else those of the
    near-miss language of all the kinds asked (``pfuzz.counting.tables`` defaults: its
    shortest and longest string, or ``UNBOUNDED_SPAN`` above the shortest)."""
    whole = near_miss_dfa(dfa, distance, kinds, edges=edges, cap=cap)
    return _counter(whole).bounds(min_length, max_length)


def _shares(n: int, parts: int) -> list[int]:
    return [n // parts + (1 if i < n % parts else 0) for i in range(parts)]


def _nothing_to_draw(distance: int, min_length, max_length) -> str:
    where = ""
    if min_length is not None or max_length is not None:
        where = f" with length {min_length or 0} to {'any' if max_length is None else max_length}"
    return f"there are no near-miss rejects at distance {distance}{where}"


_COUNTERS: dict = {}


def _counter(dfa: DFA):
    """The cached ``pfuzz.counting.tables.Counter`` of a (cached) near-miss DFA."""
    from pfuzz.counting.tables import Counter
    return by_identity(_COUNTERS, dfa, Counter)
