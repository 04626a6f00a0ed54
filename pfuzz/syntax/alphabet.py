"""Alphabet specifications: a preset name or a character class in pattern syntax.

The alphabet is the set of characters pfuzz works over; a compiled language is
L(pattern) ∩ alphabet*. Presets are defined once, in ``pfuzz.base.charset``; a
specification that starts with ``[`` is parsed as a class of the pattern
syntax (for example ``"[ab]"`` or ``"[ -~\\t\\n]"``).
"""

from __future__ import annotations

from pfuzz.base.charset import DEFAULT_ALPHABET, ALPHABETS, CharSet
from pfuzz.errors import PatternError, AlphabetError


def resolve_alphabet(spec: "str | CharSet | None") -> CharSet:
    """The CharSet an alphabet specification names."""
    if spec is None:
        spec = DEFAULT_ALPHABET
    if isinstance(spec, CharSet):
        chars = spec
    elif isinstance(spec, str) and spec in ALPHABETS:
        chars = ALPHABETS[spec]
    elif isinstance(spec, str) and spec.startswith("["):
        chars = _parse_class(spec)
    else:
        names = ", ".join(ALPHABETS)
        raise AlphabetError(f"unknown alphabet {spec!r}: use one of {names}, or a class such as '[a-z0-9]'")
    chars = chars & ALPHABETS["unicode"]
    if not chars:
        raise AlphabetError(f"alphabet {spec!r} holds no characters")
    return chars


def alphabet_label(spec: "str | CharSet | None") -> str:
    """A short name for reports."""
    if spec is None:
        return DEFAULT_ALPHABET
    return spec if isinstance(spec, str) else spec.describe()


def _parse_class(spec: str) -> CharSet:
    from pfuzz.syntax.parser import parse
    from pfuzz.syntax.tree import Chars

    try:
        tree = parse(spec)
    except PatternError as error:
        raise AlphabetError(f"alphabet {spec!r} is not a valid class: {error.message}") from None
    if not isinstance(tree, Chars):
        raise AlphabetError(f"alphabet {spec!r} must be a single character class such as '[a-z]'")
    return tree.chars
