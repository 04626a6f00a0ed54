"""The text and JSON reports of ``pfuzz audit``.

The text report opens with the evidence the answer rests on
(``pfuzz.audit.evidence``), then the exceptions the validator raised (by type),
the disagreements by direction and kind of case (``pfuzz.audit.findings``:
small groups listed, large ones summarised by the difference language they lie
in), the learned model or the exact comparison, the cases by category, and the
result. The JSON report holds everything, every finding included.
"""

from __future__ import annotations

from pfuzz.audit.evidence import describe_side
from pfuzz.audit.run import AuditReport

from .diff import comparison_dict, comparison_lines, pattern_label, quote, side_lines

__all__ = ["DEFAULT_SHOW", "EXACT_ROWS", "report_dict", "report_lines"]

#: Members of a disagreement group listed one by one in the text report (larger groups
#: are summarised; JSON lists them all).
DEFAULT_SHOW = 10
#: Lengths of a difference language's count table shown in the text report.
EXACT_ROWS = 6
#: Inputs shown per exception type.
RAISED_SHOWN = 5

DIRECTIONS = {"wrong accept": "Wrong accepts: invalid strings the validator let through",
              "wrong reject": "Wrong rejects: valid strings the validator refused"}


# -- JSON ---------------------------------------------------------------------------

def finding_dict(finding) -> dict:
    case, verdict = finding.case, finding.verdict
    return {"text": case.text, "expected": "accept" if case.expected else "reject",
            "verdict": "accept" if verdict.accepted else "reject",
            "error": verdict.error or None, "category": case.category,
            "kind": case.kind, "reason": case.reason, "witness": case.witness,
            "edits": [str(e) for e in case.edits], "sampled": case.sampled}


def report_dict(report: AuditReport) -> dict:
    """The JSON report (``--format json``)."""
    s = report.settings
    deterministic, sampled = report.case_counts()
    learning = s.learning
    return {
        "evidence": report.evidence.as_dict(),
        "agrees": report.agrees, "specification": report.spec, "validator": report.target,
        "alphabet": report.alphabet, "audit_alphabet": report.audit_alphabet.describe(limit=12),
        "audit_alphabet_ranges": [list(r) for r in report.audit_alphabet.ranges],
        "settings": {"seed": s.seed, "valid": s.valid, "rejects": s.rejects, "distance": s.distance,
                     "kinds": list(s.kinds), "reject_alphabet": s.reject_alphabet,
                     "boundary": s.boundary, "hostile": s.hostile, "case_flip": s.case_flip,
                     "min_length": s.min_length, "max_length": s.max_length,
                     "boundary_limit": s.boundary_limit,
                     "learning": {"enabled": learning.enabled, **learning.options()}
                     if learning.enabled else {"enabled": False}},
        "cases": {"total": len(report.cases), "deterministic": deterministic, "sampled": sampled},
        "summary": report.summary(),
        "exceptions": [g.as_dict() for g in report.raised.groups()],
        "groups": [g.as_dict() for g in report.groups()],
        "findings": [finding_dict(f) for f in report.findings],
        "exact": comparison_dict(report.exact) if report.exact is not None else None,
        "exact_note": report.exact_note or None,
        "learned": report.learned.as_dict() if report.learned is not None else None,
        "learning_note": report.learning_note or None,
        "notes": report.notes,
    }


# -- text ---------------------------------------------------------------------------

def report_lines(report: AuditReport, show: int = DEFAULT_SHOW) -> list[str]:
    """The text report, evidence first."""
    deterministic, sampled = report.case_counts()
    lines = [f"evidence: {report.evidence.sentence}", "",
             f"specification: {report.spec} (alphabet {report.alphabet})",
             f"validator:     {report.target}",
             f"cases:         {len(report.cases):,} ({deterministic:,} deterministic, "
             f"{sampled:,} sampled with seed {report.settings.seed})"]
    lines += [f"note: {note}" for note in report.notes]
    lines += _raised_lines(report)
    groups = report.groups()
    for direction, heading in DIRECTIONS.items():
        chosen = [g for g in groups if g.direction == direction]
        if chosen:
            lines += ["", heading]
            for group in chosen:
                lines += _group_lines(group, show)
    lines += _learned_lines(report)
    lines += _exact_lines(report)
    lines += ["", *_category_lines(report), "", _result(report)]
    return lines


def plural(n: int, noun: str) -> str:
    return f"{n:,} {noun}{'' if n == 1 else 's'}"


