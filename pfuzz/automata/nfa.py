"""Thompson construction: a syntax tree to an ε-NFA over symbol-class indexes.

The method is K. Thompson's, "Regular expression search algorithm", CACM
11(6), 1968: every node becomes a fragment with one entry and one exit state,
glued by ε-edges. Each state has one kind of out-edge: a character edge (a set
of class indexes and one target), ε-edges, or an *assertion* edge (an
``Anchor`` or ``Lookahead`` node and one target) that the determiniser takes
only when the assertion can hold (see ``pfuzz.automata.construction.compiler``).

Bounded repeats are expanded, ``x{m,n}`` as m copies of x followed by n−m
*nested* optional copies, x(x(x)?)? rather than x?x?x?: after reading i
copies the ε-closure then holds two states, not n−i, so the subset
construction stays linear in n for non-nullable items. An alternation of
single character sets is one character edge with the union of their classes.

Cost: the NFA has O(size of the expanded tree) states. ``estimate_states``
gives that size before anything is built, so an absurd repeat such as
``(a{1000}){1000}`` is refused with ``StateLimitError`` instead of filling
memory.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

from pfuzz.errors import StateLimitError
from pfuzz.syntax.tree import Alternation, Anchor, Chars, Lookahead, Node, Repeat, Sequence

#: Out-edge kinds of an NFA state.
CHAR, EPSILON, ASSERT, FINAL = "char", "epsilon", "assert", "final"


@dataclass(frozen=True)
class NFA:
    """An ε-NFA: per state its kind, label and targets; one start, one final state.

    ``labels[s]`` is the frozenset of class indexes of a character edge, or the
    assertion node of an assertion edge (None otherwise); ``targets[s]`` lists
    the successor states. With ``any_suffix`` the final state loops on every
    class, so the NFA accepts L·U*.
    """

    kinds: tuple[str, ...]
    labels: tuple
    targets: tuple[tuple[int, ...], ...]
    start: int
    final: int

    @property
    def n_states(self) -> int:
        return len(self.kinds)


class _Builder:
    """Mutable lists of states while a fragment tree is being glued."""

    def __init__(self, label_of: Callable[[Chars], frozenset[int]]):
        self.label_of = label_of
        self.kinds: list[str] = []
        self.labels: list = []
        self.targets: list[list[int]] = []

    def state(self, kind: str = EPSILON, label=None) -> int:
        self.kinds.append(kind)
        self.labels.append(label)
        self.targets.append([])
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
        if isinstance(node, (Anchor, Lookahead)):
            entry, exit_ = self.state(ASSERT, node), self.state()
            self.link(entry, exit_)
            return entry, exit_
        raise TypeError(f"not a syntax tree node: {node!r}")

    def char_edge(self, label: frozenset[int]) -> tuple[int, int]:
        entry, exit_ = self.state(CHAR, label), self.state()
        self.link(entry, exit_)
        return entry, exit_

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

    def repeat(self, node: Repeat) -> tuple[int, int]:
        parts = [self.fragment(node.item) for _ in range(node.min)]
        if node.max is None:
            parts.append(self.star(node.item))
        elif node.max > node.min:
            parts.append(self.nested_optional(node.item, node.max - node.min))
        return self.sequence(parts)

    def star(self, item: Node) -> tuple[int, int]:
        entry, exit_ = self.state(), self.state()
        item_entry, item_exit = self.fragment(item)
        self.link(entry, item_entry)
        self.link(entry, exit_)
        self.link(item_exit, item_entry)
        self.link(item_exit, exit_)
        return entry, exit_

    def nested_optional(self, item: Node, depth: int) -> tuple[int, int]:
        """(x(x(...)?)?)? with ``depth`` copies of x, all sharing one exit."""
        exit_ = self.state()
        entry = previous_exit = None
        for _ in range(depth):
            gate = self.state()
            item_entry, item_exit = self.fragment(item)
            self.link(gate, item_entry)
            self.link(gate, exit_)
            if previous_exit is None:
                entry = gate
            else:
                self.link(previous_exit, gate)
            previous_exit = item_exit
        self.link(previous_exit, exit_)
        return entry, exit_


def estimate_states(node: Node) -> int:
    """An upper bound on the number of states ``build`` creates for ``node``."""
    return _fragment_states(node) + 1


def _fragment_states(node: Node) -> int:
    if isinstance(node, (Chars, Anchor, Lookahead)):
        return 2
    if isinstance(node, Sequence):
        return max(1, sum(_fragment_states(item) for item in node.items))
    if isinstance(node, Alternation):
        return 2 + sum(_fragment_states(option) for option in node.options)
    if isinstance(node, Repeat):
        copies = node.min + 1 if node.max is None else node.max
        return 3 + copies * (_fragment_states(node.item) + 1)
    raise TypeError(f"not a syntax tree node: {node!r}")


def build(node: Node, label_of: Callable[[Chars], frozenset[int]], *, n_classes: int,
          any_suffix: bool = False, limit: int | None = None) -> NFA:
    """Thompson's construction for ``node``; ``label_of`` maps a Chars node to class indexes.

    Lookahead bodies are not expanded here: a Lookahead is one assertion edge
    whose body the determiniser compiles separately. Raises
    ``StateLimitError`` when the NFA would have more than ``limit`` states.
    """
    if limit is not None and estimate_states(node) > limit:
        raise StateLimitError(
            f"the pattern expands to more than {limit:,} automaton states before "
            "determinisation (large nested repeats); simplify the pattern or raise the cap"
        )
    builder = _Builder(label_of)
    entry, exit_ = builder.fragment(node)
    final = builder.state(FINAL)
    builder.link(exit_, final)
    if any_suffix:
        builder.kinds[final] = CHAR
        builder.labels[final] = frozenset(range(n_classes))
        builder.link(final, final)
    return NFA(tuple(builder.kinds), tuple(builder.labels),
               tuple(tuple(t) for t in builder.targets), entry, final)


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
        if nfa.kinds[s] in (EPSILON, ASSERT):
            for t in nfa.targets[s]:
                if t not in seen:
                    seen.add(t)
                    stack.append(t)
    return seen
