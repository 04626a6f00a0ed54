"""Run every benchmark module (or those named) and print their figures.

Usage: ``python -m pfuzz.benchmarks [SECTION ...] [--quick]`` (``--help`` lists the sections).
Each module in this package that defines ``run(quick: bool) -> list[dict]``
is a section; rows are printed as an aligned table.
"""

from __future__ import annotations

import argparse
import importlib
import pkgutil
import sys
from pathlib import Path


def _print_table(title: str, rows: list[dict]) -> None:
    print(f"\n== {title} ==")
    if not rows:
        print("(no rows)")
        return
    columns = list(rows[0])
    for row in rows[1:]:
        for key in row:
            if key not in columns:
                columns.append(key)
    cells = [[str(row.get(c, "")) for c in columns] for row in rows]
    widths = [max(len(c), *(len(r[i]) for r in cells)) for i, c in enumerate(columns)]
    print("  ".join(c.ljust(w) for c, w in zip(columns, widths)))
    for r in cells:
        print("  ".join(v.ljust(w) for v, w in zip(r, widths)))


def sections() -> list[str]:
    """The benchmark modules of this package, by name."""
    here = Path(__file__).parent
    return sorted(m.name for m in pkgutil.iter_modules([str(here)]) if not m.name.startswith("_"))


def _parser(names: list[str]) -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="python -m pfuzz.benchmarks",
        description="Speed and memory figures of pfuzz (not tests): one table per section, "
                    "every section unless some are named. Runs from any directory.",
        epilog="sections: " + ", ".join(names))
    parser.add_argument("names", nargs="*", metavar="SECTION", help="sections to run")
    parser.add_argument("--quick", action="store_true", help="smaller sizes, fewer repeats")
    return parser


def main(argv: list[str]) -> int:
    names = sections()
    options = _parser(names).parse_args(argv)
    unknown = sorted(set(options.names) - set(names))
    if unknown:
        print(f"unknown section(s): {', '.join(unknown)}; choose from {', '.join(names)}",
              file=sys.stderr)
        return 2
    for name in names:
        if options.names and name not in options.names:
            continue
        module = importlib.import_module(f"{__package__}.{name}")
        if hasattr(module, "run"):
            _print_table(name, module.run(options.quick))
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
