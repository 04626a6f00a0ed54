"""Audits: wall time, CPU time and peak memory of a default audit of a Python validator.

Each case is what ``pfuzz audit --pattern P --target module:function`` does,
made through the library (``pfuzz.compile`` over the default alphabet, then
``pfuzz.audit.run.run_audit`` with the default ``Settings``: the whole boundary
suite, hostile variants, case flips, 1,000 near-miss rejects and 1,000 valid
strings), against a fixture validator of ``tests/fixtures/validators`` (each
with its deliberate bug; run from a checkout only) and against a dotted-quad check written with the
standard library's ``ipaddress`` (put in a temporary directory). Each case runs in a fresh Python process
(``pfuzz.benchmarks._child``), so its peak resident set size is its own; the
``imports only`` row is the interpreter with ``pfuzz.audit.run`` loaded, the floor
under every other row. ``--quick`` asks 100 rejects and 100 valid strings.
"""

from __future__ import annotations

import tempfile
from pathlib import Path

from ._child import ROOT, measure

VALIDATORS = ROOT / "tests" / "fixtures" / "validators"

CASES = [
    (r"[A-Z]{2}-[0-9]{4}", "tickets:stripped"),
    (r"[a-z0-9_]{3,16}", "accounts:user_name_too_long"),
    (r"(0[1-9]|1[0-2])/[0-9]{2}", "cards:off_by_one_month"),
]
OCTET = r"(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])"
IPV4 = rf"{OCTET}(\.{OCTET}){{3}}"       # RFC 3986 dec-octet, four of them
IPV4_MODULE = "bench_ipv4"
IPV4_VALIDATOR = """
import ipaddress


def dotted_quad(text):
    try:
        ipaddress.IPv4Address(text)
    except ValueError:
        return False
    return True
"""

_IMPORTS = """
import pfuzz.audit.run
"""

_AUDIT = """
from pfuzz import compile
from pfuzz.audit.run import Settings, run_audit
from pfuzz.audit.targets import PythonTarget
pattern, function, directory, size = sys.argv[1:5]
settings = Settings() if size == "default" else Settings(valid=int(size), rejects=int(size))
report = run_audit(compile(pattern), PythonTarget(function, directory=directory), settings)
result.update(cases=len(report.cases), findings=len(report.findings))
"""


def _row(label: str, target: str, figures: dict) -> dict:
    return {"pattern": label, "target": target, "cases": f"{figures.get('cases', 0):,}",
            "findings": figures.get("findings", 0), "wall_s": f"{figures['wall_s']:.2f}",
            "cpu_s": f"{figures['cpu_s']:.2f}", "peak_rss_mb": f"{figures['peak_rss_mb']:.0f}"}


def run(quick: bool) -> list[dict]:
    size = "100" if quick else "default"
    rows = [_row("imports only", "", measure(_IMPORTS))]
    for pattern, function in CASES if VALIDATORS.is_dir() else ():   # fixtures: a checkout only
        figures = measure(_AUDIT, pattern, function, str(VALIDATORS), size)
        rows.append(_row(pattern, function, figures))
    with tempfile.TemporaryDirectory() as tmp:
        (Path(tmp) / f"{IPV4_MODULE}.py").write_text(IPV4_VALIDATOR, encoding="utf-8")
        target = f"{IPV4_MODULE}:dotted_quad"
        rows.append(_row("IPv4 dotted quad", target, measure(_AUDIT, IPV4, target, tmp, size)))
    return rows
