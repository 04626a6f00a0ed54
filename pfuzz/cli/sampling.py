"""``pfuzz count`` and ``pfuzz sample``: exact counts per length, uniform strings by length.

Thin skins over ``Language.counts`` and ``Counter.sample``. Standard output
carries data only; notes (a defaulted length bound, escaping, fewer distinct
strings than asked) and the progress bar go to standard error.
"""

from __future__ import annotations

import sys
import warnings

import click

from pfuzz.base.jsonlines import json_text
from pfuzz.base.numbers import big_integers
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.errors import PfuzzWarning
from pfuzz.counting.sampler import METHODS
from .common import (compile_language, emit, fail, format_option, how_many_option,
                     language_options, max_length_option, min_length_option, note, out_option,
                     pattern_input, render_strings, report_errors, require_output_memory,
                     seed_option, wants_progress)


def _bounds(lang, min_length, max_length) -> tuple[int, int]:
    """The length range, with a note on stderr when an unbounded language's bound was defaulted."""
    if min_length is not None and max_length is not None and min_length > max_length:
        fail(f"--min-length {min_length} is greater than --max-length {max_length}")
    low, high = lang.counter.bounds(min_length, max_length)
    if low > high:
        fail(f"the length range {low} to {high} is empty (the longest string has length "
             f"{high}); lower --min-length")
    if max_length is None and not lang.is_finite():
        note(f"the language is unbounded: lengths up to {high} ({UNBOUNDED_SPAN} above the "
              "shortest considered); set --max-length to change it")
    return low, high


@click.command("count")
@pattern_input
@language_options
@click.option("--length", type=click.IntRange(min=0), default=None,
              help="Count only strings of exactly this length.")
@min_length_option
@max_length_option
@format_option(("text", "csv", "json"), "text")
@out_option
@report_errors
def count(pattern, alphabet, flags, state_cap, length, min_length, max_length, fmt, out):
    """Count exactly the strings PATTERN accepts, per length, and in total.

    The table lists every length in the range (zeros included); csv ends with
    a 'total' row. Without --max-length an unbounded language is counted up
    to a default bound, said on stderr.

    \b
    Example:
      pfuzz count '[A-Z]{2}[0-9]{4}'
      pfuzz count '[a-z]{1,8}@[a-z]{2,6}\\.org' --max-length 12 --format csv
    """
    if length is not None and (min_length is not None or max_length is not None):
        fail("give --length, or --min-length/--max-length, not both")
    if length is not None:
        min_length = max_length = length
    lang = compile_language(pattern, alphabet, flags, state_cap)
    low, high = _bounds(lang, min_length, max_length)
    table = lang.counts(low, high)
    with big_integers():
        emit(_render_counts(lang, table, fmt, defaulted=max_length is None), out)


def _render_counts(lang, table: dict[int, int], fmt: str, defaulted: bool) -> str:
    total = sum(table.values())
    if fmt == "json":
        document = {
            "pattern": lang.pattern, "alphabet": lang.alphabet_name,
            "min_length": min(table), "max_length": max(table),
            "max_length_defaulted": defaulted and not lang.is_finite(),
            "counts": [{"length": k, "count": v} for k, v in table.items()],
            "total": total, "language_total": lang.total,
        }
        return json_text(document, indent=2, sort_keys=False) + "\n"
    if fmt == "csv":
        rows = ["length,count", *(f"{k},{v}" for k, v in table.items()), f"total,{total}"]
        return "\r\n".join(rows) + "\r\n"
    width = max(len("length"), len(str(max(table))))
    lines = [f"{'length':>{width}}  count"]
    lines += [f"{k:>{width}}  {v:,}" for k, v in table.items()]     # separators as diff, audit
    lines.append(f"{'total':>{width}}  {total:,}")
    return "\n".join(lines) + "\n"


@click.command("sample")
@pattern_input
@language_options
@how_many_option("strings")
@seed_option
@min_length_option
@max_length_option
@click.option("--lengths", type=click.Choice(["even", "proportional"]), default="even",
              show_default=True,
              help="even: each length in range equally often; proportional: uniform over all strings.")
@click.option("--unique", is_flag=True, help="Distinct strings only (all of them, if fewer exist).")
@click.option("--method", type=click.Choice(METHODS), default="auto", show_default=True,
              help="exact: big-integer walk; bulk: float alias tables (bounded deviation); "
                   "auto: bulk from 1,000 strings or lengths above 1,000.")
@format_option(("text", "jsonl"), "text")
@out_option
@report_errors
def sample(pattern, alphabet, flags, state_cap, how_many, seed, min_length, max_length, lengths,
           unique, method, fmt, out):
    """Write N strings PATTERN accepts, uniformly random within each length.

    text writes one string per line, with control characters, newlines and
    backslashes escaped (said on stderr when it happens); jsonl writes one
    JSON string per line and keeps every character exactly.

    \b
    Example:
      pfuzz sample '[A-Z]{2}[0-9]{4}' -n 5 --seed 7
      pfuzz sample '[a-z]+@[a-z]+\\.org' -n 1000 --max-length 20 --unique --format jsonl
    """
    lang = compile_language(pattern, alphabet, flags, state_cap)
    _low, high = _bounds(lang, min_length, max_length)
    require_output_memory(how_many, high, lang)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", PfuzzWarning)
        strings = _sample_with_progress(lang, how_many, min_length, max_length, seed, lengths,
                                        unique, method)
    for warning in caught:
        if issubclass(warning.category, PfuzzWarning):
            note(f"warning: {warning.message}")
    emit(render_strings(strings, fmt), out)


def _sample_with_progress(lang, n, min_length, max_length, seed, lengths, unique,
                          method) -> list[str]:
    show = wants_progress(n)
    arguments = dict(min_length=min_length, max_length=max_length, seed=seed, lengths=lengths,
                     unique=unique, method=method)
    if not show:
        return lang.counter.sample(n, **arguments)
    with click.progressbar(length=n, label="sampling", file=sys.stderr) as bar:
        return lang.counter.sample(n, progress=bar.update, **arguments)


COMMANDS = [count, sample]
