"""The corpus writer: layout, checksums, reproducibility, exact formats, atomicity, records."""

from __future__ import annotations

import hashlib
import itertools
import json
import textwrap
from pathlib import Path

import pytest
from hypothesis import given, settings, strategies as st

from pfuzz.corpus import formats as corpusfiles
from pfuzz.corpus.writer import CASE_COLUMNS, write_corpus
from pfuzz.base.jsonlines import jsonl_text, read_jsonl
from pfuzz.corpus.formats import csv_text, read_csv
from pfuzz.errors import CorpusExistsError
from pfuzz.errors import ProfileError
from pfuzz.profile.loader import load_profile

SMALL = """
[profile]
title = "Small"
seed = 11

[[field]]
name = "code"
pattern = '[A-C]{2}[0-9]{1,2}'
valid = 12
invalid = 10

[[field]]
name = "tag"
pattern = '#[a-f]{2,4}'
forbid = ['#(aa|bb).*']
valid = 8
invalid = 6

[record]
name = "item"
columns = ["code", "who", "tag"]
valid_rows = 5
invalid_rows = 7

[[record.context]]
column = "who"
provider = "name"
locale = "en_GB"
"""


def profile_file(tmp_path: Path, text: str = SMALL, name: str = "small.toml") -> Path:
    path = tmp_path / name
    path.write_text(textwrap.dedent(text), encoding="utf-8")
    return path


def tree_bytes(root: Path) -> dict[str, bytes]:
    return {str(p.relative_to(root)): p.read_bytes() for p in sorted(root.rglob("*"))
            if p.is_file()}


