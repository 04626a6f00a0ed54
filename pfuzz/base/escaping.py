"""One escaper for code points: in a pattern, inside ``[...]``, or in one line of text output.

Every place that shows a character to a person or writes it into a Python ``re``
pattern goes through ``escape_point``, so a character looks the same in a pattern
pfuzz writes back, a class label in ``info`` or ``draw``, and a string in text output.
Printable characters (and the space) stand for themselves; ``\\n``, ``\\t`` and ``\\r``
get their names; everything else becomes ``\\xNN``, ``\\uNNNN`` or ``\\UNNNNNNNN``,
which is what both Python string literals and ``re`` read back.
"""

from __future__ import annotations

__all__ = ["escape_point", "escape_text", "needs_escape", "quoted"]

#: Characters with a meaning of their own, by where the character is written.
_SPECIAL = {
    "pattern": frozenset(".^$*+?{}[]\\|()"),
    "class": frozenset("\\]^-[&~|"),
    "text": frozenset("\\"),
}
_NAMED = {"\n": "\\n", "\t": "\\t", "\r": "\\r"}


def escape_point(point: int, where: str = "pattern") -> str:
    """Code point ``point`` written for ``where``: ``pattern``, ``class`` (inside ``[...]``)
    or ``text`` (one line of output, read back as a Python string literal's body)."""
    char = chr(point)
    if char in _NAMED:
        return _NAMED[char]
    if char in _SPECIAL[where]:
        return "\\" + char
    if char == " " or (char.isprintable() and not char.isspace()):
        return char
    if point <= 0xFF:
        return f"\\x{point:02x}"
    return f"\\u{point:04x}" if point <= 0xFFFF else f"\\U{point:08x}"


def needs_escape(text: str) -> bool:
    """True when ``escape_text`` would change ``text``."""
    return not text.isprintable() or "\\" in text


def escape_text(text: str) -> str:
    """One-line form of a string for text output: backslashes, line breaks, control and
    invisible characters become Python-style escapes."""
    if not needs_escape(text):
        return text
    return "".join(escape_point(ord(ch), "text") for ch in text)


def quoted(text: str) -> str:
    """A string as reports show it: in double quotes, escaped to one line."""
    return '"' + escape_text(text).replace('"', '\\"') + '"'
