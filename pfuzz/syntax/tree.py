"""The syntax tree of a pattern: small immutable nodes, flags already applied.

``pfuzz.syntax.parser`` builds these from pattern text; ``pfuzz.automata.nfa`` and
``pfuzz.automata.construction`` read them. Every flag but IGNORECASE is resolved at
parse time: ``.`` under DOTALL, ``\\w`` and ``\\b`` under ASCII, ``^``/``$`` under
MULTILINE are already the right nodes. Case-insensitive atoms keep their source text
and flags so that ``pfuzz.syntax.casefold`` can ask ``re`` itself which cased
characters they match.

Groups change no language unless something looks at what they captured, so a
capturing group stays a ``Group`` node only when a ``Backreference`` or a
``Conditional`` refers to it; every other group dissolves into its parent. Lazy
quantifiers keep their ``lazy`` mark only where ``re``'s order of trying matters
(atomic groups, possessive quantifiers, groups that are referred to); elsewhere
they are plain repeats. ``width`` gives a node's shortest and longest match
length the way ``re``'s parser counts them (``getwidth``).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Union

from pfuzz.base.charset import CharSet

#: Kinds of ``Anchor``, with re's meaning under full matching:
#: text_start ``\A`` or ``^`` (position 0); line_start ``(?m)^`` (position 0 or after '\n');
#: text_end ``\Z`` (end of string); end_or_final_newline ``$`` (end, or just before a
#: final '\n'); line_end ``(?m)$`` (end, or before any '\n').
ANCHOR_KINDS = ("text_start", "line_start", "text_end", "end_or_final_newline", "line_end")


@dataclass(frozen=True)
class Chars:
    """Exactly one character from ``chars`` (its case-sensitive meaning, all code points)."""

    chars: CharSet
    position: int = 0
    source: str = ""
    flags: int = 0

    @property
    def ignore_case(self) -> bool:
        return bool(self.flags & re.IGNORECASE)


@dataclass(frozen=True)
class Sequence:
    """The items one after another; no items is the empty string."""

    items: tuple["Node", ...] = ()
    position: int = 0


@dataclass(frozen=True)
class Alternation:
    """Any one of the options."""

    options: tuple["Node", ...]
    position: int = 0


@dataclass(frozen=True)
class Repeat:
    """``item`` repeated between ``min`` and ``max`` times (``max`` None: unbounded).

    ``lazy`` tries fewer repetitions first (``*?``); ``possessive`` (``*+``) takes as
    many as it can, each one atomically, and never gives one back."""

    item: "Node"
    min: int
    max: int | None
    position: int = 0
    lazy: bool = False
    possessive: bool = False


@dataclass(frozen=True)
class Anchor:
    """A zero-width assertion about the position; ``kind`` is one of ANCHOR_KINDS."""

    kind: str
    position: int = 0


@dataclass(frozen=True)
class _Lookaround:
    item: "Node"
    negative: bool
    position: int = 0


class Lookahead(_Lookaround):
    """``(?=item)`` or, when ``negative``, ``(?!item)``: a constraint on the rest of the string."""


class Lookbehind(_Lookaround):
    """``(?<=item)`` or, when ``negative``, ``(?<!item)``: a constraint on the text before
    the position (``re`` allows only items of one fixed width)."""


@dataclass(frozen=True)
class Boundary:
    """``\\b`` or, when ``negative``, ``\\B``; ``ascii`` when word characters are re.ASCII's."""

    negative: bool
    ascii: bool = False
    position: int = 0


@dataclass(frozen=True)
class Group:
    """Capturing group number ``index`` (from 1), kept because something refers to it."""

    item: "Node"
    index: int
    position: int = 0


@dataclass(frozen=True)
class Backreference:
    """``\\index`` or ``(?P=name)``: the text group ``index`` last captured; ``flags`` holds
    IGNORECASE and ASCII as they stand at the reference (they decide the comparison)."""

    index: int
    flags: int = 0
    position: int = 0


@dataclass(frozen=True)
class Conditional:
    """``(?(index)yes|no)``: ``yes`` if group ``index`` has captured so far, else ``no``."""

    index: int
    yes: "Node"
    no: "Node"
    position: int = 0


@dataclass(frozen=True)
class Atomic:
    """``(?>item)``: the first way (in ``re``'s order) that ``item`` matches, never retried."""

    item: "Node"
    position: int = 0


Node = Union[Chars, Sequence, Alternation, Repeat, Anchor, Lookahead, Lookbehind, Boundary, Group,
             Backreference, Conditional, Atomic]


def children(node: Node) -> tuple:
    """The nodes directly inside ``node``."""
    if isinstance(node, Sequence):
        return node.items
    if isinstance(node, Alternation):
        return node.options
    if isinstance(node, Conditional):
        return (node.yes, node.no)
    if isinstance(node, (Repeat, Lookahead, Lookbehind, Group, Atomic)):
        return (node.item,)
    return ()


def walk(node: Node):
    """Every node of the tree, parents before children."""
    stack = [node]
    while stack:
        current = stack.pop()
        yield current
        stack.extend(children(current))


def width(node: Node, groups: dict[int, tuple[int, int | None]] | None = None) -> tuple[int, int | None]:
    """(shortest, longest) match length of ``node``, longest None when unbounded.

    Counted as ``re``'s parser does: assertions are 0 wide, a conditional is as wide
    as its branches together, a backreference as wide as its group (``groups`` maps
    group numbers to widths; groups met inside ``node`` are added to it)."""
    groups = {} if groups is None else groups
    if isinstance(node, Chars):
        return 1, 1
    if isinstance(node, (Sequence, Alternation, Conditional)):
        parts = [width(child, groups) for child in children(node)]
        if isinstance(node, Sequence):
            return sum(low for low, _ in parts), _sum_high(high for _, high in parts)
        return min(low for low, _ in parts), _max_high(high for _, high in parts)
    if isinstance(node, Repeat):
        low, high = width(node.item, groups)
        if node.max == 0:
            return 0, 0
        if high is None or node.max is None:
            return low * node.min, None if high is None or high else 0
        return low * node.min, high * node.max
    if isinstance(node, (Group, Atomic)):
        found = width(node.item, groups)
        if isinstance(node, Group):
            groups[node.index] = found
        return found
    if isinstance(node, Backreference):
        return groups.get(node.index, (0, None))
    return 0, 0


def _sum_high(highs) -> int | None:
    total = 0
    for high in highs:
        if high is None:
            return None
        total += high
    return total


def _max_high(highs) -> int | None:
    highs = list(highs)
    return None if None in highs else max(highs, default=0)