@pytest.fixture(scope="module")
def small_corpus(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("small")
    out = tmp / "out"
    summary = write_corpus(load_profile(profile_file(tmp)), out)
    return out, summary


# -- layout and manifest ---------------------------------------------------------

def test_layout(small_corpus):
    out, _ = small_corpus
    names = set(tree_bytes(out))
    for field in ("code", "tag"):
        assert {f"fields/{field}/{part}.jsonl" for part in ("valid", "rejects", "boundary")} <= names
    assert {"records/item/valid.csv", "records/item/invalid.csv", "cases.csv",
            "manifest.json", "SHA256SUMS"} <= names


def test_manifest_checksums_match_every_file(small_corpus):
    out, _ = small_corpus
    manifest = json.loads((out / "manifest.json").read_text(encoding="utf-8"))
    files = tree_bytes(out)
    assert set(manifest["files"]) == set(files) - {"manifest.json", "SHA256SUMS"}
    for name, info in manifest["files"].items():
        assert info["sha256"] == hashlib.sha256(files[name]).hexdigest()
        assert info["bytes"] == len(files[name])
    # SHA256SUMS is in the format of coreutils' sha256sum: "DIGEST  PATH" (common practice).
    sums = dict(reversed(line.split("  ", 1)) for line in files["SHA256SUMS"].decode().splitlines())
    assert set(sums) == set(files) - {"SHA256SUMS"}
    assert all(hashlib.sha256(files[n]).hexdigest() == d for n, d in sums.items())


def test_manifest_facts(small_corpus, tmp_path):
    out, _ = small_corpus
    manifest = json.loads((out / "manifest.json").read_text(encoding="utf-8"))
    assert manifest["seed"] == 11                       # the profile's seed
    assert set(manifest["versions"]) == {"pfuzz", "python", "numpy", "faker"}
    code = manifest["fields"]["code"]
    # [A-C]{2}[0-9]{1,2}: 9 * 10 strings of length 3, 9 * 100 of length 4 (counted by hand).
    assert code["counts_by_length"] == {"3": 90, "4": 900}
    assert code["finite"] and code["made"]["valid"] == 12
    raw = profile_file(tmp_path).read_bytes()
    assert manifest["profile"]["sha256"] == hashlib.sha256(raw).hexdigest()


def test_unbounded_field_reports_its_length_window(tmp_path):
    text = '[profile]\ntitle = "u"\n[[field]]\nname = "word"\npattern = "[ab]+"\nvalid = 5\n' \
           'invalid = 3\n'
    out = tmp_path / "out"
    write_corpus(profile_file(tmp_path, text), out, seed=1)
    word = json.loads((out / "manifest.json").read_text())["fields"]["word"]
    low, high = word["length_window"]
    assert not word["finite"] and low == 1 and "unbounded" in word["length_window_note"]
    assert word["counts_by_length"] == {str(n): 2**n for n in range(low, high + 1)}


# -- reproducibility ------------------------------------------------------------

def test_same_profile_and_seed_give_byte_identical_output(tmp_path, small_corpus):
    again = tmp_path / "again"
    write_corpus(load_profile(profile_file(tmp_path)), again)
    assert tree_bytes(again) == tree_bytes(small_corpus[0])


def test_another_seed_changes_the_strings(tmp_path, small_corpus):
    other = tmp_path / "other"
    write_corpus(load_profile(profile_file(tmp_path)), other, seed=12)
    first, second = tree_bytes(small_corpus[0]), tree_bytes(other)
    assert first["fields/code/valid.jsonl"] != second["fields/code/valid.jsonl"]
    # The boundary suite has no randomness at all.
    assert first["fields/code/boundary.jsonl"] == second["fields/code/boundary.jsonl"]


def test_counts_of_one_field_leave_the_other_fields_alone(tmp_path, small_corpus):
    changed = SMALL.replace("valid = 12", "valid = 30")
    out = tmp_path / "changed"
    write_corpus(load_profile(profile_file(tmp_path, changed)), out)
    assert tree_bytes(out)["fields/tag/valid.jsonl"] == \
        tree_bytes(small_corpus[0])["fields/tag/valid.jsonl"]


# -- contents ---------------------------------------------------------------------

def test_valid_strings_are_distinct_and_rejects_distinct(small_corpus):
    out, _ = small_corpus
    for field in ("code", "tag"):
        valid = [r["text"] for r in read_jsonl((out / f"fields/{field}/valid.jsonl").read_text())]
        rejects = [r["text"] for r in read_jsonl((out / f"fields/{field}/rejects.jsonl").read_text())]
        assert len(set(valid)) == len(valid) and len(set(rejects)) == len(rejects)
        assert not set(valid) & set(rejects)


def test_small_language_is_written_whole(tmp_path):
    text = '[profile]\ntitle = "s"\n[[field]]\nname = "bit"\npattern = "[01]{1,2}"\nvalid = 50\n' \
           'invalid = 4\n'
    out = tmp_path / "out"
    write_corpus(profile_file(tmp_path, text), out)
    rows = read_jsonl((out / "fields/bit/valid.jsonl").read_text())
    assert [r["text"] for r in rows] == ["0", "1", "00", "01", "10", "11"]
    manifest = json.loads((out / "manifest.json").read_text())
    assert manifest["fields"]["bit"]["made"]["valid_mode"] == "all"


def test_cases_table_lists_every_case_once(small_corpus):
    out, summary = small_corpus
    table = read_csv((out / "cases.csv").read_text(encoding="utf-8"))
    assert list(table[0]) == list(CASE_COLUMNS)
    assert len(table) == summary.cases and len({r["case_id"] for r in table}) == len(table)
    for field in ("code", "tag"):
        for part in ("valid", "rejects", "boundary"):
            rows = read_jsonl((out / f"fields/{field}/{part}.jsonl").read_text())
            listed = {r["case_id"]: r for r in table if r["file"] == f"fields/{field}/{part}.jsonl"}
            assert [r["id"] for r in rows] == list(listed)
            assert all(listed[r["id"]]["value"] == r["text"] for r in rows)
    assert {r["expected"] for r in table} == {"accept", "reject"}


def test_record_rows_have_exactly_one_near_miss_field_in_turn(small_corpus):
    out, _ = small_corpus
    profile_fields = ["code", "tag"]
    valid = read_csv((out / "records/item/valid.csv").read_text(encoding="utf-8"))
    invalid = read_csv((out / "records/item/invalid.csv").read_text(encoding="utf-8"))
    assert len(valid) == 5 and len(invalid) == 7
    assert list(valid[0]) == ["row_id", "code", "who", "tag"]
    assert [r["bad_field"] for r in invalid] == [profile_fields[i % 2] for i in range(7)]
    for row in invalid:
        assert f"'{row['bad_field']}'" in row["reason"] and row["witness"] and row["edits"]


def test_field_without_near_misses_is_skipped_in_the_turn(tmp_path):
    text = """
    [profile]
    title = "t"
    [[field]]
    name = "anything"
    pattern = '.*'
    valid = 3
    [[field]]
    name = "digit"
    pattern = '[0-9]'
    valid = 3
    [record]
    name = "pair"
    invalid_rows = 3
    valid_rows = 1
    """
    out = tmp_path / "out"
    write_corpus(profile_file(tmp_path, text), out)
    invalid = read_csv((out / "records/pair/invalid.csv").read_text())
    assert [r["bad_field"] for r in invalid] == ["digit"] * 3
    manifest = json.loads((out / "manifest.json").read_text())
    assert manifest["record"]["fields_without_near_misses"] == ["anything"]
    assert manifest["fields"]["anything"]["made"]["rejects"] == 0


def test_empty_field_language_is_a_profile_error(tmp_path):
    text = '[profile]\ntitle = "e"\n[[field]]\nname = "none"\npattern = "[0-9]{3}"\n' \
           'max_length = 2\n'
    with pytest.raises(ProfileError, match="field 'none'.*no string satisfies"):
        write_corpus(profile_file(tmp_path, text), tmp_path / "out")
    assert not (tmp_path / "out").exists()


def test_empty_field_language_error_names_the_alphabet(tmp_path):
    # 'é' is outside the default alphabet (printable ASCII), so the field is empty there
    text = '[profile]\ntitle = "e"\n[[field]]\nname = "accent"\npattern = "é"\n'
    with pytest.raises(ProfileError, match="no string satisfies.*alphabet 'printable'"):
        write_corpus(profile_file(tmp_path, text), tmp_path / "out")


# -- exact formats ------------------------------------------------------------------

HOSTILE = ',"\n\r\x00\t é\u2028'


def test_hostile_strings_round_trip_through_every_file(tmp_path):
    # Every string of length 0..2 over ten awkward characters: 1 + 10 + 100 = 111 strings.
    chars = "".join(sorted(HOSTILE))
    alphabet = "[" + "".join(f"\\u{ord(c):04x}" for c in chars) + "]"
    text = f"""
    [profile]
    title = "hostile"
    [[field]]
    name = "text"
    pattern = '.{{0,2}}'
    flags = ["DOTALL"]
    alphabet = '{alphabet}'
    valid = 200
    invalid = 0
    [record]
    name = "row"
    valid_rows = 40
    invalid_rows = 0
    """
    out = tmp_path / "out"
    write_corpus(profile_file(tmp_path, text), out)
    expected = {"".join(p) for n in range(3) for p in itertools.product(chars, repeat=n)}
    rows = read_jsonl((out / "fields/text/valid.jsonl").read_text(encoding="utf-8"))
    assert {r["text"] for r in rows} == expected and len(rows) == len(expected)
    with open(out / "cases.csv", encoding="utf-8", newline="") as handle:
        table = read_csv(handle.read())
    assert {r["value"] for r in table if r["category"] == "valid"} == expected
    record_rows = read_csv((out / "records/row/valid.csv").read_bytes().decode("utf-8"))
    assert {r["text"] for r in record_rows} <= expected
    # One JSON object per physical line, even for U+2028 and U+0085 (str.splitlines breaks on them).
    raw = (out / "fields/text/valid.jsonl").read_text(encoding="utf-8")
    assert len(raw.splitlines()) == len(expected)


@settings(max_examples=100, deadline=None, database=None)
@given(st.lists(st.lists(st.text(), min_size=3, max_size=3), max_size=4))
def test_csv_round_trip_of_any_text(rows):
    assert [list(r.values()) for r in read_csv(csv_text(["a", "b", "c"], rows))] == rows


@settings(max_examples=100, deadline=None, database=None)
@given(st.lists(st.dictionaries(st.text(max_size=8), st.text() | st.integers(), max_size=4),
                max_size=4))
def test_jsonl_round_trip_of_any_text(rows):
    assert read_jsonl(jsonl_text(rows)) == rows


# -- atomicity and --force ------------------------------------------------------------

def test_existing_directory_is_not_replaced_without_force(tmp_path, small_corpus):
    out = tmp_path / "out"
    out.mkdir()
    (out / "keep.txt").write_text("mine")
    with pytest.raises(CorpusExistsError, match="pass force=True"):
        write_corpus(profile_file(tmp_path), out)
    assert (out / "keep.txt").read_text() == "mine"


def test_force_replaces_an_earlier_corpus_only(tmp_path):
    out = tmp_path / "out"
    path = profile_file(tmp_path)
    write_corpus(path, out, seed=1)
    write_corpus(path, out, seed=2, force=True)
    assert json.loads((out / "manifest.json").read_text())["seed"] == 2
    stranger = tmp_path / "stranger"
    stranger.mkdir()
    (stranger / "notes.txt").write_text("not a corpus")
    with pytest.raises(CorpusExistsError, match="refusing to replace"):
        write_corpus(path, stranger, force=True)
    assert (stranger / "notes.txt").exists()
    (tmp_path / "afile").write_text("x")
    with pytest.raises(CorpusExistsError, match="not a directory"):
        write_corpus(path, tmp_path / "afile", force=True)


def test_force_never_replaces_the_current_directory(tmp_path, monkeypatch):
    out = tmp_path / "out"
    write_corpus(profile_file(tmp_path), out)
    monkeypatch.chdir(out)
    with pytest.raises(CorpusExistsError, match="current directory"):
        write_corpus(profile_file(tmp_path), ".", force=True)
    assert (out / "manifest.json").exists()


def _fail_after(monkeypatch, n: int):
    """Interrupt the run when the file after the first ``n`` is opened (cases.csv is
    open throughout, so the interruption lands while it is half-written)."""
    real = corpusfiles.atomic_writer
    calls = []

    def flaky(path, *args, **kwargs):
        calls.append(path)
        if len(calls) > n:
            raise KeyboardInterrupt("simulated interruption")
        return real(path, *args, **kwargs)

    monkeypatch.setattr(corpusfiles, "atomic_writer", flaky)


def test_interrupted_write_leaves_no_partial_directory(tmp_path, monkeypatch):
    _fail_after(monkeypatch, 3)
    with pytest.raises(KeyboardInterrupt):
        write_corpus(profile_file(tmp_path), tmp_path / "out")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["small.toml"]


def test_interrupted_forced_write_keeps_the_old_corpus(tmp_path, monkeypatch):
    out = tmp_path / "out"
    write_corpus(profile_file(tmp_path), out, seed=1)
    before = tree_bytes(out)
    _fail_after(monkeypatch, 5)
    with pytest.raises(KeyboardInterrupt):
        write_corpus(profile_file(tmp_path), out, seed=2, force=True)
    assert tree_bytes(out) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "small.toml"]


