"""The compiler on hand-built trees: assertions, lookarounds, captures, order of trying, classes, limits."""

from __future__ import annotations

import itertools
import re

import pytest

import pfuzz
from helpers import strings_upto
from pfuzz.automata import algebra
from pfuzz.base.charset import ALL, ALPHABETS, CharSet
from pfuzz.automata.construction.compiler import compile_dfa, compile_tree
from pfuzz.automata.dfa import DEFAULT_STATE_CAP
from pfuzz.errors import PatternError, StateLimitError
from pfuzz.automata.construction.simplify import simplify
from pfuzz.syntax.tree import (Alternation, Anchor, Atomic, Backreference, Boundary, Chars, Conditional, Group,
                               Lookahead, Lookbehind, Repeat, Sequence)

PRINTABLE = ALPHABETS["printable"]
NO_NEWLINE = CharSet.single("\n").complement()


def lit(text: str):
    items = tuple(Chars(CharSet.single(ch)) for ch in text)
    return items[0] if len(items) == 1 else Sequence(items)


def cls(lo: str, hi: str | None = None) -> Chars:
    return Chars(CharSet.range(lo, hi or lo))


def seq(*items):
    return Sequence(tuple(items))


def star(item):
    return Repeat(item, 0, None)


DOT_STAR = star(Chars(NO_NEWLINE))


def compiled(tree, alphabet: str | CharSet, cap: int = DEFAULT_STATE_CAP):
    letters = CharSet.from_chars(alphabet) if isinstance(alphabet, str) else alphabet
    return compile_tree(tree, letters, cap=cap, resolve=lambda node, u: node.chars & u)


def accepted(dfa, alphabet: str, max_length: int) -> set[str]:
    return {w for w in strings_upto(alphabet, max_length) if dfa.accepts(w)}


def test_literal_sequence_has_one_state_per_position():
    dfa = compiled(lit("abc"), PRINTABLE)
    assert dfa.n_states == 4 and dfa.accepts("abc") and not dfa.accepts("ab")


def test_characters_outside_the_alphabet_give_the_empty_language():
    assert compiled(lit("z"), "ab").is_empty()


def test_text_end_then_more_text_is_empty():
    assert compiled(seq(Anchor("text_end"), lit("a")), "a\n").is_empty()


def test_dollar_accepts_before_a_final_newline_only():
    dfa = compiled(seq(lit("a"), Anchor("end_or_final_newline"), star(lit("\n"))), "a\n")
    assert accepted(dfa, "a\n", 4) == {"a", "a\n"}


def test_line_anchors_need_the_newline_context():
    tree = seq(lit("a"), Anchor("line_end"), lit("\n"), Anchor("line_start"), lit("b"))
    assert accepted(compiled(tree, "ab\n", 4), "ab\n", 4) == {"a\nb"}
    blocked = seq(lit("a"), Anchor("line_start"), lit("b"))
    assert compiled(blocked, "ab\n").is_empty()


def test_lookahead_body_judges_dollar_against_the_whole_rest():
    # (?=a$) holds when the rest is "a" or "a\n"; the a·U* reading would accept "aa".
    tree = seq(Lookahead(seq(lit("a"), Anchor("end_or_final_newline")), False),
               star(Chars(ALL)))
    assert accepted(compiled(tree, "a\n", 4), "a\n", 4) == {"a", "a\n"}


def test_lookahead_body_sees_the_context_before_it():
    # a\n(?=^a)a with a line-start anchor inside the body: the body starts after '\n'.
    good = seq(lit("a\n"), Lookahead(seq(Anchor("line_start"), lit("a")), False), lit("a"))
    assert accepted(compiled(good, "a\n", 4), "a\n", 4) == {"a\na"}
    bad = seq(lit("a"), Lookahead(seq(Anchor("line_start"), lit("a")), False), lit("a"))
    assert compiled(bad, "a\n").is_empty()
    negated = seq(lit("a"), Lookahead(Anchor("text_start"), True), lit("a"))
    assert accepted(compiled(negated, "a\n", 3), "a\n", 3) == {"aa"}


def test_lookahead_at_the_start_is_an_intersection():
    # (?=X)Y == L(Y) ∩ L(X)·U* and (?!X)Y == L(Y) − L(X)·U* when X has no end assertion.
    x = seq(Repeat(cls("a"), 1, 2), cls("b"))
    y = star(Alternation((cls("a"), cls("b"))))
    ly, lx = compiled(y, "ab"), algebra.with_any_suffix(compiled(x, "ab"))
    positive = compiled(seq(Lookahead(x, False), y), "ab")
    negative = compiled(seq(Lookahead(x, True), y), "ab")
    assert algebra.distinguish(positive, algebra.intersection(ly, lx)) is None
    assert algebra.distinguish(negative, algebra.difference(ly, lx)) is None


