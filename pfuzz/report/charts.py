"""Pictures for the HTML report, as inline SVG: counts by length, and the minimal DFA.

Why hand-made SVG: the report needs two simple pictures, a bar chart and a node-link
drawing, as static markup that a browser shows with no script and no network. A
plotting library that writes SVG (matplotlib) would add some 40 MB and a second of
import time to draw bars; the chart here is a few dozen lines, and its text stays
text (searchable, selectable, exact counts in each bar's tooltip).

Counts by length: one bar per length of the window, height on a logarithmic scale
(counts run from 1 to 10^40 and beyond), the exact count in the bar's ``<title>``.

The automaton: Graphviz's ``dot`` lays it out when installed, otherwise the project's
own layered layout (both in ``pfuzz.automata.drawing``). Past ``DRAW_LIMIT`` states a
drawing is not readable (the 968-state password field): the report shows a summary
instead, the states per breadth-first depth as a small table.

Cost: O(lengths) for the chart; the drawing's cost is ``pfuzz.automata.drawing``'s.
"""

from __future__ import annotations

import math
import shutil

from pfuzz.automata.dfa import DFA
from pfuzz.automata.drawing import depths, layered_svg, to_dot, to_svg

__all__ = ["DRAW_LIMIT", "counts_svg", "automaton_svg", "depths"]

#: Most states drawn; larger automata get a summary.
DRAW_LIMIT = 40


def counts_svg(counts: dict[int, int], width: int = 640, height: int = 220) -> str:
    """A bar chart of ``counts`` (length → number of strings), log scale."""
    lengths = sorted(counts)
    if not lengths:
        return ""
    top = max(math.log10(c) if c else 0 for c in counts.values()) or 1.0
    left, bottom, plot_h = 56, 34, height - 54
    bar = min(40.0, max(2.0, (width - left - 10) / len(lengths)))
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" class="chart counts" width="{width}" '
           f'height="{height}" viewBox="0 0 {width} {height}" role="img" '
           'aria-label="valid strings per length, logarithmic scale">']
    for power in range(0, int(top) + 1, max(1, int(top) // 4 or 1)):
        y = height - bottom - plot_h * power / top
        out.append(f'<line x1="{left}" y1="{y:.1f}" x2="{width - 6}" y2="{y:.1f}" class="grid"/>'
                   f'<text x="{left - 6}" y="{y + 4:.1f}" class="axis" text-anchor="end">'
                   f'10{_superscript(power)}</text>')
    step = max(1, len(lengths) // 16)
    for i, n in enumerate(lengths):
        c = counts[n]
        h = plot_h * (math.log10(c) / top if c > 1 else (0.02 if c == 1 else 0))
        x = left + i * bar
        out.append(f'<rect class="bar" x="{x + 1:.1f}" y="{height - bottom - h:.1f}" '
                   f'width="{bar - 2:.1f}" height="{h:.1f}"><title>length {n}: {c:,} '
                   f'string{"" if c == 1 else "s"}</title></rect>')
        if i % step == 0:
            out.append(f'<text x="{x + bar / 2:.1f}" y="{height - bottom + 16}" class="axis" '
                       f'text-anchor="middle">{n}</text>')
    out.append(f'<text x="{(left + width) / 2:.0f}" y="{height - 4}" class="axis" '
               'text-anchor="middle">length</text></svg>')
    return "".join(out)


def _superscript(n: int) -> str:
    return str(n).translate(str.maketrans("0123456789", "⁰¹²³⁴⁵⁶⁷⁸⁹"))


def automaton_svg(dfa: DFA, limit: int = DRAW_LIMIT, use_graphviz: bool = True) -> str | None:
    """The DFA as SVG, or None past ``limit`` states (the caller shows a summary)."""
    if dfa.n_states > limit:
        return None
    if use_graphviz and shutil.which("dot"):
        text = to_svg(to_dot(dfa))
        return text[text.index("<svg"):]
    return layered_svg(dfa)
