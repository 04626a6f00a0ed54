"""Sharded corpora (``pfuzz corpus --shards K``): the union of the shards is one corpus.

References outside the code under test: Python's ``re`` decides membership
(``re.fullmatch`` of each field's pattern); ``hashlib.sha256`` recomputes every
checksum; brute force over ``itertools.product`` lists the strings of small fields;
a ``set`` checks distinctness and bijections; the chi-square critical value for 25
degrees of freedom at p = 10^-6 (about 71.6) is from the chi-square distribution's
published tables (scipy.stats.chi2.isf(1e-6, 25) gives the same).
"""

from __future__ import annotations

import hashlib
import itertools
import json
import re
import string
from pathlib import Path

import pytest
from click.testing import CliRunner

from pfuzz.base.jsonlines import read_jsonl
from pfuzz.cli import main
from pfuzz.corpus import shards as sharding
from pfuzz.base.permutation import KeyedPermutation
from pfuzz.corpus.shards import case_ranges, write_sharded_corpus

PATTERNS = {
    "hhmm": r"([01][0-9]|2[0-3]):[0-5][0-9]",     # 1,440 strings: exact permutations
    "code": r"[A-C]{2}[0-9]{1,2}",                # lengths 3 (90 strings) and 4 (900)
    "pair": r"[ab][0-9]",                         # 20 strings: fewer than asked, all written
    "word": r"[a-z]{6}",                          # 26^6 > 2^20: the keyed Feistel network
}
PROFILE = """
[profile]
title = "Shards"
seed = 3

[[field]]
name = "hhmm"
pattern = '([01][0-9]|2[0-3]):[0-5][0-9]'
valid = 300
invalid = 40

[[field]]
name = "code"
pattern = '[A-C]{2}[0-9]{1,2}'
valid = 500
invalid = 30

[[field]]
name = "pair"
pattern = '[ab][0-9]'
valid = 50
invalid = 25

[[field]]
name = "word"
pattern = '[a-z]{6}'
valid = 2600
invalid = 20
"""
PARTS = ("valid", "rejects")


@pytest.fixture(scope="module")
def profile(tmp_path_factory) -> Path:
    path = tmp_path_factory.mktemp("profile") / "shards.toml"
    path.write_text(PROFILE, encoding="utf-8")
    return path


@pytest.fixture(scope="module")
def corpora(profile, tmp_path_factory) -> dict[int, Path]:
    out = {}
    for k in (1, 2, 3, 7):
        out[k] = tmp_path_factory.mktemp(f"k{k}") / "corpus"
        write_sharded_corpus(profile, out[k], shards=k)
    return out


def joined(folder: Path, field: str, part: str) -> bytes:
    files = sorted((folder / "fields" / field).glob(f"{part}.shard-*.jsonl"))
    return b"".join(f.read_bytes() for f in files)


def rows(folder: Path, field: str, part: str) -> list[dict]:
    return read_jsonl(joined(folder, field, part).decode("utf-8"))


@pytest.mark.parametrize("k", [2, 3, 7])
def test_union_of_shards_is_the_one_shard_corpus_byte_for_byte(corpora, k):
    for field, part in itertools.product(PATTERNS, PARTS):
        assert len(list((corpora[k] / "fields" / field).glob(f"{part}.shard-*.jsonl"))) == k
        assert joined(corpora[k], field, part) == joined(corpora[1], field, part)
    for field in PATTERNS:
        boundary = Path("fields", field, "boundary.jsonl")
        assert (corpora[k] / boundary).read_bytes() == (corpora[1] / boundary).read_bytes()


def test_every_valid_string_matches_and_every_reject_does_not(corpora):
    """Python's re is the reference matcher."""
    for field, pattern in PATTERNS.items():
        valid = rows(corpora[3], field, "valid")
        assert valid and all(re.fullmatch(pattern, r["text"]) for r in valid)
        assert all(r["length"] == len(r["text"]) for r in valid)
        rejects = rows(corpora[3], field, "rejects")
        assert rejects
        for r in rejects:
            assert re.fullmatch(pattern, r["text"]) is None
            assert re.fullmatch(pattern, r["witness"])
            assert 1 <= r["distance"] == len(r["edits"])


def test_strings_are_distinct_and_ids_run_in_order(corpora):
    for field, part in itertools.product(PATTERNS, PARTS):
        found = rows(corpora[7], field, part)
        assert len({r["text"] for r in found}) == len(found)
        prefix = f"{field}:{'valid' if part == 'valid' else 'reject'}"
        assert [r["id"] for r in found] == [f"{prefix}:{i:04d}" for i in range(1, len(found) + 1)]


