"""Simulation preorders: language inclusion, and the stricter one with extra moves and marks."""

from __future__ import annotations

import pytest

import pfuzz
from pfuzz.automata import dfa as automata
from pfuzz.automata.minimise import minimise
from pfuzz.automata.algebra import difference
from pfuzz.automata.simulation import beaten, simulation


def dominators(dfa, *relations):
    return beaten(simulation(dfa, *relations))


def from_state(dfa, q):
    """The language of ``dfa`` read from state q."""
    return minimise(automata.explore(
        q, lambda s, c: None if dfa.table[s][c] < 0 else dfa.table[s][c],
        lambda s: s in dfa.accepting, dfa.classes, dfa.alphabet))


def test_dominators_on_a_small_chain():
    # a|ab over {a, b}: after "a" the rest is {"", "b"}, after "ab" it is {""}.
    dfa = pfuzz.compile("a|ab", alphabet="[ab]").dfa
    after_a, after_ab = dfa.run("a"), dfa.run("ab")
    beats = dominators(dfa)
    assert beats[after_ab] == 1 << after_a
    assert beats[after_a] == 0 and beats[0] == 0


@pytest.mark.parametrize("pattern", ["(ab|b)*a?", "a{2,5}|b+a", "(a|b)*a(a|b){2}", "[ab]{0,3}b?"])
def test_dominators_agree_with_language_difference(pattern):
    dfa = pfuzz.compile(pattern, alphabet="[ab]").dfa
    beats = dominators(dfa)
    for q in range(dfa.n_states):
        for p in range(dfa.n_states):
            included = difference(from_state(dfa, q), from_state(dfa, p)).is_empty()
            assert bool(beats[q] >> p & 1) == (included and p != q), (pattern, q, p)


def test_simulation_with_written_moves_is_stricter_than_inclusion():
    # After "a" the rest is [b-c], after "b" it is [a-c]: inclusion holds. An
    # extra move from the state after "a" that the state after "b" lacks, or a
    # mark on the first but not the second, breaks the simulation.
    dfa = pfuzz.compile("a[b-c]|b[a-c]", alphabet="[a-d]").dfa
    after_a, after_b = dfa.run("a"), dfa.run("b")
    assert dominators(dfa)[after_a] >> after_b & 1  # L("[b-c]") is inside L("[a-c]")
    writes = [0] * dfa.n_states
    writes[after_a] = 1 << dfa.run("ab")
    assert not dominators(dfa, [writes], [])[after_a] >> after_b & 1
    marks = [1 << after_a]
    assert not dominators(dfa, [], marks)[after_a] >> after_b & 1


def test_edit_moves_need_only_the_grade_below():
    # After "x" the rest is a, after "y" it is [ab]; after "z" it is c[de], after
    # "w" c[a-e]. Let the state after "x" write into the one after "z", the
    # state after "y" into the one after "w", and the state after "z" write on
    # (the one after "w" does not). Then "w" simulates "z" by inclusion only,
    # and that is all the write from "x" needs one grade up.
    dfa = pfuzz.compile("xa|y[ab]|zc[de]|wc[a-e]", alphabet="[a-z]").dfa
    x, y, z, w = (dfa.run(ch) for ch in "xyzw")
    writes = [0] * dfa.n_states
    writes[x], writes[y], writes[z] = 1 << z, 1 << w, 1 << dfa.run("xa")
    inclusion = simulation(dfa)
    graded = simulation(dfa, [writes], [], inner=inclusion)
    assert inclusion[z, w] and not graded[z, w]
    assert graded[x, y]
    assert not simulation(dfa, [writes], [], inner=graded)[x, y]
