"""Liveness of registers: which captured groups a run from each NFA state may still read.

A backward fixpoint over the NFA (the classic liveness analysis of compilers): a
group is live at a state if some path from it reads the group's register (a
backreference, a conditional, a lookaround whose body reads or sets it, the earlier
choices a Priority assertion looks at, the reopening of a group that a conditional
inside it tests) before the group's OPEN overwrites it. ``registers.expand`` forgets
the dead registers of each state, so threads that differ only in them become one.
Cost: O(states × groups) set operations until nothing changes.
"""

from __future__ import annotations

from typing import Callable, Hashable

from pfuzz.automata.nfa import ASSERT, BACKREF, CONDITION, NFA, OPEN, Priority

def live_groups(nfa: NFA, layout, reads: Callable[[Hashable], frozenset],
                at_final: frozenset = frozenset()) -> list[frozenset]:
    """Per NFA state, the groups whose registers a run from there may still read;
    ``reads(label)`` gives what a lookaround edge reads, ``at_final`` what the run's end
    reads (a lookaround's outcome), ``layout.adjacency`` the groups reopened under test."""
    kinds, labels, targets = nfa.kinds, nfa.labels, nfa.targets
    own = [frozenset() for _ in kinds]
    for s, kind in enumerate(kinds):
        label = labels[s]
        if kind == BACKREF:
            own[s] = frozenset({label.index})
        elif kind == CONDITION or kind == OPEN and label in layout.adjacency:
            own[s] = frozenset({label})
        elif kind == ASSERT and not isinstance(label, Priority):
            own[s] = reads(label)
    live = [own[s] | (at_final if s == nfa.final else frozenset()) for s in range(len(kinds))]
    before: list[list[int]] = [[] for _ in kinds]
    for s, kind in enumerate(kinds):
        extra = labels[s].targets if kind == ASSERT and isinstance(labels[s], Priority) else ()
        for t in (*targets[s], *extra):
            before[t].append(s)
    stack = list(range(len(kinds)))
    while stack:
        t = stack.pop()
        for s in before[t]:
            passed = live[t] - {labels[s]} if kinds[s] == OPEN and labels[s] not in layout.adjacency \
                else live[t]
            if not passed <= live[s]:
                live[s] = live[s] | passed
                stack.append(s)
    return live
