"""The determiniser: interned sets, pruning, configurations grouped by obligation set, the work budget."""

from __future__ import annotations

import re

import pytest

from helpers import strings_upto
from pfuzz.base.charset import CharSet
from pfuzz.automata.construction.compiler import compile_dfa
from pfuzz.automata.construction.determinise import Determiniser
from pfuzz.automata.construction.obligations import NO_OBLIGATIONS, Interned, Obligations
from pfuzz.errors import StateLimitError

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
    assert all(len(config) <= 3 for _, config in recorded)  # (ending, look-back, one group)
    # The same state sets recur under many obligation sets; their moves are memoised.
    main = max({runner for runner, _ in recorded}, key=lambda r: len(r.state_sets))
    steps = sum(1 for runner, _ in recorded if runner is main)
    assert sum(len(moves.moved) for moves in main.tables.values()) < steps / 2
    rx = re.compile(pattern)  # reference: re.fullmatch
    for s in ["ab12", "abcd", "1234", "a1", "zz99zz99", "zz99zz99z"]:
        assert dfa.accepts(s) == bool(rx.fullmatch(s)), s


def test_threads_at_the_final_state_become_the_accepting_flag(recorded):
    dfa = compile_dfa(r"a(b|c$)?", LETTERS)
    assert any(config[0] and len(config) > 2 for _, config in recorded)  # "a": end or go on
    for runner, config in recorded:
        assert all(runner.nfa.final not in runner.state_sets[sid] for _, sid in config[2:])
    rx = re.compile(r"a(b|c$)?")  # reference: re.fullmatch
    for s in strings_upto("abc", 3):
        assert dfa.accepts(s) == bool(rx.fullmatch(s)), s


BIT_PARALLEL_CASES = [(r"(a|b)*a(a|b){3}", "fullmatch"), (r"a{2,5}", "fullmatch"), (r"(ab|a)*b?", "fullmatch"),
                      (r"", "fullmatch"), (r"a*", "search"), (r"(?:a?b?){5}", "fullmatch"),
                      (r"[ab]{0,3}c", "match"), (r"ab{2}", "search"), (r"(a|bc)+", "match"),
                      (r"(?:(a)|b)\1?c", "fullmatch")]


@pytest.mark.parametrize("pattern, mode", BIT_PARALLEL_CASES)
def test_assertion_free_patterns_take_the_bit_parallel_path(recorded, monkeypatch, pattern, mode):
    from pfuzz.automata.construction import bitsets

    fast = compile_dfa(pattern, LETTERS, mode=mode)
    assert not recorded  # no configuration went through the general step
    monkeypatch.setattr(bitsets, "applies", lambda nfa: False)
    assert compile_dfa(pattern, LETTERS, mode=mode) == fast  # the same canonical minimal DFA
    call = getattr(re.compile(pattern), mode)  # reference: re in the same mode
    for s in strings_upto("abc", 5):
        assert fast.accepts(s) == bool(call(s)), s


def test_moves_of_many_word_operations_take_the_sets(monkeypatch, recorded):
    from pfuzz.automata.construction import bitsets

    pattern = r"x.{0,40}y"  # the exits of the 40 nested optional copies share one target group
    fast = compile_dfa(pattern, LETTERS | CharSet.from_chars("xy"))
    assert not recorded
    monkeypatch.setattr(bitsets, "MAX_GROUPS", 1)
    assert compile_dfa(pattern, LETTERS | CharSet.from_chars("xy")) == fast
    assert recorded  # the set-based path built it


def test_the_bit_parallel_path_meets_the_state_cap_and_budget():
    with pytest.raises(StateLimitError, match="state cap"):
        compile_dfa(r"(a|b)*a(a|b){12}", CharSet.range("a", "b"), cap=4_000)
    # A search for .{n}: configuration k holds k threads; the budget counts their words.
    assert compile_dfa(r".{3000}", CharSet.range("a", "b"), mode="search").n_states == 3001


def test_a_large_nfa_takes_the_bits_when_sets_run_out_of_budget(monkeypatch, recorded):
    from pfuzz.automata.construction import bitsets

    monkeypatch.setattr(bitsets, "BIT_STATES", 100)
    # As sets, the search costs about 300²/2 = 45,000 steps, past the budget of 16 × 1,000.
    dfa = compile_dfa(r".{300}", CharSet.range("a", "b"), mode="search", cap=1_000)
    assert recorded  # the set-based path ran first
    assert dfa.n_states == 301  # strings of 300 characters or more: a chain of 301 states
    for n in (0, 299, 300, 301, 450):
        text = "ab" * (n // 2) + "a" * (n % 2)
        assert dfa.accepts(text) == bool(re.search(r".{300}", text)), n  # reference: re.search
    with pytest.raises(StateLimitError, match="work budget"):  # both ways over budget: refused
        compile_dfa(r"(?:a?b?){150}", CharSet.from_chars("ab"), mode="search", cap=2_000)


def test_a_memoryless_look_back_is_not_stored_in_configurations(recorded):
    compile_dfa(r"(?m)^a$\n^b", CharSet.from_chars("ab\n"))
    assert all(config[1] == 0 for _, config in recorded)


def test_a_lookbehind_tracker_is_carried_in_configurations(recorded):
    dfa = compile_dfa(r"[ab]*(?<!a)", LETTERS)
    assert len({config[1] for _, config in recorded}) > 1
    rx = re.compile(r"[ab]*(?<!a)")  # reference: re.fullmatch
    for s in strings_upto("abc", 4):
        assert dfa.accepts(s) == bool(rx.fullmatch(s)), s


def test_the_work_budget_stops_nested_optional_repeats():
    # (?:a?b?){n}: every state's ε-closure reaches all later copies, so the subset construction
    # costs O(n²) steps for n + 1 states; the budget (16 steps per state of the cap) ends it.
    with pytest.raises(StateLimitError, match="work budget"):
        compile_dfa(r"(?:a?b?){150}", CharSet.from_chars("ab"), cap=2_000)
    assert compile_dfa(r"(?:a?b?){40}", CharSet.from_chars("ab"), cap=2_000).n_states == 81
