"""Random patterns from a small grammar, checked exhaustively against Python's ``re``.

Reference matcher: CPython's ``re.fullmatch`` (the standard library). Every
pattern is drawn together with its syntax tree, so the compiler is judged on
its own (``compile_tree``) and through the parser (``compile_dfa``); both must
accept exactly the strings of length <= 6 over a 2- or 3-letter alphabet that
``re.fullmatch`` accepts. Alphabets with '\\n' exercise the anchors, ``$``
before a final newline and ``(?m)``; alphabets with both cases of a letter
exercise ``(?i)``.
"""

from __future__ import annotations

import re

import pytest
from hypothesis import given, settings, strategies as st

from helpers import strings_upto
from pfuzz.base.charset import ALL, CharSet
from pfuzz.automata.construction.compiler import compile_dfa, compile_tree
from pfuzz.syntax.tree import Alternation, Anchor, Chars, Lookahead, Repeat, Sequence

MAX_LENGTH = 6
ALPHABETS = ["ab", "a\n", "ab\n", "aA\n", "aAb", "aB\n"]
LETTERS = "abAB"


def _fold(chars: str, flags: int) -> CharSet:
    """Literal letters as re matches them: under IGNORECASE, both ASCII cases."""
    if flags & re.IGNORECASE:
        chars = chars + chars.swapcase()
    return CharSet.from_chars(chars)


@st.composite
def atoms(draw, flags):
    """(pattern text, tree) of one character atom."""
    kind = draw(st.sampled_from(["letter", "letter", "class", "negated", "dot", "newline"]))
    if kind == "letter":
        ch = draw(st.sampled_from(LETTERS))
        return ch, Chars(_fold(ch, flags))
    if kind == "class":
        members = "".join(sorted(set(draw(st.lists(st.sampled_from(LETTERS + "\n"), min_size=1, max_size=3)))))
        return "[" + members.replace("\n", "\\n") + "]", Chars(_fold(members, flags))
    if kind == "negated":
        ch = draw(st.sampled_from(LETTERS + "\n"))
        return "[^" + ch.replace("\n", "\\n") + "]", Chars(_fold(ch, flags).complement())
    if kind == "dot":
        dot = ALL if flags & re.DOTALL else CharSet.single("\n").complement()
        return ".", Chars(dot)
    return "\\n", Chars(CharSet.single("\n"))


def anchor(text: str, flags: int):
    multiline = bool(flags & re.MULTILINE)
    kind = {"^": "line_start" if multiline else "text_start", "\\A": "text_start",
            "$": "line_end" if multiline else "end_or_final_newline", "\\Z": "text_end"}[text]
    return text, Anchor(kind)


QUANTIFIERS = [("*", 0, None), ("+", 1, None), ("?", 0, 1), ("{2}", 2, 2), ("{1,3}", 1, 3),
               ("{2,}", 2, None), ("{,2}", 0, 2), ("{0,1}", 0, 1)]


@st.composite
def nodes(draw, flags, depth, assertions):
    """(pattern text, tree) from the grammar; ``assertions`` allows anchors and lookaheads."""
    choices = ["atom", "atom", "atom"]
    if assertions:
        choices += ["anchor"]
    if depth > 0:
        choices += ["sequence", "sequence", "alternation", "repeat", "repeat"]
        if assertions:
            choices += ["lookahead"]
    kind = draw(st.sampled_from(choices))
    if kind == "atom":
        return draw(atoms(flags))
    if kind == "anchor":
        return anchor(draw(st.sampled_from(["^", "$", "\\A", "\\Z"])), flags)
    inner = nodes(flags, depth - 1, assertions)
    if kind == "sequence":
        parts = draw(st.lists(inner, min_size=2, max_size=4))
        return "".join(p[0] for p in parts), Sequence(tuple(p[1] for p in parts))
    if kind == "alternation":
        parts = draw(st.lists(inner, min_size=2, max_size=3))
        return "(?:" + "|".join(p[0] for p in parts) + ")", Alternation(tuple(p[1] for p in parts))
    if kind == "repeat":
        text, tree = draw(inner)
        quantifier, low, high = draw(st.sampled_from(QUANTIFIERS))
        lazy = "?" if draw(st.booleans()) else ""
        return "(?:" + text + ")" + quantifier + lazy, Repeat(tree, low, high)
    text, tree = draw(inner)
    negative = draw(st.booleans())
    return ("(?!" if negative else "(?=") + text + ")", Lookahead(tree, negative)


FLAG_LETTERS = {re.MULTILINE: "m", re.DOTALL: "s", re.IGNORECASE: "i"}


