"""Boundary suites: deterministic QA cases read off the minimal DFA.

Boundary value analysis and equivalence partitioning are trade terms of
software testing; here the partitions are the states and transitions of the
minimal DFA, so every case is derived, not guessed. Nothing is random: the same
automaton (and limit and probes) always gives the same suite, in the same order.

The suite, most informative first:

1. ``shortest``: the shortlex-least valid string.
2. ``longest``: the shortlex-least valid string of the greatest valid length;
   for an unbounded language, of the greatest valid length within the length
   bound (below).
3. ``length-edge``: for each edge of the set of valid lengths, in increasing
   length, the shortlex-least valid string of that length, then an invalid
   string just outside it (kinds ``valid``, ``shorter``: without its last
   character, ``longer``: its last character repeated).
4. The position-aware edges of ``pfuzz.boundary.edges``, for every transition
   (a state and a maximal character range leading to a live state):
   ``range-edge`` (kinds ``below``, ``above``: the characters just outside the
   range, invalid; ``low``, ``high``: its ends, valid), ``repetition``
   (``one-more``, ``one-fewer`` of the class taken there) and ``exit``
   (``outside``: the ends of the ranges a state refuses, and the caller's
   probe characters, where no allowed range is next to them). They come in
   rounds: round j holds the j-th case of every (kind, state) pair, kinds in
   the order below, above, one-more, one-fewer, low, high, outside, states in
   breadth-first order. So every position gets its first invalid edge, then
   its first repetition, its first valid edge..., before any position gets a
   second case of a kind.
5. ``coverage``: valid strings that together take every transition (the
   greedy cover of ``pfuzz.boundary.paths``; at most one per transition). The
   valid range edges already take every transition; the cover adds longer
   walks that take many at once.

A case whose text an earlier case already has is merged into it (the earlier
keeps its category and kind; up to ``REASONS`` reasons are joined and the
rest counted), so the suite holds each text once. Characters outside the
alphabet are never used. Positions in reasons count from 0. Every invalid
case carries a valid string one edit away (``witness``) and that edit.

Limit: a large automaton has many edges (the 968-state password field of
``profiles/password-policy.toml`` has some 5,500 ranges). ``limit`` (default
``DEFAULT_LIMIT`` distinct cases) keeps the first cases in the order above and
cuts the rest; the result says how many were cut, per category
(``Suite.cut``, ``Suite.cut_by_category``, ``Suite.note()``).

Length bound: ``max_length`` bounds the ``longest`` case and the scan for
length edges. By default it is the language's longest length for a finite
language and ``min_length + UNBOUNDED_SPAN`` for an unbounded one (the same
default bound as sampling, ``pfuzz.base.constants.UNBOUNDED_SPAN``). The scan
stops early when the set of states reachable in exactly n steps repeats or
becomes empty. The other cases are built from shortest prefixes and
completions and are not cut by the bound.

Cost: the paths (``pfuzz.boundary.paths``), then O(drafts × case length) for
the texts of every draft (all of them, so that the cut is counted exactly),
plus the reasons and verdicts of the cases kept. Drafts are linear in the
transitions' ranges plus states × (alphabet and probe ranges). Figures are in
``python -m pfuzz.benchmarks boundary``. The empty language gives an empty suite.
"""

from __future__ import annotations

from collections import Counter
from collections.abc import Sequence
from dataclasses import dataclass, field

from pfuzz.automata.dfa import DFA
from pfuzz.base.charset import CharSet
from pfuzz.boundary.edges import Draft, Verdicts, ordered_drafts
from pfuzz.boundary.paths import Guide, Lengths
from pfuzz.errors import ArgumentError
from pfuzz.nearmiss.edits import Edit

CATEGORIES = ("shortest", "longest", "length-edge", "range-edge", "repetition", "exit", "coverage")
#: Distinct cases a suite keeps unless told otherwise (per field, in corpora and audits).
DEFAULT_LIMIT = 20_000
#: Reasons joined on a case that several edges share; the others are counted.
REASONS = 4

__all__ = ["CATEGORIES", "Case", "DEFAULT_LIMIT", "Suite", "coverage", "suite"]


