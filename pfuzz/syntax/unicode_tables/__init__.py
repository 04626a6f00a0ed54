"""Generated tables of the Unicode facts ``re`` uses, one data module per interpreter version.

A module such as ``python3_11_unicode14_0_0`` (CPython 3.11 with Unicode 14.0.0) holds, as
sorted disjoint inclusive code-point ranges, what ``\\d``, ``\\w`` and ``\\s`` match with and
without re.ASCII, and the code points where IGNORECASE may change a match, exactly as ``re``
has them on that interpreter. Each table is one flat tuple of bounds (low, high, low, ...),
which compiles several times faster than a tuple of pairs where no bytecode is cached.
``python -m pfuzz.syntax.unicode_tables.generate`` writes the module for the interpreter
that runs it, after checking it against that interpreter's ``re`` for every code point
(``scan.problems``).

``ranges(name)`` gives the running interpreter's table when one is shipped for its Python
minor version and ``unicodedata.unidata_version``, and otherwise asks ``re`` (``scan``, one
pass over the 1,114,112 code points per table and process).

Cost: one import of a data module of constants per process (an unmarshal of its cached
bytecode, or a compile of about 18 kB of source where bytecode is not cached).
Limits: a table is keyed by minor version, not patch release (``re``'s categories follow the
Unicode version, fixed within a minor release); the tests check every shipped table against
each interpreter of its version found on the machine.
"""

from __future__ import annotations

import functools
import importlib
import pkgutil
import sys
import unicodedata
from types import ModuleType

__all__ = ["current", "module_name", "ranges", "shipped"]


def module_name(python: tuple[int, int], unicode: str) -> str:
    """The name of the table module for a Python minor version and a Unicode version."""
    return f"python{python[0]}_{python[1]}_unicode{unicode.replace('.', '_')}"


def shipped() -> list[str]:
    """The names of the table modules in this package."""
    return sorted(info.name for info in pkgutil.iter_modules(__path__)
                  if info.name.startswith("python"))


@functools.cache
def current() -> ModuleType | None:
    """The running interpreter's table module, or None when none is shipped for it."""
    key = (tuple(sys.version_info[:2]), unicodedata.unidata_version)
    try:
        table = importlib.import_module(f"{__name__}.{module_name(*key)}")
    except ModuleNotFoundError:
        return None
    return table if (table.PYTHON, table.UNICODE) == key else None


def ranges(name: str) -> tuple[tuple[int, int], ...]:
    """The table ``name`` (one of ``scan.TABLE_NAMES``) for the running interpreter."""
    from pfuzz.syntax.unicode_tables import scan
    table = current()
    return scan.pairs(getattr(table, name)) if table is not None else scan.compute(name)