def password_rule(classes):
    """^(?=.*C1)(?=.*C2)...(?=.{8,64}$).*$ for the given character classes."""
    looks = [Lookahead(seq(DOT_STAR, c), False) for c in classes]
    length = Lookahead(seq(Repeat(Chars(NO_NEWLINE), 8, 64), Anchor("end_or_final_newline")), False)
    return seq(Anchor("text_start"), *looks, length, DOT_STAR, Anchor("end_or_final_newline"))


def test_password_rule_equals_the_intersection_of_its_parts():
    classes = [cls("0", "9"), cls("a", "z"), cls("A", "Z"), Chars(CharSet.from_chars("!#$%&*"))]
    rule = compiled(password_rule(classes), PRINTABLE)
    expected = compiled(Repeat(Chars(NO_NEWLINE), 8, 64), PRINTABLE)
    for c in classes:
        expected = algebra.intersection(expected, compiled(seq(DOT_STAR, c, DOT_STAR), PRINTABLE))
    assert algebra.distinguish(rule, expected) is None
    # Four "seen a class" bits and lengths 0..64 (then 65 = "too long" collapses to dead).
    assert rule.n_states <= 16 * 65


def test_wide_classes_cost_few_symbol_classes():
    word = Chars(CharSet.of([(0x30, 0x39), (0x41, 0x5A), (0x61, 0x7A), (0xC0, 0x2FF)]))
    dfa = compiled(Repeat(word, 3, 30), ALPHABETS["unicode"])
    assert len(dfa.classes) == 2 and dfa.n_states == 31


def test_the_state_cap_stops_determinisation():
    ab = Alternation((cls("a"), cls("b")))
    tree = seq(star(ab), cls("a"), Repeat(ab, 12, 12))
    with pytest.raises(StateLimitError, match="1,000 states"):
        compiled(tree, "ab", cap=1000)


def test_the_state_cap_bounds_the_expanded_nfa():
    tree = Repeat(Repeat(cls("a"), 1000, 1000), 1000, 1000)
    with pytest.raises(StateLimitError):
        compiled(tree, "a", cap=10_000)


def test_bounded_repeat_has_one_state_per_position():
    # [a-z0-9]{1,n} has n + 1 states (its cost is measured by python -m pfuzz.benchmarks)
    chars = Chars(CharSet.of([(0x61, 0x7A), (0x30, 0x39)]))
    for n in (256, 1024):
        assert compiled(Repeat(chars, 1, n), PRINTABLE).n_states == n + 1


# -- through the parser and the Language façade (values derived by hand) -----------------

def lang(pattern: str, alphabet: str = "printable", **options):
    return pfuzz.compile(pattern, alphabet, **options)


def test_fixed_length_code():
    code = lang(r"[A-Z]{2}[0-9]{4}")
    # One state per position 0..6; classes [A-Z], [0-9] and every other character.
    assert (code.states, len(code.classes)) == (7, 3)
    assert code.accepts("AB1234") and not code.accepts("AB123") and not code.accepts("ab1234")
    assert code.is_finite() and (code.min_length, code.max_length) == (6, 6)


def test_unbounded_language_facts_and_complement():
    pairs = lang(r"(?:ab|ba)*", "[ab]")
    # start (accepting) -a-> expects b -b-> start; start -b-> expects a -a-> start.
    assert pairs.states == 3 and not pairs.is_finite()
    assert (pairs.min_length, pairs.max_length) == (0, None)
    other = pairs.complement()
    # Completed: 3 states plus the dead one, which becomes accepting and live.
    assert other.states == 4 and other.shortest() == "a"
    assert pairs.distinguish(other) == ""


def test_boolean_operations_match_hand_written_equivalents():
    starts_and_ends_with_a = lang(r"[ab]*a", "[ab]") & lang(r"a[ab]*", "[ab]")
    assert starts_and_ends_with_a.distinguish(lang(r"a|a[ab]*a", "[ab]")) is None
    assert (lang(r"a{2}") | lang(r"a{3}")).equivalent(lang(r"a{2,3}"))
    assert (lang(r"a{0,4}") - lang(r"a{2}")).equivalent(lang(r"|a|aaa|aaaa"))


def test_distinguish_returns_the_shortlex_least_difference():
    assert lang(r"a*").distinguish(lang(r"a{0,3}")) == "aaaa"
    # [ab]{2} minus aa is {ab, ba, bb}; "ab" comes first.
    assert lang(r"[ab]{2}", "[ab]").distinguish(lang(r"aa", "[ab]")) == "ab"
    assert lang(r"[ab]{2}", "[ab]").distinguish(lang(r"aa|ab|ba", "[ab]")) == "bb"


