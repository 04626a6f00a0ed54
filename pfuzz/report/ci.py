"""The audit report in the formats CI systems read: JUnit XML and SARIF 2.1.0.

Both writers take the audit's JSON report dictionary (``report_dict`` of
``pfuzz.cli.audit_report``, what ``pfuzz audit --format json`` prints) and return text.

JUnit XML: the de facto schema of JUnit's Ant task, which CI servers read: one
``<testsuite>`` for the audit, one ``<testcase>`` per cause group of disagreements
(direction and kind of case, as the text report groups them) carrying a ``<failure>``
whose message names the shortest member and whose body lists the members with their
witness and edits; one ``<testcase>`` with an ``<error>`` per exception type that is a
finding; and one passing ``<testcase>`` per category of case that went right. XML 1.0
cannot hold most control characters at all, so every string is written with the
project's escaper (``\\x00``, ``\\u200b``); the exact strings stay in the JSON report.

SARIF 2.1.0 (OASIS standard, "Static Analysis Results Interchange Format"): one run
whose tool is pfuzz, with three rules (``wrong-accept``, ``wrong-reject``,
``validator-raised``) and one result per cause group or exception type. A result's
location is a *logical* location, since a validator's bug has no file position here:
``PROFILE:FIELD`` (kind ``member``) for a profile field, or the pattern (kind
``value``). The strings themselves go in the result's ``properties``, exactly (JSON
holds any character). Validated in the tests against the standard's JSON schema.

Cost: linear in the size of the report.
"""

from __future__ import annotations

import json
import re
from xml.sax.saxutils import quoteattr, escape

from pfuzz import __version__
from pfuzz.base.escaping import escape_text, quoted

__all__ = ["junit_xml", "sarif_json", "cause_groups", "location"]

SARIF_SCHEMA = ("https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/"
                "sarif-schema-2.1.0.json")
RULES = {
    "wrong accept": ("wrong-accept", "The validator accepts a string the specification rejects."),
    "wrong reject": ("wrong-reject", "The validator rejects a string the specification accepts."),
    "raised": ("validator-raised", "The validator raised an exception that is not a way of "
                                   "saying reject."),
}
#: Members listed per group in a JUnit failure body and a SARIF result's properties.
LISTED = 50
_FIELD_LABEL = re.compile(r"^(?P<profile>.+) field (?P<field>[a-z][a-z0-9_]*)$")


def cause_groups(report: dict) -> list[dict]:
    """The report's cause groups, each with its findings (dicts of the JSON report).

    A finding goes to the group that lists it among its shortest, else to the group of
    its direction and kind of case, else to its direction's difference-language group.
    A report without ``groups`` is grouped here by direction and kind of case."""
    findings = report.get("findings") or []
    groups = report.get("groups")
    if not groups:
        keys = list(dict.fromkeys((_direction(f), _label(f)) for f in findings))
        groups = [{"direction": d, "kind": k} for d, k in keys]
    members: list[list[dict]] = [[] for _ in groups]
    listed = {t: i for i, g in enumerate(groups) for t in g.get("shortest") or []}
    for f in findings:
        i = listed.get(f["text"])
        if i is None:
            same = [j for j, g in enumerate(groups) if g["direction"] == _direction(f)]
            i = next((j for j in same if groups[j].get("kind") == _label(f)),
                     next((j for j in same if not groups[j].get("kind")), same[0] if same else 0))
        members[i].append(f)
    return [{**g, "size": g.get("size", len(m)), "members": m,
             "shortest": g.get("shortest") or [f["text"] for f in m[:5]]}
            for g, m in zip(groups, members)]


def _direction(finding: dict) -> str:
    return "wrong accept" if finding["verdict"] == "accept" else "wrong reject"


def _label(finding: dict) -> str:
    """The kind of case a finding was found by, as the audit names its groups."""
    category = finding.get("category") or ""
    return f"near-miss ({finding['kind']})" if category == "near-miss" else category


def location(report: dict, profile: str | None = None, field: str | None = None) -> dict:
    """The SARIF logical location of the specification: PROFILE:FIELD, or the pattern."""
    label = report.get("specification") or ""
    if profile is None:
        match = _FIELD_LABEL.match(label)
        if match:
            profile, field = match["profile"], match["field"]
    if profile is not None:
        name = f"{profile}:{field}" if field else str(profile)
        return {"name": field or str(profile), "fullyQualifiedName": name, "kind": "member"}
    return {"name": label, "fullyQualifiedName": label, "kind": "value"}


def _title(group: dict) -> str:
    kind = group.get("kind") or (f"the {group['difference_source']}'s difference language"
                                 if group.get("difference_source") else "cases")
    return f"{group['direction']}: {kind}"


def _member_line(f: dict) -> str:
    line = f"{quoted(f['text'])}: expected {f['expected']}, the validator said {f['verdict']}"
    if f.get("witness") is not None:
        line += f"; witness {quoted(f['witness'])}"
        if f.get("edits"):
            line += f" ({'; '.join(f['edits'])})"
    if f.get("reason"):
        line += f"; {f['reason']}"
    return line


def _summary(group: dict) -> str:
    size = group.get("size", len(group["members"]))
    shortest = group.get("shortest") or [m["text"] for m in group["members"]]
    first = next((m for m in group["members"] if m["text"] == shortest[0]), None) if shortest else None
    text = f"{size:,} string{'' if size == 1 else 's'}"
    if shortest:
        text += f", the shortest {quoted(shortest[0])}"
    if first is not None and first.get("witness") is not None:
        text += f" (witness {quoted(first['witness'])}"
        text += f": {'; '.join(first['edits'])})" if first.get("edits") else ")"
    if group.get("difference_pattern"):
        text += f"; all of them: {escape_text(group['difference_pattern'])}"
    return text


