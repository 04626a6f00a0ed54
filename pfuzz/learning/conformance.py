"""Equivalence queries without an oracle of equivalence: tests derived from two automata.

Four families of test words. The state tests and the probes are generated lazily (a test is
made when it is asked for, so memory stays linear in the hypothesis, never in the size of a
suite); the differences are a list, linear in the product's size:

- ``difference_witnesses(model, specification, d)``: the exact comparison with the
  specification. For every reachable pair of states of the product automaton (Rabin & Scott,
  1959) from which a difference can be reached, and every path of up to ``d`` classes out of
  it, the shortlex-least string of the symmetric difference that passes through the pair and
  then the path: the pair's shortlex-least access string, the path, and the shortlex-least
  completion (a breadth-first search backwards from the pairs that disagree). The first of
  them is the shortlex-least difference (``pfuzz.automata.algebra.distinguish``); the others
  are the next differences, several per region of the product, so that one confirmed
  disagreement does not hide the others, even where the validator tells apart states that
  both the model and the specification merge (a leap day in a year the validator otherwise
  refuses: the learner asks with ``d = 1`` and, once that finds nothing, ``d = k + 1``).
  Cost: O(pairs × classes^d) words.
- ``state_tests(tree, hypothesis, n)``: the words ``access(q)·m·w`` for every state ``q``,
  every word ``m`` of ``n`` representatives, and every suffix ``w`` of the identifier of the
  state that ``access(q)·m`` reaches in the hypothesis. These are the tests of the Wp-method
  (S. Fujiwara, G. v. Bochmann, F. Khendek, M. Amalou and A. Ghedamsi, "Test selection based on
  finite state models", IEEE TSE 17(6), 1991), in the variant whose state identifiers are
  *harmonised* (any two share a suffix that tells them apart): the discrimination tree's paths
  are such identifiers, and the tree already tells every pair of states apart, so the
  Wp-method's first phase (the whole characterisation set after every access string, which
  costs states² queries) is not needed. With ``n`` from 0 to k + 1 these words make a test
  suite that is complete for validators of at most (states + k) states (the W-method's bound,
  T. S. Chow, "Testing software design modeled by finite-state machines", IEEE TSE 4(3),
  1978), provided the hypothesis agrees with its own tree (``n = 0``, which asks nothing new).
  ``n = 1`` is exactly the sifting of the transitions, also already asked. Size: states ×
  classes^n × (tree depth).
- ``specification_probes(spec, symbols)``: every probe of every class in place of the class's
  representative after every state of the specification, completed to acceptance: the
  range edges and interior characters tried at every position the specification knows of,
  so that an edge moved at a later position is found even when the hypothesis is still far
  from the validator. Size: spec states × probes.
- ``probe_tests(tree, hypothesis, skip, k)``: every probe of every class asked in place of the
  class's representative after the access string of every state that does not behave as the
  specification state its access string reaches (those are probed by
  ``specification_probes``), followed by up to k representatives and the identifier of the
  state reached; each test carries the word with the representative, whose answer it must
  match (a mismatch splits the class, ``pfuzz.learning.symbols``). Size: such states × probes
  × classes^k × (tree depth).
"""

from __future__ import annotations

import itertools
from typing import Iterator

from pfuzz.automata.dfa import DEAD, DFA
from pfuzz.base.charset import partition
from pfuzz.learning.discrimination import Tree
from pfuzz.learning.symbols import Symbols

__all__ = ["difference_witnesses", "matched_states", "state_tests", "probe_tests",
           "specification_probes"]


def difference_witnesses(a: DFA, b: DFA, depth: int = 1) -> list[tuple[str, bool]]:
    """Shortlex-least differences of ``a`` and ``b`` through every reachable product pair and
    every path of at most ``depth`` classes out of it; deduplicated, in shortlex order (none
    when equal), each with whether ``b`` accepts it.

    ``a``'s classes should refine ``b``'s (the hypothesis over the learner's classes), so that
    every class of the learner is tried after every pair.
    """
    graph, suffix, end = _product(a, b)
    words: dict[str, bool] = {}
    for i in range(len(graph.nodes)):
        if suffix[i] is None:
            continue
        paths = [("", i)]
        for _ in range(depth + 1):
            grown = []
            for path, j in paths:
                words[graph.access[i] + path + suffix[j]] = graph.nodes[end[j]][1] in b.accepting
                grown.extend((path + char, k) for char, k in graph.successors[j]
                             if suffix[k] is not None)
            paths = grown
    return sorted(words.items(), key=lambda item: (len(item[0]), item[0]))


def matched_states(a: DFA, b: DFA, access: list[str]) -> set[int]:
    """The states ``q`` of ``a`` whose language equals that of the state of ``b`` reached by
    ``access[q]``, where that state is live."""
    graph, suffix, _ = _product(a, b)
    same = {pair for pair, rest in zip(graph.nodes, suffix) if rest is None and pair[1] >= 0}
    return {q for q, word in enumerate(access) if (q, b.run(word)) in same}


def _product(a: DFA, b: DFA):
    """The reachable product of ``a`` and ``b`` and, per pair, the shortest way to a difference."""
    classes = partition(list(a.classes) + list(b.classes), a.alphabet)
    columns = [(a.class_of(c.min), b.class_of(c.min)) for c in classes]

    def step(pair, column):
        (sa, sb), (ca, cb) = pair, column
        nxt = (a.table[sa][ca] if sa >= 0 else DEAD, b.table[sb][cb] if sb >= 0 else DEAD)
        return None if nxt == (DEAD, DEAD) else nxt

    graph = _Graph((0, 0), step, columns, [chr(c.min) for c in classes])
    suffix, end = graph.completions(lambda pair: (pair[0] in a.accepting) != (pair[1] in b.accepting))
    return graph, suffix, end


