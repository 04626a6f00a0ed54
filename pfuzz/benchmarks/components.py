"""Costs of single components, the figures their module docstrings leave to this output.

- ``pfuzz.corpus.context``: creating a ``Faker`` per locale, and one value (in a fresh
  process per locale, after ``import faker``, so the figure is the locale's own).
- ``pfuzz.automata.minimise``: a long bounded repeat ``[a-z0-9]{1,n}`` minimised with
  Moore's refinement cut off after ``MOORE_ROUNDS`` rounds (then Hopcroft), as shipped,
  and with Moore run to the end.
- ``pfuzz.nearmiss.neighbourhood``: the near-miss automaton of the ``password`` field of
  the shipped ``password-policy`` profile (968 states) at distance 1, in edges mode, and
  (full runs only) in edges mode at distance 2, the costly case.
- ``pfuzz.nearmiss.witness``: ``explain`` of near-miss rejects of that field and of the
  shipped ``ipv4`` field, median per text.
- ``pfuzz.base.resources.REJECT_BYTES``: traced memory of a list of rejects, per reject,
  beside its text and witness strings.

CPU time (``time.process_time``), best of a few runs where a run is short.
"""

from __future__ import annotations

import statistics
import sys
import time
import tracemalloc

from pfuzz.automata import minimise as minimising
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.nearmiss.neighbourhood import build
from pfuzz.nearmiss.witness import explain
from pfuzz.profile.loader import load_profile

from ._child import measure

_FAKER = """
import time
from faker import Faker
c = time.process_time()
fake = Faker(sys.argv[1])
created = time.process_time() - c
fake.seed_instance(0)
c = time.process_time()
for _ in range(1000):
    fake.name()
result.update(create_ms=created * 1e3, value_us=(time.process_time() - c) * 1e3)
"""


def _cpu(call, runs: int = 1) -> tuple[float, object]:
    best, value = float("inf"), None
    for _ in range(runs):
        start = time.process_time()
        value = call()
        best = min(best, time.process_time() - start)
    return best, value


def _field(profile: str, name: str):
    return load_profile(profile).field(name).language()


def faker_rows(quick: bool) -> list[dict]:
    rows = []
    for locale in ["en_GB"] if quick else ["en_GB", "de_DE", "ja_JP"]:
        figures = measure(_FAKER, locale)
        rows.append({"module": "corpus.context", "case": f"Faker({locale!r})",
                     "figure": "create ms / name() us",
                     "value": f"{figures['create_ms']:.0f} / {figures['value_us']:.1f}"})
    return rows


def minimise_rows(quick: bool) -> list[dict]:
    n = 512 if quick else 2048
    dfa = _field_free(f"[a-z0-9]{{1,{n}}}")
    shipped, _ = _cpu(lambda: minimising.minimise(dfa), 3)
    kept = minimising.MOORE_ROUNDS
    minimising.MOORE_ROUNDS = sys.maxsize
    try:
        moore, _ = _cpu(lambda: minimising.minimise(dfa), 3)
    finally:
        minimising.MOORE_ROUNDS = kept
    return [{"module": "automata.minimise", "case": f"[a-z0-9]{{1,{n}}} ({dfa.n_states} states)",
             "figure": "ms: as shipped / Moore to the end",
             "value": f"{shipped * 1e3:.0f} / {moore * 1e3:.0f}"}]


def _field_free(pattern: str):
    from pfuzz import compile as compile_language
    return compile_language(pattern).dfa


def neighbourhood_rows(quick: bool) -> list[dict]:
    dfa = _field("password-policy", "password").dfa
    cases = [(1, False), (1, True)] + ([] if quick else [(2, True)])
    rows = []
    for distance, edges in cases:
        seconds, built = _cpu(lambda: build(dfa, distance, EDIT_KINDS, edges))
        rows.append({"module": "nearmiss.neighbourhood",
                     "case": f"password field, distance {distance}{', edges' if edges else ''}",
                     "figure": "s / minimal states", "value": f"{seconds:.2f} / {built.n_states:,}"})
    return rows


def witness_rows(quick: bool) -> list[dict]:
    rows = []
    for profile, name in [("ipv4", "ipv4"), ("password-policy", "password")]:
        lang = _field(profile, name)
        texts = [r.text for r in lang.rejects(50 if quick else 400, seed=0)]
        explain(lang.dfa, texts[0])                     # tables built once per automaton
        times = []
        for text in texts:
            start = time.process_time()
            explain(lang.dfa, text)
            times.append(time.process_time() - start)
        mean = sum(map(len, texts)) / len(texts)
        rows.append({"module": "nearmiss.witness", "case": f"{name} rejects ({mean:.0f} chars)",
                     "figure": "us per explain (median)",
                     "value": f"{statistics.median(times) * 1e6:.0f}"})
    return rows


def reject_memory_row(quick: bool) -> dict:
    lang = _field("ipv4", "ipv4")
    n = 1_000 if quick else 10_000
    lang.rejects(n, seed=1)                               # automata and tables, before tracing
    tracemalloc.start()
    rejects = lang.rejects(n, seed=1)
    held = tracemalloc.get_traced_memory()[0]
    tracemalloc.stop()
    strings = sum(sys.getsizeof(r.text) + sys.getsizeof(r.witness) for r in rejects)
    return {"module": "base.resources", "case": f"{n:,} ipv4 rejects",
            "figure": "bytes per reject beside text and witness (REJECT_BYTES)",
            "value": f"{(held - strings) / n:.0f}"}


def run(quick: bool) -> list[dict]:
    return (faker_rows(quick) + minimise_rows(quick) + neighbourhood_rows(quick)
            + witness_rows(quick) + [reject_memory_row(quick)])
