"""``pfuzz draw``: the minimal DFA of a pattern as Graphviz DOT, or SVG."""

from __future__ import annotations

import click

from pfuzz.automata.drawing import to_dot, to_svg
from .common import compile_language, emit, language_options, out_option, pattern_input, report_errors


@click.command("draw")
@pattern_input
@language_options
@out_option
@report_errors
def draw(pattern, alphabet, flags, state_cap, out):
    """Draw the minimal DFA of PATTERN as Graphviz DOT (SVG for an --out FILE.svg).

    Accepting states are double circles; each edge is labelled with the
    characters that take it. SVG needs the Graphviz 'dot' program
    (for example 'apt-get install graphviz').

    \b
    Examples:
      pfuzz draw '[A-Z]{2}-[0-9]{4}' > code.dot
      pfuzz draw '[A-Z]{2}-[0-9]{4}' --out code.svg
    """
    lang = compile_language(pattern, alphabet, flags, state_cap)
    text = to_dot(lang.dfa, title=pattern)
    if out is not None and out.suffix.lower() == ".svg":
        text = to_svg(text)
    emit(text, out)


COMMANDS = [draw]
