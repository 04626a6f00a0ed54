"""Hostile near-misses and case flips: the rejects a uniform sample rarely hits.

Validators written with ``re.match``/``$``, ``str.isdigit``, ``str.strip`` or
``\\d`` tend to let through a short list of characters that look harmless:
the final newline that ``$`` allows, tabs and carriage returns, spaces around
the value, digits of other scripts that ``\\d`` matches, full-width letters,
no-break and zero-width spaces (common practice of input validation; the
``$`` rule is Python's ``re`` documentation). This module writes, for given
valid strings (the witnesses), one variant of each such kind, and for the
case-flip category the witness with one letter (or every letter) in the other
case. Each variant comes with its witness and the exact edits that make it.

Nothing here decides validity: the audit keeps a variant only when the
specification language rejects it, so a specification that allows spaces, say,
simply produces no space cases. Nothing is random: the same witnesses give the
same variants in the same order.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Iterable

from pfuzz.base.charset import CharSet
from pfuzz.nearmiss.edits import Edit

NO_BREAK_SPACE = "\u00a0"
ZERO_WIDTH_SPACE = "\u200b"
BYTE_ORDER_MARK = "\ufeff"
#: Decimal digits of other scripts that Python's ``\d`` matches (Unicode category Nd):
#: ARABIC-INDIC, DEVANAGARI and FULLWIDTH DIGIT ZERO, each followed by 1..9.
DIGIT_ZEROS = (0x0660, 0x0966, 0xFF10)
FULL_WIDTH_OFFSET = 0xFF21 - ord("A")  # FULLWIDTH LATIN CAPITAL LETTER A is U+FF21

#: Every character a hostile variant may write (the audit widens its alphabet by these).
HOSTILE_CHARACTERS = CharSet.of(
    [(ord(c), ord(c)) for c in "\n\r\t " + NO_BREAK_SPACE + ZERO_WIDTH_SPACE + BYTE_ORDER_MARK]
    + [(zero, zero + 9) for zero in DIGIT_ZEROS]
    + [(ord("A") + FULL_WIDTH_OFFSET, ord("Z") + FULL_WIDTH_OFFSET),
       (ord("a") + FULL_WIDTH_OFFSET, ord("z") + FULL_WIDTH_OFFSET)]
)


@dataclass(frozen=True)
class Variant:
    """A hostile or case-flipped string, the valid string it was made from, and how."""

    text: str
    witness: str
    kind: str
    edits: tuple[Edit, ...]
    reason: str


def _insert(witness: str, at: int, chars: str) -> tuple[str, tuple[Edit, ...]]:
    return witness[:at] + chars + witness[at:], (Edit("insert", at, "", chars),)


def _replace(witness: str, at: int, char: str) -> tuple[str, tuple[Edit, ...]]:
    return witness[:at] + char + witness[at + 1:], (Edit("replace", at, witness[at], char),)


def _first(witness: str, test: Callable[[str], bool]) -> int | None:
    return next((i for i, ch in enumerate(witness) if test(ch)), None)


def _appended(chars: str, reason: str):
    def make(w: str):
        yield (*_insert(w, len(w), chars), reason)
    return make


def _prepended(chars: str, reason: str):
    def make(w: str):
        yield (*_insert(w, 0, chars), reason)
    return make


def _tabs(w: str):
    yield (*_insert(w, len(w), "\t"), "a tab after a valid string")
    at = _first(w, lambda ch: ch == " ")
    if at is not None:
        yield (*_replace(w, at, "\t"), "a tab in place of a space")


def _carriage_returns(w: str):
    yield (*_insert(w, len(w), "\r"), "a carriage return after a valid string")
    yield (*_insert(w, len(w), "\r\n"), "a CR LF line end after a valid string")


def _digits(w: str):
    at = _first(w, lambda ch: "0" <= ch <= "9")
    if at is not None:
        for zero in DIGIT_ZEROS:
            char = chr(zero + int(w[at]))
            yield (*_replace(w, at, char), f"U+{ord(char):04X}, a digit of another script that \\d matches")


def _full_width(w: str):
    at = _first(w, lambda ch: "A" <= ch <= "Z" or "a" <= ch <= "z")
    if at is not None:
        char = chr(ord(w[at]) + FULL_WIDTH_OFFSET)
        yield (*_replace(w, at, char), f"U+{ord(char):04X}, the full-width form of {w[at]!r}")


def _no_break(w: str):
    at = _first(w, lambda ch: ch == " ")
    if at is not None:
        yield (*_replace(w, at, NO_BREAK_SPACE), "a no-break space (U+00A0) in place of a space")
    yield (*_insert(w, len(w), NO_BREAK_SPACE), "a no-break space (U+00A0) after a valid string")


def _zero_width(w: str):
    yield (*_insert(w, len(w), ZERO_WIDTH_SPACE), "a zero-width space (U+200B) at the end")
    if len(w) >= 2:
        yield (*_insert(w, len(w) // 2, ZERO_WIDTH_SPACE), "a zero-width space (U+200B) inside")
    yield (*_insert(w, 0, BYTE_ORDER_MARK), "a byte order mark (U+FEFF) at the start")


#: The hostile kinds, in report order, each with the function that writes its variants.
HOSTILE_KINDS: dict[str, Callable[[str], Iterable]] = {
    "trailing-newline": _appended("\n", "a newline after a valid string (what $ lets through)"),
    "leading-newline": _prepended("\n", "a newline before a valid string"),
    "tab": _tabs,
    "carriage-return": _carriage_returns,
    "leading-space": _prepended(" ", "a space before a valid string"),
    "trailing-space": _appended(" ", "a space after a valid string"),
    "non-ascii-digit": _digits,
    "full-width-letter": _full_width,
    "no-break-space": _no_break,
    "zero-width-space": _zero_width,
}


def hostile_variants(witnesses: Iterable[str]) -> list[Variant]:
    """Every hostile variant of every witness, kinds in ``HOSTILE_KINDS`` order."""
    out = []
    for witness in witnesses:
        for kind, make in HOSTILE_KINDS.items():
            out.extend(Variant(text, witness, kind, edits, reason) for text, edits, reason in make(witness))
    return out


def case_flips(witnesses: Iterable[str]) -> list[Variant]:
    """For each witness: each letter flipped to the other case alone, then all letters at once."""
    out = []
    for witness in witnesses:
        for at, ch in enumerate(witness):
            flipped = ch.swapcase()
            if flipped != ch and len(flipped) == 1:
                text, edits = _replace(witness, at, flipped)
                out.append(Variant(text, witness, "one-letter", edits,
                                   f"{ch!r} in the other case at {at}"))
        every = witness.swapcase()
        if len(every) == len(witness) and sum(a != b for a, b in zip(every, witness)) > 1:
            edits = tuple(Edit("replace", i, a, b) for i, (a, b) in enumerate(zip(witness, every))
                          if a != b)
            out.append(Variant(every, witness, "all-letters", edits, "every letter in the other case"))
    return out