# -- JUnit XML -------------------------------------------------------------------------

def junit_xml(report: dict) -> str:
    """The audit as JUnit XML (see the module docstring)."""
    groups = cause_groups(report)
    raised = [e for e in report.get("exceptions") or [] if e.get("finding")]
    passing = [row for row in report.get("summary") or []
               if row.get("category") != "total" and not (row.get("wrong_accepts")
                                                          or row.get("wrong_rejects"))]
    suite = escape_text(report.get("specification") or "specification")
    classname = "pfuzz.audit." + re.sub(r"[^A-Za-z0-9_.:-]+", "_", suite)
    cases = [_failure_case(classname, g) for g in groups]
    cases += [_error_case(classname, e) for e in raised]
    cases += [_passing_case(classname, row) for row in passing]
    tests = len(cases)
    head = (f'  <testsuite name={quoteattr(suite)} tests="{tests}" failures="{len(groups)}" '
            f'errors="{len(raised)}" skipped="0">')
    props = ["    <properties>",
             *(f"      <property name={quoteattr(k)} value={quoteattr(escape_text(str(v)))}/>"
               for k, v in _properties(report).items()),
             "    </properties>"]
    evidence = (report.get("evidence") or {}).get("sentence")
    out = ['<?xml version="1.0" encoding="UTF-8"?>',
           f'<testsuites name="pfuzz audit" tests="{tests}" failures="{len(groups)}" '
           f'errors="{len(raised)}">', head, *props, *cases]
    if evidence:
        out.append(f"    <system-out>{escape(escape_text(evidence))}</system-out>")
    out += ["  </testsuite>", "</testsuites>"]
    return "\n".join(out) + "\n"


def _properties(report: dict) -> dict:
    settings = report.get("settings") or {}
    return {"validator": report.get("validator", ""), "alphabet": report.get("alphabet", ""),
            "seed": settings.get("seed", ""), "agrees": report.get("agrees", ""),
            "pfuzz": __version__}


def _failure_case(classname: str, group: dict) -> str:
    body = "\n".join(_member_line(m) for m in group["members"][:LISTED])
    message = _summary(group)
    return (f"    <testcase classname={quoteattr(classname)} name={quoteattr(_title(group))}>\n"
            f"      <failure message={quoteattr(message)} type={quoteattr(group['direction'])}>"
            f"{escape(body)}</failure>\n    </testcase>")


def _passing_case(classname: str, row: dict) -> str:
    name = f"agrees: {row['category']} ({row['cases']:,} cases)"
    return f"    <testcase classname={quoteattr(classname)} name={quoteattr(name)}/>"


def _error_case(classname: str, raised: dict) -> str:
    shortest = ", ".join(quoted(t) for t in raised.get("shortest") or [])
    message = (f"{raised['type']} on {raised['inputs']:,} input"
               f"{'' if raised['inputs'] == 1 else 's'}; shortest: {shortest}")
    body = escape_text(raised.get("message") or "")
    return (f"    <testcase classname={quoteattr(classname)} "
            f"name={quoteattr('raised: ' + raised['type'])}>\n"
            f"      <error message={quoteattr(message)} type={quoteattr(raised['type'])}>"
            f"{escape(body)}</error>\n    </testcase>")


# -- SARIF 2.1.0 -----------------------------------------------------------------------

def sarif_json(report: dict, profile: str | None = None, field: str | None = None) -> str:
    """The audit as a SARIF 2.1.0 log (see the module docstring)."""
    where = location(report, profile, field)
    results = [_group_result(g, where) for g in cause_groups(report)]
    results += [_raised_result(e, where) for e in report.get("exceptions") or []
                if e.get("finding")]
    rules = [{"id": rule, "name": rule.replace("-", " "), "shortDescription": {"text": text},
              "defaultConfiguration": {"level": "error"}} for rule, text in RULES.values()]
    run = {
        "tool": {"driver": {"name": "pfuzz", "version": __version__, "rules": rules}},
        "invocations": [{"executionSuccessful": True,
                         "properties": {"validator": report.get("validator"),
                                        "specification": report.get("specification"),
                                        "agrees": report.get("agrees"),
                                        "evidence": report.get("evidence")}}],
        "results": results,
    }
    log = {"$schema": SARIF_SCHEMA, "version": "2.1.0", "runs": [run]}
    return json.dumps(log, ensure_ascii=False, indent=2) + "\n"


def _rule_index(key: str) -> int:
    return list(RULES).index(key)


def _group_result(group: dict, where: dict) -> dict:
    key = group["direction"]
    return {
        "ruleId": RULES[key][0], "ruleIndex": _rule_index(key), "level": "error",
        "message": {"text": f"{_title(group)}: {_summary(group)}"},
        "locations": [{"logicalLocations": [where]}],
        "properties": {"size": group.get("size", len(group["members"])),
                       "kind": group.get("kind"),
                       "differencePattern": group.get("difference_pattern"),
                       "members": [{"text": m["text"], "expected": m["expected"],
                                    "verdict": m["verdict"], "witness": m.get("witness"),
                                    "edits": m.get("edits") or []}
                                   for m in group["members"][:LISTED]]},
    }


def _raised_result(raised: dict, where: dict) -> dict:
    return {
        "ruleId": RULES["raised"][0], "ruleIndex": _rule_index("raised"), "level": "error",
        "message": {"text": f"the validator raised {raised['type']} on {raised['inputs']:,} "
                            f"input{'' if raised['inputs'] == 1 else 's'}"},
        "locations": [{"logicalLocations": [where]}],
        "properties": {"type": raised["type"], "shortest": list(raised.get("shortest") or []),
                       "message": raised.get("message")},
    }
