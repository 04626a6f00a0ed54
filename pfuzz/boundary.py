"""Boundary suites: deterministic QA cases read off the minimal DFA.

Boundary value analysis and equivalence partitioning are trade terms of
software testing; here the partitions are the states and transitions of the
minimal DFA, so every case is derived, not guessed. Nothing is random: the same
automaton always gives the same suite, in the same order.

The suite, in this order (a later case whose text repeats an earlier one is
dropped and its reason joined to the first, which keeps its category):

1. ``shortest``: the shortlex-least valid string.
2. ``longest``: the shortlex-least valid string of the greatest valid length;
   for an unbounded language, of the greatest valid length within the length
   bound (below).
3. ``length-edge``: for each edge of the set of valid lengths, in increasing
   length, the shortlex-least valid string of that length, then an invalid
   string just outside it (one character shorter: the valid string without its
   last character; one character longer: the valid string with its last
   character repeated). Any string of an invalid length is rejected.
4. ``range-edge``: for each transition (states in breadth-first order, their
   transitions by smallest character), for each code-point range of its label:
   the character just below the range (when it is in the universe and leads to
   rejection there), the low end, the high end, the character just above
   (same condition). Each is built as the shortest valid prefix reaching the
   state + the edge character + the shortest completion from the transition's
   target, so a case differs from a valid string in exactly one character.
5. ``coverage``: valid strings that together take every transition (greedy:
   for each transition not yet taken, the shortest prefix to its state, the
   transition, then while possible a transition not yet taken, then the
   shortest completion). Each string takes at least one new transition, so
   there are at most as many strings as transitions; the reason reports the
   cover's size.
6. ``exit``: for each state where some character of the universe leads to
   rejection, one reject that leaves the language there: the shortest valid
   string through the state with its next character replaced by a rejected one
   (one not adjacent to an allowed character when there is such, else the
   smallest), or the rejected character appended when the state accepts.

A *transition* is a pair of live states (s, t) with its label, the set of all
characters leading from s to t (the union of the symbol classes that do so);
only live states (those that can still reach acceptance) count. Positions in
reasons count from 1. Characters outside the universe are never used.

Length bound: ``max_length`` bounds the ``longest`` case and the scan for
length edges. By default it is the language's longest length for a finite
language and ``min_length + UNBOUNDED_SPAN`` for an unbounded one. The scan
stops early when the set of states reachable in exactly n steps repeats
(from there the set of valid lengths is periodic, so every kind of edge has
been seen) or becomes empty. The other cases are built from shortest prefixes
and completions and are not cut by the bound.

Cost: breadth-first prefixes and completions are O(states × classes); the
length scan is O(Σ|S_n| × classes) over the scanned lengths; a string of an
exact interior length n costs O(n × transitions) (backward reachable sets);
the output itself is O(cases × case length), which dominates for long
bounded repeats such as ``.{0,10000}`` (every position is a state).
The empty language gives an empty suite.
"""

from __future__ import annotations

from collections import deque
from dataclasses import dataclass

from .charset import CharSet
from .dfa import DFA

#: For an unbounded language, the ``longest`` case is sought up to this many
#: characters beyond the shortest valid length.
UNBOUNDED_SPAN = 64

CATEGORIES = ("shortest", "longest", "length-edge", "range-edge", "coverage", "exit")


@dataclass(frozen=True)
class Case:
    """One boundary case: the text, whether it is accepted, and why it is in the suite."""

    text: str
    expected: bool
    category: str
    reason: str


def suite(dfa: DFA, max_length: int | None = None) -> list[Case]:
    """The boundary suite of ``dfa`` in the documented order (see the module docstring)."""
    if max_length is not None and max_length < 0:
        raise ValueError(f"max_length must be 0 or more, not {max_length}")
    guide = Guide(dfa)
    if not guide.reachable:
        return []
    lengths = Lengths(guide, max_length)
    cases = [*_ends(guide, lengths), *_length_edges(guide, lengths), *_range_edges(guide),
             *_coverage_cases(guide), *_exits(guide)]
    return _deduplicate(cases)


def coverage(dfa: DFA) -> list[str]:
    """Valid strings that together take every transition between live states (greedy cover)."""
    guide = Guide(dfa)
    return [text for text, _ in guide.cover()] if guide.reachable else []


