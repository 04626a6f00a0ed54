"""The compiler's output is minimal, trimmed and canonical.

Minimality is checked by a separate naive Moore refinement (E. F. Moore,
"Gedanken-experiments on sequential machines", 1956): split blocks by
acceptance, then by the blocks of the successors, until nothing changes; a
minimal DFA has one block per state.
"""

from __future__ import annotations

from collections import deque

import pytest
from hypothesis import given, settings, strategies as st

from pfuzz.base.charset import ALPHABETS, CharSet
from pfuzz.automata.construction.compiler import compile_tree
from pfuzz.automata.dfa import DEAD
from pfuzz.syntax.tree import ANCHOR_KINDS, Alternation, Anchor, Chars, Lookahead, Repeat, Sequence

ALPHABET = CharSet.from_chars("ab\n")


def resolve(node, alphabet):
    return node.chars & alphabet


def moore_classes(dfa) -> int:
    """Number of equivalence classes of the completed DFA's states (dead state included)."""
    n = dfa.n_states
    rows = [[t if t != DEAD else n for t in row] for row in dfa.table] + [[n] * len(dfa.classes)]
    block = [1 if s in dfa.accepting else 0 for s in range(n)] + [0]
    while True:
        signatures = [(block[s], *(block[t] for t in rows[s])) for s in range(n + 1)]
        numbering = {sig: i for i, sig in enumerate(dict.fromkeys(signatures))}
        refined = [numbering[sig] for sig in signatures]
        if len(set(refined)) == len(set(block)):
            return len(set(refined))
        block = refined


def reachable(dfa) -> set[int]:
    seen, queue = {0}, deque([0])
    while queue:
        for t in dfa.table[queue.popleft()]:
            if t != DEAD and t not in seen:
                seen.add(t)
                queue.append(t)
    return seen


def assert_minimal(dfa):
    if dfa.is_empty():
        assert dfa.n_states == 1 and not dfa.accepting
        return
    assert reachable(dfa) == set(range(dfa.n_states))
    assert dfa.live_states() == set(range(dfa.n_states))
    # Live states are never equivalent to the (added) dead state, so one block each.
    assert moore_classes(dfa) == dfa.n_states + 1


chars = st.sets(st.sampled_from("ab\n"), min_size=1).map(lambda s: Chars(CharSet.from_chars(s)))
trees = st.recursive(
    st.one_of(chars, chars, st.sampled_from(ANCHOR_KINDS).map(Anchor)),
    lambda inner: st.one_of(
        st.lists(inner, max_size=3).map(lambda xs: Sequence(tuple(xs))),
        st.lists(inner, min_size=2, max_size=3).map(lambda xs: Alternation(tuple(xs))),
        st.tuples(inner, st.integers(0, 2), st.one_of(st.none(), st.integers(0, 2))).map(
            lambda t: Repeat(t[0], t[1], None if t[2] is None else t[1] + t[2])),
        st.tuples(inner, st.booleans()).map(lambda t: Lookahead(*t)),
    ),
    max_leaves=8,
)


@settings(max_examples=300, deadline=None, database=None)
@given(trees)
def test_random_trees_compile_to_trimmed_minimal_automata(tree):
    assert_minimal(compile_tree(tree, ALPHABET, resolve=resolve))


@settings(max_examples=100, deadline=None, database=None)
@given(trees)
def test_compilation_is_canonical(tree):
    once = compile_tree(tree, ALPHABET, resolve=resolve)
    # Wrapping in a one-item sequence or a {1} repeat changes the tree, not the language.
    assert compile_tree(Sequence((tree,)), ALPHABET, resolve=resolve) == once
    assert compile_tree(Repeat(tree, 1, 1), ALPHABET, resolve=resolve) == once


def family(k: int):
    """(a|b)*a(a|b){k}: the k+1-th letter from the end is an a."""
    ab = Alternation((Chars(CharSet.single("a")), Chars(CharSet.single("b"))))
    return Sequence((Repeat(ab, 0, None), Chars(CharSet.single("a")), Repeat(ab, k, k)))


@pytest.mark.parametrize("k", range(1, 11))
def test_last_letters_family_needs_two_to_the_k_plus_one_states(k):
    # A standard fact: the automaton must remember the last k+1 letters (common practice).
    dfa = compile_tree(family(k), CharSet.from_chars("ab"), resolve=resolve)
    assert dfa.n_states == 2 ** (k + 1)
    if k <= 6:
        assert_minimal(dfa)


@pytest.mark.parametrize("k", [3, 8])
def test_last_letters_family_over_printable(k):
    dfa = compile_tree(family(k), ALPHABETS["printable"], resolve=resolve)
    assert dfa.n_states == 2 ** (k + 1)
    assert len(dfa.classes) == 3  # a, b and every other character


# -- the array path (pfuzz.automata.refinement) against the small path and the naive check --

random_dfas = st.integers(1, 40).flatmap(lambda n: st.tuples(
    st.just(n),
    st.sampled_from([("a", "b", "c"), ("ab", "c"), ("abc",), ("a", "bc")]),
    st.lists(st.integers(-1, n - 1), min_size=3 * n, max_size=3 * n),
    st.sets(st.integers(0, n - 1)),
))


def build_random(n, labels, cells, accepting):
    from pfuzz.automata.dfa import DFA

    classes = tuple(CharSet.from_chars(label) for label in labels)
    k = len(classes)
    table = tuple(tuple(cells[s * k:(s + 1) * k]) for s in range(n))
    return DFA(CharSet.from_chars("abc"), classes, table, frozenset(accepting))


def both_paths(dfa, monkeypatch):
    from pfuzz.automata import minimise as module

    monkeypatch.setattr(module, "ARRAY_STATES", 1)
    arrays = module.minimise(dfa)
    monkeypatch.setattr(module, "ARRAY_STATES", 10**9)
    return arrays, module.minimise(dfa)


@settings(max_examples=300, deadline=None, database=None)
@given(random_dfas)
def test_array_minimisation_equals_the_small_path_on_random_automata(parts):
    from itertools import product

    with pytest.MonkeyPatch.context() as monkeypatch:
        dfa = build_random(*parts)
        arrays, small = both_paths(dfa, monkeypatch)
    assert arrays == small
    assert_minimal(arrays)
    for length in range(5):  # the language itself, string by string
        for text in map("".join, product("abc", repeat=length)):
            assert arrays.accepts(text) == dfa.accepts(text)


def test_array_minimisation_of_wide_and_long_automata(monkeypatch):
    dfa = compile_tree(family(11), CharSet.from_chars("ab"), resolve=resolve)  # 4,096 states
    assert dfa.n_states == 2 ** 12
    assert_minimal(dfa)
    letters = Chars(CharSet.from_chars("ab"))
    chain = compile_tree(Repeat(letters, 1, 2_100), CharSet.from_chars("ab"), resolve=resolve)
    assert chain.n_states == 2_101  # one state per length read (common practice)
    arrays, small = both_paths(chain, monkeypatch)
    assert arrays == small == chain