def test_empty_languages():
    for pattern in [r"a\Zb", r"(?=b)a", r"a^b", r"[^\s\S]"]:
        empty = lang(pattern, "ascii")
        assert empty.is_empty() and empty.states == 0, pattern


def test_trailing_dollar_changes_nothing_under_full_matching():
    # $ may match before a final '\n', but full matching must still consume that '\n'.
    assert lang(r"a$", "ascii").equivalent(lang(r"a\Z", "ascii"))
    assert lang(r"a$\n", "ascii").equivalent(lang(r"a\n", "ascii"))
    assert lang(r"a$\n\n", "ascii").is_empty()
    assert lang(r"(?m)a$\n\n", "ascii").equivalent(lang(r"a\n\n", "ascii"))


def test_state_cap_reaches_the_caller():
    with pytest.raises(StateLimitError, match="state cap"):
        lang(r"(a|b)*a(a|b){12}", "[ab]", state_cap=2000)


@pytest.mark.parametrize("pattern, position", [(r"(a*)\1", 4), (r"(?=(a|b+))\1", 10), ("(a", 0)])
def test_refused_patterns_raise_pattern_errors_with_positions(pattern, position):
    with pytest.raises(PatternError) as caught:
        lang(pattern)
    assert caught.value.position == position


def test_match_modes():
    digits = CharSet.from_chars("12\nx")
    # re.match(r"\d+$", ...) accepts "12" and "12\n"; re.search also accepts "x12".
    assert accepted(compile_dfa(r"\d+$", digits, mode="match"), "1\nx", 3) == {
        "1", "11", "111", "1\n", "11\n"}
    assert compile_dfa(r"\d+$", digits, mode="search").accepts("x12\n")
    with pytest.raises(ValueError, match="unknown match mode"):
        compile_dfa("a", digits, mode="prefix")


def test_an_unknown_mode_is_an_argument_error():
    from pfuzz.errors import ArgumentError
    with pytest.raises(ArgumentError, match="unknown match mode"):
        compile_dfa("a", ALPHABETS["ascii"], mode="prefix")


# -- the constructs that depend on what matched and how (trees by hand, languages by hand) --

def test_word_boundary_by_definition():
    # \b holds where exactly one neighbour is a word character, \B elsewhere, and neither
    # in the empty string (re's rule, sre AT_BOUNDARY); "a" is a word character, "-" is not.
    word = Chars(CharSet.from_chars("a"))
    any_char = Chars(CharSet.from_chars("a-"))
    edge = compiled(seq(star(any_char), Boundary(False), star(any_char)), "a-")
    assert accepted(edge, "a-", 3) == {w for w in strings_upto("a-", 3) if "a" in w}
    inside = compiled(seq(Boundary(True), star(any_char)), "a-")
    assert accepted(inside, "a-", 2) == {"-", "--", "-a"}
    assert accepted(compiled(seq(word, Boundary(False)), "a-"), "a-", 2) == {"a"}


def test_lookbehind_reads_the_prefix():
    a, b = cls("a"), cls("b")
    after_a = compiled(seq(star(Alternation((a, b))), Lookbehind(a, False), b), "ab")
    assert accepted(after_a, "ab", 4) == {w for w in strings_upto("ab", 4) if w.endswith("ab")}
    not_after_a = compiled(seq(star(Alternation((a, b))), Lookbehind(a, True), b), "ab")
    assert accepted(not_after_a, "ab", 3) == {"b", "bb", "abb", "bbb"}


def test_lookbehind_with_anchor_and_lookahead_inside():
    a, b = cls("a"), cls("b")
    # (?<=^a)b: the a must stand at the start; (?<=a(?=b)) also looks past the position.
    assert accepted(compiled(seq(a, Lookbehind(seq(Anchor("text_start"), a), False), b), "ab"), "ab", 3) == {"ab"}
    ahead = seq(a, Lookbehind(seq(a, Lookahead(b, False)), False), star(Alternation((a, b))))
    assert accepted(compiled(ahead, "ab"), "ab", 3) == {"ab", "aba", "abb"}


def test_backreference_repeats_the_capture():
    choice = Group(Alternation((cls("a"), seq(cls("a"), cls("b")))), 1)
    twice = compiled(seq(choice, Backreference(1)), "ab")
    assert accepted(twice, "ab", 5) == {"aa", "abab"}


def test_backreference_sees_the_last_copy_of_a_repeated_group():
    # (?:(a)|b)*\1: the reference reads the last a the loop captured, and fails if none.
    loop = star(Alternation((Group(cls("a"), 1), cls("b"))))
    found = accepted(compiled(seq(loop, Backreference(1)), "ab"), "ab", 4)
    assert found == {w for w in strings_upto("ab", 4) if w.endswith("a") and "a" in w[:-1]}


