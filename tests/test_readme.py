"""Every Python code block of README.md runs as written, so the README's snippets keep working.

Each block runs in a fresh namespace with a scratch directory as the working directory (a
``profiles`` link there points at the repository's folder, for blocks that name its files).
Test functions a block defines are called too; ``my_validator``, the reader's own validator
in the README, is Python's ``re`` for the ticket pattern those tests use, and ``is_postcode``
the same for the demo profile's postcode; a test parametrised by ``pfuzz.pytest.cases`` is
called once per case.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
README = ROOT / "README.md"
FENCE = re.compile(r"^```python\n(.*?)^```", re.DOTALL | re.MULTILINE)
TICKET = r"[A-Z]{2}-[0-9]{4}"
POSTCODE = r"LV[1-9][0-9]? [0-9][A-HJ-NPR-Z]{2}"        # profiles/demo.toml, field postcode


def blocks() -> list[tuple[int, str]]:
    """(line of the block's first line of code, code) for every ```python block."""
    text = README.read_text(encoding="utf-8")
    return [(text.count("\n", 0, m.start(1)) + 1, m.group(1)) for m in FENCE.finditer(text)]


def my_validator(text: str) -> bool:
    return re.fullmatch(TICKET, text) is not None      # reference: Python's re


def is_postcode(text: str) -> bool:
    return re.fullmatch(POSTCODE, text) is not None    # reference: Python's re


def parameters(function) -> list[tuple]:
    """The argument tuples of a test parametrised with pytest.mark.parametrize, else [()]."""
    marks = [m for m in getattr(function, "pytestmark", []) if m.name == "parametrize"]
    return [tuple(p.values) for p in marks[0].args[1]] if marks else [()]


def test_the_readme_has_python_blocks():
    assert len(blocks()) >= 3


@pytest.mark.parametrize("line,code", blocks(), ids=[f"line {line}" for line, _ in blocks()])
def test_block_runs_as_written(line, code, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "profiles").symlink_to(ROOT / "profiles", target_is_directory=True)
    namespace = {"__name__": "readme", "my_validator": my_validator, "is_postcode": is_postcode}
    # padded so that a traceback names the README's own line numbers
    exec(compile("\n" * (line - 1) + code, str(README), "exec"), namespace)
    for name, value in list(namespace.items()):
        if name.startswith("test_") and callable(value):
            for arguments in parameters(value):
                value(*arguments)
