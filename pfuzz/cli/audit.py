"""``pfuzz audit``: run a validator over pfuzz's cases and report every disagreement."""

from __future__ import annotations

import json
import sys
from pathlib import Path

import click

from pfuzz.audit.run import (DEFAULT_BOUNDARY_LIMIT, DEFAULT_REJECT_ALPHABET, DEFAULT_REJECTS,
                     DEFAULT_VALID, EDIT_KINDS, AuditReport, Settings, run_audit, stages)
from pfuzz.errors import TargetError
from pfuzz.base.constants import CALL_MODES
from pfuzz.audit.targets import DEFAULT_TIMEOUT, CommandTarget, PythonTarget, RegexTarget
from .common import (EXIT_DIFFERENT, EXIT_OK, compile_language, emit, fail, format_option,
                     language_options, max_length_option, min_length_option, out_option,
                     read_pattern_file, report_errors, seed_option)
from .diff import comparison_dict, comparison_lines, quote

#: Failures listed per category in the text report (JSON lists them all).
DEFAULT_SHOW = 10
#: Lengths of the exact comparison's count tables shown in the text report.
EXACT_ROWS = 6


@click.command("audit")
@click.argument("profile", required=False, type=click.Path(dir_okay=False, path_type=Path))
@click.option("--pattern", "-p", help="The specification as a pattern (instead of a PROFILE).")
@click.option("--pattern-file", type=click.Path(dir_okay=False, path_type=Path),
              help="Read the specification pattern from FILE.")
@click.option("--field", help="The profile field to audit (needed when the profile has several).")
@click.option("--target", "python_target", metavar="MODULE:FUNCTION",
              help="A Python function, imported from the current directory, called with one string.")
@click.option("--cmd", "command", metavar="COMMAND",
              help="A command reading one JSON string per line, answering 1/0 per line.")
@click.option("--regex", metavar="R", help="A Python regex as the validator uses it (checked exactly).")
@click.option("--mode", type=click.Choice(CALL_MODES), default="fullmatch", show_default=True,
              help="How the code calls --regex: re.fullmatch, re.match or re.search.")
@language_options
@min_length_option
@max_length_option
@click.option("--valid", "valid", type=click.IntRange(min=0), default=DEFAULT_VALID,
              show_default=True, help="Valid strings sampled uniformly by length.")
@click.option("--rejects", type=click.IntRange(min=0), default=DEFAULT_REJECTS, show_default=True,
              help="Near-miss rejects (a quarter of them range-edge near-misses).")
@click.option("--distance", type=click.IntRange(1, 3), default=None,
              help="Edit distance of the near-miss rejects. Default: 1 (or the profile field's).")
@click.option("--reject-alphabet", default=DEFAULT_REJECT_ALPHABET, show_default=True,
              help="Extra characters rejects are drawn over (besides --alphabet and the hostile ones).")
@click.option("--no-boundary", is_flag=True, help="Leave out the boundary suite.")
@click.option("--boundary-limit", type=click.IntRange(min=0), default=None,
              help="Boundary cases kept (default: the profile field's boundary_limit, "
                   f"else {DEFAULT_BOUNDARY_LIMIT:,}).")
@click.option("--no-hostile", is_flag=True, help="Leave out the hostile near-misses.")
@click.option("--no-case-flip", is_flag=True, help="Leave out the case flips.")
@click.option("--timeout", type=click.FloatRange(min=0, min_open=True), default=DEFAULT_TIMEOUT,
              show_default=True, help="Seconds a --cmd validator may take for the whole run.")
@seed_option
@click.option("--show", type=click.IntRange(min=0), default=DEFAULT_SHOW, show_default=True,
              help="Failures listed per category in the text report.")
