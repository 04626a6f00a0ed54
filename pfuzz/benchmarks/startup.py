"""Cold start: the whole process of short commands, beside ``python -c "import click"``.

Each row runs a fresh interpreter the way a user runs the command (the console
script is ``pfuzz.cli:main``), several times, and gives the median wall time of
the whole process (interpreter start included) and the median peak resident set
size (``VmHWM``, read at exit); ``cpu_ms`` is the median CPU time of the child
(user + system), the steadier figure on a shared machine. These runs find the
modules' bytecode cached (in a temporary ``PYTHONPYCACHEPREFIX``, warmed by one run),
as an installed package has it; ``cold_cpu_ms`` is the same with the environment as
given, which may forbid bytecode files (``PYTHONDONTWRITEBYTECODE``), so that every
module is compiled from source on every run. Commands that need no arrays should not
import numpy; the ``numpy`` column says whether the process did. Target: ``info`` and
``explain`` within twice the time of importing click alone.
"""

from __future__ import annotations

import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time

from ._child import ROOT

_PEAK = """
import atexit, sys
def _report():
    peak = 0
    with open("/proc/self/status") as status:
        for line in status:
            if line.startswith("VmHWM:"):
                peak = int(line.split()[1])
    sys.stderr.write(f"\\n@peak {peak} {int('numpy' in sys.modules)}\\n")
atexit.register(_report)
"""

CASES = [
    ("python -c 'import click'", "import click"),
    ("python -c 'import pfuzz'", "import pfuzz"),
    ("pfuzz info '[a-z]+'", "from pfuzz.cli import main; main(['info', '[a-z]+'])"),
    ("pfuzz explain '[0-9]{4}' 12a4",
     "from pfuzz.cli import main; main(['explain', '[0-9]{4}', '12a4'])"),
]


def _cpu() -> float:
    used = resource.getrusage(resource.RUSAGE_CHILDREN)
    return used.ru_utime + used.ru_stime


def _once(code: str, env: "dict | None" = None) -> tuple[float, float, float, bool]:
    start, cpu = time.perf_counter(), _cpu()
    done = subprocess.run([sys.executable, "-c", _PEAK + code], capture_output=True, text=True,
                          cwd=ROOT, check=False, env=env)
    seconds, cpu = time.perf_counter() - start, _cpu() - cpu
    tail = done.stderr.rsplit("@peak", 1)
    if len(tail) < 2:
        raise RuntimeError(f"startup case failed:\n{done.stderr}")
    peak_kb, numpy = tail[1].split()
    return seconds, cpu, int(peak_kb) / 1024, numpy == "1"


def run(quick: bool) -> list[dict]:
    repeats = 3 if quick else 9
    rows = []
    with tempfile.TemporaryDirectory() as cache:
        cached = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}
        cached["PYTHONPYCACHEPREFIX"] = cache
        for label, code in CASES:
            _once(code, cached)  # writes the bytecode
            runs = [_once(code, cached) for _ in range(repeats)]
            cold = [_once(code) for _ in range(repeats)]
            rows.append({"case": label, "runs": repeats,
                         "median_ms": f"{statistics.median(r[0] for r in runs) * 1000:.0f}",
                         "cpu_ms": f"{statistics.median(r[1] for r in runs) * 1000:.0f}",
                         "cold_cpu_ms": f"{statistics.median(r[1] for r in cold) * 1000:.0f}",
                         "peak_rss_mb": f"{statistics.median(r[2] for r in runs):.0f}",
                         "numpy": "yes" if runs[-1][3] else "no"})
    return rows
