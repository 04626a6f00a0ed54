"""``pfuzz audit`` through click's test runner: reports, exit codes, errors."""

from __future__ import annotations

import json
import shlex
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner

from pfuzz.cli import main

FIXTURES = Path(__file__).parent / "fixtures" / "validators"
TICKET = "[A-Z]{2}-[0-9]{4}"
QUICK = ["--valid", "100", "--rejects", "100"]

PROFILE = """
[profile]
title = "Saltmarsh Ferries booking desk (an invented scenario)"

[[field]]
name = "ticket"
pattern = '[A-Z]{2}-[0-9]{4}'

[[field]]
name = "seat"
pattern = '0|[1-9][0-9]{0,3}'
"""


@pytest.fixture(autouse=True)
def in_fixtures(monkeypatch):
    monkeypatch.chdir(FIXTURES)


def run(*args: str):
    return CliRunner().invoke(main, ["audit", *QUICK, *args])


def test_correct_validator_exits_0():
    result = run("--pattern", TICKET, "--target", "tickets:correct")
    assert result.exit_code == 0, result.output
    assert "result: the validator agrees with the specification on every case" in result.output
    assert "FAILURES" not in result.output


def test_faulty_validator_exits_1_with_findings_and_a_summary():
    result = run("--pattern", TICKET, "--target", "tickets:dollar_newline")
    assert result.exit_code == 1
    out = result.output
    assert "hostile: " in out and 'wrong accept: "AA-0000\\n"' in out
    assert "witness \"AA-0000\": insert '\\n' at 7" in out
    assert "category" in out and "wrong accepts" in out and out.rstrip().endswith(
        "result: the validator DISAGREES with the specification")
    assert out.index("hostile: ") < out.index("\ntotal ")  # findings first, the summary at the end


def test_json_report():
    result = run("--pattern", "[a-z0-9_]{3,16}", "--target", "accounts:user_name_too_long",
                 "--format", "json")
    assert result.exit_code == 1
    report = json.loads(result.output)
    assert report["agrees"] is False and report["validator"] == "accounts:user_name_too_long"
    finding = report["findings"][0]
    assert finding["category"] == "length-edge" and len(finding["text"]) == 17
    assert finding["expected"] == "reject" and finding["verdict"] == "accept"
    assert report["summary"][-1]["category"] == "total"
    assert report["settings"]["valid"] == 100 and report["settings"]["seed"] == 0


def test_same_seed_same_report():
    first = run("--pattern", TICKET, "--target", "tickets:missing_anchor", "--format", "json")
    again = run("--pattern", TICKET, "--target", "tickets:missing_anchor", "--format", "json")
    assert first.output == again.output


def test_command_validator_and_its_failures():
    good = shlex.join([sys.executable, "cmd_ticket.py"])
    assert run("--pattern", TICKET, "--cmd", good).exit_code == 0
    hang = shlex.join([sys.executable, "cmd_faulty.py", "hang"])
    result = run("--pattern", TICKET, "--cmd", hang, "--timeout", "1")
    assert result.exit_code == 2
    assert "did not finish within 1 s" in result.output and "Traceback" not in result.output


def test_regex_validator_is_compared_exactly():
    result = run("--pattern", TICKET, "--regex", TICKET + "$", "--mode", "match")
    assert result.exit_code == 1
    assert "exact comparison over the audit alphabet" in result.output
    assert "wrong accepts (only the validator accepts): 6,760,000 strings" in result.output
    assert r"pattern:  [A-Z]{2}-[0-9]{4}\n" in result.output


def test_profile_fields(tmp_path):
    profile = tmp_path / "desk.toml"
    profile.write_text(PROFILE)
    result = run(str(profile), "--target", "tickets:correct")
    assert result.exit_code == 2 and "choose one with --field" in result.output
    result = run(str(profile), "--field", "ticket", "--target", "tickets:correct")
    assert result.exit_code == 0, result.output
    assert f"specification: {profile} field ticket" in result.output
    result = run(str(profile), "--field", "seat", "--target", "seats:by_int", "--format", "json")
    assert result.exit_code == 1 and json.loads(result.output)["summary"][-1]["raised"] > 0
    result = run(str(profile), "--field", "nope", "--target", "tickets:correct")
    assert result.exit_code == 2 and "has no field 'nope'" in result.output
    result = run(str(profile), "--field", "ticket", "--alphabet", "ascii", "--target", "tickets:correct")
    assert result.exit_code == 2 and "--alphabet applies to --pattern" in result.output


@pytest.mark.parametrize("args, message", [
    (["--target", "tickets:correct"], "give the specification once"),
    (["--pattern", TICKET], "give the validator once"),
    (["--pattern", TICKET, "--target", "tickets:correct", "--regex", "x"], "give the validator once"),
    (["--pattern", TICKET, "--target", "tickets:correct", "--mode", "match"], "--mode applies to --regex"),
    (["--pattern", "[A-Z", "--target", "tickets:correct"], "bad pattern at column"),
    (["--pattern", TICKET, "--target", "nosuchmodule:f"], "cannot import 'nosuchmodule'"),
    (["--pattern", TICKET, "--regex", "("], "not a Python regular expression"),
    (["--pattern", r"[^\s\S]", "--target", "tickets:correct"], "accepts no string"),
])
def test_bad_input_exits_2(args, message):
    result = run(*args)
    assert result.exit_code == 2, result.output
    assert message in result.output and "Traceback" not in result.output


def test_report_to_a_file(tmp_path):
    target = tmp_path / "audit.json"
    result = run("--pattern", TICKET, "--target", "tickets:correct", "--format", "json",
                 "--out", str(target))
    assert result.exit_code == 0
    assert json.loads(target.read_text())["agrees"] is True


def test_specification_from_a_pattern_file(tmp_path):
    spec = tmp_path / "ticket.txt"
    spec.write_text(TICKET + "\n")
    result = run("--pattern-file", str(spec), "--target", "tickets:correct")
    assert result.exit_code == 0 and f"specification: {TICKET} " in result.output
