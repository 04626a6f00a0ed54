"""Tests for ``pfuzz count`` and ``pfuzz sample`` through click's CliRunner.

Strings written by the CLI are checked with Python's ``re.fullmatch`` (the
reference matcher); data formats are read back with the stdlib ``json`` and
``csv`` modules.
"""

from __future__ import annotations

import csv
import io
import json
import re

from click.testing import CliRunner

from pfuzz.cli import main


def run(*args: str):
    return CliRunner().invoke(main, list(args), catch_exceptions=False)


def test_count_text_table_and_total():
    result = run("count", "ab|[xy]{3}")
    assert result.exit_code == 0
    assert result.stdout.split("\n") == ["length  count", "     2  1", "     3  8",
                                         " total  9", ""]


def test_count_csv_and_json_read_back():
    result = run("count", "[0-9]{1,3}", "--format", "csv")
    rows = list(csv.reader(io.StringIO(result.stdout)))
    assert rows == [["length", "count"], ["1", "10"], ["2", "100"], ["3", "1000"], ["total", "1110"]]
    document = json.loads(run("count", "[0-9]{1,3}", "--min-length", "2", "--format", "json").stdout)
    assert document["counts"] == [{"length": 2, "count": 100}, {"length": 3, "count": 1000}]
    assert document["total"] == 1100 and document["language_total"] == 1110


def test_count_of_an_unbounded_language_reports_the_default_bound():
    result = run("count", "x[0-9]+", "--format", "json")
    document = json.loads(result.stdout)
    assert document["max_length_defaulted"] and document["language_total"] is None
    assert f"lengths up to {document['max_length']}" in result.stderr


def test_count_prints_numbers_beyond_the_int_string_limit():
    result = run("count", "[0-9]+", "--length", "5000")
    assert result.exit_code == 0
    shown = result.stdout.split("\n")[1].split()[1]
    assert shown == "100" + ",000" * 1666 and shown.replace(",", "") == "1" + "0" * 5000


def test_count_rejects_conflicting_options():
    result = run("count", "a+", "--length", "3", "--max-length", "4")
    assert result.exit_code == 2 and "not both" in result.stderr


def test_sample_text_is_one_accepted_string_per_line():
    result = run("sample", "[A-Z]{2}[0-9]{4}", "-n", "50", "--seed", "7")
    lines = result.stdout.splitlines()
    assert result.exit_code == 0 and len(lines) == 50
    assert all(re.fullmatch(r"[A-Z]{2}[0-9]{4}", s) for s in lines)  # reference: re.fullmatch
    assert run("sample", "[A-Z]{2}[0-9]{4}", "-n", "50", "--seed", "7").stdout == result.stdout
    assert result.stderr == ""


def test_sample_escapes_control_characters_in_text_and_keeps_them_in_jsonl():
    pattern = r"[\x00\n\\a]{3}"
    text = run("sample", pattern, "--alphabet", "ascii", "-n", "40", "--seed", "1")
    assert "escapes" in text.stderr and "\x00" not in text.stdout
    jsonl = run("sample", pattern, "--alphabet", "ascii", "-n", "40", "--seed", "1",
                "--format", "jsonl")
    strings = [json.loads(line) for line in jsonl.stdout.splitlines()]
    assert len(strings) == 40 and all(re.fullmatch(pattern, s) for s in strings)
    decoded = [s.encode("latin-1").decode("unicode_escape") for s in text.stdout.splitlines()]
    assert decoded == strings


def test_sample_options_reach_the_library(tmp_path):
    out = tmp_path / "codes.txt"
    result = run("sample", "--pattern-file", str(_pattern_file(tmp_path, "[a-c]{1,3}")),
                 "-n", "5", "--min-length", "2", "--max-length", "2", "--unique",
                 "--ignore-case", "--out", str(out))
    lines = out.read_text(encoding="utf-8").splitlines()
    assert result.exit_code == 0 and result.stdout == ""
    assert len(set(lines)) == 5 and all(re.fullmatch(r"(?i)[a-c]{2}", s) for s in lines)
    proportional = run("sample", "[0-9]{1,3}", "-n", "300", "--lengths", "proportional")
    assert sum(len(s) == 3 for s in proportional.stdout.split()) > 200


def _pattern_file(tmp_path, pattern: str):
    path = tmp_path / "pattern.txt"
    path.write_text(pattern + "\n", encoding="utf-8")
    return path


def test_sample_unique_shortfall_is_a_warning_on_stderr():
    result = run("sample", "ab?", "-n", "5", "--unique")
    assert result.exit_code == 0 and sorted(result.stdout.split()) == ["a", "ab"]
    assert "warning: only 2 distinct strings" in result.stderr


def test_sampling_an_empty_language_is_an_error():
    result = run("sample", "a{3}", "--max-length", "2")
    assert result.exit_code == 2 and result.stdout == ""
    assert result.stderr.startswith("pfuzz: error:")
    assert run("sample", "a(?=b)").exit_code == 2


def test_large_runs_show_progress_on_stderr_only():
    result = run("sample", "[a-z]{3}", "-n", "1000000", "--format", "jsonl")
    assert result.exit_code == 0 and "sampling" in result.stderr
    assert result.stdout.count("\n") == 1_000_000 and "sampling" not in result.stdout


def test_help_has_worked_examples():
    for command in ["count", "sample"]:
        help_text = run(command, "--help").stdout
        assert "Example:" in help_text and f"pfuzz {command} '" in help_text
