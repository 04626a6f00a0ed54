"""One seeded source of randomness for everything pfuzz draws.

Every random choice in pfuzz flows from a ``RandomSource``: a numpy
``Generator`` over the PCG64 bit generator (O'Neill, 2014), whose bit stream
numpy keeps stable across versions and platforms for a given seed. Exact
draws below arbitrarily large Python integers (counts such as 10**40) are
made from whole 64-bit words by rejection, so they are exactly uniform and do
not depend on floating point. Nothing here relies on hash order.

Seeds are non-negative integers; ``None`` means "seed from the OS", which the
command line never uses (it defaults to seed 0). numpy is imported, and the
generator made, on the first draw, so that commands which draw nothing start
without it.
"""

from __future__ import annotations

from pfuzz.errors import ArgumentError

WORD_BITS = 64


class RandomSource:
    """A seeded generator with exact big-integer draws and a numpy face."""

    def __init__(self, seed: int | None = 0):
        if seed is not None and (not isinstance(seed, int) or seed < 0):
            raise ArgumentError(f"seed must be a non-negative integer, got {seed!r}")
        self.seed = seed
        self._numpy = None

    @property
    def numpy(self):
        """The numpy ``Generator`` (PCG64) every draw comes from, made on first use."""
        generator = self._numpy
        if generator is None:
            import numpy as np
            generator = self._numpy = np.random.Generator(np.random.PCG64(self.seed))
        return generator

    def bits(self, k: int) -> int:
        """A uniform integer in [0, 2**k)."""
        if k <= 0:
            return 0
        words = -(-k // WORD_BITS)
        raw = self.numpy.integers(0, 2**64, size=words, dtype="uint64", endpoint=False)
        value = 0
        for w in raw.tolist():
            value = (value << WORD_BITS) | int(w)
        return value >> (words * WORD_BITS - k)

    def below(self, n: int) -> int:
        """A uniform integer in [0, n), exact for any positive Python int."""
        if n <= 0:
            raise ArgumentError(f"below() needs a positive bound, not {n}")
        if n == 1:
            return 0
        k = (n - 1).bit_length()
        while True:
            value = self.bits(k)
            if value < n:
                return value

    def weighted_index(self, weights: list[int]) -> int:
        """Index i with probability weights[i] / sum(weights), exactly (integer weights)."""
        total = sum(weights)
        if total <= 0:
            raise ArgumentError("weighted_index() needs weights with a positive total")
        target = self.below(total)
        for i, w in enumerate(weights):
            if target < w:
                return i
            target -= w
        raise AssertionError("unreachable")

    def child_seed(self) -> int:
        """A 63-bit seed for a library that needs its own seed (faker)."""
        return self.bits(63)


def source(seed: "int | None | RandomSource") -> RandomSource:
    """Accept a seed or an existing source; return a source."""
    return seed if isinstance(seed, RandomSource) else RandomSource(seed)
