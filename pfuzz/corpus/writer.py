"""Paired corpora: valid strings, near-miss rejects and boundary cases for every field.

``write_corpus(profile, out_dir, seed)`` turns a profile (``pfuzz.profile.loader``)
into a directory that QA can use as it is:

    OUT/
      manifest.json                 what was made, from what, with which versions
      SHA256SUMS                    digest of every other file (``sha256sum -c``)
      cases.csv                     every case below in one table
      qa.xlsx                       the same cases as a spreadsheet (text cells; pfuzz.corpus.workbook)
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
witness and edit script. Boundary suites come from ``pfuzz.boundary.suite``.

``pfuzz corpus --shards K`` writes a variant whose case i depends only on the seed and
i, split into K files (``pfuzz.corpus.shards``); this module's corpus is unchanged by it.

Length window: a finite field uses all its lengths; an unbounded one uses its
shortest valid length up to that plus ``pfuzz.counting.tables.UNBOUNDED_SPAN`` (the
same bound as its boundary suite, recorded in the manifest); rejects may be
``distance`` characters longer.

Randomness: one ``RandomSource(seed)``; before anything is drawn it hands out
child seeds in a fixed order (per field in profile order: valid, rejects; then
the record: its field values, its rejects, and one faker seed per context
column), so changing one field's counts leaves every other field's strings as
they were. Same profile, seed and versions → byte-identical files (no
timestamps, sorted keys, shortlex-sorted field files).

Cost: dominated by sampling and by explaining rejects (see those modules).
Every file is streamed (``Staging.open``, over ``pfuzz.base.files.atomic_writer``):
rows are made one at a time and written, cases.csv stays open from the first
field to the last and takes each case as its field is written, and checksums
are computed on the way out. What stays in memory is one field's strings at a
time: its valid strings and its rejects, each with witness and edit script
(``pfuzz.base.resources.REJECT_BYTES`` apiece), which must all be at hand to be
de-duplicated and sorted before the first is written; and a record's rows. Before
any work, ``check_memory`` estimates each of these from the field's counts and
longest length (``pfuzz.base.resources``) and refuses a profile past the memory
budget with a ``ResourceLimitError`` naming the field and the keys to lower. So
peak memory grows with the largest field, not with the corpus: ``python -m
pfuzz.benchmarks corpus`` gives peak memory and CPU time for the demo profile
and for five fields of 10^5 valid strings and 10^5 rejects each.
"""

from __future__ import annotations

import platform
from dataclasses import dataclass, field as dataclass_field
from pathlib import Path
from typing import Callable

from pfuzz import __version__
from pfuzz.corpus import context as records
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.base.jsonlines import json_text, jsonl_line
from pfuzz.corpus.formats import (CHECKSUMS_NAME, FORMAT_TAG, MANIFEST_NAME, Staging, check_target, csv_writer)
from pfuzz.corpus.rows import (RecordTables, case_ids, edit_list, record_tables,
                         reject_reason)
from pfuzz.errors import ArgumentError, ProfileError
from pfuzz.profile.loader import Field, Profile, load_profile
from pfuzz.base.randomness import RandomSource
from pfuzz.base.resources import REJECT_BYTES, require_memory, string_bytes

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
                 force: bool = False, progress: Callable[[str], None] | None = None,
                 boundary_limit: int | None = None) -> CorpusSummary:
    """Write the corpus of ``profile`` to ``out_dir`` (see the module docstring).

    ``seed`` None means the profile's ``seed`` key, else 0. An existing
    ``out_dir`` raises ``CorpusExistsError`` unless ``force`` (and then only a
    previous corpus or an empty directory is replaced). ``progress(label)`` is
    called once per step (``step_count``). ``boundary_limit`` None means each
    field's ``boundary_limit`` key (the cases its boundary suite keeps).
    """
    if not isinstance(profile, Profile):
        profile = load_profile(profile)
    out_dir = Path(out_dir)
    seed = _choose_seed(profile, seed)
    replace = check_target(out_dir, force)
    check_memory(profile)
    tick = progress or (lambda label: None)
    seeds = _child_seeds(profile, seed)
    with Staging(out_dir, replace=replace) as staging:
        with staging.open("cases.csv") as cases_handle:
            writer = _Writer(staging, profile, seed, cases_handle)
            plans = {}
            for field in profile.fields:
                made = _field_cases(field, seeds[field.name], tick, boundary_limit)
                writer.add_field(made)
                plans[field.name] = made.plan()
                del made                    # its strings are written: let them go
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

def _window(lang) -> tuple[int, int, bool]:
    """(shortest, longest, finite): the lengths a field's valid strings are drawn from."""
    low = lang.min_length
    finite = lang.max_length is not None
    return low, (lang.max_length if finite else low + UNBOUNDED_SPAN), finite


def check_memory(profile: Profile) -> None:
    """Refuse (``ResourceLimitError``) before any work when one field's strings, rejects or
    the record's rows, all of which are held at once, would be past the memory budget."""
    longest = {}
    for field in profile.fields:
        lang = field.language()
        if lang.is_empty():
            continue                        # reported in its turn, with the field's name
        widest, high = lang.alphabet.max, _window(lang)[1]
        longest[field.name] = string_bytes(high, widest)
        where = f"field '{field.name}'"
        require_memory(field.valid * 2 * longest[field.name],
                       f"{where}: {field.valid:,} valid strings of up to {high:,} characters",
                       "lower its valid or max_length key")
        longest_reject = high + field.distance
        require_memory(field.invalid * (REJECT_BYTES + 2 * string_bytes(longest_reject, widest)),
                       f"{where}: {field.invalid:,} near-miss rejects of up to "
                       f"{longest_reject:,} characters", "lower its invalid or max_length key")
    record = profile.record
    if record is not None:
        rows = record.valid_rows + record.invalid_rows
        row = sum(longest.get(name, 0) for name in record.fields) + REJECT_BYTES
        require_memory(rows * row, f"record '{record.name}': {rows:,} rows",
                       "lower its valid_rows or invalid_rows key, or its fields' max_length")


