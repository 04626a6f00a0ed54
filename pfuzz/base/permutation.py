"""A keyed pseudo-random permutation of [0, size) for any positive integer size.

Method: a balanced Feistel network of ``FEISTEL_ROUNDS`` = 8 rounds (Luby & Rackoff,
SIAM J. Comput. 17(2), 1988) on the smallest even number of bits 2h that covers
size − 1, restricted to [0, size) by cycle-walking (Black & Rogaway, CT-RSA 2002):
the network is applied again until the value falls inside. Each round is a bijection
of the 2h-bit words whatever its round function, so the whole is a bijection of
[0, size), exactly. The domain 2^(2h) is under 4·size, so fewer than 4 walks are
expected per value.

Round functions: for halves up to ``VECTOR_BITS`` = 31 bits (sizes below 2^62), the
SplitMix64 finaliser (Steele, Lea & Flood, OOPSLA 2014) of the half XOR a round key,
run on numpy arrays in blocks of ``BLOCK`` values, the 8 round keys from SHAKE-256
(FIPS 202) of the key; for wider halves, SHAKE-256 of (key, round, half) itself,
one value at a time with Python integers.

How far to trust it (an approximation, stated): the images of 0, 1, 2, ... are
pseudo-random, not an exactly uniform random arrangement. With truly random round
functions, Luby–Rackoff bounds the advantage of any q-query distinguisher by
q²/2^h; the bound says nothing once q approaches 2^(h/2), and SplitMix64 is a
statistical mixer, not a cryptographic one. Beyond the bound the choice rests on the
network's standard use (format-preserving encryption: NIST SP 800-38G uses 8 and 10
rounds) and on tests (bijection by brute force; a chi-square test of strings drawn
through it, in tests/test_corpus_shards.py).

Cost: per value, 8 rounds per walk: vectorised uint64 arithmetic (about a
microsecond per value over a block), or 8 SHAKE-256 calls for wide halves. Memory: one
block of ``BLOCK`` values.
"""

from __future__ import annotations

import hashlib

import numpy as np

from pfuzz.errors import ArgumentError

__all__ = ["FEISTEL_ROUNDS", "KeyedPermutation"]

FEISTEL_ROUNDS = 8


class KeyedPermutation:
    """A bijection of [0, size) keyed by ``key`` (bytes): cycle-walked 8-round Feistel.

    Halves of at most ``VECTOR_BITS`` bits run as numpy arrays with a 64-bit round
    function (the SplitMix64 finaliser of the half XOR a round key, the round keys from
    SHAKE-256 of the key); wider halves run one value at a time with SHAKE-256 as the
    round function."""

    VECTOR_BITS = 31
    BLOCK = 1 << 16

    def __init__(self, size: int, key: bytes):
        if size <= 0:
            raise ArgumentError(f"a permutation needs a positive size, not {size}")
        bits = max(2, (size - 1).bit_length())
        self.size, self.half = size, (bits + 1) // 2
        self.mask = (1 << self.half) - 1
        self.width = (self.half + 7) // 8
        self._keyed = hashlib.shake_256(len(key).to_bytes(4, "big") + key)
        round_keys = self._keyed.copy().digest(8 * FEISTEL_ROUNDS)
        self._round_keys = np.frombuffer(round_keys, dtype=">u8").astype(np.uint64)

    def _round(self, number: int, value: int) -> int:
        state = self._keyed.copy()
        state.update(bytes([number]) + value.to_bytes(self.width, "big"))
        return int.from_bytes(state.digest(self.width), "big") & self.mask

    def _network(self, value: int) -> int:
        left, right = value >> self.half, value & self.mask
        for number in range(FEISTEL_ROUNDS):
            left, right = right, left ^ self._round(number, right)
        return (left << self.half) | right

    def _network_array(self, values):
        half, mask = np.uint64(self.half), np.uint64(self.mask)
        left, right = values >> half, values & mask
        for number in range(FEISTEL_ROUNDS):
            z = right ^ self._round_keys[number]
            z = (z ^ (z >> np.uint64(30))) * np.uint64(0xBF58476D1CE4E5B9)
            z = (z ^ (z >> np.uint64(27))) * np.uint64(0x94D049BB133111EB)
            left, right = right, left ^ ((z ^ (z >> np.uint64(31))) & mask)
        return (left << half) | right

    def __call__(self, index: int) -> int:
        if not 0 <= index < self.size:
            raise ArgumentError(f"index {index} is outside [0, {self.size})")
        return next(iter(self.many(index, index + 1)))

    def many(self, first: int, last: int):
        """The images of ``first..last`` (an iterator of ints), in blocks of ``BLOCK``."""
        if not 0 <= first <= last <= self.size:
            raise ArgumentError(f"[{first}, {last}) is outside [0, {self.size})")
        if self.half > self.VECTOR_BITS:
            return (self._walk(t) for t in range(first, last))
        return (value for low in range(first, last, self.BLOCK)
                for value in self._walk_array(low, min(last, low + self.BLOCK)))

    def _walk(self, value: int) -> int:
        value = self._network(value)
        while value >= self.size:          # cycle-walking: stays a bijection of [0, size)
            value = self._network(value)
        return value

    def _walk_array(self, low: int, high: int) -> list[int]:
        values = self._network_array(np.arange(low, high, dtype=np.uint64))
        outside = values >= np.uint64(self.size)
        while outside.any():
            values[outside] = self._network_array(values[outside])
            outside = values >= np.uint64(self.size)
        return values.tolist()
