"""The syntax tree of a pattern: small immutable nodes, flags already applied.

``pfuzz.syntax.parser`` builds these from pattern text; ``pfuzz.automata.nfa`` and
``pfuzz.automata.construction.compiler`` read them. Groups have dissolved (capturing or not, they
change no language), lazy quantifiers are plain repeats, and every flag but
IGNORECASE is resolved at parse time: ``.`` under DOTALL, ``\\w`` under ASCII,
``^``/``$`` under MULTILINE are already the right nodes. Case-insensitive
atoms keep their source text and flags so that ``pfuzz.syntax.casefold`` can ask
``re`` itself which cased characters they match.
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
    """``item`` repeated between ``min`` and ``max`` times (``max`` None: unbounded)."""

    item: "Node"
    min: int
    max: int | None
    position: int = 0


@dataclass(frozen=True)
class Anchor:
    """A zero-width assertion about the position; ``kind`` is one of ANCHOR_KINDS."""

    kind: str
    position: int = 0


@dataclass(frozen=True)
class Lookahead:
    """``(?=item)`` or, when ``negative``, ``(?!item)``: a constraint on the rest of the string."""

    item: "Node"
    negative: bool
    position: int = 0


Node = Union[Chars, Sequence, Alternation, Repeat, Anchor, Lookahead]
