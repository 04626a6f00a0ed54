"""Benchmark cases under resource limits: an address-space and a CPU-time limit.

A case that should end in bounded memory or a clear error is run in a fresh
process (``pfuzz.benchmarks._child.measure``) under ``RLIMIT_AS`` (3 GiB by
default) and ``RLIMIT_CPU``; the row then says whether it finished, which error
it raised, or that the process was killed.
"""

from __future__ import annotations

from ._child import measure

_LIMITED = """
resource.setrlimit(resource.RLIMIT_AS, ({address}, {address}))
resource.setrlimit(resource.RLIMIT_CPU, ({cpu}, {cpu}))
try:
{body}
    result["outcome"] = "ok"
except Exception as error:
    result["outcome"] = f"{{type(error).__name__}}: {{str(error).splitlines()[0][:90] if str(error) else ''}}"
"""


def measure_limited(body: str, *args: str, address_gib: float = 3, cpu_s: int = 120) -> dict:
    """``measure`` under an address-space limit and a CPU-time limit; ``result["outcome"]``
    is "ok", the exception the body raised, or "killed: ..." when the process died."""
    indented = "\n".join("    " + line for line in body.strip("\n").splitlines())
    code = _LIMITED.format(address=int(address_gib * 2**30), cpu=cpu_s, body=indented)
    try:
        return measure(code, *args)
    except RuntimeError as failure:
        return {"outcome": f"killed: {str(failure).strip().splitlines()[-1][:90]}",
                "wall_s": float("nan"), "cpu_s": float(cpu_s), "peak_rss_mb": float("nan")}
