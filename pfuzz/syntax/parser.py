"""Pattern text to syntax tree: a recursive-descent parser for Python ``re`` syntax.

The pattern is first compiled by ``re`` itself, so every syntax error ``re``
rejects becomes a ``PatternError`` with ``re``'s own message and position.
Then one method per grammar rule builds the tree of ``pfuzz.syntax.tree``::

    pattern     := leading_flags alternation
    alternation := sequence ('|' sequence)*
    sequence    := (item quantifier*)*        -- verbose white space, # and (?#) comments skipped
    item        := escape | class | group | '.' | '^' | '$' | literal
    quantifier  := ('*' | '+' | '?' | '{' m? (',' n?)? '}') ('?' | '+')?
    group       := '(' ('?:' | '?P<name>' | '?=' | '?!' | '?<=' | '?<!' | '?>' | '?flags-flags:')?
                   alternation ')'
                 | '(?P=' name ')' | '(?(' name-or-number ')' sequence ('|' sequence)? ')'

Escapes are read by ``pfuzz.syntax.escapes``, classes by ``pfuzz.syntax.classes``,
groups by ``pfuzz.syntax.groups``; ``pfuzz.syntax.items`` builds the nodes of a sequence. The rules
follow ``re/_parser.py`` (Python 3.11) wherever the language depends on them:
a ``{`` that opens no valid quantifier is a literal; global inline flags stand
at the start; a scoped ``(?a:...)`` replaces the ASCII/Unicode mode; and an
alternation whose options are all single literals or non-negated classes
becomes one class, as in ``re`` (under IGNORECASE ``re`` tests such a merged
class as a whole). ``re`` also factors common prefixes out of alternations
before merging; we do not, which matters only under IGNORECASE and changes no
language over the cased code points (checked in tests/test_casefold.py).

Groups that nothing refers to dissolve, lazy quantifiers keep their mark only where
``re``'s order of trying can matter (see ``pfuzz.syntax.tree``), every flag but
IGNORECASE is applied here; atoms keep their source text and flags for
``pfuzz.syntax.casefold``. What pfuzz refuses raises ``PatternError`` at the index of
its first character: a backreference to a group whose width is unbounded (such as
``(a+)\\1`` or ``(.*)\\1``: whether such a pattern is regular cannot be decided in
general, so pfuzz compiles backreferences only to groups with finitely many
strings), the LOCALE flag, and bytes patterns. Cost: linear in the pattern length plus
``re``'s cached compile; each of ``\\d``, ``\\w`` and ``\\s`` loads its table from
``pfuzz.syntax.categories`` the first time a process uses it.
"""

from __future__ import annotations

import re
import warnings
from dataclasses import replace

from pfuzz.base.charset import ALL, CharSet
from pfuzz.syntax.classes import escape_chars, read_class
from pfuzz.errors import PatternError
from pfuzz.syntax.escapes import read_escape
from pfuzz.syntax.flags import ASCII, ATOM_FLAGS, DOTALL, LOCALE, MULTILINE, SUPPORTED_FLAGS, VERBOSE
from pfuzz.syntax.groups import GroupRules
from pfuzz.syntax.items import Item, build, merge_options
from pfuzz.syntax.tree import (Alternation, Anchor, Boundary, Chars, Conditional, Group, Node, Repeat, Sequence,
                               children, walk)

VERBOSE_SPACE = frozenset(" \t\n\r\v\f")
DIGITS = frozenset("0123456789")
ANY_BUT_NEWLINE = ALL - CharSet.single("\n")


def parse(pattern: str, flags: int = 0) -> Node:
    """The syntax tree of ``pattern`` under ``re`` flag values ``flags``."""
    _check_arguments(pattern, flags)
    rejection = _rejection_by_re(pattern, flags)
    if rejection is not None and rejection.position is not None:
        raise rejection
    try:
        parser = _Parser(pattern)
        tree = _finish(parser.pattern(int(flags)), parser.referenced, parser.ordered)
    except RecursionError:
        raise PatternError("pattern nests too deeply", pattern, None) from None
    except PatternError:
        raise
    except (KeyError, IndexError, ValueError):
        # Only a pattern re itself refused (without a position) can get here: our rules
        # assume what re checks, e.g. that a referenced group exists.
        if rejection is None:
            raise
        raise rejection from None
    # Where re rejected without a position (variable-width lookbehind, ...), a
    # refusal of ours, raised above, names the construct and its column.
    if rejection is not None:
        raise rejection
    return tree


