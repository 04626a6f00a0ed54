"""The nearest valid string to a text, and the edit script between them.

Method: the correction dynamic program of R. A. Wagner, "Order-n correction
for regular languages" (CACM 17(5), 1974), over the minimal DFA, extended
with the adjacent-swap step so that it computes the same optimal string
alignment (OSA) distance as ``pfuzz.nearmiss.rejects``. The graph has a node (i, q)
for "the first i characters of the text are aligned, the witness has led the
DFA to q", and edges for a match (cost 0), a substitution, an extra text
character, a missing text character (a witness character the text lacks) and
a swap of text[i], text[i+1] (cost 1 each). A swap consumes both characters
at once, so no substring is edited twice.

Shortlex-least witness. Among the strings of L at the least distance D the
witness is the shortest, then the least by code points. Edge weights are
pairs (edits, witness characters written) folded into one integer
``edits * unit + written``; a backward pass gives every node its least
weight to the end, layer by layer from the end of the text (deletions stay
in a layer and are closed with Dijkstra's algorithm). A forward pass then
writes the witness one character at a time: among all nodes still on an
optimal path it takes the least next character that keeps some node on an
optimal path. The edit script (``pfuzz.nearmiss.edits``: edits that turn the
witness into the text) is the alignment that pass followed.

Distance 1 first. Most texts explained are near misses one edit away, so
``nearest`` first tries every single edit of the text at the positions its
own run reaches (the run forward, the states accepting each suffix
backward, as bitsets whose preimages are memoised per class and set, since
the suffixes of many texts lead to the same sets): O(len(text) ×
out-degree) bit tests (times per text: ``python -m pfuzz.benchmarks
components``). Only when no single edit works does the program above
run, with a bound b on the distance that keeps only nodes within b edits of
the end, deepened 2, 4, 8, ... up to len(text) + the shortest valid length,
which always suffices; at the top it is Wagner's O(len(text) × states ×
classes) program. Tables per DFA (class lookup, predecessor lists, live
targets with their least characters) are built once and cached.
"""

from __future__ import annotations

import heapq

from pfuzz.automata import algebra
from pfuzz.base.charset import CharSet
from pfuzz.automata.dfa import DEAD, DFA, transitions
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.nearmiss.edits import Edit, Explanation, apply_edits
from pfuzz.errors import EmptyLanguageError

__all__ = ["corrector", "explain", "nearest"]


#: Bits the memo of ``_states_before`` may hold before it starts afresh (about 32 MB).
MEMO_BITS = 1 << 28


