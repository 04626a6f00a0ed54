"""Tests for pfuzz.pytest: cases from a profile field, a pattern and a corpus folder.

References: Python's ``re.fullmatch`` decides each case's expected verdict; pytest's own
collection (run as a subprocess) shows the ids a user sees.
"""

from __future__ import annotations

import re
import subprocess
import sys
import textwrap

import pytest

import pfuzz.pytest
from pfuzz.corpus.writer import write_corpus
from pfuzz.errors import ArgumentError

DEMO = "profiles/demo.toml"
POSTCODE = r"LV[1-9][0-9]? [0-9][A-HJ-NPR-Z]{2}"


def params(decorator):
    names, values = decorator.mark.args
    return names, values


def test_profile_field_cases_carry_the_verdict_re_gives():
    names, values = params(pfuzz.pytest.cases(DEMO, field="postcode", valid=10, rejects=10))
    assert names == ["text", "expected"]
    for param in values:
        text, expected = param.values
        assert bool(re.fullmatch(POSTCODE, text)) == expected, param.id   # reference: re
    kinds = {p.id.split("-")[0] for p in values}
    assert kinds == {"valid", "reject", "boundary"}
    assert sum(p.id.startswith("valid-") for p in values) == 10


def test_one_argument_receives_the_whole_case_and_ids_are_readable():
    names, values = params(pfuzz.pytest.cases(r"[a-c]\t[0-9]", argnames="case", valid=3,
                                              rejects=3, boundary=False, alphabet="ascii"))
    assert names == "case"
    case = values[0].values[0]
    assert case.kind == "valid" and case.expected and re.fullmatch(r"[a-c]\t[0-9]", case.text)
    assert all("\t" not in p.id and p.id.isascii() for p in values)
    assert any("\\t" in p.id for p in values)
    rejects = [p.values[0] for p in values if p.values[0].kind == "reject"]
    assert all(r.witness is not None and re.fullmatch(r"[a-c]\t[0-9]", r.witness) for r in rejects)


def test_corpus_folder_cases(tmp_path):
    profile = tmp_path / "p.toml"
    profile.write_text(textwrap.dedent("""
        [profile]
        title = "t"
        [[field]]
        name = "code"
        pattern = '[A-C][0-2]'
        valid = 4
        invalid = 4
    """), encoding="utf-8")
    write_corpus(profile, tmp_path / "corpus", seed=1)
    names, values = params(pfuzz.pytest.cases(tmp_path / "corpus"))
    assert len(values) > 8
    for param in values:
        text, expected = param.values
        assert bool(re.fullmatch(r"[A-C][0-2]", text)) == expected
    with pytest.raises(ArgumentError, match="no field 'nope'"):
        pfuzz.pytest.cases(tmp_path / "corpus", field="nope")


def test_pytest_shows_the_case_ids(tmp_path):
    test_file = tmp_path / "test_postcode.py"
    test_file.write_text(textwrap.dedent(f"""
        import pfuzz.pytest

        @pfuzz.pytest.cases({DEMO!r}, field="postcode", valid=2, rejects=2, boundary=False)
        def test_postcode(text, expected):
            pass
    """), encoding="utf-8")
    done = subprocess.run([sys.executable, "-m", "pytest", "--collect-only", "-q", "-p",
                           "no:cacheprovider", str(test_file)], capture_output=True, text=True,
                          cwd=".")
    assert done.returncode == 0, done.stdout + done.stderr
    ids = [line for line in done.stdout.splitlines() if "::test_postcode[" in line]
    assert len(ids) == 4
    assert sum("[valid-LV" in line for line in ids) == 2
    assert all(re.search(r"\[(valid|reject)-.+\]$", line) for line in ids)
