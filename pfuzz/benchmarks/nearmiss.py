"""Near-miss languages: build time, automaton sizes, rejects with witnesses per second.

For each pattern: the CPU time (``time.process_time``, best of a few runs,
caches cleared before each) to build the minimal near-miss DFA at distance 1
and 2, its states, and the time to draw rejects with ``sample_rejects``
(uniform texts, then each one's kinds and nearest witness), with the share
spent in ``explain`` alone. Full runs draw 10^5 rejects at distance 1,
``--quick`` 10^4. Targets: distance 1 under 100 ms, distance 2 under 1 s for
realistic validator patterns over printable ASCII; 10^5 explanations of a
50-state pattern under 10 s.

The bounded e-mail pattern is there as a limit: its minimal near-miss DFA
has about 9,500 states at distance 1 (bounded repeats on both sides of
overlapping separators) and exceeds the default state cap at distance 2, so
only distance 1 is timed.
"""

from __future__ import annotations

import time

import statistics

from pfuzz.nearmiss import rejects as nearmiss
from pfuzz.automata.construction.compiler import compile_dfa
from pfuzz.syntax.alphabet import resolve_alphabet
from pfuzz.nearmiss.witness import explain, nearest

from ._limits import measure_limited

DATE = (r"(?:(?:[0-9]{2}(?:0[48]|[2468][048]|[13579][26])|(?:0[48]|[2468][048]|[13579][26])00)"
        r"-02-29|[0-9]{4}-(?:(?:0[13578]|1[02])-(?:0[1-9]|[12][0-9]|3[01])"
        r"|(?:0[469]|11)-(?:0[1-9]|[12][0-9]|30)|02-(?:0[1-9]|1[0-9]|2[0-8])))")
TIMESTAMP = DATE + r"T(?:[01][0-9]|2[0-3]):[0-5][0-9]:[0-5][0-9](?:Z|[+-](?:[01][0-9]|2[0-3]):[0-5][0-9])"
EMAIL = r"[a-z0-9._%+-]+@[a-z0-9-]+(?:\.[a-z0-9-]+)*\.[a-z]{2,}"
EMAIL_BOUNDED = r"[A-Za-z0-9._%+-]{1,32}@[A-Za-z0-9-]{1,32}\.[A-Za-z]{2,6}"
PASSWORD = r"(?=.*[0-9])(?=.*[a-z])(?=.*[A-Z])[ -~]{8,16}"
PASSWORD_64 = r"(?=.*[0-9])(?=.*[a-z])(?=.*[A-Z])(?=.*[^A-Za-z0-9])[ -~]{8,64}"
IPV4_OCTET = r"(?:25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9][0-9]|[0-9])"
IPV4 = IPV4_OCTET + r"(?:\." + IPV4_OCTET + r"){3}"

#: (name, pattern, distances to build, rejects drawn?)
CASES = [
    ("date (Gregorian, leap days)", DATE, (1, 2), True),
    ("timestamp (date, time, offset)", TIMESTAMP, (1, 2), True),
    ("e-mail-like", EMAIL, (1, 2), True),
    ("password (3 lookaheads, 8-16)", PASSWORD, (1, 2), True),
    ("password (4 lookaheads, 8-64)", PASSWORD_64, (1, 2), False),
    ("IPv4 dotted quad", IPV4, (1, 2), False),
    ("e-mail, bounded parts", EMAIL_BOUNDED, (1,), False),
]
#: Cases slow enough that one timed run is plenty.
SLOW = {"password (4 lookaheads, 8-64)", "e-mail, bounded parts"}


def _build_ms(dfa, distance: int, runs: int) -> tuple[float, int]:
    best, states = float("inf"), 0
    for _ in range(runs):
        nearmiss.clear_caches()
        start = time.process_time()
        states = nearmiss.near_miss_dfa(dfa, distance).n_states
        best = min(best, time.process_time() - start)
    return best * 1000, states


