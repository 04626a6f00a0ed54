"""Sharded corpora: every field's cases split into K files that any process can make alone.

``write_sharded_corpus(profile, out_dir, seed, shards=K)`` is ``pfuzz corpus ...
--shards K``. It writes, for every field,

    fields/NAME/valid.shard-0000.jsonl ... valid.shard-{K-1}.jsonl
    fields/NAME/rejects.shard-0000.jsonl ...   (near-miss rejects, with witness and edits)
    fields/NAME/boundary.jsonl                 (the boundary suite, as unsharded)

plus manifest.json (``"sampling": "keyed"``, each shard's case range, case count,
size and SHA-256) and SHA256SUMS. The shards of a part, concatenated in order, are
byte for byte the one file ``--shards 1`` writes for the same seed: case i of a part
is a pure function of (profile, seed, i), never of the shard that makes it.

Method ("keyed sampling", its own mode; the unsharded corpus of
``pfuzz.corpus.writer`` draws from one sequential generator and is unchanged).
A part (a field's valid strings, or its near-miss rejects from N_d(L) − L) asks for
n cases from a language over a length window:

- when the window holds at most n strings, case i is the i-th string in shortlex
  order (``pfuzz.counting.blocks.RankBlocks``, a rank range per shard);
- otherwise the cases are grouped by length, shortest first. How many of each
  length (the quotas) follows the ``"even"`` length plan of ``pfuzz.counting.sampler``
  exactly: n uniform draws among the lengths that have strings, a length that runs
  out of strings handing its excess to a redraw among the others. The draws come
  from a counter-based generator (numpy's Philox; Salmon et al., SC 2011) keyed by
  the part's seed, so every shard computes the same small table of quotas itself.
  Case t of length m is ``unrank(m, π_m(t))`` for a bijection π_m of
  [0, count(m)) keyed by (seed, m): the strings are **distinct** and any shard finds
  its cases without the others.

The bijection π_m: when count(m) ≤ ``EXACT_PERMUTATION_LIMIT``, a uniformly random
permutation (numpy's Fisher–Yates ``permutation`` from a Philox generator keyed by
(seed, m)), so the quota is an exactly uniform random subset; every shard remakes
it (O(count(m)) time and memory, kept per process). Above, a cycle-walked 8-round
Feistel network keyed by (seed, m) (``pfuzz.base.permutation.KeyedPermutation``):
a pseudo-random permutation, not an exactly uniform one; its method, the bound on
its error and where that bound stops saying anything are in that module.
Distinctness is exact either way (a bijection).

Rejects are drawn by the same scheme from the whole near-miss language of the
field's edit kinds (the unsharded writer gives each kind an equal share instead),
then explained one by one (nearest witness, edit script, kinds). Within a length,
cases are in draw order (π order), not sorted. The boundary suite is small and
deterministic and stays one file.

Left out in this mode: cases.csv and qa.xlsx (one table of every case is what
sharding avoids), and record rows (drawn from one sequential generator; the
manifest says so). Cost per case: one unrank (O(length × log pieces) big-integer
steps) plus 8 vectorised rounds per Feistel step (or 8 hashes for counts of 2^62 and
more), and for rejects one explanation; per
shard, the quotas (O(n) vectorised draws) and the small exact permutations. Memory
per shard: the quotas, the small permutations' first quota entries, one row at a
time. Shards run through ``pfuzz.scale.run_shards`` (in this process by default,
or on a local Dask cluster with ``workers``); they write into the staging folder, so
the workers must share this machine's file system.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Callable

import numpy as np

from pfuzz.base.files import Checksum, atomic_writer
from pfuzz.base.permutation import KeyedPermutation
from pfuzz.base.jsonlines import json_text, jsonl_line
from pfuzz.corpus.formats import CHECKSUMS_NAME, FORMAT_TAG, MANIFEST_NAME, Staging, check_target
from pfuzz.corpus.rows import edit_list
from pfuzz.corpus.writer import (FieldCases, _boundary_items, _child_seeds, _choose_seed,
                                 _field_manifest, _versions, _window, field_language)
from pfuzz.errors import ArgumentError
from pfuzz.nearmiss.rejects import Reject, kinds_of
from pfuzz.profile.loader import Profile, load_profile

__all__ = ["EXACT_PERMUTATION_LIMIT", "SAMPLING",
           "ShardedSummary", "case_ranges", "keyed_cases", "write_sharded_corpus"]

SAMPLING = "keyed"
#: Counts up to this get an exactly uniform permutation; above, the keyed Feistel network.
EXACT_PERMUTATION_LIMIT = 1 << 20
#: Lengths drawn per vectorised batch when the quotas are made.
_QUOTA_BATCH = 1 << 20
_QUOTAS, _PERMUTATION = 1, 2               # Philox counter words: what a stream is for
SHARDED_PARTS = ("valid", "rejects")


def _philox(key: int, purpose: int, length: int = 0):
    return np.random.Generator(np.random.Philox(key=key, counter=[purpose, length, 0, 0]))


# -- one part of a field: its plan and its cases ------------------------------------------

@dataclass(frozen=True)
class _Plan:
    """The blocks of a part: (length, cases of that length); ``everything`` means the whole
    window in shortlex order (then blocks are (length, count))."""

    blocks: tuple[tuple[int, int], ...]
    everything: bool

    @property
    def cases(self) -> int:
        return sum(size for _, size in self.blocks)


def _plan(counts: dict[int, int], asked: int, key: int) -> _Plan:
    return _cached_plan(tuple(sorted((k, c) for k, c in counts.items() if c)), asked, key)


@lru_cache(maxsize=64)
def _cached_plan(pairs: tuple[tuple[int, int], ...], asked: int, key: int) -> _Plan:
    """The plan, made once per process (every shard of a part needs the same one)."""
    counts = dict(pairs)
    lengths = [k for k, _ in pairs]
    if sum(counts[k] for k in lengths) <= asked:
        return _Plan(tuple((k, counts[k]) for k in lengths), True)
    quotas = _length_quotas(asked, [counts[k] for k in lengths], key)
    return _Plan(tuple((k, q) for k, q in zip(lengths, quotas) if q), False)


def _length_quotas(n: int, capacity: list[int], key: int) -> list[int]:
    """The ``"even"`` plan with full lengths redrawn (as ``pfuzz.counting.sampler`` makes
    its quotas): exactly uniform integer draws from the keyed generator, counted in
    batches of ``_QUOTA_BATCH`` so memory stays bounded for any n."""
    generator = _philox(key, _QUOTAS)
    quota, open_lengths, need = [0] * len(capacity), list(range(len(capacity))), n
    while need:
        hits = np.zeros(len(open_lengths), dtype=np.int64)
        for done in range(0, need, _QUOTA_BATCH):
            drawn = generator.integers(0, len(open_lengths), size=min(_QUOTA_BATCH, need - done))
            hits += np.bincount(drawn, minlength=len(open_lengths))
        need, still = 0, []
        for j, got in zip(open_lengths, hits.tolist()):
            taken = min(got, capacity[j] - quota[j])
            quota[j] += taken
            need += got - taken
            if quota[j] < capacity[j]:
                still.append(j)
        open_lengths = still
    return quota


@lru_cache(maxsize=64)
def _small_permutation(key: int, length: int, size: int, quota: int) -> tuple[int, ...]:
    return tuple(_philox(key, _PERMUTATION, length).permutation(size)[:quota].tolist())


def _ranks(key: int, length: int, size: int, quota: int, first: int, last: int):
    """Ranks of cases ``first..last`` among the ``quota`` drawn at ``length``."""
    if size <= EXACT_PERMUTATION_LIMIT:
        chosen = _small_permutation(key, length, size, quota)
        return iter(chosen[first:last])
    permute = KeyedPermutation(size, key.to_bytes(16, "big") + length.to_bytes(8, "big"))
    return permute.many(first, last)


def keyed_cases(language, counts: dict[int, int], asked: int, key: int, start: int,
                stop: int | None = None):
    """Texts of cases ``start..stop`` of a part (see the module docstring); ``counts``
    maps each length of the window to its number of strings; ``key`` < 2^128."""
    plan = _plan(counts, asked, key)
    stop = plan.cases if stop is None else min(stop, plan.cases)
    if plan.everything:
        from pfuzz.counting.blocks import RankBlocks
        lengths = [k for k, _ in plan.blocks]
        if stop > start:
            for block in RankBlocks(language.dfa).walk(lengths[0], lengths[-1], start, stop):
                yield from block
        return
    position = 0
    for length, quota in plan.blocks:
        first, last = max(start - position, 0), min(stop - position, quota)
        if first < last:
            size = counts[length]
            for rank in _ranks(key, length, size, quota, first, last):
                yield language.unrank(length, rank)
        position += quota


def case_ranges(cases: int, shards: int) -> list[tuple[int, int]]:
    """K contiguous case ranges of near-equal size covering [0, cases)."""
    return [(s * cases // shards, (s + 1) * cases // shards) for s in range(shards)]


# -- making a shard (a pure function of the profile, seed and range) ------------------------

def _part_key(seed: int, part: str) -> int:
    return seed | (SHARDED_PARTS.index(part) + 1) << 64


def _part_source(field, part: str):
    """(language, counts by length, cases asked) of one part of a field."""
    lang = field.language()
    low, high, _ = _window(lang)
    if part == "valid":
        return lang, lang.counts(low, high), field.valid
    near = lang.near_misses(field.distance, list(field.edits))
    if near.is_empty():
        return near, {}, 0
    near_low, near_high = near.counter.bounds(None, high + field.distance)
    return near, near.counts(near_low, near_high), field.invalid


def _case_id(prefix: str, index: int, cases: int) -> str:
    return f"{prefix}:{index + 1:0{max(4, len(str(cases)))}d}"


def make_shard(shard: dict, profile: Profile) -> dict:
    """Write one shard file (``shard["path"]``); its size, SHA-256 and case count."""
    field = next(f for f in profile.fields if f.name == shard["field"])
    part, seed = shard["part"], shard["seed"]
    language, counts, asked = _part_source(field, part)
    texts = keyed_cases(language, counts, asked, _part_key(seed, part), shard["start"],
                        shard["stop"]) if asked else iter(())
    prefix = f"{field.name}:{'valid' if part == 'valid' else 'reject'}"
    checksum = Checksum()
    made = 0
    with atomic_writer(Path(shard["path"]), checksum=checksum) as out:
        for index, text in enumerate(texts, shard["start"]):
            row = {"id": _case_id(prefix, index, shard["cases"]), "length": len(text),
                   "text": text}
            if part == "rejects":
                reject = _reject(field, text)
                row = {**reject.as_dict(), **row, "script": edit_list(reject)}
            out.write(jsonl_line(row))
            made += 1
    return {"bytes": checksum.size, "sha256": checksum.sha256, "count": made}


def _reject(field, text: str) -> Reject:
    lang = field.language()
    why = lang.explain(text)
    kinds = kinds_of(lang.dfa, text, field.distance, lang.state_cap)
    return Reject(text, kinds, why.witness, why.edits, why.distance)


# -- the whole corpus -------------------------------------------------------------------------

@dataclass
class ShardedSummary:
    """What ``write_sharded_corpus`` wrote: the folder, seed, shards, files and per-part counts."""

    out_dir: Path
    seed: int
    shards: int
    files: dict[str, dict]
    fields: dict[str, dict]
    cases: int = 0


def write_sharded_corpus(profile: "Profile | str | Path", out_dir: "str | Path",
                         seed: int | None = None, shards: int = 1, force: bool = False,
                         progress: Callable[[str], None] | None = None,
                         boundary_limit: int | None = None, settings=None) -> ShardedSummary:
    """Write the keyed, sharded corpus of ``profile`` (see the module docstring).

    ``seed``, ``force``, ``progress`` and ``boundary_limit`` as for
    ``pfuzz.corpus.writer.write_corpus``; ``settings`` a ``pfuzz.scale.RunSettings``
    (default: every shard in this process)."""
    from pfuzz.scale import RunSettings, run_shards

    if isinstance(shards, bool) or not isinstance(shards, int) or shards < 1:
        raise ArgumentError(f"shards must be a positive integer, not {shards!r}")
    if not isinstance(profile, Profile):
        profile = load_profile(profile)
    out_dir, seed = Path(out_dir), _choose_seed(profile, seed)
    replace = check_target(out_dir, force)
    tick = progress or (lambda label: None)
    seeds = _child_seeds(profile, seed)
    with Staging(out_dir, replace=replace) as staging:
        work, facts = [], {}
        for field in profile.fields:
            facts[field.name] = _field_facts(field, seeds[field.name], shards, staging, work,
                                             boundary_limit)
            tick(f"{field.name}: planned")
        results = run_shards(make_shard, work, (profile,),
                             settings=settings or RunSettings(workers=0),
                             on_result=lambda shard, _: tick(shard["label"]))
        summary = ShardedSummary(out_dir, seed, shards, staging.files, {})
        for shard, result in zip(work, results):
            staging.files[shard["relative"]] = {"bytes": result["bytes"],
                                                "sha256": result["sha256"]}
            entry = facts[shard["field"]]["shards"][shard["part"]][shard["index"]]
            entry.update(count=result["count"], bytes=result["bytes"], sha256=result["sha256"])
        for name, fact in facts.items():
            made = {part: sum(s["count"] for s in fact["shards"][part]) for part in SHARDED_PARTS}
            fact["made"].update(made)
            summary.fields[name] = {**made, "boundary": fact["made"]["boundary"]}
            summary.cases += sum(summary.fields[name].values())
        manifest = _manifest(profile, seed, shards, facts)
        manifest["files"] = dict(sorted(staging.files.items()))
        staging.write(MANIFEST_NAME, json_text(manifest, indent=2, sort_keys=False) + "\n")
        staging.write(CHECKSUMS_NAME, staging.checksums_text())
        staging.commit()
    tick("written")
    return summary


def _field_facts(field, seeds: tuple[int, int], shards: int, staging: Staging, work: list,
                 boundary_limit) -> dict:
    """Plan the field's shards (appended to ``work``), write its boundary file, and return
    its manifest entry (shard facts filled in once the shards are made)."""
    lang = field_language(field)
    low, high, finite = _window(lang)
    limit = field.boundary_limit if boundary_limit is None else boundary_limit
    boundary = lang.boundary_cases(max_length=None if finite else high, limit=limit)
    counts = {n: c for n, c in lang.counts(low, high).items() if c}
    near = not lang.near_misses(field.distance, list(field.edits)).is_empty()
    made = FieldCases(field, (low, high), finite, counts, [], SAMPLING, [], boundary, near)
    path = f"fields/{field.name}/boundary.jsonl"
    with staging.open(path) as out:
        for row, _ in _boundary_items(made, path):
            out.write(jsonl_line(row))
    fact = _field_manifest(made)
    fact["made"] = {"valid_mode": SAMPLING, "boundary": len(boundary),
                    "boundary_limit": boundary.limit, "boundary_cut": dict(boundary.cut_by_category)}
    fact["shards"] = {}
    for part, seed in zip(SHARDED_PARTS, seeds):
        language, part_counts, asked = _part_source(field, part)
        cases = _plan(part_counts, asked, _part_key(seed, part)).cases if asked else 0
        fact["made"][f"{part}_mode"] = ("all" if asked and cases == sum(part_counts.values())
                                        else SAMPLING)
        fact["shards"][part] = []
        for index, (start, stop) in enumerate(case_ranges(cases, shards)):
            relative = f"fields/{field.name}/{part}.shard-{index:04d}.jsonl"
            fact["shards"][part].append({"file": relative, "cases": [start, stop]})
            work.append({"id": len(work), "field": field.name, "part": part, "seed": seed,
                         "start": start, "stop": stop, "cases": cases, "index": index,
                         "relative": relative, "path": str(staging.temp / relative),
                         "label": f"{field.name}: {part} shard {index + 1}/{shards}"})
    return fact


def _manifest(profile: Profile, seed: int, shards: int, fields: dict) -> dict:
    name = Path(profile.path).name
    return {
        "format": FORMAT_TAG,
        "sampling": SAMPLING,
        "sampling_note": ("case i of a part is a function of the seed and i alone "
                          "(pfuzz.corpus.shards); the shards of a part, concatenated in "
                          "order, are the file --shards 1 writes"),
        "profile": {"file": name, "sha256": profile.sha256, "title": profile.title,
                    "about": profile.about},
        "seed": seed,
        "shards": shards,
        "reproduce": f"pfuzz corpus {name} --out DIR --seed {seed} --shards {shards}",
        "versions": _versions(),
        "fields": fields,
        "record": None,
        "record_note": (f"record '{profile.record.name}' is not written in sharded mode"
                        if profile.record else "the profile has no record"),
        "left_out": ["cases.csv", "qa.xlsx"],
    }
