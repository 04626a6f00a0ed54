"""Run one benchmark case in a fresh Python process and read back its figures.

A fresh process makes the peak resident set size (``VmHWM`` from
``/proc/self/status``, which starts afresh at exec; ``ru_maxrss`` elsewhere)
belong to that case alone; it includes the bare interpreter, which ``measure("")``
reports as a baseline. CPU time (``time.process_time``) is the steadier
figure on a shared machine; wall time is given beside it. Both clocks start
before the case's own imports, as a user's run of the command would.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

#: The folder that holds the pfuzz package being measured (a checkout or site-packages).
#: Child processes start there, so they import this same pfuzz from any directory.
ROOT = Path(__file__).resolve().parents[2]

_PRELUDE = """
import json, resource, sys, time
t0, c0 = time.perf_counter(), time.process_time()
result = {}
"""
_REPORT = """
def _peak_mb():
    # VmHWM belongs to this program's own address space (it starts afresh at exec);
    # ru_maxrss can carry over the parent's peak from before the exec on Linux.
    try:
        with open("/proc/self/status") as status:
            for line in status:
                if line.startswith("VmHWM:"):
                    return int(line.split()[1]) / 1024
    except OSError:
        pass
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
result.update(wall_s=time.perf_counter() - t0, cpu_s=time.process_time() - c0,
              peak_rss_mb=_peak_mb())
print(json.dumps(result))
"""


def measure(body: str, *args: str) -> dict:
    """Run ``body`` (Python source that may fill the dict ``result`` and read ``sys.argv``)
    in a fresh interpreter started in ``ROOT``; its figures plus ``result``."""
    code = _PRELUDE + body + _REPORT
    done = subprocess.run([sys.executable, "-c", code, *args], capture_output=True, text=True,
                          cwd=ROOT, check=False)
    if done.returncode != 0:
        raise RuntimeError(f"benchmark case failed:\n{done.stderr}")
    return json.loads(done.stdout.splitlines()[-1])
