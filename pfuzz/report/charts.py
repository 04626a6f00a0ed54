"""Pictures for the HTML report, as inline SVG: counts by length, and the minimal DFA.

Why hand-made SVG: the report needs two simple pictures, a bar chart and a node-link
drawing, as static markup that a browser shows with no script and no network. A
plotting library that writes SVG (matplotlib) would add some 40 MB and a second of
import time to draw bars; the chart here is a few dozen lines, and its text stays
text (searchable, selectable, exact counts in each bar's tooltip).

Counts by length: one bar per length of the window, height on a logarithmic scale
(counts run from 1 to 10^40 and beyond), the exact count in the bar's ``<title>``.

The automaton: Graphviz's ``dot`` lays it out when installed (``pfuzz.automata.drawing``);
otherwise a layered layout of our own (Sugiyama-style, simplified): each state sits in
the column of its breadth-first depth from the start, in breadth-first order within
the column; edges to a later column are straight, edges within or back to an earlier
column bend above, a state's own loop is a small arc over it. Edge labels are the
``re`` class text of the characters taken (``pfuzz.automata.expression.class_text``),
cut to ``LABEL_WIDTH`` characters. Past ``DRAW_LIMIT`` states a drawing is not
readable (the 968-state password field): the report shows a summary instead, the
states per breadth-first depth as a small table.

Cost: O(states + edges) for the layout; Graphviz's own cost when it is used.
"""

from __future__ import annotations

import math
import shutil
from collections import deque
from xml.sax.saxutils import escape

from pfuzz.automata.dfa import DFA, transitions
from pfuzz.automata.expression import class_text

__all__ = ["DRAW_LIMIT", "LABEL_WIDTH", "counts_svg", "automaton_svg", "depths"]

#: Most states drawn; larger automata get a summary.
DRAW_LIMIT = 40
#: Characters of an edge label shown.
LABEL_WIDTH = 18
_COLUMN, _ROW, _RADIUS, _MARGIN = 150, 80, 18, 40


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


def depths(dfa: DFA) -> list[int]:
    """Breadth-first depth of every state from the start (-1 where unreachable)."""
    level = [-1] * dfa.n_states
    if dfa.n_states == 0:
        return level
    level[0] = 0
    queue = deque([0])
    while queue:
        s = queue.popleft()
        for t in dfa.table[s]:
            if t >= 0 and level[t] < 0:
                level[t] = level[s] + 1
                queue.append(t)
    return level


def automaton_svg(dfa: DFA, limit: int = DRAW_LIMIT, use_graphviz: bool = True) -> str | None:
    """The DFA as SVG, or None past ``limit`` states (the caller shows a summary)."""
    if dfa.n_states > limit:
        return None
    if use_graphviz and shutil.which("dot"):
        from pfuzz.automata.drawing import to_dot, to_svg

        text = to_svg(to_dot(dfa))
        return text[text.index("<svg"):]
    return _layered(dfa)


def _layered(dfa: DFA) -> str:
    level = depths(dfa)
    columns: dict[int, list[int]] = {}
    for s in range(dfa.n_states):
        columns.setdefault(max(level[s], 0), []).append(s)
    where = {s: (_MARGIN + 30 + d * _COLUMN, _MARGIN + 30 + i * _ROW)
             for d, members in columns.items() for i, s in enumerate(members)}
    width = _MARGIN * 2 + 60 + _COLUMN * (max(columns) if columns else 0)
    height = _MARGIN * 2 + 60 + _ROW * (max(len(m) for m in columns.values()) - 1 if columns else 0)
    parts = [f'<svg xmlns="http://www.w3.org/2000/svg" class="automaton" width="{width}" '
             f'height="{height}" viewBox="0 0 {width} {height}" role="img" '
             'aria-label="minimal DFA">',
             '<defs><marker id="arrow" viewBox="0 0 10 10" refX="10" refY="5" markerWidth="7" '
             'markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z"/>'
             '</marker></defs>']
    x0, y0 = where[0]
    parts.append(f'<line class="edge" x1="{x0 - 55}" y1="{y0}" x2="{x0 - _RADIUS}" y2="{y0}" '
                 'marker-end="url(#arrow)"/>')
    for s, row in enumerate(transitions(dfa)):
        for label, t in row:
            text = class_text(label, dfa.alphabet)
            if len(text) > LABEL_WIDTH:
                text = text[:LABEL_WIDTH - 1] + "…"
            parts.append(_edge(where[s], where[t], text, s == t))
    for s, (x, y) in where.items():
        parts.append(f'<g class="state{" accepting" if s in dfa.accepting else ""}">'
                     f'<circle cx="{x}" cy="{y}" r="{_RADIUS}"/>')
        if s in dfa.accepting:
            parts.append(f'<circle cx="{x}" cy="{y}" r="{_RADIUS - 4}"/>')
        parts.append(f'<text x="{x}" y="{y + 4}" text-anchor="middle">{s}</text></g>')
    parts.append("</svg>")
    return "".join(parts)


def _edge(a: tuple[int, int], b: tuple[int, int], label: str, loop: bool) -> str:
    (x1, y1), (x2, y2) = a, b
    text = escape(label)
    if loop:
        path = (f"M{x1 - 8},{y1 - _RADIUS + 2} C{x1 - 30},{y1 - 65} {x1 + 30},{y1 - 65} "
                f"{x1 + 8},{y1 - _RADIUS + 2}")
        lx, ly = x1, y1 - 52
    elif x2 > x1:
        dx, dy = x2 - x1, y2 - y1
        d = math.hypot(dx, dy)
        ux, uy = dx / d, dy / d
        path = (f"M{x1 + ux * _RADIUS:.1f},{y1 + uy * _RADIUS:.1f} "
                f"L{x2 - ux * _RADIUS:.1f},{y2 - uy * _RADIUS:.1f}")
        lx, ly = (x1 + x2) / 2, (y1 + y2) / 2 - 6
    else:
        lift = 40 + abs(x1 - x2) / 4
        path = (f"M{x1},{y1 - _RADIUS} Q{(x1 + x2) / 2:.1f},{min(y1, y2) - lift:.1f} "
                f"{x2},{y2 - _RADIUS}")
        lx, ly = (x1 + x2) / 2, min(y1, y2) - lift / 2 - 4
    return (f'<g class="transition"><path class="edge" d="{path}" marker-end="url(#arrow)"/>'
            f'<text x="{lx:.1f}" y="{ly:.1f}" text-anchor="middle" class="label">{text}</text></g>')
