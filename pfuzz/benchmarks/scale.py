"""Exhaustive audits: enumeration speed, and throughput on 1 and 2 workers.

Rows:
- block enumeration of fixed-width fields (``pfuzz.counting.blocks``) against the
  exact big-integer walk (``Counter.enumerate``), in strings per second per core;
- an exhaustive audit of ``hh:mm`` (1,440 valid strings and about a million near
  misses over printable ASCII) against a regular-expression target and a Python
  target, in this process and on a local Dask cluster of 1 and 2 workers. The
  cluster's start-up (about 1–3 s) is inside the wall time, as a user sees it; the
  scaling ratio is throughput on 2 workers over 1. On a machine shared with other
  work the ratio understates what two free cores give.
"""

from __future__ import annotations

import functools
import time

FIXED = [("date", r"[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])", 10),
         ("hh:mm:ss", r"([01][0-9]|2[0-3]):[0-5][0-9]:[0-5][0-9]", 8)]
CLOCK = r"([01][0-9]|2[0-3]):[0-5][0-9]"


def _enumeration_rows(quick: bool) -> list[dict]:
    import pfuzz
    from pfuzz.counting.blocks import RankBlocks

    limit = 200_000 if quick else 2_000_000
    rows = []
    for name, pattern, length in FIXED:
        lang = pfuzz.compile(pattern)
        stop = min(limit, lang.count(length))
        started = time.perf_counter()
        made = sum(len(b) for b in RankBlocks(lang.dfa).walk(length, length, 0, stop))
        blocks = time.perf_counter() - started
        started = time.perf_counter()
        walked = sum(1 for _ in lang.enumerate(length, length, 0, stop // 10))
        walk = time.perf_counter() - started
        rows.append({"case": f"enumerate {name}", "strings": f"{made:,}",
                     "blocks_per_s": f"{made / blocks:,.0f}", "walk_per_s": f"{walked / walk:,.0f}"})
    return rows


def _audit_rows(quick: bool) -> list[dict]:
    import pfuzz
    from pfuzz.audit.exhaustive import plan_exhaustive, run_exhaustive
    from pfuzz.audit.targets import CallableTarget, RegexTarget
    from pfuzz.base.charset import ALPHABETS
    from pfuzz.scale import RunSettings

    plan = plan_exhaustive(pfuzz.compile(CLOCK), ALPHABETS["printable"], shard_size=65_536)
    targets = {"regex target": functools.partial(RegexTarget, CLOCK, "fullmatch"),
               "python target": functools.partial(CallableTarget, _clock)}
    rows, per_worker = [], {}
    for label, make in targets.items():
        for workers in ([0] if quick else [0, 1, 2]):
            result = run_exhaustive(plan, make, settings=RunSettings(workers=workers))
            per_worker[label, workers] = result.throughput
            rows.append({"case": f"hh:mm exhaustive, {label}", "where": result.where,
                         "strings": f"{result.checked:,}", "seconds": f"{result.seconds:.2f}",
                         "strings_per_s": f"{result.throughput:,.0f}"})
        if (label, 1) in per_worker:
            rows[-1]["scaling_2_over_1"] = f"{per_worker[label, 2] / per_worker[label, 1]:.2f}"
    return rows


def _clock(text: str) -> bool:
    return len(text) == 5 and text[2] == ":" and text[:2].isdigit() and text[3:].isdigit() \
        and text.isascii() and int(text[:2]) < 24 and int(text[3:]) < 60


def run(quick: bool) -> list[dict]:
    return _enumeration_rows(quick) + _audit_rows(quick)