def field_language(field: Field):
    """The field's ``Language``; ``ProfileError`` when no string satisfies it."""
    lang = field.language()
    if lang.is_empty():
        raise ProfileError("no string satisfies the pattern with its require, forbid and "
                           f"length keys over the alphabet {field.alphabet!r}",
                           where=f"field '{field.name}'")
    return lang


def _field_cases(field: Field, seeds: tuple[int, int], tick, boundary_limit=None) -> FieldCases:
    lang = field_language(field)
    low, high, finite = _window(lang)
    counts = {n: c for n, c in lang.counts(low, high).items() if c}
    valid, mode = _valid_strings(lang, field.valid, low, high, sum(counts.values()), seeds[0])
    tick(f"{field.name}: valid")
    near = lang.near_misses(field.distance, list(field.edits))
    rejects = [] if near.is_empty() else _rejects(lang, field, high + field.distance, seeds[1])
    tick(f"{field.name}: rejects")
    limit = field.boundary_limit if boundary_limit is None else boundary_limit
    boundary = lang.boundary_cases(max_length=None if finite else high, limit=limit)
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

def _field_parts(made: FieldCases):
    """(relative path, iterator of (JSONL row, cases.csv row)) for the three files of a field,
    made lazily so that no file's rows are ever all in memory."""
    name = made.field.name
    paths = [f"fields/{name}/{part}.jsonl" for part in PARTS]
    return list(zip(paths, (_valid_items(made, paths[0]), _reject_items(made, paths[1]),
                            _boundary_items(made, paths[2]))))


def _valid_items(made: FieldCases, path: str):
    name = made.field.name
    reason = ("every valid string of the length window" if made.valid_mode == "all"
              else "drawn uniformly by length")
    for i, text in zip(case_ids(f"{name}:valid", len(made.valid)), made.valid):
        yield ({"id": i, "length": len(text), "text": text},
               (i, name, text, ACCEPT, "valid", reason, "", "", path))


def _reject_items(made: FieldCases, path: str):
    name = made.field.name
    for i, r in zip(case_ids(f"{name}:reject", len(made.rejects)), made.rejects):
        script = edit_list(r)
        yield ({**r.as_dict(), "id": i, "length": len(r.text), "script": script},
               (i, name, r.text, REJECT, "near-miss", reject_reason(r), r.witness,
                "; ".join(script), path))


def _boundary_items(made: FieldCases, path: str):
    name = made.field.name
    for i, c in zip(case_ids(f"{name}:boundary", len(made.boundary)), made.boundary):
        expected = ACCEPT if c.expected else REJECT
        yield ({"id": i, "text": c.text, "expected": expected, "category": c.category,
                "kind": c.kind, "reason": c.reason},
               (i, name, c.text, expected, c.category, c.reason, c.witness or "",
                "; ".join(edit_list(c)), path))


class _Writer:
    """Streams each part to its file as it is made, and its cases to the open cases.csv;
    keeps only the manifest facts."""

    def __init__(self, staging: Staging, profile: Profile, seed: int, cases_handle):
        self.staging, self.profile, self.seed = staging, profile, seed
        self.cases = csv_writer(cases_handle)
        self.cases.writerow(CASE_COLUMNS)
        self.field_facts: dict[str, dict] = {}
        self.record_facts: dict | None = None
        self.summary = CorpusSummary(out_dir=staging.out_dir, seed=seed, files=staging.files)

    def add_field(self, made: FieldCases) -> None:
        for path, items in _field_parts(made):
            with self.staging.open(path) as out:
                for row, case in items:
                    out.write(jsonl_line(row))
                    self.cases.writerow(case)
                    self.summary.cases += 1
        self.summary.fields[made.field.name] = {
            "valid": len(made.valid), "rejects": len(made.rejects), "boundary": len(made.boundary),
            "boundary_cut": made.boundary.cut, "boundary_note": made.boundary.note()}
        self.field_facts[made.field.name] = _field_manifest(made)

    def add_record(self, tables: RecordTables) -> None:
        for path, header, rows in tables.files():
            with self.staging.open(path) as out:
                table = csv_writer(out)
                table.writerow(header)
                table.writerows(rows)
        for case in tables.cases():
            self.cases.writerow(case)
            self.summary.cases += 1
        self.summary.record = {"name": tables.record.name, "valid_rows": len(tables.valid),
                               "invalid_rows": len(tables.invalid)}
        self.record_facts = tables.manifest()

    def finish(self) -> CorpusSummary:
        """Write the manifest and SHA256SUMS (after cases.csv is closed and counted)."""
        from pfuzz.corpus import workbook
        if workbook.available():            # the QA workbook, from the files just staged
            data = workbook.workbook_bytes(self.staging.temp, self.profile.title)
            with self.staging.open(workbook.WORKBOOK_NAME) as handle:
                handle.flush()
                handle.buffer.write(data)
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
        "alphabet": f.alphabet, "flags": list(f.flags),
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
                 "boundary": len(m.boundary), "boundary_limit": m.boundary.limit,
                 "boundary_cut": dict(m.boundary.cut_by_category)},
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
