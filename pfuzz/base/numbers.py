"""Exact counts as text: integers of any size, printed or described.

Counts are exact big integers by design (a field of 2,200 printable characters has more than
4,300 digits of strings), and Python refuses to turn an integer of more than 4,300 digits into
text (``sys.set_int_max_str_digits``, a guard against slow parsing of untrusted input).
``number_text`` prints a count with thousands separators, or describes its length past
``PRINTABLE_BITS``; ``big_integers`` lifts the limit for output that must hold every digit
(JSON, the ``count`` table), and puts it back.
"""

from __future__ import annotations

import contextlib
import sys

__all__ = ["PRINTABLE_BITS", "big_integers", "number_text"]

#: Binary digits past which an integer is described by its length, not printed
#: (below Python's 4,300-digit int-to-string limit).
PRINTABLE_BITS = 4000 * 3


def number_text(value: int) -> str:
    """``value`` with thousands separators, or its length when it is too long to print."""
    if value.bit_length() <= PRINTABLE_BITS:
        return f"{value:,}"
    digits = int(value.bit_length() * 0.30103) + 1
    return f"{'-' if value < 0 else ''}a number of about {digits:,} digits"


@contextlib.contextmanager
def big_integers():
    """Let integers of any number of digits become text inside the block."""
    previous = sys.get_int_max_str_digits()
    sys.set_int_max_str_digits(0)
    try:
        yield
    finally:
        sys.set_int_max_str_digits(previous)
