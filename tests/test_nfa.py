"""Thompson construction: the NFA of a tree accepts the tree's language, and stays small."""

from __future__ import annotations

import itertools

import pytest
from hypothesis import given, settings, strategies as st

from pfuzz.base.charset import CharSet
from pfuzz.errors import StateLimitError
from pfuzz.automata.nfa import (ASSERT, CHAR, CLOSE, EPSILON, LOOP_BEGIN, LOOP_END, LOOP_TEST, OPEN, Priority,
                                accepts, build, estimate_states, _closure)
from pfuzz.syntax.tree import (Alternation, Anchor, Atomic, Backreference, Chars, Conditional, Group, Repeat,
                               Sequence)

# Symbols are class indexes 0, 1, 2; a Chars node over code points 0..2 is labelled by them.
SYMBOLS = (0, 1, 2)


def label_of(node: Chars) -> frozenset[int]:
    return frozenset(p for p in SYMBOLS if p in node.chars)


def sym(*points: int) -> Chars:
    return Chars(CharSet.from_chars(points))


def language(node, max_length: int) -> set[tuple[int, ...]]:
    """The strings of ``node`` up to ``max_length``, by the definitions of the operators."""
    if isinstance(node, Chars):
        return {(p,) for p in label_of(node)} if max_length >= 1 else set()
    if isinstance(node, Sequence):
        result = {()}
        for item in node.items:
            result = {a + b for a in result for b in language(item, max_length)
                      if len(a + b) <= max_length}
        return result
    if isinstance(node, Alternation):
        return set().union(*(language(option, max_length) for option in node.options))
    assert isinstance(node, Repeat)
    item = language(node.item, max_length)
    result, layer, count = set(), {()}, 0
    while layer and (node.max is None or count <= node.max):
        if count >= node.min:
            result |= layer
        grown = {a + b for a in layer for b in item if len(a + b) <= max_length}
        if node.max is None and grown <= result | layer and count >= node.min:
            break
        layer, count = grown, count + 1
    return result


trees = st.recursive(
    st.sets(st.sampled_from(SYMBOLS), min_size=1).map(lambda s: sym(*s)),
    lambda inner: st.one_of(
        st.lists(inner, max_size=3).map(lambda xs: Sequence(tuple(xs))),
        st.lists(inner, min_size=2, max_size=3).map(lambda xs: Alternation(tuple(xs))),
        st.tuples(inner, st.integers(0, 2), st.one_of(st.none(), st.integers(0, 3))).map(
            lambda t: Repeat(t[0], t[1], None if t[2] is None else t[1] + t[2])),
    ),
    max_leaves=6,
)


@settings(max_examples=200, deadline=None, database=None)
@given(trees)
def test_nfa_accepts_exactly_the_language_of_the_tree(tree):
    nfa = build(tree, label_of, n_classes=3)
    expected = language(tree, 4)
    for n in range(5):
        for word in itertools.product(SYMBOLS, repeat=n):
            assert accepts(nfa, list(word)) == (word in expected), word


@settings(max_examples=200, deadline=None, database=None)
@given(trees)
def test_estimate_is_an_upper_bound(tree):
    assert build(tree, label_of, n_classes=3).n_states <= estimate_states(tree)


def test_alternation_of_sets_is_one_character_edge():
    nfa = build(Alternation((sym(0), sym(1))), label_of, n_classes=3)
    edges = [nfa.labels[s] for s in range(nfa.n_states) if nfa.kinds[s] == CHAR]
    assert edges == [frozenset({0, 1})]


def test_bounded_repeat_keeps_closures_small():
    # x{1,200}: after any number of x's the closure holds the next x and the final state.
    nfa = build(Repeat(sym(0), 1, 200), label_of, n_classes=3)
    current = _closure(nfa, {nfa.start})
    for _ in range(150):
        movers = [s for s in current if nfa.kinds[s] == CHAR]
        assert len(movers) <= 1
        current = _closure(nfa, {t for s in movers for t in nfa.targets[s]})
        important = {s for s in current if nfa.kinds[s] == CHAR or s == nfa.final}
        assert len(important) == 2


def test_any_suffix_loops_on_every_class():
    nfa = build(sym(0), label_of, n_classes=3, any_suffix=True)
    assert accepts(nfa, [0, 2, 1, 1])
    assert not accepts(nfa, [1, 0])


def test_assertions_are_single_edges():
    nfa = build(Sequence((Anchor("text_start"), sym(1))), label_of, n_classes=3)
    assert accepts(nfa, [1]) and not accepts(nfa, [])


