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
from pfuzz.audit.learned import LearningSettings
from pfuzz.learning import (DEFAULT_EXTRA_STATES, DEFAULT_INTERIOR_PROBES, DEFAULT_MAX_QUERIES,
                            DEFAULT_MAX_STATES)
from pfuzz.audit.targets import (DEFAULT_TIMEOUT, CommandTarget, PythonTarget, RegexTarget,
                                 parse_exception_names)
from .audit_report import DEFAULT_SHOW, report_dict, report_lines
from .exhaustive import exhaustive_options, run_exhaustive_audit, target_factory
from .common import (EXIT_DIFFERENT, EXIT_OK, compile_language, emit, fail, format_option,
                     language_options, max_length_option, min_length_option, note, out_option,
                     read_pattern_file, report_errors, seed_option)
from .common import FilePath


def learning_options(command):
    """The limits of learning a model of the validator, shared by ``audit`` and ``learn``."""
    options = [
        click.option("--learn-queries", type=click.IntRange(min=1), default=DEFAULT_MAX_QUERIES,
                     show_default=True, help="Most strings learning may ask the validator."),
        click.option("--learn-states", type=click.IntRange(min=1), default=DEFAULT_MAX_STATES,
                     show_default=True, help="Most states the learned model may grow to."),
        click.option("--learn-seconds", type=click.FloatRange(min=0, min_open=True), default=None,
                     help="Most seconds learning may take (default: no limit but the queries)."),
        click.option("--extra-states", type=click.IntRange(min=0), default=DEFAULT_EXTRA_STATES,
                     show_default=True, help="Test the learned model to this many states beyond its own."),
        click.option("--interior-probes", type=click.IntRange(min=0), default=DEFAULT_INTERIOR_PROBES,
                     show_default=True, help="Characters tried inside each symbol class besides its "
                                             "range ends."),
    ]
    for option in reversed(options):
        command = option(command)
    return command


