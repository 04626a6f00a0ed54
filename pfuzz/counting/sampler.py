"""Uniform sampling by length: length plans, the exact walk, the bulk path, distinct strings.

Method: the recursive method (Nijenhuis & Wilf 1978; Flajolet, Zimmermann
& Van Cutsem, TCS 132, 1994) over the count tables of ``pfuzz.counting.tables``.
First a length is chosen by the *length plan*, then a uniformly random
string of that length:

- the **exact walk** draws one uniform rank below count(length) with exact
  big-integer arithmetic (``RandomSource.below``) and unranks it. Decoding a
  uniform rank is the step-by-step recursive method: at each position the
  next piece of the alphabet is chosen with probability (characters in the
  piece × strings left after it) / (strings left), then a character
  uniformly inside it, all exactly;
- the **bulk path** (``pfuzz.counting.bulk``) walks all samples at once with
  floating-point alias tables (Denise & Zimmermann, TCS 218(2), 1999); its
  deviation from uniformity is bounded in that module (about 10^-13 in total
  variation for everyday patterns).

``method="auto"`` (the default) takes the bulk path when ``n`` is at least
``BULK_MIN_SAMPLES``, a length above ``EXACT_MAX_LENGTH`` is possible, or the
exact tables would pass ``EXACT_TABLE_BUDGET`` bytes (exact tables grow as
length², float tables as length); ``method="exact"`` forces the exact walk (and
raises ``ResourceLimitError`` past that budget, before building anything),
``method="bulk"`` the bulk path. Which lengths have strings comes from a yes/no
recurrence (``Counter.has_strings``), never from counts; the bulk path builds
float tables only for the lengths actually drawn.

Length plans: ``"even"`` picks uniformly among the lengths in range that
have strings; ``"proportional"`` weighs each by its count (uniform over all
strings in the range); an int is one length; a list of lengths is uniform
over its entries (a repeated length counts twice); a dict maps lengths to
non-negative weights. Explicit lengths ignore ``min_length``/``max_length``.
Weights are made exact integers (via ``fractions.Fraction``); the exact walk
draws lengths exactly, the bulk path exactly while the total weight is below
2^62 and otherwise from correctly rounded probabilities (a further total
variation below m·2^-52 for m lengths).

Cost: the exact walk takes O(length × d × log pieces) big-integer steps per
string (d the out-degree); the bulk path O(length) vectorised numpy steps per
chunk of strings plus one table build (``pfuzz.counting.bulk``).

``unique=True`` returns distinct strings: lengths are drawn as above, a
length that runs out of strings is dropped and its excess draws are redrawn
among the others; within a length, a sparse quota is filled by rejecting
repeats of uniform draws, a dense one (at least half the strings) by a
uniform random subset of ranks. When the range holds fewer strings than
asked, all of them are returned (shuffled) with a ``PfuzzWarning``.

Reproducibility: every draw comes from one ``pfuzz.base.randomness.RandomSource``
(numpy's PCG64, whose bit stream numpy keeps stable across platforms), in a
fixed order, with no reliance on hash order. The same seed, pattern,
alphabet, arguments (``n`` included, since it selects the path) and
versions of pfuzz, Python and numpy give the same strings on every platform.
Over ASCII alphabets the strings do not depend on the Python version either:
the only thing Python contributes is its Unicode database (which decides
what ``\\w`` or case-folding match beyond ASCII); integer arithmetic and
the numpy stream do not change.
"""

from __future__ import annotations

import warnings
from fractions import Fraction
from math import lcm

import numpy as np

from pfuzz.errors import ArgumentError, EmptyLanguageError, PfuzzWarning, ResourceLimitError
from pfuzz.base.randomness import source

#: The auto method takes the bulk path from this many samples on.
BULK_MIN_SAMPLES = 1_000
#: ... or when a length above this one may be drawn ...
EXACT_MAX_LENGTH = 1_000
#: ... or when the exact tables would take more bytes than this.
EXACT_TABLE_BUDGET = 1 << 28

METHODS = ("auto", "exact", "bulk")
LENGTH_MODES = ("even", "proportional")
_EXACT_DRAW_LIMIT = 2**62
_PROGRESS_STEP = 1024


def sample(counter, n: int, *, min_length=None, max_length=None, seed=None, lengths="even",
           unique=False, method="auto", progress=None) -> list[str]:
    """``n`` accepted strings; see the module docstring for plans, methods and guarantees."""
    if isinstance(n, bool) or not isinstance(n, int) or n < 0:
        raise ArgumentError(f"n must be a non-negative integer, got {n!r}")
    if method not in METHODS:
        raise ArgumentError(f"method must be one of {', '.join(METHODS)}, got {method!r}")
    rng = source(seed)
    candidates, weights = plan(counter, min_length, max_length, lengths, method)
    if n == 0:
        return []
    if unique:
        return _unique(counter, n, candidates, weights, rng, method)
    return _draw(counter, n, candidates, weights, rng, method, progress)


