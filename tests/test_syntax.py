"""The parser: tree shapes, flags, verbose mode, refusals with positions, re's syntax errors, speed."""

from __future__ import annotations

import re

import pytest
from hypothesis import given, settings, strategies as st

from pfuzz.syntax.categories import category
from pfuzz.base.charset import ALL, CharSet
from pfuzz.errors import PatternError
from pfuzz.syntax.parser import parse
from pfuzz.syntax.tree import (Alternation, Anchor, Atomic, Backreference, Boundary, Chars, Conditional, Group,
                               Lookahead, Lookbehind, Repeat, Sequence, width)

I, A, S = int(re.I), int(re.A), int(re.S)


def char(text: str, position: int, source: str | None = None, flags: int = 0) -> Chars:
    return Chars(CharSet.from_chars(text), position, text if source is None else source, flags)


# -- tree shapes ---------------------------------------------------------------------

def test_sequence_of_repeated_classes():
    assert parse("[A-Z]{2}[0-9]{4}") == Sequence((
        Repeat(Chars(CharSet.range("A", "Z"), 0, "[A-Z]"), 2, 2, 5),
        Repeat(Chars(CharSet.range("0", "9"), 8, "[0-9]"), 4, 4, 13),
    ), 0)


def test_groups_dissolve_and_lazy_repeats_are_plain_repeats():
    assert parse("(ab)(?:c)(?P<n>d)") == Sequence(tuple(char(c, p) for c, p in zip("abcd", (1, 2, 7, 15))), 0)
    assert parse("(?:ab)*?") == Repeat(Sequence((char("a", 3), char("b", 4)), 0), 0, None, 6)
    assert parse("a{,3}?") == Repeat(char("a", 0), 0, 3, 1)


def test_alternation_keeps_options_and_empty_ones():
    assert parse("ab|c|") == Alternation((Sequence((char("a", 0), char("b", 1)), 0), char("c", 3), Sequence((), 5)), 0)
    assert parse("") == Sequence((), 0)
    assert parse("()") == Sequence((), 0)


def test_alternation_of_single_atoms_is_one_class_as_in_re():
    # re's parser turns a|[bc]|\d into one set (re/_parser.py, _parse_sub); so do we.
    merged = parse(r"a|[bc]|\d")
    assert merged == Chars(CharSet.from_chars("abc") | category("d"), 0, r"a|[bc]|\d", 0)
    assert isinstance(parse("a|[^b]"), Alternation)  # a negated class is not merged
    assert isinstance(parse("(?i:a)|b"), Alternation)  # nor a group with flags
    assert parse("(?:a|b)|c").source == "a|b|c"


def test_quantifier_applies_to_the_last_item_past_comments_and_verbose_space():
    assert parse("ab(?#note)*") == Sequence((char("a", 0), Repeat(char("b", 1), 0, None, 10)), 0)
    assert parse("(?x) a b *") == Sequence((char("a", 5), Repeat(char("b", 7), 0, None, 9)), 5)


def test_brace_that_is_not_a_quantifier_is_a_literal():
    assert parse("a{}") == Sequence((char("a", 0), char("{", 1), char("}", 2)), 0)
    assert parse("a{,}") == Repeat(char("a", 0), 0, None, 1)
    assert parse("a{1,x}") == Sequence(tuple(char(c, p) for p, c in enumerate("a{1,x}")), 0)
    assert parse("{") == char("{", 0)


def test_dot_anchors_and_lookaheads():
    assert parse(".") == Chars(ALL - CharSet.single("\n"), 0, ".", 0)
    assert parse("(?s).") == Chars(ALL, 4, ".", S)
    assert parse(r"^\A$\Z") == Sequence((Anchor("text_start", 0), Anchor("text_start", 1),
                                         Anchor("end_or_final_newline", 3), Anchor("text_end", 4)), 0)
    assert parse("(?m)^$") == Sequence((Anchor("line_start", 4), Anchor("line_end", 5)), 4)
    assert parse("(?=a)(?!b)") == Sequence((Lookahead(char("a", 3), False, 0), Lookahead(char("b", 8), True, 5)), 0)


def test_classes():
    assert parse("[]a-]").chars == CharSet.from_chars("]a-")
    assert parse("[^]]").chars == CharSet.single("]").complement()
    assert parse("[-a]").chars == CharSet.from_chars("-a")
    assert parse(r"[\b]").chars == CharSet.single("\b")
    assert parse(r"[\d_]").chars == category("d") | CharSet.single("_")
    assert parse(r"[^\W\d]").chars == (category("W") | category("d")).complement()
    assert parse(r"[\x41-\u0043\101]").chars == CharSet.range("A", "C")
    assert parse(r"[\1\7]").chars == CharSet.from_chars([1, 7])  # octal inside a class, as in re


