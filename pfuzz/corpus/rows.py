"""Record rows of a corpus: valid rows, and rows where exactly one field is a near miss.

A record (``pfuzz.profile.loader.Record``) lists pattern fields and faker context
columns. Each valid row takes, for every pattern field, a string drawn
uniformly by length from the field's language (repeats across rows are
allowed: rows are independent draws), and for every context column a value
from its faker provider (``pfuzz.corpus.context``). Invalid row i keeps everything
valid except one field, taken in turn (row 1 the first pattern field that has
near misses, row 2 the next, ...), whose value is a near-miss reject; its
``bad_field`` column names the field, ``reason`` says why, and ``witness`` and
``edits`` show the nearest valid value and the edit that breaks it.

A field whose near-miss language is empty (for example ``.*``: every string
is valid) cannot be made invalid and is skipped in the turn; when no field has
near misses the record has no invalid rows (the manifest says so).

Cost: one sample of (valid + invalid rows) strings per field, one reject draw
per field, one Faker per context column.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterator

from pfuzz.corpus import context as records
from pfuzz.base.jsonlines import json_text
from pfuzz.profile.loader import Record
from pfuzz.base.randomness import RandomSource

VALID_HEADER = ("row_id",)
INVALID_EXTRA = ("bad_field", "reason", "witness", "edits")


@dataclass
class RecordTables:
    """The rows of one record, ready to be written as CSV and listed in cases.csv."""

    record: Record
    valid: list[dict]
    invalid: list[tuple[dict, str, object]]   # (row, bad field, reject)
    skipped: list[str]

    @property
    def base(self) -> str:
        return f"records/{self.record.name}"

    def _valid_ids(self) -> Iterator[str]:
        return case_ids(f"{self.record.name}:row", len(self.valid))

    def _invalid_ids(self) -> Iterator[str]:
        return case_ids(f"{self.record.name}:bad-row", len(self.invalid))

    def files(self):
        """(relative path, header, rows) for valid.csv and invalid.csv; rows are made lazily."""
        columns = list(self.record.columns)
        valid = ([i, *(row[c] for c in columns)] for i, row in zip(self._valid_ids(), self.valid))
        invalid = ([i, *(row[c] for c in columns), bad, _reason(bad, r), r.witness, _edits(r)]
                   for i, (row, bad, r) in zip(self._invalid_ids(), self.invalid))
        return [(f"{self.base}/valid.csv", [*VALID_HEADER, *columns], valid),
                (f"{self.base}/invalid.csv", [*VALID_HEADER, *columns, *INVALID_EXTRA], invalid)]

    def cases(self) -> Iterator[tuple]:
        """Rows for cases.csv, made lazily; ``value`` is the whole row as a JSON object in
        column order."""
        name = self.record.name
        for i, row in zip(self._valid_ids(), self.valid):
            yield (i, name, _row_json(row), "accept", "valid row", "every field valid", "", "",
                   f"{self.base}/valid.csv")
        for i, (row, bad, r) in zip(self._invalid_ids(), self.invalid):
            yield (i, name, _row_json(row), "reject", "invalid row", _reason(bad, r), r.witness,
                   _edits(r), f"{self.base}/invalid.csv")

    def manifest(self) -> dict:
        rec = self.record
        return {
            "name": rec.name, "columns": list(rec.columns), "fields": list(rec.fields),
            "context": [{"column": c.column, "provider": c.provider, "locale": c.locale}
                        for c in rec.context],
            "asked": {"valid_rows": rec.valid_rows, "invalid_rows": rec.invalid_rows},
            "made": {"valid_rows": len(self.valid), "invalid_rows": len(self.invalid)},
            "fields_without_near_misses": list(self.skipped),
        }


def case_ids(prefix: str, n: int) -> Iterator[str]:
    """``prefix:0001`` ... (at least four digits, so ids sort as text), made lazily."""
    width = max(4, len(str(n)))
    return (f"{prefix}:{i + 1:0{width}d}" for i in range(n))


def edit_list(reject) -> list[str]:
    """The edit script turning the witness into the reject, one readable step each."""
    return [str(e) for e in reject.edits]


def _edits(reject) -> str:
    return "; ".join(edit_list(reject))


def reject_reason(reject) -> str:
    """E.g. "1 edit (delete/replace) from the valid witness"; kinds are every single-kind
    language that holds the reject (none when only a mix of kinds reaches it)."""
    n = reject.distance
    kinds = "/".join(reject.kinds) or "mixed kinds"
    return f"{n} edit{'s' if n != 1 else ''} ({kinds}) from the valid witness"


def _reason(bad: str, reject) -> str:
    return f"field '{bad}' is a near miss: {reject_reason(reject)}; every other field valid"


def _row_json(row: dict) -> str:
    return json_text(row, sort_keys=False)


def record_tables(record: Record, made: dict, seeds: dict) -> RecordTables:
    """Build the rows of ``record`` from the fields' languages (``made``: name → FieldPlan)."""
    rows = record.valid_rows + record.invalid_rows
    values_source = RandomSource(seeds["values"])
    reject_source = RandomSource(seeds["rejects"])
    values = {}
    for name in record.fields:
        m = made[name]
        low, high = m.window
        values[name] = m.field.language().sample(rows, min_length=low, max_length=high,
                                                 seed=values_source)
    for column, seed in zip(record.context, seeds["context"]):
        values[column.column] = records.context_values(column.provider, column.locale, seed, rows)
    table = [{c: values[c][i] for c in record.columns} for i in range(rows)]
    turn = [n for n in record.fields if made[n].has_near_misses]
    skipped = [n for n in record.fields if n not in turn]
    invalid = []
    if turn and record.invalid_rows:
        bad_fields = [turn[i % len(turn)] for i in range(record.invalid_rows)]
        rejects = {n: iter(_draw_rejects(made[n], bad_fields.count(n), reject_source))
                   for n in turn}
        for i, bad in enumerate(bad_fields):
            row = dict(table[record.valid_rows + i])
            reject = next(rejects[bad])
            row[bad] = reject.text
            invalid.append((row, bad, reject))
    return RecordTables(record, table[:record.valid_rows], invalid, skipped)


def _draw_rejects(m, n: int, source: RandomSource) -> list:
    f = m.field
    if n == 0:
        return []
    return f.language().rejects(n, distance=f.distance, kinds=list(f.edits), seed=source,
                                max_length=m.window[1] + f.distance)
