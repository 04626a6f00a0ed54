"""Pattern text to syntax tree: a recursive-descent parser for the regular subset of ``re``.

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

Escapes are read by ``pfuzz.syntax.escapes``, classes by ``pfuzz.syntax.classes``. The rules
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
strings), the LOCALE flag, and bytes patterns. Cost: linear in the pattern length (tens of
microseconds for a validator pattern) plus ``re``'s cached compile; each of
``\\d``, ``\\w`` and ``\\s`` pays about 40 ms the first time a process uses
it, for its table in ``pfuzz.syntax.categories``.
"""

from __future__ import annotations

import re
import warnings
from dataclasses import dataclass

from pfuzz.base.charset import ALL, CharSet
from pfuzz.syntax.classes import escape_chars, read_class
from pfuzz.errors import PatternError
from pfuzz.syntax.escapes import read_escape
from pfuzz.syntax.tree import (Alternation, Anchor, Atomic, Backreference, Boundary, Chars, Conditional,
                               Group, Lookahead, Lookbehind, Node, Repeat, Sequence, children, walk, width)

# re's flag values as plain ints (RegexFlag arithmetic is slow in a hot loop).
IGNORECASE, MULTILINE, DOTALL, VERBOSE = (int(flag) for flag in (re.I, re.M, re.S, re.X))
ASCII, UNICODE, LOCALE, TEMPLATE = (int(flag) for flag in (re.A, re.U, re.L, re.T))
# TEMPLATE changes no match: re refuses it only with repeats, at compile time.
SUPPORTED_FLAGS = IGNORECASE | MULTILINE | DOTALL | VERBOSE | ASCII | UNICODE | TEMPLATE
ATOM_FLAGS = IGNORECASE | ASCII | DOTALL
TYPE_FLAGS = ASCII | UNICODE | LOCALE
INLINE_FLAGS = {
    "i": IGNORECASE, "m": MULTILINE, "s": DOTALL, "x": VERBOSE,
    "a": ASCII, "u": UNICODE, "L": LOCALE, "t": TEMPLATE,
}
VERBOSE_SPACE = frozenset(" \t\n\r\v\f")
DIGITS = frozenset("0123456789")
UNBOUNDED_REFERENCE = ("refers to a group that can match strings of any length; pfuzz compiles "
                       "backreferences only to groups with finitely many strings")
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


@dataclass(frozen=True)
class _Item:
    """One element of a sequence while parsing.

    ``ops`` is how many elements ``re``'s own parser sees here (its groups
    without flags dissolve into their parent), ``plain`` whether it is a
    single literal or non-negated class, which ``re`` merges across ``|``.
    """

    node: Node
    ops: int = 1
    plain: bool = False


@dataclass(frozen=True)
class _FlagSpec:
    """The flag letters of ``(?aimsux-imsx:`` or ``(?aimsux)``."""

    add: int
    remove: int
    terminator: str
    end: int