def test_conditional_follows_whether_the_group_took_part():
    tree = seq(Repeat(Group(cls("a"), 1), 0, 1), Conditional(1, cls("b"), cls("c")))
    assert accepted(compiled(tree, "abc"), "abc", 3) == {"ab", "c"}


def test_atomic_group_keeps_its_first_way():
    a, b, c = cls("a"), cls("b"), cls("c")
    # (?>a|ab)c: the atomic group commits to "a" when it can, so "abc" is refused.
    first = compiled(seq(Atomic(Alternation((a, seq(a, b)))), c), "abc")
    assert accepted(first, "abc", 4) == {"ac"}
    # (?>a*)a: the greedy loop leaves no a behind.
    assert compiled(seq(Atomic(star(a)), a), "a").is_empty()


def test_possessive_repeat_never_gives_one_back():
    a, b = cls("a"), cls("b")
    possessive = compiled(seq(Repeat(Alternation((a, seq(a, b))), 0, None, possessive=True), cls("c")), "abc")
    assert accepted(possessive, "abc", 4) == {"c", "ac", "aac", "aaac"}


def test_runs_and_nested_optionals_fold_into_one_repeat():
    a = cls("a")
    assert simplify(Repeat(Repeat(a, 0, 1), 2500, 2500)) == Repeat(a, 0, 2500)
    assert simplify(Sequence((Repeat(a, 0, 1),) * 5000)) == Repeat(a, 0, 5000)
    assert simplify(Repeat(Repeat(a, 2, 3), 0, 4)) == Repeat(Repeat(a, 2, 3), 0, 4)  # {0,2,3,4,...}: a gap
    assert compiled(Repeat(Repeat(a, 0, 1), 2500, 2500), "a") == compiled(Repeat(a, 0, 2500), "a")


POSSESSIVE_RUNS = [r"a{2,4}+", r"a{2,4}+a", r"a{,3}+b?", r"[ab]{1,}+b", r"a*+", r"a{3}+a?",
                   r"(?i)a{1,2}+A", r"x(?:a{0,2}+|b)a", r"a?+a", r"[^b]{1,3}+b*"]


@pytest.mark.parametrize("pattern", POSSESSIVE_RUNS)
def test_a_possessive_run_of_one_class_needs_no_atomic_groups(pattern, monkeypatch):
    from pfuzz.automata.construction import simplify as simplify_module

    alphabet = CharSet.from_chars("abAx")
    rewritten = compile_dfa(pattern, alphabet)
    rx = re.compile(pattern)  # reference: re.fullmatch
    for n in range(7):
        for letters in itertools.product("abAx", repeat=n):
            text = "".join(letters)
            assert rewritten.accepts(text) == bool(rx.fullmatch(text)), (pattern, text)
    monkeypatch.setattr(simplify_module, "_longest_run", lambda node: None)
    assert compile_dfa(pattern, alphabet) == rewritten  # the same as through atomic groups


def test_a_long_possessive_run_is_linear():
    a = cls("a")
    assert simplify(Repeat(a, 0, 1001, possessive=True)) == Alternation(
        (Repeat(a, 1001, 1001), Sequence((Repeat(a, 0, 1000), Lookahead(a, True)))))
    # a{,1001}+ then b: 1,001 a's at most, then b (the run is the longest it can be). Counted by hand.
    assert compile_dfa(r"a{,1001}+b", CharSet.from_chars("ab")).n_states == 1003


def test_captured_characters_are_bounded():
    with pytest.raises(StateLimitError, match="different characters"):
        compile_dfa(r"(.)\1", ALPHABETS["bmp"])


def test_what_groups_capture_is_bounded_by_the_cap():
    # (\d{3})\1 must remember one of 1,000 captures: beyond 4 NFA states per allowed state.
    with pytest.raises(StateLimitError, match="groups capture"):
        compile_dfa(r"(\d{3})\1", CharSet.range("0", "9"), cap=1000)
    # {xyxy}: the start, x read (10), xy read (100), xyx read (10: only y is left to check), the end.
    assert compile_dfa(r"(\d{2})\1", CharSet.range("0", "9")).n_states == 1 + 10 + 100 + 10 + 1


def test_a_lookbehind_reading_a_capture_is_tracked_per_capture():
    digits = CharSet.range("0", "9")
    with pytest.raises(StateLimitError, match="lookbehind refers to group 1"):
        compile_dfa(r"(\d{4})-(?<=\1-)", digits | CharSet.single("-"))
    # (\d)-(?<=\1-): the character before "-" is the one captured, which it is by construction.
    assert compile_dfa(r"(\d)-(?<=\1-)", digits | CharSet.single("-")) == compile_dfa(r"\d-", digits | CharSet.single("-"))
