"""Membership queries: the validator asked in rounds, each string at most once.

The learner never calls the validator directly. It hands this ``Oracle`` a batch of strings
(one *round*); the oracle sends the strings it has not seen before, in one call of the caller's
``ask(strings) -> answers``, stores every answer in a dictionary, and counts the distinct
strings sent (*queries*) and the calls that sent anything (*rounds*). A command target can then
answer a round at a time, and a string asked twice costs nothing the second time.

Budgets are checked before a round is sent, never in the middle of one: a round that would
pass ``max_queries`` is not sent at all (``room`` says how many strings still fit, so that a
caller with independent tests can send a smaller round), and no round starts once
``max_seconds`` have passed. Either raises ``Exhausted`` with the name of the budget; the
learner catches it and returns what it has learned. Memory: one dictionary entry per distinct
string asked.
"""

from __future__ import annotations

import time
from typing import Callable, Iterable, Sequence

from pfuzz.errors import ArgumentError

__all__ = ["Exhausted", "Oracle", "change_point"]


class Exhausted(Exception):
    """A budget ran out; ``budget`` is ``"queries"``, ``"states"`` or ``"seconds"``."""

    def __init__(self, budget: str):
        super().__init__(f"the {budget} budget ran out")
        self.budget = budget


class Oracle:
    """The caller's batch membership oracle, memoised and counted, under budgets."""

    def __init__(self, ask: Callable[[Sequence[str]], Sequence[bool]], *, max_queries: int,
                 max_seconds: float | None = None):
        self._ask = ask
        self.answers: dict[str, bool] = {}
        self.queries = 0
        self.rounds = 0
        self.max_queries = max_queries
        self.max_seconds = max_seconds
        self.started = time.monotonic()

    @property
    def seconds(self) -> float:
        return time.monotonic() - self.started

    def room(self) -> int:
        """How many new strings the query budget still allows."""
        return max(self.max_queries - self.queries, 0)

    def ask(self, strings: Iterable[str]) -> list[bool]:
        """The validator's answers for ``strings``, in order (one round for the new ones)."""
        strings = list(strings)
        answers = self.answers
        new = list(dict.fromkeys(s for s in strings if s not in answers))
        if new:
            self._send(new)
        return [answers[s] for s in strings]

    def accepts(self, text: str) -> bool:
        known = self.answers.get(text)
        return self.ask([text])[0] if known is None else known

    def check_time(self) -> None:
        """Raise ``Exhausted("seconds")`` once ``max_seconds`` have passed."""
        if self.max_seconds is not None and self.seconds > self.max_seconds:
            raise Exhausted("seconds")

    def _send(self, new: list[str]) -> None:
        if self.queries + len(new) > self.max_queries:
            raise Exhausted("queries")
        self.check_time()
        replies = list(self._ask(new))
        if len(replies) != len(new):
            raise ArgumentError(f"the membership oracle gave {len(replies)} answers "
                                f"for {len(new)} strings")
        self.answers.update(zip(new, map(bool, replies)))
        self.queries += len(new)
        self.rounds += 1


def change_point(low: int, high: int, value: Callable[[int], bool]) -> int:
    """The ``i`` in ``[low, high)`` with ``value(i) != value(i + 1)``, by binary search.

    Requires ``value(low) != value(high)``; asks about log2(high − low) points, one a round.
    """
    left = value(low)
    while high - low > 1:
        middle = (low + high) // 2
        if value(middle) == left:
            low = middle
        else:
            high = middle
    return low
