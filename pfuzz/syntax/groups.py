"""Groups of ``re`` syntax: capturing, named, non-capturing, scoped flags, lookarounds,
atomic groups, conditionals and backreferences, read by the parser's group rule.

``GroupRules`` is the part of ``pfuzz.syntax.parser._Parser`` that reads ``(...)``;
it numbers capturing groups as ``re`` does (by their opening parenthesis), keeps
their widths (``pfuzz.syntax.tree.width``) to refuse a backreference to a group of
unbounded width, and notes which groups something refers to. ``re`` has already
accepted the pattern, so names and numbers are valid here. Cost: linear in the
group's text.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.syntax.flags import ASCII, IGNORECASE, INLINE_FLAGS, TYPE_FLAGS
from pfuzz.syntax.items import Item, build, dissolved
from pfuzz.syntax.tree import (Atomic, Backreference, Conditional, Group, Lookahead, Lookbehind, Sequence,
                               width)

UNBOUNDED_REFERENCE = ("refers to a group that can match strings of any length; pfuzz compiles "
                       "backreferences only to groups with finitely many strings")


@dataclass(frozen=True)
class _FlagSpec:
    """The flag letters of ``(?aimsux-imsx:`` or ``(?aimsux)``."""

    add: int
    remove: int
    terminator: str
    end: int


class GroupRules:
    """The group rule of the parser (mixed into ``pfuzz.syntax.parser._Parser``)."""

    def group(self, flags: int) -> Item:
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
            return dissolved(self.group_body(start, flags), start)
        if rest[:1] in ("=", "!", ">") or rest in ("<=", "<!"):
            return self.lookaround_or_atomic(start, rest, flags)
        if rest.startswith("("):
            return self.conditional(start, flags)
        return self.scoped_group(start, flags)

    def capturing(self, start: int, name: str | None, flags: int) -> Item:
        self.groups += 1
        index = self.groups
        if name is not None:
            self.names[name] = index
        body = build(self.group_body(start, flags), start)
        self.widths[index] = width(body, dict(self.widths))
        return Item(Group(body, index, start))

    def reference(self, index: int, start: int, end: int, flags: int) -> Item:
        """A backreference to group ``index``, refused when that group's width is unbounded."""
        if self.widths[index][1] is None:
            raise self.error(f"backreference {self.text[start:end]} {UNBOUNDED_REFERENCE}", start)
        self.pos = end
        self.referenced.add(index)
        return Item(Backreference(index, flags & (IGNORECASE | ASCII), start))

    def lookaround_or_atomic(self, start: int, rest: str, flags: int) -> Item:
        behind = rest.startswith("<")
        self.pos = body_start = start + 3 + behind
        body = build(self.group_body(start, flags), body_start)
        if rest[0] == ">":
            self.ordered = True
            return Item(Atomic(body, start))
        if behind:
            return Item(Lookbehind(body, rest[1] == "!", start))
        return Item(Lookahead(body, rest[0] == "!", start))

    def conditional(self, start: int, flags: int) -> Item:
        """``(?(name)yes|no)``; re has checked the name (a group name or a number)."""
        close = self.text.index(")", start + 3)
        name = self.text[start + 3 : close]
        index = self.names[name] if name in self.names else int(name)
        self.referenced.add(index)
        self.pos = close + 1
        yes_start = self.pos
        yes = build(self.sequence(flags), yes_start)
        no = Sequence((), self.pos)
        if self.peek() == "|":
            self.pos += 1
            no = build(self.sequence(flags), self.pos)
        if self.peek() != ")":
            raise self.error("missing ), unterminated subpattern", start)
        self.pos += 1
        return Item(Conditional(index, yes, no, start))

    def scoped_group(self, start: int, flags: int) -> Item:
        spec = self.flag_spec(start + 2)
        if spec is None:
            raise self.error(f"unknown extension {self.text[start + 1 : start + 3]}", start + 1)
        if spec.terminator == ")":
            raise self.error("global flags not at the start of the expression", start)
        self.pos = spec.end
        inner = flags & ~TYPE_FLAGS if spec.add & TYPE_FLAGS else flags
        inner = (inner | spec.add) & ~spec.remove
        return Item(build(self.group_body(start, inner), start))

    def group_body(self, start: int, flags: int) -> list[Item]:
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
