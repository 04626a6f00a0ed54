"""Kearns–Vazirani learning: a discrimination tree over symbol classes, batched.

The learner keeps a *discrimination tree* (M. Kearns and U. Vazirani, "An Introduction to
Computational Learning Theory", MIT Press, 1994, chapter 8): each inner node holds a suffix
``v``, its two children the strings ``w`` whose ``w·v`` the validator rejects and accepts;
each leaf is one state of the hypothesis, named by its *access string*. The root's suffix is
the empty string, so a leaf's side of the root is whether its state accepts. A transition
``(q, a)`` is the string ``access(q)·a`` (``a`` the representative of a symbol class), and its
target is the leaf it *sifts* to. Sifting is batched: every transition waiting at some node is
asked about in one round, so building a hypothesis takes as many rounds as the tree is deep.
A transition that sifts to an empty leaf becomes a new state (the variant of the algorithm in
which a leaf may be empty, so that the first hypothesis needs no counterexample).

A counterexample ``x`` (a string of representatives on which the hypothesis and the validator
disagree) is cut by the method of R. Rivest and R. Schapire ("Inference of finite automata
using homing sequences", Information and Computation 103(2), 1993): with ``s_i`` the
hypothesis state after ``x[:i]``, the answers ``α(i)`` for ``access(s_i)·x[i:]`` differ at
``i = 0`` and ``i = |x|``, so a binary search finds ``i`` where ``α(i) ≠ α(i+1)``; then
``access(s_i)·x[i]`` and ``access(s_{i+1})`` reach different states, told apart by the
suffix ``x[i+1:]``, which splits the leaf of ``s_{i+1}``. Cost: log2 |x| queries (one a round)
and one query per transition into the split leaf; one new state per counterexample step.

Every state is told apart from every other by the suffix at their lowest common ancestor, which
was asked for both; the suffixes on the path from the root to a state's leaf are therefore a
*harmonised state identifier* (any two states' identifiers share a suffix that tells them
apart), which the conformance tests use (``pfuzz.learning.conformance``). Memory: one node per
state and per suffix, one entry per transition.
"""

from __future__ import annotations

from pfuzz.automata.dfa import DEAD, DFA
from pfuzz.base.charset import CharSet
from pfuzz.learning.oracle import Exhausted, Oracle, change_point
from pfuzz.learning.symbols import Symbols

__all__ = ["Tree"]


class _Node:
    """An inner node (``suffix`` is a string) or a leaf (``suffix`` is None; ``state`` or None)."""

    __slots__ = ("suffix", "children", "state", "parent")

    def __init__(self, parent: "_Node | None"):
        self.suffix: str | None = None
        self.children: tuple[_Node, _Node] = ()  # type: ignore[assignment]
        self.state: int | None = None
        self.parent = parent

    def branch(self, suffix: str) -> None:
        """Turn this leaf into an inner node on ``suffix`` with two empty leaves."""
        self.suffix, self.state = suffix, None
        self.children = (_Node(self), _Node(self))


class Tree:
    """The discrimination tree, the hypothesis' states and its transitions."""

    def __init__(self, oracle: Oracle, symbols: Symbols, alphabet: CharSet, max_states: int):
        self.oracle, self.symbols, self.alphabet = oracle, symbols, alphabet
        self.max_states = max_states
        self.root = _Node(None)
        self.root.branch("")
        self.access: list[str] = []
        self.leaves: list[_Node] = []
        self.targets: list[list[_Node]] = []
        self.incoming: list[set[tuple[int, int]]] = []
        self._settle([("", self.root, None)])

    # -- sifting ------------------------------------------------------------------------
    def _settle(self, items: list) -> None:
        """Sift ``(word, node, transition)`` items down to leaves, one round per tree level."""
        while items:
            answers = self.oracle.ask([word + node.suffix for word, node, _ in items])
            moving = []
            for (word, node, transition), answer in zip(items, answers):
                child = node.children[answer]
                if child.suffix is not None:
                    moving.append((word, child, transition))
                    continue
                if child.state is None:
                    moving.extend(self._new_state(word, child))
                if transition is not None:
                    self._point(transition, child)
            items = moving

    def _new_state(self, word: str, leaf: _Node) -> list:
        if len(self.access) >= self.max_states:
            raise Exhausted("states")
        state = len(self.access)
        leaf.state = state
        self.access.append(word)
        self.leaves.append(leaf)
        self.targets.append([None] * len(self.symbols))  # type: ignore[list-item]
        self.incoming.append(set())
        return [(word + self.symbols.representative(a), self.root, (state, a))
                for a in range(len(self.symbols))]

    def _point(self, transition: tuple[int, int], leaf: _Node) -> None:
        state, symbol = transition
        old = self.targets[state][symbol]
        if old is not None and old.suffix is None:
            self.incoming[old.state].discard(transition)
        self.targets[state][symbol] = leaf
        self.incoming[leaf.state].add(transition)

    # -- refinement ---------------------------------------------------------------------
    def add_symbol(self, symbol: int) -> None:
        """Sift every state's transition on a new symbol (after a class was split)."""
        for row in self.targets:
            row.append(None)  # type: ignore[arg-type]
        rep = self.symbols.representative(symbol)
        self._settle([(word + rep, self.root, (q, symbol)) for q, word in enumerate(self.access)])

    def refine(self, word: str) -> None:
        """Split a leaf by Rivest–Schapire on ``word`` (representatives only, answered unlike
        the hypothesis answers it)."""
        states = self.path_states(word)

        def alpha(i: int) -> bool:
            return self.oracle.accepts(self.access[states[i]] + word[i:])

        i = change_point(0, len(word), alpha)
        self._split(states[i + 1], word[i + 1:])

    def _split(self, state: int, suffix: str) -> None:
        leaf = self.leaves[state]
        answer = self.oracle.accepts(self.access[state] + suffix)
        leaf.branch(suffix)
        kept = leaf.children[answer]
        kept.state = state
        self.leaves[state] = kept
        moved, self.incoming[state] = sorted(self.incoming[state]), set()
        self._settle([(self.access[q] + self.symbols.representative(a), leaf, (q, a))
                      for q, a in moved])

    # -- the hypothesis -----------------------------------------------------------------
    @property
    def size(self) -> int:
        return len(self.access)

    def step(self, state: int, char: str) -> int:
        symbol = self.symbols.symbol_of(char)
        return DEAD if symbol < 0 else self.targets[state][symbol].state

    def path_states(self, word: str) -> list[int]:
        """The hypothesis states after each prefix of ``word`` (len(word) + 1 of them)."""
        states = [0]
        for ch in word:
            states.append(self.step(states[-1], ch))
        return states

    def accepting(self, state: int) -> bool:
        return self.oracle.answers[self.access[state]]

    def identifier(self, state: int) -> list[str]:
        """The suffixes on the path from the root to ``state``'s leaf."""
        out, node = [], self.leaves[state].parent
        while node is not None:
            out.append(node.suffix)
            node = node.parent
        return out

    def hypothesis(self) -> DFA:
        """The hypothesis as a complete DFA over the current classes."""
        order = self.symbols.ordered()
        classes = tuple(self.symbols.classes[a].chars for a in order)
        table = tuple(tuple(row[a].state for a in order) for row in self.targets)
        accepting = frozenset(q for q in range(self.size) if self.accepting(q))
        return DFA(self.alphabet, classes, table, accepting)