class _Parser:
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
        return _build(items, start)

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

    def alternation(self, flags: int) -> list[_Item]:
        start = self.pos
        options = [self.sequence(flags)]
        starts = [start]
        while self.peek() == "|":
            self.pos += 1
            starts.append(self.pos)
            options.append(self.sequence(flags))
        if len(options) == 1:
            return options[0]
        merged = _merge_options(options, start)
        if merged is not None:
            return [_Item(merged, 1, True)]
        nodes = tuple(_build(option, at) for option, at in zip(options, starts))
        return [_Item(Alternation(nodes, start))]

    def sequence(self, flags: int) -> list[_Item]:
        items: list[_Item] = []
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
    def quantified(self, item: _Item) -> _Item:
        start = self.pos
        minimum, maximum = self.bounds()
        mode = self.peek() if self.peek() in ("?", "+") else ""
        self.pos += len(mode)
        self.ordered = self.ordered or mode == "+"
        return _Item(Repeat(item.node, minimum, maximum, start, lazy=mode == "?", possessive=mode == "+"))

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
    def item(self, flags: int) -> _Item:
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

    def literal(self, flags: int) -> _Item:
        start = self.pos
        self.pos += 1
        char = self.text[start]
        return _Item(Chars(CharSet.single(char), start, char, flags & ATOM_FLAGS), 1, True)

    def dot(self, flags: int) -> _Item:
        start = self.pos
        self.pos += 1
        chars = ALL if flags & DOTALL else ANY_BUT_NEWLINE
        return _Item(Chars(chars, start, ".", flags & ATOM_FLAGS))

    def anchor(self, char: str, flags: int) -> _Item:
        start = self.pos
        self.pos += 1
        multiline = bool(flags & MULTILINE)
        if char == "^":
            kind = "line_start" if multiline else "text_start"
        else:
            kind = "line_end" if multiline else "end_or_final_newline"
        return _Item(Anchor(kind, start))

    def escape(self, flags: int) -> _Item:
        escape = read_escape(self.text, self.pos, in_class=False)
        source = self.text[escape.start : escape.end]
        if escape.kind == "anchor":
            self.pos = escape.end
            return _Item(Anchor("text_start" if escape.value == "A" else "text_end", escape.start))
        if escape.kind == "boundary":
            self.pos = escape.end
            return _Item(Boundary(escape.value == "B", bool(flags & ASCII), escape.start))
        if escape.kind == "backreference":
            return self.reference(escape.value, escape.start, escape.end, flags)
        self.pos = escape.end
        chars = escape_chars(escape, ascii_only=bool(flags & ASCII))
        return _Item(Chars(chars, escape.start, source, flags & ATOM_FLAGS), 1, True)

    def char_class(self, flags: int) -> _Item:
        start = self.pos
        found = read_class(self.text, start, ascii_only=bool(flags & ASCII))
        self.pos = found.end
        source = self.text[start : self.pos]
        return _Item(Chars(found.chars, start, source, flags & ATOM_FLAGS), 1, not found.negated)

    # -- groups ------------------------------------------------------------------
    def group(self, flags: int) -> _Item:
        start = self.pos
        if not self.text.startswith("(?", start):
            self.pos += 1
            return self.capturing(start, None, flags)
        rest = self.text[start + 2 : start + 4]
        if rest.startswith("P<"):
            close = self.text.index(">", start)
            name = self.text[start + 4 : close]
            self.pos = close + 1
            return self.capturing(start, name, flags)
        if rest.startswith("P="):
            close = self.text.index(")", start)
            self.pos = close + 1
            return self.reference(self.names[self.text[start + 4 : close]], start, close + 1, flags)
        if rest.startswith(":"):
            self.pos = start + 3
            return _dissolved(self.group_body(start, flags), start)
        if rest[:1] in ("=", "!", ">") or rest in ("<=", "<!"):
            return self.lookaround_or_atomic(start, rest, flags)
        if rest.startswith("("):
            return self.conditional(start, flags)
        return self.scoped_group(start, flags)

    def capturing(self, start: int, name: str | None, flags: int) -> _Item:
        self.groups += 1
        index = self.groups
        if name is not None:
            self.names[name] = index
        body = _build(self.group_body(start, flags), start)
        self.widths[index] = width(body, dict(self.widths))
        return _Item(Group(body, index, start))

    def reference(self, index: int, start: int, end: int, flags: int) -> _Item:
        """A backreference to group ``index``, refused when that group's width is unbounded."""
        if self.widths[index][1] is None:
            raise self.error(f"backreference {self.text[start:end]} {UNBOUNDED_REFERENCE}", start)
        self.pos = end
        self.referenced.add(index)
        return _Item(Backreference(index, flags & (IGNORECASE | ASCII), start))

    def lookaround_or_atomic(self, start: int, rest: str, flags: int) -> _Item:
        behind = rest.startswith("<")
        self.pos = body_start = start + 3 + behind
        body = _build(self.group_body(start, flags), body_start)
        if rest[0] == ">":
            self.ordered = True
            return _Item(Atomic(body, start))
        if behind:
            return _Item(Lookbehind(body, rest[1] == "!", start))
        return _Item(Lookahead(body, rest[0] == "!", start))

    def conditional(self, start: int, flags: int) -> _Item:
        """``(?(name)yes|no)``; re has checked the name (a group name or a number)."""
        close = self.text.index(")", start + 3)
        name = self.text[start + 3 : close]
        index = self.names[name] if name in self.names else int(name)
        self.referenced.add(index)
        self.pos = close + 1
        yes_start = self.pos
        yes = _build(self.sequence(flags), yes_start)
        no = Sequence((), self.pos)
        if self.peek() == "|":
            self.pos += 1
            no = _build(self.sequence(flags), self.pos)
        if self.peek() != ")":
            raise self.error("missing ), unterminated subpattern", start)
        self.pos += 1
        return _Item(Conditional(index, yes, no, start))

    def scoped_group(self, start: int, flags: int) -> _Item:
        spec = self.flag_spec(start + 2)
        if spec is None:
            raise self.error(f"unknown extension {self.text[start + 1 : start + 3]}", start + 1)
        if spec.terminator == ")":
            raise self.error("global flags not at the start of the expression", start)
        self.pos = spec.end
        inner = flags & ~TYPE_FLAGS if spec.add & TYPE_FLAGS else flags
        inner = (inner | spec.add) & ~spec.remove
        return _Item(_build(self.group_body(start, inner), start))

    def group_body(self, start: int, flags: int) -> list[_Item]:
        items = self.alternation(flags)
        if self.peek() != ")":
            raise self.error("missing ), unterminated subpattern", start)
        self.pos += 1
        return items

    def flag_spec(self, index: int) -> _FlagSpec | None:
        """Read ``aimsux-imsx`` then ``:`` or ``)`` from ``index``; None if no flag letter or '-' is there."""
        add, index = _flag_letters(self.text, index)
        remove = 0
        if self.text[index : index + 1] == "-":
            remove, index = _flag_letters(self.text, index + 1)
        elif not add:
            return None
        terminator = self.text[index : index + 1]
        if terminator not in (")", ":"):
            raise self.error("missing -, : or )", index)
        return _FlagSpec(add, remove, terminator, index + 1)


