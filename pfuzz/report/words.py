"""A pattern's meaning in words, for people who do not read regular expressions.

Method: a walk over the syntax tree (``pfuzz.syntax.parser``) that says each node in
plain English: runs of single characters become a quoted text (``"LV"``), a class
becomes "a digit", "a capital letter" or "one of [A-HJ-NPR-Z]", a repeat "2 of ...",
"1 to 3 of ...", "any number of ...", alternatives of plain texts "one of "ASH",
"BRK", ...". Lookaheads become "where the rest ..." clauses; anchors, which change
nothing under full matching at the ends, are left out. The text is cut at
``MAX_WORDS`` characters (long patterns read better as a pattern).

Limits: the words follow the pattern's structure, not its language (two patterns of
one language may read differently); what a case-insensitive atom matches is said as
"in any case". Cost: linear in the size of the tree.
"""

from __future__ import annotations

from pfuzz.automata.expression import class_text
from pfuzz.base.charset import CharSet
from pfuzz.base.escaping import quoted
from pfuzz.syntax import tree

__all__ = ["MAX_WORDS", "describe"]

MAX_WORDS = 400
_NAMED = {"[0-9]": ("a digit", "digits"), "[A-Z]": ("a capital letter", "capital letters"),
          "[a-z]": ("a small letter", "small letters"),
          "[A-Za-z]": ("a letter", "letters"), "[0-9A-Fa-f]": ("a hex digit", "hex digits"),
          "[0-9a-f]": ("a small hex digit", "small hex digits"),
          "[0-9A-F]": ("a capital hex digit", "capital hex digits"),
          ".": ("any character", "characters of any kind")}


def describe(pattern: str, flags: int = 0, alphabet: CharSet | None = None) -> str:
    """``pattern`` in words ("" when it cannot be parsed)."""
    from pfuzz.syntax.parser import parse
    from pfuzz.base.charset import ALPHABETS, DEFAULT_ALPHABET
    from pfuzz.errors import PfuzzError

    try:
        node = parse(pattern, flags)
    except PfuzzError:
        return ""
    words = _say(node, alphabet or ALPHABETS[DEFAULT_ALPHABET]) or "the empty string"
    words = words[0].upper() + words[1:]
    return words if len(words) <= MAX_WORDS else words[:MAX_WORDS - 1] + "…"


def _say(node, alphabet: CharSet, plural: bool = False) -> str:
    if isinstance(node, tree.Chars):
        return _chars(node, alphabet, plural)
    if isinstance(node, tree.Sequence):
        return _sequence(node.items, alphabet)
    if isinstance(node, tree.Alternation):
        return _alternation(node.options, alphabet)
    if isinstance(node, tree.Repeat):
        return _repeat(node, alphabet)
    if isinstance(node, tree.Lookahead):
        rest = _say(node.item, alphabet)
        return f"(where what follows {'does not start' if node.negative else 'starts'} with: {rest})"
    if isinstance(node, tree.Group):
        return _say(node.item, alphabet, plural)
    return ""


def _literal(node) -> str | None:
    if isinstance(node, tree.Chars) and len(node.chars) == 1 and not node.ignore_case:
        return chr(node.chars.ranges[0][0])
    return None


def _chars(node, alphabet: CharSet, plural: bool) -> str:
    single = _literal(node)
    if single is not None:
        return quoted(single)
    if len(node.chars) == 1:
        return quoted(chr(node.chars.ranges[0][0])) + " in any case"
    text = class_text(node.chars & alphabet if alphabet else node.chars, alphabet)
    named = _NAMED.get(text)
    words = (named[1] if plural else named[0]) if named else (
        f"characters from {text}" if plural else f"one of {text}")
    return words + (" in any case" if node.ignore_case else "")


def _sequence(items, alphabet: CharSet) -> str:
    parts, run = [], []
    for item in items:
        if isinstance(item, tree.Anchor):
            continue
        single = _literal(item)
        if single is not None:
            run.append(single)
            continue
        if run:
            parts.append(quoted("".join(run)))
            run = []
        said = _say(item, alphabet)
        if said:
            parts.append(said)
    if run:
        parts.append(quoted("".join(run)))
    return ", then ".join(parts)


def _alternation(options, alphabet: CharSet) -> str:
    texts = []
    for option in options:
        items = option.items if isinstance(option, tree.Sequence) else (option,)
        letters = [_literal(i) for i in items]
        if None in letters:
            break
        texts.append("".join(letters))
    if len(texts) == len(options):
        return "one of " + ", ".join(quoted(t) for t in texts)
    return "either " + " or ".join(f"({_say(o, alphabet) or 'nothing'})" for o in options)


def _repeat(node, alphabet: CharSet) -> str:
    low, high = node.min, node.max
    simple = isinstance(node.item, tree.Chars)
    inner = _say(node.item, alphabet, plural=simple and high != 1)
    if not simple:
        inner = f"({inner})"
    if (low, high) == (0, 1):
        return f"optionally {inner}"
    if high is None:
        return {0: f"any number of {inner}", 1: f"one or more {inner}"}.get(
            low, f"at least {low} {inner}")
    if low == high:
        return f"{low} {inner}" if simple else f"{low} times {inner}"
    return f"{low} to {high} {inner}" if simple else f"{low} to {high} times {inner}"
