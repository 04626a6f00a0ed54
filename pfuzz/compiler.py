"""The pattern compiler: pattern text to the minimal DFA of what ``re.fullmatch`` accepts.

Pipeline: ``pfuzz.syntax.parse`` gives a tree; every ``Chars`` node is resolved
to a ``CharSet`` inside the universe (``pfuzz.casefold.resolve``); all those
sets (and ``'\\n'``) are partitioned into disjoint classes
(``pfuzz.charset.partition``); Thompson's construction (``pfuzz.nfa``) gives an
ε-NFA over class indexes; the subset construction of Rabin & Scott (1959), run
by ``pfuzz.dfa.explore`` over the configurations below, gives a DFA, and
``pfuzz.dfa.minimise`` (partition refinement) the canonical minimal one.

Assertions are exact, wherever they stand. A DFA configuration is a set of
*threads*; a thread is an NFA state plus a set of *obligations* on the
rest of the string (sets are interned as integers), each a (constraint, state) pair of a small DFA that reads
every later character and must accept at the end of the input:

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
(see ``pfuzz.nfa``) so ``[a-z0-9]{1,256}`` has two threads per configuration.
Measured in pure Python: about 10 µs per state of the minimal DFA for
``(a|b)*a(a|b){16}`` (131,072 states in about 1.5 s), about 30 µs per state
for products of lookaheads (a four-lookahead password rule: 976 states in
about 30 ms). Limits: every construction stops at ``cap`` states with
``StateLimitError``, and the expanded NFA at ``NFA_STATES_PER_CAP × cap``
states before it is built; no assertion is refused, lookaheads nested in
lookaheads included.
"""

from __future__ import annotations

from typing import Callable

from . import dfa as automata
from .algebra import complement
from .charset import ALL, CharSet, partition
from .dfa import DEAD, DEFAULT_STATE_CAP, DFA
from .nfa import ASSERT, CHAR, NFA, build
from .tree import Alternation, Anchor, Chars, Lookahead, Node, Repeat, Sequence

#: Contexts of a position: what precedes it.
START, NEWLINE, OTHER = 0, 1, 2

#: The NFA may have at most this many states per allowed DFA state.
NFA_STATES_PER_CAP = 4

#: Obligation sets are interned; id 0 is the empty set, None means "blocked".
_NO_OBLIGATIONS = 0
_BLOCKED = None
_NO_THREADS: frozenset = frozenset()

Resolver = Callable[[Chars, CharSet], CharSet]


#: How a pattern is applied to a string, as the methods of a compiled ``re`` pattern.
MODES = ("fullmatch", "match", "search")


def compile_dfa(pattern: str, universe: CharSet, flags: int = 0,
                cap: int = DEFAULT_STATE_CAP, mode: str = "fullmatch") -> DFA:
    """The canonical minimal DFA of the strings over ``universe`` that
    ``re.fullmatch(pattern, s, flags)`` accepts (or ``re.match`` / ``re.search``
    with ``mode``)."""
    from .syntax import parse

    return compile_tree(in_mode(parse(pattern, flags), mode), universe, cap=cap)


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
    raise ValueError(f"unknown match mode {mode!r}: use one of {', '.join(MODES)}")


def compile_tree(tree: Node, universe: CharSet, cap: int = DEFAULT_STATE_CAP,
                 resolve: Resolver | None = None) -> DFA:
    """The minimal DFA of a syntax tree under full-match semantics over ``universe``."""
    if resolve is None:
        from .casefold import resolve
    sets = {node: resolve(node, universe) & universe for node in _chars_nodes(tree)}
    newline = CharSet.single("\n") & universe
    classes = partition([*sets.values(), newline], universe)
    return _Shared(classes, universe, cap, sets).compile(tree, START, any_suffix=False)


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

