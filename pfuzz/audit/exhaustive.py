"""Exhaustive audits: every valid string of a length window and every near miss, in rank shards.

Method: the specification L and its near-miss language N_d(L) − L (over the audit
alphabet) are both minimal DFAs, so each has exact counts per length and an exact
ranking (``pfuzz.counting``). The cases of a window are the ranks ``0 .. count(n)``
of every length ``n`` of both languages; they split into shards of consecutive
ranks that need no coordination: a shard is a pure function of (language, length,
rank range), made by ``pfuzz.counting.blocks.RankBlocks`` and checked against the
validator on whichever worker runs it (``pfuzz.scale``). Only disagreements and
exceptions come back, so a shard's answer is small whatever its size.

What the verdict rests on: every string of the specification with length in the
window and every string at edit distance 1..d from it (OSA distance, over the
audit alphabet) with length in the window widened by d. Within that set the
answer is a proof, not a sample; outside it, nothing is claimed.

Cost: enumeration is array work (several million strings per second per core for
fixed-width fields); the validator is usually the bottleneck. Memory per worker is
bounded by the shard size.
"""

from __future__ import annotations

import pickle
import time
from dataclasses import dataclass, field
from typing import Callable

from pfuzz.audit.comparison import lift
from pfuzz.base.charset import CharSet
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.counting.blocks import RankBlocks
from pfuzz.errors import ArgumentError, ResourceLimitError
from pfuzz.language import Language
from pfuzz.scale.executor import RunSettings, run_shards

__all__ = ["DEFAULT_MAX_CASES", "ExhaustivePlan", "ExhaustiveResult", "check_shard",
           "plan_exhaustive", "run_exhaustive"]

#: Cases an exhaustive audit may run unless raised: about an hour or two on one
#: machine for a validator answering in a few microseconds.
DEFAULT_MAX_CASES = 500_000_000
#: Disagreements a shard sends back in full; the rest are counted.
SHARD_WRONG_CAP = 10_000
#: Inputs kept per exception type and shard.
SHARD_ERROR_EXAMPLES = 5


@dataclass(frozen=True)
class ExhaustivePlan:
    """The languages, windows, exact case counts and shards of one exhaustive audit."""

    specification: Language
    near_misses: Language
    distance: int
    valid_window: tuple[int, int]
    near_window: tuple[int, int]
    valid_cases: int
    near_cases: int
    shards: tuple[dict, ...]

    @property
    def cases(self) -> int:
        return self.valid_cases + self.near_cases

    def evidence(self) -> str:
        low, high = self.valid_window
        return (f"exhaustive over lengths {low}..{high}: every one of {self.valid_cases:,} valid "
                f"strings and {self.near_cases:,} near misses (edit distance 1..{self.distance}, "
                f"lengths {self.near_window[0]}..{self.near_window[1]}) was tried")


def plan_exhaustive(specification: Language, alphabet: CharSet, *, distance: int = 1,
                    min_length: int | None = None, max_length: int | None = None,
                    max_cases: int = DEFAULT_MAX_CASES, shard_size: int | None = None,
                    workers: int = 1) -> ExhaustivePlan:
    """Count the cases exactly and cut them into shards; refuse above ``max_cases``."""
    if distance < 1:
        raise ArgumentError(f"distance must be 1 or more, not {distance}")
    spec = lift(specification, alphabet | specification.alphabet)
    low = min_length if min_length is not None else (spec.min_length or 0)
    if max_length is not None:
        high = max_length
    elif spec.is_finite:
        high = spec.max_length or 0
    else:
        high = low + UNBOUNDED_SPAN
    if low > high:
        raise ArgumentError(f"min_length {low} is above max_length {high}")
    near = spec.near_misses(distance)
    near_window = (max(0, low - distance), high + distance)
    valid_counts = {n: spec.count(n) for n in range(low, high + 1)}
    near_counts = {n: near.count(n) for n in range(near_window[0], near_window[1] + 1)}
    valid_cases, near_cases = sum(valid_counts.values()), sum(near_counts.values())
    if valid_cases + near_cases > max_cases:
        raise ResourceLimitError(
            f"an exhaustive audit of lengths {low}..{high} is {valid_cases:,} valid strings and "
            f"{near_cases:,} near misses, {valid_cases + near_cases:,} cases, above max_cases "
            f"({max_cases:,}); narrow it with a smaller alphabet, distance or max_length, "
            "or raise max_cases")
    size = shard_size or _default_shard_size(valid_cases + near_cases, workers)
    shards = _cut("valid", valid_counts, size, 0)
    shards += _cut("near", near_counts, size, len(shards))
    return ExhaustivePlan(spec, near, distance, (low, high), near_window, valid_cases,
                          near_cases, tuple(shards))


