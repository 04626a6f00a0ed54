"""Position-aware boundary values: the edges of every (state, range) of the minimal DFA.

Boundary value analysis (a trade term of software testing) tests the ends of
each input partition and the values just outside them. Here a partition is a
*transition*: a live state q and a maximal code-point range r = [lo, hi] of the
characters leading from q to one live state t. A range that recurs at several
states (``[0-9]`` at each position of ``[0-9]{4}``) is tested at each of them,
so an off-by-one at any position is seen. For each state q, in breadth-first
order, and each range r of q, by smallest character:

- ``low``, ``high``: lo and hi (valid);
- ``below``, ``above``: lo − 1 and hi + 1 when they are in the alphabet and q
  refuses them (invalid). When another transition of q takes them they are
  the ``low``/``high`` of that transition's range and are tested there;
- ``one-more``, ``one-fewer``: lo written twice, and left out: one more and
  one fewer of the class taken at that position (verdict from the DFA);

and for each maximal range of the characters q refuses (the alphabet minus
what q allows, split where the caller's *probe* characters begin and end),
its two ends where they are not ``below``/``above`` already:

- ``outside``: a refused character away from every allowed range (invalid),
  the probe ranges first. Probes are the characters a caller wants tried
  wherever they are refused: the audit passes its hostile characters (a
  final newline, which ``$`` lets through; other scripts' digits, which
  ``\\d`` takes; full-width letters), so each meets every position. Gaps in
  the alphabet split refused ranges too (the audit alphabet is Latin-1 plus
  a few blocks, so each block's ends are range ends).

Every case is prefix(q) + c + tail, where prefix(q) is the shortlex-least
string reaching q. For c in r, just outside it, or repeated, tail is the
shortlex-least completion from t, so the case is one edit from the valid
string prefix(q) + e + tail (e the end of r next to c). For ``outside``, tail
is empty when q accepts (c after a complete valid string) and otherwise the
completion from q without its first character (c replaces it). Each draft
records that valid string (its *witness*) and the one edit from it.

Limits: a probe character is tried only where it is refused (where the
specification allows it, it is an ordinary character of a range); interior
characters of a range are not tried (a validator that treats the middle of a
range apart from its ends is out of reach of boundary values).

A (state, character) pair is tested once: a character that ends two ranges
(the one refused character between two ranges) gets one case, and only the
kinds listed produce cases, so the number of drafts is at most 4 per range
(two ends, two repetitions) plus 2 per refused range: linear in the number of
transitions, plus states × (alphabet ranges + probe ranges).

Cost: O(ranges + probe ranges) character-set work per state, plus the texts
themselves (O(drafts × case length)); verdicts of repetitions are read off
the DFA along the completion, once per (state, completion) pair.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.base.charset import CharSet
from pfuzz.boundary.paths import Guide

__all__ = ["CATEGORY_OF", "KINDS", "Draft", "Verdicts", "ordered_drafts", "state_drafts"]

#: Kinds in the order a round takes them: invalid edges first, then the
#: repetitions, then the valid edges, then refused characters away from any range.
KINDS = ("below", "above", "one-more", "one-fewer", "low", "high", "outside")
#: The suite category each kind is reported under.
CATEGORY_OF = {"below": "range-edge", "above": "range-edge", "low": "range-edge",
               "high": "range-edge", "one-more": "repetition", "one-fewer": "repetition",
               "outside": "exit"}


@dataclass(frozen=True, slots=True)
class Draft:
    """A case before the suite orders, merges and cuts it.

    ``expected`` is None for repetitions (read off the DFA when the case is
    kept); ``edit`` is (kind, position, old, new) from ``witness`` to ``text``.
    """

    text: str
    expected: bool | None
    kind: str
    state: int
    position: int
    point: int
    span: tuple[int, int]
    witness: str | None = None
    edit: tuple[str, int, str, str] | None = None
    accepting: bool = False

    @property
    def category(self) -> str:
        return CATEGORY_OF[self.kind]


def state_drafts(guide: Guide, state: int, probes: CharSet) -> dict[str, list[Draft]]:
    """The drafts of one live state, per kind, each list by smallest character."""
    prefix = guide.prefix(state)
    out: dict[str, list[Draft]] = {kind: [] for kind in KINDS}
    spans: dict[int, tuple[int, int, int]] = {}       # an end character -> (lo, hi, target)
    for label, target in guide.edges[state]:
        tail = guide.completion(target)
        for lo, hi in label.ranges:
            spans[lo] = spans[hi] = (lo, hi, target)
            _taken(out, state, prefix, lo, hi, tail)
    _refused(out, guide, state, prefix, spans, probes)
    return out


def _taken(out: dict, state: int, prefix: str, lo: int, hi: int, tail: str) -> None:
    p, low = len(prefix), chr(lo)
    span = (lo, hi)
    base = prefix + low + tail
    out["low"].append(Draft(base, True, "low", state, p, lo, span))
    if hi != lo:
        out["high"].append(Draft(prefix + chr(hi) + tail, True, "high", state, p, hi, span))
    out["one-more"].append(Draft(prefix + low + low + tail, None, "one-more", state, p, lo, span,
                                 base, ("insert", p + 1, "", low)))
    out["one-fewer"].append(Draft(prefix + tail, None, "one-fewer", state, p, lo, span,
                                  base, ("delete", p, low, "")))


def _refused(out: dict, guide: Guide, state: int, prefix: str, spans: dict, probes: CharSet) -> None:
    """Both ends of each refused range: ``below``/``above`` next to an allowed range, else ``outside``."""
    allowed = CharSet.of((lo, hi) for lo, hi, _ in spans.values())
    refused = guide.dfa.alphabet - allowed
    probed = (refused & probes).ranges
    pieces = [*probed, *(refused - probes).ranges]       # probe characters first
    p = len(prefix)
    done: set[int] = set()
    accepting = state in guide.dfa.accepting
    completion = guide.completion(state)
    for a, b in pieces:
        for point in dict.fromkeys((a, b)):
            if point in done:
                continue
            done.add(point)
            after, before = spans.get(point + 1), spans.get(point - 1)
            if after is not None and after[0] == point + 1:
                out["below"].append(_substitute(guide, state, prefix, point, after, after[0], "below"))
            elif before is not None and before[1] == point - 1:
                out["above"].append(_substitute(guide, state, prefix, point, before, before[1], "above"))
            elif accepting or not completion:
                out["outside"].append(Draft(prefix + chr(point), False, "outside", state, p, point,
                                            (a, b), prefix, ("insert", p, "", chr(point)), True))
            else:
                text = prefix + chr(point) + completion[1:]
                out["outside"].append(Draft(text, False, "outside", state, p, point, (a, b),
                                            prefix + completion,
                                            ("replace", p, completion[0], chr(point))))


def _substitute(guide: Guide, state: int, prefix: str, point: int, span: tuple, edge: int,
                kind: str) -> Draft:
    lo, hi, target = span
    tail = guide.completion(target)
    p = len(prefix)
    return Draft(prefix + chr(point) + tail, False, kind, state, p, point, (lo, hi),
                 prefix + chr(edge) + tail, ("replace", p, chr(edge), chr(point)))


def ordered_drafts(guide: Guide, probes: CharSet) -> list[Draft]:
    """Every state's drafts in rounds: round j takes the j-th draft of each (kind, state).

    Within a round, kinds go in ``KINDS`` order and states in breadth-first
    order, so every position gets its first invalid edge before any position
    gets a second case of that kind.
    """
    per_state = [state_drafts(guide, s, probes) for s in guide.reachable]
    keyed = []
    for kind_rank, kind in enumerate(KINDS):
        for order, drafts in enumerate(per_state):
            for j, draft in enumerate(drafts[kind]):
                keyed.append(((j, kind_rank, order), draft))
    keyed.sort(key=lambda pair: pair[0])
    return [draft for _, draft in keyed]


class Verdicts:
    """Read the verdict of a repetition off the DFA, once per (state, completion) pair."""

    def __init__(self, guide: Guide):
        self.guide = guide
        self._memo: dict[tuple[int, int], bool] = {}

    def of(self, draft: Draft) -> bool:
        if draft.expected is not None:
            return draft.expected
        dfa = self.guide.dfa
        low = chr(draft.span[0])
        target = dfa.table[draft.state][dfa.class_of(low)]
        if draft.kind == "one-fewer":
            return self._completes(draft.state, target)
        return self._completes(dfa.table[target][dfa.class_of(low)], target)

    def _completes(self, start: int, target: int) -> bool:
        """Whether the shortest completion from ``target``, read from ``start``, is accepted."""
        key = (start, target)
        if key not in self._memo:
            dfa, s = self.guide.dfa, start
            for ch in self.guide.completion(target):
                if s < 0:
                    break
                s = dfa.table[s][dfa.class_of(ch)]
            self._memo[key] = s >= 0 and s in dfa.accepting
        return self._memo[key]
