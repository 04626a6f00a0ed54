"""Look-back: a deterministic automaton over the prefix read so far.

Assertions about what precedes a position are finite look-back obligations on
the prefix. ``^`` and ``(?m)^`` need to know whether the position is the start
or follows a newline, ``\\b`` and ``\\B`` whether the previous character is a word
character (``re``'s Unicode or ASCII notion); those are fixed by the last class
read, a *context*. A lookbehind ``(?<=X)`` or ``(?<!X)`` needs more: a *tracker*,
the subset construction of (?s:.*)·X run along the prefix, whose threads that
reach the end of X at a position tell whether X matches just before it, and, as X
may hold lookaheads and ``$``, under which obligations on the rest
(``(?<=a(?=b))`` is "after a, and b follows"). Inside a tracker, X's own anchors
and lookbehinds are judged by the tracker's own look-back, so ``(?<=^a)`` and
nested lookbehinds are exact.

A ``LookBack`` without trackers is *memoryless*: its state after a class is a
function of that class, so the determiniser need not store it in its
configurations. With trackers its state is the tuple (context, tracker
configurations), interned, and configurations carry it. Cost: one memoised
dictionary lookup per (state, class) after the first time; a tracker costs what
its own subset construction costs.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Hashable

from pfuzz.automata.construction.obligations import Interned
from pfuzz.syntax.tree import Anchor, Boundary, Lookbehind, Node, children

#: What a context says: (at the start, after '\\n', after a word character, after an ASCII one).
AT_START, AFTER_NEWLINE, AFTER_WORD, AFTER_ASCII_WORD = range(4)


@dataclass(frozen=True)
class Needs:
    """The facts about the previous character that a tree's assertions ask."""

    start: bool = False
    newline: bool = False
    word: bool = False
    ascii_word: bool = False


class Tracker:
    """A determiniser (in recording mode) run along the prefix from its start configuration."""

    def __init__(self, runner, start_back: int):
        self.runner = runner
        self.start = runner.start(start_back) or runner.dead
        self.steps: dict[tuple, tuple] = {}

    def step(self, config: tuple, c: int) -> tuple:
        key = (config, c)
        hit = self.steps.get(key)
        if hit is None:
            hit = self.steps[key] = self.runner.step(config, c) or self.runner.dead
        return hit


class LookBack:
    """Contexts from the class features, and the trackers of some lookbehinds, keyed."""

    def __init__(self, needs: Needs, features: list[tuple[bool, bool, bool]],
                 trackers: dict[Hashable, Tracker] | None = None):
        self.contexts = Interned()
        self.start_context = self.contexts((needs.start, False, False, False))
        self.class_context = [self.contexts((False, newline and needs.newline, word and needs.word,
                                             ascii_word and needs.ascii_word))
                              for newline, word, ascii_word in features]
        trackers = trackers or {}
        self.keys = {key: i for i, key in enumerate(trackers)}
        self.trackers = list(trackers.values())
        self.stored = bool(self.trackers)
        if self.stored:
            self.states = Interned((self.start_context, tuple(t.start for t in self.trackers)))
            self.start = 0
            self.steps: dict[tuple[int, int], int] = {}
        else:
            self.start = self.start_context

    def next(self, back: int, c: int) -> int:
        """The state after reading class ``c`` in state ``back``."""
        if not self.stored:
            return self.class_context[c]
        key = (back, c)
        hit = self.steps.get(key)
        if hit is None:
            _, configs = self.states.values[back]
            moved = tuple(tracker.step(config, c) for tracker, config in zip(self.trackers, configs))
            hit = self.steps[key] = self.states((self.class_context[c], moved))
        return hit

    def context(self, back: int) -> tuple[bool, bool, bool, bool]:
        """What the state says about the previous character (see AT_START ...)."""
        return self.contexts.values[self.states.values[back][0] if self.stored else back]

    def ends(self, back: int, key: Hashable) -> frozenset:
        """The (outcome, obligation set) pairs with which tracker ``key``'s X ends here."""
        return self.states.values[back][1][self.keys[key]][0]


def scan(tree: Node) -> tuple[Needs, list[Lookbehind]]:
    """What the tree's assertions ask of the previous character, and its lookbehinds,
    without looking inside the lookbehinds (their trackers have their own look-back)."""
    start = newline = word = ascii_word = False
    behinds = []
    stack = [tree]
    while stack:
        node = stack.pop()
        if isinstance(node, Lookbehind):
            behinds.append(node)
            continue
        if isinstance(node, Anchor) and node.kind in ("text_start", "line_start"):
            start = True
            newline = newline or node.kind == "line_start"
        elif isinstance(node, Boundary):
            start = start or node.negative
            word, ascii_word = word or not node.ascii, ascii_word or node.ascii
        stack.extend(children(node))
    return Needs(start, newline, word, ascii_word), behinds
