"""Boolean algebra and questions over DFAs: products, complement, concatenation, lengths.

Every operation here reads ``DFA`` values (``pfuzz.automata.dfa``) and builds new ones
with ``explore`` and ``minimise``, so each result is canonical and minimal.

Constructions, each with its source:

- Boolean operations (``intersection``, ``union``, ``difference``,
  ``symmetric_difference``): the product construction (Rabin & Scott, 1959)
  over the common refinement of the two class partitions; ``complement`` by
  completion and flipping acceptance.
- ``concatenate``: the subset construction over the second automaton's
  states, entered whenever the first accepts; ``with_any_suffix`` is L·alphabet*.
- ``distinguish``: breadth-first search of the product, characters in
  increasing order, which finds the shortlex-least string in the symmetric
  difference; ``shortest`` and ``min_length`` ask it against the empty language.
- ``is_finite``, ``max_length`` and ``longest_completions``: depth-first search
  over the live states reachable from the start; a back edge (a cycle through
  a live state) means an infinite language, otherwise the longest path to
  acceptance from each state is its bound.

Cost: the products are O(states_a × states_b × classes) steps in pure Python
(about a microsecond per table cell) before minimisation; ``distinguish`` visits
each reachable pair at most once; the length questions are O(states × classes).
Limits: operands must share one alphabet (``ArgumentError`` otherwise); products
stop with ``StateLimitError`` past the state cap.
"""

from __future__ import annotations

from collections import deque
from typing import Callable, Iterable, Optional

from pfuzz.base.charset import CharSet, partition
from pfuzz.automata.dfa import DEAD, DEFAULT_STATE_CAP, DFA, empty, explore, universal
from pfuzz.automata.minimise import minimise
from pfuzz.errors import ArgumentError

def _common_classes(a: DFA, b: DFA) -> tuple[list[CharSet], list[int], list[int]]:
    """Refine both partitions; return classes and, per class, a's and b's class index."""
    if a.alphabet != b.alphabet:
        raise ArgumentError("languages over different alphabets cannot be combined")
    classes = partition(list(a.classes) + list(b.classes), a.alphabet)
    return classes, [a.class_of(c.min) for c in classes], [b.class_of(c.min) for c in classes]


def product(a: DFA, b: DFA, accept: Callable[[bool, bool], bool], cap: int = DEFAULT_STATE_CAP) -> DFA:
    """Minimal DFA of {s : accept(s in A, s in B)} (accept(False, False) must be False)."""
    classes, ca, cb = _common_classes(a, b)

    def step(pair, c):
        sa, sb = pair
        na = a.table[sa][ca[c]] if sa >= 0 else DEAD
        nb = b.table[sb][cb[c]] if sb >= 0 else DEAD
        return None if na < 0 and nb < 0 else (na, nb)

    def is_accepting(pair):
        return accept(pair[0] in a.accepting, pair[1] in b.accepting)

    return minimise(explore((0, 0), step, is_accepting, classes, a.alphabet, cap))


def intersection(a: DFA, b: DFA, cap: int = DEFAULT_STATE_CAP) -> DFA:
    return product(a, b, lambda x, y: x and y, cap)


def union(a: DFA, b: DFA, cap: int = DEFAULT_STATE_CAP) -> DFA:
    return product(a, b, lambda x, y: x or y, cap)


def difference(a: DFA, b: DFA, cap: int = DEFAULT_STATE_CAP) -> DFA:
    return product(a, b, lambda x, y: x and not y, cap)


def symmetric_difference(a: DFA, b: DFA, cap: int = DEFAULT_STATE_CAP) -> DFA:
    return product(a, b, lambda x, y: x != y, cap)


def complement(dfa: DFA, cap: int = DEFAULT_STATE_CAP) -> DFA:
    """Minimal DFA of alphabet* minus L."""
    def step(s, c):
        return dfa.table[s][c] if s >= 0 else DEAD

    def is_accepting(s):
        return s not in dfa.accepting

    return minimise(explore(0, step, is_accepting, dfa.classes, dfa.alphabet, cap))


