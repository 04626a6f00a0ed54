"""The parsed tree means what re means: a direct reading of the tree, checked against re.fullmatch.

Reference matcher: Python's ``re`` (``re.fullmatch`` with the same flags).
The tree is read by a small set-of-positions interpreter written here from
the definitions in pfuzz/tree.py (no automaton involved), so a disagreement
points at the parser (or at pfuzz.syntax.casefold), not at the compiler.
"""

from __future__ import annotations

import functools
import itertools
import re

import pytest
from hypothesis import given, settings, strategies as st

from pfuzz.syntax.casefold import resolve
from pfuzz.base.charset import CharSet
from pfuzz.syntax.parser import parse
from pfuzz.syntax.tree import Alternation, Anchor, Chars, Lookahead, Repeat, Sequence

LETTERS = "aAbk\n \u212a"  # includes K's case partner U+212A KELVIN SIGN and a space for verbose mode
ALPHABET = CharSet.from_chars(LETTERS)
STRINGS = ["".join(t) for n in range(4) for t in itertools.product(LETTERS, repeat=n)]


@functools.lru_cache(maxsize=None)
def members(node: Chars) -> frozenset[str]:
    return frozenset(resolve(node, ALPHABET).chars())


def ends(node, text: str, start: int) -> set[int]:
    """The positions where a match of ``node`` begun at ``start`` can end."""
    if isinstance(node, Chars):
        fits = start < len(text) and text[start] in members(node)
        return {start + 1} if fits else set()
    if isinstance(node, Sequence):
        positions = {start}
        for item in node.items:
            positions = {end for p in positions for end in ends(item, text, p)}
        return positions
    if isinstance(node, Alternation):
        return set().union(*(ends(option, text, start) for option in node.options))
    if isinstance(node, Repeat):
        return repeat_ends(node, text, start)
    if isinstance(node, Anchor):
        return {start} if anchor_holds(node.kind, text, start) else set()
    assert isinstance(node, Lookahead)
    return {start} if bool(ends(node.item, text, start)) != node.negative else set()


def repeat_ends(node: Repeat, text: str, start: int) -> set[int]:
    # Beyond min + len(text) + 1 rounds no new end position can appear.
    limit = node.min + len(text) + 1 if node.max is None else node.max
    result, layer = set(), {start}
    for count in range(limit + 1):
        if count >= node.min:
            result |= layer
        layer = {end for p in layer for end in ends(node.item, text, p)}
        if not layer:
            break
    return result


def anchor_holds(kind: str, text: str, at: int) -> bool:
    return {
        "text_start": at == 0,
        "line_start": at == 0 or text[at - 1] == "\n",
        "text_end": at == len(text),
        "end_or_final_newline": at == len(text) or (at == len(text) - 1 and text[at] == "\n"),
        "line_end": at == len(text) or text[at] == "\n",
    }[kind]


def tree_accepts(tree, text: str) -> bool:
    return len(text) in ends(tree, text, 0)


def assert_same_language(pattern: str, flags: int = 0) -> None:
    tree = parse(pattern, flags)
    compiled = re.compile(pattern, flags)
    for text in STRINGS:
        # Reference: Python's re.fullmatch.
        expected = compiled.fullmatch(text) is not None
        assert tree_accepts(tree, text) == expected, (pattern, text)


