"""The nearest valid string to a text, and the edit script between them.

Method: the correction dynamic program of R. A. Wagner, "Order-n correction
for regular languages" (CACM 17(5), 1974), over the minimal DFA, extended
with the adjacent-swap step so that it computes the same optimal string
alignment (OSA) distance as ``pfuzz.nearmiss``. The graph has a node (i, q)
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
optimal path. The edit script is the one alignment that pass followed.

Direction and positions. ``edits`` turn the witness into the text: applied
one after another to the witness, each to the string the previous ones
made, they give the text. Positions count in that string, which is the same
as counting in the text, because the edits come in order of position:
``replace '0' with 'O' at 4`` means the witness had '0' where the text has
'O' at index 4; ``delete '7' at 5`` means the witness had a '7' the text
lacks just before text index 5.

Cost: with a bound b on the distance, only nodes within b edits of the end
are kept, so explaining a near miss (b = 1 or 2) touches a few nodes per
text position. ``explain`` deepens the bound 1, 2, 4, ... up to
len(text) + the shortest valid length, which always suffices; at the top it
is Wagner's O(len(text) × states × classes) program. Tables per DFA (class
lookup, predecessor lists) are built once and cached.
"""

from __future__ import annotations

import heapq
from dataclasses import dataclass

from . import dfa as automata
from .dfa import DEAD, DFA
from .errors import EmptyLanguageError


@dataclass(frozen=True)
class Edit:
    """One step of an edit script (see the module docstring for direction and positions)."""

    kind: str        # delete, insert, replace or swap
    position: int
    old: str         # the witness characters the step removes ("" for insert)
    new: str         # the characters it writes ("" for delete)

    def apply(self, text: str) -> str:
        p = self.position
        if text[p:p + len(self.old)] != self.old:
            raise ValueError(f"{self} does not apply to {text!r}")
        return text[:p] + self.new + text[p + len(self.old):]

    def __str__(self) -> str:
        if self.kind == "delete":
            return f"delete {self.old!r} at {self.position}"
        if self.kind == "insert":
            return f"insert {self.new!r} at {self.position}"
        if self.kind == "replace":
            return f"replace {self.old!r} with {self.new!r} at {self.position}"
        return f"swap {self.old[0]!r} and {self.old[1]!r} at {self.position}"

    def as_dict(self) -> dict:
        return {"kind": self.kind, "position": self.position, "old": self.old, "new": self.new}


def apply_edits(witness: str, edits) -> str:
    """The text an edit script makes from its witness."""
    for edit in edits:
        witness = edit.apply(witness)
    return witness


