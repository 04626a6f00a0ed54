"""The protocol between the compiler and the determiniser.

The determiniser (``pfuzz.automata.construction.determinise``) runs the subset
construction over NFA threads; it knows nothing of what an assertion means. When a
thread takes an assertion edge it asks a ``Judge`` (the compiler's
``pfuzz.automata.construction.compiler.Compilation``) what the assertion adds in the
current look-back state, and the answer is one of:

- ``BLOCKED`` (None): the assertion fails here, the thread dies;
- an obligation set id (``NO_OBLIGATIONS``, 0, when it simply holds): the thread
  carries it on;
- a tuple of obligation set ids: the assertion holds in one of several ways (a
  lookbehind whose inner lookaheads constrain the rest differently), and the thread
  splits into one thread per way.

The judge owns the interned obligations (``Obligations``) that both sides use. A
look-back state is an int of a ``pfuzz.automata.construction.lookback.LookBack``, which
the determiniser advances with each class it reads and hands back with each question.
"""

from __future__ import annotations

from typing import Hashable, Protocol, Union

from pfuzz.automata.construction.obligations import Obligations

#: What an assertion adds: None (blocked), one obligation set id, or alternatives.
Verdict = Union[None, int, tuple]


class Judge(Protocol):
    """What the determiniser needs from the compiler."""

    obligations: Obligations

    def assertion(self, label: Hashable, lookback, back: int) -> Verdict:
        """What taking the assertion edge labelled ``label`` adds in look-back state ``back``."""

    def charge(self, steps: int) -> None:
        """Count ``steps`` of ε-closure work against the compilation's budget (may raise)."""
