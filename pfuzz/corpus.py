"""Paired corpora: valid strings, near-miss rejects and boundary cases for every field.

``write_corpus(profile, out_dir, seed)`` turns a profile (``pfuzz.profile``)
into a directory that QA can use as it is:

    OUT/
      manifest.json                 what was made, from what, with which versions
      SHA256SUMS                    digest of every other file (``sha256sum -c``)
      cases.csv                     every case below in one table
      fields/NAME/valid.jsonl       valid strings (uniform by length)
      fields/NAME/rejects.jsonl     near-miss rejects, each with witness and edits
      fields/NAME/boundary.jsonl    the deterministic boundary suite
      records/NAME/valid.csv        record rows whose fields are all valid
      records/NAME/invalid.csv      rows with exactly one near-miss field

Methods: valid strings are drawn uniformly by length from the field's minimal
DFA (``Language.sample``, the recursive method); when the field has no more
strings in its length window than were asked for, all of them are written
instead (shortlex enumeration). Rejects are drawn from the near-miss language
N_d(L) − L (``Language.rejects``) without repeats, each with its nearest valid
witness and edit script. Boundary suites come from ``pfuzz.boundary``.

Length window: a finite field uses all its lengths; an unbounded one uses its
shortest valid length up to that plus ``pfuzz.counting.UNBOUNDED_SPAN`` (the
same bound as its boundary suite, recorded in the manifest); rejects may be
``distance`` characters longer.

Randomness: one ``RandomSource(seed)``; before anything is drawn it hands out
child seeds in a fixed order (per field in profile order: valid, rejects; then
the record: its field values, its rejects, and one faker seed per context
column), so changing one field's counts leaves every other field's strings as
they were. Same profile, seed and versions → byte-identical files (no
timestamps, sorted keys, shortlex-sorted field files).

Cost: dominated by sampling and by explaining rejects (see those modules).
A field's strings are written as soon as they are made and then let go; the
rows of cases.csv stay in memory to the end, and each file is built whole
before ``write_atomic`` writes it. Measured by ``benchmarks/corpus.py``: 49 MB
peak for the demo profile, 809 MB for 967,347 cases over five fields (about
0.8 KB per case), 26 s of CPU, most of it in witness search and sampling.
"""

from __future__ import annotations

import platform
from dataclasses import dataclass, field as dataclass_field
from pathlib import Path
from typing import Callable

from . import __version__, records
from .counting import UNBOUNDED_SPAN
from .corpusfiles import (CHECKSUMS_NAME, FORMAT_TAG, MANIFEST_NAME, Staging, check_target,
                          csv_text, json_text, jsonl_text)
from .corpusrows import (RecordTables, case_ids, edit_list, record_tables,
                         reject_reason)
from .errors import ArgumentError, ProfileError
from .profile import Field, Profile, load_profile
from .randomness import RandomSource

CASE_COLUMNS = ("case_id", "field", "value", "expected", "category", "reason", "witness",
                "edits", "file")
ACCEPT, REJECT = "accept", "reject"
PARTS = ("valid", "rejects", "boundary")     #: the three files of a field, in this order
#: Rounds of extra draws when repeats leave a reject list short (then it stays short).
TOP_UP_ROUNDS = 8


@dataclass(frozen=True)
class FieldPlan:
    """What record rows need of a field once its own files are written."""

    field: Field
    window: tuple[int, int]
    has_near_misses: bool


@dataclass
class FieldCases:
    """Everything made for one field, and the facts the manifest reports about it."""

    field: Field
    window: tuple[int, int]
    finite: bool
    counts: dict[int, int]
    valid: list[str]
    valid_mode: str
    rejects: list
    boundary: list
    has_near_misses: bool

    def plan(self) -> FieldPlan:
        return FieldPlan(self.field, self.window, self.has_near_misses)


@dataclass
class CorpusSummary:
    """What ``write_corpus`` wrote: the directory, the seed, per-file sizes, per-part counts."""

    out_dir: Path
    seed: int
    files: dict[str, dict]
    fields: dict[str, dict] = dataclass_field(default_factory=dict)
    record: dict | None = None
    cases: int = 0


def step_count(profile: Profile) -> int:
    """Steps ``write_corpus`` reports: three per field, one for the record, one to write."""
    return 3 * len(profile.fields) + (1 if profile.record else 0) + 1