@format_option(("text", "json"), "text")
@out_option
@report_errors
def audit(profile, pattern, pattern_file, field, python_target, command, regex, mode, alphabet,
          flags, state_cap, min_length, max_length, valid, rejects, distance, reject_alphabet,
          no_boundary, boundary_limit, no_hostile, no_case_flip, timeout, seed, show, fmt, out):
    """Find the strings a validator gets wrong, against a PROFILE field or a --pattern.

    PROFILE is a TOML file or the name of a shipped profile (pfuzz profiles lists them).

    Cases: the whole boundary suite, hostile near-misses (a trailing newline,
    tabs, CRs, spaces, other scripts' digits, full-width letters, no-break and
    zero-width spaces), case flips, near-miss rejects over a wider alphabet,
    and valid strings. A string with a character outside --alphabet is
    invalid. A --regex validator is also compared exactly. Exit status: 0 the
    validator agrees on every case, 1 it does not, 2 bad input or a validator
    that crashed, hung or answered short.

    \b
    Examples:
      pfuzz audit --pattern '[A-Z]{2}-[0-9]{4}' --target checks:is_ticket
      pfuzz audit --pattern '[0-9]{4}' --regex '\\d{4}$' --mode match
      pfuzz audit profiles/iso-date.toml --cmd 'node check-date.js'
    """
    spec, label, field_distance, kinds, field_limit = _specification(
        profile, pattern, pattern_file, field, alphabet, flags, state_cap)
    settings = Settings(valid=valid, rejects=rejects, seed=seed,
                        distance=distance or field_distance, kinds=kinds,
                        reject_alphabet=reject_alphabet, boundary=not no_boundary,
                        hostile=not no_hostile, case_flip=not no_case_flip,
                        min_length=min_length, max_length=max_length,
                        boundary_limit=field_limit if boundary_limit is None else boundary_limit)
    target = _target(python_target, command, regex, mode, timeout)
    try:
        report = _run_with_progress(spec, target, settings, label)
    except TargetError as error:
        fail(f"the validator {target.label} could not be audited: {error}", error.detail)
    if fmt == "json":
        emit(json.dumps(report_dict(report), ensure_ascii=False, indent=2) + "\n", out)
    else:
        emit("\n".join(report_lines(report, show)) + "\n", out)
    sys.exit(EXIT_OK if report.agrees else EXIT_DIFFERENT)


def _run_with_progress(spec, target, settings, label) -> AuditReport:
    """The audit, with a progress bar of its stages on stderr when stderr is a terminal."""
    if not sys.stderr.isatty():
        return run_audit(spec, target, settings, spec_label=label)
    names = stages(settings, exact=isinstance(target, RegexTarget))
    with click.progressbar(length=len(names), label="auditing", file=sys.stderr,
                           item_show_func=lambda stage: stage) as bar:
        seen: list[str] = []

        def advance(stage: str) -> None:
            bar.update(1 if seen else 0, stage)
            seen.append(stage)

        report = run_audit(spec, target, settings, spec_label=label, progress=advance)
        bar.update(1)
    return report


def _specification(profile, pattern, pattern_file, field, alphabet, flags, state_cap):
    """(language, label, distance, edit kinds, boundary limit) from exactly one of PROFILE,
    --pattern, --pattern-file."""
    given = [x for x in (profile, pattern, pattern_file) if x is not None]
    if len(given) != 1:
        fail("give the specification once: a PROFILE, --pattern P or --pattern-file FILE")
    if profile is None:
        if field is not None:
            fail("--field applies to a PROFILE, not to --pattern")
        if pattern_file is not None:
            pattern = read_pattern_file(pattern_file)
        return (compile_language(pattern, alphabet, flags, state_cap), pattern, 1, EDIT_KINDS,
                DEFAULT_BOUNDARY_LIMIT)
    ctx = click.get_current_context()
    for name in ("alphabet", "ignore_case"):
        if ctx.get_parameter_source(name) is not click.core.ParameterSource.DEFAULT:
            fail(f"--{name.replace('_', '-')} applies to --pattern; a profile sets each field's own")
    from pfuzz.profile.loader import load_profile

    loaded = load_profile(profile, state_cap)
    chosen = _field(loaded, field, profile)
    return (chosen.language(), f"{profile} field {chosen.name}", chosen.distance, chosen.edits,
            chosen.boundary_limit)


def _field(loaded, name, path):
    names = [f.name for f in loaded.fields]
    if name is None:
        if len(names) != 1:
            fail(f"{path} has {len(names)} fields ({', '.join(names)}); choose one with --field")
        return loaded.fields[0]
    if name not in names:
        fail(f"{path} has no field {name!r}; its fields: {', '.join(names)}")
    return loaded.field(name)


def _target(python_target, command, regex, mode, timeout):
    given = [x for x in (python_target, command, regex) if x is not None]
    if len(given) != 1:
        fail("give the validator once: --target MODULE:FUNCTION, --cmd COMMAND or --regex R")
    if mode != "fullmatch" and regex is None:
        fail("--mode applies to --regex only")
    try:
        if python_target is not None:
            return PythonTarget(python_target)
        if command is not None:
            return CommandTarget(command, timeout)
        return RegexTarget(regex, mode)
    except TargetError as error:
        fail(str(error), error.detail)


# -- the report -----------------------------------------------------------------------

def finding_dict(finding) -> dict:
    case = finding.case
    return {"text": case.text, "expected": "accept" if case.expected else "reject",
            "verdict": "accept" if finding.verdict.accepted else "reject",
            "error": finding.verdict.error or None, "category": case.category,
            "kind": case.kind, "reason": case.reason, "witness": case.witness,
            "edits": [str(e) for e in case.edits]}


