"""The HTML report: one self-contained page per profile, pattern or audit.

What a field's section holds: the pattern and its meaning in words
(``pfuzz.report.words``), the facts of its minimal DFA, the counts by length as a
chart and the automaton drawn (``pfuzz.report.charts``; a summary past the drawing
limit), and the valid strings, near-miss rejects and boundary cases in one table that
filters by kind, verdict and text, every value shown with its whitespace and invisible
characters made visible (a space as ``·``, a tab as ``→``, other invisible characters
as their ``\\uXXXX`` escape, each marked and named in its tooltip) and the edit of a
reject highlighted. An audit adds its evidence, the exceptions the validator raised and
the disagreements grouped by cause, each with its witness and edit.

Self-contained: the styles, the few lines of script (filtering) and the pictures are
inline; the page loads nothing from the network and works from a file.

Why Jinja2: the values shown are hostile on purpose (``<script>``, quotes, control
characters); Jinja2 escapes every value by default, so a forgotten escape cannot turn a
test string into markup, and the page's layout stays readable as a template
(``pfuzz.report.template``) rather than string concatenation.

Cost: a section per field: one sample, one reject draw, one boundary suite (or the
files of a corpus), one layout; tables are cut at ``ROW_LIMIT`` rows per field, and the
page says so.
"""

from __future__ import annotations

import re
import unicodedata
from dataclasses import dataclass, field as dataclass_field
from pathlib import Path

from pfuzz import __version__
from pfuzz.base.files import write_atomic
from pfuzz.base.numbers import number_text

__all__ = ["ROW_LIMIT", "FieldView", "visible", "field_view", "corpus_views", "render",
           "write_report", "write_audit_page"]

#: Rows of a field's case table shown in the page.
ROW_LIMIT = 1000
#: Cases of each kind drawn for a field when no corpus is given.
DEFAULT_CASES = 100
_SHOWN = {" ": ("·", "space"), "\t": ("→", "tab"), "\n": ("↵", "line feed"),
          "\r": ("␍", "carriage return")}
_AT = re.compile(r" at (\d+)$")


@dataclass
class FieldView:
    """Everything a field's section shows."""

    name: str
    pattern: str
    about: str = ""
    words: str = ""
    facts: list[tuple[str, str]] = dataclass_field(default_factory=list)
    counts_svg: str = ""
    automaton_svg: str | None = None
    depth_table: list[tuple[int, int]] = dataclass_field(default_factory=list)
    rows: list[dict] = dataclass_field(default_factory=list)
    cut: int = 0


# -- visible text -------------------------------------------------------------------------

def visible(text: str, marks: "set[int] | None" = None, gap: "set[int] | None" = None):
    """``text`` as HTML with whitespace and invisible characters shown, the characters at
    ``marks`` highlighted and a deletion marker before each position in ``gap``."""
    from markupsafe import Markup, escape

    marks, gap = marks or set(), gap or set()
    out = []
    for i, ch in enumerate(text):
        if i in gap:
            out.append('<span class="gap" title="a character was deleted here">⌃</span>')
        piece = _char(ch, i, len(text), escape)
        out.append(f'<mark>{piece}</mark>' if i in marks else piece)
    if len(text) in gap:
        out.append('<span class="gap" title="a character was deleted here">⌃</span>')
    return Markup("".join(out) or '<span class="empty">(empty)</span>')


def _char(ch: str, i: int, n: int, escape) -> str:
    if ch in _SHOWN:
        sign, name = _SHOWN[ch]
        edge = " edge" if ch == " " and (i == 0 or i == n - 1) else ""
        return f'<span class="ws{edge}" title="{name}">{sign}</span>'
    if ch.isprintable() and not unicodedata.category(ch).startswith(("Z", "C")):
        return str(escape(ch))
    point = ord(ch)
    code = f"\\x{point:02x}" if point <= 0xFF else (
        f"\\u{point:04x}" if point <= 0xFFFF else f"\\U{point:08x}")
    name = unicodedata.name(ch, "control character")
    return f'<span class="ctl" title="U+{point:04X} {escape(name)}">{code}</span>'


