"""Near-miss languages: hand-derived counts, kinds, range edges, the reject sampler."""

from __future__ import annotations

import re

import pytest
from scipy.stats import chisquare

import pfuzz
from pfuzz.counting.tables import Counter
from pfuzz.errors import EmptyLanguageError, PfuzzError
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.nearmiss.rejects import kinds_of, near_miss_dfa, sample_rejects
from pfuzz.nearmiss.edits import apply_edits


def counts(dfa, high):
    counter = Counter(dfa)
    return {n: c for n in range(high + 1) if (c := counter.count(n))}


def strings(dfa, high):
    return set(Counter(dfa).enumerate(0, high))


# -- hand-computed languages -------------------------------------------------------------

def test_one_literal_pair_over_three_letters():
    # L = {"ab"} over {a, b, c}. One edit away and not "ab":
    #   delete:  "b", "a"
    #   insert:  xab, axb, abx for x in abc -> aab bab cab abb acb aba abc (7 distinct)
    #   replace: bb cb (first), aa ac (second)
    #   swap:    ba
    lang = pfuzz.compile("ab", alphabet="[abc]")
    assert strings(near_miss_dfa(lang.dfa, 1, ["delete"]), 5) == {"a", "b"}
    assert strings(near_miss_dfa(lang.dfa, 1, ["insert"]), 5) == {
        "aab", "bab", "cab", "abb", "acb", "aba", "abc"}
    assert strings(near_miss_dfa(lang.dfa, 1, ["replace"]), 5) == {"bb", "cb", "aa", "ac"}
    assert strings(near_miss_dfa(lang.dfa, 1, ["swap"]), 5) == {"ba"}
    assert counts(near_miss_dfa(lang.dfa, 1), 5) == {1: 2, 2: 5, 3: 7}


def test_three_digits_over_printable_ascii_distance_one():
    # L = [0-9]{3} over the 95 printable characters, 85 of them not digits.
    # Length 2 (delete): every 2-digit string, 100.
    # Length 3 (replace; a swap of digits stays in L): exactly one non-digit, 3 * 85 * 10**2.
    # Length 4 (insert): 4 digits (10**4) or exactly one non-digit (4 * 85 * 10**3).
    lang = pfuzz.compile("[0-9]{3}")
    assert counts(near_miss_dfa(lang.dfa, 1), 8) == {2: 100, 3: 25_500, 4: 350_000}
    assert counts(near_miss_dfa(lang.dfa, 1, ["delete"]), 8) == {2: 100}
    assert counts(near_miss_dfa(lang.dfa, 1, ["replace"]), 8) == {3: 25_500}
    assert counts(near_miss_dfa(lang.dfa, 1, ["insert"]), 8) == {4: 350_000}
    assert near_miss_dfa(lang.dfa, 1, ["swap"]).is_empty()


def test_three_digits_over_printable_ascii_distance_two():
    # Within OSA distance 2 of some 3-digit string, and not in L:
    #   length 1: a digit (two deletions)                          10
    #   length 2: at least one digit (a deletion, a substitution)  95**2 - 85**2
    #   length 3: at least one digit, minus L                      95**3 - 85**3 - 10**3
    #   length 4: at most two non-digits (one extra character, and at most one
    #             substitution; a swap cannot involve the extra one)
    #             10**4 + 4*85*10**3 + 6*85**2*10**2
    #   length 5: two extra characters: at most two non-digits
    #             10**5 + 5*85*10**4 + 10*85**2*10**3
    lang = pfuzz.compile("[0-9]{3}")
    assert counts(near_miss_dfa(lang.dfa, 2), 9) == {
        1: 10, 2: 95**2 - 85**2, 3: 95**3 - 85**3 - 10**3,
        4: 10**4 + 4 * 85 * 10**3 + 6 * 85**2 * 10**2,
        5: 10**5 + 5 * 85 * 10**4 + 10 * 85**2 * 10**3}


def test_two_swaps_at_distance_two():
    # L = {"abcd"} over {a, b, c, d}: two disjoint adjacent swaps give "badc";
    # one swap gives "bacd", "acbd", "abdc". Overlapping swaps ("bcad") are not OSA 2.
    lang = pfuzz.compile("abcd", alphabet="[abcd]")
    assert strings(near_miss_dfa(lang.dfa, 2, ["swap"]), 6) == {"bacd", "acbd", "abdc", "badc"}


def test_kinds_restrict_operations_for_larger_distances():
    lang = pfuzz.compile("[0-9]{3}")
    assert counts(near_miss_dfa(lang.dfa, 2, ["delete"]), 9) == {1: 10, 2: 100}