def _raised_lines(report: AuditReport) -> list[str]:
    groups = report.raised.groups()
    if not groups:
        return []
    lines = ["", "Exceptions the validator raised"]
    for g in groups:
        role = "a finding (not a way of saying reject)" if g.unexpected else "taken as a reject"
        lines.append(f"  {g.type}, {role}: {plural(g.count, 'input')}, "
                     f"{g.spec_rejects:,} of them invalid by the specification")
        if g.message:
            lines.append(f"    message on the shortest: {g.message}")
        lines.append(f"    shortest inputs: {', '.join(quote(t) for t in g.shortest[:RAISED_SHOWN])}")
    return lines


def _group_lines(group, show: int) -> list[str]:
    low, high = group.lengths
    lengths = f"length {low}" if low == high else f"lengths {low} to {high}"
    found = ", ".join(f"{kind} {n:,}" for kind, n in group.kinds.items())
    side = group.difference
    if side is not None:
        lines = [f"  the {group.difference_source}'s difference language: {pattern_label(side)}",
                 f"    {describe_side(side)} in all; found here: {plural(group.size, 'string')}, "
                 f"{lengths} (by {found})"]
    else:
        lines = [f"  found by {group.label}: {plural(group.size, 'string')}, {lengths}"]
    if group.size <= show:
        for finding in group.findings:
            lines += _one_finding(finding)
        return lines
    if group.own_pattern is not None:
        lines.append(f"    exactly the strings of the pattern {group.own_pattern}")
    lines.append(f"    shortest: {', '.join(quote(t) for t in group.shortest)}")
    lines.append("    every one of them is in --format json")
    return lines


def _one_finding(finding) -> list[str]:
    case, verdict = finding.case, finding.verdict
    raised = f"   (raised {verdict.error})" if verdict.error else ""
    detail = [case.reason] if case.category == "near-miss" or not case.kind else [case.kind, case.reason]
    if case.witness is not None:
        edits = "; ".join(str(e) for e in case.edits)
        detail.append(f"witness {quote(case.witness)}" + (f": {edits}" if edits else ""))
    return [f"    {quote(case.text)}{raised}", "      " + "; ".join(d for d in detail if d)]


def _learned_lines(report: AuditReport) -> list[str]:
    if report.learned is None:
        return ["", report.learning_note] if report.learning_note else []
    learned = report.learned
    model = learned.model
    equal = "yes" if model.equals_specification else "no"
    lines = ["", "Learned model of the validator",
             f"  states: {model.states:,}; equal to the specification: {equal}",
             f"  queries: {model.queries:,} in {plural(model.rounds, 'round')} (the time it took "
             "is on standard error)"
             + (f"; stopped by the {model.budget_exhausted} budget" if model.budget_exhausted else ""),
             f"  guarantee: {model.guarantee()}"]
    for title, side in (("wrongly accepted (the model accepts, the specification does not)",
                         learned.wrongly_accepted),
                        ("wrongly rejected (the specification accepts, the model does not)",
                         learned.wrongly_rejected)):
        lines += ["  " + line for line in side_lines(title, side, EXACT_ROWS)]
    return lines


def _exact_lines(report: AuditReport) -> list[str]:
    if report.exact is None:
        return ["", report.exact_note] if report.exact_note else []
    titles = ("wrong rejects (only the specification accepts)",
              "wrong accepts (only the validator accepts)")
    return ["", f"Exact comparison over the audit alphabet {report.audit_alphabet.describe(limit=4)}",
            *comparison_lines(report.exact, "the specification", "the validator", EXACT_ROWS, titles)]


def _category_lines(report: AuditReport) -> list[str]:
    """One line per category of case: how many, and how many went wrong."""
    lines = ["Cases by category"]
    for row in report.summary()[:-1]:
        wrong = [plural(row["wrong_accepts"], "wrong accept")] if row["wrong_accepts"] else []
        wrong += [plural(row["wrong_rejects"], "wrong reject")] if row["wrong_rejects"] else []
        wrong += [f"{row['raised']:,} raised"] if row["raised"] else []
        lines.append(f"  {row['category']}: {row['cases']:,}" + (f" ({', '.join(wrong)})" if wrong else ""))
    return lines


def _result(report: AuditReport) -> str:
    if not report.agrees:
        return "result: the validator disagrees with the specification (the findings are above)"
    basis = {"exact": "an exact comparison", "learned": "a learned model (see its guarantee)",
             "cases": "the cases tried, which is not a proof"}[report.evidence.basis]
    return f"result: the validator agrees with the specification, on {basis}"