def write_corpus(profile: "Profile | str | Path", out_dir: "str | Path", seed: int | None = None,
                 force: bool = False, progress: Callable[[str], None] | None = None
                 ) -> CorpusSummary:
    """Write the corpus of ``profile`` to ``out_dir`` (see the module docstring).

    ``seed`` None means the profile's ``seed`` key, else 0. An existing
    ``out_dir`` raises ``CorpusExistsError`` unless ``force`` (and then only a
    previous corpus or an empty directory is replaced). ``progress(label)`` is
    called once per step (``step_count``).
    """
    if not isinstance(profile, Profile):
        profile = load_profile(profile)
    out_dir = Path(out_dir)
    seed = _choose_seed(profile, seed)
    replace = check_target(out_dir, force)
    tick = progress or (lambda label: None)
    seeds = _child_seeds(profile, seed)
    with Staging(out_dir, replace=replace) as staging:
        writer = _Writer(staging, profile, seed)
        plans = {}
        for field in profile.fields:
            made = _field_cases(field, seeds[field.name], tick)
            writer.add_field(made)
            plans[field.name] = made.plan()
            del made                        # its strings are written: let them go
        if profile.record:
            writer.add_record(record_tables(profile.record, plans, seeds["record"]))
            tick(f"record {profile.record.name}")
        summary = writer.finish()
        staging.commit()
    tick("written")
    return summary


def _choose_seed(profile: Profile, seed: int | None) -> int:
    chosen = seed if seed is not None else (profile.seed if profile.seed is not None else 0)
    if not isinstance(chosen, int) or isinstance(chosen, bool) or chosen < 0:
        raise ArgumentError(f"seed must be a non-negative integer, not {chosen!r}")
    return chosen


def _child_seeds(profile: Profile, seed: int) -> dict:
    root = RandomSource(seed)
    seeds: dict = {f.name: (root.child_seed(), root.child_seed()) for f in profile.fields}
    if profile.record:
        seeds["record"] = {"values": root.child_seed(), "rejects": root.child_seed(),
                           "context": [root.child_seed() for _ in profile.record.context]}
    return seeds


# -- per field -------------------------------------------------------------------

def _field_cases(field: Field, seeds: tuple[int, int], tick) -> FieldCases:
    lang = field.language()
    if lang.is_empty():
        raise ProfileError("no string satisfies the pattern with its require, forbid and "
                           "length keys", where=f"field '{field.name}'")
    low = lang.min_length
    finite = lang.max_length is not None
    high = lang.max_length if finite else low + UNBOUNDED_SPAN
    counts = {n: c for n, c in lang.counts(low, high).items() if c}
    valid, mode = _valid_strings(lang, field.valid, low, high, sum(counts.values()), seeds[0])
    tick(f"{field.name}: valid")
    near = lang.near_misses(field.distance, list(field.edits))
    rejects = [] if near.is_empty() else _rejects(lang, field, high + field.distance, seeds[1])
    tick(f"{field.name}: rejects")
    boundary = lang.boundary_cases(max_length=None if finite else high)
    tick(f"{field.name}: boundary")
    return FieldCases(field, (low, high), finite, counts, valid, mode, rejects, boundary,
                      has_near_misses=not near.is_empty())


def _valid_strings(lang, n: int, low: int, high: int, total: int, seed: int):
    if total <= n:
        return list(lang.enumerate(low, high)), "all"
    drawn = lang.sample(n, min_length=low, max_length=high, seed=seed, unique=True)
    return sorted(drawn, key=_shortlex), "sample"


def _rejects(lang, field: Field, high: int, seed: int) -> list:
    """``field.invalid`` distinct near-miss rejects (fewer only if fewer exist)."""
    source = RandomSource(seed)
    chosen: dict[str, object] = {}
    for _ in range(TOP_UP_ROUNDS):
        wanted = field.invalid - len(chosen)
        if wanted <= 0:
            break
        for reject in lang.rejects(wanted, distance=field.distance, kinds=list(field.edits),
                                   seed=source, max_length=high):
            chosen.setdefault(reject.text, reject)
    return sorted(chosen.values(), key=lambda r: _shortlex(r.text))[:field.invalid]


def _shortlex(text: str) -> tuple[int, str]:
    return (len(text), text)


# -- rows of the files -----------------------------------------------------------

