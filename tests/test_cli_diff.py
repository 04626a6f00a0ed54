"""``pfuzz diff`` through click's test runner: exit codes, text and JSON reports."""

from __future__ import annotations

import itertools
import json
import re

from click.testing import CliRunner

from pfuzz.cli import main


def run(*args: str):
    return CliRunner().invoke(main, ["diff", *args])


def test_equal_patterns_exit_0():
    result = run(r"\d{3}", "[0-9]{3}")
    assert result.exit_code == 0, result.output
    assert "verdict: equal" in result.output


def test_different_patterns_exit_1_with_both_sides():
    result = run("(0[1-9]|1[0-2])/[0-9]{2}", "[01][0-9]/[0-9]{2}")
    assert result.exit_code == 1
    out = result.output
    assert 'shortest string in only one: "00/00" (only in B)' in out
    assert "only in A (A-B): none" in out
    assert "only in B (B-A): 800 strings" in out
    assert "pattern:  (?:00|1[3-9])/[0-9]{2}" in out


def test_json_report_matches_brute_force():
    result = run("--format", "json", "--alphabet", "[ab]", "--max-length", "5", "a[ab]*", "[ab]*b")
    assert result.exit_code == 1
    report = json.loads(result.output)
    assert report["equal"] is False and report["alphabet"] == "[ab]"
    # Reference: Python's re over every string of length <= 5.
    strings = ["".join(p) for n in range(6) for p in itertools.product("ab", repeat=n)]
    only_a = [s for s in strings if re.fullmatch("a[ab]*", s) and not re.fullmatch("[ab]*b", s)]
    counts = {str(n): sum(1 for s in only_a if len(s) == n) for n in range(6)}
    assert report["a_minus_b"]["counts"] == {k: v for k, v in counts.items() if v}
    assert report["a_minus_b"]["examples"] == sorted(only_a, key=lambda s: (len(s), s))[:5]
    assert report["a_minus_b"]["total"] is None and report["a_minus_b"]["finite"] is False
    written = report["a_minus_b"]["pattern"]
    assert [s for s in strings if re.fullmatch(written, s)] == only_a


def test_empty_string_and_plural_labels():
    result = run("[a-z]+", "[a-z]*")
    assert "only in B (B-A): 1 string\n" in result.output
    assert '(the empty pattern: only "")' in result.output


def test_bad_pattern_exits_2_with_a_caret():
    result = run("[a-z", "[a-z]")
    assert result.exit_code == 2
    assert "bad pattern at column" in result.output and "^" in result.output
    assert "Traceback" not in result.output


def test_unbounded_counts_say_where_they_stop():
    result = run("[a-z]+", "[a-z]{1,3}")
    assert "(counted up to length 20; use --max-length to see more)" in result.output


def test_ignore_case_and_out_file(tmp_path):
    target = tmp_path / "diff.json"
    result = run("--ignore-case", "--format", "json", "--out", str(target), "[a-f]{2}", "[A-Fa-f]{2}")
    assert result.exit_code == 0
    assert json.loads(target.read_text())["equal"] is True


def test_patterns_from_files(tmp_path):
    spec = tmp_path / "spec.txt"
    spec.write_text("[a-c]{2}\n")
    implementation = tmp_path / "implementation.txt"
    implementation.write_text("[a-d]{2}\n")
    result = run("[a-c]{2}", "--pattern-file", str(implementation))
    assert result.exit_code == 1 and "B: [a-d]{2}\n" in result.output
    both = run("--pattern-file", str(spec), "--pattern-file", str(spec))
    assert both.exit_code == 0
    assert run("[a-c]").exit_code == 2
    missing = run("[a-c]", "--pattern-file", str(tmp_path / "nope.txt"))
    assert missing.exit_code == 2 and "cannot read pattern file" in missing.output
