"""Strict, typed reading of TOML profiles, with errors that say where they are.

``read_toml`` turns the bytes of a file into dicts and lists with the standard
library's ``tomllib``, and turns every way that can fail into a ``ProfileError``:
bytes that are not UTF-8 (a UTF-16 or UTF-32 byte-order mark is named as such), a
UTF-8 byte-order mark (accepted: it is an encoding signature, not content, and
Windows editors write it), a decimal integer of more than 4,300 digits (Python's
int-to-string limit, which ``tomllib`` trips), and values nested more than
``MAX_NESTING`` deep (a profile needs four levels; ``tomllib`` recurses once per
level and would run out of stack at a few hundred).

``TableReader`` then checks the tables: an unknown key is reported with the nearest
known key (``difflib``'s Ratcliff/Obershelp ratio, cutoff 0.6), a value of the
wrong type with its type and a short ``repr``, and every failure is a
``ProfileError`` that names the file, the table and the key. Booleans are never
accepted as integers (``bool`` is a subclass of ``int`` in Python). Numbers too
long to print (a hexadecimal integer has no digit limit) are described by their
length. ``pfuzz.profile.loader`` holds the schema itself.
"""

from __future__ import annotations

import codecs
import difflib
import tomllib

from pfuzz.base.numbers import number_text
from pfuzz.errors import ProfileError, shorten

__all__ = ["MAX_NESTING", "RENAMED_KEYS", "TableReader", "hint", "read_toml"]

#: Deepest nesting of arrays and tables a profile may use, the document's own table counting
#: as one (a [[field]]'s require list is at level four).
MAX_NESTING = 32
#: Byte-order marks of encodings a profile may not use, longest first.
OTHER_ENCODINGS = ((codecs.BOM_UTF32_LE, "UTF-32"), (codecs.BOM_UTF32_BE, "UTF-32"),
                   (codecs.BOM_UTF16_LE, "UTF-16"), (codecs.BOM_UTF16_BE, "UTF-16"))


def read_toml(raw: bytes, label: str) -> dict:
    """The tables of the TOML document ``raw``; ``ProfileError`` (naming ``label``) if it
    is not one that a profile can be."""
    for mark, encoding in OTHER_ENCODINGS:
        if raw.startswith(mark):
            raise ProfileError(f"is {encoding} text (it starts with a {encoding} byte-order "
                               "mark); save it as UTF-8", path=label)
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as error:
        raise ProfileError(f"not UTF-8 text (byte {error.start})", path=label) from None
    text = text.removeprefix("\ufeff")        # the UTF-8 byte-order mark: a signature only
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise ProfileError(f"not valid TOML: {shorten(str(error), 200)}", path=label) from None
    except RecursionError:
        raise _too_deep(label) from None
    except ValueError as error:
        if "digits" not in str(error):
            raise ProfileError(f"not valid TOML: {shorten(str(error), 200)}", path=label) from None
        raise ProfileError("holds a decimal integer of more than 4,300 digits (the most Python "
                           "reads); no profile key takes one", path=label) from None
    if _depth(data) > MAX_NESTING:
        raise _too_deep(label)
    return data


def _too_deep(label: str) -> ProfileError:
    return ProfileError(f"arrays and tables nest more than {MAX_NESTING} levels deep (the "
                        "document counting as one); a profile needs four", path=label)


def _depth(value) -> int:
    """Deepest nesting of lists and dicts in ``value`` (iterative: no recursion limit)."""
    deepest, stack = 0, [(value, 0)]
    while stack:
        item, depth = stack.pop()
        if isinstance(item, dict):
            item = list(item.values())
        if isinstance(item, list):
            deepest = max(deepest, depth + 1)
            if deepest > MAX_NESTING:
                return deepest
            stack.extend((child, depth + 1) for child in item)
    return deepest


#: Keys of earlier profile versions, with what replaced them.
RENAMED_KEYS = {"universe": "renamed to 'alphabet': the set of characters a field is over"}


def hint(value: str, known, fallback: str) -> str:
    """"did you mean 'x'?" for the nearest known value, else ``fallback``."""
    close = difflib.get_close_matches(value, list(known), n=1)
    return f"did you mean '{close[0]}'?" if close else fallback


class TableReader:
    """Typed access to parsed TOML tables; every failure is a ``ProfileError`` with its place."""

    count_limit: int | None = None    #: upper bound of ``count`` values (None: no bound)

    def __init__(self, label: str):
        self.label = label

    def fail(self, message: str, where: str = "", key: str = "", detail: str = "") -> None:
        raise ProfileError(message, path=self.label, where=where, key=key, detail=detail)

    def keys(self, table: dict, known: tuple[str, ...], where: str) -> None:
        for key in table:
            if key not in known:
                why = RENAMED_KEYS.get(key) or hint(key, known, "known keys: " + ", ".join(known))
                self.fail(f"is not known ({why})", where, key)

    def get(self, table: dict, key: str, kind: type, where: str, *, required=False, default=None):
        if key not in table:
            if required:
                self.fail("is required", where, key)
            return default
        value = table[key]
        if not isinstance(value, kind) or (kind is int and isinstance(value, bool)):
            self.fail(f"must be {_KIND_NAMES[kind]}, not {_describe(value)}", where, key)
        return value

    def count(self, table: dict, key: str, where: str, default, low=0, high=None):
        value = self.get(table, key, int, where, default=default)
        high = self.count_limit if high is None else high
        if value is not None and (value < low or (high is not None and value > high)):
            limit = f"between {low:,} and {high:,}" if high is not None else f"at least {low:,}"
            self.fail(f"must be {limit}, not {number_text(value)}", where, key)
        return value

    def strings(self, table: dict, key: str, where: str) -> tuple[str, ...]:
        values = self.get(table, key, list, where, default=[])
        for i, item in enumerate(values):
            if not isinstance(item, str):
                self.fail(f"item {i + 1} must be a string, not {_describe(item)}", where, key)
        return tuple(values)

    def choices(self, table: dict, key: str, where: str, allowed: tuple[str, ...], default):
        values = self.strings(table, key, where) if key in table else default
        for value in values:
            if value not in allowed:
                why = hint(value, allowed, "use " + ", ".join(allowed))
                self.fail(f"'{value}' is not one of {', '.join(allowed)} ({why})", where, key)
        if len(set(values)) != len(values):
            self.fail("lists a value twice", where, key)
        return tuple(values)

    def table(self, data: dict, key: str, where: str, required=False) -> dict:
        return self.get(data, key, dict, where, required=required, default={})

    def tables(self, data: dict, key: str, where: str) -> list[dict]:
        items = self.get(data, key, list, where, default=[])
        for i, item in enumerate(items):
            if not isinstance(item, dict):
                self.fail(f"entry {i + 1} must be a table ([[{key}]]), not {_describe(item)}",
                          where, key)
        return items


_KIND_NAMES = {str: "a string", int: "an integer", list: "a list", dict: "a table"}


def _describe(value) -> str:
    kinds = {bool: "a boolean", int: "an integer", float: "a number", str: "a string",
             list: "a list", dict: "a table"}
    if isinstance(value, int) and not isinstance(value, bool):
        shown = number_text(value)
    elif isinstance(value, (list, dict)):
        shown = f"{len(value):,} item{'s' if len(value) != 1 else ''}"
    else:
        shown = shorten(repr(value), 40)
    return f"{kinds.get(type(value), 'a ' + type(value).__name__)} ({shown})"