def use_bulk(n: int, longest: int, method: str, counter=None) -> bool:
    """Whether ``n`` strings of lengths up to ``longest`` take the bulk path."""
    if method != "auto":
        if method == "exact" and counter is not None:
            _exact_affordable(counter, longest, required=True)
        return method == "bulk"
    if n >= BULK_MIN_SAMPLES or longest > EXACT_MAX_LENGTH:
        return True
    return counter is not None and not _exact_affordable(counter, longest)


def _exact_affordable(counter, longest: int, required: bool = False) -> bool:
    """Whether the exact tables up to ``longest`` fit ``EXACT_TABLE_BUDGET`` (raise when
    ``required`` and they do not)."""
    needed = counter.exact_table_bytes(longest)
    if needed <= EXACT_TABLE_BUDGET:
        return True
    if required:
        raise ResourceLimitError(
            f"exact sampling up to length {longest:,} needs exact count tables of about "
            f"{needed / 2**20:,.0f} MB (limit {EXACT_TABLE_BUDGET / 2**20:,.0f} MB): use "
            "method='bulk' (float tables, bounded error) or ask for shorter strings")
    return False


# -- length plans ---------------------------------------------------------------------

def plan(counter, min_length, max_length, lengths, method="auto") -> tuple[list[int], list[int] | None]:
    """The candidate lengths and their integer weights (None: all equal)."""
    if counter.empty:
        raise EmptyLanguageError("the language is empty: there is nothing to sample")
    if isinstance(lengths, str):
        if lengths not in LENGTH_MODES:
            raise ArgumentError(_LENGTHS_HELP.format(lengths))
        return _ranged_plan(counter, min_length, max_length, lengths, method)
    if isinstance(lengths, int) and not isinstance(lengths, bool):
        lengths = [lengths]
    if isinstance(lengths, dict):
        pairs = [(k, Fraction(v)) for k, v in lengths.items()]
    elif isinstance(lengths, (list, tuple)):
        pairs = [(k, Fraction(1)) for k in lengths]
    else:
        raise ArgumentError(_LENGTHS_HELP.format(lengths))
    return _explicit_plan(counter, pairs, method)


_LENGTHS_HELP = ("lengths must be 'even', 'proportional', a length, a list of lengths or a "
                 "dict of length -> weight; got {!r}")


def _ranged_plan(counter, min_length, max_length, mode, method):
    low, high = counter.bounds(min_length, max_length)
    if low > high:
        hint = (f" (the shortest string has length {low})" if min_length is None else
                f" (the longest string has length {high})" if max_length is None else "")
        raise EmptyLanguageError(f"the length range {low} to {high} is empty{hint}")
    candidates = [k for k in range(low, high + 1) if counter.has_strings(k)]
    if not candidates:
        raise EmptyLanguageError(f"the language has no strings with length {low} to {high}")
    if mode == "even":
        return candidates, None
    exact = method == "exact" or high <= EXACT_MAX_LENGTH
    if exact and _exact_affordable(counter, high, required=method == "exact"):
        return candidates, [counter.count(k) for k in candidates]
    relative = counter.float_tables(candidates).relative_weights(candidates)
    return candidates, _integer_weights([Fraction(float(w)) for w in relative])


def _explicit_plan(counter, pairs, method):
    total: dict[int, Fraction] = {}
    for length, weight in pairs:
        if isinstance(length, bool) or not isinstance(length, int) or length < 0:
            raise ArgumentError(f"a length must be a non-negative integer, got {length!r}")
        if weight < 0:
            raise ArgumentError(f"length weights must be >= 0, got {weight} for length {length}")
        total[length] = total.get(length, Fraction(0)) + weight
    chosen = sorted(k for k, w in total.items() if w > 0)
    if not chosen:
        raise ArgumentError("no length has a positive weight")
    for length in chosen:
        if not counter.has_strings(length):
            raise EmptyLanguageError(f"the language has no strings of length {length}")
    weights = _integer_weights([total[k] for k in chosen])
    return chosen, None if len(set(weights)) == 1 else weights


def _integer_weights(fractions: list[Fraction]) -> list[int]:
    scale = lcm(*(f.denominator for f in fractions))
    return [int(f * scale) for f in fractions]


