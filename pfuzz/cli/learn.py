"""``pfuzz learn``: infer the automaton of a validator and print the language it accepts."""

from __future__ import annotations

import sys
from pathlib import Path

import click

from pfuzz.audit.comparison import DEFAULT_EXAMPLES, summarise, verified_pattern
from pfuzz.audit.learned import HOSTILE_SINGLES
from pfuzz.audit.targets import DEFAULT_TIMEOUT
from pfuzz.base.charset import CharSet
from pfuzz.base.constants import CALL_MODES
from pfuzz.base.jsonlines import json_text
from pfuzz.errors import TargetError
from pfuzz.learning import learn as learn_model
from pfuzz.learning.model import BUDGET_WORDS
from pfuzz.syntax.alphabet import resolve_alphabet
from .audit import _target, learning_options
from .common import (EXIT_DIFFERENT, EXIT_OK, compile_language, emit, fail, format_option,
                     language_options, out_option, read_pattern_file, report_errors, seed_option)
from .common import FilePath
from .diff import quote, side_lines


@click.command("learn")
@click.option("--pattern", "-p", help="The specification as a pattern (or PROFILE:FIELD).")
@click.option("--pattern-file", type=FilePath(dir_okay=False, path_type=Path),
              help="Read the specification pattern from FILE.")
@click.option("--target", "python_target", metavar="MODULE:FUNCTION",
              help="A Python function, imported from the current directory, called with one string.")
@click.option("--cmd", "command", metavar="COMMAND",
              help="A command reading one JSON string per line, answering 1/0 per line.")
@click.option("--regex", metavar="R", help="A Python regex as the validator uses it.")
@click.option("--mode", type=click.Choice(CALL_MODES), default="fullmatch", show_default=True,
              help="How the code calls --regex: re.fullmatch, re.match or re.search.")
@language_options
@click.option("--extra-alphabet", default=None, metavar="ALPHABET",
              help="Characters the validator is also asked about, besides --alphabet "
                   "(a preset name or a class such as '[\\t\\n]').")
@click.option("--no-hostile", is_flag=True,
              help="Do not ask about the hostile characters (line ends, tab, space, no-break "
                   "and zero-width spaces, byte order mark), each otherwise a class of its own.")
@click.option("--reject-on", metavar="TYPE,...",
              help="Exceptions of a --target that mean reject besides ValueError.")
@click.option("--timeout", type=click.FloatRange(min=0, min_open=True), default=DEFAULT_TIMEOUT,
              show_default=True, help="Seconds a validator (--target, --cmd or --regex) may take "
                                      "to answer one round of strings.")
@learning_options
@seed_option
@click.option("--examples", type=click.IntRange(min=0), default=DEFAULT_EXAMPLES,
              show_default=True, help="Shortest strings to list for each difference.")
@format_option(("text", "json"), "text")
@out_option
@report_errors
def learn(pattern, pattern_file, python_target, command, regex, mode, alphabet, flags, state_cap,
          extra_alphabet, no_hostile, reject_on, timeout, learn_queries, learn_states, learn_seconds,
          extra_states, interior_probes, seed, examples, fmt, out):
    """Learn the language a validator accepts, by asking it, and compare it with a --pattern.

    The validator is asked strings in rounds (active automata learning over
    classes of characters the specification treats alike); the model is
    compared exactly with the specification and tested for --extra-states
    more states. Prints the model's states, whether it equals the
    specification, the strings it accepts wrongly and rejects wrongly (as
    patterns, counted per length, shortest first), the cost, and the
    guarantee the model comes with. Exit status: 0 the model equals the
    specification, 1 it differs, 2 bad input or a validator that failed.

    \b
    Examples:
      pfuzz learn --pattern '[A-Z]{2}-[0-9]{4}' --target checks:is_ticket
      pfuzz learn --pattern '[0-9]{4}' --regex '\\d{4}$' --mode match
    """
    if (pattern is None) == (pattern_file is None):
        fail("give the specification once: --pattern P or --pattern-file FILE")
    text = pattern if pattern is not None else read_pattern_file(pattern_file)
    spec = compile_language(text, alphabet, flags, state_cap)
    wider = resolve_alphabet(extra_alphabet) if extra_alphabet else CharSet()
    hostile = "" if no_hostile else HOSTILE_SINGLES
    target = _target(python_target, command, regex, mode, timeout, reject_on)
    try:
        with target:
            model = learn_model(target.ask, spec, alphabet=wider, extra_characters=hostile,
                                interior_probes=interior_probes, extra_states=extra_states,
                                max_queries=learn_queries, max_states=learn_states,
                                max_seconds=learn_seconds, seed=seed)
    except TargetError as error:
        fail(f"the validator {target.label} could not be asked: {error}", error.detail)
    sides = (summarise(model.wrongly_accepted, examples=examples),
             summarise(model.wrongly_rejected, examples=examples))
    pattern_text, pattern_note = verified_pattern(model.model)
    if fmt == "json":
        document = {"specification": text, "validator": target.label,
                    "alphabet": model.specification.alphabet_name, **model.as_dict(),
                    "model_pattern": pattern_text, "model_pattern_note": pattern_note,
                    "wrongly_accepted": sides[0].as_dict(), "wrongly_rejected": sides[1].as_dict()}
        emit(json_text(document, indent=2, sort_keys=False) + "\n", out)
    else:
        lines = [f"specification: {text}", f"validator: {target.label}",
                 f"alphabet: {model.specification.alphabet_name}",
                 *model_lines(model, _pattern_label(pattern_text, pattern_note))]
        for title, side in zip(("wrongly accepted (model - specification)",
                                "wrongly rejected (specification - model)"), sides):
            lines += ["", *side_lines(title, side)]
        emit("\n".join(lines) + "\n", out)
    sys.exit(EXIT_OK if model.equals_specification else EXIT_DIFFERENT)


def model_lines(model, pattern: str) -> list[str]:
    """The facts of a learned model, one a line."""
    verdict = ("equal to the specification" if model.equals_specification
               else "different from the specification")
    budget = (f"the {BUDGET_WORDS[model.budget_exhausted]} budget ran out"
              if model.budget_exhausted else "none ran out")
    confirmed = ", ".join(quote(w) for w in model.confirmed_differences[:DEFAULT_EXAMPLES])
    more = len(model.confirmed_differences) - DEFAULT_EXAMPLES
    lines = [f"model: {model.states} state{'' if model.states == 1 else 's'}, {verdict}",
             f"model pattern: {pattern}",
             f"classes: {len(model.classes)}: "
             + ", ".join(_label(c.chars) for c in model.classes),
             f"queries: {model.queries:,} in {model.rounds:,} rounds, {model.seconds:.2f} s",
             f"budgets: {budget}",
             f"tested for extra states: {_depth(model)}",
             f"guarantee: {model.guarantee()}"]
    if confirmed:
        lines.append(f"confirmed differences: {confirmed}" + (f" and {more:,} more" if more > 0 else ""))
    return lines


def _pattern_label(pattern: str | None, note: str) -> str:
    if pattern is None:
        return note
    return pattern if pattern else '(the empty pattern: only "")'


def _label(chars: CharSet) -> str:
    text = chars.describe()
    return "[ ]" if text == " " else text


def _depth(model) -> str:
    if model.conformance_depth is None:
        return f"none of {model.extra_states}"
    return f"{model.conformance_depth} of {model.extra_states}"


COMMANDS = [learn]
