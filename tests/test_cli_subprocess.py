"""The installed console script run as a real subprocess: exit codes, streams, no tracebacks.

The script is the ``pfuzz`` next to the running interpreter (the venv's
console script, as ``pip install`` made it).
"""

from __future__ import annotations

import json
import shlex
import subprocess
import sys
from pathlib import Path

import pytest

SCRIPT = Path(sys.executable).parent / "pfuzz"
FIXTURES = Path(__file__).parent / "fixtures" / "validators"
TICKET = "[A-Z]{2}-[0-9]{4}"

pytestmark = pytest.mark.skipif(not SCRIPT.exists(), reason="the pfuzz console script is not installed")


def pfuzz(*args: str, cwd: Path = FIXTURES) -> subprocess.CompletedProcess:
    return subprocess.run([str(SCRIPT), *args], capture_output=True, text=True, cwd=cwd, timeout=120)


def test_version_and_help():
    assert pfuzz("--version").stdout.startswith("pfuzz, version ")
    helped = pfuzz("--help")
    assert helped.returncode == 0
    for command in ("audit", "diff", "draw"):
        assert command in helped.stdout
        assert "Example" in pfuzz(command, "--help").stdout


def test_audit_finds_the_bug_and_exits_1():
    done = pfuzz("audit", "--pattern", TICKET, "--target", "tickets:stripped", "--format", "json")
    assert done.returncode == 1, done.stderr
    report = json.loads(done.stdout)
    kinds = {f["kind"] for f in report["findings"]}
    assert {"leading-space", "trailing-space", "trailing-newline", "tab"} <= kinds


def test_audit_of_a_command_validator():
    command = shlex.join([sys.executable, "cmd_ticket.py"])
    done = pfuzz("audit", "--pattern", TICKET, "--cmd", command, "--valid", "50", "--rejects", "50")
    assert done.returncode == 0, done.stderr
    assert done.stdout.startswith("evidence: a learned model of the validator (8 states) equals")
    assert done.stdout.rstrip().endswith("agrees with the specification, on a learned model "
                                         "(see its guarantee)")


def test_crashing_command_exits_2_on_stderr_only():
    command = shlex.join([sys.executable, "cmd_faulty.py", "crash"])
    done = pfuzz("audit", "--pattern", TICKET, "--cmd", command, "--format", "json")
    assert done.returncode == 2 and done.stdout == ""
    assert "the command crashed: exit status 3" in done.stderr and "Traceback" not in done.stderr


def test_diff_exit_codes():
    assert pfuzz("diff", r"\d{2}", "[0-9]{2}").returncode == 0
    different = pfuzz("diff", "[a-c]", "[a-d]", "--format", "json")
    assert different.returncode == 1
    assert json.loads(different.stdout)["b_minus_a"]["pattern"] == "d"
    bad = pfuzz("diff", "(a", "a")
    assert bad.returncode == 2 and "^" in bad.stderr and "Traceback" not in bad.stderr


def test_draw_writes_dot(tmp_path):
    done = pfuzz("draw", TICKET, cwd=tmp_path)
    assert done.returncode == 0 and done.stdout.startswith("digraph dfa {")
