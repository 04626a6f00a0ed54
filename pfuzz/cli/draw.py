"""``pfuzz draw``: the minimal DFA of a pattern as Graphviz DOT, SVG or PNG."""

from __future__ import annotations

import shutil

import click

from .common import (compile_language, emit, fail, language_options, note, out_option,
                     pattern_input, report_errors)

#: What ``--out`` may end in, and what it writes.
FORMATS = {".dot": "DOT", ".gv": "DOT", ".svg": "SVG", ".png": "PNG"}


@click.command("draw")
@pattern_input
@language_options
@out_option
@report_errors
def draw(pattern, alphabet, flags, state_cap, out):
    """Draw the minimal DFA of PATTERN (or PROFILE:FIELD): DOT, SVG or PNG by --out's extension.

    Without --out, Graphviz DOT goes to standard output. --out FILE.dot (or
    .gv) writes DOT, FILE.svg SVG (laid out by Graphviz's 'dot' when it is
    installed, else by pfuzz itself), FILE.png a PNG (needs Graphviz, for
    example 'apt-get install graphviz'); any other extension is refused.
    Accepting states are double circles; each edge is labelled with the
    characters that take it.

    \b
    Examples:
      pfuzz draw '[A-Z]{2}-[0-9]{4}' > code.dot
      pfuzz draw '[A-Z]{2}-[0-9]{4}' --out code.svg
      pfuzz draw profiles/demo.toml:postcode --out postcode.png
    """
    from pfuzz.automata.drawing import layered_svg, to_dot, to_png, to_svg

    kind = "DOT" if out is None else FORMATS.get(out.suffix.lower())
    if kind is None:
        fail(f"cannot tell the format from {out.name!r}: end --out in "
             f"{', '.join(FORMATS)} (DOT, SVG or PNG)")
    lang = compile_language(pattern, alphabet, flags, state_cap)
    text = to_dot(lang.dfa, title=pattern)
    if kind == "PNG":
        emit(to_png(text), out)
        return
    if kind == "SVG":
        if shutil.which("dot") is None:
            note("Graphviz is not installed: pfuzz lays the drawing out itself")
            text = layered_svg(lang.dfa)
        else:
            text = to_svg(text)
    emit(text, out)


COMMANDS = [draw]
