"""Strict, typed reading of parsed TOML tables, with errors that say where they are.

``tomllib`` turns a file into dicts and lists; this module checks them: an
unknown key is reported with the nearest known key (``difflib``'s
Ratcliff/Obershelp ratio, cutoff 0.6), a value of the wrong type with its
type and a short ``repr``, and every failure is a ``ProfileError`` that names
the file, the table and the key. Booleans are never accepted as integers
(``bool`` is a subclass of ``int`` in Python). ``pfuzz.profile.loader`` holds the
schema itself.
"""

from __future__ import annotations

import difflib

from pfuzz.errors import ProfileError


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
            self.fail(f"must be {limit}, not {value:,}", where, key)
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
    shown = repr(value)
    shown = shown if len(shown) <= 40 else shown[:37] + "..."
    return f"{kinds.get(type(value), 'a ' + type(value).__name__)} ({shown})"