def transitions(dfa: DFA) -> list[tuple[int, CharSet, int]]:
    """Every transition (state, label, target) between reachable live states, in suite order."""
    guide = Guide(dfa)
    return [(s, label, t) for s in guide.reachable for label, t in guide.edges[s]]


# -- the paths every case is built from --------------------------------------------

class Guide:
    """Transitions, shortest prefixes and shortest completions of a DFA's live part."""

    def __init__(self, dfa: DFA):
        self.dfa = dfa
        self.live = dfa.live_states()
        self.edges = [_labels(dfa, s, self.live) if s in self.live else [] for s in range(dfa.n_states)]
        self.reachable, self._parent = self._breadth_first()
        self._next = self._completion_steps()
        self._prefix: dict[int, str] = {0: ""}
        self._completion: dict[int, str] = {}

    def _breadth_first(self) -> tuple[list[int], dict[int, tuple[int, str]]]:
        """States in breadth-first order from the start; parent links of shortlex-least prefixes."""
        if 0 not in self.live:
            return [], {}
        order, parent = [0], {}
        queue = deque([0])
        while queue:
            s = queue.popleft()
            for label, t in self.edges[s]:
                if t != 0 and t not in parent:
                    parent[t] = (s, chr(label.min))
                    order.append(t)
                    queue.append(t)
        return order, parent

    def _completion_steps(self) -> dict[int, tuple[str, int]]:
        """Per non-accepting live state, the first step of its shortlex-least completion."""
        preds: dict[int, list[int]] = {}
        for s in self.live:
            for _, t in self.edges[s]:
                preds.setdefault(t, []).append(s)
        distance = {s: 0 for s in self.dfa.accepting if s in self.live}
        queue = deque(sorted(distance))
        while queue:
            t = queue.popleft()
            for s in preds.get(t, ()):
                if s not in distance:
                    distance[s] = distance[t] + 1
                    queue.append(s)
        steps = {}
        for s in self.live:
            if distance[s]:
                label, t = next((l, t) for l, t in self.edges[s] if distance[t] == distance[s] - 1)
                steps[s] = (chr(label.min), t)
        return steps

    def prefix(self, state: int) -> str:
        """The shortlex-least string leading from the start to ``state``."""
        chain, s = [], state
        while s not in self._prefix:
            s, ch = self._parent[s]
            chain.append(ch)
        text = self._prefix[s]
        for ch in reversed(chain):
            text += ch
        self._prefix[state] = text
        return text

    def completion(self, state: int) -> str:
        """The shortlex-least string leading from ``state`` to acceptance."""
        if state not in self._completion:
            chars, s = [], state
            while s in self._next:
                ch, s = self._next[s]
                chars.append(ch)
            self._completion[state] = "".join(chars)
        return self._completion[state]

    def allowed(self, state: int) -> CharSet:
        """Characters that keep a string live from ``state``."""
        return CharSet.of(r for label, _ in self.edges[state] for r in label.ranges)

    def cover(self) -> list[tuple[str, int]]:
        """Greedy transition cover: (valid string, number of transitions it takes first)."""
        taken: set[tuple[int, int]] = set()
        out = []
        for s in self.reachable:
            for label, t in self.edges[s]:
                if (s, t) not in taken:
                    text = self._covering_string(s, chr(label.min), t, taken)
                    before = len(taken)
                    taken.update(_path(self.dfa, text))
                    out.append((text, len(taken) - before))
        return out

    def _covering_string(self, s: int, ch: str, t: int, taken: set) -> str:
        used = {(s, t)}
        text = self.prefix(s) + ch
        while True:
            fresh = [(l, u) for l, u in self.edges[t] if (t, u) not in taken and (t, u) not in used]
            if not fresh:
                return text + self.completion(t)
            label, u = fresh[0]
            used.add((t, u))
            text += chr(label.min)
            t = u


def _labels(dfa: DFA, state: int, live: set[int]) -> list[tuple[CharSet, int]]:
    """The transitions out of ``state`` as (label, target), by smallest character."""
    ranges: dict[int, list[tuple[int, int]]] = {}
    for c, t in enumerate(dfa.table[state]):
        if t >= 0 and t in live:
            ranges.setdefault(t, []).extend(dfa.classes[c].ranges)
    edges = [(CharSet.of(rs), t) for t, rs in ranges.items()]
    edges.sort(key=lambda edge: edge[0].min)
    return edges


