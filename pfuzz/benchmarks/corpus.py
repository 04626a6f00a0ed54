"""Corpus writing: wall time, CPU time and peak memory for the demo profile and a large profile.

Each case runs in a fresh Python process (``pfuzz.benchmarks._child``) so that its
peak resident set size belongs to that case alone; it includes the bare
interpreter, whose own figure is the ``baseline`` row. CPU time is the
steadier figure on a shared machine; wall time is given beside it.

The large profile has five fields of realistic validator patterns and asks
10^5 valid strings and 10^5 near-miss rejects of each (quick mode: 10^3),
with no record.
"""

from __future__ import annotations

import tempfile
from pathlib import Path

from pfuzz.profile import shipped

from ._child import measure

DEMO = shipped.path_of("demo")

LARGE_FIELDS = [
    ("date", r"(19[0-9]{2}|20[0-9]{2})-(0[1-9]|1[0-2])-(0[1-9]|1[0-9]|2[0-8])"),
    ("ipv4", r"(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])(\.(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])){3}"),
    ("postcode", r"LV[1-9][0-9]? [0-9][A-HJ-NPR-Z]{2}"),
    ("account", r"[A-Z]{2}[0-9]{2}-[0-9]{4}-[0-9]{4}"),
    ("handle", r"[a-z][a-z0-9_]{2,15}"),
]


def large_profile(n: int) -> str:
    parts = ['[profile]\ntitle = "benchmark: five fields"\n']
    for name, pattern in LARGE_FIELDS:
        parts.append(f"[[field]]\nname = \"{name}\"\npattern = '''{pattern}'''\n"
                     f"valid = {n}\ninvalid = {n}\n")
    return "\n".join(parts)


_CORPUS = """
from pfuzz.corpus.writer import write_corpus
summary = write_corpus(sys.argv[1], sys.argv[2], seed=0)
result.update(bytes=sum(f["bytes"] for f in summary.files.values()), cases=summary.cases)
"""


def _measure(profile: str, out: str) -> dict:
    return {"bytes": 0, "cases": 0, **measure(_CORPUS if profile != "-" else "", profile, out)}


def _row(label: str, figures: dict) -> dict:
    return {"case": label, "cases": f"{figures['cases']:,}",
            "output_mb": f"{figures['bytes'] / 1e6:.1f}",
            "wall_s": f"{figures['wall_s']:.2f}", "cpu_s": f"{figures['cpu_s']:.2f}",
            "peak_rss_mb": f"{figures['peak_rss_mb']:.0f}"}


def run(quick: bool) -> list[dict]:
    n = 1_000 if quick else 100_000
    rows = []
    with tempfile.TemporaryDirectory() as tmp:
        rows.append(_row("baseline (interpreter, no work)", _measure("-", "-")))
        rows.append(_row("demo profile", _measure(str(DEMO), f"{tmp}/demo")))
        big = Path(tmp) / "large.toml"
        big.write_text(large_profile(n), encoding="utf-8")
        rows.append(_row(f"5 fields x {n:,} valid + {n:,} rejects", _measure(str(big),
                                                                             f"{tmp}/large")))
    return rows