HAND_PICKED = [
    r"a|b|\d", r"(?i)k", r"(?i)[^a-z]", r"(?i)[\Wa]+", r"(?i)\W", r"(?i:a)|b", r"(?:a|\W)|b",
    r"a{,2}b{1,}", r"a{}", r"a{,}", r"a{2,x}", r"{", r"a{1}{", r"^a$", r"(?m)^a$\n?", r"a$\n",
    r"a\Z", r"\Aa", r"(?=a)\w+", r"(?!k)\w\w", r"a(?=b)b", r"(?:(?=a)|b)a", r"(?=a)*a",
    r"(?x) a b # comment", r"(?x)a\ b[ ]", r"(?x)a #c\n *", r"(?x:a b)c d", r"(?-x:a b)",
    r"(?s).", r".", r"(?s:.)\n.", r"(a|)*b", r"(?:a?)*", r"()a", r"(?#note)a(?#x)*", r"[]a]",
    r"[^]a]", r"[a-]", r"[-a]", r"[\da]", r"[\x41\0]", r"\101\x61", r"[\101]", r"\N{LATIN SMALL LETTER A}",
    r"(?a)\w", r"(?a)(?u:\w)", r"(?i)(?a:k)", r"(?ia)k", r"(?i)[\u212a]", r"(?i)\u212a",
    r"a*?b+?c??d{1,2}?", r"(a)(?P<n>b)|\n", r"(?i)a|[^\W]", r"ab|ac", r"(?i)xa|x\W",
    r"(?#a\)b)k", "(?x)a # x \\\n b", r"(?x)[#]a", r"(?x)a\#b", r"\0\01\012\0123", r"(?x)a{2 }",
    "(?x)# comment\n(?i)k", r"(?#c)(?i)k", r"(?i)(?s)(?m)^.$", "\u212a|\N{LATIN SMALL LETTER K}",
    r"[\u0041-\U0000004b]+", r"\x0a|\x20", r"(?i)[\x4b]", r"(?i)\113", r"(?i)[k-k]", "(?i)[^\u212a]",
]


@pytest.mark.parametrize("pattern", HAND_PICKED)
def test_hand_picked_patterns_mean_what_re_means(pattern):
    assert_same_language(pattern)


@pytest.mark.parametrize("flags", [re.I, re.M, re.S, re.X, re.A, re.I | re.A, re.I | re.X])
def test_flag_values_mean_what_re_means(flags):
    for pattern in [r"^k$", r"a .$", r"[\w ]\s", r"(?-i:k)K", r"(?u:\w)|b"]:
        if flags & re.A and "(?u" in pattern:
            continue  # re refuses to mix ASCII with UNICODE
        assert_same_language(pattern, flags)


ATOMS = ["a", "b", "A", "k", "K", "\\n", ".", "[ab]", "[^a]", "[a-bA]", r"\w", r"\W", r"\s", r"\S",
         r"\d", r"\x61", r"\101", r"\.", "[ .]", "[^\\W]", "\u212a", "[]a]", "[a-]", "{", "}", " ",
         r"\0", r"\x4b", r"\N{KELVIN SIGN}", "\\ ", "#c\n", "(?#c)", r"[\x00-a]", r"[^\sa]"]
ZERO_WIDTH = ["^", "$", r"\A", r"\Z"]
QUANTIFIERS = ["*", "+", "?", "{2}", "{0,2}", "{,1}", "{1,}", "*?", "??", "{1,2}?", "{,}"]
OPENERS = ["(", "(?:", "(?=", "(?!", "(?i:", "(?-i:", "(?s:", "(?m:", "(?a:", "(?x:", "(?-x:"]
GLOBAL = ["", "(?i)", "(?s)", "(?m)", "(?x)", "(?ia)", "(?im)", "(?xi)"]


def pattern_text() -> st.SearchStrategy[str]:
    def extend(inner):
        group = st.tuples(st.sampled_from(OPENERS), inner).map(lambda t: t[0] + t[1] + ")")
        quantified = st.tuples(st.one_of(st.sampled_from(ATOMS), group), st.sampled_from(QUANTIFIERS))
        sequence = st.lists(st.one_of(inner, quantified.map("".join)), max_size=3).map("".join)
        alternation = st.lists(sequence, min_size=2, max_size=3).map("|".join)
        return st.one_of(group, sequence, alternation)

    body = st.recursive(st.sampled_from(ATOMS + ZERO_WIDTH), extend, max_leaves=8)
    return st.tuples(st.sampled_from(GLOBAL), body).map("".join)


def compiles(pattern: str) -> bool:
    try:
        re.compile(pattern)
    except re.error:
        return False
    return True


@settings(max_examples=300, deadline=None, database=None)
@given(pattern_text().filter(compiles))
def test_random_patterns_mean_what_re_means(pattern):
    assert_same_language(pattern)