def _path(dfa: DFA, text: str) -> list[tuple[int, int]]:
    """The (state, next state) pairs a string takes."""
    pairs, s = [], 0
    for ch in text:
        t = dfa.table[s][dfa.class_of(ch)]
        pairs.append((s, t))
        s = t
    return pairs


# -- lengths ---------------------------------------------------------------------------

class Lengths:
    """Which lengths are valid, up to the bound or until the pattern of lengths repeats."""

    def __init__(self, guide: Guide, max_length: int | None):
        self.guide = guide
        dfa = guide.dfa
        self.min = len(guide.completion(0))
        self.finite_max = _longest_length(guide)
        if max_length is not None:
            self.bound = max_length
        else:
            self.bound = self.finite_max if self.finite_max is not None else self.min + UNBOUNDED_SPAN
        self.valid: list[bool] = []
        self.period: tuple[int, int] | None = None
        seen: dict[frozenset, int] = {}
        current = frozenset({0})
        while len(self.valid) <= self.bound + 1:
            n = len(self.valid)
            self.valid.append(bool(current & dfa.accepting))
            if not current:
                break
            if current in seen:
                self.period = (seen[current], n - seen[current])
                break
            seen[current] = n
            current = frozenset(t for s in current for _, t in guide.edges[s])
        self._reach: list[frozenset] = []

    def is_valid(self, n: int) -> bool:
        if n < len(self.valid):
            return self.valid[n]
        if self.period is None:
            return False
        first, period = self.period
        return self.valid[first + (n - first) % period]

    def longest_within_bound(self) -> int | None:
        top = min(self.bound, self.finite_max) if self.finite_max is not None else self.bound
        return next((n for n in range(top, self.min - 1, -1) if self.is_valid(n)), None)

    def string_of_length(self, n: int) -> str:
        """The shortlex-least valid string of length ``n`` (which must be a valid length)."""
        if n == self.min:
            return self.guide.completion(0)
        if n == self.finite_max:
            return _longest_string(self.guide)
        reach = self._reaching(n)
        dfa, s, chars = self.guide.dfa, 0, []
        for remaining in range(n, 0, -1):
            label, s = next((l, t) for l, t in self.guide.edges[s] if t in reach[remaining - 1])
            chars.append(chr(label.min))
        return "".join(chars)

    def _reaching(self, n: int) -> list[frozenset]:
        """reach[r]: live states from which acceptance is reachable in exactly r steps."""
        guide = self.guide
        if not self._reach:
            self._reach.append(frozenset(s for s in guide.dfa.accepting if s in guide.live))
        while len(self._reach) <= n:
            after = self._reach[-1]
            self._reach.append(frozenset(s for s in guide.live
                                         if any(t in after for _, t in guide.edges[s])))
        return self._reach


def _longest_length(guide: Guide) -> int | None:
    """Greatest valid length, or None when the language is unbounded."""
    best = _longest_table(guide)
    return None if best is None else best[0]


def _longest_table(guide: Guide) -> dict[int, int] | None:
    """Per live state, the longest completion length; None if a live cycle is reachable."""
    best: dict[int, int] = {}
    on_path: set[int] = set()
    stack = [(0, iter(guide.edges[0]))]
    on_path.add(0)
    while stack:
        s, it = stack[-1]
        for _, t in it:
            if t in on_path:
                return None
            if t not in best:
                on_path.add(t)
                stack.append((t, iter(guide.edges[t])))
                break
        else:
            stack.pop()
            on_path.discard(s)
            here = [best[t] + 1 for _, t in guide.edges[s]]
            best[s] = max(here + ([0] if s in guide.dfa.accepting else []))
    return best


def _longest_string(guide: Guide) -> str:
    """The shortlex-least valid string of the greatest length (finite languages)."""
    best = _longest_table(guide)
    s, chars = 0, []
    while best[s] > 0:
        label, s = next((l, t) for l, t in guide.edges[s] if best[t] == best[s] - 1)
        chars.append(chr(label.min))
    return "".join(chars)


