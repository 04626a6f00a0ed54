"""Hypothesis strategies over pfuzz languages.

Every strategy here draws plain integers and decodes them through the
language's exact ranking (``pfuzz.counting.tables``): first the index of a length
among the lengths that have strings, then a rank below the count of that
length, then ``unrank``. Hypothesis shrinks integers toward zero, so a
failing example shrinks by itself toward the shortest length and, within it,
the shortlex-smallest string, with no shrinking code of our own. When the
length shrinks, Hypothesis keeps the rank if it is still in range, so the
result is exact when the first failing rank at the shortest failing length
also fails at the longer lengths (e.g. "the digits after the prefix are at
least 50": the rank 50 fails at every length). Otherwise it is Hypothesis's
usual heuristic and may stop at a local minimum: for ``[A-Z]{2}[0-9]{2,4}``
and "the code starts with M or later", a run can stop at "MA0000", whose
rank (3,120,000) has no string of length 4, instead of "MA00". The strings
come from our automata; Hypothesis's own pattern-based string strategy is
not used.

Cost: one unrank per example, O(length × out-degree × log pieces)
big-integer steps; the count tables are built once per language.
"""

from __future__ import annotations

from hypothesis import strategies as st

from pfuzz.base.charset import DEFAULT_ALPHABET
from pfuzz.errors import EmptyLanguageError
from pfuzz.language import Language


def accepted(pattern_or_language: "str | Language", *, min_length: int | None = None,
             max_length: int | None = None, alphabet: str = DEFAULT_ALPHABET,
             flags: int = 0) -> st.SearchStrategy[str]:
    """Strings the pattern accepts (``re.fullmatch``), over ``alphabet``.

    For an unbounded language ``max_length`` defaults to the documented
    bound of ``pfuzz.counting.tables.UNBOUNDED_SPAN`` characters above the
    shortest length considered.
    """
    language = _language(pattern_or_language, alphabet, flags)
    return ranked_strings(language, min_length, max_length, what="accepted strings")


def _language(pattern_or_language, alphabet, flags) -> Language:
    if isinstance(pattern_or_language, Language):
        return pattern_or_language
    return Language.compile(pattern_or_language, alphabet, flags)


def ranked_strings(language: Language, min_length: int | None, max_length: int | None,
                   what: str = "strings") -> st.SearchStrategy[str]:
    """Strings of ``language`` drawn as (length index, rank) integers, then unranked."""
    counter = language.counter
    lengths = counter.lengths(max_length=max_length, min_length=min_length)
    if not lengths:
        low, high = counter.bounds(min_length, max_length)
        raise EmptyLanguageError(f"no {what} with length {low} to {high}")

    def strings_of(length: int) -> st.SearchStrategy[str]:
        return st.integers(0, counter.count(length) - 1).map(
            lambda index: counter.unrank(length, index))

    return st.integers(0, len(lengths) - 1).flatmap(lambda i: strings_of(lengths[i]))


def rejected(pattern_or_language: "str | Language", *, distance: int = 1,
             kinds: "list[str] | None" = None, min_length: int | None = None,
             max_length: int | None = None, alphabet: str = DEFAULT_ALPHABET,
             flags: int = 0) -> st.SearchStrategy[str]:
    """Near-miss rejects: strings the pattern rejects within OSA ``distance`` of one it accepts.

    Drawn like ``accepted``, over the near-miss language
    (``Language.near_misses``; ``kinds`` restricts the edits as in
    ``pfuzz.nearmiss.rejects``), so a failing example shrinks toward the shortest,
    shortlex-smallest reject. ``Language.explain`` gives a reject's nearest
    valid string and edits.
    """
    language = _language(pattern_or_language, alphabet, flags)
    return ranked_strings(language.near_misses(distance, kinds), min_length, max_length,
                          what="near-miss rejects")
