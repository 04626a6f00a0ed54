"""Corpus cases judged by outside references: Python's ``re`` for every verdict, faker for context.

The reference verdict of a field is, with Python's ``re.fullmatch`` as the
matcher: the pattern matches, every ``require`` pattern matches, no
``forbid`` pattern matches, the length is within ``min_length..max_length``
and every character is in the field's alphabet. Every case the corpus marks
``accept`` must get True, every ``reject`` False.
"""

from __future__ import annotations

import datetime
import json
import re
from pathlib import Path

import pytest

from pfuzz.base.jsonlines import read_jsonl
from pfuzz.corpus.formats import read_csv
from pfuzz.corpus.writer import write_corpus
from pfuzz.profile.loader import load_profile
from pfuzz.base.randomness import RandomSource

DEMO = Path(__file__).resolve().parents[2] / "profiles" / "demo.toml"

#: Flags, length bounds, require/forbid, distance 2 and a subset of edit kinds together.
MIXED = """
[profile]
title = "mixed keys"
seed = 3

[[field]]
name = "code"
pattern = '[a-z]{2,}[0-9]*'
flags = ["IGNORECASE"]
min_length = 3
max_length = 6
require = ['.*[0-9].*']
forbid = ['.*(00|xx).*']
distance = 2
edits = ["delete", "swap"]
valid = 40
invalid = 40

[[field]]
name = "word"
pattern = 'a[bc]+'
alphabet = "[abc ]"
valid = 20
invalid = 20

# Patterns that reach beyond the alphabet: only the alphabet keeps their strings in it.
[[field]]
name = "mark"
pattern = '.{1,2}[^0-9]'
alphabet = "[0-9x-z]"
valid = 20
invalid = 20

[[field]]
name = "any"
pattern = '(?s).{1,3}'
valid = 30
invalid = 10

[record]
name = "pair"
valid_rows = 6
invalid_rows = 6
"""


def _not_surrogate(ch: str) -> bool:
    return not "\ud800" <= ch <= "\udfff"


#: The named alphabets as the README defines them: printable is U+0020-U+007E (the printable
#: characters of ASCII, RFC 20), ascii U+0000-U+007F, latin1 U+0000-U+00FF (ISO/IEC 8859-1),
#: bmp the Basic Multilingual Plane and unicode every code point, both without surrogates.
PRESETS = {
    "printable": lambda ch: " " <= ch <= "~",
    "ascii": lambda ch: ch <= "\x7f",
    "latin1": lambda ch: ch <= "\xff",
    "bmp": lambda ch: ch <= "\uffff" and _not_surrogate(ch),
    "unicode": _not_surrogate,
}


def in_alphabet(spec: str, ch: str) -> bool:
    """A preset by the README's definition, or a class judged by Python's re."""
    if spec.startswith("["):
        return re.fullmatch(spec, ch) is not None and _not_surrogate(ch)
    return PRESETS[spec](ch)


def reference(field, text: str) -> bool:
    """The verdict of Python's re (source: the ``re`` module of the standard library)."""
    flags = field.flag_bits
    return (re.fullmatch(field.pattern, text, flags) is not None
            and all(re.fullmatch(p, text, flags) for p in field.require)
            and not any(re.fullmatch(p, text, flags) for p in field.forbid)
            and (field.min_length or 0) <= len(text)
            and (field.max_length is None or len(text) <= field.max_length)
            and all(in_alphabet(field.alphabet, ch) for ch in text))


def apply_script(witness: str, edits: list[dict]) -> str:
    """Apply edit steps as the JSON records them, independently of pfuzz's own code."""
    text = witness
    for e in edits:
        p = e["position"]
        assert text[p:p + len(e["old"])] == e["old"]
        text = text[:p] + e["new"] + text[p + len(e["old"]):]
    return text


@pytest.fixture(scope="module", params=["demo", "mixed"])
def demo(request, tmp_path_factory):
    tmp = tmp_path_factory.mktemp(request.param)
    path = DEMO
    if request.param == "mixed":
        path = tmp / "mixed.toml"
        path.write_text(MIXED, encoding="utf-8")
    write_corpus(path, tmp / "corpus")
    return load_profile(path), tmp / "corpus"


def test_every_field_case_gets_the_verdict_of_re(demo):
    profile, out = demo
    for field in profile.fields:
        base = out / "fields" / field.name
        for row in read_jsonl((base / "valid.jsonl").read_text(encoding="utf-8")):
            assert reference(field, row["text"]), (field.name, row)
        for row in read_jsonl((base / "boundary.jsonl").read_text(encoding="utf-8")):
            assert reference(field, row["text"]) == (row["expected"] == "accept"), (field.name, row)
        for row in read_jsonl((base / "rejects.jsonl").read_text(encoding="utf-8")):
            assert not reference(field, row["text"]), (field.name, row)
            assert reference(field, row["witness"]), (field.name, row)
            assert apply_script(row["witness"], row["edits"]) == row["text"]
            assert 1 <= row["distance"] == len(row["edits"]) <= field.distance


def test_every_record_row_gets_the_verdict_of_re(demo):
    profile, out = demo
    record = profile.record
    valid = read_csv((out / "records" / record.name / "valid.csv").read_text(encoding="utf-8"))
    invalid = read_csv((out / "records" / record.name / "invalid.csv").read_text(encoding="utf-8"))
    for row in valid:
        assert all(reference(profile.field(n), row[n]) for n in record.fields), row
    for row in invalid:
        bad = row["bad_field"]
        assert not reference(profile.field(bad), row[bad]), row
        assert reference(profile.field(bad), row["witness"]), row
        assert all(reference(profile.field(n), row[n]) for n in record.fields if n != bad), row


def test_cases_table_verdicts_match_re(demo):
    profile, out = demo
    table = read_csv((out / "cases.csv").read_text(encoding="utf-8"))
    names = {f.name for f in profile.fields}
    for row in table:
        if row["field"] in names:
            verdict = reference(profile.field(row["field"]), row["value"])
            assert verdict == (row["expected"] == "accept"), row
        else:
            values = json.loads(row["value"])
            verdicts = [reference(profile.field(n), values[n]) for n in profile.record.fields]
            assert all(verdicts) == (row["expected"] == "accept"), row


def test_context_columns_are_faker_values_from_the_documented_seed(demo):
    """Source: faker itself, seeded as pfuzz.corpus.writer documents (child seeds of one
    RandomSource: two per field, then record values, record rejects, one per context column)."""
    from faker import Faker

    profile, out = demo
    root = RandomSource(profile.seed)
    for _ in range(2 * len(profile.fields) + 2):
        root.child_seed()
    record = profile.record
    rows = read_csv((out / "records" / record.name / "valid.csv").read_text(encoding="utf-8"))
    for column in record.context:
        fake = Faker(column.locale)
        fake.seed_instance(root.child_seed())
        values = [r[column.column] for r in rows]
        if column.provider == "date_of_birth":
            # Source: the stdlib's datetime parses ISO 8601 calendar dates.
            born = [datetime.date.fromisoformat(v) for v in values]
            assert all(datetime.date(1930, 1, 1) <= d <= datetime.date(2006, 12, 31) for d in born)
        else:
            assert values == [getattr(fake, column.provider)() for _ in rows]