def _rejects(dfa, n: int) -> dict:
    start = time.process_time()
    rejects = nearmiss.sample_rejects(dfa, n, seed=1)
    total = time.process_time() - start
    start = time.process_time()
    for reject in rejects:
        nearest(dfa, reject.text, 1)
    alone = time.process_time() - start
    return {"rejects": n, "rejects_s": f"{total:.2f}", "explain_s": f"{alone:.2f}",
            "us_per_explain": f"{alone / n * 1e6:.0f}"}


#: Local and domain parts at their RFC 5321 limits (64 and 63 characters): a
#: distance-1 near-miss DFA of about 20,000 states.
EMAIL_LIMITS = r"[a-z0-9._%+-]{1,64}@[a-z0-9-]{1,63}\.[a-z]{2,}"
#: A 60-character e-mail text with its separator doubled (one edit from valid).
EMAIL_TEXT = "first.last+news@@mail-relay-district-seven-archive.examp.org"

_REJECTS = """
import pfuzz
lang = pfuzz.compile(sys.argv[1])
start = time.process_time()
result["rejects"] = len(lang.rejects(int(sys.argv[2]), seed=1))
result["rejects_s"] = time.process_time() - start
"""

#: (label, pattern, rejects drawn), each in a fresh process under a 3 GiB address-space limit.
LARGE = [
    ("e-mail at RFC 5321 limits: rejects(10^5)", EMAIL_LIMITS, 100_000),
    ("[a-z]{1,4000}: rejects(200)", "[a-z]{1,4000}", 200),
]


def large_rows(quick: bool) -> list[dict]:
    """Whole ``rejects`` calls (near-miss DFA, tables, draws, witnesses): CPU time and peak memory."""
    rows = []
    for label, pattern, n in LARGE:
        if quick and n > 10_000:
            n, label = 10_000, label.replace("10^5", "10^4")
        figures = measure_limited(_REJECTS, pattern, str(n))
        rows.append({"pattern": label, "rejects_s": (f"{figures['rejects_s']:.2f}"
                                                     if "rejects_s" in figures else
                                                     f"({figures['cpu_s']:.1f} cpu)"),
                     "peak_rss_mb": f"{figures['peak_rss_mb']:.0f}",
                     "outcome": figures["outcome"]})
    return rows


def explain_row(quick: bool) -> dict:
    """Microseconds per ``explain`` of a 60-character e-mail text (median of batches)."""
    dfa = compile_dfa(EMAIL, resolve_alphabet("printable"))
    assert len(EMAIL_TEXT) == 60
    explain(dfa, EMAIL_TEXT)
    batch, batches = 2_000, 3 if quick else 9
    times = []
    for _ in range(batches):
        start = time.process_time()
        for _ in range(batch):
            explain(dfa, EMAIL_TEXT)
        times.append((time.process_time() - start) / batch)
    return {"pattern": "e-mail-like: explain a 60-character text",
            "us_per_explain": f"{statistics.median(times) * 1e6:.1f}"}


def run(quick: bool) -> list[dict]:
    return build_rows(quick) + large_rows(quick) + [explain_row(quick)]


def build_rows(quick: bool) -> list[dict]:
    alphabet = resolve_alphabet("printable")
    runs = 1 if quick else 3
    n = 10_000 if quick else 100_000
    rows = []
    for name, pattern, distances, draw in CASES:
        if quick and not draw:
            continue
        dfa = compile_dfa(pattern, alphabet)
        row = {"pattern": name, "states": dfa.n_states, "classes": len(dfa.classes)}
        for d in distances:
            ms, states = _build_ms(dfa, d, 1 if name in SLOW else runs)
            row[f"d{d}_ms"] = f"{ms:.0f}"
            row[f"d{d}_states"] = states
        if draw:
            row.update(_rejects(dfa, n))
        rows.append(row)
    return rows

