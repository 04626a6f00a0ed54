"""The determiniser: interned sets, pruning, configurations grouped by obligation set."""

from __future__ import annotations

import re

import pytest

from helpers import strings_upto
from pfuzz.base.charset import CharSet
from pfuzz.automata.construction.compiler import compile_dfa
from pfuzz.automata.construction.determinise import NO_OBLIGATIONS, Determiniser, Interned, Obligations

LETTERS = CharSet.range("a", "c")


def test_interned_numbers_values_in_first_seen_order():
    table = Interned("x")
    assert [table("y"), table("x"), table("z"), table("y")] == [1, 0, 2, 1]
    assert table.values == ["x", "y", "z"]


def test_prune_drops_threads_whose_obligations_include_another_threads():
    sets = Obligations([LETTERS])
    one = sets.set_id(frozenset({(0, 1)}))
    two = sets.set_id(frozenset({(0, 1), (1, 2)}))
    assert sets.prune({one: {5, 6}, two: {5, 7}}) == {one: {5, 6}, two: {7}}
    assert sets.prune({NO_OBLIGATIONS: {5}, one: {5, 6}}) == {NO_OBLIGATIONS: {5}, one: {6}}
    assert sets.prune({one: {5}}) == {one: {5}}


@pytest.fixture
def recorded(monkeypatch):
    """Every (determiniser, configuration) that a compilation steps from."""
    seen = []
    step = Determiniser.step

    def recording(self, config, c):
        seen.append((self, config))
        return step(self, config, c)

    monkeypatch.setattr(Determiniser, "step", recording)
    return seen


def test_threads_after_a_start_lookahead_move_as_one_group(recorded):
    pattern = r"(?=.*[0-9])(?=.*[a-z])[a-z0-9]{4,8}"
    dfa = compile_dfa(pattern, CharSet.range("0", "z"))
    assert all(len(config) <= 2 for _, config in recorded)
    # The same state sets recur under many obligation sets; their moves are memoised.
    main = max({runner for runner, _ in recorded}, key=lambda r: len(r.state_sets))
    steps = sum(1 for runner, _ in recorded if runner is main)
    assert sum(map(len, main.moved)) < steps / 2
    rx = re.compile(pattern)  # reference: re.fullmatch
    for s in ["ab12", "abcd", "1234", "a1", "zz99zz99", "zz99zz99z"]:
        assert dfa.accepts(s) == bool(rx.fullmatch(s)), s


def test_threads_at_the_final_state_become_the_accepting_flag(recorded):
    dfa = compile_dfa(r"a(b|c$)?", LETTERS)
    assert any(config[0] and len(config) > 1 for _, config in recorded)  # "a": end or go on
    for runner, config in recorded:
        assert all(runner.nfa.final not in runner.state_sets[sid] for _, sid in config[1:])
    rx = re.compile(r"a(b|c$)?")  # reference: re.fullmatch
    for s in strings_upto("abc", 3):
        assert dfa.accepts(s) == bool(rx.fullmatch(s)), s


def test_plain_threads_take_the_subset_step(recorded):
    compile_dfa(r"(a|b)*a(a|b){3}", CharSet.range("a", "b"))
    assert all(len(config) == 2 and config[1][0] == NO_OBLIGATIONS
               for _, config in recorded if len(config) > 1)
    runner = recorded[0][0]
    assert not any(runner.moved)  # no memo: each plain state set is one configuration