def _flag_letters(text: str, index: int) -> tuple[int, int]:
    value = 0
    while index < len(text) and text[index] in INLINE_FLAGS:
        value |= INLINE_FLAGS[text[index]]
        index += 1
    return value, index


def _digits_end(text: str, index: int) -> int:
    while index < len(text) and text[index] in DIGITS:
        index += 1
    return index


def _dissolved(items: list[_Item], start: int) -> _Item:
    """A group without flags: re splices its elements into the parent sequence."""
    ops = sum(item.ops for item in items)
    return _Item(_build(items, start), ops, _single_plain(items) is not None)


def _single_plain(items: list[_Item]) -> Chars | None:
    """The one literal or non-negated class these items amount to in re's eyes, if so."""
    counted = [item for item in items if item.ops]
    if len(counted) != 1 or counted[0].ops != 1 or not counted[0].plain:
        return None
    node = _build(items, 0)
    return node if isinstance(node, Chars) else None


def _merge_options(options: list[list[_Item]], start: int) -> Chars | None:
    """The one class re makes of ``a|[bc]|\\d`` (options that are single plain atoms), or None."""
    atoms = [_single_plain(option) for option in options]
    if any(atom is None for atom in atoms) or len({atom.flags for atom in atoms}) != 1:
        return None
    chars = CharSet.union([atom.chars for atom in atoms])
    source = "|".join(atom.source for atom in atoms)
    return Chars(chars, start, source, atoms[0].flags)


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
        return _build([_Item(part) for part in parts], node.position)
    if isinstance(node, Alternation):
        return Alternation(tuple(parts), node.position)
    if isinstance(node, Repeat):
        return Repeat(parts[0], node.min, node.max, node.position, node.lazy and ordered, node.possessive)
    if isinstance(node, Conditional):
        return Conditional(node.index, parts[0], parts[1], node.position)
    if parts:
        return type(node)(parts[0], *[getattr(node, field) for field in _FIELDS[type(node)]])
    return node


#: The fields after ``item`` of the nodes with one child, in constructor order.
_FIELDS = {Lookahead: ("negative", "position"), Lookbehind: ("negative", "position"),
           Group: ("index", "position"), Atomic: ("position",)}


def _build(items: list[_Item], position: int) -> Node:
    """The node for a run of items: nested sequences spliced, a single item as itself."""
    nodes: list[Node] = []
    for item in items:
        if isinstance(item.node, Sequence):
            nodes.extend(item.node.items)
        else:
            nodes.append(item.node)
    if len(nodes) == 1:
        return nodes[0]
    return Sequence(tuple(nodes), position)