@dataclass(frozen=True)
class Case:
    """One boundary case: the text, whether it is accepted, and why it is in the suite.

    For an invalid case, ``witness`` is a valid string one edit away and
    ``edits`` that edit (``pfuzz.nearmiss.edits.Edit``).
    """

    text: str
    expected: bool
    category: str
    reason: str
    kind: str = ""
    witness: str | None = None
    edits: tuple[Edit, ...] = ()


@dataclass(frozen=True)
class Suite(Sequence):
    """The cases kept, in order, and what the limit cut."""

    cases: tuple[Case, ...] = ()
    limit: int | None = DEFAULT_LIMIT
    cut_by_category: dict[str, int] = field(default_factory=dict)

    def __len__(self) -> int:
        return len(self.cases)

    def __getitem__(self, index):
        return self.cases[index]

    @property
    def cut(self) -> int:
        """Distinct cases left out by the limit."""
        return sum(self.cut_by_category.values())

    def note(self) -> str | None:
        """One line saying what the limit cut, or None when nothing was."""
        if not self.cut:
            return None
        parts = ", ".join(f"{n:,} {category}" for category, n in self.cut_by_category.items())
        return (f"boundary suite cut to its first {len(self):,} of {len(self) + self.cut:,} "
                f"cases by the limit of {self.limit:,} (left out: {parts})")


def suite(dfa: DFA, max_length: int | None = None, *, limit: int | None = DEFAULT_LIMIT,
          probes: CharSet | None = None) -> Suite:
    """The boundary suite of ``dfa`` in the documented order (see the module docstring).

    ``limit``: distinct cases kept (None keeps all); ``probes``: characters to
    try wherever they are refused (``pfuzz.boundary.edges``).
    """
    _check(max_length, "max_length")
    if limit is not None:
        _check(limit, "limit")
    guide = Guide(dfa)
    if not guide.reachable:
        return Suite((), limit)
    lengths = Lengths(guide, max_length)
    items = [*_ends(guide, lengths), *_length_edges(guide, lengths),
             *ordered_drafts(guide, probes or CharSet()), *_coverage_cases(guide)]
    return _assemble(items, limit, Verdicts(guide))


def coverage(dfa: DFA) -> list[str]:
    """Valid strings that together take every transition between live states (greedy cover)."""
    guide = Guide(dfa)
    return [text for text, _ in guide.cover()] if guide.reachable else []


def _check(value, name: str) -> None:
    if value is not None and (not isinstance(value, int) or isinstance(value, bool) or value < 0):
        raise ArgumentError(f"{name} must be a whole number, 0 or more, not {value!r}")


# -- the head: ends and length edges ----------------------------------------------------

def _ends(guide: Guide, lengths: Lengths) -> list[Case]:
    shortest = guide.completion(0)
    cases = [Case(shortest, True, "shortest", f"shortest valid string (length {len(shortest)})")]
    top = lengths.longest_within_bound()
    if top is not None:
        if lengths.finite_max is not None and top == lengths.finite_max:
            why = f"longest valid string (length {top})"
        elif lengths.finite_max is not None:
            why = (f"longest valid string within the length bound {lengths.bound} "
                   f"(the language goes to {lengths.finite_max})")
        else:
            why = f"longest valid string within the length bound {lengths.bound} (no upper limit)"
        cases.append(Case(lengths.string_of_length(top), True, "longest", why))
    return cases


def _length_edges(guide: Guide, lengths: Lengths) -> list[Case]:
    cases = []
    last = min(len(lengths.valid) - 1, lengths.bound + 1)
    for n in range(min(last, lengths.bound + 1)):
        if not lengths.valid[n]:
            continue
        below = n > 0 and not lengths.valid[n - 1]
        above = not lengths.valid[n + 1]
        if not (below or above or n == lengths.min):
            continue
        text = lengths.string_of_length(n)
        cases.append(Case(text, True, "length-edge", _edge_reason(n, below, above, lengths), "valid"))
        if below:
            what = f"the shortest valid string ({n})" if n == lengths.min else f"a valid string of length {n}"
            cases.append(Case(text[:-1], False, "length-edge", f"one character shorter than {what}",
                              "shorter", text, (Edit("delete", n - 1, text[-1], ""),)))
        if above:
            what = (f"the longest valid string ({n})" if n == lengths.finite_max
                    else f"a valid string of length {n}")
            extra = text[-1] if text else chr(guide.dfa.alphabet.min)
            cases.append(Case(text + extra, False, "length-edge", f"one character longer than {what}",
                              "longer", text, (Edit("insert", n, "", extra),)))
    return cases