def test_categories_and_ascii_mode():
    for letter in "dDsSwW":
        assert parse("\\" + letter).chars == category(letter)
        assert parse("(?a)\\" + letter).chars == category(letter, ascii_only=True)
        assert parse("\\" + letter, re.ASCII).chars == category(letter, ascii_only=True)
    assert parse(r"(?a)(?u:\w)").chars == category("w")


# -- flags ---------------------------------------------------------------------------

def test_ignorecase_is_kept_on_atoms_with_their_source():
    assert parse("(?i)k") == char("k", 4, flags=I)
    assert parse("k", re.I) == char("k", 0, flags=I)
    assert parse("(?i)a(?-i:b)") == Sequence((char("a", 4, flags=I), char("b", 10)), 4)
    assert parse("(?ia)[k]").flags == I | A


def test_flag_values_and_inline_flags_agree():
    for letters, value in [("i", re.I), ("s", re.S), ("m", re.M), ("x", re.X), ("a", re.A), ("u", re.U)]:
        pattern = "^a . b$"
        assert parse(f"(?{letters})" + pattern) == _shifted(parse(pattern, value), len(letters) + 3)


def _shifted(node, offset):
    """The same tree with every position moved by ``offset``."""
    import dataclasses

    changes = {"position": node.position + offset}
    for name in ("items", "options"):
        if hasattr(node, name):
            changes[name] = tuple(_shifted(child, offset) for child in getattr(node, name))
    if hasattr(node, "item"):
        changes["item"] = _shifted(node.item, offset)
    return dataclasses.replace(node, **changes)


def test_verbose_mode_skips_space_and_comments_outside_classes():
    tree = parse("(?x) a \\  [ #] # comment \n b{2, 3}")
    assert [n.source for n in tree.items] == ["a", "\\ ", "[ #]", "b", "{", "2", ",", "3", "}"]
    assert parse("a b", re.X) == Sequence((char("a", 0), char("b", 2)), 0)
    assert parse("(?x:a b)c d") == Sequence((char("a", 4), char("b", 6), char("c", 8), char(" ", 9), char("d", 10)), 0)


def test_sources_are_standalone_patterns_for_the_same_atom():
    # Reference: Python's re; each atom's source, compiled alone with its flags, matches its characters.
    tree = parse(r"(?x) \x41 \N{EM DASH} \101 [ a-c] \  \u00e9 \0")
    for node in tree.items:
        for point in list(node.chars)[:5]:
            assert re.fullmatch(node.source, chr(point), node.flags)


# -- groups that are referred to, lookbehind, boundaries, atomic and possessive -----------

def test_referred_groups_stay_and_the_others_dissolve():
    a, b = char("a", 1), char("b", 4)
    assert parse(r"(a)(b)\1") == Sequence((Group(a, 1, 0), b, Backreference(1, 0, 6)), 0)
    assert parse("(a)(?P<x>b)(?P=x)") == Sequence((a, Group(char("b", 9), 2, 3), Backreference(2, 0, 11)), 0)
    tree = parse("(a)(?(1)b|c)")
    assert tree.items[1] == Conditional(1, char("b", 8), char("c", 10), 3)
    assert parse("()(?(1)a)").items[1].no == Sequence((), 8)  # no "no" branch: the empty string


def test_conditionals_accept_what_re_accepts_as_a_group_number():
    # re 3.11 accepts these with a DeprecationWarning (re/_parser.py, int() of the name).
    for pattern in ["()(?( 1 )a|b)", "()(?(+1)a|b)", "()(?(\u0967)a|b)"]:
        assert parse(pattern).items[1].index == 1


def test_backreference_flags_are_those_at_the_reference():
    assert parse(r"(a)(?i:\1)").items[1] == Backreference(1, I, 7)
    assert parse(r"(?ai)(a)\1").items[1].flags == I | A


def test_lookbehind_boundaries_and_atomic_groups():
    assert parse("(?<=a)b") == Sequence((Lookbehind(char("a", 4), False, 0), char("b", 6)), 0)
    assert parse("(?<!a)").negative
    assert parse(r"\b\B") == Sequence((Boundary(False, False, 0), Boundary(True, False, 2)), 0)
    assert parse(r"(?a:\b)") == Boundary(False, True, 4)
    assert parse("(?>ab)") == Atomic(Sequence((char("a", 3), char("b", 4)), 3), 0)


def test_possessive_and_lazy_marks():
    assert parse("a*+") == Repeat(char("a", 0), 0, None, 1, possessive=True)
    assert parse("a{2,3}+").possessive
    # A lazy mark is kept only where re's order of trying can change the language.
    assert not parse("a*?").lazy
    assert parse("(?>a*?)").item.lazy and parse(r"(a)*?\1").items[0].lazy


