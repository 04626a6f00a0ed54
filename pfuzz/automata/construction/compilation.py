"""One compilation: classes, NFAs, registers, look-backs, and the judge of assertions.

``Compilation`` is the ``Judge`` of ``protocol``: the determiniser asks it what each
assertion adds in a look-back state, and it answers by compiling what the assertion
needs, recursively and memoised:

- ``^ \\A (?m)^`` from the context; ``\\Z``, ``$``, ``(?m)$`` as obligations on
  two-state DFAs; ``\\b`` and ``\\B`` as the context (previous character a word
  character or not) and an obligation on the next character, with ``re``'s rule
  that neither matches in the empty string;
- ``(?=X)`` from a position requires the rest to lie in P(X), the strings with a
  prefix that X matches with assertions judged against the whole rest (so
  ``(?=a$)`` is {"a", "a\\n"}, not a·U*): the DFA of X with a final state that
  loops on every class, compiled from the look-back state of the position;
  ``(?!X)`` its complement;
- ``(?<=X)`` and ``(?<!X)`` from the tracker of ``lookback``;
- the Priority assertion of an atomic scope as the complement of "one of the
  earlier choices reaches the end of the scope", compiled like a lookahead;
- a lookaround whose body reads or sets captured groups is compiled per memory
  (``registers``): a positive one that captures splits the thread by what it
  captured, each way with the obligation that the body's first match (``re``
  commits to it) captures exactly that.

Constraint DFAs are interned by value, so equal assertions share one.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass
from typing import Hashable

from pfuzz.automata.algebra import complement
from pfuzz.automata.construction import bitsets
from pfuzz.automata.construction.determinise import Determiniser
from pfuzz.automata.construction.lookback import (AFTER_ASCII_WORD, AFTER_NEWLINE, AFTER_WORD, AT_START,
                                                  LookBack, Tracker, scan)
from pfuzz.automata.construction.obligations import BLOCKED, NO_OBLIGATIONS, Obligations
from pfuzz.automata.construction.liveness import live_groups
from pfuzz.automata.construction.registers import UNSET, UNTOUCHED, PriorityCheck, Registers, expand
from pfuzz.automata.dfa import DEAD, DFA, explore
from pfuzz.automata.minimise import minimise
from pfuzz.automata.nfa import FINAL, NFA, build
from pfuzz.base.charset import ALL, CharSet
from pfuzz.errors import StateLimitError
from pfuzz.syntax.tree import (Anchor, Atomic, Backreference, Boundary, Chars, Conditional, Group,
                               Lookahead, Lookbehind, Node, Repeat, Sequence, walk)

#: The NFA may have at most this many states per allowed DFA state.
NFA_STATES_PER_CAP = 4
#: ε-closure steps and configuration sizes allowed per allowed DFA state (the work budget).
CLOSURE_STEPS_PER_CAP = 16
#: Most memories a lookbehind that reads captured groups is tracked under.
MAX_LOOKBEHIND_MEMORIES = 4096

ANYTHING = Repeat(Chars(ALL), 0, None)
_MISSING = object()


class _OverBudget(StateLimitError):
    """The work budget ran out (the state cap did not)."""


def _always(memory: int) -> bool:
    return True


@dataclass(frozen=True)
class Check:
    """Assertion label: lookaround ``node`` judged with its body starting from memory
    ``given``; ``outcome`` (when not None) is what its first match must capture."""

    node: Node
    given: int
    outcome: tuple | None


@dataclass(frozen=True)
class Facts:
    """What a compilation needs to know about its tree, found before anything is built."""

    groups: dict
    widths: dict
    tracked: frozenset
    valued: frozenset


class Compilation:
    """Classes, labels, NFAs, look-backs and verdicts of one compilation."""

    def __init__(self, classes: list[CharSet], alphabet: CharSet, cap: int, sets: dict,
                 facts: Facts, registers: Registers, words: dict[bool, CharSet]):
        self.obligations = Obligations(classes)
        self.classes, self.alphabet, self.cap = classes, alphabet, cap
        self.labels = {node: frozenset(c for c, cls in enumerate(classes) if cls.min in chars)
                       for node, chars in sets.items()}
        self.newline_class = next((c for c, cls in enumerate(classes) if "\n" in cls), DEAD)
        self.facts, self.registers = facts, registers
        self.features = [(c == self.newline_class, cls.min in words[False], cls.min in words[True])
                         for c, cls in enumerate(classes)]
        self.words = words
        self.limit = NFA_STATES_PER_CAP * cap
        self.budget, self.spent = CLOSURE_STEPS_PER_CAP * cap, 0
        self.loops = [0]
        self.nfas: dict[tuple, NFA] = {}
        self.lookbacks: dict[Node, LookBack] = {}
        self.tracker_nfas: dict[tuple, NFA] = {}
        self.verdicts: dict[tuple, object] = {}
        self.liveness: dict[tuple, list] = {}

    # -- building and determinising ------------------------------------------------------
    def label_of(self, node: Chars) -> frozenset[int]:
        hit = self.labels.get(node)
        if hit is None:
            chars = node.chars & self.alphabet
            hit = self.labels[node] = frozenset(c for c, cls in enumerate(self.classes) if cls.min in chars)
        return hit

    def nfa(self, tree: Node, scoped: bool = False, any_suffix: bool = False) -> NFA:
        key = (tree, scoped, any_suffix)
        hit = self.nfas.get(key)
        if hit is None:
            hit = self.nfas[key] = build(
                tree, self.label_of, n_classes=len(self.classes), any_suffix=any_suffix, limit=self.limit,
                tracked=self.facts.tracked, widths=self.facts.widths, scoped=scoped, loops=self.loops)
        return hit

    def expand(self, nfa: NFA, starts: list, stop: int, accept, any_suffix: bool,
               recording: bool = False, ignored: int | None = None, reads: frozenset = frozenset()) -> NFA:
        """The plain NFA of ``nfa`` with registers; ``reads`` are the groups ``accept`` reads."""
        return expand(nfa, self.registers, starts, stop, accept, self.lookaround_edges,
                      n_classes=len(self.classes), limit=self.limit, any_suffix=any_suffix,
                      recording=recording, ignored=ignored, live=self.live(nfa, reads))

    def live(self, nfa: NFA, reads: frozenset) -> list[frozenset]:
        key = (id(nfa), reads)
        if key not in self.liveness:
            self.liveness[key] = live_groups(nfa, self.registers.layout, _label_reads, reads)
        return self.liveness[key]

    def compile(self, tree: Node, lookback: LookBack, back: int, any_suffix: bool,
                memory: int | None = None, accept=None, scoped: bool = False,
                reads: frozenset = frozenset()) -> DFA:
        """The minimal DFA of full matches of ``tree`` (then anything, with ``any_suffix``)
        from look-back state ``back`` and register memory ``memory``."""
        program = self.nfa(tree, scoped)
        if program.registers or memory is not None:
            nfa = self.expand(program, [(program.start, memory or 0)], program.final,
                              accept or _always, any_suffix, reads=reads)
        else:
            nfa = self.nfa(tree, scoped, any_suffix) if any_suffix else program
        return self.determinise(nfa, lookback, back)

    def determinise(self, nfa: NFA, lookback: LookBack, back: int) -> DFA:
        """The minimal DFA of ``nfa``: bit-parallel where it has no assertions and the bits
        are cheaper (``bitsets``), or where the set-based construction runs out of budget."""
        runner = Determiniser(self, nfa, lookback)
        plain = bitsets.applies(nfa)
        found = plain and bitsets.explore_bits(runner, self.classes, self.alphabet, self.cap, back)
        if found:
            return minimise(found)
        spent = self.spent
        try:
            start = runner.start(back) or runner.dead
            return minimise(explore(start, runner.step, runner.is_accepting, self.classes, self.alphabet,
                                    self.cap))
        except _OverBudget:
            if not plain:
                raise
            self.spent = spent  # the budget again, for the other way
            found = bitsets.explore_bits(Determiniser(self, nfa, lookback), self.classes, self.alphabet,
                                         self.cap, back, first=False)
            if not found:
                raise
        return minimise(found)

    def charge(self, steps: int) -> None:
        self.spent += steps
        if self.spent > self.budget:
            raise _OverBudget(
                f"building the automaton took more than {self.budget:,} steps of subset construction, "
                f"the work budget ({CLOSURE_STEPS_PER_CAP} per state of the state cap): nested optional "
                "repeats such as (?:a?b?){1000}, or a search for a long counted repeat, make every "
                "state hold many NFA states; simplify the pattern or raise the cap")

    # -- look-back ------------------------------------------------------------------------
    def lookback_for(self, tree: Node) -> LookBack:
        """The look-back that ``tree``'s assertions need (lookbehind bodies have their own)."""
        hit = self.lookbacks.get(tree)
        if hit is None:
            needs, behinds = scan(tree)
            trackers = {(node, given): self.tracker(node, given)
                        for node in behinds for given in self.givens(node)}
            hit = self.lookbacks[tree] = LookBack(needs, self.features, trackers)
        return hit

    def tracker(self, node: Lookbehind, given: int | None) -> Tracker:
        nfa, tree = self.tracker_nfa(node, given)
        own = self.lookback_for(tree)
        return Tracker(Determiniser(self, nfa, own, recording=True), own.start)

    def tracker_nfa(self, node: Lookbehind, given: int | None) -> tuple[NFA, Node]:
        """The NFA of (?s:.*)·X whose final states say what X captured, and its tree."""
        key = (node, given)
        if key not in self.tracker_nfas:
            inner = _inner_groups(node)
            keep = not node.negative and bool(inner)
            tree = Sequence((ANYTHING, Atomic(node.item, node.position) if keep else node.item))
            program = self.nfa(tree)
            nfa = program
            if program.registers or given is not None:
                accept = (lambda m: self.registers.outcome(m, inner)) if keep else _always
                nfa = self.expand(program, [(program.start, given or 0)], program.final, accept,
                                  False, recording=True, reads=frozenset(inner))
            self.tracker_nfas[key] = (nfa, tree)
        return self.tracker_nfas[key]

    def givens(self, node: Lookbehind) -> list:
        """The memories lookbehind ``node`` may be judged under (None when it reads none)."""
        if not _touches(node):
            return [None]
        referenced = sorted(_referenced(node) - set(_inner_groups(node)))
        choices = [self.candidates(group) for group in referenced]
        total = 1
        for choice in choices:
            total *= len(choice)
        if total > MAX_LOOKBEHIND_MEMORIES:
            raise StateLimitError(
                f"the lookbehind at position {node.position} refers to groups that can capture "
                f"{total:,} different combinations of text; pfuzz tracks at most "
                f"{MAX_LOOKBEHIND_MEMORIES:,} (use a smaller alphabet)")
        untouched = {group: UNTOUCHED for group in _inner_groups(node)}
        return [self.registers.with_groups({**dict(zip(referenced, combo)), **untouched})
                for combo in itertools.product(*choices)]

    def candidates(self, group: int) -> list[tuple]:
        """The registers group ``group`` may hold where a lookbehind reads it."""
        if group not in self.facts.valued:
            return [UNSET, (True, None, False)]
        low, high = self.facts.widths[group]
        alphabet = sorted(self.capture_classes(group))
        if sum(len(alphabet) ** n for n in range(low, high + 1)) > MAX_LOOKBEHIND_MEMORIES:
            raise StateLimitError(
                f"a lookbehind refers to group {group}, which can capture more than "
                f"{MAX_LOOKBEHIND_MEMORIES:,} different texts; use a smaller alphabet")
        return [UNSET] + [(value, None, False) for n in range(low, high + 1)
                          for value in itertools.product(alphabet, repeat=n)]

    def capture_classes(self, group: int) -> set[int]:
        """Every class group ``group`` may capture (over-approximated)."""
        found: set[int] = set()
        for node in walk(self.facts.groups[group].item):
            if isinstance(node, Chars):
                found |= self.label_of(node)
            elif isinstance(node, Backreference):
                for c in self.capture_classes(node.index):
                    found |= self.registers.matches(c, node.flags)
        return found

    def projection(self, node: Lookbehind, memory: int) -> int:
        registers = self.registers
        found = {group: (registers.values[memory][0][registers.slot[group]][0], None, False)
                 for group in _referenced(node) - set(_inner_groups(node))}
        found.update({group: UNTOUCHED for group in _inner_groups(node)})
        return registers.with_groups(found)

    # -- lookarounds in expanded NFAs ---------------------------------------------------------
    def lookaround_edges(self, node: Hashable, memory: int) -> list:
        """The (label, memory after) pairs of an assertion edge in an expanded NFA."""
        if not isinstance(node, (Lookahead, Lookbehind)) or not _touches(node):
            return [(node, memory)]
        inner = _inner_groups(node)
        behind = isinstance(node, Lookbehind)
        given = self.projection(node, memory) if behind else self.registers.given(memory)
        if node.negative or not inner:
            return [(Check(node, given, None), memory)]
        if behind:
            nfa = self.tracker_nfa(node, given)[0]
        else:
            program = self.nfa(node.item, scoped=True)
            nfa = self.expand(program, [(program.start, given)], program.final,
                              lambda m: self.registers.outcome(m, inner), False, recording=True,
                              reads=frozenset(inner))
        outcomes = {nfa.labels[s] for s, kind in enumerate(nfa.kinds) if kind == FINAL}
        return [(Check(node, given, outcome), self.registers.apply(memory, outcome))
                for outcome in sorted(outcomes - {None}, key=repr)]

    # -- the judge ---------------------------------------------------------------------------
    def assertion(self, label: Hashable, lookback: LookBack, back: int):
        key = (label, id(lookback), back)
        hit = self.verdicts.get(key, _MISSING)
        if hit is _MISSING:
            hit = self.verdicts[key] = self._assertion(label, lookback, back)
        return hit

    def _assertion(self, label: Hashable, lookback: LookBack, back: int):
        if isinstance(label, Anchor):
            return self.anchor(label.kind, lookback.context(back))
        if isinstance(label, Boundary):
            return self.boundary(label, lookback.context(back))
        if isinstance(label, PriorityCheck):
            return self.priority(label, lookback, back)
        node, given, outcome = (label.node, label.given, label.outcome) if isinstance(label, Check) \
            else (label, None, None)
        if isinstance(node, Lookbehind):
            return self.behind(node, given, outcome, lookback, back)
        return self.ahead(node, given, outcome, lookback, back)

    def anchor(self, kind: str, context: tuple):
        if kind == "text_start":
            return NO_OBLIGATIONS if context[AT_START] else BLOCKED
        if kind == "line_start":
            return NO_OBLIGATIONS if context[AT_START] or context[AFTER_NEWLINE] else BLOCKED
        return self.obligations.obligation(self.end_dfa(kind))

    def boundary(self, node: Boundary, context: tuple):
        """re: \\b where exactly one side is a word character, \\B where both or neither,
        and neither in the empty string (sre's AT_BOUNDARY / AT_NON_BOUNDARY)."""
        after_word = context[AFTER_ASCII_WORD if node.ascii else AFTER_WORD]
        word_next = self.next_dfa(node.ascii, True)
        if not node.negative:
            rest = complement(word_next) if after_word else word_next
        elif after_word:
            rest = word_next
        elif context[AT_START]:
            rest = self.next_dfa(node.ascii, False)
        else:
            rest = complement(word_next)
        return self.obligations.obligation(rest)

    def ahead(self, node: Lookahead, given, outcome, lookback: LookBack, back: int):
        if given is None:
            body = self.compile(node.item, lookback, back, any_suffix=True)
        else:
            inner = _inner_groups(node)
            accept = _always if outcome is None else \
                (lambda m: True if self.registers.outcome(m, inner) == outcome else None)
            body = self.compile(node.item, lookback, back, True, memory=given, accept=accept,
                                scoped=outcome is not None, reads=frozenset(inner))
        return self.obligations.obligation(complement(body) if node.negative else body)

    def behind(self, node: Lookbehind, given, outcome, lookback: LookBack, back: int):
        ways = sorted({oid for found, oid in lookback.ends(back, (node, given))
                       if outcome is None or found == outcome})
        if node.negative:
            if not ways:
                return NO_OBLIGATIONS
            if ways[0] == NO_OBLIGATIONS:
                return BLOCKED
            either = self.obligations.language(ways, self.alphabet, self.cap)
            return self.obligations.obligation(complement(either))
        if not ways:
            return BLOCKED
        if ways[0] == NO_OBLIGATIONS or len(ways) == 1:
            return ways[0]
        return tuple(ways)

    def priority(self, label: PriorityCheck, lookback: LookBack, back: int):
        nfa = label.nfa
        reach = self.expand(nfa, [(t, label.memory) for t in label.targets], nfa.scope_exits[label.scope],
                            _always, any_suffix=True, ignored=label.scope)
        return self.obligations.obligation(complement(self.determinise(reach, lookback, back)))

    # -- small constraint automata -----------------------------------------------------------
    def end_dfa(self, kind: str) -> DFA:
        """The rest-of-string language of \\Z ({""}), $ ({"", "\\n"}) or (?m)$ ("" or "\\n"…)."""
        k, nl = len(self.classes), self.newline_class
        rows = [[DEAD] * k]
        if kind != "text_end" and nl != DEAD:
            rows[0][nl] = 1
            rows.append([1 if kind == "line_end" else DEAD] * k)
        return self.table_dfa(rows, range(len(rows)))

    def next_dfa(self, ascii_only: bool, word: bool) -> DFA:
        """The rests whose first character is (with ``word``) or is not a word character."""
        words = self.words[ascii_only]
        first = [1 if (cls.min in words) == word else DEAD for cls in self.classes]
        return self.table_dfa([first, [1] * len(self.classes)], (1,))

    def table_dfa(self, rows: list, accepting) -> DFA:
        table = tuple(tuple(row) for row in rows)
        return minimise(DFA(self.alphabet, tuple(self.classes), table, frozenset(accepting)))


# -- tree facts -------------------------------------------------------------------------

def _inner_groups(node: Node) -> tuple[int, ...]:
    return tuple(sorted({n.index for n in walk(node.item) if isinstance(n, Group)}))


def _referenced(node: Node) -> set[int]:
    return {n.index for n in walk(node.item) if isinstance(n, (Backreference, Conditional))}


def _touches(node: Node) -> bool:
    """Whether a lookaround's body reads or sets what groups captured."""
    return any(isinstance(n, (Group, Backreference, Conditional)) for n in walk(node.item))


def _label_reads(label: Hashable) -> frozenset:
    """The groups an assertion edge's label reads (see ``registers.live_groups``)."""
    if isinstance(label, (Lookahead, Lookbehind)) and _touches(label):
        return frozenset(_referenced(label)) | frozenset(_inner_groups(label))
    return frozenset()
