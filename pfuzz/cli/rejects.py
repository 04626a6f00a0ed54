"""``pfuzz reject`` and ``pfuzz explain``: near-miss rejects, and why a text is rejected.

Thin skins over ``pfuzz.nearmiss.rejects.sample_rejects`` and ``pfuzz.nearmiss.rejects.explain``.
Standard output carries data only; notes and the progress bar go to
standard error. ``explain`` exits 0 when the pattern accepts the text and 1
when it rejects it, like ``grep``.
"""

from __future__ import annotations

import functools
import sys
import unicodedata

import click

from pfuzz.base.jsonlines import json_text, jsonl_line
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.automata.algebra import is_finite
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.base.resources import REJECT_BYTES
from pfuzz.nearmiss.rejects import length_range, near_miss_dfa, sample_rejects
from .common import (EXIT_DIFFERENT, compile_language, emit, escape_text, fail, format_option,
                     how_many_option, language_options, max_length_option, min_length_option,
                     out_option, pattern_input, report_errors, seed_option)
from .common import render_strings, require_output_memory, wants_progress


@click.command("reject")
@pattern_input
@language_options
@how_many_option("rejects")
@click.option("--distance", type=click.IntRange(min=1), default=1, show_default=True,
              help="Edit distance (optimal string alignment) from the nearest valid string.")
@click.option("--kind", "kinds", type=click.Choice(EDIT_KINDS), multiple=True,
              help="Only edits of this kind (repeatable); several kinds share the rejects "
                   "equally. Default: the whole near-miss language.")
@click.option("--edges", is_flag=True,
              help="Substitute and insert only range-edge characters (lo-1, hi+1 of each "
                   "transition's ranges), the classic off-by-one values.")
@seed_option
@min_length_option
@max_length_option
@format_option(("text", "jsonl"), "text")
@out_option
@report_errors
def reject(pattern, alphabet, flags, state_cap, how_many, distance, kinds, edges, seed,
           min_length, max_length, fmt, out):
    """Write N near-miss rejects of PATTERN: strings it rejects within a few edits of one it accepts.

    Rejects are uniform within each length of the near-miss language. text
    writes one reject per line (escaped as for 'pfuzz sample'); jsonl writes
    one object per line: the reject, the kinds of edit that reach it, its
    nearest valid string (witness), the distance and the edits that turn the
    witness into the reject.

    \b
    Example:
      pfuzz reject '[A-Z]{2}[0-9]{4}' -n 4 --kind delete --kind swap
      pfuzz reject '[0-9]{4}-[0-9]{2}' -n 100 --edges --format jsonl --out rejects.jsonl
    """
    lang = compile_language(pattern, alphabet, flags, state_cap)
    if min_length is not None and max_length is not None and min_length > max_length:
        fail(f"--min-length {min_length} is greater than --max-length {max_length}")
    asked = list(kinds) or None
    low, high = length_range(lang.dfa, distance, asked, min_length, max_length, edges=edges,
                             cap=state_cap)
    near = near_miss_dfa(lang.dfa, distance, asked, edges=edges, cap=state_cap)
    if max_length is None and not is_finite(near):
        click.echo(f"pfuzz: the near-miss language is unbounded: lengths up to {high} "
                   f"({UNBOUNDED_SPAN} above the shortest considered); set --max-length to "
                   "change it", err=True)
    require_output_memory(how_many, high, lang, per_item=REJECT_BYTES)
    arguments = dict(distance=distance, kinds=asked, seed=seed, min_length=low,
                     max_length=high, edges=edges, cap=state_cap)
    if wants_progress(how_many):
        with click.progressbar(length=how_many, label="rejects", file=sys.stderr) as bar:
            rejects = sample_rejects(lang.dfa, how_many, progress=bar.update, **arguments)
    else:
        rejects = sample_rejects(lang.dfa, how_many, **arguments)
    if fmt == "jsonl":
        emit("".join(jsonl_line(r.as_dict()) for r in rejects), out)
    else:
        emit(render_strings([r.text for r in rejects], "text"), out)


def _text_after_pattern_file(func):
    """With --pattern-file, the one positional argument is TEXT, not PATTERN."""
    @functools.wraps(func)
    def wrapper(*args, pattern_arg=None, text=None, pattern_file=None, **kwargs):
        if pattern_file is not None and text is None:
            pattern_arg, text = None, pattern_arg
        if text is None:
            raise click.UsageError("give the TEXT to explain")
        return func(*args, pattern_arg=pattern_arg, text=text, pattern_file=pattern_file,
                    **kwargs)
    return wrapper


