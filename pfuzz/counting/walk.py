"""The bulk walk: many uniform strings at once over the float tables of ``pfuzz.counting.bulk``.

All samples of a chunk walk together, one numpy operation per step over the
whole column of choices. Samples are sorted longest first and aligned at
their end, so at every step the active samples (a prefix) have the same
remaining length and read the same level of the tables. Per level kind:

- uniform (every pair has one edge, all with the same characters): one exact
  draw ``Generator.integers(0, w)`` per character (numpy takes small bounded
  draws from 32-bit halves of its 64-bit words, so two characters per word).
  Runs of uniform levels with nothing else below them need no state at all:
  all their characters are drawn in one call, and a chunk whose every level
  is uniform with one character set is filled in a single draw;
- straight (one edge per pair, characters differing): the edge is certain,
  the character is ⌊v·w⌋ for a 53-bit uniform v;
- branching: an alias draw picks the edge (one uniform x: slot ⌊x·k⌋, kept
  when x·k is below its limit, else its alias), then the character as above.

Characters are written into one flat buffer per chunk, in the samples' own
order, each string followed by a separator outside the alphabet; the buffer is
decoded once (Latin-1 or UTF-32) and split, never through numpy string arrays,
so U+0000 survives. When the alphabet holds no line-break character the
separator is a newline and ``str.splitlines`` does the split (faster than
``str.split``).

Reproducibility: the walk consumes the seeded numpy stream in a fixed order
(chunks of ``chunk_size(longest)`` samples in the order given; within a chunk,
level by level from the longest string's first character).
"""

from __future__ import annotations

import numpy as np

from pfuzz.counting.bulk import BRANCHING, STRAIGHT, UNIFORM

__all__ = ["chunk_size", "uniform_draws", "walk_all"]

#: Characters one chunk may hold (bounds the working memory whatever the lengths).
CHUNK_CHARACTERS = 1 << 21
#: Most samples walked together: 2^14 keeps a chunk's columns in a core's cache (median bulk
#: ratio of the date pattern 0.80 at 2^16, 0.69-0.74 at 2^14 and 2^15, on the machine of the benchmarks).
CHUNK = 1 << 14
#: The characters ``str.splitlines`` splits at, besides the newline.
LINE_BREAKS = "\n\r\x0b\x0c\x1c\x1d\x1e\x85\u2028\u2029"


