"""Boundary suites: time and size for realistic patterns and for DFAs of 100 to 2,000+ states.

Each pattern is compiled first (not timed); then ``pfuzz.boundary.suite.suite`` is
timed as the best of a few runs in CPU time (``time.process_time``). Size is
given as the number of cases; how many are range-edge cases and how many
transition-cover strings remain (beside the number of live transitions: at
most one cover string per transition, and a cover string equal to an earlier
case is merged into it); and the total characters of the suite. The large automata:
``[a-z0-9]{1,256}`` (257 states), the two fields of
``profiles/password-policy.toml`` (``passphrase``, ``password``: 500 and more
states) and ``(a|b)*a(a|b){10}`` (2,048 states). ``--quick`` times one run each
and drops the largest member of the ``(a|b)*a(a|b){k}`` family.
"""

from __future__ import annotations

import time
from collections import Counter

from pfuzz import compile as compile_language
from pfuzz.boundary.suite import suite
from pfuzz.boundary.paths import Guide
from pfuzz.profile.loader import load_profile

from ._child import ROOT

POLICY = ROOT / "profiles" / "password-policy.toml"

REALISTIC = [
    (r"[A-Z]{2}-[0-9]{4}", "printable"),
    (r"\d{4}-\d{2}-\d{2}", "printable"),
    (r"(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])(\.(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])){3}",
     "printable"),
    (r"[a-z0-9._%+-]+@[a-z0-9.-]+\.[a-z]{2,}", "printable"),
    (r"[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}", "printable"),
    (r"\w{3,30}", "unicode"),
]
LARGE = [(r"[a-z0-9]{1,256}", "printable")]
FAMILY = r"(a|b)*a(a|b){%d}"


def _languages(quick: bool):
    """(label, Language) for every case, in report order."""
    for pattern, alphabet in REALISTIC + LARGE:
        yield pattern, compile_language(pattern, alphabet)
    for field in load_profile(POLICY).fields:
        yield f"password-policy.toml: {field.name}", field.language()
    for k in (6, 10) if quick else (6, 10, 12):
        yield FAMILY % k, compile_language(FAMILY % k, "[ab]")


def _best_ms(dfa, runs: int):
    best, cases = float("inf"), []
    for _ in range(runs):
        start = time.process_time()
        cases = suite(dfa)
        best = min(best, time.process_time() - start)
    return best * 1000, cases


def _label(text: str) -> str:
    return text if len(text) <= 44 else text[:41] + "..."


def run(quick: bool) -> list[dict]:
    rows = []
    for label, lang in _languages(quick):
        dfa = lang.dfa
        ms, cases = _best_ms(dfa, 1 if quick else 3)
        kinds = Counter(c.category for c in cases)
        edges = sum(len(out) for out in Guide(dfa).edges)
        rows.append({"pattern": _label(label), "states": lang.states, "transitions": edges,
                     "cases": len(cases), "coverage": kinds["coverage"],
                     "range_edge": kinds["range-edge"],
                     "chars": sum(len(c.text) for c in cases), "ms": f"{ms:.1f}"})
    return rows
