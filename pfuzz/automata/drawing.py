"""The minimal DFA as a Graphviz DOT graph, and SVG through the ``dot`` program.

States are drawn as circles (accepting states as double circles), with an
arrow into the start state from a point; the dead state is left out. All the
symbol classes leading from one state to the same next state are merged into
one edge (``pfuzz.automata.dfa.transitions``), labelled with the shortest ``re`` class text for
their union over the alphabet (``pfuzz.automata.expression.class_text``: ``[0-9]``, ``[^,]``, ``.``).
DOT is the Graphviz language (graphviz.org/doc/info/lang.html); SVG needs the
Graphviz ``dot`` program on the PATH, run as a subprocess.

Cost: O(states × classes) to group the edges; the text is linear in its size.
"""

from __future__ import annotations

import shutil
import subprocess

from pfuzz.automata.dfa import DFA, transitions
from pfuzz.errors import GraphvizError
from pfuzz.automata.expression import class_text

#: Seconds ``dot`` may take to lay out a graph.
DOT_TIMEOUT = 60

INSTALL_HINT = ("install Graphviz to get SVG: 'apt-get install graphviz' (Debian, Ubuntu), "
                "'dnf install graphviz' (Fedora), 'brew install graphviz' (macOS), or see "
                "https://graphviz.org/download/; or write DOT with --out FILE.dot")


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
    program = shutil.which("dot")
    if program is None:
        raise GraphvizError(f"the Graphviz 'dot' program is not installed; {INSTALL_HINT}")
    try:
        done = subprocess.run([program, "-Tsvg"], input=dot_text, capture_output=True,
                              text=True, encoding="utf-8", timeout=DOT_TIMEOUT)
    except subprocess.TimeoutExpired:
        raise GraphvizError(f"'dot' took more than {DOT_TIMEOUT} s to lay out the graph") from None
    except OSError as error:
        raise GraphvizError(f"cannot run 'dot': {error.strerror}") from None
    if done.returncode != 0:
        detail = done.stderr.strip().splitlines()[-1:] or [f"exit status {done.returncode}"]
        raise GraphvizError(f"'dot' failed: {detail[0]}")
    return done.stdout
