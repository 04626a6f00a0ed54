"""Syntax: pattern text (Python `re` syntax) to an immutable syntax tree.

Takes a pattern and flags; gives a tree whose character sets are `CharSet`s over an alphabet.
Owns escapes, classes, the Unicode facts asked of `re` (categories, case folding) and alphabets."""

__all__: list[str] = []
