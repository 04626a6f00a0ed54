"""Thompson construction: a syntax tree to an ε-NFA over symbol-class indexes.

The method is K. Thompson's, "Regular expression search algorithm", CACM
11(6), 1968: every node becomes a fragment with one entry and one exit state,
glued by ε-edges. Each state has one kind of out-edge: a character edge (a set
of class indexes and one target), ε-edges, or an *assertion* edge (an
``Anchor``, ``Boundary``, ``Lookahead`` or ``Lookbehind`` node and one target) that
the determiniser takes only when the assertion can hold (see
``pfuzz.automata.construction``). The ε-edges of a state are listed in ``re``'s
order of trying: a greedy repeat tries another copy first, a lazy one stops first.

Bounded repeats are expanded, ``x{m,n}`` as m copies of x followed by n−m
*nested* optional copies, x(x(x)?)? rather than x?x?x?: after reading i
copies the ε-closure then holds two states, not n−i, so the subset
construction stays linear in n for non-nullable items. An alternation of
single character sets is one character edge with the union of their classes.

Where what a pattern captured or the order of trying matters, the NFA also has
*register* states, which ``pfuzz.automata.construction.registers`` expands into plain
states: ``OPEN``/``CLOSE`` of a group that something refers to, ``BACKREF``,
``CONDITION`` (two targets: yes, no), and the zero-width guard of ``re``'s repeats
(``LOOP_BEGIN``, ``LOOP_TEST``, ``LOOP_END``): after an optional copy that read
nothing, ``re`` tries no further copy (``MAX_UNTIL`` in CPython's ``sre``). An
atomic group ``(?>x)`` is a *scope*: every choice inside it that is not the first
gets an assertion edge labelled ``Priority(scope, earlier targets)``, "none of the
earlier choices could have reached the end of the scope", which makes the first
way x matches (in ``re``'s order) the only one taken (Berglund, van der Merwe, van
der Walt & van Litsenborgh, "On the semantics of atomic subgroups in practical
regular expressions", CIAA 2017). A possessive ``x{m,n}+`` is (?>x) m times, then
(?>(?>x){0,n−m}), as ``re`` runs it.

Cost: the NFA has O(size of the expanded tree) states. ``estimate_states``
gives that size before anything is built, so an absurd repeat such as
``(a{1000}){1000}`` is refused with ``StateLimitError`` instead of filling
memory.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

from pfuzz.errors import StateLimitError
from pfuzz.syntax.tree import (Alternation, Anchor, Atomic, Backreference, Boundary, Chars, Conditional,
                               Group, Lookahead, Lookbehind, Node, Repeat, Sequence, walk, width)

#: Out-edge kinds of an NFA state.
CHAR, EPSILON, ASSERT, FINAL = "char", "epsilon", "assert", "final"
#: Register kinds (labels: group number, Backreference node, group number, loop number).
OPEN, CLOSE, BACKREF, CONDITION = "open", "close", "backref", "condition"
LOOP_BEGIN, LOOP_TEST, LOOP_END = "loop_begin", "loop_test", "loop_end"
ASSERTION_NODES = (Anchor, Boundary, Lookahead, Lookbehind)


@dataclass(frozen=True)
class Priority:
    """Assertion label: none of ``targets`` (the earlier choices) can reach the end of ``scope``."""

    scope: int
    targets: tuple[int, ...]


@dataclass(frozen=True)
class NFA:
    """An ε-NFA: per state its kind, label and targets; one start, one final state.

    ``labels[s]`` is the frozenset of class indexes of a character edge, or the
    assertion's label (None for plain ε-edges); ``targets[s]`` lists the successor
    states in ``re``'s order. With ``any_suffix`` the final state loops on every
    class, so the NFA accepts L·U*. ``scope_exits[k]`` is the exit state of atomic
    scope k. ``registers`` says whether register states or scopes are present, which
    ``pfuzz.automata.construction.registers`` must expand before determinisation.
    """

    kinds: tuple[str, ...]
    labels: tuple
    targets: tuple[tuple[int, ...], ...]
    start: int
    final: int
    scope_exits: tuple[int, ...] = ()
    registers: bool = False

    @property
    def n_states(self) -> int:
        return len(self.kinds)


class _Builder:
    """Mutable lists of states while a fragment tree is being glued.

    ``tracked`` are the groups kept as OPEN/CLOSE states; ``widths`` the groups'
    widths (for backreferences inside repeats); with ``scoped`` the whole tree is
    one atomic scope (the body of a lookaround whose captures are used)."""

    def __init__(self, label_of: Callable[[Chars], frozenset[int]], tracked: frozenset = frozenset(),
                 widths: dict | None = None, scoped: bool = False, loops: list | None = None):
        self.label_of = label_of
        self.tracked = tracked
        self.widths = widths or {}
        self.kinds: list[str] = []
        self.labels: list = []
        self.targets: list[list[int]] = []
        self.state_scope: list[int | None] = []
        self.scope_exits: list[int | None] = [None] if scoped else []
        self.scope = 0 if scoped else None
        self.loops = loops if loops is not None else [0]  # a counter shared by a compilation's NFAs
        self.registers = False

    def state(self, kind: str = EPSILON, label=None) -> int:
        self.kinds.append(kind)
        self.labels.append(label)
        self.targets.append([])
        self.state_scope.append(self.scope)
        if kind not in (CHAR, EPSILON, ASSERT, FINAL):
            self.registers = True
        return len(self.kinds) - 1

    def link(self, source: int, target: int) -> None:
        self.targets[source].append(target)

    # -- fragments: each returns (entry, exit) -----------------------------------
    def fragment(self, node: Node) -> tuple[int, int]:
        if isinstance(node, Chars):
            return self.char_edge(self.label_of(node))
        if isinstance(node, Sequence):
            return self.sequence([self.fragment(item) for item in node.items])
        if isinstance(node, Alternation):
            return self.alternation(node)
        if isinstance(node, Repeat):
            return self.repeat(node)
        if isinstance(node, ASSERTION_NODES):
            if isinstance(node, (Lookahead, Lookbehind)) and self.tracked:
                self.registers = self.registers or any(
                    isinstance(n, (Group, Backreference, Conditional)) for n in walk(node.item))
            return self.single(ASSERT, node)
        if isinstance(node, Group):
            return self.group(node)
        if isinstance(node, Backreference):
            return self.single(BACKREF, node)
        if isinstance(node, Conditional):
            return self.conditional(node)
        if isinstance(node, Atomic):
            return self.atomic(node.item)
        raise TypeError(f"not a syntax tree node: {node!r}")

    def single(self, kind: str, label) -> tuple[int, int]:
        entry = self.state(kind, label)
        return entry, self.after(entry)

    def after(self, state: int) -> int:
        """A fresh ε-state after ``state``: a fragment's exit, free for later links."""
        exit_ = self.state()
        self.link(state, exit_)
        return exit_

    def char_edge(self, label: frozenset[int]) -> tuple[int, int]:
        return self.single(CHAR, label)

    def sequence(self, parts: list[tuple[int, int]]) -> tuple[int, int]:
        if not parts:
            state = self.state()
            return state, state
        for (_, left_exit), (right_entry, _) in zip(parts, parts[1:]):
            self.link(left_exit, right_entry)
        return parts[0][0], parts[-1][1]

    def alternation(self, node: Alternation) -> tuple[int, int]:
        if all(isinstance(option, Chars) for option in node.options):
            return self.char_edge(frozenset().union(*map(self.label_of, node.options)))
        entry, exit_ = self.state(), self.state()
        for option in node.options:
            option_entry, option_exit = self.fragment(option)
            self.link(entry, option_entry)
            self.link(option_exit, exit_)
        return entry, exit_

    def group(self, node: Group) -> tuple[int, int]:
        if node.index not in self.tracked:
            return self.fragment(node.item)
        entry, close = self.state(OPEN, node.index), self.state(CLOSE, node.index)
        item_entry, item_exit = self.fragment(node.item)
        self.link(entry, item_entry)
        self.link(item_exit, close)
        return entry, self.after(close)

    def conditional(self, node: Conditional) -> tuple[int, int]:
        entry, exit_ = self.state(CONDITION, node.index), self.state()
        for branch in (node.yes, node.no):
            branch_entry, branch_exit = self.fragment(branch)
            self.link(entry, branch_entry)
            self.link(branch_exit, exit_)
        return entry, exit_

    def atomic(self, item: Node) -> tuple[int, int]:
        """``(?>item)``: later choices inside carry Priority assertions (see the module doc)."""
        scope, outer = len(self.scope_exits), self.scope
        self.scope_exits.append(None)
        first = len(self.kinds)
        self.scope = scope
        entry, exit_ = self.fragment(item)
        self.scope = outer
        self.scope_exits[scope] = exit_
        self.prioritise(scope, first)
        return entry, exit_

    def prioritise(self, scope: int, first: int) -> None:
        for s in range(first, len(self.kinds)):
            if self.kinds[s] == EPSILON and self.state_scope[s] == scope and len(self.targets[s]) > 1:
                targets = self.targets[s]
                for i in range(1, len(targets)):
                    guard = self.state(ASSERT, Priority(scope, tuple(targets[:i])))
                    self.state_scope[guard] = None
                    self.link(guard, targets[i])
                    targets[i] = guard

    # -- repeats -------------------------------------------------------------------
    def repeat(self, node: Repeat) -> tuple[int, int]:
        if node.possessive:
            return self.fragment(_possessive(node))
        parts = [self.fragment(node.item) for _ in range(node.min)]
        guarded = self.guarded(node.item)
        if node.max is None:
            parts.append(self.star(node.item, node.lazy, guarded))
        elif node.max > node.min:
            parts.append(self.nested_optional(node.item, node.max - node.min, node.lazy, guarded))
        return self.sequence(parts)

    def guarded(self, item: Node) -> bool:
        """Whether re's zero-width guard can change what the repeat of ``item`` matches:
        the item can match empty, and order matters here or the item captures."""
        if self.scope is None and not self.tracked:
            return False
        if width(item, dict(self.widths))[0] != 0:
            return False
        return self.scope is not None or any(
            isinstance(n, Group) and n.index in self.tracked for n in walk(item))

    def copy(self, item: Node, loop: int | None) -> tuple[int, int]:
        """One optional copy of ``item``; under the guard it starts by clearing the loop's flag."""
        item_entry, item_exit = self.fragment(item)
        if loop is None:
            return item_entry, item_exit
        begin = self.state(LOOP_BEGIN, loop)
        self.link(begin, item_entry)
        return begin, item_exit

    def new_loop(self, guarded: bool) -> int | None:
        if not guarded:
            return None
        self.loops[0] += 1
        return self.loops[0]

    def choice(self, gate: int, go_on: int, stop: int, lazy: bool) -> None:
        for target in ((stop, go_on) if lazy else (go_on, stop)):
            self.link(gate, target)

    def star(self, item: Node, lazy: bool = False, guarded: bool = False) -> tuple[int, int]:
        loop = self.new_loop(guarded)
        entry = self.state()
        stop = self.state() if loop is None else self.state(LOOP_END, loop)
        item_entry, item_exit = self.copy(item, loop)
        self.choice(entry, item_entry, stop, lazy)
        if loop is None:  # a fresh state: item_exit may belong to a scope inside the item
            again = self.after(item_exit)
            self.choice(again, item_entry, stop, lazy)
            return entry, stop
        self.test(item_exit, loop, entry, stop)
        return entry, self.after(stop)

    def test(self, source: int, loop: int, go_on: int, stop: int) -> None:
        """After a guarded copy: go on only if the copy read something."""
        test = self.state(LOOP_TEST, loop)
        self.link(source, test)
        self.link(test, go_on)
        self.link(test, stop)

    def nested_optional(self, item: Node, depth: int, lazy: bool = False,
                        guarded: bool = False) -> tuple[int, int]:
        """(x(x(...)?)?)? with ``depth`` copies of x, all sharing one exit."""
        loop = self.new_loop(guarded)
        exit_ = self.state() if loop is None else self.state(LOOP_END, loop)
        entry = previous_exit = None
        for _ in range(depth):
            gate = self.state()
            item_entry, item_exit = self.copy(item, loop)
            self.choice(gate, item_entry, exit_, lazy)
            if previous_exit is None:
                entry = gate
            elif loop is None:
                self.link(previous_exit, gate)
            else:
                self.test(previous_exit, loop, gate, exit_)
            previous_exit = item_exit
        self.link(previous_exit, exit_)
        return entry, exit_ if loop is None else self.after(exit_)