def test_the_empty_language_and_everything_have_no_near_misses():
    assert near_miss_dfa(pfuzz.compile("[^\\s\\S]", alphabet="[ab]").dfa, 2).is_empty()
    assert near_miss_dfa(pfuzz.compile("[ab]*", alphabet="[ab]").dfa, 1).is_empty()


def test_arguments_are_checked():
    dfa = pfuzz.compile("a").dfa
    for bad in (0, -1, 1.5, True):
        with pytest.raises(PfuzzError):
            near_miss_dfa(dfa, bad)
    with pytest.raises(PfuzzError, match="unknown edit kind"):
        near_miss_dfa(dfa, 1, ["flip"])
    with pytest.raises(PfuzzError):
        near_miss_dfa(dfa, 1, [])


def test_results_are_cached_and_wrapped_by_the_language():
    lang = pfuzz.compile("[0-9]{3}")
    assert near_miss_dfa(lang.dfa, 1) is near_miss_dfa(lang.dfa, 1)
    assert lang.near_misses().count(2) == 100


# -- range edges --------------------------------------------------------------------------

def test_edge_mode_writes_only_edge_characters():
    # L = [0-5]. Edges of the one transition: '/' and '6'. Substitutions write
    # them; insertions happen before the digit (the final state has no
    # transitions, so no edges); the deletion gives the empty string.
    lang = pfuzz.compile("[0-5]")
    expected = {"", "/", "6"} | {e + d for e in "/6" for d in "012345"}
    assert strings(near_miss_dfa(lang.dfa, 1, edges=True), 4) == expected


def test_edge_mode_on_a_two_digit_range():
    # 1[0-2]: the first transition reads '1' (edges '0' and '2'), the second
    # [0-2] (edges '/' and '3'). Substitutions then give 0d and 2d for d in 0-2,
    # and "1/", "13".
    lang = pfuzz.compile("1[0-2]")
    replaced = strings(near_miss_dfa(lang.dfa, 1, ["replace"], edges=True), 4)
    assert replaced == {"00", "01", "02", "20", "21", "22", "1/", "13"}


def test_edge_rejects_favour_off_by_one_values():
    lang = pfuzz.compile("[0-9]{2}-[0-9]{2}")
    rejects = sample_rejects(lang.dfa, 200, kinds=["replace"], edges=True, seed=3)
    written = {e.new for r in rejects for e in r.edits if e.kind == "replace"}
    assert written <= {"/", ":", ",", ".", "-", "0", "9"}


# -- sampling -------------------------------------------------------------------------------

PLATE = r"[A-Z]{2}[0-9]{4}"


def test_rejects_are_rejected_and_explained():
    lang = pfuzz.compile(PLATE)
    for reject in sample_rejects(lang.dfa, 300, seed=7):
        assert re.fullmatch(PLATE, reject.text) is None  # reference matcher: Python's re
        assert re.fullmatch(PLATE, reject.witness)
        assert apply_edits(reject.witness, reject.edits) == reject.text
        assert reject.distance == len(reject.edits) == 1
        assert reject.kinds and set(reject.kinds) <= set(EDIT_KINDS)


def test_same_seed_same_rejects():
    lang = pfuzz.compile(PLATE)
    first = sample_rejects(lang.dfa, 50, seed=11, kinds=["swap", "delete"])
    assert first == sample_rejects(lang.dfa, 50, seed=11, kinds=["swap", "delete"])
    assert first != sample_rejects(lang.dfa, 50, seed=12, kinds=["swap", "delete"])


def test_strata_get_equal_shares_and_interleave():
    lang = pfuzz.compile("[0-9]{3}")
    rejects = sample_rejects(lang.dfa, 9, seed=1, kinds=["insert", "delete", "replace"])
    assert [len(r.text) for r in rejects] == [2, 4, 3] * 3  # order of EDIT_KINDS: delete, insert, replace


def test_empty_strata_pass_their_share_on():
    lang = pfuzz.compile("[0-9]{3}")
    rejects = sample_rejects(lang.dfa, 10, seed=1, kinds=["swap", "delete"])
    assert len(rejects) == 10 and {len(r.text) for r in rejects} == {2}


def test_kinds_list_every_kind_that_reaches_a_reject():
    lang = pfuzz.compile("ab", alphabet="[abc]")
    assert kinds_of(lang.dfa, "ba") == ("swap",)
    assert kinds_of(lang.dfa, "aa") == ("replace",)
    assert kinds_of(lang.dfa, "abb") == ("insert",)
    both = pfuzz.compile("ab|ba|a", alphabet="[abc]")
    assert kinds_of(both.dfa, "bb") == ("replace",)
    assert kinds_of(both.dfa, "b") == ("delete", "replace")  # from "ab"; from "a"
    # "bac": a swap of "abc", a substitution in "bbc".
    assert kinds_of(pfuzz.compile("abc|bbc", alphabet="[abc]").dfa, "bac") == ("replace", "swap")


