"""Run every benchmark module (or those named) and print their figures.

Usage: ``python -m pfuzz.benchmarks [compile sampling nearmiss corpus ...] [--quick]``.
Each module in this package that defines ``run(quick: bool) -> list[dict]``
is a section; rows are printed as an aligned table.
"""

from __future__ import annotations

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


def main(argv: list[str]) -> int:
    quick = "--quick" in argv
    wanted = [a for a in argv if not a.startswith("-")]
    here = Path(__file__).parent
    names = sorted(m.name for m in pkgutil.iter_modules([str(here)]) if not m.name.startswith("_"))
    for name in names:
        if wanted and name not in wanted:
            continue
        module = importlib.import_module(f"{__package__}.{name}")
        if hasattr(module, "run"):
            _print_table(name, module.run(quick))
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
