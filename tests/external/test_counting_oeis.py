"""Exact counts against published combinatorial facts.

Each check names its source beside it. OEIS sequence numbers and the first
terms quoted are from memory; every closed form used is also re-derived in
a comment, so a wrong memory shows up as a failing test, not a wrong
expectation silently trusted.
"""

from __future__ import annotations

import pytest

import pfuzz

N = range(0, 31)


def fibonacci(k: int) -> int:
    a, b = 0, 1
    for _ in range(k):
        a, b = b, a + b
    return a


def tribonacci(k: int) -> int:
    """OEIS A000073: 0, 0, 1, 1, 2, 4, 7, 13, 24, 44, ... (from memory)."""
    a, b, c = 0, 0, 1
    for _ in range(k):
        a, b, c = b, c, a + b + c
    return a


def counts(pattern: str, alphabet: str) -> list[int]:
    lang = pfuzz.compile(pattern, alphabet=alphabet)
    return [lang.count(n) for n in N]


def test_binary_strings_without_11_are_fibonacci():
    # OEIS A000045: binary strings of length n with no two consecutive 1s number F(n+2).
    assert counts(r"(0|10)*1?", "[01]") == [fibonacci(n + 2) for n in N]


def test_binary_strings_with_an_even_number_of_ones():
    # Common practice (flip the last bit): for n >= 1 exactly half of the 2^n binary
    # strings have an even number of 1s, 2^(n-1) (OEIS A000079, shifted); n = 0 gives 1.
    assert counts(r"0*(10*10*)*", "[01]") == [1] + [2 ** (n - 1) for n in N if n]


def test_fixed_length_decimal_strings():
    # Common practice: [0-9]{n} has 10^n strings; 40 digits exceed 64-bit integers.
    for n in [0, 1, 7, 40]:
        assert pfuzz.compile(rf"[0-9]{{{n}}}").count(n) == 10**n


def test_binary_strings_without_three_equal_in_a_row():
    # Runs of length 1 or 2 compose n as an ordered sum of 1s and 2s: F(n+1) ways
    # (OEIS A000045), times 2 for the first symbol; n = 0 gives the empty string.
    assert counts(r"(?!.*(000|111))[01]*", "[01]") == [1] + [2 * fibonacci(n + 1) for n in N if n]


def test_binary_strings_without_111_are_tribonacci():
    # OEIS A000073: binary strings of length n avoiding 111 number A000073(n+3)
    # (from memory; the recurrence a(n) = a(n-1) + a(n-2) + a(n-3) follows from the
    # last 0 being at position n, n-1 or n-2).
    assert counts(r"(0|10|110)*(1|11)?", "[01]") == [tribonacci(n + 3) for n in N]


def test_ternary_strings_without_equal_neighbours():
    # Common practice: 3 choices for the first symbol, 2 for each next one: 3 * 2^(n-1)
    # (OEIS A007283, 3 * 2^n, shifted; from memory).
    assert counts(r"(?!.*(aa|bb|cc))[abc]*", "[abc]") == [1] + [3 * 2 ** (n - 1) for n in N if n]


def test_decimal_numerals_without_leading_zeros():
    # Common practice: "0", or a non-zero digit then n-1 digits: 9 * 10^(n-1) for n >= 2.
    assert counts(r"0|[1-9][0-9]*", "printable")[:8] == [0, 10] + [9 * 10 ** (n - 1) for n in range(2, 8)]


def test_rfc3986_dec_octet_has_256_values():
    # RFC 3986 section 3.2.2, dec-octet: exactly the decimal numerals 0-255, one per value.
    dec_octet = r"[0-9]|[1-9][0-9]|1[0-9]{2}|2[0-4][0-9]|25[0-5]"
    lang = pfuzz.compile(dec_octet)
    assert lang.total == 256
    assert sorted(lang.enumerate(1, 3), key=int) == [str(v) for v in range(256)]
    # RFC 3986 IPv4address = dec-octet "." dec-octet "." dec-octet "." dec-octet: 2^32 strings.
    quad = pfuzz.compile(rf"({dec_octet})(\.({dec_octet})){{3}}")
    assert quad.total == 2**32


@pytest.mark.parametrize("k", [1, 2, 3])
def test_words_with_exactly_k_ones(k):
    # Common practice: binary strings of length n with exactly k ones number C(n, k).
    from math import comb
    assert counts(rf"0*(10*){{{k}}}", "[01]") == [comb(n, k) for n in N]
