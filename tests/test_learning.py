"""``pfuzz.learning``: the oracle, symbol classes, equivalence tests, the loop, and ``pfuzz learn``.

References named beside each check: Python's ``re`` decides what a validator written as a
pattern accepts; brute force over short strings decides languages; a hand-written Python
function (balanced brackets, equal counts) stands for a validator that is not regular, whose
language has no finite automaton (a fact of the trade: the pumping lemma). Seeds are fixed;
no check reads a clock.
"""

from __future__ import annotations

import json
import re

import pytest
from click.testing import CliRunner

import pfuzz
from helpers import strings_upto
from pfuzz.automata import algebra
from pfuzz.base.charset import CharSet
from pfuzz.base.randomness import source
from pfuzz.cli import main
from pfuzz.errors import ArgumentError
from pfuzz.learning import learn
from pfuzz.learning.conformance import difference_witnesses
from pfuzz.learning.oracle import Exhausted, Oracle, change_point
from pfuzz.learning.symbols import EDGE_RANGES, Symbols, boundary, probes


def fullmatch(pattern: str, flags: int = 0):
    compiled = re.compile(pattern, flags)
    return lambda strings: [compiled.fullmatch(s) is not None for s in strings]


class Recorder:
    """A validator that remembers every round it was asked."""

    def __init__(self, accepts):
        self.accepts, self.rounds = accepts, []

    def __call__(self, strings):
        self.rounds.append(list(strings))
        return [self.accepts(s) for s in strings]


# -- the oracle ----------------------------------------------------------------------------------

def test_oracle_asks_each_string_once_and_counts_rounds():
    recorder = Recorder(lambda s: s.startswith("a"))
    oracle = Oracle(recorder, max_queries=10)
    assert oracle.ask(["a", "b", "a"]) == [True, False, True]
    assert oracle.ask(["b", "ab"]) == [False, True]
    assert oracle.ask(["a", "ab"]) == [True, True]  # all known: no round
    assert recorder.rounds == [["a", "b"], ["ab"]]
    assert (oracle.queries, oracle.rounds) == (3, 2)


def test_oracle_never_sends_a_round_past_the_budget():
    recorder = Recorder(lambda s: True)
    oracle = Oracle(recorder, max_queries=3)
    oracle.ask(["a", "b"])
    with pytest.raises(Exhausted) as caught:
        oracle.ask(["c", "d"])
    assert caught.value.budget == "queries"
    assert recorder.rounds == [["a", "b"]] and oracle.room() == 1


def test_oracle_refuses_a_short_answer():
    oracle = Oracle(lambda strings: [True], max_queries=10)
    with pytest.raises(ArgumentError):
        oracle.ask(["a", "b"])


@pytest.mark.parametrize("values", [[0, 1], [0, 0, 0, 1], [1, 1, 0, 0, 0], [0, 1, 1, 1, 1, 1, 1, 1]])
def test_change_point_finds_a_flip(values):
    i = change_point(0, len(values) - 1, lambda k: bool(values[k]))
    assert values[i] != values[i + 1]  # brute force: the definition


# -- symbol classes ---------------------------------------------------------------------------------

def test_probes_are_the_range_edges_and_interior_characters_from_the_seed():
    digits_and_letters = CharSet.of([(ord("0"), ord("9")), (ord("a"), ord("z"))])
    first = probes(digits_and_letters, 2, source(7))
    assert {"0", "9", "a", "z"} <= set(first) and len(first) == 6
    assert all(ch in digits_and_letters for ch in first)
    assert first == probes(digits_and_letters, 2, source(7))  # same seed, same probes


def test_a_small_class_is_probed_everywhere():
    assert probes(CharSet.range("a", "d"), 2, source(0)) == ("a", "b", "c", "d")


