"""First use of the Unicode facts asked of ``re``: the shipped tables against the scan.

Each row is one first use in a fresh process, timed after the imports: ``\\d``, ``\\w``,
``\\s``, the case-sensitive code points behind ``(?i)``, ``(?a)\\d``, and all of them (every
category in both modes, then the case set). It is measured three ways:

- ``table``: the shipped table of the running interpreter, its bytecode cached (as after
  ``pip install``; the cache lives in a private ``PYTHONPYCACHEPREFIX`` warmed first);
- ``table, no bytecode``: the same with an empty bytecode cache and writing off, so the data
  module is compiled from source (a checkout run with ``PYTHONDONTWRITEBYTECODE``);
- ``scan``: the fallback for an interpreter with no shipped table, which asks ``re`` about
  every code point (what every interpreter paid before the tables).

CPU time (``time.process_time``, the steadier figure on a shared machine) as the median of
the runs, the wall time of the table runs beside it, and the peak resident set size of the
process (``VmHWM``). ``source`` says whether the running interpreter has a shipped table.
"""

from __future__ import annotations

import json
import os
import statistics
import subprocess
import sys
import tempfile

from pfuzz.syntax import unicode_tables

from ._child import ROOT

__all__ = ["run"]

_CASES = {
    "\\d": 'category("d")',
    "\\w": 'category("w")',
    "\\s": 'category("s")',
    "(?i) case set": "case_sensitive_points()",
    "(?a)\\d": 'category("d", True)',
    "all": '[category(l, a) for a in (False, True) for l in "dDwWsS"], case_sensitive_points()',
}

_BODY = """
import json, sys, time
from pfuzz.syntax import unicode_tables
from pfuzz.syntax.casefold import case_sensitive_points
from pfuzz.syntax.categories import category
if sys.argv[1] == "scan":
    unicode_tables.current = lambda: None
wall, cpu = time.perf_counter(), time.process_time()
{call}
cpu, wall = time.process_time() - cpu, time.perf_counter() - wall
with open("/proc/self/status") as status:
    peak = next(int(line.split()[1]) for line in status if line.startswith("VmHWM:"))
print(json.dumps([cpu * 1e3, wall * 1e3, peak / 1024]))
"""


def _once(call: str, way: str, cache: str) -> list[float]:
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
    env["PYTHONPYCACHEPREFIX"] = cache if way != "no bytecode" else os.path.join(cache, "empty")
    if way == "no bytecode":
        env["PYTHONDONTWRITEBYTECODE"] = "1"
    done = subprocess.run([sys.executable, "-c", _BODY.format(call=call), way],
                          capture_output=True, text=True, cwd=ROOT, env=env, check=False)
    if done.returncode != 0:
        raise RuntimeError(f"categories case failed:\n{done.stderr}")
    return json.loads(done.stdout.splitlines()[-1])


def _median(runs: list[list[float]], column: int) -> float:
    return statistics.median(run[column] for run in runs)


def run(quick: bool) -> list[dict]:
    repeats = 3 if quick else 7
    table = unicode_tables.current()
    source = table.__name__.rsplit(".", 1)[1] if table else "none shipped: scan"
    rows = []
    with tempfile.TemporaryDirectory(prefix="pfuzz-pycache-") as cache:
        _once(_CASES["all"], "table", cache)                  # fills the bytecode cache
        for label, call in _CASES.items():
            figures = {way: [_once(call, way, cache) for _ in range(repeats)]
                       for way in ("table", "no bytecode", "scan")}
            rows.append({"case": label, "runs": repeats,
                         "table_cpu_ms": f"{_median(figures['table'], 0):.2f}",
                         "table_wall_ms": f"{_median(figures['table'], 1):.2f}",
                         "no_bytecode_cpu_ms": f"{_median(figures['no bytecode'], 0):.2f}",
                         "scan_cpu_ms": f"{_median(figures['scan'], 0):.1f}",
                         "table_peak_mb": f"{_median(figures['table'], 2):.0f}",
                         "scan_peak_mb": f"{_median(figures['scan'], 2):.0f}",
                         "source": source})
    return rows
