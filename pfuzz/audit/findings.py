"""Findings grouped so that a person can act on them: exceptions by type, disagreements by cause.

Exceptions: every exception a validator raised is grouped by its type, with
the number of distinct inputs that raised it, how many of those the
specification rejects, the message of the shortest and the shortest few
inputs (shortlex: by length, then by code point). Types that are not a way of
saying "reject" (``Verdict.unexpected``) are findings of their own.

Disagreements: grouped by direction (a wrong accept: an invalid string let
through; a wrong reject: a valid string refused) and by cause. Where the
difference language of that direction is known exactly (the exact comparison
of a regular-expression target, or a learned model of the validator), it is
the cause: every disagreement inside it forms one group, summarised by that
language (written back as a pattern by state elimination, counted,
``pfuzz.audit.comparison.summarise``), whichever kinds of case found them.
Otherwise, and for disagreements outside it (a model that is wrong there), the
kind of case that found them stands in for the cause (``AuditCase.group``:
boundary categories, near-misses by edit kind, hostile variants, case flips,
sampled valid strings). A group of up to ``LISTED`` members is listed whole; a
larger one is summarised by its size, its lengths, its shortest members and
its difference language or, with none known, the pattern of its own finite set
when that is short. The full lists stay in the JSON report.

Cost: sorting the findings, one membership test per finding and difference
language, and for small groups without a difference language the minimal DFA of
a finite set (``pfuzz.automata.algebra.from_strings``) and its state elimination.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from pfuzz.automata.algebra import from_strings
from pfuzz.base.charset import CharSet
from pfuzz.language import Language

__all__ = ["LISTED", "SHORTEST", "Group", "RaisedGroup", "RaisedLog", "group_findings",
           "shortlex"]

#: Groups up to this size are listed member by member in the text report.
LISTED = 10
#: Shortest members (or inputs) shown for a larger group.
SHORTEST = 5
#: A group's own finite set is written as a pattern only up to this many members ...
FINITE_MEMBERS = 50
#: ... and when the pattern is at most this long.
FINITE_PATTERN = 160


def shortlex(text: str) -> tuple[int, str]:
    return len(text), text


@dataclass
class _Seen:
    count: int = 0
    spec_rejects: int = 0
    shortest: list[str] = field(default_factory=list)
    message: str = ""
    unexpected: bool = False


@dataclass(frozen=True)
class RaisedGroup:
    """One exception type: how often, on which inputs, and whether it is a finding."""

    type: str
    count: int
    spec_rejects: int
    shortest: tuple[str, ...]
    message: str
    unexpected: bool

    def as_dict(self) -> dict:
        return {"type": self.type, "inputs": self.count, "specification_rejects": self.spec_rejects,
                "shortest": list(self.shortest), "message": self.message,
                "finding": self.unexpected}


class RaisedLog:
    """Exceptions seen, per type, in bounded memory (a count and the shortest inputs of each)."""

    def __init__(self, keep: int = SHORTEST):
        self.keep = keep
        self._types: dict[str, _Seen] = {}

    def add(self, text: str, verdict, spec_accepts: bool) -> None:
        """Record one input's exception (the caller gives each input once)."""
        if not verdict.raised:
            return
        seen = self._types.setdefault(verdict.raised, _Seen())
        seen.count += 1
        seen.spec_rejects += not spec_accepts
        seen.unexpected = seen.unexpected or verdict.unexpected
        if len(seen.shortest) < self.keep or shortlex(text) < shortlex(seen.shortest[-1]):
            seen.shortest = sorted([*seen.shortest, text], key=shortlex)[:self.keep]
            if seen.shortest[0] == text:
                seen.message = verdict.message

    def groups(self) -> list[RaisedGroup]:
        """Findings first, then by how many inputs raised each type."""
        out = [RaisedGroup(name, s.count, s.spec_rejects, tuple(s.shortest), s.message, s.unexpected)
               for name, s in self._types.items()]
        return sorted(out, key=lambda g: (not g.unexpected, -g.count, g.type))

    @property
    def unexpected(self) -> int:
        """Distinct inputs that raised an exception that is a finding."""
        return sum(s.count for s in self._types.values() if s.unexpected)


@dataclass(frozen=True)
class Group:
    """Disagreements of one direction and one cause."""

    direction: str          #: "wrong accept" or "wrong reject"
    label: str              #: the kind of case (``AuditCase.group``), or "" for a difference language
    findings: tuple         #: the findings, shortlex by text
    difference: object      #: the ``comparison.Side`` the group lies in, or None
    difference_source: str  #: "exact comparison", "learned model" or ""
    own_pattern: str | None  #: the group's own finite set as a pattern, when short

    @property
    def kinds(self) -> dict[str, int]:
        """How many members each kind of case found."""
        out: dict[str, int] = {}
        for f in self.findings:
            out[f.case.group] = out.get(f.case.group, 0) + 1
        return out

    @property
    def size(self) -> int:
        return len(self.findings)

    @property
    def listed(self) -> bool:
        return self.size <= LISTED

    @property
    def shortest(self) -> tuple[str, ...]:
        return tuple(f.case.text for f in self.findings[:SHORTEST])

    @property
    def lengths(self) -> tuple[int, int]:
        sizes = [len(f.case.text) for f in self.findings]
        return min(sizes), max(sizes)

    def as_dict(self) -> dict:
        diff = self.difference
        return {"direction": self.direction, "kind": self.label or None, "found_by": self.kinds,
                "size": self.size, "lengths": list(self.lengths), "shortest": list(self.shortest),
                "difference_source": self.difference_source or None,
                "difference_pattern": diff.pattern if diff is not None else None,
                "own_pattern": self.own_pattern}


def group_findings(findings, alphabet: CharSet, differences: dict | None = None,
                   source: str = "") -> list[Group]:
    """Groups by direction and kind of case, in the order of their shortest member.

    ``differences`` maps "wrong accept" and "wrong reject" to the ``Side`` of
    the matching difference language (validator − specification, and
    specification − validator), when one is known; ``source`` says where it
    comes from. Patterns are written over ``alphabet`` (the audit alphabet).
    """
    differences = differences or {}
    buckets: dict[tuple[str, str], list] = {}
    for f in sorted(findings, key=lambda f: shortlex(f.case.text)):
        direction = "wrong accept" if f.wrong_accept else "wrong reject"
        side = differences.get(direction)
        inside = side is not None and side.language.accepts(f.case.text)
        buckets.setdefault((direction, "" if inside else f.case.group), []).append(f)
    out = []
    for (direction, label), members in buckets.items():
        side = differences.get(direction) if not label else None
        own = _own_pattern(members, alphabet) if side is None and len(members) > LISTED else None
        out.append(Group(direction, label, tuple(members), side, source if side is not None else "",
                         own))
    return out


def _own_pattern(members, alphabet: CharSet) -> str | None:
    """A pattern for the group's own finite set of strings, when it is short."""
    if len(members) > FINITE_MEMBERS:
        return None
    return Language(from_strings([f.case.text for f in members], alphabet)).to_pattern(FINITE_PATTERN)