# -- the cases ---------------------------------------------------------------------------

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
        cases.append(Case(text, True, "length-edge", _edge_reason(n, below, above, lengths)))
        if below:
            what = f"the shortest valid string ({n})" if n == lengths.min else f"a valid string of length {n}"
            cases.append(Case(text[:-1], False, "length-edge", f"one character shorter than {what}"))
        if above:
            what = (f"the longest valid string ({n})" if n == lengths.finite_max
                    else f"a valid string of length {n}")
            extra = text[-1] if text else chr(guide.dfa.universe.min)
            cases.append(Case(text + extra, False, "length-edge", f"one character longer than {what}"))
    return cases


def _edge_reason(n: int, below: bool, above: bool, lengths: Lengths) -> str:
    sides = [f"length {n - 1}" if below else "", f"length {n + 1}" if above else ""]
    outside = " and ".join(s for s in sides if s)
    if not outside:
        return f"valid at length {n}, the lower end of the valid lengths"
    return f"valid at length {n}; {outside} {'are' if below and above else 'is'} not valid"


def _range_edges(guide: Guide) -> list[Case]:
    dfa, cases = guide.dfa, []
    for s in guide.reachable:
        prefix = guide.prefix(s)
        where = f"at position {len(prefix) + 1}"
        for label, t in guide.edges[s]:
            tail = guide.completion(t)
            for lo, hi in label.ranges:
                span = _show_range(lo, hi)
                if _rejected(guide, s, lo - 1):
                    cases.append(Case(prefix + chr(lo - 1) + tail, False, "range-edge",
                                      f"{_q(lo - 1)} is just below the range {span} allowed {where}"))
                for point, end in ((lo, "low"), (hi, "high"))[: 1 if lo == hi else 2]:
                    why = (f"{_q(point)} is allowed {where} (a range of one character)" if lo == hi
                           else f"{_q(point)} is the {end} end of the range {span} allowed {where}")
                    cases.append(Case(prefix + chr(point) + tail, True, "range-edge", why))
                if _rejected(guide, s, hi + 1):
                    cases.append(Case(prefix + chr(hi + 1) + tail, False, "range-edge",
                                      f"{_q(hi + 1)} is just above the range {span} allowed {where}"))
    return cases


def _rejected(guide: Guide, state: int, point: int) -> bool:
    """True when ``point`` is in the universe and leads from ``state`` to rejection."""
    c = guide.dfa.class_of(point) if 0 <= point <= 0x10FFFF else -1
    return c >= 0 and guide.dfa.table[state][c] not in guide.live


def _coverage_cases(guide: Guide) -> list[Case]:
    cover = guide.cover()
    size = sum(new for _, new in cover)
    return [Case(text, True, "coverage",
                 f"transition cover string {i} of {len(cover)} (together they take all "
                 f"{size} transitions); takes {new} not taken before")
            for i, (text, new) in enumerate(cover, 1)]


def _exits(guide: Guide) -> list[Case]:
    universe, cases = guide.dfa.universe, []
    for s in guide.reachable:
        allowed = guide.allowed(s)
        rejected = universe - allowed
        if not rejected:
            continue
        near = CharSet.of((lo - 1, hi + 1) for lo, hi in allowed.ranges)
        bad = (rejected - near or rejected).min
        prefix, tail = guide.prefix(s), guide.completion(s)
        where = f"at position {len(prefix) + 1}"
        if allowed:
            why = f"{_q(bad)} leaves the language {where}, where only {_show_set(allowed)} may come"
        else:
            why = f"{_q(bad)} {where}, after a complete valid string that nothing may follow"
        cases.append(Case(prefix + chr(bad) + tail[1:], False, "exit", why))
    return cases


def _q(point: int) -> str:
    return repr(chr(point))


def _show_set(chars: CharSet) -> str:
    return _q(chars.min) if len(chars) == 1 else chars.describe()


def _show_range(lo: int, hi: int) -> str:
    return _q(lo) if lo == hi else f"{_q(lo)}-{_q(hi)}"


def _deduplicate(cases: list[Case]) -> list[Case]:
    """Keep the first case of each text; join the reasons of later duplicates to it."""
    first: dict[str, int] = {}
    out: list[Case] = []
    for case in cases:
        i = first.get(case.text)
        if i is None:
            first[case.text] = len(out)
            out.append(case)
            continue
        kept = out[i]
        if kept.expected != case.expected:
            raise AssertionError(f"boundary cases disagree on {case.text!r}")
        if case.reason not in kept.reason:
            out[i] = Case(kept.text, kept.expected, kept.category, f"{kept.reason}; {case.reason}")
    return out