def test_huge_expansions_are_refused_before_building():
    tree = Repeat(Repeat(sym(0), 1000, 1000), 1000, 1000)
    with pytest.raises(StateLimitError, match="more than 100,000"):
        build(tree, label_of, n_classes=3, limit=100_000)


def _kinds(nfa) -> list[str]:
    return [nfa.kinds[s] for s in range(nfa.n_states)]


def test_later_choices_of_an_atomic_group_carry_priority_assertions():
    # (?>x|xy): the second option is guarded by "the first cannot reach the end of the scope".
    nfa = build(Atomic(Alternation((sym(0), Sequence((sym(0), sym(1)))))), label_of, n_classes=3)
    guards = [s for s in range(nfa.n_states) if nfa.kinds[s] == ASSERT]
    assert len(guards) == 1
    label = nfa.labels[guards[0]]
    assert isinstance(label, Priority) and label.scope == 0 and len(label.targets) == 1
    assert nfa.scope_exits[0] is not None and nfa.registers
    # Ignoring the guards, the language is the plain alternation's.
    assert accepts(nfa, [0]) and accepts(nfa, [0, 1]) and not accepts(nfa, [1])


def test_groups_that_are_referred_to_open_and_close_registers():
    tree = Sequence((Group(sym(0), 1), Backreference(1)))
    assert OPEN not in _kinds(build(tree, label_of, n_classes=3))  # group 1 not tracked
    nfa = build(tree, label_of, n_classes=3, tracked=frozenset({1}))
    assert _kinds(nfa).count(OPEN) == _kinds(nfa).count(CLOSE) == 1 and nfa.registers


def test_the_zero_width_guard_wraps_nullable_repeats_that_capture():
    # (?:(x?))*: re stops after a copy that read nothing; the guard states model it.
    tree = Repeat(Group(Repeat(sym(0), 0, 1), 1), 0, None)
    plain = build(tree, label_of, n_classes=3)
    assert LOOP_BEGIN not in _kinds(plain) and not plain.registers
    guarded = build(tree, label_of, n_classes=3, tracked=frozenset({1}))
    kinds = _kinds(guarded)
    assert kinds.count(LOOP_BEGIN) == kinds.count(LOOP_TEST) == kinds.count(LOOP_END) == 1
    # A repeat of an item that cannot match empty needs no guard, even where order matters.
    assert LOOP_BEGIN not in _kinds(build(Atomic(Repeat(sym(0), 0, None)), label_of, n_classes=3))


def test_lazy_repeats_try_to_stop_first():
    greedy = build(Repeat(sym(0), 0, None), label_of, n_classes=3)
    lazy = build(Repeat(sym(0), 0, None, lazy=True), label_of, n_classes=3)
    first = lambda nfa: nfa.kinds[nfa.targets[nfa.start][0]]  # noqa: E731
    assert first(greedy) == CHAR and first(lazy) == EPSILON


def test_possessive_repeat_is_atomic_copies():
    nfa = build(Repeat(Alternation((sym(0), Sequence((sym(0), sym(1))))), 1, 3, possessive=True),
                label_of, n_classes=3)
    # (?>x) once, then (?>(?>x){0,2}): a scope per copy plus the outer one.
    assert len(nfa.scope_exits) == 4
    assert accepts(nfa, [0, 0, 1]) and not accepts(nfa, [1])


def test_conditionals_have_two_targets():
    nfa = build(Conditional(1, sym(0), sym(1)), label_of, n_classes=3, tracked=frozenset({1}))
    assert nfa.registers and accepts(nfa, [0]) and accepts(nfa, [1])


extended_trees = st.recursive(
    st.sets(st.sampled_from(SYMBOLS), min_size=1).map(lambda s: sym(*s)),
    lambda inner: st.one_of(
        st.lists(inner, max_size=3).map(lambda xs: Sequence(tuple(xs))),
        st.lists(inner, min_size=2, max_size=3).map(lambda xs: Alternation(tuple(xs))),
        st.tuples(inner, st.integers(0, 2), st.one_of(st.none(), st.integers(0, 3)), st.booleans(),
                  st.booleans()).map(lambda t: Repeat(t[0], t[1], None if t[2] is None else t[1] + t[2],
                                                      lazy=t[3], possessive=t[4])),
        inner.map(Atomic),
        inner.map(lambda x: Group(x, 1)),
        st.tuples(inner, inner).map(lambda t: Conditional(1, t[0], t[1])),
    ),
    max_leaves=6,
)


@settings(max_examples=200, deadline=None, database=None)
@given(extended_trees)
def test_estimate_bounds_trees_with_captures_and_scopes(tree):
    nfa = build(tree, label_of, n_classes=3, tracked=frozenset({1}))
    assert nfa.n_states <= estimate_states(tree)
