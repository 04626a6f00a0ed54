"""DOT text of a minimal DFA (pfuzz.automata.drawing).

Edge labels are ``re`` class texts; each is checked with Python's ``re``
(the reference matcher) against the characters of the transition it labels.
"""

from __future__ import annotations

import re

import pfuzz
from helpers import flat_transitions
from pfuzz.automata.drawing import to_dot

EDGE = re.compile(r'^  s(\d+) -> s(\d+) \[label="((?:[^"\\]|\\.)*)"\];$', re.M)
NODE = re.compile(r'^  s(\d+) \[label="\d+"(, shape=doublecircle)?\];$', re.M)


def dot_unquote(text: str) -> str:
    """Undo DOT string escaping (backslash-quote and double backslash)."""
    return re.sub(r"\\(.)", r"\1", text)


def test_states_start_and_accepting_states():
    lang = pfuzz.compile("[A-Z]{2}-[0-9]{1,2}")
    dot = to_dot(lang.dfa, title="[A-Z]{2}-[0-9]{1,2}")
    nodes = NODE.findall(dot)
    assert len(nodes) == lang.states
    assert {int(n) for n, double in nodes if double} == set(lang.dfa.accepting)
    assert "  start -> s0;" in dot and dot.startswith("digraph dfa {") and dot.endswith("}\n")
    assert 'label="[A-Z]{2}-[0-9]{1,2}"; labelloc=t;' in dot


def test_parallel_classes_become_one_edge_with_a_readable_label():
    lang = pfuzz.compile(r"[a-c]x|[x-z]x|,")
    found = EDGE.findall(to_dot(lang.dfa))
    pairs = [(s, t) for s, t, _ in found]
    assert len(pairs) == len(set(pairs))  # one edge per pair of states
    labels = {dot_unquote(label) for _, _, label in found}
    assert "[a-cx-z]" in labels and "," in labels


def test_labels_match_exactly_the_characters_of_their_transition():
    for pattern in [r'[^,"]+', r'\d{2}\.\d', r'"[^"\\]*"', r"(?i)ab|\s"]:
        lang = pfuzz.compile(pattern)
        expected = {(s, t): label for s, label, t in flat_transitions(lang.dfa)}
        for s, t, label in EDGE.findall(to_dot(lang.dfa, title=pattern)):
            chars = expected[int(s), int(t)]
            compiled = re.compile(dot_unquote(label))  # reference: Python's re
            for point in range(0x20, 0x7F):
                assert bool(compiled.fullmatch(chr(point))) == (point in chars), (pattern, label)


def test_empty_language_is_one_plain_state():
    dot = to_dot(pfuzz.compile("[^\\s\\S]").dfa)
    assert NODE.findall(dot) == [("0", "")] and not EDGE.findall(dot)