def _edit_marks(edits) -> tuple[set[int], set[int]]:
    """Positions to highlight and deletion points, from Edit objects, dicts or text."""
    marks, gaps = set(), set()
    for e in edits or ():
        if isinstance(e, str):
            found = _AT.search(e)
            if not found:
                continue
            kind, position, new = e.split(" ", 1)[0], int(found[1]), "x"
        else:
            e = e if isinstance(e, dict) else e.as_dict()
            kind, position, new = e["kind"], e["position"], e.get("new") or ""
        if kind == "delete":
            gaps.add(position)
        else:
            marks.update(range(position, position + max(len(new), 2 if kind == "swap" else 1)))
    return marks, gaps


def _edits_text(edits) -> str:
    return "; ".join(e if isinstance(e, str) else str(e) if not isinstance(e, dict)
                     else f"{e['kind']} at {e['position']}" for e in edits or ())


def case_row(kind: str, text: str, expected: bool, reason: str = "", witness=None,
             edits=()) -> dict:
    marks, gaps = _edit_marks(edits) if not expected else (set(), set())
    return {"kind": kind, "text": visible(text, marks, gaps), "raw": text, "length": len(text),
            "expected": "accept" if expected else "reject", "reason": reason,
            "witness": visible(witness) if witness is not None else "",
            "edits": _edits_text(edits)}


# -- field sections --------------------------------------------------------------------------

def field_view(language, name: str, pattern: str | None, *, about: str = "", flags: int = 0,
               valid: int = DEFAULT_CASES, rejects: int = DEFAULT_CASES, seed: int = 0,
               distance: int = 1, kinds=None, cases: "list[dict] | None" = None) -> FieldView:
    """The section of one field: ``cases`` (rows of ``case_row``) or freshly drawn ones."""
    from pfuzz.report.charts import automaton_svg, counts_svg
    from pfuzz.report.words import describe

    view = FieldView(name=name, pattern=pattern or "(derived language)", about=about,
                     words=describe(pattern, flags, language.alphabet) if pattern else "")
    if language.is_empty():
        view.facts = [("strings", "none: the language is empty")]
        return view
    low = language.min_length
    high = language.max_length if language.is_finite() else language.counter.default_max_length()
    counts = language.counts(low, high)
    view.facts = _facts(language, low, high, counts)
    view.counts_svg = counts_svg(counts)
    view.automaton_svg = automaton_svg(language.dfa)
    if view.automaton_svg is None:
        view.depth_table = _depth_table(language.dfa)
    if cases is None:
        cases = _drawn_cases(language, valid, rejects, seed, distance, kinds)
    view.rows, view.cut = cases[:ROW_LIMIT], max(0, len(cases) - ROW_LIMIT)
    return view


def _facts(language, low: int, high: int, counts: dict) -> list[tuple[str, str]]:
    total = sum(counts.values())
    finite = language.is_finite()
    return [("alphabet", language.alphabet_name),
            ("states", f"{language.states:,} (minimal DFA, dead state not counted)"),
            ("lengths", f"{low} to {high}" if finite else f"{low} and up (shown to {high})"),
            ("strings", number_text(total) if finite
             else f"infinitely many ({number_text(total)} up to length {high})")]


def _depth_table(dfa) -> list[tuple[int, int]]:
    from collections import Counter

    from pfuzz.report.charts import depths

    return sorted(Counter(d for d in depths(dfa) if d >= 0).items())


def _drawn_cases(language, valid, rejects, seed, distance, kinds) -> list[dict]:
    from pfuzz.base.randomness import RandomSource

    import warnings

    from pfuzz.errors import PfuzzWarning

    root = RandomSource(seed)
    seeds = root.child_seed(), root.child_seed()
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", PfuzzWarning)     # fewer strings exist: all are shown
        drawn = language.sample(valid, seed=seeds[0], unique=True)
    rows = [case_row("valid", t, True, "drawn uniformly by length")
            for t in sorted(drawn, key=lambda t: (len(t), t))]
    if rejects and not language.near_misses(distance, kinds).is_empty():
        rows += [case_row("near-miss", r.text, False, "/".join(r.kinds) or "mixed kinds",
                          r.witness, r.edits)
                 for r in language.rejects(rejects, distance=distance, kinds=kinds,
                                           seed=seeds[1])]
    rows += [case_row("boundary", c.text, c.expected, c.reason, c.witness, c.edits)
             for c in language.boundary_cases()]
    return rows


