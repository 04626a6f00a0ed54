"""Bulk uniform sampling by length with floating-point tables.

Method: the recursive method with floating-point arithmetic, as analysed by
Denise & Zimmermann ("Uniform random generation of decomposable structures
using floating-point arithmetic", TCS 218(2), 1999). For every remaining
length r and every edge e = (s → t) of the DFA (the characters from s to t,
``width(e)`` of them) the table holds the probability that a uniform string
of length r from s starts with one of those characters,

    q[r][e] = width(e) · T[r-1][t] / T[r][s],

computed from the counts ``T`` kept as float64 mantissas with separate
integer exponents, so they never overflow or underflow however long the
strings. Each row q[r][s → ·] becomes an alias table (Walker's alias method,
built vectorised with Marsaglia's "Robin Hood" pairing, one pass per slot), so
choosing the next edge costs O(1) whatever the out-degree; a character is
then taken uniformly among the edge's ``width(e)``. All samples walk at once:
one numpy operation per step handles a whole column of choices. Strings are
decoded from code-point arrays (uint8/latin-1 or uint32/UTF-32) with a
separator character outside the alphabet, never via numpy string arrays, so
U+0000 survives.

Reproducibility: the tables come from correctly rounded IEEE-754 operations
applied in a fixed order (no platform-dependent summation), so they are
bit-identical everywhere, and the walk consumes the seeded numpy stream in a
fixed order (chunks of ``CHUNK`` samples, one uniform per sample and step
for the edge where the state branches, one for the character).

Cost: tables O(L × (E + n)) cells for lengths up to L over E edges and n
states (a float64 threshold and an int32 alias, 12 bytes per cell), built
with O(L) vectorised passes; sampling O(N × L) vectorised work for N strings.

Deviation from exact uniformity (u = 2^-53, d = the largest out-degree, w =
the largest edge width, r ≤ L): the only rounding in the counts is one
product and at most d-1 additions per state and level (scalings by powers of
two are exact), all of non-negative terms, so each computed T[r][s] is exact
up to a relative error γ_{(d+1)r}, γ_k = k·u/(1-k·u); each q̂[r][e] then has
relative error at most γ_{2(d+1)r+1}. The alias table of a row adds at most
k-1 roundings of size k·u to each of its k thresholds (2·d²·u in total
variation), the slot draw ⌊x·k⌋ from a 53-bit uniform x (with a padding slot
for the rare x·k = k) at most u per slot, and the character draw ⌊v·w⌋ at
most u per character. So one step's choice is within total variation

    η_r ≤ γ_{2(d+1)r+1}/2 + (2d² + d + w)·u

of the exact one, and by the coupling (hybrid) argument a string of length L
is drawn within total variation Σ_{r≤L} η_r ≈ (d+1)·L·(L+1)·u + L·(2d² + d + w)·u
of the uniform distribution on strings of length L (``string_bound``). For
a date pattern (d = 4, w = 10, L = 10) that is about 10^-13; for L = 10^4
over printable ASCII (d = 5, w = 95) below 10^-7. ``transition_bound`` and
``step_bound`` give the per-entry and per-step bounds that the tests check
against exact fractions. Terms smaller than 2^-1074 of a state's largest
term are dropped as zero (a further relative error below 2^-1000 per level,
not worth a line in the bound).
"""

from __future__ import annotations

import numpy as np

#: Samples walked together; bounds the working memory to CHUNK × length codes.
CHUNK = 1 << 14
#: Edges with at most this many characters in all get a direct key → character table;
#: wider ones (Unicode-sized classes) are searched among their ranges.
CHAR_TABLE_LIMIT = 1 << 20

_UNIT = 2.0 ** -53
_LEVEL_BLOCK = 256  # levels per block when building alias tables
_NONE = -(1 << 40)  # exponent of a zero count


