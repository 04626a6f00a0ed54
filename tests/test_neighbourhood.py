"""The edit-neighbourhood automaton: inclusion cuts, range edges, configurations."""

from __future__ import annotations

import random

import pytest

import pfuzz
from pfuzz import dfa as automata
from pfuzz.algebra import difference
from pfuzz import neighbourhood
from pfuzz.neighbourhood import KINDS, build, dominators, edge_characters


def from_state(dfa, q):
    """The language of ``dfa`` read from state q."""
    return automata.minimise(automata.explore(
        q, lambda s, c: None if dfa.table[s][c] < 0 else dfa.table[s][c],
        lambda s: s in dfa.accepting, dfa.classes, dfa.universe))


def test_dominators_on_a_small_chain():
    # a|ab over {a, b}: after "a" the rest is {"", "b"}, after "ab" it is {""}.
    dfa = pfuzz.compile("a|ab", universe="[ab]").dfa
    after_a, after_ab = dfa.run("a"), dfa.run("ab")
    beaten = dominators(dfa)
    assert beaten[after_ab] == 1 << after_a
    assert beaten[after_a] == 0 and beaten[0] == 0


@pytest.mark.parametrize("pattern", ["(ab|b)*a?", "a{2,5}|b+a", "(a|b)*a(a|b){2}", "[ab]{0,3}b?"])
def test_dominators_agree_with_language_difference(pattern):
    dfa = pfuzz.compile(pattern, universe="[ab]").dfa
    beaten = dominators(dfa)
    for q in range(dfa.n_states):
        for p in range(dfa.n_states):
            included = difference(from_state(dfa, q), from_state(dfa, p)).is_empty()
            assert bool(beaten[q] >> p & 1) == (included and p != q), (pattern, q, p)


@pytest.mark.parametrize("seed", range(6))
def test_cutting_dominated_states_keeps_the_language(seed, monkeypatch):
    rng = random.Random(seed)
    pattern = "".join(rng.choice(["a", "b", "[ab]", "(ab)?", "a*", "(a|bb)"]) for _ in range(4))
    dfa = pfuzz.compile(pattern, universe="[ab]").dfa
    kinds = tuple(rng.sample(KINDS, rng.randint(1, 4)))
    cut = build(dfa, 2, kinds, False)
    monkeypatch.setattr(neighbourhood, "dominators", lambda d: [0] * d.n_states)
    assert build(dfa, 2, kinds, False) == cut


def test_edge_characters_are_just_outside_each_transition():
    lang = pfuzz.compile("[0-5]")
    (only,) = edge_characters(lang.dfa)[0].values()
    assert only == {ord("/"), ord("6")}


def test_edges_stop_at_the_universe():
    lang = pfuzz.compile("[ -!]x")
    first = edge_characters(lang.dfa)[0]
    assert set(first.values()) == {frozenset({ord('"')})}  # no U+001F in printable ASCII