def test_length_bounds_and_nothing_to_draw():
    lang = pfuzz.compile("[0-9]{3}")
    assert {len(r.text) for r in sample_rejects(lang.dfa, 20, min_length=4, seed=0)} == {4}
    with pytest.raises(EmptyLanguageError):
        sample_rejects(lang.dfa, 5, min_length=6, max_length=8)
    with pytest.raises(EmptyLanguageError):
        sample_rejects(pfuzz.compile("[ab]*", alphabet="[ab]").dfa, 3)
    assert sample_rejects(lang.dfa, 0) == []


def test_rejects_at_distance_two_carry_their_distance():
    lang = pfuzz.compile(PLATE)
    for reject in sample_rejects(lang.dfa, 100, distance=2, seed=5):
        assert reject.distance in (1, 2) and len(reject.edits) == reject.distance
        assert apply_edits(reject.witness, reject.edits) == reject.text


def test_language_facade_forwards():
    lang = pfuzz.compile(PLATE)
    rejects = lang.rejects(5, seed=2, kinds=["replace"])
    assert all("replace" in r.kinds for r in rejects)
    assert rejects[0].as_dict()["edits"][0]["kind"] == "replace"


def test_uniform_within_a_length():
    # Chi-squared goodness of fit (scipy.stats) over all near misses of length 3 of L = a(b|c)a over {a, b, c}: every string equally likely.
    lang = pfuzz.compile("a[bc]a", alphabet="[abc]")
    support = sorted(Counter(near_miss_dfa(lang.dfa, 1)).enumerate(3, 3))
    draws = sample_rejects(lang.dfa, 40 * len(support), min_length=3, max_length=3, seed=9)
    observed = [sum(1 for r in draws if r.text == s) for s in support]
    assert sum(observed) == len(draws)
    assert chisquare(observed).pvalue > 1e-3


# -- the Hypothesis strategy (pfuzz.strategies.rejected) -------------------------------------

def test_rejected_strategy_draws_rejects():
    from hypothesis import given, settings

    from pfuzz.strategies import rejected

    @settings(max_examples=60, deadline=None, database=None)
    @given(rejected(PLATE, kinds=["replace", "swap"]))
    def check(text):
        assert re.fullmatch(PLATE, text) is None and len(text) == 6  # reference: Python's re

    check()


def test_rejected_strategy_shrinks_to_the_shortlex_least_reject():
    from hypothesis import find, settings

    from pfuzz.strategies import rejected

    quiet = settings(database=None, max_examples=200)
    # [0-9]{3}: the shortest near misses have two digits ("00" is least); at
    # length 4 the least is a space (U+0020, the first printable) before "000".
    assert find(rejected("[0-9]{3}"), lambda s: True, settings=quiet) == "00"
    # (the walk alone: with boundary cases a failing boundary case such as "0000" may be
    # reported instead, as pfuzz.strategies says)
    assert find(rejected("[0-9]{3}", boundary=0), lambda s: len(s) == 4, settings=quiet) == " 000"
    with pytest.raises(EmptyLanguageError):
        rejected("[ab]*", alphabet="[ab]")


def test_lengths_are_equally_likely():
    # [0-9]{3} has near misses of lengths 2, 3 and 4 only (see the counts above);
    # "even" lengths: each a third of the draws (chi-squared, scipy.stats).
    lang = pfuzz.compile("[0-9]{3}")
    draws = sample_rejects(lang.dfa, 3000, seed=4)
    observed = [sum(1 for r in draws if len(r.text) == n) for n in (2, 3, 4)]
    assert sum(observed) == 3000 and chisquare(observed).pvalue > 1e-3


def test_large_automata_are_not_cut_and_keep_their_near_misses(monkeypatch):
    # Past SIMULATION_STATES the quadratic simulation matrices are not built; the
    # antichain cut only saves configurations, so the near-miss language is the same.
    from pfuzz.nearmiss import neighbourhood
    from pfuzz.nearmiss.neighbourhood import build

    dfa = pfuzz.compile(r"[a-c]{2,4}(x[0-9])?").dfa
    cut = build(dfa, 2, EDIT_KINDS, False)
    monkeypatch.setattr(neighbourhood, "SIMULATION_STATES", 1)
    monkeypatch.setattr(neighbourhood, "simulation", None)  # would fail if called
    assert build(dfa, 2, EDIT_KINDS, False) == cut
