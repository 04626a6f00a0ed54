"""Tests for pfuzz.boundary.paths, against brute-force enumeration over a 3-letter alphabet.

The automata are built from Python predicates (``from_strings`` of every string
up to length 6 that the predicate accepts), so the reference is the predicate
itself, not the pattern compiler.
"""

from __future__ import annotations

import itertools

import pytest

from helpers import strings_upto
from pfuzz.base.charset import CharSet
from pfuzz.automata.dfa import explore
from pfuzz.automata.minimise import minimise
from pfuzz.automata.algebra import from_strings
from pfuzz.boundary.paths import Guide, Lengths

LETTERS = "abc"
ALPHABET = CharSet.range("a", "c")
PREDICATES = [
    lambda s: 2 <= len(s) <= 5 and s.count("a") % 2 == 0,
    lambda s: len(s) in (1, 4, 5) and s.startswith("b"),
    lambda s: len(s) <= 6 and "cc" not in s and s.endswith("a"),
    lambda s: len(s) == 3 and s[1] != "c",
]


def shortlex_least(strings):
    return min(strings, key=lambda s: (len(s), s), default=None)


@pytest.fixture(params=range(len(PREDICATES)))
def case(request):
    member = PREDICATES[request.param]
    valid = [s for s in strings_upto(LETTERS, 6) if member(s)]
    return from_strings(valid, ALPHABET), valid


def test_prefixes_and_completions_are_shortlex_least(case):
    dfa, valid = case
    guide = Guide(dfa)
    all_strings = list(strings_upto(LETTERS, 6))
    for state in guide.reachable:
        reaching = [s for s in all_strings if dfa.run(s) == state]
        assert guide.prefix(state) == shortlex_least(reaching)
        completing = [s for s in all_strings if dfa.run(s, state) in dfa.accepting]
        assert guide.completion(state) == shortlex_least(completing)


def test_strings_of_every_valid_length_are_shortlex_least(case):
    dfa, valid = case
    lengths = Lengths(Guide(dfa), None)
    by_length = {len(s) for s in valid}
    for n in range(8):
        assert lengths.is_valid(n) == (n in by_length)
        if n in by_length:
            assert lengths.string_of_length(n) == min(s for s in valid if len(s) == n)


def test_transition_labels_partition_the_allowed_characters(case):
    dfa, _ = case
    guide = Guide(dfa)
    for state in guide.reachable:
        labels = [label for label, _ in guide.edges[state]]
        for a, b in itertools.combinations(labels, 2):
            assert a.isdisjoint(b)
        for ch in LETTERS:
            target = dfa.table[state][dfa.class_of(ch)]
            inside = [t for label, t in guide.edges[state] if ch in label]
            assert inside == ([target] if target in guide.live else [])


def test_unbounded_lengths_repeat_with_a_period():
    # (ab)* over a-c: valid lengths 0, 2, 4, ...; the scan stops when the reachable sets repeat
    classes = [CharSet.single(c) for c in LETTERS]
    dfa = minimise(explore(0, lambda k, c: (1 - k) if LETTERS[c] == "ab"[k] else None,
                           lambda k: k == 0, classes, ALPHABET))
    lengths = Lengths(Guide(dfa), None)
    assert lengths.period is not None and len(lengths.valid) <= 4
    assert [lengths.is_valid(n) for n in range(200)] == [n % 2 == 0 for n in range(200)]
    assert lengths.string_of_length(10) == "ab" * 5


def test_allowed_characters_are_those_that_keep_a_string_live(case):
    dfa, valid = case
    guide = Guide(dfa)
    valid_set = set(valid)
    for state in guide.reachable:
        prefix = guide.prefix(state)
        # reference: some valid string (up to length 6) continues prefix + ch
        expected = {ch for ch in LETTERS if any(s.startswith(prefix + ch) for s in valid_set)}
        assert set(guide.allowed(state).chars()) == expected


def test_breadth_first_order_is_by_shortlex_least_prefix(case):
    dfa, _ = case
    guide = Guide(dfa)
    prefixes = [guide.prefix(s) for s in guide.reachable]
    assert prefixes == sorted(prefixes, key=lambda p: (len(p), p))
    assert guide.reachable[0] == 0 and len(set(guide.reachable)) == len(guide.reachable)


def test_longest_within_bound_against_brute_force(case):
    dfa, valid = case
    for bound in (0, 2, 4, None):
        lengths = Lengths(Guide(dfa), bound)
        reference = max((len(s) for s in valid if bound is None or len(s) <= bound), default=None)
        if reference is not None and reference < lengths.min:
            reference = None
        assert lengths.longest_within_bound() == reference, bound
