"""Float tables for bulk uniform sampling by length, sized to the lengths drawn.

Method: the recursive method with floating-point arithmetic, as analysed by
Denise & Zimmermann ("Uniform random generation of decomposable structures
using floating-point arithmetic", TCS 218(2), 1999). For a remaining length r,
a state s and an edge e = (s → t) of the DFA (``width(e)`` characters) the
tables hold the probability that a uniform string of length r from s starts
with one of e's characters,

    q[r][e] = width(e) · T[r-1][t] / T[r][s],

with the counts ``T`` kept as float64 mantissas and separate integer exponents,
so they never overflow or underflow however long the strings.

Pairs. The tables are built only for the (remaining length, state) pairs that a
walk to one of the lengths asked for can meet: a walk to length m is in a state
reachable from the start in exactly i steps (``pfuzz.counting.levels.forward_sets``)
with m − i characters to go. A chain such as ``.{65535,}?`` needs about one pair
per length and remaining length (not states × lengths: 65,536 × 65,568 cells
would be 32 GiB); an automaton whose states are all reachable at most depths
gets every pair of every level up to the longest length. Tables that would
pass ``TABLE_BUDGET`` bytes raise ``ResourceLimitError`` before they are
allocated. Pairs are numbered level by level, and each pair owns a run of
*slots*: one per edge whose target still has strings, plus a padding slot.
When every live state has one edge and all edges carry the same characters
(``[a-z]{1,64}``, ``.{65535,}?``), no pair needs a table at all
(``single_path``): a string of a length that has strings is that many
independent uniform picks.

Alias tables. Each pair's law over its slots is an alias table (Walker's
method), so choosing the next edge costs O(1) whatever the out-degree; a
character is then taken uniformly among the edge's ``width(e)``. Rows of at
most ``ROBIN_HOOD_FANOUT`` slots are built vectorised with Marsaglia's "Robin
Hood" pairing (k-1 rounds of O(rows·k) work); wider rows, one at a time, with
Vose's linear pairing ("A linear algorithm for generating random numbers with
a given distribution", IEEE TSE 17(9), 1991), because the vectorised rounds are
quadratic in k (a 133,548-slot row took 24 s). Both do the same arithmetic per
round (finalise one slot of value at most 1, take the difference from one of
at least 1), so the error bound below holds for either. Slots are one per
character (one draw picks the character and the edge) only when no pair has
more than ``PER_CHARACTER_FANOUT`` characters, which keeps d below small in
that mode. The walk itself is in ``pfuzz.counting.walk``.

Reproducibility: the tables come from correctly rounded IEEE-754 operations
applied in a fixed order, so they are bit-identical everywhere.

Cost: O(P + S) memory for P pairs and S slots (about 24 bytes a slot and 40 a
pair), built with one vectorised pass per level; ``TABLE_BUDGET`` bounds it.

Deviation from exact uniformity (u = 2^-53, d = the largest out-degree, w = the
largest edge width). Levels are of three kinds. At a *uniform* level every pair
has one edge and all those edges carry the same characters: the character is
drawn with ``Generator.integers`` (exact, Lemire's method), so the step is
exact, η_r = 0. At a *straight* level every pair has one edge: the edge is
certain and only the character draw ⌊v·w⌋ from a 53-bit uniform v errs, by at
most w·u, η_r ≤ w·u. At a *branching* level the computed counts are exact up to
a relative error γ_{(d+1)r}, γ_k = k·u/(1-k·u) (one product and at most d-1
additions of non-negative terms per pair and level; scalings by powers of two
are exact), each q̂ then within γ_{2(d+1)r+1}; the alias table adds at most
2·d²·u in total variation, the slot draw ⌊x·k⌋ at most u per slot, the
character draw w·u, so

    η_r ≤ γ_{2(d+1)r+1}/2 + (2d² + d + w)·u.

By the coupling (hybrid) argument a string of length L is drawn within total
variation Σ_{r≤L} η_r of the uniform distribution on strings of length L
(``string_bound``): 0 for fixed-width patterns without branching (plates,
UUIDs), about 10^-13 for a date pattern, below 10^-7 for L = 10^4 over
printable ASCII. ``transition_bound``, ``step_bound`` and ``step_distribution``
give the per-entry and per-step figures that the tests check against exact
fractions. Terms smaller than 2^-1074 of a pair's largest term are dropped as
zero (a further relative error below 2^-1000 per level, not worth a line).
"""

