"""The QA workbook of a corpus (``qa.xlsx``): the cases as a spreadsheet that is safe to open.

Why a workbook besides ``cases.csv``: a spreadsheet program reading a CSV guesses each
value's type, so ``1E06`` becomes 1.00E+06, ``000000`` becomes 0, ``3-4`` a date, and a
value beginning with ``=``, ``+``, ``-`` or ``@`` runs as a formula; leading and trailing
spaces cannot be seen. Here every value is a text cell, its type set explicitly
(``data_type = "s"``, number format ``@``), so nothing is converted or evaluated; a
column shows each value with its whitespace made visible (``·`` for a space, ``→`` for a
tab, ``↵`` for a line feed, ``\\uXXXX`` for other invisible characters); reasons are short
and plain ("'O' where '0' belongs, 6th character"), the technical reason in a column of
its own.

Sheets: "Read me" (what each sheet and column holds), one sheet per field (its valid
strings, near-miss rejects and boundary cases), and per record one sheet of valid rows
and one of invalid rows with one cell per column. The Office Open XML format cannot
hold most control characters (NUL, ESC, ...): such values are written with visible
escapes and the value column's note says so; the exact values stay in ``cases.csv`` and
the JSON Lines files, which are the files to feed to programs.

Reproducible: the workbook's creation time and every member's zip date are fixed, so
the same corpus gives the same bytes. Needs openpyxl (the ``pfuzz[report]`` extra);
without it the corpus is written without the workbook and the writer says so.

Cost: the whole workbook is built in memory (openpyxl keeps every cell): about 1 KB a
case, so a corpus of 10^5 cases needs some 100 MB; ``MAX_ROWS`` caps each sheet.
"""

from __future__ import annotations

import csv
import io
import json
import re
import unicodedata
import zipfile
from pathlib import Path

from pfuzz.base.escaping import escape_text

__all__ = ["WORKBOOK_NAME", "MAX_ROWS", "available", "plain_reason", "visible_text",
           "workbook_bytes"]

WORKBOOK_NAME = "qa.xlsx"
#: Rows per sheet (a spreadsheet holds 1,048,576; the rest stay in the CSV and JSONL files).
MAX_ROWS = 100_000
FIELD_COLUMNS = ("case", "value", "value, whitespace shown", "length", "expected", "why",
                 "nearest valid value", "technical reason", "edits")
_FIXED_TIME = "2000-01-01T00:00:00Z"
_ILLEGAL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f]")
_SHOWN = {" ": "·", "\t": "→", "\n": "↵", "\r": "␍"}
_ORDINAL = {1: "st", 2: "nd", 3: "rd"}
_BOUNDARY = {"below": "a character just below an allowed range",
             "above": "a character just above an allowed range",
             "low": "the lowest character of an allowed range",
             "high": "the highest character of an allowed range",
             "one-more": "one character too many", "one-fewer": "one character too few",
             "shorter": "one character shorter than allowed",
             "longer": "one character longer than allowed",
             "outside": "a character that is not allowed there"}
_CATEGORY = {"shortest": "the shortest valid value", "longest": "the longest valid value",
             "length-edge": "at the edge of the allowed lengths",
             "coverage": "a valid value that takes many paths of the format"}
NOTE = ("Characters a spreadsheet cannot hold (control characters such as NUL or ESC) are "
        "shown as escapes like \\x00 here; the exact values are in cases.csv and the JSON "
        "Lines files.")


def available() -> bool:
    """Whether openpyxl is installed (the ``pfuzz[report]`` extra)."""
    try:
        import openpyxl  # noqa: F401
    except ImportError:
        return False
    return True


def visible_text(text: str) -> str:
    """``text`` with whitespace and invisible characters shown as signs or escapes."""
    return _LOOKED_AT.sub(_visible, text) or "(empty)"


_LOOKED_AT = re.compile("[^!-~]+")  # visible ASCII stays as it is


def _visible(match: re.Match) -> str:
    out = []
    for ch in match.group():
        if ch in _SHOWN:
            out.append(_SHOWN[ch])
        elif ch.isprintable() and not unicodedata.category(ch).startswith(("Z", "C")):
            out.append(ch)
        else:
            out.append(escape_text(ch))
    return "".join(out)


def _cell_text(text: str) -> str:
    """The value itself, with only the characters the format cannot hold escaped."""
    return _ILLEGAL.sub(lambda m: escape_text(m.group()), text)


def _ordinal(n: int) -> str:
    return f"{n}{'th' if 10 <= n % 100 <= 20 else _ORDINAL.get(n % 10, 'th')}"


def plain_reason(edits: list, category: str = "", kind: str = "", expected: bool = False) -> str:
    """A short reason in plain words, from an edit script (dicts) or a boundary kind."""
    if edits:
        return "; ".join(_plain_edit(e) for e in edits)
    if kind in _BOUNDARY:
        return _BOUNDARY[kind]
    if category in _CATEGORY:
        return _CATEGORY[category]
    return "valid: must be accepted" if expected else "must be rejected"


def _plain_edit(edit: dict) -> str:
    kind, where = edit["kind"], _ordinal(edit["position"] + 1)
    old, new = visible_text(edit.get("old") or ""), visible_text(edit.get("new") or "")
    if kind == "delete":
        return f"'{old}' missing, {where} character"
    if kind == "insert":
        return f"extra '{new}', {where} character"
    if kind == "replace":
        return f"'{new}' where '{old}' belongs, {where} character"
    return f"'{old}' swapped, {where} and next character"