def _default_shard_size(cases: int, workers: int) -> int:
    """About eight shards per worker, each between 2**14 and 2**22 strings."""
    return max(1 << 14, min(1 << 22, cases // (8 * max(workers, 1)) + 1))


def _cut(kind: str, counts: dict[int, int], size: int, first_id: int) -> list[dict]:
    shards = []
    for length, count in counts.items():
        for start in range(0, count, size):
            shards.append({"id": first_id + len(shards), "kind": kind, "length": length,
                           "start": start, "stop": min(count, start + size)})
    return shards


# -- one shard, on whichever worker runs it ------------------------------------------------

_WORKER_CACHE: dict = {}


def _cached(key, make: Callable):
    if key not in _WORKER_CACHE:
        if len(_WORKER_CACHE) > 16:
            _WORKER_CACHE.clear()
        _WORKER_CACHE[key] = make()
    return _WORKER_CACHE[key]


def _close_cached_targets() -> None:
    """End the validators this process started for in-process shards."""
    for key in [k for k in _WORKER_CACHE if k[0] == "target"]:
        close = getattr(_WORKER_CACHE.pop(key), "close", None)
        if close:
            close()


def check_shard(shard: dict, valid_dfa, near_dfa, make_target: Callable) -> dict:
    """Run the validator over one shard; return what disagreed and what raised."""
    dfa = valid_dfa if shard["kind"] == "valid" else near_dfa
    expected = shard["kind"] == "valid"
    blocks = _cached(("blocks", id(dfa)), lambda: (RankBlocks(dfa), dfa))[0]
    target = _cached(("target", pickle.dumps(make_target)), make_target)
    wrong, wrong_total, errors, checked = [], 0, {}, 0
    texts = blocks.strings(shard["length"], shard["start"], shard["stop"])
    for first in range(0, len(texts), 4096):
        chunk = texts[first:first + 4096]
        for text, verdict in zip(chunk, target.verdicts(chunk)):
            checked += 1
            if verdict.unexpected:
                seen = errors.setdefault(verdict.raised, {"count": 0, "inputs": []})
                seen["count"] += 1
                if len(seen["inputs"]) < SHARD_ERROR_EXAMPLES:
                    seen["inputs"].append(text)
            elif bool(verdict.accepted) != expected:
                wrong_total += 1
                if len(wrong) < SHARD_WRONG_CAP:
                    wrong.append(text)
    return {"id": shard["id"], "kind": shard["kind"], "checked": checked, "wrong": wrong,
            "wrong_total": wrong_total, "errors": errors}


# -- the whole run ------------------------------------------------------------------------

@dataclass
class ExhaustiveResult:
    """Totals, the disagreements (capped per shard) and the figures of one run."""

    plan: ExhaustivePlan
    checked: int = 0
    wrong_accepts: list[str] = field(default_factory=list)
    wrong_rejects: list[str] = field(default_factory=list)
    wrong_accept_total: int = 0
    wrong_reject_total: int = 0
    errors: dict = field(default_factory=dict)
    seconds: float = 0.0
    where: str = ""

    @property
    def agrees(self) -> bool:
        return not (self.wrong_accept_total or self.wrong_reject_total or self.errors)

    @property
    def throughput(self) -> float:
        return self.checked / self.seconds if self.seconds else 0.0

    def add(self, result: dict) -> None:
        self.checked += result["checked"]
        if result["kind"] == "valid":
            self.wrong_rejects.extend(result["wrong"])
            self.wrong_reject_total += result["wrong_total"]
        else:
            self.wrong_accepts.extend(result["wrong"])
            self.wrong_accept_total += result["wrong_total"]
        for name, seen in result["errors"].items():
            mine = self.errors.setdefault(name, {"count": 0, "inputs": []})
            mine["count"] += seen["count"]
            mine["inputs"] = sorted(set(mine["inputs"]) | set(seen["inputs"]),
                                    key=lambda s: (len(s), s))[:SHARD_ERROR_EXAMPLES]


def run_exhaustive(plan: ExhaustivePlan, make_target: Callable, *,
                   settings: RunSettings = RunSettings(),
                   on_progress: Callable[[int, int], None] | None = None) -> ExhaustiveResult:
    """Every case of ``plan`` against the validator ``make_target()`` builds (on each worker).

    ``make_target`` must pickle (a class and its arguments, e.g. ``functools.partial``);
    ``on_progress(done, total)`` sees the cases checked so far."""
    result = ExhaustiveResult(plan, where=settings.where())
    done = [0]

    def arrived(shard: dict, outcome: dict) -> None:
        done[0] += shard["stop"] - shard["start"]
        if on_progress:
            on_progress(done[0], plan.cases)

    fingerprint = repr((plan.specification.dfa.signature(), plan.distance, plan.valid_window,
                        pickle.dumps(make_target)))
    started = time.perf_counter()
    outcomes = run_shards(check_shard, plan.shards,
                          (plan.specification.dfa, plan.near_misses.dfa, make_target),
                          settings=settings, fingerprint=fingerprint, on_result=arrived)
    result.seconds = time.perf_counter() - started
    _close_cached_targets()
    for outcome in outcomes:
        result.add(outcome)
    key = lambda s: (len(s), s)  # noqa: E731  (shortlex, by code point)
    result.wrong_accepts.sort(key=key)
    result.wrong_rejects.sort(key=key)
    return result