from __future__ import annotations

import numpy as np

from pfuzz.counting.levels import forward_sets
from pfuzz.errors import ResourceLimitError

__all__ = ["FloatTables", "TABLE_BUDGET", "robin_hood", "vose"]

#: Bytes the float tables of one request may take; larger requests raise ResourceLimitError.
TABLE_BUDGET = 1 << 29
#: Edges with at most this many characters in all get a direct key → character table;
#: wider ones (Unicode-sized classes) are searched among their ranges.
CHAR_TABLE_LIMIT = 1 << 20
#: Bytes a pair and a slot take (arrays kept, and the working arrays of the build).
PAIR_BYTES, SLOT_BYTES = 40, 60
#: Alias cells built together (bounds the temporaries of ``robin_hood``).
ROW_BLOCK = 1 << 18
#: Bytes of slots one per character may take; beyond, slots are one per edge.
CHARACTER_SLOT_BUDGET = 1 << 24
#: Characters one pair may have for slots one per character (more: one slot per edge).
PER_CHARACTER_FANOUT = 256
#: Widest alias rows built by the vectorised Robin Hood rounds; wider rows use Vose's pairing.
ROBIN_HOOD_FANOUT = 256

_UNIT = 2.0 ** -53
_NONE = -(1 << 40)  # exponent of a zero count
UNIFORM, STRAIGHT, BRANCHING = 0, 1, 2


