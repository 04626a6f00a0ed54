"""``pfuzz reject`` and ``pfuzz explain`` through click's test runner."""

from __future__ import annotations

import json
import re

from click.testing import CliRunner

from pfuzz.cli import main
from pfuzz.nearmiss.edits import Edit, apply_edits

PLATE = r"[A-Z]{2}[0-9]{4}"


def run(*args):
    return CliRunner().invoke(main, list(args))  # click 8.2+: stdout and stderr apart


def test_reject_text_writes_one_reject_per_line():
    result = run("reject", PLATE, "-n", "25", "--seed", "3")
    assert result.exit_code == 0 and result.stderr == ""
    lines = result.stdout.splitlines()
    assert len(lines) == 25
    assert all(re.fullmatch(PLATE, line) is None for line in lines)  # reference: Python's re


def test_reject_jsonl_carries_kinds_witness_and_edits():
    result = run("reject", PLATE, "-n", "12", "--kind", "swap", "--kind", "delete",
                 "--format", "jsonl")
    assert result.exit_code == 0
    rows = [json.loads(line) for line in result.stdout.splitlines()]
    assert [r["kinds"][0] for r in rows[:2]] == ["delete", "swap"]
    for row in rows:
        edits = [Edit(**e) for e in row["edits"]]
        assert apply_edits(row["witness"], edits) == row["text"]
        assert re.fullmatch(PLATE, row["witness"]) and row["distance"] == len(edits)


def test_reject_is_reproducible_and_honours_options(tmp_path):
    args = ("reject", "[0-9]{3}", "-n", "20", "--distance", "2", "--seed", "5",
            "--min-length", "4", "--max-length", "4", "--format", "jsonl")
    first = run(*args)
    assert first.stdout == run(*args).stdout
    assert {len(json.loads(line)["text"]) for line in first.stdout.splitlines()} == {4}
    out = tmp_path / "rejects.txt"
    written = run(*args, "--out", str(out))
    assert written.stdout == "" and out.read_text() == first.stdout


def test_reject_escapes_control_characters_and_says_so():
    result = run("reject", "a", "--alphabet", "ascii", "-n", "40", "--kind", "replace")
    assert result.exit_code == 0
    assert "escape" in result.stderr
    assert all(len(line) == 1 or line.startswith("\\") for line in result.stdout.splitlines())


def test_reject_edges_writes_off_by_one_characters():
    result = run("reject", "[1-5]", "-n", "10", "--kind", "replace", "--edges")
    assert set(result.stdout.split()) == {"0", "6"}


def test_reject_errors_exit_two():
    assert run("reject", ".*", "-n", "3").exit_code == 2
    assert run("reject", "(", "-n", "3").exit_code == 2
    assert run("reject", "a", "--kind", "flip").exit_code == 2


def test_explain_rejected_marks_the_position():
    result = run("explain", PLATE, "AB12O4")
    assert result.exit_code == 1
    lines = result.stdout.splitlines()
    assert lines[1] == "text      AB12O4"
    assert lines[2] == "              ^"
    assert "nearest   AB1204" in lines
    assert lines[-1].strip() == "replace '0' with 'O' at 4"


def test_explain_accepted_exits_zero():
    result = run("explain", PLATE, "AB1234")
    assert result.exit_code == 0 and result.stdout == "accepted  AB1234\n"


def test_explain_json():
    result = run("explain", PLATE, "AB1234X", "--format", "json")
    assert result.exit_code == 1
    document = json.loads(result.stdout)
    assert document["witness"] == "AB1234" and document["edits"] == [
        {"kind": "insert", "position": 6, "old": "", "new": "X"}]


def test_explain_with_a_pattern_file(tmp_path):
    rule = tmp_path / "rule.txt"
    rule.write_text(PLATE + "\n")
    result = run("explain", "--pattern-file", str(rule), "AB1234")
    assert result.exit_code == 0
    assert run("explain", "--pattern-file", str(rule)).exit_code == 2


def test_explain_caret_under_escaped_characters():
    result = run("explain", "a\tb", "--alphabet", "ascii", "a\tc")
    lines = result.stdout.splitlines()
    assert lines[1] == "text      a\\tc" and lines[2] == "             ^"


def test_explain_empty_language_is_an_error():
    result = run("explain", "[^\\s\\S]", "x")
    assert result.exit_code == 2 and "empty" in result.stderr


def test_help_has_examples():
    for command in ("reject", "explain"):
        assert "Example:" in run(command, "--help").stdout


def test_reject_says_when_the_length_bound_was_defaulted():
    assert "unbounded: lengths up to 34" in run("reject", "[a-z]+@x", "-n", "3").stderr
    assert run("reject", PLATE, "-n", "3").stderr == ""
    assert run("reject", "[a-z]+@x", "-n", "3", "--max-length", "5").stderr == ""
    assert run("reject", PLATE, "--min-length", "5", "--max-length", "4").exit_code == 2
