"""Write (or check) the running interpreter's Unicode table module from ``re`` itself.

Usage: ``python -m pfuzz.syntax.unicode_tables.generate [--check] [--directory DIR]``.
Run it once with each supported interpreter. It scans every code point with ``re`` (``scan``),
checks the result against ``re`` for every code point by other calls (``scan.problems``) and
only then writes ``python<major>_<minor>_unicode<version>.py`` atomically. ``--check`` writes
nothing: it exits 1 unless the shipped module is exactly what would be written and agrees
with ``re``. Output is deterministic: the same interpreter version writes the same bytes.
"""

from __future__ import annotations

import argparse
import sys
import unicodedata
from pathlib import Path

from pfuzz.base.files import write_atomic
from pfuzz.syntax.unicode_tables import module_name, scan

__all__ = ["main", "render"]

_WIDTH = 99
_MEANING = {"DIGIT": "\\d", "WORD": "\\w", "SPACE": "\\s"}


_HEADER = '''"""What re matches on CPython {version} (Unicode {unicode}): generated, do not edit.

Written by ``python -m pfuzz.syntax.unicode_tables.generate`` on CPython {version}, which
checked every table against its ``re`` for every code point first. Each table holds sorted,
disjoint, inclusive code-point ranges as one flat tuple of bounds: low, high, low, high, ...
"""

__all__ = [
{names}
]

PYTHON = {python!r}
UNICODE = "{unicode}"
'''


def render(tables: dict[str, tuple[tuple[int, int], ...]], python: tuple[int, int],
           unicode: str) -> str:
    """The source text of the data module holding ``tables``."""
    names = ", ".join(f'"{name}"' for name in ("PYTHON", "UNICODE") + scan.TABLE_NAMES)
    lines = [_HEADER.format(version=f"{python[0]}.{python[1]}", unicode=unicode,
                            python=tuple(python), names="\n".join(_wrap(names.split(" "))))]
    for name in scan.TABLE_NAMES:
        ranges = tables[name]
        size = sum(high - low + 1 for low, high in ranges)
        bounds = [f"0x{low:X}, 0x{high:X}," for low, high in ranges]
        lines += [f"#: {_meaning(name)}: {size:,} code points in {len(ranges):,} ranges.",
                  f"{name} = (", *_wrap(bounds, "  "), ")", ""]
    return "\n".join(lines)


def _meaning(name: str) -> str:
    if name == scan.CASE_SENSITIVE:
        return "where IGNORECASE may change a match"
    ascii_only = name.startswith("ASCII_")
    return _MEANING[name.removeprefix("ASCII_")] + (" under re.ASCII" if ascii_only else "")


def _wrap(items: list[str], gap: str = " ") -> list[str]:
    lines, line = [], ""
    for item in items:
        if line and len(line) + len(gap) + len(item) + 4 > _WIDTH:
            lines.append("    " + line)
            line = ""
        line += (gap if line else "") + item
    return lines + ["    " + line] if line else lines


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="python -m pfuzz.syntax.unicode_tables.generate",
        description="Write the running interpreter's table of the Unicode facts re uses, "
                    "checked against re for every code point.")
    parser.add_argument("--check", action="store_true",
                        help="write nothing; exit 1 unless the shipped table is up to date")
    parser.add_argument("--directory", type=Path, default=Path(__file__).parent,
                        help="where the table modules live (default: this package)")
    return parser


def main(argv: list[str]) -> int:
    options = _parser().parse_args(argv)
    python, unicode = tuple(sys.version_info[:2]), unicodedata.unidata_version
    text = scan.every_code_point_text()
    tables = {name: scan.compute(name, text) for name in scan.TABLE_NAMES}
    found = scan.problems({**{name: scan.flat(table) for name, table in tables.items()},
                           "PYTHON": python, "UNICODE": unicode})
    path = options.directory / f"{module_name(python, unicode)}.py"
    source = render(tables, python, unicode)
    if options.check and not found:
        shipped = path.read_text(encoding="utf-8") if path.exists() else None
        found = [] if shipped == source else [f"{path} is missing or out of date"]
    for problem in found:
        print(problem, file=sys.stderr)
    if found:
        return 1
    if not options.check:
        write_atomic(path, source)
    for name in scan.TABLE_NAMES:
        print(f"{name:15} {len(tables[name]):5} ranges "
              f"{sum(high - low + 1 for low, high in tables[name]):7} code points")
    print(f"{path} {'is up to date' if options.check else 'written'}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
