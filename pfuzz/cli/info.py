"""``pfuzz info``: facts about a pattern's minimal DFA."""

from __future__ import annotations


import click

from pfuzz.base.jsonlines import json_text

from .common import (compile_language, emit, format_option, language_options, out_option,
                     pattern_input, report_errors)


@click.command("info")
@pattern_input
@language_options
@format_option(("text", "json"), "text")
@out_option
@report_errors
def info(pattern, alphabet, flags, state_cap, fmt, out):
    """Describe the minimal DFA of PATTERN: states, classes, lengths.

    \b
    Example:
      pfuzz info '[A-Z]{2}-[0-9]{4}'
    """
    lang = compile_language(pattern, alphabet, flags, state_cap)
    facts = describe(lang)
    if fmt == "json":
        emit(json_text(facts, indent=2, sort_keys=False) + "\n", out)
        return
    rows = [
        ("pattern", pattern),
        ("alphabet", facts["alphabet"]),
        ("states", f"{facts['states']} (minimal DFA, dead state not counted)"),
        ("classes", f"{facts['classes']}: {', '.join(facts['class_labels'])}"),
        ("empty", "yes" if facts["empty"] else "no"),
        ("finite", "yes" if facts["finite"] else "no"),
        ("min length", "-" if facts["min_length"] is None else str(facts["min_length"])),
        ("max length", _max_label(facts)),
    ]
    width = max(len(k) for k, _ in rows)
    emit("".join(f"{k:<{width}}  {v}\n" for k, v in rows), out)


def _max_label(facts) -> str:
    if facts["empty"]:
        return "-"
    return "unbounded" if facts["max_length"] is None else str(facts["max_length"])


def describe(lang) -> dict:
    """The facts ``info`` prints, as a plain dict."""
    return {
        "pattern": lang.pattern,
        "alphabet": lang.alphabet_name,
        "states": lang.states,
        "classes": len(lang.classes),
        "class_labels": [c.describe() for c in lang.classes],
        "empty": lang.is_empty(),
        "finite": lang.is_finite(),
        "min_length": lang.min_length,
        "max_length": lang.max_length,
    }


COMMANDS = [info]