def test_progress_is_reported_once_per_step(tmp_path):
    from pfuzz.corpus.writer import step_count
    labels = []
    profile = load_profile(profile_file(tmp_path))
    write_corpus(profile, tmp_path / "out", progress=labels.append)
    assert len(labels) == step_count(profile) and labels[-1] == "written"


@pytest.fixture
def umask():
    """Set the process umask for one test and put the old one back afterwards."""
    import os
    previous = os.umask(0o022)
    os.umask(previous)
    yield os.umask
    os.umask(previous)


@pytest.mark.parametrize("mask", [0o002, 0o022, 0o077])
@pytest.mark.parametrize("replace", [False, True])
def test_corpus_folder_and_files_get_ordinary_permissions(tmp_path, umask, mask, replace):
    # POSIX open(2)/mkdir(2): a new file is 0666 and a new folder 0777, less the umask.
    # mkdtemp's private 0700 must not survive, and no fixed mode may override the user's umask.
    import os
    import stat

    out = tmp_path / "corpus"
    profile = load_profile(profile_file(tmp_path))
    if replace:
        write_corpus(profile, out, seed=1)
    umask(mask)
    write_corpus(profile, out, seed=1, force=replace)
    folders = [out] + [p for p in out.rglob("*") if p.is_dir()]
    files = [p for p in out.rglob("*") if p.is_file()]
    assert len(folders) > 1 and len(files) > 3
    modes = {str(p.relative_to(tmp_path)): stat.S_IMODE(p.stat().st_mode) for p in folders + files}
    assert modes == {str(p.relative_to(tmp_path)): 0o777 & ~mask for p in folders} | {
        str(p.relative_to(tmp_path)): 0o666 & ~mask for p in files}