def _field_files(made: FieldCases):
    """(relative path, JSONL rows, cases.csv rows) for the three files of one field."""
    name = made.field.name
    base = f"fields/{name}"
    valid_ids = case_ids(f"{name}:valid", len(made.valid))
    valid_rows = [{"id": i, "length": len(t), "text": t} for i, t in zip(valid_ids, made.valid)]
    reason = ("every valid string of the length window" if made.valid_mode == "all"
              else "drawn uniformly by length")
    valid_file, rejects_file, boundary_file = (f"{base}/{part}.jsonl" for part in PARTS)
    valid_cases = [(i, name, t, ACCEPT, "valid", reason, "", "", valid_file)
                   for i, t in zip(valid_ids, made.valid)]
    reject_ids = case_ids(f"{name}:reject", len(made.rejects))
    reject_rows, reject_cases = [], []
    for i, r in zip(reject_ids, made.rejects):
        script = edit_list(r)
        reject_rows.append({**r.as_dict(), "id": i, "length": len(r.text), "script": script})
        reject_cases.append((i, name, r.text, REJECT, "near-miss", reject_reason(r),
                             r.witness, "; ".join(script), rejects_file))
    boundary_ids = case_ids(f"{name}:boundary", len(made.boundary))
    boundary_rows = [{"id": i, "text": c.text, "expected": ACCEPT if c.expected else REJECT,
                      "category": c.category, "reason": c.reason}
                     for i, c in zip(boundary_ids, made.boundary)]
    boundary_cases = [(i, name, c.text, ACCEPT if c.expected else REJECT, c.category, c.reason,
                       "", "", boundary_file) for i, c in zip(boundary_ids, made.boundary)]
    return [(valid_file, valid_rows, valid_cases), (rejects_file, reject_rows, reject_cases),
            (boundary_file, boundary_rows, boundary_cases)]


class _Writer:
    """Writes each part as it is made and keeps only the cases.csv rows and manifest facts."""

    def __init__(self, staging: Staging, profile: Profile, seed: int):
        self.staging, self.profile, self.seed = staging, profile, seed
        self.cases: list[tuple] = []
        self.field_facts: dict[str, dict] = {}
        self.record_facts: dict | None = None
        self.summary = CorpusSummary(out_dir=staging.out_dir, seed=seed, files=staging.files)

    def add_field(self, made: FieldCases) -> None:
        for path, rows, field_cases in _field_files(made):
            self.staging.write(path, jsonl_text(rows))
            self.cases.extend(field_cases)
        self.summary.fields[made.field.name] = {
            "valid": len(made.valid), "rejects": len(made.rejects), "boundary": len(made.boundary)}
        self.field_facts[made.field.name] = _field_manifest(made)

    def add_record(self, tables: RecordTables) -> None:
        for path, header, rows in tables.files():
            self.staging.write(path, csv_text(header, rows))
        self.cases.extend(tables.cases())
        self.summary.record = {"name": tables.record.name, "valid_rows": len(tables.valid),
                               "invalid_rows": len(tables.invalid)}
        self.record_facts = tables.manifest()

    def finish(self) -> CorpusSummary:
        self.staging.write("cases.csv", csv_text(list(CASE_COLUMNS), self.cases))
        self.summary.cases = len(self.cases)
        manifest = _manifest(self.profile, self.seed, self.field_facts, self.record_facts,
                             self.staging.files)
        self.staging.write(MANIFEST_NAME, json_text(manifest, indent=2, sort_keys=False) + "\n")
        self.staging.write(CHECKSUMS_NAME, self.staging.checksums_text())
        return self.summary


# -- the manifest ----------------------------------------------------------------

def _versions() -> dict[str, str]:
    import numpy
    return {"pfuzz": __version__, "python": platform.python_version(),
            "numpy": numpy.__version__, "faker": records.faker_version()}


def _field_manifest(m: FieldCases) -> dict:
    f = m.field
    low, high = m.window
    return {
        "about": f.about, "source": f.source,
        "pattern": f.pattern, "require": list(f.require), "forbid": list(f.forbid),
        "universe": f.universe, "flags": list(f.flags),
        "min_length": f.min_length, "max_length": f.max_length,
        "distance": f.distance, "edits": list(f.edits),
        "finite": m.finite,
        "length_window": [low, high],
        "length_window_note": ("every valid length" if m.finite else
                               f"unbounded language: lengths {low}..{high} counted and sampled"),
        "total_in_window": sum(m.counts.values()),
        "counts_by_length": {str(n): c for n, c in sorted(m.counts.items())},
        "asked": {"valid": f.valid, "rejects": f.invalid},
        "made": {"valid": len(m.valid), "valid_mode": m.valid_mode, "rejects": len(m.rejects),
                 "boundary": len(m.boundary)},
    }


def _manifest(profile: Profile, seed: int, fields: dict[str, dict], record: dict | None,
              files: dict[str, dict]) -> dict:
    return {
        "format": FORMAT_TAG,
        "profile": {"file": Path(profile.path).name, "sha256": profile.sha256,
                    "title": profile.title, "about": profile.about},
        "seed": seed,
        "reproduce": f"pfuzz corpus {Path(profile.path).name} --out DIR --seed {seed}",
        "versions": _versions(),
        "fields": fields,
        "record": record,
        "files": dict(sorted(files.items())),
    }