def test_width_counts_as_res_parser_does():
    # Reference: re's own widths, read from the pattern re compiles (sre_parse getwidth).
    import re._parser as sre_parse

    for pattern in ["a{2,5}", "(?:ab|c)*", "(a)(?(1)bc|d)", r"(ab)\1", "(?=abc)x", "a{0}", "(?:a*){0}", "x|"]:
        low, high = sre_parse.parse(pattern).getwidth()
        assert width(parse(pattern), {}) == (low, None if high >= sre_parse.MAXWIDTH else high), pattern


# -- refusals: constructs re accepts but pfuzz does not ------------------------------

REFUSED = [
    (r"(a+)\1", 4, "any length"),
    (r"(?P<n>a*)x(?P=n)", 10, "any length"),
    (r"(a)(.*)b\2", 8, "any length"),
]


@pytest.mark.parametrize("pattern, position, construct", REFUSED)
def test_unsupported_constructs_are_refused_at_their_first_character(pattern, position, construct):
    with pytest.raises(PatternError) as caught:
        parse(pattern)
    assert caught.value.position == position
    assert construct in caught.value.message
    assert caught.value.pattern == pattern


@pytest.mark.filterwarnings("ignore::DeprecationWarning")  # re deprecates TEMPLATE in 3.11
def test_the_template_flag_changes_nothing_re_compiles():
    # re refuses TEMPLATE only with repeats (re/_compiler.py), so where it compiles it means nothing.
    assert parse("(?t)ab") == _shifted(parse("ab"), 4)
    with pytest.raises(PatternError):
        parse("(?t)a*")  # re's own refusal


def test_an_unbounded_backreference_is_refused_with_its_reason():
    with pytest.raises(PatternError) as caught:
        parse(r"(\w+)=\1")
    assert caught.value.message == (
        "backreference \\1 refers to a group that can match strings of any length; pfuzz compiles "
        "backreferences only to groups with finitely many strings")


def test_bad_arguments_are_pattern_errors():
    for pattern, flags in [(b"a", 0), ("a", re.LOCALE), ("a", re.DEBUG), (3, 0), ("a", "i")]:
        with pytest.raises(PatternError):
            parse(pattern, flags)


RE_REJECTS = [
    "a(", "a)", "[a", "*a", "a**", "a{3,2}", "(?i", "(?z)", "[b-a]", r"\x4", r"\u12", r"\U00110000",
    r"\N{NO SUCH NAME}", r"\N", r"\q", "\\", r"\400", r"[\8]", "(?P=x)", "(?-a:b)", "a(?i)", "(?#x",
    r"[\d-z]", "(?<a)", "a|*", "(?P<1>a)", r"(a)\2", "(?P<n>a)(?P<n>b)", "^*", "(?i-i:a)", "x{2}{3}",
]


@pytest.mark.parametrize("pattern", RE_REJECTS)
def test_syntax_errors_carry_res_message_and_position(pattern):
    # Reference: Python's re; its error message and re.error.pos.
    with pytest.raises(re.error) as expected:
        re.compile(pattern)
    with pytest.raises(PatternError) as caught:
        parse(pattern)
    assert caught.value.message == expected.value.msg
    assert caught.value.position == expected.value.pos


def test_value_errors_of_re_are_pattern_errors():
    for pattern, flags in [("(?u)a", re.A), ("a{4294967295}", 0), ("(" * 2000 + ")" * 2000, 0)]:
        with pytest.raises(PatternError):
            parse(pattern, flags)


# -- arbitrary text ------------------------------------------------------------------

SYNTAX_SOUP = st.lists(st.sampled_from(list("ab\\()[]{}|*+?^$.-,:=!<>#PiLmsxau0123dwsbBAZNxU\n ")
                                       + ["(?", "(?P<n>", "\\x4"]), max_size=14).map("".join)


@pytest.mark.filterwarnings("ignore::FutureWarning")  # re's "possible nested set" notes
@settings(max_examples=400, deadline=None, database=None)
@given(SYNTAX_SOUP)
def test_any_text_gives_a_tree_or_a_pattern_error_that_agrees_with_re(text):
    try:
        re.compile(text)  # reference: Python's re decides what is a syntax error
        re_error = None
    except (re.error, OverflowError, ValueError) as error:
        re_error = error
    try:
        parse(text)
    except PatternError as error:
        if isinstance(re_error, re.error) and re_error.pos is not None:
            assert (error.message, error.position) == (re_error.msg, re_error.pos)
        elif re_error is None:
            assert "any length" in error.message or "not supported" in error.message, error.message
    else:
        assert re_error is None


def test_a_pattern_re_refuses_without_a_position_is_refused_with_re_words():
    # Found by the fuzz driver: re raises OverflowError (no position) for a repeat count past
    # its limit, and the rest of the pattern refers to a group that does not exist.
    with pytest.raises(PatternError, match="repetition number is too large"):
        parse(r"(?<!x{99999999999}?-\1)a")