def profile_views(profile, seed: int | None = None) -> list[FieldView]:
    """One section per field of a loaded profile, cases drawn with the profile's seed."""
    chosen = seed if seed is not None else (profile.seed or 0)
    return [field_view(f.language(), f.name, f.pattern, about=f.about, flags=f.flag_bits,
                       valid=min(f.valid, DEFAULT_CASES), rejects=min(f.invalid, DEFAULT_CASES),
                       seed=chosen, distance=f.distance, kinds=list(f.edits))
            for f in profile.fields]


def corpus_views(profile, out_dir: "str | Path") -> list[FieldView]:
    """One section per field, showing exactly the cases a written corpus holds."""
    base = Path(out_dir) / "fields"
    views = []
    for f in profile.fields:
        rows = [case_row("valid", r["text"], True, "drawn uniformly by length")
                for r in _jsonl(base / f.name / "valid.jsonl")]
        rows += [case_row("near-miss", r["text"], False, "/".join(r.get("kinds") or []),
                          r.get("witness"), r.get("edits")) for r in _jsonl(base / f.name / "rejects.jsonl")]
        rows += [case_row("boundary", r["text"], r["expected"] == "accept", r.get("reason", ""),
                          r.get("witness"), r.get("edits"))
                 for r in _jsonl(base / f.name / "boundary.jsonl")]
        views.append(field_view(f.language(), f.name, f.pattern, about=f.about,
                                flags=f.flag_bits, cases=rows))
    return views


def _jsonl(path: Path) -> list[dict]:
    """The rows of a corpus's JSON Lines file (none when the file is missing)."""
    from pfuzz.base.jsonlines import read_jsonl

    return read_jsonl(path.read_text(encoding="utf-8")) if path.is_file() else []


# -- the audit ------------------------------------------------------------------------------

def audit_view(report: dict) -> dict:
    """The audit part of the page, from the audit's JSON report dictionary."""
    from pfuzz.report.ci import cause_groups

    groups = []
    for g in cause_groups(report):
        kind = g.get("kind") or (f"the {g['difference_source']}'s difference language"
                                 if g.get("difference_source") else "cases")
        rows = [case_row("finding", m["text"], m["expected"] == "accept", m.get("reason") or "",
                         m.get("witness"), m.get("edits")) for m in g["members"]]
        groups.append({"title": f"{g['direction']}: {kind}", "size": g.get("size", len(rows)),
                       "pattern": g.get("difference_pattern") or g.get("own_pattern"),
                       "rows": rows})
    return {"evidence": (report.get("evidence") or {}).get("sentence", ""),
            "agrees": report.get("agrees"), "validator": report.get("validator", ""),
            "specification": report.get("specification", ""),
            "exceptions": report.get("exceptions") or [], "groups": groups,
            "summary": [r for r in report.get("summary") or [] if r.get("category") != "total"]}


# -- the page -------------------------------------------------------------------------------

def render(title: str, views: list[FieldView], audit: dict | None = None, about: str = "") -> str:
    """The whole page as one string."""
    import jinja2

    from pfuzz.report.template import TEMPLATE

    environment = jinja2.Environment(autoescape=True, undefined=jinja2.StrictUndefined,
                                     trim_blocks=True, lstrip_blocks=True)
    return environment.from_string(TEMPLATE).render(
        title=title, about=about, views=views, audit=audit, version=__version__,
        row_limit=ROW_LIMIT)


def write_report(out: "str | Path", title: str, views: list[FieldView],
                 audit_report: dict | None = None, about: str = "") -> None:
    """Write the page atomically."""
    audit = audit_view(audit_report) if audit_report is not None else None
    write_atomic(Path(out), render(title, views, audit, about))


def write_audit_page(out: "str | Path", language, report: dict, profile=None,
                     field: str | None = None) -> None:
    """The page of an audit: the specification's section and the findings."""
    spec = report.get("specification", "")
    pattern = language.pattern
    name = field or (spec.rpartition(" field ")[2] if " field " in spec else "specification")
    view = field_view(language, name, pattern)
    write_report(out, f"pfuzz audit: {spec}", [view], report)