def _draw_lengths(candidates, weights, n, rng, bulk: bool) -> list[int]:
    """``n`` lengths from the plan: exact draws, or vectorised ones on the bulk path."""
    m = len(candidates)
    if not bulk:
        if weights is None:
            picks = [rng.below(m) for _ in range(n)]
        else:
            picks = [rng.weighted_index(weights) for _ in range(n)]
        return [candidates[i] for i in picks]
    gen = rng.numpy
    if m == 1:
        return np.full(n, candidates[0], dtype=np.int64)
    if weights is None:
        picks = gen.integers(0, m, size=n)
    elif sum(weights) < _EXACT_DRAW_LIMIT:
        cumulative = np.cumsum(np.array(weights, dtype=np.int64))
        picks = np.searchsorted(cumulative, gen.integers(0, int(cumulative[-1]), size=n), "right")
    else:
        whole = sum(weights)
        cumulative = np.cumsum([w / whole for w in weights])
        picks = np.minimum(np.searchsorted(cumulative, gen.random(n) * cumulative[-1], "right"), m - 1)
    return np.asarray(candidates, dtype=np.int64)[picks]


# -- drawing ----------------------------------------------------------------------------

def _draw(counter, n, candidates, weights, rng, method, progress=None) -> list[str]:
    bulk = use_bulk(n, max(candidates), method, counter)
    lengths = _draw_lengths(candidates, weights, n, rng, bulk)
    if bulk:
        lengths = np.asarray(lengths, dtype=np.int64)
        tables = counter.float_tables(np.flatnonzero(np.bincount(lengths)).tolist())
        return tables.sample(lengths, rng.numpy, progress)
    out = []
    for i, length in enumerate(lengths):
        out.append(counter.unrank(length, rng.below(counter.count(length))))
        if progress is not None and (i + 1) % _PROGRESS_STEP == 0:
            progress(_PROGRESS_STEP)
    if progress is not None and n % _PROGRESS_STEP:
        progress(n % _PROGRESS_STEP)
    return out


def _unique(counter, n, candidates, weights, rng, method) -> list[str]:
    long = [k for k in candidates if method != "exact" and k > EXACT_MAX_LENGTH]
    tables = counter.float_tables(long) if long else None
    capacity = [_capacity(counter, k, n, method, tables) for k in candidates]
    available = sum(capacity)
    if available <= n:
        if available < n:
            warnings.warn(f"only {available} distinct strings have the lengths asked for; "
                          f"returning all of them instead of {n}", PfuzzWarning, stacklevel=5)
        everything = [s for k in candidates for s in counter.enumerate(k, k)]
        return _shuffled(everything, rng)
    quotas = _quotas(n, candidates, weights, capacity, rng, method)
    out: list[str] = []
    for length, quota, size in zip(candidates, quotas, capacity):
        if quota:
            out.extend(_distinct(counter, length, quota, size, rng, method))
    return _shuffled(out, rng)


def _capacity(counter, length: int, n: int, method: str, tables) -> int:
    """count(length), or a stand-in above 4n when the float tables show it is far larger
    (so that long lengths do not need exact tables)."""
    if method == "exact" or length <= EXACT_MAX_LENGTH:
        return counter.count(length)
    if tables.has_strings(length) and tables.start_exponent(length) - 1 > (8 * n).bit_length():
        return 4 * n + 1  # the count is at least 2^(exponent - 1), mantissa >= 1/2
    return counter.count(length)


def _quotas(n, candidates, weights, capacity, rng, method) -> list[int]:
    """How many strings of each length: drawn as usual, full lengths redrawn among the rest."""
    quota = [0] * len(candidates)
    still = list(range(len(candidates)))
    need = n
    while need:
        sub_weights = None if weights is None else [weights[j] for j in still]
        drawn = _draw_lengths(list(range(len(still))), sub_weights, need, rng,
                              use_bulk(need, 0, method))
        hits = np.bincount(np.asarray(drawn, dtype=np.int64), minlength=len(still))
        need = 0
        for j, got in zip(list(still), hits.tolist()):
            quota[j] += got
            if quota[j] >= capacity[j]:
                need += quota[j] - capacity[j]
                quota[j] = capacity[j]
                still.remove(j)
    return quota


def _distinct(counter, length, quota, size, rng, method) -> list[str]:
    """``quota`` distinct uniform strings of ``length`` (which has ``size`` strings)."""
    if 2 * quota >= size:
        chosen = np.zeros(size, dtype=bool)
        chosen[rng.numpy.permutation(size)[:quota]] = True
        return [s for s, keep in zip(counter.enumerate(length, length), chosen.tolist()) if keep]
    seen: dict[str, None] = {}
    while len(seen) < quota:
        for text in _draw(counter, quota - len(seen), [length], None, rng, method):
            seen.setdefault(text)
            if len(seen) == quota:
                break
    return list(seen)


def _shuffled(items: list[str], rng) -> list[str]:
    return [items[i] for i in rng.numpy.permutation(len(items)).tolist()]
