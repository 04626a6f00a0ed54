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
4. ``range-edge``: for each code-point range of each transition's label
   (states in breadth-first order, their transitions by smallest character):
   the character just below the range (when it is in the alphabet and leads to
   rejection there), the low end, the high end, the character just above
   (same condition). Each is built as the shortest valid prefix reaching the
   state + the edge character + the shortest completion from the transition's
   target, so a case differs from a valid string in exactly one character.
   A range that recurs at later states (``[0-9]`` at every position of
   ``[0-9]{4}``) is tested at the first state where it occurs (for the
   characters just outside: the first where they are rejected), which keeps
   the suite small; the near-miss rejects in edges mode (``pfuzz.nearmiss.rejects``)
   put edge characters at every position.
5. ``coverage``: valid strings that together take every transition (the
   greedy cover of ``pfuzz.boundary.paths``). Each string takes at least one new
   transition, so there are at most as many strings as transitions; each
   reason reports the cover's size. Automata that track several conditions at
   once (a password policy) need many strings: every string passes at most
   one of the transitions that complete the last condition.
6. ``exit``: for each distinct pair (set of allowed next characters, whether
   the string so far is valid) among the states where some character of the
   alphabet leads to rejection, one reject that leaves the language at the
   first such state: the shortest valid
   string through the state with its next character replaced by a rejected
   one (one not adjacent to an allowed character when there is such, else the
   smallest), or the rejected character appended when the state accepts.

A *transition* is a pair of live states (s, t) with its label, the set of all
characters leading from s to t (the union of the symbol classes that do so);
only live states (those that can still reach acceptance) count. Positions in
reasons count from 1. Characters outside the alphabet are never used.

Length bound: ``max_length`` bounds the ``longest`` case and the scan for
length edges. By default it is the language's longest length for a finite
language and ``min_length + UNBOUNDED_SPAN`` for an unbounded one (the same
default bound as sampling, ``pfuzz.counting.tables.UNBOUNDED_SPAN``). The scan
stops early when the set of states reachable in exactly n steps repeats
(from there the set of valid lengths is periodic, so every kind of edge has
been seen) or becomes empty. The other cases are built from shortest prefixes
and completions and are not cut by the bound.

Cost: see ``pfuzz.boundary.paths`` for the paths; the cases add O(transitions ×
ranges) and the output itself, O(cases × case length). Measured (one core):
1-5 ms for realistic validator patterns of 15-260 states; about 40 ms for
the password-policy fields (513 and 968 states, up to 2,767 transitions,
about 600-740 cover strings); 70 ms for ``(a|b)*a(a|b){10}`` (2,048 states);
90 ms for ``\\w{3,30}`` over the unicode alphabet, where ``\\w`` has some 640
ranges and so gives about 2,600 range-edge cases. The empty language gives
an empty suite.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.base.charset import CharSet
from pfuzz.automata.dfa import DFA
from pfuzz.boundary.paths import Guide, Lengths

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
            extra = text[-1] if text else chr(guide.dfa.alphabet.min)
            cases.append(Case(text + extra, False, "length-edge", f"one character longer than {what}"))
    return cases


def _edge_reason(n: int, below: bool, above: bool, lengths: Lengths) -> str:
    sides = [f"length {n - 1}" if below else "", f"length {n + 1}" if above else ""]
    outside = " and ".join(s for s in sides if s)
    if not outside:
        return f"valid at length {n}, the lower end of the valid lengths"
    return f"valid at length {n}; {outside} {'are' if below and above else 'is'} not valid"


def _range_edges(guide: Guide) -> list[Case]:
    cases, done = [], set()
    for s in guide.reachable:
        prefix = guide.prefix(s)
        where = f"at {len(prefix)}"
        for label, t in guide.edges[s]:
            tail = guide.completion(t)
            for lo, hi in label.ranges:
                span = _show_range(lo, hi)

                def add(key, point, expected, why):
                    if (key, lo, hi) not in done:
                        done.add((key, lo, hi))
                        cases.append(Case(prefix + chr(point) + tail, expected, "range-edge", why))

                if _rejected(guide, s, lo - 1):
                    add("below", lo - 1, False, f"{_q(lo - 1)} is just below the range {span} allowed {where}")
                if lo == hi:
                    add("ends", lo, True, f"{_q(lo)} is allowed {where} (a range of one character)")
                else:
                    add("low", lo, True, f"{_q(lo)} is the low end of the range {span} allowed {where}")
                    add("high", hi, True, f"{_q(hi)} is the high end of the range {span} allowed {where}")
                if _rejected(guide, s, hi + 1):
                    add("above", hi + 1, False, f"{_q(hi + 1)} is just above the range {span} allowed {where}")
    return cases


def _rejected(guide: Guide, state: int, point: int) -> bool:
    """True when ``point`` is in the alphabet and leads from ``state`` to rejection."""
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
    alphabet, cases, done = guide.dfa.alphabet, [], set()
    for s in guide.reachable:
        allowed = guide.allowed(s)
        rejected = alphabet - allowed
        key = (allowed, s in guide.dfa.accepting)
        if not rejected or key in done:
            continue
        done.add(key)
        near = CharSet.of((lo - 1, hi + 1) for lo, hi in allowed.ranges)
        bad = (rejected - near or rejected).min
        prefix, tail = guide.prefix(s), guide.completion(s)
        where = f"at {len(prefix)}"
        if not allowed:
            why = f"{_q(bad)} {where}, after a complete valid string that nothing may follow"
        elif not tail:
            why = (f"{_q(bad)} {where}, after the valid string {prefix!r}, which only "
                   f"{_show_set(allowed)} may follow")
        else:
            why = f"{_q(bad)} leaves the language {where}, where only {_show_set(allowed)} may come"
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
