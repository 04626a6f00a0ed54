"""``pfuzz diff``: are two patterns the same language, and if not, where do they differ?"""

from __future__ import annotations

import sys
from pathlib import Path

import click

from pfuzz.base.numbers import number_text

from pfuzz.base.jsonlines import json_text
from pfuzz.audit.comparison import DEFAULT_EXAMPLES, Comparison, Side, compare
from .common import (EXIT_DIFFERENT, EXIT_OK, compile_language, emit, escape_text, fail,
                     format_option, language_options, max_length_option, out_option,
                     read_pattern_file, report_errors)
from .common import FilePath


@click.command("diff")
@click.argument("patterns", metavar="PATTERN_A PATTERN_B", nargs=-1)
@click.option("--pattern-file", "pattern_files", multiple=True,
              type=FilePath(dir_okay=False, path_type=Path),
              help="Read a pattern from FILE instead (give it once for B, twice for A and B).")
@language_options
@max_length_option
@click.option("--examples", type=click.IntRange(min=0), default=DEFAULT_EXAMPLES,
              show_default=True, help="Shortest strings to list for each side.")
@format_option(("text", "json"), "text")
@out_option
@report_errors
def diff(patterns, pattern_files, alphabet, flags, state_cap, max_length, examples, fmt, out):
    """Compare the languages of PATTERN_A and PATTERN_B exactly.

    Prints whether they are equal and, for each of A−B (only in A) and B−A
    (only in B): the number of strings per length, the shortest strings, and
    a pattern for the difference (checked to compile back to it). Exit
    status: 0 equal, 1 different, 2 bad input.

    \b
    Examples (a specification against an implementation):
      pfuzz diff '(0[1-9]|1[0-2])/[0-9]{2}' '[01][0-9]/[0-9]{2}'
      pfuzz diff '[A-Z]{2}-[0-9]{4}' --pattern-file implementation.txt
    """
    pattern_a, pattern_b = _two_patterns(patterns, pattern_files)
    a = compile_language(pattern_a, alphabet, flags, state_cap)
    b = compile_language(pattern_b, alphabet, flags, state_cap)
    result = compare(a, b, max_length=max_length, examples=examples)
    if fmt == "json":
        document = {"a": pattern_a, "b": pattern_b, "alphabet": a.alphabet_name,
                    **comparison_dict(result)}
        emit(json_text(document, indent=2, sort_keys=False) + "\n", out)
    else:
        lines = [f"A: {pattern_a}", f"B: {pattern_b}", f"alphabet: {a.alphabet_name}",
                 *comparison_lines(result)]
        emit("\n".join(lines) + "\n", out)
    sys.exit(EXIT_OK if result.equal else EXIT_DIFFERENT)


def _two_patterns(patterns: tuple[str, ...], files: tuple[Path, ...]) -> tuple[str, str]:
    """PATTERN_A and PATTERN_B from arguments first, then from --pattern-file FILEs."""
    if len(patterns) + len(files) != 2:
        fail("give two patterns: PATTERN_A PATTERN_B, or --pattern-file FILE for either of them")
    return (*patterns, *(read_pattern_file(f) for f in files))


def comparison_dict(result: Comparison) -> dict:
    """The machine-readable form shared by ``diff`` and ``audit --regex``."""
    return {"equal": result.equal, "distinguishing": result.distinguishing,
            "a_minus_b": result.only_a.as_dict(), "b_minus_a": result.only_b.as_dict()}


def comparison_lines(result: Comparison, a: str = "A", b: str = "B", rows: int | None = None,
                     titles: tuple[str, str] | None = None) -> list[str]:
    """The text form shared by ``diff`` and ``audit --regex`` (``titles`` name the two sides)."""
    if result.equal:
        return ["verdict: equal (the same language)"]
    where = a if result.only_a.language.accepts(result.distinguishing) else b
    lines = [f"verdict: different; shortest string in only one: "
             f"{quote(result.distinguishing)} (only in {where})"]
    titles = titles or (f"only in {a} ({a}-{b})", f"only in {b} ({b}-{a})")
    for title, side in zip(titles, (result.only_a, result.only_b)):
        lines.append("")
        lines.extend(side_lines(title, side, rows))
    return lines


def side_lines(title: str, side: Side, rows: int | None = None) -> list[str]:
    """One side of a comparison; ``rows`` caps the lines of the count table."""
    if side.empty:
        return [f"{title}: none"]
    if side.total is None:
        size = "infinitely many strings"
    else:
        size = f"{number_text(side.total)} string{'' if side.total == 1 else 's'}"
    lines = [f"{title}: {size}",
             f"  pattern:  {pattern_label(side)}",
             f"  shortest: {', '.join(quote(t) for t in side.examples)}",
             f"  {'length':>6}  count"]
    counts = list(side.counts.items())
    lines.extend(f"  {n:>6}  {number_text(c)}" for n, c in counts[:rows])
    if rows is not None and len(counts) > rows:
        lines.append(f"  {'...':>6}  ({len(counts) - rows} more lengths)")
    elif not side.finite or (side.language.max_length or 0) > side.bound:
        lines.append(f"  (counted up to length {side.bound}; use --max-length to see more)")
    return lines


def pattern_label(side: Side) -> str:
    if side.pattern is None:
        return f"({side.note})"
    return side.pattern if side.pattern else '(the empty pattern: only "")'


def quote(text: str) -> str:
    """A string as it appears in text reports: in double quotes, escaped to one line."""
    return '"' + escape_text(text).replace('"', '\\"') + '"'


COMMANDS = [diff]
