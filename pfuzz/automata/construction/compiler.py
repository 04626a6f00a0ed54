"""The pattern compiler: pattern text to the minimal DFA of what ``re.fullmatch`` accepts.

Pipeline: ``pfuzz.syntax.parser.parse`` gives a tree; every ``Chars`` node is resolved
to a ``CharSet`` inside the alphabet (``pfuzz.syntax.casefold.resolve``); all those
sets (and ``'\\n'``) are partitioned into disjoint classes
(``pfuzz.base.charset.partition``); Thompson's construction (``pfuzz.automata.nfa``) gives an
ε-NFA over class indexes; the subset construction of Rabin & Scott (1959), run
by ``pfuzz.automata.dfa.explore`` over the configurations below, gives a DFA, and
``pfuzz.automata.minimise.minimise`` (partition refinement) the canonical minimal one.

Assertions are exact, wherever they stand. A DFA configuration is a set of
*threads*; a thread is an NFA state plus a set of *obligations* on the
rest of the string, each a (constraint, state) pair of a small DFA that
reads every later character and must accept at the end of the input (the
determiniser, ``pfuzz.automata.construction.determinise``, groups threads by obligation set):

- ``^`` / ``\\A`` and ``(?m)^`` look back one character. The context of a
  position (start of text, just after ``'\\n'``, other) is fixed by the last
  class read, so ε-closures are computed per (state, context) and their
  assertion edges taken only where allowed; the context itself need not be
  stored in the configuration.
- ``\\Z`` (rest is empty), ``$`` (rest is "" or "\\n") and ``(?m)$`` (rest is ""
  or starts with "\\n") become obligations on two-state DFAs.
- ``(?=X)`` from a position requires the rest to lie in P(X), the strings with
  a prefix that X matches *with assertions judged against the whole rest*
  (so ``(?=a$)`` is {"a", "a\\n"}, not a·U*). P(X) is compiled recursively,
  as the NFA of X whose final state loops on every class, starting from the
  context of the position (one DFA per context used, so ``^`` inside a
  lookahead is exact too). ``(?!X)`` uses the complement of P(X).

An obligation whose state is universal is dropped and a dead one kills its
thread; a thread is dropped when another thread at the same NFA state carries
a subset of its obligations. Constraint DFAs are interned by value, so equal
lookaheads share one. This gives exactly L(Y) ∩ P(X) for ``(?=X)Y`` at the
start, and the password idiom ``^(?=.*\\d)(?=.{8,64}$).*$`` costs about the
product of its lookaheads' automata, as the minimal DFA must.

``mode="match"`` / ``"search"`` compile what ``re.match`` / ``re.search``
accept, as full matches of P(?s:.*) and (?s:.*)P(?s:.*) (see ``in_mode``).

Cost: linear in the number of DFA configurations times the classes times the
threads per configuration; bounded repeats are expanded with nested optionals
(see ``pfuzz.automata.nfa``) so ``[a-z0-9]{1,256}`` has two threads per configuration.
Measured in pure Python (``python -m pfuzz.benchmarks compile``): about 12 µs per
state of the minimal DFA for ``(a|b)*a(a|b){16}`` (131,072 states in about
1.6 s), about 20 µs per state for products of lookaheads (a four-lookahead
password rule: 976 states in about 20 ms, of which 8 ms subset construction
and 6 ms minimisation), and about 28 µs per state for the hostname rule
under ``(?=.{1,253}$)`` (23,997 states in about 0.68 s, three quarters of
it in minimisation: Moore's rounds run out on the 253-step length counter
and Hopcroft's algorithm, in pure Python, takes over). Limits: every construction stops at ``cap`` states with
``StateLimitError``, and the expanded NFA at ``NFA_STATES_PER_CAP × cap``
states before it is built; no assertion is refused, lookaheads nested in
lookaheads included.
"""

from __future__ import annotations

from typing import Callable

from pfuzz.automata import dfa as automata
from pfuzz.automata.minimise import minimise
from pfuzz.automata.algebra import complement
from pfuzz.base.charset import ALL, CharSet, partition
from pfuzz.automata.dfa import DEAD, DEFAULT_STATE_CAP, DFA
from pfuzz.base.constants import CALL_MODES
from pfuzz.errors import ArgumentError
from pfuzz.automata.construction.determinise import (BLOCKED, NEWLINE, NO_OBLIGATIONS, OTHER, START, Determiniser,
                          Obligations)
from pfuzz.automata.nfa import build
from pfuzz.syntax.tree import Alternation, Anchor, Chars, Lookahead, Node, Repeat, Sequence

#: The NFA may have at most this many states per allowed DFA state.
NFA_STATES_PER_CAP = 4

Resolver = Callable[[Chars, CharSet], CharSet]


#: How a pattern is applied to a string, as the methods of a compiled ``re`` pattern.


def compile_dfa(pattern: str, alphabet: CharSet, flags: int = 0,
                cap: int = DEFAULT_STATE_CAP, mode: str = "fullmatch") -> DFA:
    """The canonical minimal DFA of the strings over ``alphabet`` that
    ``re.fullmatch(pattern, s, flags)`` accepts (or ``re.match`` / ``re.search``
    with ``mode``)."""
    from pfuzz.syntax.parser import parse

    return compile_tree(in_mode(parse(pattern, flags), mode), alphabet, cap=cap)