def test_counts_follow_the_even_length_plan(corpora):
    """code asks 500: half would be length 3, which has only 90 (brute force), so all 90 are
    taken and the other 410 are length 4; hhmm, pair and word have one length."""
    every_three = {"".join(t) for t in itertools.product("ABC", "ABC", string.digits)}
    assert all(re.fullmatch(PATTERNS["code"], s) for s in every_three) and len(every_three) == 90
    valid = [r["text"] for r in rows(corpora[2], "code", "valid")]
    assert len(valid) == 500
    assert {s for s in valid if len(s) == 3} == every_three
    assert [len(s) for s in valid] == [3] * 90 + [4] * 410   # grouped by length, shortest first


def test_a_small_field_is_written_whole_in_shortlex_order(corpora):
    """pair has 20 strings (brute force over printable pairs with re), fewer than asked."""
    printable = [chr(c) for c in range(32, 127)]
    every = sorted({a + b for a, b in itertools.product(printable, repeat=2)
                    if re.fullmatch(PATTERNS["pair"], a + b)})
    assert [r["text"] for r in rows(corpora[7], "pair", "valid")] == every
    manifest = json.loads((corpora[7] / "manifest.json").read_text(encoding="utf-8"))
    assert manifest["fields"]["pair"]["made"]["valid_mode"] == "all"
    assert manifest["fields"]["hhmm"]["made"]["valid_mode"] == "keyed"


def test_manifest_lists_ranges_counts_and_checksums(corpora):
    for k, folder in corpora.items():
        manifest = json.loads((folder / "manifest.json").read_text(encoding="utf-8"))
        assert manifest["sampling"] == "keyed" and manifest["shards"] == k
        for field, part in itertools.product(PATTERNS, PARTS):
            listed = manifest["fields"][field]["shards"][part]
            assert len(listed) == k
            position = 0
            for entry in listed:
                data = (folder / entry["file"]).read_bytes()
                assert entry["sha256"] == hashlib.sha256(data).hexdigest()
                assert entry["bytes"] == len(data)
                assert entry["cases"][0] == position
                position = entry["cases"][1]
                assert entry["count"] == position - entry["cases"][0] == data.count(b"\n")
                assert manifest["files"][entry["file"]]["sha256"] == entry["sha256"]
            assert position == manifest["fields"][field]["made"][part]
        sums = dict(line.split("  ", 1)[::-1] for line in
                    (folder / "SHA256SUMS").read_text(encoding="utf-8").splitlines())
        on_disk = [p for p in folder.rglob("*") if p.is_file() and p.name != "SHA256SUMS"]
        assert sorted(sums) == sorted(p.relative_to(folder).as_posix() for p in on_disk)
        for path in on_disk:
            assert sums[path.relative_to(folder).as_posix()] == \
                hashlib.sha256(path.read_bytes()).hexdigest()


def test_same_seed_same_bytes_and_another_seed_other_strings(profile, corpora, tmp_path):
    write_sharded_corpus(profile, tmp_path / "again", shards=3)
    write_sharded_corpus(profile, tmp_path / "other", seed=4, shards=3)
    for field, part in itertools.product(PATTERNS, PARTS):
        assert joined(tmp_path / "again", field, part) == joined(corpora[3], field, part)
    assert joined(tmp_path / "other", "hhmm", "valid") != joined(corpora[3], "hhmm", "valid")


def test_a_corpus_made_shard_by_shard_replaces_itself_with_force(profile, tmp_path):
    write_sharded_corpus(profile, tmp_path / "c", shards=2)
    first = joined(tmp_path / "c", "word", "valid")
    write_sharded_corpus(profile, tmp_path / "c", shards=5, force=True)
    assert joined(tmp_path / "c", "word", "valid") == first


@pytest.mark.parametrize("vector_bits", [KeyedPermutation.VECTOR_BITS, 0])
@pytest.mark.parametrize("size", [1, 2, 3, 17, 1000, 1441, 4096])
def test_keyed_permutation_is_a_bijection(size, vector_bits, monkeypatch):
    """Brute force: the image of [0, size) is [0, size), every key; both round functions
    (numpy arrays, and SHAKE-256 one value at a time when vectors are turned off)."""
    monkeypatch.setattr(KeyedPermutation, "VECTOR_BITS", vector_bits)
    for key in (b"a", b"another key"):
        permute = KeyedPermutation(size, key)
        assert sorted(permute.many(0, size)) == list(range(size))
        assert [permute(i) for i in range(size)] == list(permute.many(0, size))


