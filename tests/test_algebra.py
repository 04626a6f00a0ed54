"""DFA algebra checked by brute force over all short strings on a 3-letter alphabet.

The reference is direct simulation of randomly generated automata: every
combined automaton must agree with set operations on the operands' languages
on every string up to length 6; lengths and finiteness are checked against
the pumping lemma (a standard fact of automata theory).
"""

import pytest
from hypothesis import given, settings

import pfuzz
from helpers import ALL_STRINGS, language, random_dfas
from pfuzz.automata import algebra
from pfuzz.automata.dfa import DFA
from pfuzz.automata.minimise import minimise

settings_ = settings(max_examples=150, deadline=None, database=None)


@settings_
@given(random_dfas(), random_dfas())
def test_boolean_algebra(a, b):
    la, lb = language(a), language(b)
    everything = set(ALL_STRINGS)
    assert language(algebra.intersection(a, b)) == la & lb
    assert language(algebra.union(a, b)) == la | lb
    assert language(algebra.difference(a, b)) == la - lb
    assert language(algebra.symmetric_difference(a, b)) == la ^ lb
    assert language(algebra.complement(a)) == everything - la


@settings_
@given(random_dfas(), random_dfas())
def test_distinguish_is_shortlex_least(a, b):
    diff = sorted(language(a) ^ language(b), key=lambda w: (len(w), w))
    word = algebra.distinguish(a, b)
    if word is None:
        assert not diff
        assert minimise(a) == minimise(b)                 # equal languages, equal values
    else:
        assert a.accepts(word) != b.accepts(word)
        # the least difference may be longer than the brute-force strings (product states)
        assert word == diff[0] if diff else len(word) > len(ALL_STRINGS[-1])


@settings_
@given(random_dfas(), random_dfas())
def test_concatenation(a, b):
    la, lb = language(a), language(b)
    expected = {w for w in ALL_STRINGS
                if any(w[:i] in la and w[i:] in lb for i in range(len(w) + 1))}
    assert language(algebra.concatenate(a, b)) == expected


@settings_
@given(random_dfas())
def test_lengths_and_finiteness(d):
    words = language(d)
    m = minimise(d)
    if words:
        assert algebra.min_length(m) == min(map(len, words))
        assert algebra.shortest(m) == min(words, key=lambda w: (len(w), w))
    else:
        assert algebra.shortest(m) is None
    m_lengths = accepted_lengths(m, 2 * m.n_states + 2)
    if algebra.is_finite(m):
        bound = algebra.max_length(m)
        assert bound is None or bound < m.n_states        # a finite language is shorter than n
        assert not words or bound == max(m_lengths)
        if words:                                         # per state, from brute force
            longest = [max(len(w) for w in ALL_STRINGS if m.run(w, s) in m.accepting)
                       for s in range(m.n_states)]
            assert algebra.longest_completions(m) == longest
    else:
        # pumping lemma: an infinite regular language accepted by an n-state DFA
        # has a word whose length lies in [n, 2n)
        n = m.n_states
        assert any(n <= k < 2 * n for k in m_lengths)
        assert algebra.max_length(m) is None


def accepted_lengths(d: DFA, up_to: int) -> set[int]:
    """Lengths k <= up_to with an accepted word, by layered simulation of state sets."""
    layer, found = {0}, set()
    for k in range(up_to + 1):
        if layer & d.accepting:
            found.add(k)
        layer = {t for s in layer for t in d.table[s] if t >= 0}
    return found


def test_operands_over_different_alphabets_are_refused():
    from pfuzz.errors import ArgumentError
    a, b = pfuzz.compile("a", "ascii").dfa, pfuzz.compile("a", "printable").dfa
    with pytest.raises(ArgumentError, match="different alphabets"):
        algebra.intersection(a, b)