def in_mode(tree: Node, mode: str) -> Node:
    """The tree whose full matches are the strings ``mode`` accepts.

    ``re.match`` accepts s when a prefix of s matches with assertions judged
    against all of s, which is a full match of P·(?s:.*); ``re.search`` is a
    full match of (?s:.*)·P·(?s:.*). Concatenating languages instead (L·U*)
    would be wrong for ``$``: ``re.match(r"\\d+$", s)`` accepts "12\\n" but not "12x".
    """
    anything = Repeat(Chars(ALL), 0, None)
    if mode == "fullmatch":
        return tree
    if mode == "match":
        return Sequence((tree, anything))
    if mode == "search":
        return Sequence((anything, tree, anything))
    raise ArgumentError(f"unknown match mode {mode!r}: use one of {', '.join(CALL_MODES)}")


def compile_tree(tree: Node, alphabet: CharSet, cap: int = DEFAULT_STATE_CAP,
                 resolve: Resolver | None = None) -> DFA:
    """The minimal DFA of a syntax tree under full-match semantics over ``alphabet``."""
    if resolve is None:
        from pfuzz.syntax.casefold import resolve
    sets = {node: resolve(node, alphabet) & alphabet for node in _chars_nodes(tree)}
    newline = CharSet.single("\n") & alphabet
    classes = partition([*sets.values(), newline], alphabet)
    return _Shared(classes, alphabet, cap, sets).compile(tree, START, any_suffix=False)


# -- tree walks -----------------------------------------------------------------------

def _children(node: Node) -> tuple:
    if isinstance(node, Sequence):
        return node.items
    if isinstance(node, Alternation):
        return node.options
    if isinstance(node, (Repeat, Lookahead)):
        return (node.item,)
    return ()


def _walk(node: Node):
    stack = [node]
    while stack:
        current = stack.pop()
        yield current
        stack.extend(_children(current))


def _chars_nodes(tree: Node) -> set[Chars]:
    return {n for n in _walk(tree) if isinstance(n, Chars)}


def _context_map(tree: Node) -> tuple[int, int, int]:
    """Contexts that the tree's start anchors can tell apart (others collapse to OTHER)."""
    kinds = {n.kind for n in _walk(tree) if isinstance(n, Anchor)}
    if "line_start" in kinds:
        return (START, NEWLINE, OTHER)
    if "text_start" in kinds:
        return (START, OTHER, OTHER)
    return (OTHER, OTHER, OTHER)


# -- shared state of one compilation: classes, constraint automata ---------------------

class _Shared(Obligations):
    """Classes, labels, assertions and the interned constraint DFAs of one compilation."""

    def __init__(self, classes: list[CharSet], alphabet: CharSet, cap: int,
                 sets: dict[Chars, CharSet]):
        super().__init__(classes)
        self.alphabet = alphabet
        self.cap = cap
        self.labels = {node: frozenset(c for c, cls in enumerate(classes) if cls.min in chars)
                       for node, chars in sets.items()}
        self.newline_class = next((c for c, cls in enumerate(classes) if "\n" in cls), DEAD)
        self.assertions: dict = {}

    def compile(self, tree: Node, context: int, any_suffix: bool) -> DFA:
        nfa = build(tree, self.labels.__getitem__, n_classes=len(self.classes),
                    any_suffix=any_suffix, limit=NFA_STATES_PER_CAP * self.cap)
        runner = Determiniser(self, nfa, _context_map(tree))
        raw = automata.explore(runner.start(context), runner.step, runner.is_accepting,
                               self.classes, self.alphabet, self.cap)
        return minimise(raw)

    def assertion(self, node: Anchor | Lookahead, context: int):
        """What taking an assertion edge in ``context`` adds (see ``obligation``)."""
        key = (node, context)
        if key not in self.assertions:
            self.assertions[key] = self._assertion(node, context)
        return self.assertions[key]

    def _assertion(self, node: Anchor | Lookahead, context: int):
        if isinstance(node, Lookahead):
            body = self.compile(node.item, context, any_suffix=True)
            return self.obligation(self.intern(complement(body) if node.negative else body))
        if node.kind == "text_start":
            return NO_OBLIGATIONS if context == START else BLOCKED
        if node.kind == "line_start":
            return NO_OBLIGATIONS if context in (START, NEWLINE) else BLOCKED
        return self.obligation(self.intern(self._end_dfa(node.kind)))

    def _end_dfa(self, kind: str) -> DFA:
        """The rest-of-string language of \\Z ({""}), $ ({"", "\\n"}) or (?m)$ ("" or "\\n"…)."""
        k, nl = len(self.classes), self.newline_class
        rows = [[DEAD] * k]
        if kind != "text_end" and nl != DEAD:
            rows[0][nl] = 1
            rows.append([1 if kind == "line_end" else DEAD] * k)
        table = tuple(tuple(row) for row in rows)
        raw = DFA(self.alphabet, tuple(self.classes), table, frozenset(range(len(rows))))
        return minimise(raw)
