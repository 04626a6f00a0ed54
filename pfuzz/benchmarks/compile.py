"""Compile time and minimal-DFA size for a fixed set of patterns.

Each pattern is compiled once to warm the character tables and imports, then
timed as the best of a few runs in CPU time (``time.process_time``, so that
other processes on the machine disturb the figures less); ``--quick`` runs each
pattern once. The large automata (``LARGE``: the 131,072-state member of the
``(a|b)*a(a|b){k}`` family, the hostname rule, and k = 30, which must stop at the
state cap) are compiled once each in a fresh process, with its peak memory.
"""

from __future__ import annotations

import time

from pfuzz.automata.construction.compiler import compile_dfa
from pfuzz.syntax.alphabet import resolve_alphabet

from ._child import measure

PASSWORD = r"^(?=.*\d)(?=.*[a-z])(?=.*[A-Z])(?=.*[!#$%&*+\-.?@^_~])(?=.{8,64}$).*$"
PASSWORD_5 = r"^(?=.*\d)(?=.*[a-z])(?=.*[A-Z])(?=.*[!#$%&*+\-.?@^_~])(?!.* )(?=.{8,64}$).*$"
HOSTNAME = r"(?=.{1,253}$)(?:(?!-)[A-Za-z0-9-]{1,63}\.)+[A-Za-z]{2,63}"

PATTERNS = [
    (r"[A-Z]{2}[0-9]{4}", "printable"),
    (r"\d{4}-\d{2}-\d{2}", "printable"),
    (r"[a-z0-9]{1,256}", "printable"),
    (r"\w{3,30}", "unicode"),
    (r"[a-z0-9._%+-]+@[a-z0-9.-]+\.[a-z]{2,}", "printable"),
    (PASSWORD, "printable"),
    (PASSWORD_5, "printable"),
    (HOSTNAME, "printable"),
    (r"\d+$", "ascii"),
    (r"(?m)^[a-z]+$(?:\n^[a-z]+$)*", "ascii"),
]
FAMILY = r"(a|b)*a(a|b){%d}"

#: Constructs that depend on how a match went, in validator idioms (target: under 20 ms each,
#: warm), and optional repeats that must cost what the bounded repeat of the same language
#: costs: (label, pattern, alphabet, call mode).
IDIOMS = [
    ("hostname label", r"^(?!-)[A-Za-z0-9-]{1,63}(?<!-)$", "printable", "fullmatch"),
    ("date, one separator", r"\d{4}([-/.])\d{2}\1\d{2}", "printable", "fullmatch"),
    ("phone, optional ( )", r"^(\()?\d{3}(?(1)\))[- ]?\d{4}$", "printable", "fullmatch"),
    ("zip code, search", r"\b\d{5}\b", "printable", "search"),
    ("(?>a|ab)c", r"(?>a|ab)c", "printable", "fullmatch"),
    ("(?>a*)a", r"(?>a*)a", "printable", "fullmatch"),
    ("(a|ab)*+c", r"(a|ab)*+c", "printable", "fullmatch"),
    ("(?:a?){2500}", r"(?:a?){2500}", "[ab]", "fullmatch"),
    ("a? written 5,000 times", "a?" * 5000, "[ab]", "fullmatch"),
    ("a{0,2500}", r"a{0,2500}", "[ab]", "fullmatch"),
]


def _best_ms(pattern: str, alphabet, runs: int, mode: str = "fullmatch") -> tuple[float, object]:
    best, dfa = float("inf"), None
    for _ in range(runs):
        start = time.process_time()
        dfa = compile_dfa(pattern, alphabet, mode=mode)
        best = min(best, time.process_time() - start)
    return best * 1000, dfa


#: Large automata, each in a fresh process so that its peak memory is its own:
#: (label, pattern, alphabet, mode). The one marked so must stop at the state cap.
LARGE = [
    ("(a|b)*a(a|b){16}", FAMILY % 16, "[ab]", "fullmatch"),
    ("hostname (RFC 1123, 253 total)", HOSTNAME, "printable", "fullmatch"),
    ("(a|b)*a(a|b){30}: state cap", FAMILY % 30, "[ab]", "fullmatch"),
    (".{8000}, search", ".{8000}", "printable", "search"),
]

_LARGE = """
from pfuzz.automata.construction.compiler import compile_dfa
from pfuzz.errors import StateLimitError
from pfuzz.syntax.alphabet import resolve_alphabet
alphabet = resolve_alphabet(sys.argv[2])
start = time.process_time()
try:
    result["states"] = compile_dfa(sys.argv[1], alphabet, mode=sys.argv[3]).n_states
except StateLimitError:
    result["states"] = "cap"
result["compile_s"] = time.process_time() - start
"""


def large_rows(quick: bool) -> list[dict]:
    """Compile CPU time of the large automata, peak memory of the whole process beside it."""
    rows = []
    for label, pattern, alphabet, mode in LARGE:
        figures = measure(_LARGE, pattern, alphabet, mode)
        rows.append({"pattern": label, "alphabet": alphabet, "states": figures["states"],
                     "ms": f"{figures['compile_s'] * 1000:.1f}",
                     "peak_rss_mb": f"{figures['peak_rss_mb']:.0f}"})
    return rows


def run(quick: bool) -> list[dict]:
    return small_rows(quick) + idiom_rows(quick) + large_rows(quick)


def idiom_rows(quick: bool) -> list[dict]:
    """Warm compile time of the idioms (the first compile fills re's and pfuzz's tables)."""
    rows = []
    for label, pattern, alphabet_name, mode in IDIOMS:
        alphabet = resolve_alphabet(alphabet_name)
        compile_dfa(pattern, alphabet, mode=mode)
        ms, dfa = _best_ms(pattern, alphabet, 1 if quick else 3, mode)
        rows.append({"pattern": label, "alphabet": alphabet_name, "states": dfa.n_states,
                     "classes": len(dfa.classes), "ms": f"{ms:.1f}"})
    return rows


def small_rows(quick: bool) -> list[dict]:
    cases = list(PATTERNS) + [(FAMILY % k, "[ab]") for k in (8, 12)]
    rows = []
    for pattern, alphabet_name in cases:
        alphabet = resolve_alphabet(alphabet_name)
        compile_dfa(pattern, alphabet)
        runs = 1 if quick else 3
        ms, dfa = _best_ms(pattern, alphabet, runs)
        rows.append({"pattern": pattern if len(pattern) <= 48 else pattern[:45] + "...",
                     "alphabet": alphabet_name, "states": dfa.n_states,
                     "classes": len(dfa.classes), "ms": f"{ms:.1f}"})
    return rows