def test_keyed_permutation_blocks_agree_with_single_values(monkeypatch):
    """A shard starting mid-block sees the same images as the whole run."""
    monkeypatch.setattr(KeyedPermutation, "BLOCK", 7)
    permute = KeyedPermutation(10**9, b"key")
    whole = list(permute.many(0, 40))
    assert list(permute.many(13, 29)) == whole[13:29] == [permute(i) for i in range(13, 29)]
    assert len(set(whole)) == 40 and all(0 <= v < 10**9 for v in whole)


def test_feistel_ranks_spread_evenly(corpora):
    """word goes through the Feistel network (26^6 > the exact-permutation limit): the first
    letters of its 2,600 strings pass a chi-square test of uniformity at p = 10^-6."""
    assert 26 ** 6 > sharding.EXACT_PERMUTATION_LIMIT
    firsts = [r["text"][0] for r in rows(corpora[1], "word", "valid")]
    expected = len(firsts) / 26
    chi2 = sum((firsts.count(c) - expected) ** 2 / expected for c in string.ascii_lowercase)
    assert chi2 < 71.6


def test_the_feistel_path_and_the_exact_path_each_give_the_same_union(profile, tmp_path,
                                                                      monkeypatch):
    """Forcing hhmm (1,440 strings) through the Feistel network keeps the shard property."""
    monkeypatch.setattr(sharding, "EXACT_PERMUTATION_LIMIT", 100)
    write_sharded_corpus(profile, tmp_path / "one", shards=1)
    write_sharded_corpus(profile, tmp_path / "many", shards=7)
    texts = [r["text"] for r in rows(tmp_path / "many", "hhmm", "valid")]
    assert joined(tmp_path / "many", "hhmm", "valid") == joined(tmp_path / "one", "hhmm", "valid")
    assert len(set(texts)) == 300 and all(re.fullmatch(PATTERNS["hhmm"], t) for t in texts)


def test_case_ranges_cover_without_overlap():
    for cases, k in [(0, 3), (5, 7), (100, 3), (10, 1)]:
        ranges = case_ranges(cases, k)
        assert len(ranges) == k and ranges[0][0] == 0 and ranges[-1][1] == cases
        assert all(a[1] == b[0] for a, b in zip(ranges, ranges[1:]))


def test_cli_shards_writes_the_same_union(profile, corpora, tmp_path):
    out = tmp_path / "cli"
    result = CliRunner().invoke(main, ["corpus", str(profile), "--out", str(out),
                                       "--shards", "3"], catch_exceptions=False)
    assert result.exit_code == 0, result.output
    assert "3 shards" in result.output
    for field, part in itertools.product(PATTERNS, PARTS):
        assert joined(out, field, part) == joined(corpora[1], field, part)


def test_quotas_drawn_in_small_batches_still_fill_every_length(monkeypatch):
    """Brute-force capacities: the quotas sum to n, never pass a length's count, and a
    length that is full hands its excess to the others."""
    monkeypatch.setattr(sharding, "_QUOTA_BATCH", 7)
    capacity = [3, 1000, 5, 1000]
    quotas = sharding._length_quotas(600, capacity, key=99)
    assert sum(quotas) == 600 and quotas[0] == 3 and quotas[2] == 5
    assert all(0 <= q <= c for q, c in zip(quotas, capacity))
    assert sharding._length_quotas(2008, capacity, key=1) == capacity


def test_shards_made_on_a_dask_cluster_give_the_same_union(profile, corpora, tmp_path):
    """The same shard functions run in worker processes (pfuzz[scale], part of the test install:
    a missing Dask fails here rather than skipping)."""
    import distributed  # noqa: F401
    from pfuzz.scale import RunSettings

    write_sharded_corpus(profile, tmp_path / "dask", shards=3, settings=RunSettings(workers=1))
    for field, part in itertools.product(PATTERNS, PARTS):
        assert joined(tmp_path / "dask", field, part) == joined(corpora[1], field, part)


def test_cli_refuses_html_with_shards_and_zero_shards(profile, tmp_path):
    runner = CliRunner()
    html = runner.invoke(main, ["corpus", str(profile), "--out", str(tmp_path / "a"),
                                "--shards", "2", "--html", str(tmp_path / "a.html")])
    assert html.exit_code == 2 and "--shards" in html.output
    assert not (tmp_path / "a").exists()
    zero = runner.invoke(main, ["corpus", str(profile), "--out", str(tmp_path / "b"),
                                "--shards", "0"])
    assert zero.exit_code == 2
    alone = runner.invoke(main, ["corpus", str(profile), "--out", str(tmp_path / "c"),
                                 "--workers", "2"])
    assert alone.exit_code == 2 and "--shards" in alone.output
