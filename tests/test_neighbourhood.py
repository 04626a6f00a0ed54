"""The edit-neighbourhood automaton: antichain cuts, range edges, the edges-mode definition."""

from __future__ import annotations

import random
import re

import pytest

import pfuzz
from helpers import strings_upto
from pfuzz.automata import dfa as automata
from pfuzz.automata.minimise import minimise
from pfuzz.nearmiss import neighbourhood
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.nearmiss.neighbourhood import build, edge_characters


@pytest.mark.parametrize("seed", range(6))
def test_cutting_dominated_states_keeps_the_language(seed, monkeypatch):
    rng = random.Random(seed)
    pattern = "".join(rng.choice(["a", "b", "[ab]", "(ab)?", "a*", "(a|bb)"]) for _ in range(4))
    dfa = pfuzz.compile(pattern, alphabet="[ab]").dfa
    kinds = tuple(rng.sample(EDIT_KINDS, rng.randint(1, 4)))
    cut = build(dfa, 2, kinds, False)
    monkeypatch.setattr(neighbourhood, "beaten", lambda sim: [0] * (sim.shape[0] - 1))
    assert build(dfa, 2, kinds, False) == cut


def test_edge_characters_are_just_outside_each_transition():
    lang = pfuzz.compile("[0-5]")
    (only,) = edge_characters(lang.dfa)[0].values()
    assert only == {ord("/"), ord("6")}


def test_edges_stop_at_the_alphabet():
    lang = pfuzz.compile("[ -!]x")
    first = edge_characters(lang.dfa)[0]
    assert set(first.values()) == {frozenset({ord('"')})}  # no U+001F in printable ASCII


# -- range edges: the cuts and the definition ---------------------------------------------

def edges_pattern(rng: random.Random) -> str:
    """A small pattern over a-e whose classes leave characters just outside them."""
    atoms = ["a", "c", "e", "[b-c]", "[a-b]", "[c-e]", "[bd]", "(b|de)", "[b-d]*", "c?"]
    return "".join(rng.choice(atoms) for _ in range(rng.randint(2, 3)))


LETTERS = "abcde"


def label_edges(dfa, q: int, t: int) -> set[str]:
    """The letters just outside the label of q -> t: the label read off the DFA's table one
    letter at a time, its edges as the neighbours (code point +-1) of its letters that are
    neither in it nor outside the alphabet (lo-1 and hi+1 of each maximal range)."""
    label = {ord(x) for x in LETTERS if dfa.run(x, q) == t}
    return {chr(p) for x in label for p in (x - 1, x + 1)
            if p not in label and chr(p) in LETTERS}


def one_edge_edit(w: str, dfa) -> set[str]:
    """Every string one edit from w, writing only range-edge characters (the definition)."""
    path = [dfa.run(w[:i]) for i in range(len(w) + 1)]
    out = set()
    for i in range(len(w) + 1):
        q = path[i]
        live = {dfa.run(x, q) for x in LETTERS} - {-1}
        out.update(w[:i] + x + w[i:] for t in live for x in label_edges(dfa, q, t))
        if i < len(w):
            out.add(w[:i] + w[i + 1:])
            out.update(w[:i] + x + w[i + 1:] for x in label_edges(dfa, q, path[i + 1]))
        if i + 1 < len(w) and w[i] != w[i + 1]:
            out.add(w[:i] + w[i + 1] + w[i] + w[i + 2:])
    return out


@pytest.mark.parametrize("seed", range(8))
def test_edges_mode_is_its_definition(seed):
    # Reference: re.fullmatch (the standard library) decides membership; the
    # one-edit strings are written out from the definition in the module
    # docstring, over the transition labels of the minimal DFA (read letter by letter
    # here, not with the module's own edge_characters).
    pattern = edges_pattern(random.Random(seed))
    rx, lang = re.compile(pattern), pfuzz.compile(pattern, alphabet="[a-e]")
    expected = set()
    for w in strings_upto("abcde", 5):
        if rx.fullmatch(w):
            expected |= {s for s in one_edge_edit(w, lang.dfa) if len(s) <= 4}
    expected = {s for s in expected if not rx.fullmatch(s)}
    nm = build(lang.dfa, 1, EDIT_KINDS, True)
    assert {s for s in strings_upto("abcde", 4) if nm.accepts(s)} == expected, pattern


@pytest.mark.parametrize("seed", range(8))
def test_edges_mode_cuts_keep_the_language(seed, monkeypatch):
    rng = random.Random(seed)
    dfa = pfuzz.compile(edges_pattern(rng), alphabet="[a-e]").dfa
    kinds = tuple(rng.sample(EDIT_KINDS, rng.randint(2, 4)))
    distance = 2 + seed % 2
    cut = build(dfa, distance, kinds, True)
    monkeypatch.setattr(neighbourhood, "beaten", lambda sim: [0] * (sim.shape[0] - 1))
    assert build(dfa, distance, kinds, True) == cut


@pytest.mark.parametrize("edges", [False, True])
def test_the_unrolled_distance_one_step_is_the_general_step(edges):
    for seed in range(6):
        dfa = pfuzz.compile(edges_pattern(random.Random(seed)), alphabet="[a-e]").dfa
        plan = neighbourhood._Neighbourhood(dfa, 1, EDIT_KINDS, edges)
        built = [minimise(automata.explore(plan.start(), step, plan.is_accepting,
                                                    plan.classes, dfa.alphabet))
                 for step in (plan.step, plan.step_one)]
        assert built[0] == built[1] == build(dfa, 1, EDIT_KINDS, edges)