@dataclass(frozen=True)
class Explanation:
    """Verdict on a text, its nearest valid string and the edits from that string to it."""

    text: str
    accepted: bool
    witness: str
    distance: int
    edits: tuple[Edit, ...]

    def __str__(self) -> str:
        if self.accepted:
            return f"accepted: {self.text!r}"
        lines = [f"rejected: {self.text!r}",
                 f"nearest valid string: {self.witness!r} (distance {self.distance})",
                 "edits that turn it into the text:"]
        lines += [f"  {edit}" for edit in self.edits]
        return "\n".join(lines)

    def as_dict(self) -> dict:
        return {"text": self.text, "accepted": self.accepted, "witness": self.witness,
                "distance": self.distance, "edits": [e.as_dict() for e in self.edits]}


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
        self.out = [_targets(dfa, q) for q in range(n)]
        self.shortest = automata.min_length(dfa)
        self._class_of: dict[str, int] = {}

    def classes_of(self, text: str) -> list[int]:
        cache = self._class_of
        out = []
        for ch in text:
            c = cache.get(ch)
            if c is None:
                c = cache[ch] = self.dfa.class_of(ch)
            out.append(c)
        return out

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
        m = len(text)
        ceiling = m + self.shortest
        b = min(bound or 1, ceiling)
        while True:
            unit = m + b + 2
            h = self._costs(text, cls, b, unit)
            best = h[0].get(0)
            if best is not None:
                break
            b = min(2 * b, ceiling)
        witness, edits = self._walk(text, cls, h, best, unit)
        return Explanation(text, False, witness, best // unit, edits)

    def _swappable(self, text: str, cls: list[int], i: int) -> bool:
        return (i + 1 < len(text) and text[i] != text[i + 1]
                and cls[i] >= 0 and cls[i + 1] >= 0)

    def _costs(self, text: str, cls: list[int], bound: int, unit: int) -> list[dict]:
        """h[i][q]: least weight from node (i, q) to the end, for nodes within ``bound`` edits."""
        m = len(text)
        limit = (bound + 1) * unit
        pred, pred_any = self.pred, self.pred_any
        h: list[dict] = [{} for _ in range(m + 2)]
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
            if self._swappable(text, cls, i):
                z = pred[cls[i + 1]]
                for q, w in h[i + 2].items():
                    v = w + unit + 2
                    if v < limit:
                        for p1 in into[q]:
                            for p in z[p1]:
                                if v < get(p, limit):
                                    layer[p] = v
            h[i] = self._close(layer, unit, limit) if layer else layer
        return h

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
    def _walk(self, text, cls, h, best, unit) -> tuple[str, tuple[Edit, ...]]:
        """Write the witness: at each step the least character that keeps an optimal path."""
        m = len(text)
        frontier = self._extra_characters({(0, 0): (0, None)}, h, best, unit, m)
        written = []
        for _ in range(best % unit):
            options: list[tuple] = []
            for node, (g, trail) in frontier.items():
                self._moves(node, best - g, g, trail, text, cls, h, unit, options)
            ch = min(option[0] for option in options)
            chosen: dict = {}
            for c, node, g, trail in options:
                if c == ch and (node not in chosen or g < chosen[node][0]):
                    chosen[node] = (g, trail)
            written.append(ch)
            frontier = self._extra_characters(chosen, h, best, unit, m)
        end = next(node for node in frontier if len(node) == 2 and node[0] == m)
        return "".join(written), self._script(frontier[end][1], text)

    def _moves(self, node, room, g, trail, text, cls, h, unit, options) -> None:
        """Append (character, node, weight so far, trail) for each optimal edge that writes.

        ``room`` is the weight left to the optimum; an edge to node v of weight
        w stays optimal when h(v) == room - w.
        """
        table, edit = self.table, unit + 1
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
                if self._swappable(text, cls, i):
                    half = row[cls[i + 1]]
                    after = table[half][x] if half != DEAD else DEAD
                    if after != DEAD and h[i + 2].get(after) == need - 1:
                        options.append((text[i + 1], (i, half, 1), g + edit, (("swap", i), trail)))
        if room >= edit:
            need, here = room - edit, h[i]
            for t, first, _ in self.out[q]:
                if here.get(t) == need:
                    options.append((first, (i, t), g + edit, (("delete", i, first), trail)))

    def _extra_characters(self, frontier: dict, h, best, unit, m) -> dict:
        """Close the frontier under text characters the witness lacks (they write nothing)."""
        out = dict(frontier)
        heap = [node for node, (g, _) in out.items()
                if len(node) == 2 and node[0] < m and best - g >= unit]
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


def _targets(dfa: DFA, q: int) -> list[tuple[int, str, str | None]]:
    """Live targets of q with the two least characters leading there, by least character."""
    chars: dict[int, list[int]] = {}
    for c, t in enumerate(dfa.table[q]):
        if t != DEAD:
            cls = dfa.classes[c]
            chars.setdefault(t, []).extend(cls.nth(j) for j in range(min(2, len(cls))))
    out = []
    for t, points in chars.items():
        least = sorted(points)[:2]
        out.append((t, chr(least[0]), chr(least[1]) if len(least) > 1 else None))
    return sorted(out, key=lambda item: item[1])


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


def nearest(dfa: DFA, text: str, bound: int | None = None) -> Explanation:
    """``explain`` with a first guess ``bound`` at the distance (used by the reject sampler)."""
    return corrector(dfa).nearest(text, bound)


def explain(dfa: DFA, text: str) -> Explanation:
    """Verdict, nearest valid string (shortlex-least), distance and edit script for ``text``.

    Raises ``EmptyLanguageError`` for a rejected text when the language is empty.
    """
    return corrector(dfa).nearest(text)