@st.composite
def cases(draw, assertions=True, flag_choices=(0, re.MULTILINE, re.DOTALL, re.IGNORECASE)):
    """An alphabet, an inline flag prefix such as "(?mi)", the pattern body and its tree."""
    alphabet = draw(st.sampled_from(ALPHABETS))
    flags = 0
    for flag in flag_choices:
        if flag and draw(st.booleans()):
            flags |= flag
    text, tree = draw(nodes(flags, 3, assertions))
    prefix = "".join(letter for flag, letter in FLAG_LETTERS.items() if flags & flag)
    return alphabet, (f"(?{prefix})" if prefix else ""), text, tree


def check(alphabet: str, prefix: str, body: str, tree) -> None:
    pattern = prefix + body
    letters = CharSet.from_chars(alphabet)
    by_tree = compile_tree(tree, letters, resolve=lambda node, u: node.chars & u)
    by_text = compile_dfa(pattern, letters)
    rx = re.compile(pattern)
    for s in strings_upto(alphabet, MAX_LENGTH):
        expected = rx.fullmatch(s) is not None  # reference: re.fullmatch
        assert by_tree.accepts(s) == expected, (pattern, alphabet, s, "tree")
        assert by_text.accepts(s) == expected, (pattern, alphabet, s, "text")


def check_modes(alphabet: str, prefix: str, body: str) -> None:
    """re.match and re.search: by ``mode`` and as full matches of P(?s:.*) and (?s:.*)P(?s:.*)."""
    letters = CharSet.from_chars(alphabet)
    pattern = prefix + body
    rx = re.compile(pattern)
    compiled = {
        "match": [compile_dfa(pattern, letters, mode="match"),
                  compile_dfa(f"{prefix}(?:{body})(?s:.*)", letters)],
        "search": [compile_dfa(pattern, letters, mode="search"),
                   compile_dfa(f"{prefix}(?s:.*)(?:{body})(?s:.*)", letters)],
    }
    for s in strings_upto(alphabet, MAX_LENGTH):
        for mode, dfas in compiled.items():
            expected = getattr(rx, mode)(s) is not None  # reference: re.match / re.search
            assert all(d.accepts(s) == expected for d in dfas), (pattern, mode, s)


@settings(max_examples=400, deadline=None, database=None)
@given(cases(assertions=False, flag_choices=(0, re.DOTALL, re.IGNORECASE)))
def test_plain_patterns_agree_with_re(case):
    check(*case)


@settings(max_examples=900, deadline=None, database=None)
@given(cases())
def test_patterns_with_anchors_and_lookaheads_agree_with_re(case):
    check(*case)


@settings(max_examples=200, deadline=None, database=None)
@given(cases())
def test_match_and_search_modes_agree_with_re(case):
    alphabet, prefix, body, _ = case
    check_modes(alphabet, prefix, body)


# Hand-picked classics: anchors and lookaheads where validators commonly go wrong.
CLASSICS = [
    ("1\n", r"\d+$"),                     # under fullmatch the final '\n' must still be consumed
    ("1\n", r"\d+$\n"),                  # ... which is why this accepts "1\n"
    ("ab\n", r"(?m)^a$\n^b$"),
    ("a\n", r"(?m)^$"),
    ("a\n", r"(?m)(?:^a$\n?)+"),
    ("a\n", r"(?m)a$\n\n"),
    ("a\n", r"a(?=\n$)\n"),
    ("a\n", r"(?=a$).*\n?"),
    ("a\n", r"(?!.*\n).*\n?"),
    ("a\n", r"(?:^|a|\n)+"),
    ("a\n", r"(?s).*$\n"),
    ("a\n", r"$"),
    ("a\n", r"\Z"),
    ("a1\n", r"^(?=.*\d)(?=.*[a-z]).{2,4}$"),
    ("a1\n", r"(?m)(?:^(?=.*1)[a1]+$\n?)*"),
    ("aA\n", r"(?i)[^a]\n?A"),
    ("aB\n", r"(?i)(?!b)[a-z]+"),
]


@pytest.mark.parametrize("alphabet, pattern", CLASSICS)
def test_classic_anchor_cases(alphabet, pattern):
    letters = CharSet.from_chars(alphabet)
    compiled = compile_dfa(pattern, letters)
    for s in strings_upto(alphabet, MAX_LENGTH):
        assert compiled.accepts(s) == (re.fullmatch(pattern, s) is not None), s  # reference: re
    flags = re.match(r"\(\?[a-z]+\)", pattern)
    prefix = flags.group() if flags else ""
    check_modes(alphabet, prefix, pattern[len(prefix):])


def test_dollar_before_a_final_newline():
    # re.match(r"\d+$", "12\n") succeeds, re.fullmatch does not (reference: re).
    assert re.match(r"\d+$", "12\n") and not re.fullmatch(r"\d+$", "12\n")
    digits = CharSet.from_chars("12\n")
    assert not compile_dfa(r"\d+$", digits).accepts("12\n")
    assert compile_dfa(r"\d+$", digits, mode="match").accepts("12\n")
    assert not compile_dfa(r"\d+$", digits, mode="match").accepts("12\n1")
