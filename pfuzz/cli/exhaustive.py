"""``pfuzz audit --exhaustive``: every valid string and near miss of a window, in shards.

A thin skin over ``pfuzz.audit.exhaustive``: it counts the cases first (and refuses
above ``--max-cases``), shows a progress bar with strings per second and the time
left, and ends with the same evidence line, difference summary and exit status as
a sampled audit.
"""

from __future__ import annotations

import functools
import os
import sys
import time

import click

from pfuzz.audit.exhaustive import DEFAULT_MAX_CASES, plan_exhaustive, run_exhaustive
from pfuzz.audit.run import audit_alphabet
from pfuzz.audit.targets import CommandTarget, PythonTarget, RegexTarget, parse_exception_names
from pfuzz.base.jsonlines import json_text
from pfuzz.scale import RunSettings

from .common import EXIT_DIFFERENT, EXIT_OK, emit, note

__all__ = ["exhaustive_options", "run_exhaustive_audit"]


def exhaustive_options(command):
    """The options of the exhaustive mode, added to ``pfuzz audit``."""
    options = [
        click.option("--exhaustive", is_flag=True,
                     help="Try every valid string of the length window and every near miss "
                          "at --distance, in shards (instead of samples)."),
        click.option("--max-cases", type=click.IntRange(min=1), default=DEFAULT_MAX_CASES,
                     show_default=True, help="With --exhaustive: refuse a run of more cases."),
        click.option("--workers", type=click.IntRange(min=0), default=None,
                     help="With --exhaustive: worker processes of a local Dask cluster "
                          "(default one per core; 0 runs in this process)."),
        click.option("--scheduler", metavar="ADDRESS", default=None,
                     help="With --exhaustive: an existing Dask scheduler (tcp://HOST:PORT or "
                          "tls://...) instead of a local cluster. Use only clusters you trust."),
        click.option("--state", "state_dir", type=click.Path(file_okay=False), default=None,
                     help="With --exhaustive: record finished shards in DIR; a rerun after an "
                          "interruption does only the missing ones."),
    ]
    for option in reversed(options):
        command = option(command)
    return command


def target_factory(python_target, command, regex, mode, timeout, reject_on):
    """A picklable recipe that builds the validator on whichever worker runs a shard."""
    if python_target is not None:
        return functools.partial(PythonTarget, python_target, os.getcwd(), timeout=timeout,
                                 reject_on=parse_exception_names(reject_on))
    if command is not None:
        return functools.partial(CommandTarget, command, timeout)
    return functools.partial(RegexTarget, regex, mode, timeout)


def run_exhaustive_audit(spec, label, make_target, *, distance, reject_alphabet, min_length,
                         max_length, max_cases, workers, scheduler, state_dir, show, fmt, out):
    """Plan, run and report one exhaustive audit; exits with the audit's status."""
    settings = RunSettings(workers=workers, scheduler=scheduler, state_dir=state_dir)
    alphabet = audit_alphabet(spec.alphabet, reject_alphabet)
    plan = plan_exhaustive(spec, alphabet, distance=distance, min_length=min_length,
                           max_length=max_length, max_cases=max_cases,
                           workers=workers or os.cpu_count() or 1)
    note(f"exhaustive audit: {plan.cases:,} cases ({plan.valid_cases:,} valid, "
         f"{plan.near_cases:,} near misses) in {len(plan.shards):,} shards on {settings.where()}")
    result = _run_with_progress(plan, make_target, settings)
    document = _document(result, label, make_target)
    if fmt == "json":
        emit(json_text(document, indent=2, sort_keys=False) + "\n", out)
    else:
        emit("\n".join(_lines(document, show)) + "\n", out)
    sys.exit(EXIT_OK if result.agrees else EXIT_DIFFERENT)


def _run_with_progress(plan, make_target, settings):
    if not sys.stderr.isatty():
        return run_exhaustive(plan, make_target, settings=settings)
    started = time.perf_counter()

    def rate(_item) -> str:
        seconds = time.perf_counter() - started
        return f"{bar.pos / seconds:,.0f} strings/s" if seconds > 0 else ""

    with click.progressbar(length=plan.cases, label="checking", file=sys.stderr,
                           show_eta=True, item_show_func=rate) as bar:
        result = run_exhaustive(plan, make_target, settings=settings,
                                on_progress=lambda done, total: bar.update(done - bar.pos))
    return result


def _document(result, label, make_target) -> dict:
    plan = result.plan
    return {
        "evidence": plan.evidence(),
        "specification": label,
        "validator": _validator_label(make_target),
        "cases": {"valid": plan.valid_cases, "near_misses": plan.near_cases,
                  "valid_lengths": list(plan.valid_window),
                  "near_miss_lengths": list(plan.near_window), "distance": plan.distance},
        "run": {"where": result.where, "shards": len(plan.shards), "strings": result.checked,
                "seconds": round(result.seconds, 3), "strings_per_second": round(result.throughput)},
        "wrong_accepts": _side(result.wrong_accepts, result.wrong_accept_total, plan),
        "wrong_rejects": _side(result.wrong_rejects, result.wrong_reject_total, plan),
        "exceptions": result.errors,
        "agrees": result.agrees,
    }


def _side(strings: list[str], total: int, plan) -> dict:
    side = {"count": total, "strings": strings, "complete": len(strings) == total}
    if strings and side["complete"]:
        from pfuzz.automata.algebra import from_strings
        from pfuzz.language import Language

        alphabet = plan.near_misses.alphabet | plan.specification.alphabet
        side["pattern"] = Language(from_strings(strings, alphabet)).to_pattern()
    return side


def _validator_label(make_target) -> str:
    name = make_target.func.__name__
    shown = " ".join(str(a) for a in make_target.args if not str(a).startswith("/"))
    return {"PythonTarget": "--target ", "CommandTarget": "--cmd ",
            "RegexTarget": "--regex "}.get(name, "") + shown


def _lines(document: dict, show: int) -> list[str]:
    run, cases = document["run"], document["cases"]
    lines = [f"evidence: {document['evidence']}", "",
             f"specification: {document['specification']}",
             f"validator:     {document['validator']}",
             f"ran on:        {run['where']}; {run['shards']:,} shards; {run['strings']:,} strings "
             f"in {run['seconds']:.1f} s ({run['strings_per_second']:,} strings/s)"]
    for key, heading in (("wrong_accepts", "Wrong accepts: invalid strings the validator let through"),
                         ("wrong_rejects", "Wrong rejects: valid strings the validator refused")):
        side = document[key]
        lines += ["", f"{heading}: {side['count']:,}" if side["count"] else f"{heading}: none"]
        if side.get("pattern"):
            lines.append(f"  as a pattern: {side['pattern']}")
        shown = side["strings"][:show]
        if shown:
            lines.append("  " + ", ".join(json_text(s) for s in shown)
                         + (f" (first {len(shown)} in shortlex order)" if side["count"] > len(shown) else ""))
    for name, seen in sorted(document["exceptions"].items()):
        lines += ["", f"Raised {name} on {seen['count']:,} inputs, e.g. "
                  + ", ".join(json_text(s) for s in seen["inputs"])]
    tried = document["cases"]["valid"] + document["cases"]["near_misses"]
    verdict = (f"no disagreement in the {tried:,} cases of the exhaustive window "
               "(what that covers is the evidence line above)"
               if document["agrees"] else "the validator disagrees with the specification "
               "(the findings are above)")
    lines += ["", f"result: {verdict}"]
    return lines