class FloatTables:
    """Float counts, transition laws and alias tables for the walks to ``lengths``.

    ``lengths`` is an iterable of lengths, or an int L for every length up to L.
    """

    def __init__(self, counter, lengths):
        if isinstance(lengths, int):
            lengths = range(lengths + 1)
        self.lengths = sorted({int(m) for m in lengths})
        self.max_length = self.lengths[-1] if self.lengths else 0
        self.dfa = counter.dfa
        self._edges(counter)
        self.single_path = len(self.src) > 0 and self._degree == 1 and self.label.max() == 0
        if self.single_path:
            self._one_path(counter)
            return
        self._pairs(counter)
        self._counts()
        self._slots()
        self._level_kinds()

    def _one_path(self, counter) -> None:
        """Every live state has one edge, and all edges carry the same characters: a string of
        length m is m independent uniform picks from them (when m has strings at all), so no
        pair needs a table; every level is uniform."""
        top, width = self.max_length, int(self.width[0])
        self.dense, self.per_character, self.counter = True, False, counter
        self.kind = np.full(top + 1, UNIFORM, dtype=np.int64)
        self.level_label = np.zeros(top + 1, dtype=np.int64)
        self.level_width = np.full(top + 1, width, dtype=np.int64)
        self.uniform_below = np.ones(top + 1, dtype=bool)
        self._path_counts: dict[int, tuple[float, int]] = {}

    # -- structure ----------------------------------------------------------------------
    def _edges(self, counter) -> None:
        src, tgt, ranges = [], [], []
        for s, groups in enumerate(counter.groups):
            for t, rs in groups:
                src.append(s)
                tgt.append(t)
                ranges.append(tuple(rs))
        n = counter.dfa.n_states
        self.n_states = n
        self.src = np.array(src, dtype=np.int64)
        self.tgt = np.array(tgt, dtype=np.int64)
        self.ranges = ranges
        self.width = np.array([sum(hi - lo + 1 for lo, hi in rs) for rs in ranges], dtype=np.float64)
        self.edge_ptr = np.concatenate(([0], np.cumsum(np.bincount(self.src, minlength=n))))
        labels: dict[tuple, int] = {}
        self.label = np.array([labels.setdefault(rs, len(labels)) for rs in ranges], dtype=np.int64)
        self.label_ranges = list(labels)
        self.accepting = np.zeros(n, dtype=bool)
        self.accepting[sorted(counter.dfa.accepting)] = True
        self.successors = [[t for t, _ in groups] for groups in counter.groups]

    def _pairs(self, counter) -> None:
        """Pair keys ``level * n + state``, sorted: every pair a walk to the lengths can meet."""
        n, top = self.n_states, self.max_length
        degree = max(len(self.src) / max(n, 1), 1.0)
        per_pair = PAIR_BYTES + SLOT_BYTES * (degree + 1)
        dense = n * (top + 1)
        sets = None
        if len(self.lengths) < top + 1 or dense * per_pair > TABLE_BUDGET:
            sets = forward_sets(self.successors, top, limit=dense)
        if sets is not None:
            depth = np.repeat(np.arange(len(sets)), [len(f) for f in sets])
            state = np.concatenate([np.asarray(f, dtype=np.int64) for f in sets])
            within = np.searchsorted(depth, self.lengths, side="right")
            if within.sum() >= dense and dense * per_pair <= TABLE_BUDGET:
                sets = None
        self.dense = sets is None
        index = np.int32 if n < 2**31 else np.int64
        if self.dense:
            self._check(dense * per_pair)
            self.pair_state = np.tile(np.arange(n, dtype=index), top + 1)
            self.level_ptr = np.arange(0, dense + 1, n)
        else:
            self._check(int(within.sum()) * per_pair)
            keys = np.sort(np.concatenate([(m - depth[:k]) * n + state[:k]
                                           for m, k in zip(self.lengths, within.tolist())]))
            keys = keys[np.concatenate(([True], keys[1:] != keys[:-1]))]
            self.pair_state = (keys % n).astype(index)
            self.level_ptr = np.searchsorted(keys // n, np.arange(top + 2))
        self.n_pairs = len(self.pair_state)

    def _check(self, needed: float) -> None:
        if needed > TABLE_BUDGET:
            raise ResourceLimitError(
                f"sampling strings of length up to {self.max_length:,} from this "
                f"{self.n_states:,}-state automaton needs float tables of about "
                f"{needed / 2**20:,.0f} MB (limit {TABLE_BUDGET / 2**20:,.0f} MB): ask for "
                "shorter strings (max_length) or fewer distinct lengths")

    def covers(self, lengths) -> bool:
        """Whether walks to every one of ``lengths`` can use these tables."""
        if self.dense:  # every pair of every level up to max_length (or a single path)
            return all(0 <= m <= self.max_length for m in lengths)
        return set(lengths) <= set(self.lengths)

    def pair(self, level: int, state: int) -> int:
        """The number of the pair (level, state), or -1 when the tables do not hold it."""
        if not 0 <= level <= self.max_length:
            return -1
        a, b = int(self.level_ptr[level]), int(self.level_ptr[level + 1])
        at = a + int(np.searchsorted(self.pair_state[a:b], state))
        return at if at < b and self.pair_state[at] == state else -1

    # -- counts and laws ----------------------------------------------------------------
    def _counts(self) -> None:
        """Float counts of every pair, level by level, and the law over each pair's edges."""
        size = self.n_pairs
        self.mantissa = np.zeros(size)
        self.exponent = np.full(size, _NONE, dtype=np.int64)
        first = slice(self.level_ptr[0], self.level_ptr[1])
        held = self.accepting[self.pair_state[first]]
        self.mantissa[first] = np.where(held, 0.5, 0.0)
        self.exponent[first] = np.where(held, 1, _NONE)
        degree = np.diff(self.edge_ptr)
        most = int(degree[self.pair_state[self.level_ptr[1]:]].sum())  # entries at most
        index = self.pair_state.dtype
        self.entry_pair, self.entry_next = np.empty(most, index), np.empty(most, index)
        self.entry_edge, self.entry_q = np.empty(most, np.int32), np.empty(most)
        filled = 0
        for r in range(1, self.max_length + 1):
            part = self._level(r)
            if part is not None:
                end = filled + len(part[0])
                for column, values in zip((self.entry_pair, self.entry_edge, self.entry_q,
                                           self.entry_next), part):
                    column[filled:end] = values
                filled = end
        for column in (self.entry_pair, self.entry_edge, self.entry_q, self.entry_next):
            column.resize(filled, refcheck=False)

    def _level(self, r: int):
        """Counts of level r from those of level r - 1, and the law of each pair's edges:
        (pair, edge, q̂, target pair) for the edges with strings after them."""
        found = self._terms(r)
        if found is None:
            return None
        a, owner, edge, target, terms, total, top = found
        mantissa, raised = np.frexp(total)
        self.mantissa[a:a + len(total)] = mantissa
        self.exponent[a:a + len(total)] = np.where(total > 0, raised + top, _NONE)
        keep = terms > 0
        q = terms[keep] / total[owner[keep]]
        return owner[keep] + a, edge[keep], q, target[keep]

    def _terms(self, r: int):
        """Level r's terms width(e) · T̂[r-1][t] (scaled by a common power of two per pair)
        and their sums: (first pair, owner, edge, target pair, terms, totals, exponents)."""
        a, b = self.level_ptr[r], self.level_ptr[r + 1]
        c = self.level_ptr[r - 1]
        if a == b:
            return None
        states = self.pair_state[a:b]
        first = self.edge_ptr[states]
        counts = self.edge_ptr[states + 1] - first
        single = counts.min() == 1 and counts.max() == 1
        if single:  # one edge per pair (chains): no grouping
            owner, edge = np.arange(b - a), first
        else:
            owner = np.repeat(np.arange(b - a), counts)
            edge = np.repeat(first - np.cumsum(counts) + counts, counts) + np.arange(len(owner))
        below = self.pair_state[c:a]
        targets = self.tgt[edge]
        at = np.searchsorted(below, targets)
        np.minimum(at, len(below) - 1, out=at)
        found = below[at] == targets if len(below) else np.zeros(len(edge), dtype=bool)
        target = c + at
        x = np.where(found, self.exponent[target], _NONE)
        if single:
            top = x
        else:
            top = np.full(b - a, _NONE, dtype=np.int64)
            np.maximum.at(top, owner, x)
        shift = np.maximum(x - top[owner], -1100).astype(np.int32)
        terms = np.where(found, self.width[edge] * np.ldexp(self.mantissa[target], shift), 0.0)
        total = terms if single else np.bincount(owner, weights=terms, minlength=b - a)
        return a, owner, edge, target, terms, total, top

    def transition_law(self, remaining: int, state: int) -> dict[int, float]:
        """Edge → q̂, the computed probability that a string of length ``remaining`` from
        ``state`` starts with one of the edge's characters (recomputed as the build did)."""
        a, owner, edge, _, terms, total, _ = self._terms(remaining)
        mine = owner == self.pair(remaining, state) - a
        return {int(e): float(t / total[o]) for e, t, o in zip(edge[mine], terms[mine], owner[mine])
                if t > 0}

    # -- slots and alias tables --------------------------------------------------------------
    def _slots(self) -> None:
        """Slots per pair: one per edge (with strings after it), or, when the tables stay
        small, one per character of those edges (``per_character``: one draw picks the
        character and the edge at once); a padding slot ends each pair's run."""
        self._characters()
        size = self.n_pairs
        pair, edge, q, nxt = self.entry_pair, self.entry_edge, self.entry_q, self.entry_next
        del self.entry_pair, self.entry_edge, self.entry_q, self.entry_next
        self.edge_count = np.bincount(pair, minlength=size).astype(np.int32)
        characters = int(self.width[edge].sum())
        widest = np.bincount(pair, weights=self.width[edge], minlength=1).max()
        self.per_character = (self.char_table is not None and widest <= PER_CHARACTER_FANOUT
                              and characters * SLOT_BYTES <= CHARACTER_SLOT_BUDGET)
        chars = None
        if self.per_character:
            widths = self.width[edge].astype(np.int64)
            expand = np.repeat(np.arange(len(edge)), widths)
            within = np.arange(len(expand)) - np.repeat(np.cumsum(widths) - widths, widths)
            pair, edge, nxt = pair[expand], edge[expand], nxt[expand]
            q = q[expand] / widths[expand]
            chars = self.char_table[self.edge_key[edge] + within]
        fanout = np.bincount(pair, minlength=size)
        index = np.int32 if int(fanout.sum()) + size < 2**31 else np.int64
        self.fanout = fanout.astype(index)
        self.base = np.concatenate(([0], np.cumsum(fanout + 1)[:-1])).astype(index)
        self.n_slots = int(fanout.sum() + size)
        first_entry = np.concatenate(([0], np.cumsum(fanout)[:-1])).astype(index)
        del fanout
        slot = self.base[pair] + (np.arange(len(pair), dtype=index) - first_entry[pair])
        del pair
        self.slot_edge = np.zeros(self.n_slots, dtype=np.int32)
        self.slot_edge[slot] = edge
        if chars is not None:
            narrow = self.dfa.alphabet.max < 256
            self.slot_char = np.zeros(self.n_slots, dtype=np.uint8 if narrow else np.uint32)
            self.slot_char[slot] = chars
        self.next_base = np.zeros(self.n_slots, dtype=index)
        self.next_base[slot] = self.base[nxt]
        del slot, edge, nxt, chars
        self.slot_fanout = np.zeros(self.n_slots, dtype=np.float32)  # small integers: exact
        self.slot_fanout[self.base] = self.fanout
        self.limit = np.zeros(self.n_slots)
        self.alias = np.arange(self.n_slots, dtype=index)
        for k in np.unique(self.fanout).tolist():
            if k:
                self._alias(k, first_entry, q)

    def _alias(self, k: int, first_entry: np.ndarray, q: np.ndarray) -> None:
        """Alias tables of the pairs with ``k`` slots: slot j with threshold p gets limit
        j + p, so a draw x·k keeps slot ⌊x·k⌋ when x·k < limit; an alias is a slot index."""
        pairs = np.flatnonzero(self.fanout == k)
        for a in range(0, len(pairs), max(ROW_BLOCK // k, 1)):
            block = pairs[a:a + max(ROW_BLOCK // k, 1)]
            rows = q[first_entry[block][:, None] + np.arange(k)]
            cols = self.base[block][:, None] + np.arange(k)
            if k == 1:
                self.limit[cols] = 1.0
            else:
                p, alias = (robin_hood if k <= ROBIN_HOOD_FANOUT else vose)(rows * k)
                self.limit[cols] = p + np.arange(k)
                self.alias[cols] = alias + self.base[block][:, None]
            pad = self.base[block] + k
            self.limit[pad] = k
            self.alias[pad] = self.base[block] + rows.argmax(axis=1)

    def _characters(self) -> None:
        """Per edge, the offset of its characters in one key space, and how keys decode."""
        widths = self.width.astype(np.int64)
        self.edge_key = np.concatenate(([0], np.cumsum(widths + 1)[:-1])).astype(np.int64)
        self.char_table = None
        if widths.sum() <= CHAR_TABLE_LIMIT:
            self.char_table = np.concatenate(
                [np.concatenate([np.arange(lo, hi + 1) for lo, hi in rs] + [[rs[-1][1]]])
                 for rs in self.ranges] or [np.zeros(1)]).astype(np.int64)
        else:
            self.range_lo = np.array([lo for rs in self.ranges for lo, _ in rs], dtype=np.int64)
            starts, key = [], 0
            for rs in self.ranges:
                for lo, hi in rs:
                    starts.append(key)
                    key += hi - lo + 1
                key += 1
            self.range_key = np.array(starts, dtype=np.int64)

    def _level_kinds(self) -> None:
        """Per level: UNIFORM, STRAIGHT or BRANCHING (see the module docstring), and the
        label of a uniform level's one character set."""
        top = self.max_length
        live = np.flatnonzero(self.edge_count)
        level = np.searchsorted(self.level_ptr, live, side="right") - 1
        label = self.label[self.slot_edge[self.base[live]]]
        most = np.zeros(top + 1, dtype=np.int64)
        np.maximum.at(most, level, self.edge_count[live])
        high = np.full(top + 1, -1, dtype=np.int64)
        low = np.full(top + 1, len(self.label), dtype=np.int64)
        np.maximum.at(high, level, label)
        np.minimum.at(low, level, label)
        self.kind = np.where(most > 1, BRANCHING, np.where(high > low, STRAIGHT, UNIFORM))
        self.kind[0] = UNIFORM
        self.level_label = np.where(self.kind == UNIFORM, high, -1)
        self.level_width = np.ones(top + 1, dtype=np.int64)
        uniform = self.level_label >= 0
        self.level_width[uniform] = self.width[self.level_edge(uniform)].astype(np.int64)
        # uniform_below[r]: every level 1..r is uniform, so a walk there needs no state
        self.uniform_below = np.concatenate(([True], np.cumprod(self.kind[1:] == UNIFORM) > 0))

    def level_edge(self, levels: np.ndarray) -> np.ndarray:
        """An edge carrying the label of each uniform level (levels given as a mask)."""
        first = {}
        for e, lab in enumerate(self.label.tolist()):
            first.setdefault(lab, e)
        return np.array([first[lab] for lab in self.level_label[levels].tolist()], dtype=np.int64)

    # -- questions --------------------------------------------------------------------
    def start(self, length: int) -> int:
        """The pair of the start state with ``length`` characters to go (-1 if not held)."""
        return self.pair(length, 0)

    def start_count(self, length: int) -> tuple[float, int]:
        """count(length) as (mantissa, exponent): mantissa · 2^exponent, mantissa in [1/2, 1)
        (0 and a huge negative exponent when the length has no strings)."""
        if self.single_path:
            hit = self._path_counts.get(length)
            if hit is None:
                if not self.counter.has_strings(length):
                    hit = (0.0, _NONE)
                else:  # width^length, its leading 53 bits as the mantissa
                    count = int(self.width[0]) ** length
                    shift = max(count.bit_length() - 53, 0)
                    mantissa, exponent = np.frexp(float(count >> shift))
                    hit = (float(mantissa), int(exponent) + shift)
                self._path_counts[length] = hit
            return hit
        p = self.start(length)
        return (float(self.mantissa[p]), int(self.exponent[p])) if p >= 0 else (0.0, _NONE)

    def has_strings(self, length: int) -> bool:
        return self.start_count(length)[0] > 0

    def start_exponent(self, length: int) -> int:
        """The binary exponent of count(length): the count lies in [2^(e-1), 2^e)."""
        return self.start_count(length)[1]

    def relative_weights(self, lengths: list[int]) -> np.ndarray:
        """Count(length) up to one common factor, as floats (for proportional length choice)."""
        counts = [self.start_count(m) for m in lengths]
        mantissas = np.array([c[0] for c in counts])
        exps = np.array([c[1] for c in counts], dtype=np.int64)
        return np.ldexp(mantissas, np.clip(exps - exps.max(), -1100, 0).astype(np.int32))

    def transition_bound(self, remaining: int) -> float:
        """Bound on |q̂/q - 1| for an entry at this remaining length (see the module docstring)."""
        return _gamma(2 * (self._degree + 1) * remaining + 1)

    def step_bound(self, remaining: int) -> float:
        """Bound on the total variation of one step's choice at this remaining length."""
        kind, w = int(self.kind[remaining]), int(self.width.max(initial=1))
        if kind == UNIFORM:
            return 0.0
        if self.per_character:
            k = int(self.fanout.max(initial=1))
            return _gamma(2 * (self._degree + 1) * remaining + 2) / 2 + (2 * k * k + k) * _UNIT
        if kind == STRAIGHT:
            return w * _UNIT
        d = self._degree
        return self.transition_bound(remaining) / 2 + (2 * d * d + d + w) * _UNIT

    def string_bound(self, length: int) -> float:
        """Bound on the total variation from uniform of a whole string of ``length``."""
        return sum(self.step_bound(r) for r in range(1, length + 1))

    @property
    def _degree(self) -> int:
        return int(np.bincount(self.src, minlength=1).max(initial=1))

    def step_distribution(self, remaining: int, state: int) -> list[tuple[int, float]]:
        """(edge, probability) per slot of (remaining, state): the law its alias table draws
        (ignoring the padding slot's 2^-53 share); edges without strings after them have
        no slot, and an edge has one slot per character in ``per_character`` tables."""
        p = self.pair(remaining, state)
        k, first = int(self.fanout[p]), int(self.base[p])
        law = np.zeros(k + 1)
        for j in range(k):
            threshold = self.limit[first + j] - j  # exact: Sterbenz
            law[j] += threshold
            law[int(self.alias[first + j]) - first] += 1.0 - threshold
        edges = self.slot_edge[first:first + k].tolist()
        return [(e, float(x) / k) for e, x in zip(edges, law[:k])]

    def sample(self, lengths: np.ndarray, generator: np.random.Generator, progress=None) -> list[str]:
        """One string per entry of ``lengths`` (each must have strings), in that order."""
        from pfuzz.counting.walk import walk_all
        return walk_all(self, lengths, generator, progress)


def robin_hood(scaled: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Alias tables for many rows at once (each row of k weights averaging 1).

    The "Robin Hood" pairing of Marsaglia, Tsang & Wang (J. Stat. Softw.
    11(4), 2004): k-1 rounds, each finalising the smallest remaining slot with
    the largest as its alias and moving the difference; vectorised over rows.
    Returns (threshold, alias) with thresholds in [0, 1].
    """
    rows, k = scaled.shape
    value = scaled.copy()
    prob = np.ones((rows, k))
    alias = np.tile(np.arange(k, dtype=np.int64), (rows, 1))
    done = np.zeros((rows, k), dtype=bool)
    every = np.arange(rows)
    for _ in range(k - 1):
        small = np.where(done, np.inf, value).argmin(axis=1)
        large = np.where(done, -np.inf, value).argmax(axis=1)
        v = value[every, small]
        prob[every, small] = np.clip(v, 0.0, 1.0)
        alias[every, small] = large
        done[every, small] = True
        value[every, large] -= 1.0 - v
    return prob, alias


def vose(scaled: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Alias tables row by row in O(k) each (Vose 1991): same result type as ``robin_hood``.

    Slots below 1 and slots of at least 1 are kept on two stacks; each round
    finalises a small slot with a large one as its alias and moves the
    difference, the large slot going back to whichever stack its new value
    belongs on. Slots left when one stack empties keep threshold 1 (their
    values are 1 up to rounding).
    """
    rows, k = scaled.shape
    prob = np.ones((rows, k))
    alias = np.tile(np.arange(k, dtype=np.int64), (rows, 1))
    for row in range(rows):
        value = scaled[row].tolist()
        p, a = prob[row], alias[row]
        small = [j for j, v in enumerate(value) if v < 1.0]
        large = [j for j, v in enumerate(value) if v >= 1.0]
        while small and large:
            j, g = small.pop(), large.pop()
            p[j], a[j] = max(value[j], 0.0), g
            value[g] -= 1.0 - value[j]
            (small if value[g] < 1.0 else large).append(g)
    return prob, alias


def _gamma(k: int) -> float:
    return k * _UNIT / (1 - k * _UNIT)
