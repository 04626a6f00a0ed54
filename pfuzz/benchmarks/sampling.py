"""Sampling speed next to ``re.fullmatch``, counting at long lengths, and memory.

Speed: for each pattern, in a fresh process, the tables are built by a warm-up
call, then the whole call ``lang.sample(n, seed=1)`` is timed against the loop
``sum(1 for s in xs if rx.fullmatch(s))`` over its output (CPU time, ``time.process_time``,
the steadier clock on a shared machine);
``ratio`` is the median of five such ratios (n = 10^6; ``--quick``: three, n =
2·10^5). Targets: at most 0.75 for the fixed-width patterns, 1.5 for the others.
Large cases (each in a fresh process under a 3 GiB address-space limit, CPU time
and peak resident memory, or the error raised): ``[0-9]{5000}`` counted at length
5000, 200 strings of ``.{65535,}?``. Memory: peak traced allocation (``tracemalloc``,
which sees numpy's buffers too) of the exact tables and of the float tables for
lengths up to 10^3 on a 100-state DFA, and of one bulk sample at length 10^4.
"""

from __future__ import annotations

import time
import tracemalloc

import pfuzz
from pfuzz.counting.bulk import FloatTables

from ._child import measure
from ._limits import measure_limited

#: (label, pattern, fixed width?): the bulk ratio targets are 0.75 for fixed-width
#: patterns and 1.5 for the others.
PATTERNS = [
    ("plate", r"[A-Z]{2}[0-9]{4}", True),
    ("date", r"[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])", True),
    ("UUID", r"[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}", True),
    ("[a-z]{1,64}", r"[a-z]{1,64}", False),
    ("e-mail-like", r"[a-z0-9._]{1,20}@[a-z0-9]{1,15}\.(com|org|net)", False),
]
#: A cyclic DFA of 100 states: a letter, then up to 99 digits, repeated.
HUNDRED_STATES = r"([a-f][0-9]{0,99})*"


_SPEED = """
import re, statistics
import pfuzz
pattern, n, repeats = sys.argv[1], int(sys.argv[2]), int(sys.argv[3])
lang, rx = pfuzz.compile(pattern), re.compile(pattern)
lang.sample(1000, seed=0)
runs = []
for _ in range(repeats):
    start = time.process_time()
    xs = lang.sample(n, seed=1)
    sample_s = time.process_time() - start
    start = time.process_time()
    ok = sum(1 for s in xs if rx.fullmatch(s))
    match_s = time.process_time() - start
    assert ok == n
    runs.append((sample_s / match_s, sample_s, match_s))
result["states"] = lang.states
result["ratio"], result["sample_s"], result["match_s"] = statistics.median(runs)
result["ratios"] = [round(r[0], 2) for r in runs]
"""


def speed_rows(quick: bool) -> list[dict]:
    """Bulk sampling against the ``re.fullmatch`` loop, each pattern in a fresh process:
    the median of ``repeats`` ratios, with its sample and match times and the peak memory."""
    n, repeats = (200_000, 3) if quick else (1_000_000, 5)
    rows = []
    for label, pattern, _ in PATTERNS:
        figures = measure(_SPEED, pattern, str(n), str(repeats))
        rows.append({"case": label, "states": figures["states"], "n": f"{n:,}",
                     "sample_s": f"{figures['sample_s']:.3f}",
                     "fullmatch_s": f"{figures['match_s']:.3f}",
                     "ratio": f"{figures['ratio']:.2f}",
                     "ratios": " ".join(f"{r:.2f}" for r in sorted(figures["ratios"])),
                     "peak_rss_mb": f"{figures['peak_rss_mb']:.0f}"})
    return rows


def _peak_mb(func) -> tuple[float, float, object]:
    tracemalloc.start()
    start = time.perf_counter()
    value = func()
    seconds = time.perf_counter() - start
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    return peak / 2**20, seconds, value


def memory_rows(quick: bool) -> list[dict]:
    lang = pfuzz.compile(HUNDRED_STATES)
    rows = []
    exact_mb, exact_s, _ = _peak_mb(lambda: pfuzz.compile(HUNDRED_STATES).counter._table(1000))
    rows.append({"case": "exact tables, lengths <= 1000", "states": lang.states,
                 "peak_MB": f"{exact_mb:.1f}", "seconds": f"{exact_s:.2f}"})
    float_mb, float_s, _ = _peak_mb(lambda: FloatTables(lang.counter, 1000))
    rows.append({"case": "float tables, lengths <= 1000", "states": lang.states,
                 "peak_MB": f"{float_mb:.1f}", "seconds": f"{float_s:.2f}"})
    long = 2_000 if quick else 10_000
    fresh = pfuzz.compile(HUNDRED_STATES)
    sample_mb, sample_s, xs = _peak_mb(lambda: fresh.sample(10, lengths=[long], seed=1))
    assert all(len(s) == long and fresh.accepts(s) for s in xs)
    rows.append({"case": f"10 strings at length {long:,} (bulk)", "states": fresh.states,
                 "peak_MB": f"{sample_mb:.1f}", "seconds": f"{sample_s:.2f}",
                 "bound": f"{fresh.counter.float_tables([long]).string_bound(long):.1e}"})
    return rows


_COUNT = """
import pfuzz
lang = pfuzz.compile(sys.argv[1])
start = time.process_time()
result["bits"] = lang.count(int(sys.argv[2])).bit_length()
result["count_s"] = time.process_time() - start
"""

_SAMPLE = """
import pfuzz
lang = pfuzz.compile(sys.argv[1])
start = time.process_time()
xs = lang.sample(int(sys.argv[2]), seed=1)
result["sample_s"] = time.process_time() - start
assert all(lang.accepts(s) for s in xs)
"""


def large_rows(quick: bool) -> list[dict]:
    """Counting at one long length, and a few strings from a huge chain, each in a fresh
    process under a 3 GiB address-space limit: CPU time and peak memory, or the error."""
    rows = []
    figures = measure_limited(_COUNT, "[0-9]{5000}", "5000")
    rows.append({"case": "[0-9]{5000}: count(5000)", "seconds": _seconds(figures, "count_s"),
                 "peak_rss_mb": _mb(figures), "outcome": figures["outcome"]})
    figures = measure_limited(_SAMPLE, ".{65535,}?", "200")
    rows.append({"case": ".{65535,}?: sample(200)", "seconds": _seconds(figures, "sample_s"),
                 "peak_rss_mb": _mb(figures), "outcome": figures["outcome"]})
    return rows


def _seconds(figures: dict, key: str) -> str:
    return f"{figures[key]:.3f}" if key in figures else f"({figures['cpu_s']:.1f} cpu)"


def _mb(figures: dict) -> str:
    return f"{figures['peak_rss_mb']:.0f}"


def run(quick: bool) -> list[dict]:
    return speed_rows(quick) + large_rows(quick) + memory_rows(quick)
