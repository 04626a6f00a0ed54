"""Shared test helpers: small random DFAs over a 3-letter alphabet and brute-force languages.

The reference is direct simulation: a DFA's language is the set of strings up
to length 6 over ``abc`` that it accepts, read one character at a time.
"""

from __future__ import annotations

import itertools
from typing import Iterator

from hypothesis import strategies as st

from pfuzz.base.charset import CharSet, partition
from pfuzz.automata.dfa import DFA, transitions

ALPHABET = CharSet.range("a", "c")
CLASSES = tuple(partition([CharSet.single("a"), CharSet.single("b")], ALPHABET))


def strings_upto(alphabet: str, max_length: int) -> Iterator[str]:
    """Every string over ``alphabet`` of length 0 to ``max_length``: by length, then in product order."""
    for n in range(max_length + 1):
        for chars in itertools.product(alphabet, repeat=n):
            yield "".join(chars)


ALL_STRINGS = list(strings_upto("abc", 6))


@st.composite
def random_dfas(draw):
    """Partial DFAs of 1 to 6 states over the classes a, b, c, with random acceptance."""
    n = draw(st.integers(1, 6))
    table = tuple(tuple(draw(st.integers(-1, n - 1)) for _ in CLASSES) for _ in range(n))
    accepting = frozenset(s for s in range(n) if draw(st.booleans()))
    return DFA(ALPHABET, CLASSES, table, accepting)


def language(d: DFA) -> set[str]:
    """Every string up to length 6 over abc that ``d`` accepts."""
    return {w for w in ALL_STRINGS if d.accepts(w)}


def flat_transitions(d: DFA) -> list[tuple[int, CharSet, int]]:
    """Every merged transition (state, characters, target) of ``d``, state by state."""
    return [(s, label, t) for s, row in enumerate(transitions(d)) for label, t in row]
