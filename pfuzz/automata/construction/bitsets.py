"""Subset construction on bit-parallel configurations, for NFAs with no assertion edges.

Where the NFA has no assertion edge, a configuration of the determiniser
(``determinise``) is only a set of NFA character states plus the flag "a thread
ended on the last character". This module keeps that set as one Python integer,
bit i for the i-th character state in the NFA's own order, and moves it under a
class with a few word operations instead of a union of per-state sets: the
moves ``s → t`` of a class are grouped by the distance between the bits of s
and t, and a whole set moves by one mask-and-shift per distance,

    next = OR over distances d of ((set & mask_d) << d)

(bit-parallel simulation of an NFA, R. Baeza-Yates & G. Gonnet, "A new approach
to text searching", CACM 35(10), 1992, generalised from the single distance 1 of
a string's chain to every distance the NFA uses; cited from memory). Thompson's
construction numbers the copies of a repeat in order, so the distances are few
(two per class for ``(a|b)*a(a|b){16}``) however long the pattern is.

The breadth-first exploration, the numbering of configurations and the state
cap are those of ``pfuzz.automata.dfa.explore``; the result is the same DFA
state for state (the minimal DFA is canonical either way). The
work budget is charged the words of each new configuration, which bounds the
memory the configurations take: a search for ``.{8000}`` holds up to 8,001
threads per configuration, 126 words, where a set of states would cost 8,001
objects.

Cost: per step, one AND, one shift and one OR per distance of the class, on
integers of (character states / 64) words; one dictionary lookup per step.
Measured with ``python -m pfuzz.benchmarks compile``.
"""

from __future__ import annotations

from pfuzz.automata.construction.determinise import Determiniser
from pfuzz.automata.dfa import DFA, explore
from pfuzz.automata.nfa import ASSERT, CHAR, NFA
from pfuzz.base.charset import CharSet


#: Character states up to which the bit-parallel path is taken first (configurations of at
#: most 1 KiB); past it, only where the set-based path runs out of its work budget.
BIT_STATES = 8192
#: Most word operations (shifts and target groups) one class may take per step.
MAX_GROUPS = 64


def applies(nfa: NFA) -> bool:
    """Whether ``explore_bits`` can build ``nfa``'s DFA: it has no assertion edges."""
    return ASSERT not in nfa.kinds


def explore_bits(runner: Determiniser, classes: list[CharSet], alphabet: CharSet, cap: int,
                 back: int, first: bool = True) -> DFA | None:
    """The DFA of ``runner``'s NFA (which ``applies``), explored breadth-first from the
    configuration of look-back state ``back``; ``StateLimitError`` past ``cap`` states.

    None where the bits would cost more than sets: a class needs more than ``MAX_GROUPS``
    word operations a step or, as the ``first`` choice, the NFA has more than ``BIT_STATES``
    character states (each configuration costs words up to its highest state, so a long
    chain of sparse configurations, ``[0-9]{20000}``, is cheaper as sets, while dense ones,
    a search for ``.{8000}``, only fit as bits)."""
    nfa = runner.nfa
    chars = [s for s, kind in enumerate(nfa.kinds) if kind == CHAR]
    if first and len(chars) > BIT_STATES:
        return None
    bit = {s: i for i, s in enumerate(chars)}
    moves = [_class_moves(runner, c, bit) for c in range(len(classes))]
    if any(len(shifts) + len(groups) > MAX_GROUPS for shifts, groups, _ in moves):
        return None
    final = 1 << bit[nfa.final] if runner.sink is not None else 0  # L·U*: reaching it is the sink
    start = _encode(runner.start(back), runner, bit, final)
    charge = runner.judge.charge
    return explore(start, _stepper(moves, final), lambda value: bool(value & 1 or (value >> 1) & final),
                   classes, alphabet, cap, weigh=lambda value: charge(1 + value.bit_length() // 64))


def _class_moves(runner: Determiniser, c: int, bit: dict[int, int]) -> tuple[tuple, tuple, int]:
    """Class ``c``'s moves: ((distance, sources), ...) for the distances two or more moves share,
    ((sources, targets), ...) for the rest grouped by target set, and the states whose move ends."""
    table = runner.table(c, runner.lookback.next(runner.lookback.start, c))
    moves = [(bit[s], [bit[t] for t in targets]) for s, targets in table.plain.items()]
    shared: dict[int, int] = {}
    for here, there in moves:
        for t in there:
            shared[t - here] = shared.get(t - here, 0) + 1
    by_distance: dict[int, list[int]] = {}
    by_targets: dict[tuple, list[int]] = {}
    for here, there in moves:
        rest = []
        for t in there:
            if shared[t - here] > 1:
                by_distance.setdefault(t - here, []).append(here)
            else:
                rest.append(t)
        if rest:
            by_targets.setdefault(tuple(sorted(rest)), []).append(here)
    return (tuple((d, _mask(found)) for d, found in sorted(by_distance.items())),
            tuple((_mask(found), _mask(targets)) for targets, found in by_targets.items()),
            _mask([bit[s] for s in table.enders]))


def _mask(positions) -> int:
    """The integer with the bits at ``positions`` set (in time linear in its length)."""
    if not positions:
        return 0
    buffer = bytearray(max(positions) // 8 + 1)
    for p in positions:
        buffer[p >> 3] |= 1 << (p & 7)
    return int.from_bytes(buffer, "little")


def _encode(config, runner: Determiniser, bit: dict[int, int], final: int) -> int:
    """A configuration of ``determinise`` (plain threads only) as (states << 1) | ending;
    0 is the dead configuration, ``final << 1`` the sink."""
    if config is None:
        return 0
    states = _mask([bit[s] for s in runner.state_sets[config[2][1]]] if len(config) == 3 else [])
    return final << 1 if states & final else (states << 1) | bool(config[0])


def _stepper(moves: list, final: int):
    """The step function of the encoded configurations (see ``_encode``)."""
    sink = final << 1

    def step(value: int, c: int) -> int | None:
        states = value >> 1
        distances, groups, enders = moves[c]
        moved = 0
        for d, mask in distances:
            part = states & mask
            if part:
                moved |= part << d if d >= 0 else part >> -d
        for sources, targets in groups:
            if states & sources:
                moved |= targets
        if moved & final:
            return sink
        return ((moved << 1) | (1 if states & enders else 0)) or None

    return step