def _edge_reason(n: int, below: bool, above: bool, lengths: Lengths) -> str:
    sides = [f"length {n - 1}" if below else "", f"length {n + 1}" if above else ""]
    outside = " and ".join(s for s in sides if s)
    if not outside:
        return f"valid at length {n}, the lower end of the valid lengths"
    return f"valid at length {n}; {outside} {'are' if below and above else 'is'} not valid"


def _coverage_cases(guide: Guide) -> list[Case]:
    cover = guide.cover()
    size = sum(new for _, new in cover)
    return [Case(text, True, "coverage",
                 f"transition cover string {i} of {len(cover)} (together they take all "
                 f"{size} transitions); takes {new} not taken before")
            for i, (text, new) in enumerate(cover, 1)]


# -- the edges as cases ------------------------------------------------------------------

def _case(item: "Case | Draft", verdicts: Verdicts) -> Case:
    if isinstance(item, Case):
        return item
    expected = verdicts.of(item)
    witness, edits = None, ()
    if not expected:
        witness, edits = item.witness, (Edit(*item.edit),)
    return Case(item.text, expected, item.category, _reason(item, expected), item.kind,
                witness, edits)


def _reason(draft: Draft, expected: bool) -> str:
    q, at, span = _q(draft.point), f"at position {draft.position}", _show_range(*draft.span)
    kind = draft.kind
    if kind in ("low", "high"):
        if draft.span[0] == draft.span[1]:
            return f"{q} {at}, a range of one character"
        return f"{q} is the {kind} end of {span} {at}"
    if kind in ("below", "above"):
        return f"{q} is just {kind} {span} {at}"
    if kind == "one-more":
        return f"one more of {span} {at} ({q} twice){'' if expected else ', not allowed'}"
    if kind == "one-fewer":
        return f"one fewer of {span} {at} ({q} left out){'' if expected else ', not allowed'}"
    if draft.accepting:
        return f"{q} after the complete valid string {draft.witness!r} (an end of the refused range {span})"
    return f"{q} {at}, an end of the range {span} refused there"


def _q(point: int) -> str:
    return repr(chr(point))


def _show_range(lo: int, hi: int) -> str:
    return _q(lo) if lo == hi else f"{_q(lo)}-{_q(hi)}"


def _assemble(items: list, limit: int | None, verdicts: Verdicts) -> Suite:
    """Keep the first item of each text up to ``limit``; join the reasons of later repeats."""
    index: dict[str, int] = {}
    kept: list = []
    repeats: list[list] = []
    cut: Counter = Counter()
    for item in items:
        i = index.get(item.text)
        if i is not None:
            if i >= 0:
                repeats[i].append(item)
            continue
        if limit is not None and len(kept) >= limit:
            index[item.text] = -1
            cut[item.category] += 1
            continue
        index[item.text] = len(kept)
        kept.append(item)
        repeats.append([])
    cases = tuple(_merged(item, extra, verdicts) for item, extra in zip(kept, repeats))
    order = {c: k for k, c in enumerate(CATEGORIES)}
    return Suite(cases, limit, dict(sorted(cut.items(), key=lambda kv: order[kv[0]])))


def _merged(item, extra: list, verdicts: Verdicts) -> Case:
    case = _case(item, verdicts)
    if not extra:
        return case
    reasons = [case.reason]
    for other in extra:
        if len(reasons) == REASONS:
            break
        why = _case(other, verdicts).reason
        if why not in reasons:
            reasons.append(why)
    more = len(extra) + 1 - len(reasons)
    tail = f"; and {more} more edge{'s' if more != 1 else ''}" if more > 0 else ""
    return Case(case.text, case.expected, case.category, "; ".join(reasons) + tail, case.kind,
                case.witness, case.edits)