class _Graph:
    """The part of an automaton reachable from ``start``, breadth first, edges in the given
    order (by least character), with each node's shortlex-least access string."""

    def __init__(self, start, step, columns, chars):
        self.index = index = {start: 0}
        self.nodes, self.access, self.successors = [start], [""], []
        i = 0
        while i < len(self.nodes):
            row = []
            for column, char in zip(columns, chars):
                nxt = step(self.nodes[i], column)
                if nxt is None:
                    continue
                j = index.get(nxt)
                if j is None:
                    j = index[nxt] = len(self.nodes)
                    self.nodes.append(nxt)
                    self.access.append(self.access[i] + char)
                row.append((char, j))
            self.successors.append(row)
            i += 1

    def completions(self, goal) -> tuple[list[str | None], list[int]]:
        """Per node, the shortlex-least shortest path to a node where ``goal`` holds (None where
        there is none), and the node it ends at (a breadth-first search backwards)."""
        predecessors: list[list[int]] = [[] for _ in self.nodes]
        for i, row in enumerate(self.successors):
            for _, j in row:
                predecessors[j].append(i)
        distance = [-1] * len(self.nodes)
        order = [i for i, node in enumerate(self.nodes) if goal(node)]
        for i in order:
            distance[i] = 0
        for j in order:  # grows while it is read: a queue
            for i in predecessors[j]:
                if distance[i] < 0:
                    distance[i] = distance[j] + 1
                    order.append(i)
        suffix: list[str | None] = [None] * len(self.nodes)
        end = list(range(len(self.nodes)))
        for i in order:
            if distance[i] == 0:
                suffix[i] = ""
                continue
            char, j = next((c, j) for c, j in self.successors[i] if distance[j] == distance[i] - 1)
            suffix[i], end[i] = char + suffix[j], end[j]
        return suffix, end


def state_tests(tree: Tree, hypothesis: DFA, length: int) -> Iterator[tuple[str, bool]]:
    """``access(q)·m·w`` for |m| = ``length`` (representatives), with the hypothesis' answer."""
    reps = [chr(c.min) for c in hypothesis.classes]
    columns = range(len(reps))
    table, accepting = hypothesis.table, hypothesis.accepting
    identifiers: dict[int, list[tuple[str, bool]]] = {}
    for q, access in enumerate(tree.access):
        for middle in itertools.product(range(len(reps)), repeat=length):
            target = q
            for c in middle:
                target = table[target][columns[c]]  # the tree's hypothesis is complete
            if target not in identifiers:
                identifiers[target] = [(suffix, hypothesis.run(suffix, target) in accepting)
                                       for suffix in tree.identifier(target)]
            word = access + "".join(reps[c] for c in middle)
            for suffix, answer in identifiers[target]:
                yield word + suffix, answer


def probe_tests(tree: Tree, hypothesis: DFA, skip: set[int],
                length: int) -> Iterator[tuple[str, tuple[str, str, str, str]]]:
    """Each probe in place of its representative after the access string of each state not in
    ``skip``, then ``m·w`` for every ``m`` of at most ``length`` representatives and every
    suffix ``w`` of the identifier of the state the representative and ``m`` lead to:
    ``(word, (reference, before, probe, after))``, shortest ``m`` first."""
    symbols, table = tree.symbols, hypothesis.table
    reps = [chr(c.min) for c in hypothesis.classes]
    identifiers: dict[int, list[str]] = {}
    for n in range(length + 1):
        for a in symbols.ordered():
            rep = symbols.representative(a)
            others = [p for p in symbols.classes[a].probes if p != rep]
            column = hypothesis.class_of(rep)
            for q, access in enumerate(tree.access):
                if q in skip or not others:
                    continue
                for middle in itertools.product(range(len(reps)), repeat=n):
                    target = table[q][column]
                    for c in middle:
                        target = table[target][c]
                    if target not in identifiers:
                        identifiers[target] = tree.identifier(target)
                    word = "".join(reps[c] for c in middle)
                    for suffix in identifiers[target]:
                        after = word + suffix
                        for probe in others:
                            yield access + probe + after, (access + rep + after, access, probe, after)


def specification_probes(spec: DFA, symbols: Symbols) -> Iterator[tuple[str, tuple[str, str, str, str]]]:
    """Each probe in place of its representative after every state of the specification:
    reached by its shortlex-least access string, completed by the shortlex-least shortest
    accepted suffix of where the class leads (where it leads nowhere, by the rest of the
    state's own shortest suffix, as in a replaced character). Same form as ``probe_tests``."""
    order = symbols.ordered()
    reps = [symbols.representative(a) for a in order]
    columns = [spec.class_of(rep) for rep in reps]
    graph = _Graph(0, lambda s, c: spec.table[s][c] if spec.table[s][c] >= 0 else None,
                   columns, reps)
    suffix, _ = graph.completions(lambda s: s in spec.accepting)
    for i, state in enumerate(graph.nodes):
        if suffix[i] is None:
            continue
        before, own = graph.access[i], suffix[i]
        for a, rep, column in zip(order, reps, columns):
            target = spec.table[state][column]
            if target >= 0:
                after = suffix[graph.index[target]]
            elif own:
                after = own[1:]
            else:
                continue
            for probe in symbols.classes[a].probes:
                if probe != rep:
                    yield before + probe + after, (before + rep + after, before, probe, after)