def concatenate(a: DFA, b: DFA, cap: int = DEFAULT_STATE_CAP) -> DFA:
    """Minimal DFA of L(a)·L(b) (subset construction over b's states)."""
    classes, ca, cb = _common_classes(a, b)

    def enter(sa, tails):
        return (sa, tails | {0}) if sa in a.accepting else (sa, tails)

    def step(config, c):
        sa, tails = config
        na = a.table[sa][ca[c]] if sa >= 0 else DEAD
        nt = frozenset(t for t in (b.table[s][cb[c]] for s in tails) if t >= 0)
        if na < 0 and not nt:
            return None
        return enter(na, nt)

    def is_accepting(config):
        return any(t in b.accepting for t in config[1])

    start = enter(0, frozenset())
    return minimise(explore(start, step, is_accepting, classes, a.alphabet, cap))


def with_any_suffix(dfa: DFA, cap: int = DEFAULT_STATE_CAP) -> DFA:
    """Minimal DFA of L·alphabet* (strings with a prefix in L)."""
    return concatenate(dfa, universal(dfa.alphabet), cap)


# -- questions ---------------------------------------------------------------------

def distinguish(a: DFA, b: DFA) -> Optional[str]:
    """Shortlex-least string accepted by exactly one of a and b, or None if equal."""
    classes, ca, cb = _common_classes(a, b)
    order = sorted(range(len(classes)), key=lambda c: classes[c].min)
    start = (0, 0)
    parent: dict[tuple[int, int], tuple] = {start: None}
    queue = deque([start])
    while queue:
        pair = queue.popleft()
        sa, sb = pair
        if (sa in a.accepting) != (sb in b.accepting):
            return _path(parent, pair)
        for c in order:
            na = a.table[sa][ca[c]] if sa >= 0 else DEAD
            nb = b.table[sb][cb[c]] if sb >= 0 else DEAD
            nxt = (na, nb)
            if nxt == (DEAD, DEAD) or nxt in parent:
                continue
            parent[nxt] = (pair, chr(classes[c].min))
            queue.append(nxt)
    return None


def _path(parent: dict, node) -> str:
    chars = []
    while parent[node] is not None:
        node, ch = parent[node]
        chars.append(ch)
    return "".join(reversed(chars))


def shortest(dfa: DFA) -> Optional[str]:
    """The shortlex-least accepted string, or None for the empty language."""
    return distinguish(dfa, empty(dfa.alphabet))


def min_length(dfa: DFA) -> Optional[int]:
    word = shortest(dfa)
    return None if word is None else len(word)


def is_finite(dfa: DFA) -> bool:
    """True when no cycle passes through a live state reachable from the start."""
    return longest_completions(dfa) is not None


def max_length(dfa: DFA) -> Optional[int]:
    """Length of the longest accepted string; None if unbounded or empty."""
    best = longest_completions(dfa)
    return None if best is None or best[0] < 0 else best[0]


def longest_completions(dfa: DFA) -> Optional[list[int]]:
    """Per state, the longest length from it to acceptance, or None when the language is infinite.

    States the search from the start does not reach (and every state of the
    empty language) get -1.
    """
    live = dfa.live_states()
    best = [-1] * dfa.n_states
    if 0 not in live:
        return best
    WHITE, GREY, BLACK = 0, 1, 2
    colour = [WHITE] * dfa.n_states
    stack = [(0, iter(dfa.table[0]))]
    colour[0] = GREY
    while stack:
        s, it = stack[-1]
        advanced = False
        for t in it:
            if t < 0 or t not in live:
                continue
            if colour[t] == GREY:
                return None
            if colour[t] == WHITE:
                colour[t] = GREY
                stack.append((t, iter(dfa.table[t])))
                advanced = True
                break
        if advanced:
            continue
        stack.pop()
        colour[s] = BLACK
        here = 0 if s in dfa.accepting else -1
        for t in dfa.table[s]:
            if t >= 0 and t in live and best[t] >= 0:
                here = max(here, best[t] + 1)
        best[s] = here
    return best


def from_strings(strings: Iterable[str], alphabet: CharSet) -> DFA:
    """The minimal DFA of a finite set of strings (those inside the alphabet)."""
    words = [w for w in strings if all(ch in alphabet for ch in w)]
    chars = {ord(ch) for w in words for ch in w}
    classes = partition([CharSet.single(p) for p in chars], alphabet)
    probe = [c.min for c in classes]

    def step(prefix, c):
        nxt = prefix + chr(probe[c])
        return nxt if any(w.startswith(nxt) for w in words) else None

    return minimise(explore("", step, lambda p: p in words, classes, alphabet))
