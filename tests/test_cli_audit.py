"""``pfuzz audit`` through click's test runner: reports, exit codes, errors."""

from __future__ import annotations

import json
import os
import shlex
import signal
import subprocess
import sys
import time
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


def test_correct_validator_exits_0_with_its_evidence_first():
    result = run("--pattern", TICKET, "--target", "tickets:correct")
    assert result.exit_code == 0, result.output
    lines = result.stdout.splitlines()
    assert lines[0].startswith("evidence: a learned model of the validator (8 states) equals the "
                               "specification, tested to 1 extra state")
    assert "guarantee: exact, provided the validator treats every character of each class alike" \
        in result.stdout
    assert lines[-1] == ("result: the validator agrees with the specification, on a learned model "
                         "(see its guarantee)")
    assert "every case" not in result.stdout and "FAILURES" not in result.stdout
    assert "learning the model asked" in result.stderr
    cases_only = run("--pattern", TICKET, "--target", "tickets:correct", "--no-learn")
    assert cases_only.exit_code == 0
    assert cases_only.stdout.startswith("evidence: agreement on ")
    assert "sampled cases (not a proof" in cases_only.stdout.splitlines()[0]
    assert cases_only.stdout.rstrip().endswith("on the cases tried, which is not a proof")


def test_faulty_validator_exits_1_with_findings_grouped_by_cause():
    result = run("--pattern", TICKET, "--target", "tickets:dollar_newline", "--no-learn")
    assert result.exit_code == 1
    out = result.stdout
    assert "Wrong accepts: invalid strings the validator let through" in out
    assert "found by hostile: " in out and '    "AA-0009\\n"' in out
    assert "witness \"AA-0009\": insert '\\n' at 7" in out
    assert out.rstrip().endswith("result: the validator disagrees with the specification "
                                 "(the findings are above)")
    assert "hostile: 106 (7 wrong accepts)" in out.split("Cases by category")[1]
    assert "FAILURES" not in out and " more (--show" not in out and "-----" not in out


def test_json_report():
    result = run("--pattern", "[a-z0-9_]{3,16}", "--target", "accounts:user_name_too_long",
                 "--format", "json")
    assert result.exit_code == 1
    report = json.loads(result.stdout)
    assert report["agrees"] is False and report["validator"] == "accounts:user_name_too_long"
    finding = report["findings"][0]
    assert finding["category"] == "length-edge" and len(finding["text"]) == 17
    assert finding["expected"] == "reject" and finding["verdict"] == "accept"
    assert report["summary"][-1]["category"] == "total"
    assert report["settings"]["valid"] == 100 and report["settings"]["seed"] == 0


def test_same_seed_same_report_learned_model_included():
    first = run("--pattern", TICKET, "--target", "tickets:missing_anchor", "--format", "json")
    again = run("--pattern", TICKET, "--target", "tickets:missing_anchor", "--format", "json")
    assert first.stdout == again.stdout


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
    assert result.output.startswith("evidence: the exact difference over the audit alphabet")
    assert "Exact comparison over the audit alphabet" in result.output
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
    assert result.exit_code == 1 and json.loads(result.stdout)["summary"][-1]["raised"] > 0
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


# -- hostile validators ---------------------------------------------------------------

def test_an_exception_is_listed_with_its_type_and_inputs_and_exits_1():
    result = run("--pattern", TICKET, "--target", "planted:ticket_index_error")
    assert result.exit_code == 1, result.output
    out = result.stdout
    assert "Exceptions the validator raised" in out
    assert "IndexError, a finding (not a way of saying reject): " in out
    assert 'shortest inputs: "", ' in out and "message on the shortest: string index out of range" in out
    assert "raised an exception that is not a reject on" in out.splitlines()[0]


def test_reject_on_option():
    plain = run("--pattern", TICKET, "--target", "hostile:by_framework_error", "--no-learn")
    assert plain.exit_code == 1 and "hostile.TicketRejected, a finding" in plain.stdout
    named = run("--pattern", TICKET, "--target", "hostile:by_framework_error", "--no-learn",
                "--reject-on", "KeyError,hostile.TicketRejected")
    assert named.exit_code == 0, named.output
    assert "hostile.TicketRejected, taken as a reject" in named.stdout
    assert run("--pattern", TICKET, "--target", "hostile:by_value_error").exit_code == 0
    for args, message in [(["--target", "tickets:correct", "--reject-on", "NoSuchError"],
                           "--reject-on 'NoSuchError' is not an exception class"),
                          (["--regex", TICKET, "--reject-on", "KeyError"],
                           "--reject-on applies to --target only")]:
        result = run("--pattern", TICKET, *args)
        assert result.exit_code == 2 and message in result.output


