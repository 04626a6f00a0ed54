"""Sampling speed next to ``re.fullmatch``, and the memory of the count tables.

Speed: for each pattern, the tables are built by a warm-up call, then the
whole call ``lang.sample(n, seed=1)`` is timed against the loop
``sum(1 for s in xs if rx.fullmatch(s))`` over its output (best of a few
runs each, ``time.perf_counter``); ``ratio`` is sample time / match time
(target: at most 3; n = 200,000 is the issue's reference case). Memory:
peak traced allocation (``tracemalloc``, which sees numpy's buffers too) of
the exact tables and of the float tables for lengths up to 10^3 on a
100-state DFA, and of one bulk sample at length 10^4.
"""

from __future__ import annotations

import re
import time
import tracemalloc

import pfuzz
from pfuzz.counting.bulk import FloatTables

PATTERNS = [
    r"[A-Z]{2}[0-9]{4}",
    r"[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])",
    r"[a-z0-9._]{1,20}@[a-z0-9]{1,15}\.(com|org|net)",
    r"[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}",
]
#: A cyclic DFA of 100 states: a letter, then up to 99 digits, repeated.
HUNDRED_STATES = r"([a-f][0-9]{0,99})*"


def _best(func, runs: int) -> tuple[float, object]:
    best, value = float("inf"), None
    for _ in range(runs):
        start = time.perf_counter()
        value = func()
        best = min(best, time.perf_counter() - start)
    return best, value


def speed_rows(quick: bool) -> list[dict]:
    sizes = [200_000] if quick else [100_000, 200_000, 1_000_000]
    rows = []
    for pattern in PATTERNS:
        lang = pfuzz.compile(pattern)
        rx = re.compile(pattern)
        lang.sample(1000, seed=0)
        for n in sizes:
            runs = 1 if n >= 1_000_000 or quick else 3
            sample_s, xs = _best(lambda: lang.sample(n, seed=1), runs)
            match_s, ok = _best(lambda: sum(1 for s in xs if rx.fullmatch(s)), runs)
            assert ok == n
            rows.append({"case": pattern if len(pattern) <= 40 else pattern[:37] + "...",
                         "states": lang.states, "n": f"{n:,}", "sample_s": f"{sample_s:.3f}",
                         "fullmatch_s": f"{match_s:.3f}", "ratio": f"{sample_s / match_s:.2f}"})
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
                 "bound": f"{fresh.counter.float_tables(long).string_bound(long):.1e}"})
    return rows


def run(quick: bool) -> list[dict]:
    return speed_rows(quick) + memory_rows(quick)