class _Shared:
    """Classes, labels and the interned constraint DFAs of one compilation."""

    def __init__(self, classes: list[CharSet], universe: CharSet, cap: int,
                 sets: dict[Chars, CharSet]):
        self.classes = classes
        self.universe = universe
        self.cap = cap
        self.labels = {node: frozenset(c for c, cls in enumerate(classes) if cls.min in chars)
                       for node, chars in sets.items()}
        self.newline_class = next((c for c, cls in enumerate(classes) if "\n" in cls), DEAD)
        self.constraints: list[DFA] = []
        self.columns: list[tuple[int, ...]] = []
        self.universal: list[int] = []
        self.interned: dict[DFA, int] = {}
        self.assertions: dict = {}
        self.sets: list[frozenset] = [frozenset()]
        self.set_ids: dict[frozenset, int] = {frozenset(): _NO_OBLIGATIONS}
        self.advanced: dict[tuple[int, int], int | None] = {}
        self.unions: dict[tuple[int, int], int] = {}

    def compile(self, tree: Node, context: int, any_suffix: bool) -> DFA:
        nfa = build(tree, self.labels.__getitem__, n_classes=len(self.classes),
                    any_suffix=any_suffix, limit=NFA_STATES_PER_CAP * self.cap)
        runner = _Determiniser(self, nfa, _context_map(tree))
        raw = automata.explore(runner.start(context), runner.step, runner.is_accepting,
                               self.classes, self.universe, self.cap)
        return automata.minimise(raw)

    # -- constraints ------------------------------------------------------------------
    def intern(self, dfa: DFA) -> int:
        cid = self.interned.get(dfa)
        if cid is None:
            cid = len(self.constraints)
            self.interned[dfa] = cid
            self.constraints.append(dfa)
            self.columns.append(tuple(dfa.class_of(cls.min) for cls in self.classes))
            self.universal.append(_universal_state(dfa))
        return cid

    def obligation(self, cid: int):
        """The obligation set a new constraint adds: none (universal), _BLOCKED, or one pair."""
        if self.universal[cid] == 0:
            return _NO_OBLIGATIONS
        if self.constraints[cid].is_empty():
            return _BLOCKED
        return self.set_id(frozenset({(cid, 0)}))

    def set_id(self, pairs: frozenset) -> int:
        """The interned id of a set of (constraint, state) pairs."""
        oid = self.set_ids.get(pairs)
        if oid is None:
            oid = self.set_ids[pairs] = len(self.sets)
            self.sets.append(pairs)
        return oid

    def union(self, a: int, b: int) -> int:
        if not a or not b or a == b:
            return a or b
        key = (a, b) if a < b else (b, a)
        oid = self.unions.get(key)
        if oid is None:
            oid = self.unions[key] = self.set_id(self.sets[a] | self.sets[b])
        return oid

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
            return _NO_OBLIGATIONS if context == START else _BLOCKED
        if node.kind == "line_start":
            return _NO_OBLIGATIONS if context in (START, NEWLINE) else _BLOCKED
        return self.obligation(self.intern(self._end_dfa(node.kind)))

    def _end_dfa(self, kind: str) -> DFA:
        """The rest-of-string language of \\Z ({""}), $ ({"", "\\n"}) or (?m)$ ("" or "\\n"…)."""
        k, nl = len(self.classes), self.newline_class
        rows = [[DEAD] * k]
        if kind != "text_end" and nl != DEAD:
            rows[0][nl] = 1
            rows.append([1 if kind == "line_end" else DEAD] * k)
        table = tuple(tuple(row) for row in rows)
        raw = DFA(self.universe, tuple(self.classes), table, frozenset(range(len(rows))))
        return automata.minimise(raw)

    def advance(self, oid: int, c: int):
        """The obligation set after reading class ``c``, or _BLOCKED when one of them dies."""
        key = (oid, c)
        if key in self.advanced:
            return self.advanced[key]
        kept = []
        for cid, state in self.sets[oid]:
            nxt = self.constraints[cid].table[state][self.columns[cid][c]]
            if nxt == DEAD:
                kept = _BLOCKED
                break
            if nxt != self.universal[cid]:
                kept.append((cid, nxt))
        result = _BLOCKED if kept is _BLOCKED else self.set_id(frozenset(kept))
        self.advanced[key] = result
        return result

    def satisfied(self, oid: int) -> bool:
        """Whether every obligation of the set accepts the end of the input."""
        return all(state in self.constraints[cid].accepting for cid, state in self.sets[oid])

    def prune(self, plain: frozenset, threads) -> frozenset:
        """Drop threads subsumed by a thread at the same state with fewer obligations."""
        states = {s for s, _ in threads}
        if len(states) == len(threads) and states.isdisjoint(plain):
            return frozenset(threads)
        by_state: dict[int, list[int]] = {}
        for s, oid in threads:
            if s not in plain:
                by_state.setdefault(s, []).append(oid)
        sets = self.sets
        return frozenset((s, oid) for s, oids in by_state.items() for oid in oids
                         if len(oids) == 1 or not any(sets[o] < sets[oid] for o in oids))