#: Nearest valid strings ``explain --all`` lists by default.
DEFAULT_ALL_LIMIT = 20


@click.command("explain")
@_text_after_pattern_file
@pattern_input
@click.argument("text", required=False)
@language_options
@click.option("--all", "show_all", is_flag=True,
              help="Also list the other valid strings at the same least distance.")
@click.option("--limit", type=click.IntRange(min=1), default=DEFAULT_ALL_LIMIT, show_default=True,
              help="Most nearest valid strings --all lists.")
@format_option(("text", "json"), "text")
@out_option
@report_errors
def explain(pattern, text, alphabet, flags, state_cap, show_all, limit, fmt, out):
    """Say whether PATTERN accepts TEXT and, if not, the nearest valid string and the edits.

    The nearest valid string (witness) is the shortest, then alphabetically
    first, among the valid strings at the least edit distance (optimal string
    alignment). The edits turn the witness into TEXT; the caret line marks
    where they are in TEXT. Exit status: 0 accepted, 1 rejected, 2 bad input.

    \b
    Example:
      pfuzz explain '[A-Z]{2}[0-9]{4}' 'AB12O4'
      pfuzz explain --pattern-file rule.txt 'x-42' --format json
    """
    lang = compile_language(pattern, alphabet, flags, state_cap)
    why = lang.explain(text)
    others, complete = _all_nearest(lang, why, limit) if show_all else ([], True)
    if fmt == "json":
        document = {"pattern": lang.pattern, "alphabet": lang.alphabet_name, **why.as_dict(),
                    "edits_text": [str(e) for e in why.edits]}
        if show_all:
            document.update(nearest_all=others, nearest_all_complete=complete)
        emit(json_text(document, indent=2, sort_keys=False) + "\n", out)
    else:
        emit(render_explanation(why) + (_all_lines(why, others, complete) if show_all else ""),
             out)
    if not why.accepted:
        sys.exit(EXIT_DIFFERENT)


def _all_nearest(lang, why, limit: int) -> tuple[list[str], bool]:
    """The witness first, then the other nearest valid strings found (``pfuzz.nearmiss.alternatives``)."""
    if why.accepted or why.witness is None:
        return [], True
    from pfuzz.nearmiss.alternatives import nearest_strings

    found, complete = nearest_strings(lang.dfa, why.text, why.distance, limit)
    rest = sorted((s for s in found if s != why.witness), key=lambda s: (len(s), s))
    return [why.witness, *rest][:limit], complete


def _all_lines(why, others: list[str], complete: bool) -> str:
    if why.accepted:
        return ""
    edits = "edit" if why.distance == 1 else "edits"
    head = (f"all nearest ({len(others)} valid strings at {why.distance} {edits})" if complete
            else f"all nearest (the first {len(others)} valid strings at {why.distance} {edits}; "
                 "there are more: --limit N)")
    return head + "\n" + "".join(f"          {escape_text(s)}\n" for s in others)


def _width(piece: str) -> int:
    """Terminal columns: two for wide and full-width characters (as PatternError.caret)."""
    return sum(2 if unicodedata.east_asian_width(ch) in "WF" else 1 for ch in piece)


def render_explanation(why) -> str:
    """The verdict, the text with a caret under each edit, the witness and the edits."""
    shown = [escape_text(ch) for ch in why.text]
    if why.accepted:
        return f"accepted  {''.join(shown)}\n"
    columns = [0]
    for piece in shown:
        columns.append(columns[-1] + _width(piece))
    marks = set()
    for edit in why.edits:
        marks.update(range(edit.position, edit.position + (2 if edit.kind == "swap" else 1)))
    caret = [" "] * (columns[-1] + 1)
    for p in marks:
        caret[columns[p]] = "^"
    plural = "edit" if why.distance == 1 else "edits"
    lines = [f"rejected  {why.distance} {plural} from the nearest valid string",
             f"text      {''.join(shown)}",
             f"          {''.join(caret).rstrip()}",
             f"nearest   {escape_text(why.witness)}",
             "edits     (turning the nearest valid string into the text)"]
    lines += [f"          {edit}" for edit in why.edits]
    return "\n".join(lines) + "\n"


COMMANDS = [reject, explain]
