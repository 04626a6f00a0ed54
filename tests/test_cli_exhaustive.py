"""``pfuzz audit --exhaustive`` from the command line.

Reference for the planted bug (a validator regex that also allows hour 24): the affected
strings are "24:00".."24:59", formatted with str.format; 24 * 60 = 1,440 valid times of day
(ISO 8601 hh:mm). Python's ``re`` judges the JSON report's strings independently.
"""

import json
import re

from click.testing import CliRunner

from pfuzz.cli import main

SPEC = r"([01][0-9]|2[0-3]):[0-5][0-9]"
BUGGY = r"([01][0-9]|2[0-4]):[0-5][0-9]"


def audit(*args):
    return CliRunner().invoke(main, ["audit", "--pattern", SPEC, *args])


def test_exhaustive_finds_exactly_the_planted_strings(tmp_path):
    result = audit("--regex", BUGGY, "--exhaustive", "--workers", "0", "--format", "json",
                   "--state", str(tmp_path / "state"))
    assert result.exit_code == 1, result.output
    report = json.loads(result.stdout)
    assert report["cases"]["valid"] == 24 * 60
    assert report["wrong_accepts"]["strings"] == [f"24:{m:02d}" for m in range(60)]
    assert all(re.fullmatch(BUGGY, s) and not re.fullmatch(SPEC, s)
               for s in report["wrong_accepts"]["strings"])
    assert re.fullmatch(report["wrong_accepts"]["pattern"], "24:37")
    assert report["evidence"].startswith("exhaustive over lengths 5..5")
    again = audit("--regex", BUGGY, "--exhaustive", "--workers", "0", "--format", "json",
                  "--state", str(tmp_path / "state"))  # every shard is already recorded
    assert json.loads(again.stdout)["wrong_accepts"] == report["wrong_accepts"]


def test_a_correct_validator_exits_zero_and_says_what_was_tried():
    result = audit("--regex", SPEC, "--exhaustive", "--workers", "0")
    assert result.exit_code == 0, result.output
    assert result.stdout.startswith("evidence: exhaustive over lengths 5..5: every one of 1,440")
    assert "result: no disagreement in the" in result.stdout


def test_too_many_cases_is_refused_before_starting():
    result = audit("--regex", SPEC, "--exhaustive", "--max-cases", "1000")
    assert result.exit_code == 2 and "above max_cases" in result.output


def test_cluster_options_need_exhaustive():
    result = audit("--regex", SPEC, "--workers", "2")
    assert result.exit_code == 2 and "apply to --exhaustive" in result.output