class FloatTables:
    """Per-level alias tables over the edges of one DFA, for lengths up to ``max_length``.

    Layout: state s owns the slots ``base[s] .. base[s] + fanout[s]``, one per
    outgoing edge plus one padding slot (threshold 0) that catches the rare
    float draw ⌊x·k⌋ = k; the state being walked is held as its base slot.
    """

    def __init__(self, counter, max_length: int):
        self.max_length = max_length
        self._edges(counter)
        q, self.start_mantissa, self.start_exponent = self.probabilities(max_length)
        self.limit, self.alias = self._alias_tables(q)
        self._separator, self._codes_dtype, self._encoding = _codec(counter.dfa.alphabet)

    # -- structure ----------------------------------------------------------------------
    def _edges(self, counter) -> None:
        src, tgt, ranges = [], [], []
        for s, groups in enumerate(counter.groups):
            for t, rs in groups:
                src.append(s)
                tgt.append(t)
                ranges.append(rs)
        n, e = counter.dfa.n_states, len(src)
        self.n_states, self.n_edges, self.n_slots = n, e, e + n
        self.src = np.array(src, dtype=np.int64)
        self.tgt = np.array(tgt, dtype=np.int64)
        self.width = np.array([sum(hi - lo + 1 for lo, hi in rs) for rs in ranges], dtype=np.float64)
        self.fanout = np.bincount(self.src, minlength=n).astype(np.int64)
        self.base = np.concatenate(([0], np.cumsum(self.fanout + 1)[:-1])).astype(np.int64)
        self.slot = np.arange(e, dtype=np.int64) + self.src  # slot of each edge
        self.accepting = np.array([s in counter.dfa.accepting for s in range(n)])
        self._slot_arrays(ranges)

    def _slot_arrays(self, ranges) -> None:
        """Per slot: the state's fanout, the target's base, the edge's width and character keys."""
        size = self.n_slots
        self.slot_fanout = np.repeat(self.fanout.astype(np.float64), self.fanout + 1)
        self.next_base = np.zeros(size, dtype=np.int64)
        self.next_base[self.slot] = self.base[self.tgt]
        self.slot_width = np.ones(size)
        self.slot_width[self.slot] = self.width
        self.slot_key = np.zeros(size, dtype=np.int64)
        widths = self.width.astype(np.int64)
        self.slot_key[self.slot] = np.concatenate(([0], np.cumsum(widths + 1)[:-1]))
        self._char_table = None
        if widths.sum() <= CHAR_TABLE_LIMIT:
            self._char_table = np.concatenate(
                [np.concatenate([np.arange(lo, hi + 1) for lo, hi in rs] + [[rs[-1][1]]])
                 for rs in ranges] or [np.zeros(1)]).astype(np.int64)
        else:
            self._range_lo = np.array([lo for rs in ranges for lo, _ in rs], dtype=np.int64)
            starts, key = [], 0
            for rs in ranges:
                for lo, hi in rs:
                    starts.append(key)
                    key += hi - lo + 1
                key += 1
            self._range_key = np.array(starts, dtype=np.int64)

    def probabilities(self, max_length: int):
        """q[r][e] for r = 0..max_length (row 0 unused), plus the start state's counts."""
        n, src, tgt = self.n_states, self.src, self.tgt
        mantissa = np.where(self.accepting, 0.5, 0.0)
        exponent = np.where(self.accepting, 1, _NONE).astype(np.int64)
        q = np.zeros((max_length + 1, self.n_edges))
        start_m, start_e = [mantissa[0]], [exponent[0]]
        for r in range(1, max_length + 1):
            x = exponent[tgt]
            top = np.full(n, _NONE, dtype=np.int64)
            np.maximum.at(top, src, x)
            shift = np.clip(x - top[src], -1100, 0).astype(np.int32)
            terms = self.width * np.ldexp(mantissa[tgt], shift)
            total = np.bincount(src, weights=terms, minlength=n)
            np.divide(terms, total[src], out=q[r], where=total[src] > 0)
            mantissa, raised = np.frexp(total)
            exponent = np.where(total > 0, raised + top, _NONE)
            start_m.append(mantissa[0])
            start_e.append(exponent[0])
        return q, np.array(start_m), np.array(start_e, dtype=np.int64)

    def _alias_tables(self, q):
        """Limits and aliases per (level, slot): slot j of a state with threshold p has
        limit j + p, so a draw x·k keeps slot ⌊x·k⌋ when x·k < limit; an alias is a slot index.
        Built a block of levels at a time, so temporaries stay small beside the result."""
        levels = q.shape[0]
        limit = np.zeros((levels, self.n_slots))
        alias = np.broadcast_to(np.arange(self.n_slots, dtype=np.int32),
                                (levels, self.n_slots)).copy()
        for first in range(0, levels, _LEVEL_BLOCK):
            block = slice(first, min(first + _LEVEL_BLOCK, levels))
            self._alias_block(q[block], limit[block], alias[block])
        limit += np.arange(self.n_slots) - np.repeat(self.base, self.fanout + 1)
        return limit, alias

    def _alias_block(self, q, prob, alias) -> None:
        levels = q.shape[0]
        for k in np.unique(self.fanout).tolist():
            if k == 0:
                continue
            states = np.flatnonzero(self.fanout == k)
            cols = self.base[states][:, None] + np.arange(k)
            rows = q[:, cols - states[:, None]]
            p, a = robin_hood(rows.reshape(-1, k) * k)
            prob[:, cols] = p.reshape(levels, len(states), k)
            alias[:, cols] = a.reshape(levels, len(states), k) + self.base[states][None, :, None]
            alias[:, self.base[states] + k] = rows.argmax(axis=2) + self.base[states][None, :]

    # -- questions --------------------------------------------------------------------
    def has_strings(self, length: int) -> bool:
        return bool(self.start_mantissa[length] > 0)

    def relative_weights(self, lengths: list[int]) -> np.ndarray:
        """Count(length) up to one common factor, as floats (for proportional length choice)."""
        exps = self.start_exponent[lengths]
        return np.ldexp(self.start_mantissa[lengths],
                        np.clip(exps - exps.max(), -1100, 0).astype(np.int32))

    def transition_bound(self, remaining: int) -> float:
        """Bound on |q̂/q - 1| for an entry at this remaining length (see the module docstring)."""
        return _gamma(2 * (self._degree + 1) * remaining + 1)

    def step_bound(self, remaining: int) -> float:
        """Bound on the total variation of one step's choice at this remaining length."""
        d, w = self._degree, int(self.width.max(initial=1))
        return self.transition_bound(remaining) / 2 + (2 * d * d + d + w) * _UNIT

    def string_bound(self, length: int) -> float:
        """Bound on the total variation from uniform of a whole string of ``length``."""
        return sum(self.step_bound(r) for r in range(1, length + 1))

    @property
    def _degree(self) -> int:
        return int(self.fanout.max(initial=1))

    def step_distribution(self, remaining: int, state: int) -> np.ndarray:
        """The law over the state's edges that its alias table at this level draws
        (ignoring the padding slot's 2^-53 share)."""
        k = int(self.fanout[state])
        first = int(self.base[state])
        law = np.zeros(k + 1)
        for j in range(k):
            p = self.limit[remaining, first + j] - j  # exact: Sterbenz
            law[j] += p
            law[int(self.alias[remaining, first + j]) - first] += 1.0 - p
        return law[:k] / k

    # -- sampling ---------------------------------------------------------------------
    def sample(self, lengths: np.ndarray, generator: np.random.Generator, progress=None) -> list[str]:
        """One string per entry of ``lengths`` (each must have strings), in that order."""
        if len(lengths) and lengths.max() > self.max_length:
            raise ValueError("tables too short for the lengths asked")
        if len(lengths) and lengths.min() == lengths.max():
            return self._sample_sorted(lengths, generator, progress)
        key = -lengths
        if lengths.max() < 2**15:
            key = key.astype(np.int16)  # a stable sort of int16 is a radix sort
        order = np.argsort(key, kind="stable")
        result = np.empty(len(lengths), dtype=object)
        result[order] = self._sample_sorted(lengths[order], generator, progress)
        return result.tolist()

    def _sample_sorted(self, lengths: np.ndarray, generator, progress) -> list[str]:
        """Strings for lengths sorted longest first, a chunk at a time."""
        out: list[str] = []
        for a in range(0, len(lengths), CHUNK):
            chunk = lengths[a:a + CHUNK]
            out.extend(self._decode(self._walk(chunk, generator), chunk))
            if progress is not None:
                progress(len(chunk))
        return out

    def _walk(self, lengths: np.ndarray, generator: np.random.Generator) -> np.ndarray:
        """Code points, one row per sample (lengths sorted longest first).

        Strings are aligned at their end: a string of length L starts at step
        top - L, so at every step all active samples have the same remaining
        length and read the same level of the tables. Each row ends with the
        separator; row k holds its string in columns top - L .. top - 1.
        """
        n = len(lengths)
        top = int(lengths[0]) if n else 0
        codes = np.zeros((top + 1, n), dtype=self._codes_dtype)
        codes[top, :] = self._separator
        where = np.zeros(n, dtype=np.int64)  # base slot of each sample's state
        branching = self.fanout.max(initial=0) > 1
        negative = -lengths
        for step in range(top):
            remaining = top - step
            m = int(np.searchsorted(negative, -remaining, side="right"))
            here = where[:m]
            chosen = self._choose(here, remaining, generator) if branching else here
            codes[step, :m] = self._characters(chosen, generator)
            where[:m] = self.next_base[chosen]
        return codes.T

    def _choose(self, here, remaining: int, generator) -> np.ndarray:
        """Alias draw: a uniform slot of the state, kept below its limit, else its alias."""
        x = generator.random(len(here)) * self.slot_fanout[here]
        slot = here + x.astype(np.int64)
        return np.where(x < self.limit[remaining][slot], slot, self.alias[remaining][slot])

    def _characters(self, chosen, generator) -> np.ndarray:
        """A uniform character among the chosen edge's characters."""
        widths = self.slot_width[chosen]
        pick = (generator.random(len(chosen)) * widths).astype(np.int64)
        key = self.slot_key[chosen] + pick
        if self._char_table is not None:
            return self._char_table[key]
        key = np.minimum(key, self.slot_key[chosen] + widths.astype(np.int64) - 1)
        at = np.searchsorted(self._range_key, key, side="right") - 1
        return self._range_lo[at] + (key - self._range_key[at])

    def _decode(self, codes: np.ndarray, lengths: np.ndarray) -> list[str]:
        """Rows of code points back to strings, one run of equal lengths at a time."""
        out: list[str] = []
        separator = chr(self._separator)
        top = codes.shape[1] - 1
        cuts = np.flatnonzero(np.diff(lengths)) + 1
        for a, b in zip([0, *cuts.tolist()], [*cuts.tolist(), len(lengths)]):
            block = np.ascontiguousarray(codes[a:b, top - int(lengths[a]):])
            text = block.tobytes().decode(self._encoding, "surrogatepass")
            out.extend(text.split(separator)[:-1])
        return out


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


def _gamma(k: int) -> float:
    return k * _UNIT / (1 - k * _UNIT)


def _codec(alphabet) -> tuple[int, type, str]:
    """A separator code point outside the alphabet, and how to store and decode code points."""
    rest = alphabet.complement()
    if rest.ranges and rest.min < 256 and alphabet.max < 256:
        return rest.min, np.uint8, "latin-1"
    separator = next((lo for lo, _ in rest.ranges), 0xD800)
    return separator, np.uint32, "utf-32-le"
