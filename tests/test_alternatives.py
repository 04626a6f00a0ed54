"""Tests for pfuzz.nearmiss.alternatives and ``pfuzz explain --all``: every nearest valid string.

Reference: brute force. Every string over a small alphabet up to a length bound that
Python's ``re`` accepts, with its optimal-string-alignment distance to the text computed
by the textbook dynamic programme (Levenshtein's operations plus adjacent transposition).
"""

from __future__ import annotations

import re

import pytest
from click.testing import CliRunner

import pfuzz
from helpers import strings_upto
from pfuzz.cli import main
from pfuzz.nearmiss.alternatives import nearest_strings


def osa(a: str, b: str) -> int:
    d = [[0] * (len(b) + 1) for _ in range(len(a) + 1)]
    for i in range(len(a) + 1):
        d[i][0] = i
    for j in range(len(b) + 1):
        d[0][j] = j
    for i in range(1, len(a) + 1):
        for j in range(1, len(b) + 1):
            d[i][j] = min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + (a[i - 1] != b[j - 1]))
            if i > 1 and j > 1 and a[i - 1] == b[j - 2] and a[i - 2] == b[j - 1]:
                d[i][j] = min(d[i][j], d[i - 2][j - 2] + 1)
    return d[-1][-1]


CASES = [(r"[ab]{2}[01]", "b0a"), (r"a[01]*b", "ba"), (r"(ab|ba)0?", "0"), (r"[ab]1[ab]", "1"),
         (r"ab|ba|abc", "b"), (r"[01]{3}", "a0b1")]


@pytest.mark.parametrize("pattern, text", CASES)
def test_all_nearest_strings_match_brute_force(pattern, text):
    lang = pfuzz.compile(pattern, alphabet="[ab01]")
    why = lang.explain(text)
    valid = [s for s in strings_upto("ab01", len(text) + why.distance) if re.fullmatch(pattern, s)]
    best = min(osa(text, s) for s in valid)
    assert why.distance == best
    truth = {s for s in valid if osa(text, s) == best}
    found, complete = nearest_strings(lang.dfa, text, why.distance, 10_000)
    assert complete and set(found) == truth and len(found) == len(truth)


def test_the_listing_is_capped():
    lang = pfuzz.compile(r"[a-z]{10}")
    found, complete = nearest_strings(lang.dfa, "12345678ab", 8, 7)
    assert len(found) == 7 and not complete
    assert all(re.fullmatch(r"[a-z]{10}", s) and osa("12345678ab", s) == 8 for s in found)


def test_explain_all_lists_the_witness_first():
    result = CliRunner().invoke(main, ["explain", "[A-Z]{2}[0-9]{4}", "AB12O4", "--all"])
    assert result.exit_code == 1
    lines = result.stdout.splitlines()
    start = lines.index("all nearest (10 valid strings at 1 edit)")
    listed = [line.strip() for line in lines[start + 1:]]
    assert listed[0] == "AB1204" and sorted(listed) == [f"AB12{d}4" for d in range(10)]
    result = CliRunner().invoke(main, ["explain", "[a-z]{10}", "12345678ab", "--all",
                                       "--limit", "3", "--format", "json"])
    assert '"nearest_all_complete": false' in result.stdout
