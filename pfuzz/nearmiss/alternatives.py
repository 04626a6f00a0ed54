"""Every nearest valid string of a text, listed up to a limit (``pfuzz explain --all``).

``explain`` gives one witness, the shortest and then first of the valid strings at the
least edit distance d (optimal string alignment: delete, insert, replace, adjacent
swap). There may be very many: ``12345678ab`` is 8 edits from ``[a-z]{10}``, with about
26^8 nearest strings. This module lists them lazily, up to a limit.

Method: Wagner's correction table (R. A. Wagner, "Order-n correction for regular
languages", CACM 17(5), 1974) read from the right: ``rest[i][s]`` is the least cost of
turning ``text[i:]`` into a string the DFA accepts from state ``s``. Column ``n`` is the
shortest completion from each state; each column to the left takes deletes, matches,
replaces and swaps from the columns to its right, then closes over insertions (unit
cost edges within the column: a breadth-first relaxation). A depth-first walk from
(start, 0) then follows only the moves that keep the total at d, characters in
code-point order, and yields each distinct witness once.

Cost: the table is O(n × states × out-degree) with a bucketed relaxation per column;
the walk costs O(n + d) per path, and different paths may spell the same string, so
at most ``MAX_STEPS`` moves are walked (the result says when the walk stopped early).
Limits: at each position only the first ``PER_LABEL`` characters of a transition are
tried, so over very wide alphabets (``bmp``, ``unicode``) the list is a subset; the
first strings found come in the walk's order, not shortlex order.
"""

from __future__ import annotations

from itertools import islice

from pfuzz.automata.dfa import DFA, transitions
from pfuzz.base.charset import CharSet

__all__ = ["MAX_STEPS", "nearest_strings"]

#: Moves walked before the listing stops (paths that spell the same string included).
MAX_STEPS = 200_000
#: Characters of one transition tried at each position (all of them over ASCII alphabets).
PER_LABEL = 256


def nearest_strings(dfa: DFA, text: str, distance: int, limit: int) -> tuple[list[str], bool]:
    """Up to ``limit`` distinct valid strings at ``distance`` edits from ``text`` (which must
    be the least distance), and whether that is all of them."""
    rows = transitions(dfa)
    rest = _table(dfa, rows, text)
    found: dict[str, None] = {}
    steps = [0]
    complete = _walk(dfa, rows, rest, text, 0, 0, distance, [], found, limit, steps)
    return list(found), complete


def _table(dfa: DFA, rows, text: str) -> list[list[float]]:
    n, inf = len(text), float("inf")
    rest = [[inf] * dfa.n_states for _ in range(n + 1)]
    for s in dfa.accepting:
        rest[n][s] = 0
    _close(rest[n], rows)
    for i in range(n - 1, -1, -1):
        column = rest[i]
        for s, row in enumerate(rows):
            best = 1 + rest[i + 1][s]                          # delete text[i]
            for label, t in row:
                cost = 0 if text[i] in label else 1            # match, or replace
                best = min(best, cost + rest[i + 1][t])
            if i + 1 < n and text[i] != text[i + 1]:
                t2 = _swap_target(rows, s, text[i + 1], text[i])
                if t2 is not None:
                    best = min(best, 1 + rest[i + 2][t2])
            column[s] = best
        _close(column, rows)
    return rest


def _close(column: list[float], rows) -> None:
    """Insertions: column[s] <= 1 + column[t] for every transition s -> t, to a fixpoint."""
    changed = True
    while changed:
        changed = False
        for s, row in enumerate(rows):
            for _, t in row:
                if column[t] + 1 < column[s]:
                    column[s] = column[t] + 1
                    changed = True


def _target(row, char: str) -> int | None:
    return next((t for label, t in row if char in label), None)


def _swap_target(rows, s: int, first: str, second: str) -> int | None:
    t1 = _target(rows[s], first)
    return None if t1 is None else _target(rows[t1], second)


def _walk(dfa, rows, rest, text, s, i, budget, spelt, found, limit, steps) -> bool:
    """Depth-first over the moves that keep the cost at ``budget``; False when stopped early."""
    steps[0] += 1
    if len(found) >= limit or steps[0] > MAX_STEPS:
        return False
    n = len(text)
    if i == n and budget == 0 and s in dfa.accepting:
        found.setdefault("".join(spelt))
    moves = []
    if i < n and 1 + rest[i + 1][s] <= budget:
        moves.append((None, s, i + 1, 1))                          # delete text[i]
    for label, t in rows[s]:
        for char in _chars(label):
            if i < n and rest[i + 1][t] + (char != text[i]) <= budget:
                moves.append((char, t, i + 1, int(char != text[i])))   # match or replace
            if 1 + rest[i][t] <= budget:
                moves.append((char, t, i, 1))                           # insert
    if i + 1 < n and text[i] != text[i + 1]:
        t2 = _swap_target(rows, s, text[i + 1], text[i])
        if t2 is not None and 1 + rest[i + 2][t2] <= budget:
            moves.append((text[i + 1] + text[i], t2, i + 2, 1))
    moves.sort(key=lambda m: (m[0] is not None, m[0] or ""))
    for chars, t, j, cost in moves:
        spelt.append(chars or "")
        going = _walk(dfa, rows, rest, text, t, j, budget - cost, spelt, found, limit, steps)
        spelt.pop()
        if not going:
            return False
    return True


def _chars(label: CharSet):
    return islice(label.chars(), PER_LABEL)
