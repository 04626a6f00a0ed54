"""``Language``: the minimal DFA of a pattern plus its alphabet, as one value.

This is the façade every upper room and every user receives. It holds an
immutable ``DFA`` (see ``pfuzz.automata.dfa``) and forwards each question to the room
that owns the method: counting and sampling to ``pfuzz.counting.tables``, near-miss
rejects and witnesses to ``pfuzz.nearmiss.rejects``, boundary suites to
``pfuzz.boundary.suite``, back-translation to a pattern to ``pfuzz.automata.elimination``.
Derived tables (count tables, the near-miss automata) are built lazily and
cached on the instance; the instance itself never changes, so it is cheap to
share between threads of work.
"""

from __future__ import annotations

from functools import cached_property
from typing import Iterator, Sequence

from pfuzz.automata import algebra
from pfuzz.base.charset import CharSet
from pfuzz.automata.dfa import DEFAULT_STATE_CAP, DFA, universal


class Language:
    """A regular language over an alphabet, backed by its minimal DFA."""

    def __init__(self, dfa: DFA, *, pattern: str | None = None, flags: int = 0,
                 alphabet_name: str | None = None, state_cap: int = DEFAULT_STATE_CAP):
        self.dfa = dfa
        #: The state cap of every automaton built from this language (products, near misses).
        self.state_cap = state_cap
        self.pattern = pattern
        self.flags = flags
        self.alphabet_name = alphabet_name or dfa.alphabet.describe()
        self._derived: dict = {}

    # -- construction ------------------------------------------------------------
    @classmethod
    def compile(cls, pattern: str, alphabet: "str | CharSet" = "printable", flags: int = 0,
                *, state_cap: int = DEFAULT_STATE_CAP, mode: str = "fullmatch") -> "Language":
        """The strings over ``alphabet`` that ``re.<mode>(pattern, s, flags)`` accepts,
        where ``mode`` is ``fullmatch`` (the default), ``match`` or ``search``."""
        from pfuzz.automata.construction.compiler import compile_dfa
        from pfuzz.syntax.alphabet import resolve_alphabet, alphabet_label

        charset = resolve_alphabet(alphabet)
        dfa = compile_dfa(pattern, charset, flags=flags, cap=state_cap, mode=mode)
        return cls(dfa, pattern=pattern, flags=flags, alphabet_name=alphabet_label(alphabet),
                   state_cap=state_cap)

    def _wrap(self, dfa: DFA, pattern: str | None = None, state_cap: int | None = None
              ) -> "Language":
        return Language(dfa, pattern=pattern, alphabet_name=self.alphabet_name,
                        state_cap=self.state_cap if state_cap is None else state_cap)

    def _combine(self, operation, other: "Language") -> "Language":
        """``operation(a, b, cap)`` of the two DFAs, under the smaller of the two caps."""
        cap = min(self.state_cap, other.state_cap)
        return self._wrap(operation(self.dfa, other.dfa, cap), state_cap=cap)

    # -- basic facts -----------------------------------------------------------------
    @property
    def alphabet(self) -> CharSet:
        return self.dfa.alphabet

    @property
    def states(self) -> int:
        """States of the trimmed minimal DFA; the dead state is not counted."""
        return 0 if self.is_empty() else self.dfa.n_states

    @property
    def classes(self) -> tuple[CharSet, ...]:
        return self.dfa.classes

    def accepts(self, text: str) -> bool:
        return self.dfa.accepts(text)

    def __contains__(self, text: str) -> bool:
        return self.accepts(text)

    def is_empty(self) -> bool:
        return self.dfa.is_empty()

    def is_finite(self) -> bool:
        return algebra.is_finite(self.dfa)

    @cached_property
    def min_length(self) -> int | None:
        return algebra.min_length(self.dfa)

    @cached_property
    def max_length(self) -> int | None:
        """Longest accepted length; None when unbounded (or empty)."""
        return algebra.max_length(self.dfa)

    def shortest(self) -> str | None:
        return algebra.shortest(self.dfa)

    # -- boolean algebra ---------------------------------------------------------------
    def complement(self) -> "Language":
        return self._wrap(algebra.complement(self.dfa, self.state_cap))

    def __and__(self, other: "Language") -> "Language":
        return self._combine(algebra.intersection, other)

    def __or__(self, other: "Language") -> "Language":
        return self._combine(algebra.union, other)

    def __sub__(self, other: "Language") -> "Language":
        return self._combine(algebra.difference, other)

    def __xor__(self, other: "Language") -> "Language":
        return self._combine(algebra.symmetric_difference, other)

    def distinguish(self, other: "Language") -> str | None:
        """None when equal, else the shortlex-least string in exactly one of them."""
        return algebra.distinguish(self.dfa, other.dfa)

    def equivalent(self, other: "Language") -> bool:
        return self.distinguish(other) is None

    def with_any_suffix(self) -> "Language":
        """L·U*: the strings that start with a string of L. Not ``re.match`` of the
        pattern when it ends in ``$`` (compile with ``mode="match"`` for that)."""
        return self._wrap(algebra.with_any_suffix(self.dfa, self.state_cap))

    def with_any_prefix(self) -> "Language":
        """U*·L: the strings that end with a string of L."""
        return self._wrap(algebra.concatenate(universal(self.alphabet), self.dfa, self.state_cap))

    # -- counting and sampling (pfuzz.counting.tables) -------------------------------------------
    @property
    def counter(self):
        if "counter" not in self._derived:
            from pfuzz.counting.tables import Counter
            self._derived["counter"] = Counter(self.dfa)
        return self._derived["counter"]

    def count(self, length: int) -> int:
        return self.counter.count(length)

    def counts(self, min_length: int = 0, max_length: int | None = None) -> dict[int, int]:
        return self.counter.counts(min_length, max_length)

    @property
    def total(self) -> int | None:
        return self.counter.total()

    def lengths(self, max_length: int | None = None) -> list[int]:
        return self.counter.lengths(max_length)

    def sample(self, n: int, *, min_length: int | None = None, max_length: int | None = None,
               seed=None, lengths="even", unique: bool = False, method: str = "auto") -> list[str]:
        return self.counter.sample(n, min_length=min_length, max_length=max_length,
                                   seed=seed, lengths=lengths, unique=unique, method=method)

    def rank(self, text: str) -> int:
        return self.counter.rank(text)

    def unrank(self, length: int, index: int) -> str:
        return self.counter.unrank(length, index)

    def enumerate(self, min_length: int = 0, max_length: int | None = None,
                  start: int = 0, stop: int | None = None) -> Iterator[str]:
        return self.counter.enumerate(min_length, max_length, start, stop)

    # -- near misses (pfuzz.nearmiss.rejects) -------------------------------------------------------
    def near_misses(self, distance: int = 1, kinds: Sequence[str] | None = None) -> "Language":
        """N_d(L) − L under the OSA edit distance, as a Language."""
        key = ("near", distance, tuple(sorted(kinds)) if kinds else None)
        if key not in self._derived:
            from pfuzz.nearmiss.rejects import near_miss_dfa
            self._derived[key] = self._wrap(near_miss_dfa(self.dfa, distance, kinds,
                                                          cap=self.state_cap))
        return self._derived[key]

    def explain(self, text: str):
        from pfuzz.nearmiss.rejects import explain
        return explain(self.dfa, text)

    def rejects(self, n: int, *, distance: int = 1, kinds: Sequence[str] | None = None,
                seed=None, min_length: int | None = None, max_length: int | None = None,
                edges: bool = False, progress=None):
        """``n`` near-miss rejects, each with its kinds, nearest witness and edit script."""
        from pfuzz.nearmiss.rejects import sample_rejects
        return sample_rejects(self.dfa, n, distance=distance, kinds=kinds, seed=seed,
                              min_length=min_length, max_length=max_length, edges=edges,
                              progress=progress, cap=self.state_cap)

    # -- boundary suites and back-translation ---------------------------------------------
    def boundary_cases(self, max_length: int | None = None, **options):
        """The boundary suite (``pfuzz.boundary.suite``; options ``limit``, ``probes``)."""
        from pfuzz.boundary.suite import suite
        return suite(self.dfa, max_length=max_length, **options)

    def to_pattern(self, limit: int | None = None) -> str | None:
        """A Python ``re`` pattern for this language (state elimination), or None if too large."""
        from pfuzz.automata.elimination import pattern_of
        return pattern_of(self.dfa, limit=limit)

    def __repr__(self) -> str:
        label = repr(self.pattern) if self.pattern is not None else "derived"
        return f"<Language {label} over {self.alphabet_name}: {self.states} states>"


def compile(pattern: str, alphabet: "str | CharSet" = "printable", flags: int = 0,
            *, state_cap: int = DEFAULT_STATE_CAP, mode: str = "fullmatch") -> Language:
    """Compile a Python ``re`` pattern to the Language ``re.fullmatch`` accepts over ``alphabet``
    (``mode="match"`` or ``"search"`` for what ``re.match`` / ``re.search`` accept)."""
    return Language.compile(pattern, alphabet, flags, state_cap=state_cap, mode=mode)