def _check_arguments(pattern: object, flags: object) -> None:
    if isinstance(pattern, (bytes, bytearray, memoryview)):
        raise PatternError("bytes patterns are not supported: give the pattern as str")
    if not isinstance(pattern, str):
        raise PatternError(f"a pattern must be a str, not {type(pattern).__name__}")
    if not isinstance(flags, int):
        raise PatternError(f"flags must be re flag values (an int), not {type(flags).__name__}", pattern)
    if flags & LOCALE:
        raise PatternError("the re.LOCALE flag is not supported", pattern)
    if flags & ~SUPPORTED_FLAGS:
        raise PatternError(f"flag value {flags & ~SUPPORTED_FLAGS:#x} is not supported", pattern)


def _rejection_by_re(pattern: str, flags: int) -> PatternError | None:
    """re's own verdict on the pattern: None if it compiles, else the error to raise."""
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            re.compile(pattern, flags)
    except re.error as error:
        return PatternError(error.msg, pattern, error.pos)
    except (ValueError, OverflowError, RecursionError) as error:
        # re raises these for clashing flags, too large repeat counts, deep nesting.
        return PatternError(str(error), pattern, None)
    return None


class _Parser(GroupRules):
    def __init__(self, pattern: str):
        self.text = pattern
        self.pos = 0
        self.groups = 0  # capturing groups opened so far
        self.names: dict[str, int] = {}
        self.widths: dict[int, tuple[int, int | None]] = {}  # of the groups closed so far
        self.referenced: set[int] = set()  # groups a backreference or conditional names
        self.ordered = False  # an atomic group or possessive quantifier was seen

    # -- helpers ---------------------------------------------------------------
    def peek(self, offset: int = 0) -> str:
        return self.text[self.pos + offset : self.pos + offset + 1]

    def error(self, message: str, position: int | None) -> PatternError:
        return PatternError(message, self.text, position)


    def skip_ignored(self, flags: int) -> None:
        """Skip ``(?#...)`` comments and, in verbose mode, white space and ``#`` comments."""
        text = self.text
        while self.pos < len(text):
            char = text[self.pos]
            if char == "(" and text.startswith("(?#", self.pos):
                self.pos = self.token_end(self.pos + 3, ")")
            elif flags & VERBOSE and char in VERBOSE_SPACE:
                self.pos += 1
            elif flags & VERBOSE and char == "#":
                self.pos = self.token_end(self.pos + 1, "\n")
            else:
                return

    def token_end(self, index: int, terminator: str) -> int:
        """Index just past the next ``terminator`` token (escapes are two-character tokens)."""
        while index < len(self.text):
            if self.text[index] == "\\":
                index += 2
                continue
            index += 1
            if self.text[index - 1] == terminator:
                return index
        if terminator == "\n":
            return len(self.text)
        raise self.error("missing ), unterminated comment", index)

    # -- pattern, alternation, sequence --------------------------------------------
    def pattern(self, flags: int) -> Node:
        flags = self.leading_flags(flags)
        start = self.pos
        items = self.alternation(flags)
        if self.pos < len(self.text):
            raise self.error("unbalanced parenthesis", self.pos)
        return build(items, start)

    def leading_flags(self, flags: int) -> int:
        """Apply the global ``(?flags)`` groups at the start of the pattern."""
        while True:
            self.skip_ignored(flags)
            start = self.pos
            spec = self.flag_spec(start + 2) if self.text.startswith("(?", start) else None
            if spec is None or spec.terminator != ")":
                return flags
            flags |= spec.add
            self.pos = spec.end

    def alternation(self, flags: int) -> list[Item]:
        start = self.pos
        options = [self.sequence(flags)]
        starts = [start]
        while self.peek() == "|":
            self.pos += 1
            starts.append(self.pos)
            options.append(self.sequence(flags))
        if len(options) == 1:
            return options[0]
        merged = merge_options(options, start)
        if merged is not None:
            return [Item(merged, 1, True)]
        nodes = tuple(build(option, at) for option, at in zip(options, starts))
        return [Item(Alternation(nodes, start))]

    def sequence(self, flags: int) -> list[Item]:
        items: list[Item] = []
        while True:
            self.skip_ignored(flags)
            char = self.peek()
            if char in ("", "|", ")"):
                return items
            if char in "*+?" or (char == "{" and self.brace_bounds() is not None):
                if not items:
                    raise self.error("nothing to repeat", self.pos)
                items[-1] = self.quantified(items[-1])
            else:
                items.append(self.item(flags))

    # -- quantifiers -----------------------------------------------------------------
    def quantified(self, item: Item) -> Item:
        start = self.pos
        minimum, maximum = self.bounds()
        mode = self.peek() if self.peek() in ("?", "+") else ""
        self.pos += len(mode)
        self.ordered = self.ordered or mode == "+"
        return Item(Repeat(item.node, minimum, maximum, start, lazy=mode == "?", possessive=mode == "+"))

    def bounds(self) -> tuple[int, int | None]:
        simple = {"*": (0, None), "+": (1, None), "?": (0, 1)}.get(self.peek())
        if simple is not None:
            self.pos += 1
            return simple
        minimum, maximum, self.pos = self.brace_bounds()
        return minimum, maximum

    def brace_bounds(self) -> tuple[int, int | None, int] | None:
        """(min, max, end) when the ``{`` at ``pos`` opens a quantifier; None when re reads it as a literal."""
        text = self.text
        low_start = self.pos + 1
        if text[low_start : low_start + 1] == "}":
            return None
        low_end = _digits_end(text, low_start)
        low = text[low_start:low_end]
        high, close = low, low_end
        if text[low_end : low_end + 1] == ",":
            close = _digits_end(text, low_end + 1)
            high = text[low_end + 1 : close]
        if text[close : close + 1] != "}":
            return None
        return int(low) if low else 0, int(high) if high else None, close + 1

    # -- items -------------------------------------------------------------------
    def item(self, flags: int) -> Item:
        char = self.peek()
        if char == "\\":
            return self.escape(flags)
        if char == "[":
            return self.char_class(flags)
        if char == "(":
            return self.group(flags)
        if char == ".":
            return self.dot(flags)
        if char in "^$":
            return self.anchor(char, flags)
        return self.literal(flags)

    def literal(self, flags: int) -> Item:
        start = self.pos
        self.pos += 1
        char = self.text[start]
        return Item(Chars(CharSet.single(char), start, char, flags & ATOM_FLAGS), 1, True)

    def dot(self, flags: int) -> Item:
        start = self.pos
        self.pos += 1
        chars = ALL if flags & DOTALL else ANY_BUT_NEWLINE
        return Item(Chars(chars, start, ".", flags & ATOM_FLAGS))

    def anchor(self, char: str, flags: int) -> Item:
        start = self.pos
        self.pos += 1
        multiline = bool(flags & MULTILINE)
        if char == "^":
            kind = "line_start" if multiline else "text_start"
        else:
            kind = "line_end" if multiline else "end_or_final_newline"
        return Item(Anchor(kind, start))

    def escape(self, flags: int) -> Item:
        escape = read_escape(self.text, self.pos, in_class=False)
        source = self.text[escape.start : escape.end]
        if escape.kind == "anchor":
            self.pos = escape.end
            return Item(Anchor("text_start" if escape.value == "A" else "text_end", escape.start))
        if escape.kind == "boundary":
            self.pos = escape.end
            return Item(Boundary(escape.value == "B", bool(flags & ASCII), escape.start))
        if escape.kind == "backreference":
            return self.reference(escape.value, escape.start, escape.end, flags)
        self.pos = escape.end
        chars = escape_chars(escape, ascii_only=bool(flags & ASCII))
        return Item(Chars(chars, escape.start, source, flags & ATOM_FLAGS), 1, True)

    def char_class(self, flags: int) -> Item:
        start = self.pos
        found = read_class(self.text, start, ascii_only=bool(flags & ASCII))
        self.pos = found.end
        source = self.text[start : self.pos]
        return Item(Chars(found.chars, start, source, flags & ATOM_FLAGS), 1, not found.negated)



def _digits_end(text: str, index: int) -> int:
    while index < len(text) and text[index] in DIGITS:
        index += 1
    return index


def _finish(tree: Node, referenced: set[int], ordered: bool) -> Node:
    """Dissolve the groups nothing refers to; drop lazy marks where order cannot matter."""
    if not any(isinstance(node, (Group, Repeat)) for node in walk(tree)):
        return tree
    return _rewrite(tree, referenced, ordered or bool(referenced))


def _rewrite(node: Node, referenced: set[int], ordered: bool) -> Node:
    parts = [_rewrite(child, referenced, ordered) for child in children(node)]
    if isinstance(node, Group) and node.index not in referenced:
        return parts[0]
    if isinstance(node, Sequence):
        return build([Item(part) for part in parts], node.position)
    if isinstance(node, Alternation):
        return replace(node, options=tuple(parts))
    if isinstance(node, Conditional):
        return replace(node, yes=parts[0], no=parts[1])
    if isinstance(node, Repeat):
        return replace(node, item=parts[0], lazy=node.lazy and ordered)
    return replace(node, item=parts[0]) if parts else node