def _universal_state(dfa: DFA) -> int:
    """The state of a minimal DFA whose language is U*, or DEAD when there is none."""
    for state, row in enumerate(dfa.table):
        if state in dfa.accepting and all(t == state for t in row):
            return state
    return DEAD


# -- the determiniser: configurations and their steps -----------------------------------

class _Determiniser:
    """Subset construction over configurations (plain states, obligated threads)."""

    def __init__(self, shared: _Shared, nfa: NFA, contexts: tuple[int, int, int]):
        self.shared = shared
        self.nfa = nfa
        self.contexts = contexts
        self.closures: dict[tuple[int, int], tuple[frozenset, frozenset]] = {}
        self.sink = (frozenset({nfa.final}), _NO_THREADS) if nfa.kinds[nfa.final] == CHAR else None
        n_classes = len(shared.classes)
        after = [contexts[NEWLINE] if c == shared.newline_class else OTHER for c in range(n_classes)]
        # Per class: the plain states and the obligated threads each mover reaches.
        self.plain_moves: list[dict[int, frozenset]] = [{} for _ in range(n_classes)]
        self.obligated_moves: list[dict[int, frozenset]] = [{} for _ in range(n_classes)]
        for s, kind in enumerate(nfa.kinds):
            if kind == CHAR:
                (target,) = nfa.targets[s]
                for c in nfa.labels[s]:
                    plain, obligated = self.closure(target, after[c])
                    self.plain_moves[c][s] = plain
                    if obligated:
                        self.obligated_moves[c][s] = obligated

    def start(self, context: int):
        return self.closure(self.nfa.start, self.contexts[context])

    def closure(self, state: int, context: int) -> tuple[frozenset, frozenset]:
        """Threads reachable by ε and assertion edges: (plain states, obligated threads)."""
        key = (state, context)
        if key not in self.closures:
            self.closures[key] = self._closure(state, context)
        return self.closures[key]

    def _closure(self, state: int, context: int) -> tuple[frozenset, frozenset]:
        kinds, labels, targets, final = (self.nfa.kinds, self.nfa.labels, self.nfa.targets,
                                         self.nfa.final)
        plain, obligated = set(), set()
        seen = set()
        stack = [(state, _NO_OBLIGATIONS)]
        while stack:
            thread = stack.pop()
            if thread in seen:
                continue
            seen.add(thread)
            s, obligations = thread
            if kinds[s] == CHAR or s == final:
                (obligated.add(thread) if obligations else plain.add(s))
                continue
            if kinds[s] == ASSERT:
                extra = self.shared.assertion(labels[s], context)
                if extra is _BLOCKED:
                    continue
                obligations = self.shared.union(obligations, extra)
            stack.extend((t, obligations) for t in targets[s])
        return frozenset(plain), self.shared.prune(plain, obligated)

    def step(self, config, c: int):
        plain, obligated = config
        plain_moves, obligated_moves = self.plain_moves[c], self.obligated_moves[c]
        new_plain = frozenset().union(*filter(None, map(plain_moves.get, plain)))
        if not obligated and not obligated_moves:
            if self.sink is not None and self.nfa.final in new_plain:
                return self.sink
            return (new_plain, _NO_THREADS) if new_plain else None
        threads = set().union(*filter(None, map(obligated_moves.get, plain)))
        for s, obligations in obligated:
            if s not in plain_moves:
                continue
            carried = self.shared.advance(obligations, c)
            if carried is _BLOCKED:
                continue
            more = obligated_moves.get(s, ())
            if not carried:
                new_plain = new_plain | plain_moves[s]
                threads.update(more)
                continue
            threads.update((u, carried) for u in plain_moves[s])
            union = self.shared.union
            threads.update((u, union(carried, extra)) for u, extra in more)
        if self.sink is not None and self.nfa.final in new_plain:
            return self.sink
        if not new_plain and not threads:
            return None
        return new_plain, (self.shared.prune(new_plain, threads) if threads else _NO_THREADS)

    def is_accepting(self, config) -> bool:
        plain, obligated = config
        final = self.nfa.final
        return final in plain or any(s == final and self.shared.satisfied(obligations)
                                     for s, obligations in obligated)
