"""Boundary suites: time and size for realistic patterns, every standard profile field, large DFAs.

Each language is compiled first (not timed); then ``pfuzz.boundary.suite.suite``
is timed as the best of a few runs in CPU time (``time.process_time``) with the
default limit. Columns: live states; ``ranges``, the (state, maximal character
range) pairs of transitions to live states, which the position-aware edges
walk; ``cases`` kept and ``cut`` by the limit; how many kept cases are
range-edge, repetition, exit and transition-cover cases; the total characters
of the suite. Rows:

- realistic patterns, and ``\\w{3,30}`` over the unicode alphabet (some 640
  ranges at each of 30 states: the limit cuts it);
- every field of every profile in ``profiles/``, as a corpus writes it (over
  the field's alphabet, no probes);
- the two password-policy fields as the audit builds them
  (``[audit]``: over the audit alphabet, the field's alphabet plus Latin-1 and
  the hostile characters, with the hostile characters as probes), where the
  968-state ``password`` field meets the limit;
- ``[a-z0-9]{1,256}`` (257 states) and ``(a|b)*a(a|b){k}`` (2^(k+1) states).

``--quick`` times one run each and drops the largest member of the
``(a|b)*a(a|b){k}`` family.
"""

from __future__ import annotations

import time
from collections import Counter

from pfuzz import compile as compile_language
from pfuzz.audit.comparison import lift
from pfuzz.audit.hostile import HOSTILE_CHARACTERS
from pfuzz.audit.run import DEFAULT_REJECT_ALPHABET, audit_alphabet
from pfuzz.automata.dfa import transitions
from pfuzz.boundary.suite import suite
from pfuzz.profile import shipped
from pfuzz.profile.loader import load_profile

PROFILES = shipped.folder()
POLICY = shipped.path_of("password-policy")

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
    """(label, Language, probes) for every row, in report order."""
    for pattern, alphabet in REALISTIC:
        yield pattern, compile_language(pattern, alphabet), None
    for path in sorted(PROFILES.glob("*.toml")):
        for field in load_profile(path).fields:
            yield f"{path.name}: {field.name}", field.language(), None
    for field in load_profile(POLICY).fields:
        lang = field.language()
        wide = lift(lang, audit_alphabet(lang.alphabet, DEFAULT_REJECT_ALPHABET))
        yield f"[audit] {POLICY.name}: {field.name}", wide, HOSTILE_CHARACTERS
    for pattern, alphabet in LARGE:
        yield pattern, compile_language(pattern, alphabet), None
    for k in (6, 10) if quick else (6, 10, 12):
        yield FAMILY % k, compile_language(FAMILY % k, "[ab]"), None


def _best_ms(dfa, probes, runs: int):
    best, cases = float("inf"), None
    for _ in range(runs):
        start = time.process_time()
        cases = suite(dfa, probes=probes)
        best = min(best, time.process_time() - start)
    return best * 1000, cases


def _label(text: str) -> str:
    return text if len(text) <= 44 else text[:41] + "..."


def run(quick: bool) -> list[dict]:
    rows = []
    for label, lang, probes in _languages(quick):
        dfa = lang.dfa
        ms, cases = _best_ms(dfa, probes, 1 if quick else 3)
        kinds = Counter(c.category for c in cases)
        live = dfa.live_states()
        ranges = sum(len(label.ranges) for row in transitions(dfa, live) for label, _ in row)
        rows.append({"language": _label(label), "states": lang.states, "ranges": ranges,
                     "cases": len(cases), "cut": cases.cut, "range_edge": kinds["range-edge"],
                     "repetition": kinds["repetition"], "exit": kinds["exit"],
                     "coverage": kinds["coverage"], "chars": sum(len(c.text) for c in cases),
                     "ms": f"{ms:.1f}"})
    return rows