def test_a_class_of_many_ranges_is_probed_at_its_first_and_last_ranges():
    chars = CharSet.of([(p, p) for p in range(0x100, 0x200, 2)])  # 128 ranges of one character
    edges = [chr(lo) for lo, _ in chars.ranges]
    chosen = probes(chars, 0, source(0))
    assert chosen == tuple(edges[:EDGE_RANGES // 2] + edges[-(EDGE_RANGES // 2):])


def test_bisection_finds_the_exact_boundary_inside_a_class():
    # The validator (re) treats [a-m] and [n-z] differently; the class is [a-z].
    symbols = Symbols([CharSet.range("a", "z")], 0, source(0))
    oracle = Oracle(fullmatch("x[a-m]y"), max_queries=100)
    point = boundary(symbols, "s", "x", "y", oracle)
    assert chr(point) == "n"
    new = symbols.split(0, point)
    assert symbols.classes[0].chars == CharSet.range("a", "m")
    assert symbols.classes[new].chars == CharSet.range("n", "z")
    assert oracle.queries <= 1 + 5  # log2 of 18 characters between a and s, and the ends


# -- equivalence tests -----------------------------------------------------------------------------

def test_the_first_difference_witness_is_the_shortlex_least_difference():
    a = pfuzz.compile("[ab]{1,3}", "[abc]")
    b = pfuzz.compile("a[ab]?|bb", "[abc]")
    words = difference_witnesses(a.dfa, b.dfa)
    assert words[0][0] == algebra.distinguish(a.dfa, b.dfa)
    for word, b_accepts in words:  # each is a difference, and says how b answers (re decides)
        in_a = re.fullmatch("[ab]{1,3}", word) is not None
        in_b = re.fullmatch("a[ab]?|bb", word) is not None
        assert in_a != in_b and in_b == b_accepts
    assert [w for w, _ in words] == sorted((w for w, _ in words), key=lambda w: (len(w), w))
    assert difference_witnesses(a.dfa, a.dfa) == []


# -- the loop ------------------------------------------------------------------------------------------

def test_queries_and_rounds_are_counted_as_asked():
    recorder = Recorder(lambda s: re.fullmatch("[A-Z]{2}-[0-9]{3}", s) is not None)
    model = learn(recorder, pfuzz.compile("[A-Z]{2}-[0-9]{4}"), max_queries=50_000)
    sent = [s for batch in recorder.rounds for s in batch]
    assert model.queries == len(sent) == len(set(sent))  # each distinct string once
    assert model.rounds == len(recorder.rounds) and all(recorder.rounds)
    assert model.queries <= 50_000


def test_same_seed_same_model():
    spec = pfuzz.compile("[a-z]{2,4}[0-9]")
    runs = [learn(fullmatch("[a-y]{2,4}[0-9]"), spec, seed=3) for _ in range(2)]
    assert runs[0].model.dfa == runs[1].model.dfa
    assert runs[0].classes == runs[1].classes
    assert (runs[0].queries, runs[0].rounds) == (runs[1].queries, runs[1].rounds)


def test_an_off_by_one_at_a_later_position_is_found():
    # The validator refuses 00 as a berth number; re.fullmatch is the reference.
    spec = pfuzz.compile("[A-Z]-[0-9]{2}")
    model = learn(fullmatch("[A-Z]-(0[1-9]|[1-9][0-9])"), spec)
    assert not model.equals_specification
    assert model.wrongly_rejected.to_pattern() == "[A-Z]-00"
    assert model.wrongly_accepted.is_empty()
    assert "A-00" in model.confirmed_differences


def test_a_class_split_is_found_when_one_interior_character_is_treated_differently():
    spec = pfuzz.compile("[a-z]{1,3}")
    bug = "[a-pr-z]{1,3}"                       # q is refused: re is the reference
    everywhere = learn(fullmatch(bug), spec, interior_probes=24)  # every letter probed
    by_a_case = learn(fullmatch(bug), spec, extra_tests=["xqx"])  # a case with a q
    for model in (everywhere, by_a_case):
        assert CharSet.single("q") in [c.chars for c in model.classes]
        assert model.splits >= 1
        for word in strings_upto("apqz", 3):
            assert model.model.accepts(word) == (re.fullmatch(bug, word) is not None)


def test_strings_sampled_from_the_differences_refute_a_hypothesis_the_probes_miss():
    # The validator forgot the case flag: "aaa" passes, "Aaa", "aAa", ... do not. Probing one
    # position at a time beside a representative (A) never meets three lower-case letters at
    # once; a string drawn from spec - hypothesis does. re.fullmatch is the reference, and
    # 52**3 - 26**3 strings of three letters are the validator's wrong rejects (by counting).
    model = learn(fullmatch("[a-z]{3}"), pfuzz.compile("(?i)[a-z]{3}"))
    assert model.wrongly_rejected.count(3) == 52 ** 3 - 26 ** 3 and model.wrongly_accepted.is_empty()
    for word in ["abc", "Abc", "ABC", "zzz", "ab"]:
        assert model.model.accepts(word) == (re.fullmatch("[a-z]{3}", word) is not None)


def test_an_unprobed_interior_character_is_beyond_the_guarantee():
    # With no interior probes and no case holding q, the q-class is never split: the model
    # is the specification, and the guarantee says what it rests on.
    model = learn(fullmatch("[a-pr-z]{1,3}"), pfuzz.compile("[a-z]{1,3}"), interior_probes=0)
    assert model.equals_specification
    assert "treats every character of each class alike" in model.guarantee()


def test_a_hostile_character_is_a_class_of_its_own():
    # re.match with $ accepts a final newline (the re documentation); the specification does not.
    spec = pfuzz.compile("[0-9]{1,3}")
    compiled = re.compile("[0-9]{1,3}$")
    model = learn(lambda strings: [compiled.match(s) is not None for s in strings], spec,
                  extra_characters="\n")
    assert CharSet.single("\n") in [c.chars for c in model.classes]
    for word in strings_upto("09a\n", 5):
        assert model.model.accepts(word) == (compiled.match(word) is not None)
        assert model.wrongly_accepted.accepts(word) == (compiled.match(word) is not None
                                                       and word.endswith("\n"))


def test_unicode_digits_are_found_in_a_wide_alphabet():
    # re's \d matches ARABIC-INDIC DIGIT FIVE (Unicode category Nd, the re documentation).
    spec = pfuzz.compile("[0-9]{2}")
    model = learn(fullmatch(r"\d{2}"), spec, alphabet=pfuzz.ALPHABETS["bmp"],
                  extra_characters="\u0665")
    assert model.wrongly_accepted.accepts("\u0665\u0665")
    assert model.wrongly_accepted.accepts("1\u0665")
    assert not model.wrongly_accepted.accepts("11")


def balanced(text: str) -> bool:
    """Balanced brackets: not a regular language (the pumping lemma)."""
    depth = 0
    for ch in text:
        depth += 1 if ch == "(" else -1
        if depth < 0:
            return False
    return depth == 0


def test_a_validator_that_is_not_regular_ends_with_a_budget_run_out():
    spec = pfuzz.compile(r"(\(\))*", "[()]")
    model = learn(lambda strings: [balanced(s) for s in strings], spec, max_states=12)
    assert model.budget_exhausted == "states"
    assert model.hypothesis_states <= 12
    assert model.guarantee().startswith("none:")
    for word in strings_upto("()", 6):  # what was learned is right on the short strings
        if len(word) <= 4:
            assert model.model.accepts(word) == balanced(word)


def test_equal_counts_end_with_the_query_budget():
    spec = pfuzz.compile("(ab)*", "[ab]")
    model = learn(lambda strings: [s.count("a") == s.count("b") for s in strings], spec,
                  max_queries=3_000)
    assert model.budget_exhausted == "queries" and model.queries <= 3_000
    assert not model.equals_specification


def test_a_budget_too_small_for_a_first_hypothesis_gives_no_guarantee():
    model = learn(fullmatch("[0-9]{2}"), pfuzz.compile("[0-9]{2}"), max_queries=1)
    assert model.budget_exhausted == "queries" and model.queries <= 1
    assert model.conformance_depth is None and model.guarantee().startswith("none:")
    assert len(model.classes) == 2  # the specification's: [0-9] and the rest


def test_guarantee_states_both_conditions():
    model = learn(fullmatch("[A-Z][0-9]"), pfuzz.compile("[A-Z][0-9]"), interior_probes=3)
    text = model.guarantee()
    assert model.equals_specification and model.conformance_depth == 1
    assert text.startswith("exact, provided the validator treats every character of each class")
    assert "at 3 interior characters" in text
    assert f"needs at most {model.hypothesis_states + 1} states" in text


@pytest.mark.parametrize("options", [{"max_queries": 0}, {"max_states": 0},
                                     {"interior_probes": -1}, {"extra_states": -1},
                                     {"max_seconds": 0}])
def test_bad_budgets_are_argument_errors(options):
    with pytest.raises(ArgumentError):
        learn(fullmatch("a"), pfuzz.compile("a"), **options)


def test_extra_tests_outside_the_alphabet_are_left_out():
    model = learn(fullmatch("[0-9]"), pfuzz.compile("[0-9]"), extra_tests=["\u00e9", "5"])
    assert model.equals_specification


# -- pfuzz learn -----------------------------------------------------------------------------------------

def run(*args: str):
    return CliRunner().invoke(main, ["learn", *args])


def test_cli_prints_the_model_and_its_differences():
    result = run("--pattern", "[A-Z]{2}-[0-9]{4}", "--regex", r"[A-Z]{2}-[0-9]{4}$",
                 "--mode", "match")
    assert result.exit_code == 1, result.output
    out = result.output
    assert "model: 9 states, different from the specification" in out
    assert r"model pattern: [A-Z]{2}-[0-9]{4}\n?" in out
    assert r"pattern:  [A-Z]{2}-[0-9]{4}\n" in out
    assert "wrongly rejected (specification - model): none" in out
    assert "guarantee: exact, provided" in out and "queries:" in out


def test_cli_json_and_exit_0_for_a_correct_validator():
    result = run("--pattern", "[0-9]{2}", "--regex", "[0-9]{2}", "--format", "json")
    assert result.exit_code == 0, result.output
    report = json.loads(result.output)
    assert report["equals_specification"] is True and report["states"] == 3
    assert report["wrongly_accepted"]["empty"] and report["budget_exhausted"] is None
    assert report["queries"] > 0 and report["guarantee"].startswith("exact")


def test_cli_needs_one_validator_and_one_specification():
    assert run("--pattern", "a").exit_code == 2
    assert run("--regex", "a").exit_code == 2
    result = run("--pattern", "a", "--regex", "a", "--learn-queries", "0")
    assert result.exit_code == 2 and "Traceback" not in result.output


def test_cli_python_target(tmp_path, monkeypatch):
    (tmp_path / "ferry.py").write_text(
        "def berth(text):\n"
        "    return len(text) == 2 and text.isdigit() and text != '00'\n", encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    result = run("--pattern", "[0-9]{2}", "--target", "ferry:berth", "--no-hostile")
    assert result.exit_code == 1, result.output
    assert "wrongly rejected (specification - model): 1 string" in result.output
    assert 'shortest: "00"' in result.output