def _possessive(node: Repeat) -> Node:
    """x{m,n}+ as re runs it: (?>x) m times, then (?>(?>x){0,n-m}) (see the module doc)."""
    once = Atomic(node.item, node.position)
    parts = [once] * node.min
    if node.max is None or node.max > node.min:
        rest = None if node.max is None else node.max - node.min
        parts.append(Atomic(Repeat(once, 0, rest, node.position), node.position))
    return Sequence(tuple(parts), node.position)


def estimate_states(node: Node) -> int:
    """An upper bound on the number of states ``build`` creates for ``node``."""
    guarded = any(isinstance(n, (Group, Atomic)) or isinstance(n, Repeat) and n.possessive for n in walk(node))
    return _fragment_states(node, 4 if guarded else 1) + 1


def _fragment_states(node: Node, per_copy: int) -> int:
    """States of ``node``'s fragment; ``per_copy`` states of a repeat's copy besides the item's
    (1 for the gate, 4 where zero-width guards may be added)."""
    if isinstance(node, (Chars, Backreference) + ASSERTION_NODES):
        return 2
    if isinstance(node, Sequence):
        return max(1, sum(_fragment_states(item, per_copy) for item in node.items))
    if isinstance(node, (Alternation, Conditional)):
        options = node.options if isinstance(node, Alternation) else (node.yes, node.no)
        return 2 + sum(_fragment_states(option, per_copy) for option in options)
    if isinstance(node, Repeat):
        if node.possessive:
            return _fragment_states(_possessive(node), per_copy)
        copies = node.min + 1 if node.max is None else node.max
        return 6 + copies * (_fragment_states(node.item, per_copy) + per_copy)
    if isinstance(node, Group):
        return 3 + _fragment_states(node.item, per_copy)
    if isinstance(node, Atomic):  # a Priority guard for each later choice: at most one per state
        return 2 * _fragment_states(node.item, per_copy)
    raise TypeError(f"not a syntax tree node: {node!r}")


