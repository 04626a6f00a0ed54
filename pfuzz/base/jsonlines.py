"""JSON and JSON Lines text, the one writer for corpora and command output.

JSON Lines: one JSON object per line, UTF-8 (``ensure_ascii=False``), keys sorted
unless the caller keeps a fixed order. JSON escapes every control character
below U+0020; the three characters that some line splitters also treat as line
ends (U+0085, U+2028, U+2029, for example Python's ``str.splitlines``) are
written as ``\\u`` escapes too, so one object is always one physical line.
"""

from __future__ import annotations

import json

from pfuzz.base.numbers import big_integers

__all__ = ["json_text", "jsonl_line", "jsonl_text", "read_jsonl"]

_LINE_BREAKERS = {"\u0085": "\\u0085", "\u2028": "\\u2028", "\u2029": "\\u2029"}


_LINE_ENCODER = json.JSONEncoder(ensure_ascii=False, sort_keys=True)


def json_text(value, indent: int | None = None, sort_keys: bool = True) -> str:
    """Deterministic JSON: sorted keys (or the caller's fixed order), UTF-8 text, no raw
    line-breaking characters."""
    with big_integers():  # exact counts of any size
        if indent is None and sort_keys:
            text = _LINE_ENCODER.encode(value)
        else:
            text = json.dumps(value, ensure_ascii=False, sort_keys=sort_keys, indent=indent)
    for char, escape in _LINE_BREAKERS.items():
        text = text.replace(char, escape)
    return text


def jsonl_line(row) -> str:
    """One JSON Lines record: the object and its line end."""
    return json_text(row) + "\n"


def jsonl_text(rows) -> str:
    return "".join(jsonl_line(row) for row in rows)


def read_jsonl(text: str) -> list:
    return [json.loads(line) for line in text.split("\n") if line]