def chunk_size(longest: int) -> int:
    """Samples walked together when the longest is ``longest`` characters."""
    return int(max(256, min(CHUNK, CHUNK_CHARACTERS // (longest + 1))))


def walk_all(tables, lengths: np.ndarray, generator: np.random.Generator, progress=None) -> list[str]:
    """One string per entry of ``lengths``, in that order (each length must have strings)."""
    lengths = np.asarray(lengths, dtype=np.int64)
    if len(lengths) and lengths.max() > tables.max_length:
        raise ValueError("tables too short for the lengths asked")
    codec = _Codec(tables.dfa.alphabet)
    size = chunk_size(int(lengths.max(initial=0)))
    out: list[str] = []
    for a in range(0, len(lengths), size):
        chunk = lengths[a:a + size]
        out.extend(codec.decode(_Chunk(tables, chunk, codec).fill(generator)))
        if progress is not None:
            progress(len(chunk))
    return out


class _Chunk:
    """One chunk's buffer and walk."""

    def __init__(self, tables, lengths: np.ndarray, codec: "_Codec"):
        self.t = tables
        ends = np.cumsum(lengths + 1) - 1
        self.buffer = np.empty(int(ends[-1]) + 1 if len(ends) else 0, dtype=codec.dtype)
        self.buffer[ends] = self.separator = codec.separator
        self.lengths, self.ends = lengths, ends

    def fill(self, generator) -> np.ndarray:
        t, lengths = self.t, self.lengths
        top = int(lengths.max(initial=0))
        if top == 0:
            return self.buffer
        if t.uniform_below[top] and _one_label(t, top):
            # every character independent and uniform: draw them all, separators on top
            self.buffer[:] = _uniform_characters(t, top, len(self.buffer), generator)
            self.buffer[self.ends] = self.separator
            return self.buffer
        self.matrix = None
        if lengths[0] == lengths[-1] and lengths.min() == top:
            self.sorted_lengths, self.position = lengths, self.ends
            self.matrix = self.buffer.reshape(-1, top + 1)  # one length: level r is a column
        else:
            key = -lengths if top >= 2**15 else (-lengths).astype(np.int16)  # int16: radix sort
            order = np.argsort(key, kind="stable")
            self.sorted_lengths, self.position = lengths[order], self.ends[order]
        here = None if t.uniform_below[top] else _start_slots(t, self.sorted_lengths)
        step = 0
        while step < top:
            remaining = top - step
            if t.uniform_below[remaining]:
                self._uniform_tail(remaining, generator)
                break
            m = int(np.searchsorted(-self.sorted_lengths, -remaining, side="right"))
            here = self._step(remaining, m, here, generator)
            step += 1
        return self.buffer

    def _step(self, remaining: int, m: int, here: np.ndarray, generator) -> np.ndarray:
        t = self.t
        at = here[:m]
        kind = t.kind[remaining]
        if kind == UNIFORM:
            chars = _uniform_characters(t, remaining, m, generator)
            chosen = at
        elif t.per_character:
            chosen = _choose(t, at, generator)
            chars = np.take(t.slot_char, chosen)
        else:
            chosen = at if kind == STRAIGHT else _choose(t, at, generator)
            chars = _edge_characters(t, chosen, generator)
        if self.matrix is not None:
            self.matrix[:, -1 - remaining] = chars
        else:
            self.buffer[self.position[:m] - remaining] = chars
        here[:m] = np.take(t.next_base, chosen)
        return here

    def _uniform_tail(self, remaining: int, generator) -> None:
        """Levels ``remaining`` .. 1 are all uniform: no state, one draw per run of levels
        with the same character set and the same active samples."""
        t, lengths = self.t, self.sorted_lengths
        if lengths[0] == lengths[-1]:
            self._uniform_columns(remaining, generator)
            return
        r = remaining
        while r >= 1:
            m = int(np.searchsorted(-lengths, -r, side="right"))
            low = r
            while (low > 1 and t.level_label[low - 1] == t.level_label[r]
                   and (m == len(lengths) or lengths[m] < low - 1)):
                low -= 1
            span = r - low + 1
            chars = _uniform_characters(t, r, m * span, generator).reshape(m, span)
            self.buffer[self.position[:m, None] - np.arange(r, low - 1, -1)] = chars
            r = low - 1


    def _uniform_columns(self, remaining: int, generator) -> None:
        """``_uniform_tail`` when every string of the chunk has one length: the buffer is a
        matrix, and each run of levels with one character set is a block of its columns."""
        t, width = self.t, int(self.lengths[0]) + 1
        matrix = self.buffer.reshape(-1, width)
        r = remaining
        while r >= 1:
            low = r
            while low > 1 and t.level_label[low - 1] == t.level_label[r]:
                low -= 1
            first = width - 1 - r
            block = _uniform_characters(t, r, len(matrix) * (r - low + 1), generator)
            matrix[:, first:first + r - low + 1] = block.reshape(len(matrix), -1)
            r = low - 1


def _start_slots(t, lengths: np.ndarray) -> np.ndarray:
    """The base slot of the start pair of each sample's length."""
    bases = np.zeros(int(lengths.max()) + 1, dtype=np.intp)  # intp: takes need no conversion
    for m in np.flatnonzero(np.bincount(lengths)).tolist():
        bases[m] = t.base[t.start(m)]
    return bases[lengths]


def _one_label(t, top: int) -> bool:
    labels = t.level_label[1:top + 1]
    return bool((labels == labels[0]).all())


def _uniform_characters(t, remaining: int, count: int, generator) -> np.ndarray:
    """``count`` characters drawn exactly uniformly from the one set of a uniform level."""
    return uniform_draws(_label_table(t, int(t.level_label[remaining])), count, generator)


def uniform_draws(table: np.ndarray, count: int, generator) -> np.ndarray:
    """``count`` independent exactly uniform picks from ``table``.

    Up to 256 entries, from raw random bytes: a byte below the largest multiple of
    w (or of w² for w ≤ 16, which gives two picks per byte) is kept and mapped through
    a 256-entry table, the others are rejected; wider tables use
    ``Generator.integers`` (Lemire's method, exact too)."""
    width = len(table)
    if width == 1:
        return np.full(count, table[0], dtype=table.dtype)
    if width > 256:
        kind = np.uint16 if width <= 65536 else np.uint32
        return table[generator.integers(0, width, size=count, dtype=kind)]
    per = 2 if width <= 16 else 1
    span = width ** per
    keep = 256 // span * span
    need = -(-count // per)
    lookup = _byte_lookup(table, per)
    parts, got = [], 0
    while got < need:
        words = -(-int((need - got) * 256 / keep * 1.01 + 64) // 8)
        raw = generator.bit_generator.random_raw(words).view(np.uint8)
        kept = np.compress(raw < keep, raw) if keep < 256 else raw
        parts.append(kept)
        got += len(kept)
    picked = np.concatenate(parts)[:need] if len(parts) > 1 else parts[0][:need]
    return np.take(lookup, picked).view(table.dtype)[:count]


_LOOKUPS: dict = {}


def _byte_lookup(table: np.ndarray, per: int) -> np.ndarray:
    """Byte → pick(s): table[b % w], or the pair (table[b // w % w], table[b % w]) as one
    item twice as wide, for two picks per byte."""
    key = (table.tobytes(), table.dtype.str, per)
    hit = _LOOKUPS.get(key)
    if hit is None:
        b, w = np.arange(256), len(table)
        if per == 1:
            hit = table[b % w]
        else:
            pairs = np.ascontiguousarray(np.stack([table[b // w % w], table[b % w]], axis=1))
            hit = pairs.view(np.uint16 if table.itemsize == 1 else np.uint64).reshape(-1)
        _LOOKUPS[key] = hit
    return hit


def _label_table(t, label: int) -> np.ndarray:
    """The code points of a label in increasing order (cached on the tables)."""
    cache = t.__dict__.setdefault("_label_tables", {})
    table = cache.get(label)
    if table is None:
        ranges = t.label_ranges[label]
        table = cache[label] = np.concatenate([np.arange(lo, hi + 1) for lo, hi in ranges]) \
            .astype(np.uint32 if ranges[-1][1] > 0xFF else np.uint8)
    return table


def _choose(t, here: np.ndarray, generator) -> np.ndarray:
    """Alias draw: a uniform slot of the pair, kept below its limit, else its alias."""
    x = generator.random(len(here)) * np.take(t.slot_fanout, here)
    slot = here + x.astype(here.dtype)
    return np.where(x < np.take(t.limit, slot), slot, np.take(t.alias, slot))


def _edge_characters(t, chosen: np.ndarray, generator) -> np.ndarray:
    """A uniform character among the chosen edge's characters."""
    edge = t.slot_edge[chosen]
    widths = t.width[edge]
    pick = (generator.random(len(chosen)) * widths).astype(np.int64)
    key = t.edge_key[edge] + pick
    if t.char_table is not None:
        return t.char_table[key]
    key = np.minimum(key, t.edge_key[edge] + widths.astype(np.int64) - 1)
    at = np.searchsorted(t.range_key, key, side="right") - 1
    return t.range_lo[at] + (key - t.range_key[at])


class _Codec:
    """A separator outside the alphabet, how code points are stored, and how to split."""

    def __init__(self, alphabet):
        narrow = alphabet.max < 256 if alphabet else True
        if "\n" not in alphabet and not any(ch in alphabet for ch in LINE_BREAKS):
            self.separator, self.lines = ord("\n"), True
        else:
            rest = alphabet.complement()
            self.separator = next((lo for lo, _ in rest.ranges if not narrow or lo < 256), 0xD800)
            self.lines = False
        narrow = narrow and self.separator < 256
        self.dtype = np.uint8 if narrow else np.uint32
        self.encoding = "latin-1" if narrow else "utf-32-le"

    def decode(self, buffer: np.ndarray) -> list[str]:
        if not len(buffer):
            return []
        text = buffer.tobytes().decode(self.encoding, "surrogatepass")
        if self.lines:
            return text.splitlines()
        return text.split(chr(self.separator))[:-1]