@pytest.mark.parametrize("target, message", [
    ("hostile:exits", "could not be audited: it called sys.exit(0) on \""),
    ("hostile:exits_one", "called sys.exit(1) on"),
    ("exits_at_import:check", "importing 'exits_at_import' called sys.exit(0)"),
])
def test_a_validator_that_exits_is_exit_2_with_a_clear_message(target, message):
    result = run("--pattern", TICKET, "--target", target)
    assert result.exit_code == 2
    assert message in result.output and "Traceback" not in result.output


@pytest.mark.parametrize("target", ["hostile:prints", "hostile:closes_stdout", "prints_at_import:check"])
def test_a_printing_validator_leaves_the_json_report_clean(target):
    result = run("--pattern", TICKET, "--target", target, "--format", "json")
    report = json.loads(result.stdout)
    assert report["validator"] == target and report["evidence"]["basis"] == "learned"
    assert "checking" not in result.stdout and "raw" not in result.stdout


def test_json_report_holds_evidence_groups_exceptions_and_the_model():
    result = run("--pattern", TICKET, "--target", "tickets:dollar_newline", "--format", "json",
                 "--learn-queries", "50000", "--extra-states", "1")
    report = json.loads(result.stdout)
    assert report["evidence"]["basis"] == "learned"
    assert report["settings"]["learning"]["max_queries"] == 50000
    assert report["learned"]["equals_specification"] is False
    assert report["learned"]["wrongly_accepted"]["pattern"] == TICKET + r"\n"
    assert "seconds" not in report["learned"]
    (group,) = report["groups"]
    assert group["direction"] == "wrong accept" and group["difference_pattern"] == TICKET + r"\n"
    assert group["size"] == len(report["findings"])
    assert report["cases"]["deterministic"] + report["cases"]["sampled"] == report["cases"]["total"]


def test_a_learning_budget_that_runs_out_is_said():
    result = run("--pattern", TICKET, "--target", "tickets:correct", "--learn-queries", "50")
    assert "queries budget" in result.stdout or "query budget" in result.stdout


def test_commands_that_hang_with_a_descendant_or_flood_end_with_exit_2():
    started = time.monotonic()
    result = run("--pattern", TICKET, "--cmd", "sh -c 'setsid sleep 40 & cat >/dev/null; sleep 1000'",
                 "--timeout", "3")
    assert result.exit_code == 2 and "did not finish within 3 s" in result.output
    assert time.monotonic() - started < 20
    flood = run("--pattern", TICKET, "--cmd", "yes 1")
    assert flood.exit_code == 2 and "too many answers" in flood.output


SCRIPT = Path(sys.executable).parent / "pfuzz"


@pytest.mark.skipif(not SCRIPT.exists(), reason="the pfuzz console script is not installed")
def test_ctrl_c_during_an_audit_ends_the_validator(tmp_path):
    pid_file = tmp_path / "pid"
    command = f"sh -c 'echo $$ > {pid_file}; exec sleep 1000'"
    process = subprocess.Popen([str(SCRIPT), "audit", "--pattern", TICKET, "--cmd", command],
                               stdout=subprocess.PIPE, stderr=subprocess.PIPE, cwd=tmp_path)
    deadline = time.monotonic() + 30
    while not (pid_file.exists() and pid_file.read_text().strip()) and time.monotonic() < deadline:
        time.sleep(0.05)
    validator = int(pid_file.read_text())
    process.send_signal(signal.SIGINT)
    process.communicate(timeout=30)
    assert process.returncode != 0
    assert not _alive(validator)


def _alive(pid: int) -> bool:
    """Running and not a zombie (reference: the kernel's /proc/PID/stat, else kill(pid, 0))."""
    try:
        state = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()[0]
        return state != "Z"
    except FileNotFoundError:
        return False
    except OSError:
        try:
            os.kill(pid, 0)
        except OSError:
            return False
        return True