@click.command("audit")
@click.argument("profile", required=False, type=FilePath(dir_okay=False, path_type=Path))
@click.option("--pattern", "-p", help="The specification as a pattern (instead of a PROFILE).")
@click.option("--pattern-file", type=FilePath(dir_okay=False, path_type=Path),
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
@click.option("--reject-on", metavar="TYPE,...",
              help="Exceptions that mean reject besides ValueError (builtin or dotted names); "
                   "any other exception a --target raises is a finding.")
@click.option("--timeout", type=click.FloatRange(min=0, min_open=True), default=DEFAULT_TIMEOUT,
              show_default=True, help="Seconds a validator (--target, --cmd or --regex) may take "
                                      "to answer one round of strings.")
@click.option("--no-learn", is_flag=True,
              help="Do not learn a model of a --target or --cmd validator.")
@learning_options
@seed_option
@click.option("--show", type=click.IntRange(min=0), default=DEFAULT_SHOW, show_default=True,
              help="Disagreements listed one by one per group; larger groups are summarised.")
@format_option(("text", "json", "junit", "sarif"), "text")
@out_option
@click.option("--html", "html_out", type=FilePath(dir_okay=False, path_type=Path), default=None,
              help="Also write the report as one self-contained HTML page to FILE.")
@exhaustive_options
@report_errors
def audit(profile, pattern, pattern_file, field, python_target, command, regex, mode, alphabet,
          flags, state_cap, min_length, max_length, valid, rejects, distance, reject_alphabet,
          no_boundary, boundary_limit, no_hostile, no_case_flip, reject_on, timeout, no_learn,
          learn_queries, learn_states, learn_seconds, extra_states, interior_probes, seed, show, fmt,
          out, html_out=None, exhaustive=False, max_cases=None, workers=None, scheduler=None,
          state_dir=None):
    """Find the strings a validator gets wrong, against a PROFILE field or a --pattern.

    PROFILE is a TOML file or the name of a shipped profile (pfuzz profiles lists them).

    Cases: the whole boundary suite, hostile near-misses (a trailing newline,
    tabs, CRs, spaces, other scripts' digits, full-width letters, no-break and
    zero-width spaces), case flips, near-miss rejects over a wider alphabet,
    and valid strings. A string with a character outside --alphabet is
    invalid. A --regex validator is also compared exactly; of a --target or
    --cmd validator a model is learned and compared exactly. The report opens
    with the evidence the answer rests on. Exit status: 0 the validator agrees,
    1 it disagrees or raised an exception that is not a reject, 2 bad input or
    a validator that exited, crashed, hung or answered short.

    \b
    Examples:
      pfuzz audit --pattern '[A-Z]{2}-[0-9]{4}' --target checks:is_ticket
      pfuzz audit --pattern '[0-9]{4}' --regex '\\d{4}$' --mode match
      pfuzz audit profiles/iso-date.toml --cmd 'node check-date.js'
    """
    spec, label, field_distance, kinds, field_limit = _specification(
        profile, pattern, pattern_file, field, alphabet, flags, state_cap)
    if exhaustive:
        _exhaustive(spec, label, python_target, command, regex, mode, timeout, reject_on,
                    distance or field_distance, reject_alphabet, min_length, max_length,
                    max_cases, workers, scheduler, state_dir, show, fmt, out)
    elif workers is not None or scheduler or state_dir:
        fail("--workers, --scheduler and --state apply to --exhaustive")
    settings = Settings(valid=valid, rejects=rejects, seed=seed,
                        distance=distance or field_distance, kinds=kinds,
                        reject_alphabet=reject_alphabet, boundary=not no_boundary,
                        hostile=not no_hostile, case_flip=not no_case_flip,
                        min_length=min_length, max_length=max_length,
                        boundary_limit=field_limit if boundary_limit is None else boundary_limit,
                        learning=LearningSettings(not no_learn, learn_queries, learn_states,
                                                  learn_seconds, extra_states, interior_probes))
    target = _target(python_target, command, regex, mode, timeout, reject_on)
    try:
        with target:
            report = _run_with_progress(spec, target, settings, label)
    except TargetError as error:
        fail(f"the validator {target.label} could not be audited: {error}", error.detail)
    if report.learned is not None:
        model = report.learned.model
        note(f"learning the model asked {model.queries:,} queries in {model.rounds:,} rounds "
             f"and took {model.seconds:.2f} s")
    if html_out is not None:
        from pfuzz.report.page import write_audit_page
        write_audit_page(html_out, spec, report_dict(report), profile=profile, field=field)
        note(f"wrote {html_out}")
    if fmt == "json":
        emit(json.dumps(report_dict(report), ensure_ascii=False, indent=2) + "\n", out)
    elif fmt in ("junit", "sarif"):
        from pfuzz.report.ci import junit_xml, sarif_json
        document = report_dict(report)
        emit(junit_xml(document) if fmt == "junit" else sarif_json(document), out)
    else:
        emit("\n".join(report_lines(report, show)) + "\n", out)
    sys.exit(EXIT_OK if report.agrees else EXIT_DIFFERENT)


def _exhaustive(spec, label, python_target, command, regex, mode, timeout, reject_on, distance,
                reject_alphabet, min_length, max_length, max_cases, workers, scheduler,
                state_dir, show, fmt, out):
    if fmt not in ("text", "json"):
        fail("--exhaustive writes text or json")
    _target(python_target, command, regex, mode, timeout, reject_on).close()  # fails early
    make = target_factory(python_target, command, regex, mode, timeout, reject_on)
    run_exhaustive_audit(spec, label, make, distance=distance, reject_alphabet=reject_alphabet,
                         min_length=min_length, max_length=max_length, max_cases=max_cases,
                         workers=workers, scheduler=scheduler, state_dir=state_dir, show=show,
                         fmt=fmt, out=out)


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


def _target(python_target, command, regex, mode, timeout, reject_on):
    given = [x for x in (python_target, command, regex) if x is not None]
    if len(given) != 1:
        fail("give the validator once: --target MODULE:FUNCTION, --cmd COMMAND or --regex R")
    if mode != "fullmatch" and regex is None:
        fail("--mode applies to --regex only")
    if reject_on is not None and python_target is None:
        fail("--reject-on applies to --target only")
    try:
        if python_target is not None:
            return PythonTarget(python_target, timeout=timeout,
                                reject_on=parse_exception_names(reject_on))
        if command is not None:
            return CommandTarget(command, timeout)
        return RegexTarget(regex, mode, timeout)
    except TargetError as error:
        fail(str(error), error.detail)


COMMANDS = [audit]