def workbook_bytes(folder: "str | Path", title: str = "") -> bytes:
    """The workbook of the corpus written (or staged) in ``folder``."""
    from openpyxl import Workbook
    from openpyxl.comments import Comment

    folder = Path(folder)
    book = Workbook()
    about = book.active
    about.title = "Read me"
    _read_me(about, title)
    for field in sorted(p.name for p in (folder / "fields").iterdir()) \
            if (folder / "fields").is_dir() else []:
        sheet = book.create_sheet(_sheet_name(field, book))
        _rows(sheet, FIELD_COLUMNS, _field_rows(folder / "fields" / field), Comment)
    for record in sorted(p.name for p in (folder / "records").iterdir()) \
            if (folder / "records").is_dir() else []:
        for part in ("valid", "invalid"):
            path = folder / "records" / record / f"{part}.csv"
            if path.is_file():
                header, rows = _csv_rows(path)
                sheet = book.create_sheet(_sheet_name(f"{record} {part} rows", book))
                _rows(sheet, header, rows, Comment)
    book.properties.creator = "pfuzz"
    buffer = io.BytesIO()
    book.save(buffer)
    return _fixed(buffer.getvalue())


def _read_me(sheet, title: str) -> None:
    lines = [_cell_text(title) if title else "pfuzz corpus", "",
             "Hand this workbook to people who test by hand: one sheet per field, one per "
             "table of record rows. Every cell is text: nothing is converted to a number or "
             "a date, and nothing runs as a formula.",
             "The 'value, whitespace shown' column shows a space as ·, a tab as →, a line "
             "feed as ↵ and other invisible characters as escapes such as \\u200b.",
             "'why' says in plain words what makes a value invalid; 'technical reason' says "
             "it in the automaton's terms.", NOTE,
             "Hand cases.csv or the JSON Lines files (fields/NAME/*.jsonl) to programs and "
             "test code: they hold every value exactly."]
    for i, line in enumerate(lines, start=1):
        _text(sheet.cell(row=i, column=1), line)
    sheet.column_dimensions["A"].width = 110


def _sheet_name(name: str, book) -> str:
    base = re.sub(r"[\[\]:*?/\\]", "_", name)[:31]
    taken = set(book.sheetnames)
    candidate, n = base, 2
    while candidate in taken:
        candidate = f"{base[:28]}~{n}"
        n += 1
    return candidate


def _text(cell, value: str) -> None:
    cell.value = value
    cell.data_type = "s"            # never a formula, number or date, whatever it looks like
    cell.number_format = "@"


def _rows(sheet, header, rows, comment_class) -> None:
    from openpyxl.styles import Font

    for j, name in enumerate(header, start=1):
        cell = sheet.cell(row=1, column=j)
        _text(cell, name)
        cell.font = Font(bold=True)
        if name in ("value", "nearest valid value") or (header is not FIELD_COLUMNS
                                                        and name != "row_id"):
            cell.comment = comment_class(NOTE, "pfuzz")
    for i, row in enumerate(rows, start=2):
        if i > MAX_ROWS + 1:
            break
        for j, value in enumerate(row, start=1):
            _text(sheet.cell(row=i, column=j), _cell_text(str(value)))
    sheet.freeze_panes = "A2"
    for j, name in enumerate(header, start=1):
        letter = sheet.cell(row=1, column=j).column_letter
        sheet.column_dimensions[letter].width = 34 if "value" in name or name in ("why",
                                                                                  "technical reason") else 14


def _field_rows(base: Path):
    for part in ("valid", "rejects", "boundary"):
        path = base / f"{part}.jsonl"
        if not path.is_file():
            continue
        with path.open(encoding="utf-8", newline="") as handle:
            for line in handle:
                if line.strip():
                    yield _field_row(json.loads(line), part)


def _field_row(row: dict, part: str) -> tuple:
    text = row["text"]
    expected = part == "valid" or row.get("expected") == "accept"
    edits = row.get("edits") or []
    technical = {"valid": "drawn uniformly by length",
                 "rejects": f"near miss: {'/'.join(row.get('kinds') or []) or 'mixed'} edit"}
    reason = row.get("reason") or technical.get(part, "")
    why = plain_reason(edits if isinstance(edits, list) and edits and isinstance(edits[0], dict)
                       else [], row.get("category", ""), row.get("kind", ""), expected)
    script = row.get("script") or [e if isinstance(e, str) else "" for e in edits]
    return (row.get("id", ""), text, visible_text(text), len(text),
            "accept" if expected else "reject", why, row.get("witness") or "", reason,
            "; ".join(s for s in script if s))


def _csv_rows(path: Path) -> tuple[list[str], list[list[str]]]:
    with path.open(encoding="utf-8", newline="") as handle:
        rows = list(csv.reader(handle))
    return (rows[0], rows[1:]) if rows else ([], [])


def _fixed(data: bytes) -> bytes:
    """The same workbook with its timestamps fixed, so equal corpora give equal bytes."""
    source = zipfile.ZipFile(io.BytesIO(data))
    out = io.BytesIO()
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as target:
        for info in source.infolist():
            body = source.read(info.filename)
            if info.filename == "docProps/core.xml":
                body = re.sub(rb"(<dcterms:(created|modified)[^>]*>)[^<]*",
                              lambda m: m.group(1) + _FIXED_TIME.encode(), body)
            fixed = zipfile.ZipInfo(info.filename, date_time=(1980, 1, 1, 0, 0, 0))
            fixed.compress_type = zipfile.ZIP_DEFLATED
            fixed.external_attr = 0o644 << 16
            target.writestr(fixed, body)
    return out.getvalue()
