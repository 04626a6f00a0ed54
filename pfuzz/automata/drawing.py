"""The minimal DFA as a Graphviz DOT graph, as SVG (through ``dot``, or laid out here), as PNG.

States are drawn as circles (accepting states as double circles), with an
arrow into the start state from a point; the dead state is left out. All the
symbol classes leading from one state to the same next state are merged into
one edge (``pfuzz.automata.dfa.transitions``), labelled with the shortest ``re`` class text for
their union over the alphabet (``pfuzz.automata.expression.class_text``: ``[0-9]``, ``[^,]``, ``.``).
DOT is the Graphviz language (graphviz.org/doc/info/lang.html); Graphviz's ``dot``
program, run as a subprocess, turns it into SVG or PNG.

Without Graphviz, ``layered_svg`` lays the automaton out itself (a simplified layered
drawing after Sugiyama, Tagawa & Toda, IEEE SMC 11(2), 1981): each state sits in the
column of its breadth-first depth from the start, in breadth-first order within the
column; edges to a later column are straight, edges within or back to an earlier
column bend above, a state's own loop is a small arc over it; labels are cut to
``LABEL_WIDTH`` characters. No crossing reduction: past a few dozen states the
drawing gets hard to read (the report shows a summary instead).

Cost: O(states × classes) to group the edges; the text is linear in its size; the
layered layout is O(states + edges).
"""

from __future__ import annotations

import math
import shutil
import subprocess
from collections import deque
from xml.sax.saxutils import escape

from pfuzz.automata.dfa import DFA, transitions
from pfuzz.errors import GraphvizError
from pfuzz.automata.expression import class_text

__all__ = ["to_dot", "to_svg", "to_png", "layered_svg", "depths", "LABEL_WIDTH"]

#: Characters of an edge label shown in ``layered_svg``.
LABEL_WIDTH = 18
_COLUMN, _ROW, _RADIUS, _MARGIN = 150, 80, 18, 40
#: Seconds ``dot`` may take to lay out a graph.
DOT_TIMEOUT = 60

INSTALL_HINT = ("install Graphviz to get PNG: 'apt-get install graphviz' (Debian, Ubuntu), "
                "'dnf install graphviz' (Fedora), 'brew install graphviz' (macOS), or see "
                "https://graphviz.org/download/; or write --out FILE.svg or FILE.dot")


def _quoted(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def to_dot(dfa: DFA, title: str | None = None) -> str:
    """DOT text for ``dfa`` (``title``, e.g. the pattern, is shown above the graph)."""
    lines = ["digraph dfa {", "  rankdir=LR;", '  node [shape=circle, fontname="Helvetica"];',
             '  edge [fontname="Helvetica"];']
    if title is not None:
        lines.append(f"  label={_quoted(title)}; labelloc=t;")
    lines.append('  start [shape=point, label=""];')
    lines.append("  start -> s0;")
    for s in range(dfa.n_states):
        shape = ", shape=doublecircle" if s in dfa.accepting else ""
        lines.append(f'  s{s} [label="{s}"{shape}];')
    for s, row in enumerate(transitions(dfa)):
        lines.extend(f"  s{s} -> s{t} [label={_quoted(class_text(label, dfa.alphabet))}];"
                     for label, t in row)
    lines.append("}")
    return "\n".join(lines) + "\n"


def to_svg(dot_text: str) -> str:
    """Lay out DOT text with Graphviz ``dot -Tsvg``; GraphvizError when it cannot."""
    return _dot(dot_text, "svg").decode("utf-8")


def to_png(dot_text: str) -> bytes:
    """Lay out DOT text with Graphviz ``dot -Tpng``; GraphvizError when it cannot."""
    return _dot(dot_text, "png")


def _dot(dot_text: str, fmt: str) -> bytes:
    program = shutil.which("dot")
    if program is None:
        raise GraphvizError(f"the Graphviz 'dot' program is not installed; {INSTALL_HINT}")
    try:
        done = subprocess.run([program, f"-T{fmt}"], input=dot_text.encode("utf-8"),
                              capture_output=True, timeout=DOT_TIMEOUT)
    except subprocess.TimeoutExpired:
        raise GraphvizError(f"'dot' took more than {DOT_TIMEOUT} s to lay out the graph") from None
    except OSError as error:
        raise GraphvizError(f"cannot run 'dot': {error.strerror}") from None
    if done.returncode != 0:
        lines = done.stderr.decode("utf-8", "replace").strip().splitlines()
        raise GraphvizError(f"'dot' failed: {(lines[-1:] or [f'exit status {done.returncode}'])[0]}")
    return done.stdout


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


def layered_svg(dfa: DFA) -> str:
    """The DFA drawn by the layered layout of the module docstring (no Graphviz needed)."""
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
