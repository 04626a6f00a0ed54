"""Tests for pfuzz.corpus.workbook: the corpus's qa.xlsx keeps every value as text.

References: the workbook's own XML (Office Open XML, ECMA-376: a cell's ``t`` attribute is
its type, an ``<f>`` element a formula), read with the standard library's zipfile and XML
parser; the exact values come from the corpus's JSON Lines files; Python's ``re`` says
which values the fields accept.
"""

from __future__ import annotations

import json
import re
import textwrap
import xml.etree.ElementTree as ElementTree
import zipfile

import pytest

from pfuzz.corpus.workbook import plain_reason, visible_text
from pfuzz.corpus.writer import write_corpus

MAIN = "{http://schemas.openxmlformats.org/spreadsheetml/2006/main}"
PROFILE = textwrap.dedent("""
    [profile]
    title = "Values a spreadsheet would change"
    [[field]]
    name = "formula"
    pattern = '=[1-9]\\+[1-9]'
    valid = 5
    invalid = 5
    [[field]]
    name = "exponent"
    pattern = '[1-9]E0[1-9]'
    valid = 5
    invalid = 5
    [[field]]
    name = "zeros"
    pattern = ' ?0{6}'
    valid = 5
    invalid = 5
    [[field]]
    name = "control"
    pattern = 'a[\\x00\\x1b]b'
    alphabet = "ascii"
    valid = 2
    invalid = 3
    [record]
    name = "row"
    columns = ["formula", "zeros"]
    valid_rows = 3
    invalid_rows = 3
""")


@pytest.fixture(scope="module")
def corpus(tmp_path_factory):
    folder = tmp_path_factory.mktemp("wb")
    (folder / "p.toml").write_text(PROFILE, encoding="utf-8")
    write_corpus(folder / "p.toml", folder / "corpus", seed=3)
    return folder / "corpus"


def sheets(path) -> dict[str, list[list[tuple[str | None, str]]]]:
    """Sheet name -> rows of (cell type, text), read from the XML itself."""
    with zipfile.ZipFile(path) as book:
        shared = [("".join(t.itertext())) for t in
                  ElementTree.fromstring(book.read("xl/sharedStrings.xml")).iter(f"{MAIN}si")] \
            if "xl/sharedStrings.xml" in book.namelist() else []
        names = [s.get("name") for s in
                 ElementTree.fromstring(book.read("xl/workbook.xml")).iter(f"{MAIN}sheet")]
        out = {}
        for i, name in enumerate(names, start=1):
            root = ElementTree.fromstring(book.read(f"xl/worksheets/sheet{i}.xml"))
            assert root.find(f".//{MAIN}f") is None                   # no formula anywhere
            rows = []
            for row in root.iter(f"{MAIN}row"):
                cells = []
                for c in row.iter(f"{MAIN}c"):
                    kind, v = c.get("t"), c.find(f"{MAIN}v")
                    text = shared[int(v.text)] if kind == "s" else "".join(c.itertext())
                    cells.append((kind, text))
                rows.append(cells)
            out[name] = rows
    return out


def test_every_value_is_a_text_cell_and_exact_where_the_format_allows(corpus):
    book = sheets(corpus / "qa.xlsx")
    assert list(book)[:5] == ["Read me", "control", "exponent", "formula", "zeros"]
    for name in ("control", "exponent", "formula", "zeros"):
        rows = book[name]
        assert all(kind in ("s", "inlineStr") for row in rows for kind, _ in row)
        exact = [json.loads(line)["text"]
                 for part in ("valid", "rejects", "boundary")
                 for line in (corpus / "fields" / name / f"{part}.jsonl").read_text(
                     encoding="utf-8").splitlines()]
        values = [row[1][1] for row in rows[1:]]
        if name == "control":
            # Characters outside XML 1.0's Char production (NUL, ESC, ...) cannot be stored:
            # they are shown as escapes; the JSONL keeps them exactly.
            shown = [re.sub(r"[\x00-\x08\x0b\x0c\x0e-\x1f]",
                            lambda m: f"\\x{ord(m.group()):02x}", t) for t in exact]
            assert values == shown and shown != exact
        else:
            assert values == exact
    formula_values = [row[1][1] for row in book["formula"][1:]]
    assert any(v.startswith("=") for v in formula_values)
    assert any(re.fullmatch(r"=[1-9]\+[1-9]", v) for v in formula_values)    # reference: re
    assert any(v == "000000" for v in (row[1][1] for row in book["zeros"][1:]))


def test_visible_whitespace_and_plain_reasons(corpus):
    book = sheets(corpus / "qa.xlsx")
    header = [text for _, text in book["zeros"][0]]
    assert header[:3] == ["case", "value", "value, whitespace shown"]
    for row in book["zeros"][1:]:
        value, shown = row[1][1], row[2][1]
        assert shown == (value.replace(" ", "·") or "(empty)")
    why = header.index("why")
    reasons = [row[why][1] for row in book["formula"][1:] if row[4][1] == "reject"]
    assert reasons and all(len(r) <= 60 for r in reasons)
    assert plain_reason([{"kind": "replace", "position": 5, "old": "0", "new": "O"}]) == \
        "'O' where '0' belongs, 6th character"
    assert visible_text("a\tb\u200b ") == "a→b\\u200b·"


def test_record_sheets_have_one_cell_per_column(corpus):
    book = sheets(corpus / "qa.xlsx")
    valid = book["row valid rows"]
    assert [t for _, t in valid[0]] == ["row_id", "formula", "zeros"]
    assert len(valid) == 4 and all(len(r) == 3 for r in valid)
    invalid = book["row invalid rows"]
    assert [t for _, t in invalid[0]][:3] == ["row_id", "formula", "zeros"]


def test_same_corpus_same_bytes(corpus, tmp_path):
    write_corpus(corpus.parent / "p.toml", tmp_path / "again", seed=3)
    assert (tmp_path / "again" / "qa.xlsx").read_bytes() == (corpus / "qa.xlsx").read_bytes()
    sums = (corpus / "SHA256SUMS").read_text(encoding="utf-8")
    assert "  qa.xlsx" in sums