def report_dict(report: AuditReport) -> dict:
    """The JSON report (``--format json``)."""
    s = report.settings
    return {
        "agrees": report.agrees, "specification": report.spec, "validator": report.target,
        "alphabet": report.alphabet, "audit_alphabet": report.audit_alphabet.describe(limit=12),
        "audit_alphabet_ranges": [list(r) for r in report.audit_alphabet.ranges],
        "settings": {"seed": s.seed, "valid": s.valid, "rejects": s.rejects, "distance": s.distance,
                     "kinds": list(s.kinds), "reject_alphabet": s.reject_alphabet,
                     "boundary": s.boundary, "hostile": s.hostile, "case_flip": s.case_flip,
                     "min_length": s.min_length, "max_length": s.max_length,
                     "boundary_limit": s.boundary_limit},
        "summary": report.summary(),
        "findings": [finding_dict(f) for f in report.findings],
        "exact": comparison_dict(report.exact) if report.exact is not None else None,
        "exact_note": report.exact_note or None,
        "notes": report.notes,
    }


def report_lines(report: AuditReport, show: int = DEFAULT_SHOW) -> list[str]:
    """The text report: failures by category, the exact comparison, the summary table."""
    findings = report.findings
    total = report.summary()[-1]
    lines = [f"specification: {report.spec} (alphabet {report.alphabet})",
             f"validator:     {report.target}",
             f"cases:         {total['cases']:,} (seed {report.settings.seed})", ""]
    lines += [f"note: {note}" for note in report.notes]
    if findings:
        lines.append(f"FAILURES: {len(findings):,} ({plural(total['wrong_accepts'], 'wrong accept')}, "
                     f"{plural(total['wrong_rejects'], 'wrong reject')}), shortest first by category")
    lines += _finding_lines(findings, show)
    lines += _exact_lines(report)
    lines += ["", *_summary_lines(report.summary()), ""]
    lines.append("result: the validator agrees with the specification on every case"
                 if report.agrees else "result: the validator DISAGREES with the specification")
    return lines


def _finding_lines(findings, show: int) -> list[str]:
    lines: list[str] = []
    groups: dict[str, list] = {}
    for f in findings:
        groups.setdefault(f.case.group, []).append(f)
    for category, members in groups.items():
        lines += ["", f"{category}: {plural(len(members), 'failure')}"]
        for f in members[:show]:
            lines += _one_finding(f)
        if len(members) > show:
            lines.append(f"  ... and {len(members) - show:,} more (--show, or --format json)")
    return lines


def plural(n: int, noun: str) -> str:
    return f"{n:,} {noun}{'' if n == 1 else 's'}"


def _one_finding(finding) -> list[str]:
    case, verdict = finding.case, finding.verdict
    what = "wrong accept" if finding.wrong_accept else "wrong reject"
    raised = f"   (raised {verdict.error})" if verdict.error else ""
    detail = [case.reason] if case.category == "near-miss" or not case.kind else [case.kind, case.reason]
    if case.witness is not None:
        edits = "; ".join(str(e) for e in case.edits)
        detail.append(f"witness {quote(case.witness)}" + (f": {edits}" if edits else ""))
    return [f"  {what}: {quote(case.text)}{raised}",
            "      " + "; ".join(d for d in detail if d)]


def _exact_lines(report: AuditReport) -> list[str]:
    if report.exact is None:
        return ["", report.exact_note] if report.exact_note else []
    titles = ("wrong rejects (only the specification accepts)",
              "wrong accepts (only the validator accepts)")
    return ["", f"exact comparison over the audit alphabet {report.audit_alphabet.describe(limit=4)}",
            *comparison_lines(report.exact, "the specification", "the validator", EXACT_ROWS, titles)]


def _summary_lines(rows: list[dict]) -> list[str]:
    header = ("category", "cases", "wrong accepts", "wrong rejects", "raised")
    cells = [header] + [(r["category"], f"{r['cases']:,}", f"{r['wrong_accepts']:,}",
                         f"{r['wrong_rejects']:,}", f"{r['raised']:,}") for r in rows]
    widths = [max(len(row[i]) for row in cells) for i in range(len(header))]
    out = []
    for i, row in enumerate(cells):
        out.append("  ".join(row[0].ljust(widths[0]) if j == 0 else row[j].rjust(widths[j])
                             for j in range(len(header))).rstrip())
        if i == 0 or i == len(cells) - 2:
            out.append("  ".join("-" * w for w in widths))
    return out


COMMANDS = [audit]
