"""Two languages side by side: the difference languages A − B and B − A.

Used by ``pfuzz diff`` and by the exact audit of a regex validator. Each
difference is a ``Language`` (a product automaton, see ``pfuzz.automata.algebra``), so it
is summarised exactly: its count per length (``pfuzz.counting.tables``), its total
when finite, its shortest strings in shortlex order, and a pattern for it
written back by state elimination (``pfuzz.automata.elimination``). Every pattern is
compiled back with ``pfuzz.compile`` over the same alphabet and compared
with ``distinguish`` before it is shown, so a pattern in a report always
denotes exactly the difference.

Counts are listed per length up to a bound: for a finite difference, its
longest length; otherwise its shortest length plus ``COUNT_SPAN``.

Cost: one product construction per side, O(states_A × states_B × classes),
then the counting tables up to the bound and one state elimination.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.base.charset import CharSet
from pfuzz.automata.dfa import DEAD, DFA
from pfuzz.automata.minimise import minimise
from pfuzz.automata.elimination import DEFAULT_LIMIT
from pfuzz.base.constants import COUNT_SPAN
from pfuzz.errors import ArgumentError
from pfuzz.language import Language

#: Shortest examples listed per side.
DEFAULT_EXAMPLES = 5


@dataclass(frozen=True)
class Side:
    """One difference language, summarised."""

    language: Language
    counts: dict[int, int]
    bound: int | None
    total: int | None
    examples: tuple[str, ...]
    pattern: str | None
    note: str

    @property
    def empty(self) -> bool:
        return self.language.is_empty()

    @property
    def finite(self) -> bool:
        return self.language.is_finite()

    def as_dict(self) -> dict:
        return {
            "empty": self.empty,
            "finite": self.finite,
            "total": self.total,
            "counts": {str(n): c for n, c in self.counts.items()},
            "counted_up_to": self.bound,
            "examples": list(self.examples),
            "pattern": self.pattern,
            "pattern_note": self.note,
        }


@dataclass(frozen=True)
class Comparison:
    """A − B and B − A, and the shortlex-least string in exactly one of them."""

    only_a: Side
    only_b: Side
    distinguishing: str | None

    @property
    def equal(self) -> bool:
        return self.distinguishing is None


def compare(a: Language, b: Language, *, max_length: int | None = None,
            examples: int = DEFAULT_EXAMPLES, limit: int = DEFAULT_LIMIT) -> Comparison:
    """Summaries of A − B and B − A (``max_length`` bounds the counts per length)."""
    if a.alphabet != b.alphabet:
        raise ArgumentError("compare() needs two languages over the same alphabet")
    return Comparison(summarise(a - b, max_length, examples, limit),
                      summarise(b - a, max_length, examples, limit),
                      a.distinguish(b))


def summarise(lang: Language, max_length: int | None = None, examples: int = DEFAULT_EXAMPLES,
              limit: int = DEFAULT_LIMIT) -> Side:
    """Counts, total, shortest examples and a verified pattern of one language."""
    if lang.is_empty():
        return Side(lang, {}, None, 0, (), lang.to_pattern(limit), "")
    bound = count_bound(lang, max_length)
    shortest = lang.min_length
    counted = lang.counts(shortest, bound) if bound >= shortest else {}
    counts = {n: c for n, c in counted.items() if c}
    total = lang.total if lang.is_finite() else None
    shown = tuple(lang.enumerate(shortest, count_bound(lang, None), 0, examples))
    pattern, note = verified_pattern(lang, limit)
    return Side(lang, counts, bound, total, shown, pattern, note)


def count_bound(lang: Language, max_length: int | None) -> int:
    """The longest length to count: ``max_length``, else the default bound (module docstring)."""
    if max_length is not None:
        return max_length
    longest = lang.max_length
    return longest if longest is not None else lang.min_length + COUNT_SPAN


def verified_pattern(lang: Language, limit: int = DEFAULT_LIMIT) -> tuple[str | None, str]:
    """A pattern for ``lang`` that compiles back to it, or None and the reason."""
    from pfuzz.language import compile as compile_pattern

    pattern = lang.to_pattern(limit)
    if pattern is None:
        return None, f"too large to show (more than {limit:,} characters)"
    back = compile_pattern(pattern, lang.alphabet)
    if back.distinguish(lang) is not None:
        return None, "not shown: the pattern found did not compile back to the same language"
    return pattern, ""


def lift(lang: Language, alphabet: CharSet) -> Language:
    """The same language over a wider alphabet (new characters lead to rejection)."""
    if not lang.alphabet.issubset(alphabet):
        raise ArgumentError("lift() needs an alphabet that contains the language's alphabet")
    extra = alphabet - lang.alphabet
    if not extra:
        return lang
    dfa = lang.dfa
    table = tuple(row + (DEAD,) for row in dfa.table)
    wider = DFA(alphabet, dfa.classes + (extra,), table, dfa.accepting)
    return Language(minimise(wider), pattern=lang.pattern, flags=lang.flags,
                    alphabet_name=alphabet.describe(), state_cap=lang.state_cap)
