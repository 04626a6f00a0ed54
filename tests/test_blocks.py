"""Block enumeration by rank range (pfuzz.counting.blocks) against brute force with ``re``.

Reference: Python's ``re.fullmatch`` over every string of each length up to 5 on small
alphabets, sorted by code point (shortlex order within a length), computed without pfuzz.
"""

import itertools
import re

import pytest

import pfuzz
from pfuzz.counting import blocks
from pfuzz.counting.blocks import RankBlocks

CASES = [
    ("[ab]*a[ab]?", "ab"),
    ("(a|b\x00)*", "ab\x00"),           # U+0000 at the end of strings (numpy drops trailing NULs)
    ("x?[0-2]{2}|[1-9]", "x0129"),
    ("(ab|ba)+|c{3}", "abc"),
    ("[^b]+", "abc\u2028"),
]


def by_re(pattern: str, letters: str, length: int) -> list[str]:
    compiled = re.compile(pattern)
    words = ("".join(w) for w in itertools.product(sorted(letters), repeat=length))
    return [w for w in words if compiled.fullmatch(w)]


@pytest.mark.parametrize("rows", [0, 2, 4096])  # prefixes only / short suffixes / whole strings
@pytest.mark.parametrize("pattern, letters", CASES)
def test_every_rank_range_matches_brute_force(pattern, letters, rows, monkeypatch):
    monkeypatch.setattr(blocks, "BLOCK", 7)  # many blocks, and blocks that end mid-length
    monkeypatch.setattr(blocks, "SUFFIX_ROWS", rows)
    enumerator = RankBlocks(pfuzz.compile(pattern, f"[{re.escape(letters)}]").dfa)
    for length in range(6):
        expected = by_re(pattern, letters, length)
        assert enumerator.count(length) == len(expected)
        assert enumerator.strings(length, 0, len(expected)) == expected
        for start, stop in ((1, 4), (len(expected) // 2, len(expected))):
            start, stop = min(start, len(expected)), min(stop, len(expected))
            assert enumerator.strings(length, start, stop) == expected[start:stop]


def test_walk_counts_ranks_across_the_window():
    pattern, letters = "[ab]*a[ab]?", "ab"
    everything = [w for n in range(1, 6) for w in by_re(pattern, letters, n)]
    enumerator = RankBlocks(pfuzz.compile(pattern, "[ab]").dfa)
    got = [w for block in enumerator.walk(1, 5, 10, 40) for w in block]
    assert got == everything[10:40]


def test_counts_beyond_64_bits_stay_exact():
    # 10**20 strings of length 20 exceed 2**64; the last two in order are known by hand.
    enumerator = RankBlocks(pfuzz.compile("[0-9]{20}").dfa)
    top = 10**20
    assert enumerator.strings(20, top - 2, top) == ["9" * 19 + "8", "9" * 20]


def test_bad_ranges_are_argument_errors():
    enumerator = RankBlocks(pfuzz.compile("[ab]").dfa)
    with pytest.raises(pfuzz.ArgumentError):
        enumerator.strings(1, 1, 3)