class _Corrector:
    """Per-DFA tables for the correction program."""

    def __init__(self, dfa: DFA):
        self.dfa = dfa
        n, k = dfa.n_states, len(dfa.classes)
        self.table = dfa.table
        self.final = sorted(dfa.accepting)
        self.pred = [[[] for _ in range(n)] for _ in range(k)]
        any_pred = [set() for _ in range(n)]
        for q, row in enumerate(dfa.table):
            for c, t in enumerate(row):
                if t != DEAD:
                    self.pred[c][t].append(q)
                    any_pred[t].add(q)
        self.pred_any = [sorted(ps) for ps in any_pred]
        # pred_bits[c][t]: the predecessors of t under c as a bitset, made when first asked
        # (n bits each: all of them at once would take memory quadratic in the states)
        self.pred_bits: list[dict[int, int]] = [{} for _ in range(k)]
        self.final_bits = sum(1 << f for f in self.final)
        self._before: list[dict[int, int]] = [{} for _ in range(k)]
        self._remembered = 0
        self.out = [_targets(row) for row in transitions(dfa)]
        self.out_bits = [sum(1 << t for t, _, _ in row) for row in self.out]
        self.shortest = algebra.min_length(dfa)
        self._class_of = _ClassCache(dfa)

    def classes_of(self, text: str) -> list[int]:
        return list(map(self._class_of.__getitem__, text))

    def accepts(self, cls: list[int]) -> bool:
        q, table = 0, self.table
        for c in cls:
            if c < 0:
                return False
            q = table[q][c]
            if q < 0:
                return False
        return q in self.dfa.accepting

    # -- the program ---------------------------------------------------------------------
    def nearest(self, text: str, bound: int | None = None) -> Explanation:
        """Explain ``text``; ``bound`` is a first guess at the distance (deepened as needed)."""
        cls = self.classes_of(text)
        if self.accepts(cls):
            return Explanation(text, True, text, 0, ())
        if self.shortest is None:
            raise EmptyLanguageError("the language is empty: there is no valid string to "
                                     "compare the text with")
        quick = self._one_edit(text, cls)
        if quick is not None:
            return quick[0]
        ceiling = len(text) + self.shortest
        b = min(max(bound or 2, 2), ceiling)
        while True:
            problem = _Problem(text, cls, b)
            self._costs(problem, b)
            if problem.best is not None:
                break
            b = min(2 * b, ceiling)
        witness, edits = self._walk(problem)
        return Explanation(text, False, witness, problem.best // problem.unit, edits)

    def one_edit(self, text: str) -> "tuple[Explanation, tuple[str, ...]] | None":
        """For a rejected text one edit from L: its explanation and every kind of edit
        (from some valid string) that makes it; None otherwise."""
        cls = self.classes_of(text)
        return None if self.accepts(cls) else self._one_edit(text, cls)

    def _one_edit(self, text: str, cls: list[int]):
        """The answer when the text is one edit from L, else None (the common case, made fast).

        Every string at distance 1 is one edit of the text at a position the
        text's own run still reaches, landing in a state that accepts the rest:
        ``run[i]`` is the state after text[:i], ``rest[i]`` the set (a bitset)
        of states from which text[i:] is accepted. The candidates are noted as
        (witness length, position, kind, character); only those of the least
        length (the shortlex order puts them first) are written out and compared.
        Ties between scripts for the same witness go to the leftmost edit.
        """
        table, m = self.table, len(text)
        run, q = [0], 0
        for c in cls:
            if c < 0:
                break
            q = table[q][c]
            if q < 0:
                break
            run.append(q)
        rest = [0] * (m + 2)
        rest[m] = states = self.final_bits
        memo = self._before
        for i in range(m - 1, -1, -1):
            c = cls[i]
            if c < 0 or not states:
                break
            hit = memo[c].get(states)
            rest[i] = states = hit if hit is not None else self._states_before(c, states)
        found = self._candidates(text, cls, run, rest)
        if not found:
            return None
        present = {f[2] for f in found}
        kinds = tuple(k for k in EDIT_KINDS if k in present)
        shortest = min(f[0] for f in found)
        _, witness, i, kind, new = min(
            (length, _written(text, i, kind, new), i, kind, new)
            for length, i, kind, new in found if length == shortest)
        step = (kind, i) if kind in ("insert", "swap") else (kind, i, new)
        return Explanation(text, False, witness, 1, self._script((step, None), text)), kinds

    def _candidates(self, text: str, cls: list[int], run: list[int], rest: list[int]) -> list:
        """Every single edit that gives a valid string: (its length, position, kind, character)."""
        table, m, out, reach = self.table, len(text), self.out, self.out_bits
        found = []
        add = found.append
        for i, q in enumerate(run):
            here, after = rest[i], rest[i + 1]
            if i < m:
                if after >> q & 1:
                    add((m - 1, i, "insert", ""))
                ch = text[i]
                if (here | after) & reach[q]:
                    for t, first, second in out[q]:
                        if after >> t & 1:
                            new = first if first != ch else second
                            if new is not None:
                                add((m, i, "replace", new))
                        if here >> t & 1:
                            add((m + 1, i, "delete", first))
                if i + 1 < m and ch != text[i + 1] and cls[i + 1] >= 0 and cls[i] >= 0:
                    half = table[q][cls[i + 1]]
                    if half != DEAD:
                        last = table[half][cls[i]]
                        if last != DEAD and rest[i + 2] >> last & 1:
                            add((m, i, "swap", ""))
            elif here & reach[q]:
                for t, first, _ in out[q]:
                    if here >> t & 1:
                        add((m + 1, i, "delete", first))
        return found

    def _states_before(self, c: int, states: int) -> int:
        """The states that class c leads into ``states`` (bitsets; memoised, since the
        suffixes of many texts lead to the same sets, up to ``MEMO_BITS`` bits in all)."""
        hit = self._before[c].get(states)
        if hit is None:
            hit, rest, into, column = 0, states, self.pred_bits[c], self.pred[c]
            while rest:
                low = rest & -rest
                t = low.bit_length() - 1
                bits = into.get(t)
                if bits is None:
                    bits = into[t] = sum(1 << p for p in column[t])
                hit |= bits
                rest ^= low
            self._remembered += states.bit_length() + hit.bit_length() + 512
            if self._remembered > MEMO_BITS:
                for memo in self._before:
                    memo.clear()
                self._remembered = 0
            self._before[c][states] = hit
        return hit

    def _costs(self, problem: "_Problem", bound: int) -> None:
        """h[i][q]: least weight from node (i, q) to the end, for nodes within ``bound`` edits."""
        text, cls, swaps, unit = problem.text, problem.cls, problem.swaps, problem.unit
        m = len(text)
        limit = (bound + 1) * unit
        pred, pred_any = self.pred, self.pred_any
        h = problem.h
        h[m] = self._close({f: 0 for f in self.final}, unit, limit)
        for i in range(m - 1, -1, -1):
            layer: dict[int, int] = {}
            get = layer.get
            x = cls[i]
            into = pred[x] if x >= 0 else None
            for q, w in h[i + 1].items():
                if into is not None:
                    v = w + 1  # match
                    for p in into[q]:
                        if v < get(p, limit):
                            layer[p] = v
                v = w + unit  # the text has an extra character
                if v < limit:
                    if v < get(q, limit):
                        layer[q] = v
                    v += 1  # substitution
                    if v < limit:
                        for p in pred_any[q]:
                            if v < get(p, limit):
                                layer[p] = v
            if swaps[i]:
                z = pred[cls[i + 1]]
                for q, w in h[i + 2].items():
                    v = w + unit + 2
                    if v < limit:
                        for p1 in into[q]:
                            for p in z[p1]:
                                if v < get(p, limit):
                                    layer[p] = v
            h[i] = self._close(layer, unit, limit) if layer else layer
        problem.best = h[0].get(0)

    def _close(self, layer: dict, unit: int, limit: int) -> dict:
        """Relax missing-character edges inside one layer (Dijkstra; all weigh unit + 1)."""
        step = unit + 1
        heap = [(w, q) for q, w in layer.items() if w + step < limit]
        if not heap:
            return layer
        heapq.heapify(heap)
        pred_any = self.pred_any
        while heap:
            w, q = heapq.heappop(heap)
            if w != layer[q]:
                continue
            v = w + step
            if v >= limit:
                break
            for p in pred_any[q]:
                if v < layer.get(p, limit):
                    layer[p] = v
                    heapq.heappush(heap, (v, p))
        return layer

    # -- the forward pass ------------------------------------------------------------------
    def _walk(self, problem: "_Problem") -> tuple[str, tuple[Edit, ...]]:
        """Write the witness: at each step the least character that keeps an optimal path."""
        text, best, unit = problem.text, problem.best, problem.unit
        frontier = self._extra_characters({(0, 0): (0, None)}, problem)
        written: list[str] = []
        for _ in range(best % unit):
            if len(frontier) == 1:
                (node, (g, trail)), = frontier.items()
                if len(node) == 2 and best - g < unit:  # no edits left: the rest is text
                    return "".join(written) + text[node[0]:], self._script(trail, text)
            options: list[tuple] = []
            for node, (g, trail) in frontier.items():
                self._moves(problem, node, g, trail, options)
            ch = min(option[0] for option in options)
            chosen: dict = {}
            for c, node, g, trail in options:
                if c == ch and (node not in chosen or g < chosen[node][0]):
                    chosen[node] = (g, trail)
            written.append(ch)
            frontier = self._extra_characters(chosen, problem)
        end = next(node for node in frontier if len(node) == 2 and node[0] == len(text))
        return "".join(written), self._script(frontier[end][1], text)

    def _moves(self, problem: "_Problem", node, g, trail, options) -> None:
        """Append (character, node, weight so far, trail) for each optimal edge that writes.

        ``room`` is the weight left to the optimum; an edge to node v of weight
        w stays optimal when h(v) == room - w.
        """
        text, cls, h = problem.text, problem.cls, problem.h
        table, edit, room = self.table, problem.unit + 1, problem.best - g
        if len(node) == 3:  # second half of a swap: write text[i], land after both
            i, q, _ = node
            t = table[q][cls[i]]
            if t != DEAD and h[i + 2].get(t) == room - 1:
                options.append((text[i], (i + 2, t), g + 1, trail))
            return
        i, q = node
        row = table[q]
        if i < len(text):
            x, ch, ahead = cls[i], text[i], h[i + 1]
            if x >= 0 and row[x] != DEAD and ahead.get(row[x]) == room - 1:
                options.append((ch, (i + 1, row[x]), g + 1, trail))
            if room >= edit:
                need = room - edit
                for t, first, second in self.out[q]:
                    if ahead.get(t) == need:
                        new = first if first != ch else second
                        if new is not None:
                            options.append((new, (i + 1, t), g + edit, (("replace", i, new), trail)))
                if problem.swaps[i]:
                    half = row[cls[i + 1]]
                    after = table[half][x] if half != DEAD else DEAD
                    if after != DEAD and h[i + 2].get(after) == need - 1:
                        options.append((text[i + 1], (i, half, 1), g + edit, (("swap", i), trail)))
        if room >= edit:
            need, here = room - edit, h[i]
            for t, first, _ in self.out[q]:
                if here.get(t) == need:
                    options.append((first, (i, t), g + edit, (("delete", i, first), trail)))

    def _extra_characters(self, frontier: dict, problem: "_Problem") -> dict:
        """Close the frontier under text characters the witness lacks (they write nothing)."""
        best, unit, h, m = problem.best, problem.unit, problem.h, len(problem.text)
        heap = [node for node, (g, _) in frontier.items()
                if len(node) == 2 and node[0] < m and best - g >= unit]
        if not heap:
            return frontier
        out = dict(frontier)
        heapq.heapify(heap)
        done = set()
        while heap:
            node = heapq.heappop(heap)
            if node in done:
                continue
            done.add(node)
            i, q = node
            g, trail = out[node]
            nxt, ng = (i + 1, q), g + unit
            if h[i + 1].get(q) == best - ng and ng < out.get(nxt, (best + 1,))[0]:
                out[nxt] = (ng, (("insert", i), trail))
                if i + 1 < m and best - ng >= unit:
                    heapq.heappush(heap, nxt)
        return out

    @staticmethod
    def _script(trail, text: str) -> tuple[Edit, ...]:
        steps = []
        while trail is not None:
            steps.append(trail[0])
            trail = trail[1]
        edits = []
        for step in reversed(steps):
            kind, i = step[0], step[1]
            if kind == "insert":
                edits.append(Edit("insert", i, "", text[i]))
            elif kind == "replace":
                edits.append(Edit("replace", i, step[2], text[i]))
            elif kind == "delete":
                edits.append(Edit("delete", i, step[2], ""))
            else:
                edits.append(Edit("swap", i, text[i + 1] + text[i], text[i:i + 2]))
        return tuple(edits)


class _Problem:
    """One text being explained: its classes, where swaps are possible, the cost layers."""

    __slots__ = ("text", "cls", "swaps", "unit", "h", "best")

    def __init__(self, text: str, cls: list[int], bound: int):
        m = len(text)
        self.text, self.cls = text, cls
        self.swaps = [i + 1 < m and text[i] != text[i + 1] and cls[i] >= 0 and cls[i + 1] >= 0
                      for i in range(m)]
        self.unit = m + bound + 2  # exceeds any witness length within the bound
        self.h: list[dict] = [{} for _ in range(m + 2)]
        self.best: int | None = None


def _written(text: str, i: int, kind: str, new: str) -> str:
    """The valid string a single edit of ``text`` at ``i`` gives (the witness)."""
    if kind == "insert":  # the text has an extra character: drop it
        return text[:i] + text[i + 1:]
    if kind == "replace":
        return text[:i] + new + text[i + 1:]
    if kind == "delete":  # the text lacks a character: put it back
        return text[:i] + new + text[i:]
    return text[:i] + text[i + 1] + text[i] + text[i + 2:]


class _ClassCache(dict):
    """Character → class index of a DFA (-1 outside its alphabet), filled on first use."""

    def __init__(self, dfa: DFA):
        super().__init__()
        self.dfa = dfa

    def __missing__(self, char: str) -> int:
        c = self[char] = self.dfa.class_of(char)
        return c


def _targets(row: list[tuple[CharSet, int]]) -> list[tuple[int, str, str | None]]:
    """A state's live targets with the two least characters leading there, by least character."""
    return [(t, chr(label.min), chr(label.nth(1)) if len(label) > 1 else None) for label, t in row]


def by_identity(store: dict, dfa: DFA, build, size: int = 32):
    """``build(dfa)``, cached in ``store`` by the automaton's identity (checked, bounded)."""
    hit = store.get(id(dfa))
    if hit is None or hit[0] is not dfa:
        if len(store) >= size:
            store.pop(next(iter(store)))
        hit = store[id(dfa)] = (dfa, build(dfa))
    return hit[1]


_CORRECTORS: dict = {}


def corrector(dfa: DFA) -> _Corrector:
    """The cached correction tables of ``dfa``."""
    return by_identity(_CORRECTORS, dfa, _Corrector)


def clear_caches() -> None:
    """Forget the cached correction tables."""
    _CORRECTORS.clear()


def nearest(dfa: DFA, text: str, bound: int | None = None) -> Explanation:
    """``explain`` with a first guess ``bound`` at the distance (used by the reject sampler)."""
    return corrector(dfa).nearest(text, bound)


def explain(dfa: DFA, text: str) -> Explanation:
    """Verdict, nearest valid string (shortlex-least), distance and edit script for ``text``.

    Raises ``EmptyLanguageError`` for a rejected text when the language is empty.
    """
    return corrector(dfa).nearest(text)