def build(node: Node, label_of: Callable[[Chars], frozenset[int]], *, n_classes: int,
          any_suffix: bool = False, limit: int | None = None, tracked: frozenset = frozenset(),
          widths: dict | None = None, scoped: bool = False, loops: list | None = None) -> NFA:
    """Thompson's construction for ``node``; ``label_of`` maps a Chars node to class indexes.

    Lookaround bodies are not expanded here: a lookaround is one assertion edge
    whose body the compiler compiles separately. ``tracked``, ``widths`` and
    ``scoped`` are as in ``_Builder``; ``loops`` numbers the zero-width guards of
    one compilation. Raises ``StateLimitError`` when the NFA would have more than
    ``limit`` states.
    """
    if limit is not None and estimate_states(node) > limit:
        raise StateLimitError(
            f"the pattern expands to more than {limit:,} automaton states before "
            "determinisation (large nested repeats); simplify the pattern or raise the cap"
        )
    builder = _Builder(label_of, tracked, widths, scoped, loops)
    first = len(builder.kinds)
    entry, exit_ = builder.fragment(node)
    if scoped:
        builder.scope_exits[0] = exit_
        builder.prioritise(0, first)
    final = builder.state(FINAL)
    builder.link(exit_, final)
    if any_suffix:
        make_any_suffix(builder.kinds, builder.labels, builder.targets, final, n_classes)
    return NFA(tuple(builder.kinds), tuple(builder.labels), tuple(tuple(t) for t in builder.targets),
               entry, final, tuple(builder.scope_exits),
               builder.registers or bool(builder.scope_exits))


def make_any_suffix(kinds: list, labels: list, targets: list, final: int, n_classes: int) -> None:
    """Turn ``final`` into a state that loops on every class (the NFA then accepts L·U*)."""
    kinds[final] = CHAR
    labels[final] = frozenset(range(n_classes))
    targets[final] = [final]


def accepts(nfa: NFA, symbols: list[int]) -> bool:
    """Whether the NFA accepts a string of class indexes, ignoring assertion edges'
    conditions (taking every one); for tests of the construction on assertion-free trees."""
    current = _closure(nfa, {nfa.start})
    for symbol in symbols:
        moved = {t for s in current if nfa.kinds[s] == CHAR and symbol in nfa.labels[s]
                 for t in nfa.targets[s]}
        current = _closure(nfa, moved)
    return nfa.final in current


def _closure(nfa: NFA, states: set[int]) -> set[int]:
    seen = set(states)
    stack = list(states)
    while stack:
        s = stack.pop()
        if nfa.kinds[s] not in (CHAR, FINAL):
            for t in nfa.targets[s]:
                if t not in seen:
                    seen.add(t)
                    stack.append(t)
    return seen
