"""``pfuzz audit`` against validators with planted bugs (tests/fixtures/validators/planted.py).

Each planted validator is a plain Python function with one realistic bug of a
booking form (Saltmarsh Ferries, an invented scenario). References, never the
code under test: Python's ``re.fullmatch`` on the specification pattern says
what is valid; the planted function itself, called directly, says what the
validator does; hand-written rules say what each bug is. Every finding the audit
reports must be a true disagreement by those references, every planted bug must
be found by the deterministic part of the audit alone (no sampled cases: no
seed can miss it), and the report must say what its answer rests on.
"""

from __future__ import annotations

import itertools
import json
import re
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner

from pfuzz.cli import main

FIXTURES = Path(__file__).parent.parent / "fixtures" / "validators"
sys.path.insert(0, str(FIXTURES))
import planted  # noqa: E402  (the fixture modules, called directly as the reference)
import tickets  # noqa: E402

sys.path.remove(str(FIXTURES))

@pytest.fixture(autouse=True)
def in_fixtures(monkeypatch):
    """The validators are imported from the current directory, as the command line does."""
    monkeypatch.chdir(FIXTURES)


#: Deterministic part only: the boundary suite, hostile variants and case flips of
#: deterministic witnesses, and the learned model.
DETERMINISTIC = ["--valid", "0", "--rejects", "0"]

#: (specification, planted function, hand-written rule: is this string a symptom of the bug?)
BUGS = [
    ("[A-F](0[1-9]|[1-9][0-9])", "planted:berth_allows_zero", lambda t: re.fullmatch("[A-F]00", t)),
    ("[A-Z]{3}-[0-9]{3}", "planted:plate_one_digit_too_many",
     lambda t: re.fullmatch("[A-Z]{3}-[0-9]{4}", t)),
    ("(?i)[a-z]{3,12}", "planted:vessel_missing_case_flag",
     lambda t: re.fullmatch("(?i)[a-z]{3,12}", t) and t != t.lower()),
    ("[A-Z]{2}-[0-9]{4}", "tickets:dollar_newline", lambda t: re.fullmatch(r"[A-Z]{2}-[0-9]{4}\n", t)),
    ("[A-Z]{2}-[0-9]{4}", "tickets:unicode_digits",
     lambda t: re.fullmatch(r"[A-Z]{2}-\d{4}", t) and not t.isascii()),
]
MODULES = {"planted": planted, "tickets": tickets}


def audit(spec: str, function: str, *extra: str):
    target = function if ":" in function else f"planted:{function}"
    result = CliRunner().invoke(main, ["audit", "--pattern", spec, "--target", target,
                                       "--format", "json", *extra])
    return result, (json.loads(result.stdout) if result.exit_code in (0, 1) else None)


def printable(n: int):
    """Every string over a small printable sample of length n (brute force)."""
    return map("".join, itertools.product("aZ0-9\n", repeat=n))


@pytest.mark.parametrize("spec, function, symptom", BUGS)
def test_each_planted_bug_is_found_without_sampling(spec, function, symptom):
    result, report = audit(spec, function, *DETERMINISTIC)
    assert result.exit_code == 1, result.output
    module, _, name = function.partition(":")
    validator = getattr(MODULES[module], name)
    assert report["findings"]
    for finding in report["findings"]:
        text = finding["text"]
        valid = re.fullmatch(spec, text) is not None and all(" " <= c <= "~" for c in text)
        assert (finding["expected"] == "accept") == valid                  # reference: re
        assert (finding["verdict"] == "accept") == bool(validator(text))   # the validator itself
        assert symptom(text), text                                         # hand-written rule
    assert report["evidence"]["basis"] == "learned"
    assert "differs from the specification" in report["evidence"]["sentence"]


@pytest.mark.parametrize("spec, function, symptom", BUGS)
def test_the_learned_difference_pattern_is_the_bug(spec, function, symptom):
    # Default settings: the sampled valid strings are among the model's tests (with none, the
    # missing case flag's model never sees an all-lower-case string the validator accepts).
    _, report = audit(spec, function)
    learned = report["learned"]
    for side in ("wrongly_accepted", "wrongly_rejected"):
        pattern = learned[side]["pattern"]
        for text in learned[side]["examples"]:
            assert symptom(text), text
        if pattern is None or learned[side]["empty"]:
            continue
        compiled = re.compile(pattern)
        for n in range(7):  # brute force over a small sample alphabet, judged by re and the rule
            for text in printable(n):
                assert bool(compiled.fullmatch(text)) == bool(symptom(text)), (pattern, text)


def test_an_index_error_on_short_inputs_is_a_finding_with_its_type_and_inputs():
    result, report = audit("[A-Z]{2}-[0-9]{4}", "ticket_index_error")
    assert result.exit_code == 1
    (raised,) = report["exceptions"]
    assert raised["type"] == "IndexError" and raised["finding"] is True
    assert raised["inputs"] == raised["specification_rejects"] > 0
    for text in raised["shortest"]:
        assert len(text) < 3  # hand-written: text[2] is read first
        with pytest.raises(IndexError):
            planted.ticket_index_error(text)
    text_report = CliRunner().invoke(main, ["audit", "--pattern", "[A-Z]{2}-[0-9]{4}",
                                            "--target", "planted:ticket_index_error"]).stdout
    assert "IndexError, a finding" in text_report and 'shortest inputs: "", ' in text_report


def test_a_validator_that_raises_value_error_for_rejects_agrees():
    result, report = audit("0[1-9]|[1-9][0-9]", "berth_refuses_by_raising")
    assert result.exit_code == 0, result.output
    assert report["exceptions"][0]["type"] == "ValueError" and report["exceptions"][0]["finding"] is False
    assert report["learned"]["equals_specification"] is True


def test_the_missing_case_flag_is_one_group_with_a_pattern_and_a_count():
    result, report = audit("(?i)[a-z]{3,12}", "vessel_missing_case_flag")
    assert result.exit_code == 1
    (group,) = report["groups"]
    valid_found = group["found_by"]["valid"]
    # Of 1,000 samples uniform by length over 3..12, about 2.5% are all lower case (the sum of
    # 2^-n over n = 3..12, over ten lengths) and pass; the rest are refused.
    sampled = [f for f in report["findings"] if f["category"] == "valid"]
    assert valid_found == len(sampled) >= 950
    assert all(f["text"] != f["text"].lower() for f in sampled)  # hand-written: an upper-case letter
    assert group["size"] == len(report["findings"]) and group["difference_pattern"]
    text = CliRunner().invoke(main, ["audit", "--pattern", "(?i)[a-z]{3,12}",
                                     "--target", "planted:vessel_missing_case_flag"]).stdout
    wrong = text.split("Wrong rejects: valid strings the validator refused")[1].split("\n\n")[0]
    lines = wrong.strip().splitlines()
    assert lines[0].startswith("the learned model's difference language: (?:")
    assert f"valid {valid_found:,}" in lines[1] and "strings in all" in lines[1]
    assert len(lines) == 4  # summarised, not listed: pattern, count, shortest, where the rest is
    assert vessel_rule_holds(group["difference_pattern"])


def vessel_rule_holds(pattern: str) -> bool:
    """The group's pattern is exactly 'valid in any case, yet not all lower case' (re, brute force)."""
    compiled = re.compile(pattern)
    return all(bool(compiled.fullmatch(t)) == bool(re.fullmatch("(?i)[a-z]{3,12}", t) and t != t.lower())
               for n in range(6) for t in map("".join, itertools.product("aZq1", repeat=n)))
