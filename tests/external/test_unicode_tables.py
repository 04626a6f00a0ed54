"""The shipped Unicode tables agree with re, for every code point, on every interpreter at hand.

Each shipped table module is checked by each interpreter of its Python minor version and
Unicode version found on this machine (the running one, ``python3.X`` on PATH, the system's
``/usr/bin/python3.X`` and pyenv's versions), in a subprocess that loads the standard-library
scan and the data module by path, so no third-party package is needed there. References:

- Python's ``re`` of that interpreter, for every code point (``scan.problems``: ``\\d*``
  matches the whole string of a table's members and ``\\d`` nothing among the rest, likewise
  ``\\D``; the case set equals what ``_sre``, re's engine, reports);
- the ``re`` documentation's definitions: ``\\d`` is Unicode category Nd, ``\\w`` is
  ``str.isalnum()`` or the underscore, ``\\s`` is ``str.isspace()``; under re.ASCII
  ``[0-9]``, ``[a-zA-Z0-9_]`` and ``[ \\t\\n\\r\\f\\v]``.
"""

from __future__ import annotations

import functools
import glob
import json
import os
import shutil
import subprocess
import sys
import unicodedata
from pathlib import Path

import pytest

from pfuzz.syntax import unicode_tables
from pfuzz.syntax.unicode_tables import generate, scan

HERE = Path(unicode_tables.__file__).parent

_PROBE = "import sys, unicodedata; print(sys.version_info[0], sys.version_info[1], " \
         "unicodedata.unidata_version, sys.version.split()[0], sys.base_prefix)"

_VERIFY = '''
import importlib.util, json, string, sys, unicodedata

def load(name, path):
    spec = importlib.util.spec_from_file_location(name, path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module

scan, table = load("scan", sys.argv[1]), load("table", sys.argv[2])
found = scan.problems(vars(table))
# Reference: the re documentation's definition of each category.
documented = {
    "DIGIT": lambda c: unicodedata.category(c) == "Nd",
    "WORD": lambda c: c.isalnum() or c == "_",
    "SPACE": str.isspace,
    "ASCII_DIGIT": lambda c: c in string.digits,
    "ASCII_WORD": lambda c: c in string.ascii_letters + string.digits + "_",
    "ASCII_SPACE": lambda c: c in " \\t\\n\\r\\f\\v",
}
for name, test in documented.items():
    members = {p for low, high in scan.pairs(getattr(table, name)) for p in range(low, high + 1)}
    if members != {p for p in range(sys.maxunicode + 1) if test(chr(p))}:
        found.append(name + " differs from the documented definition")
print(json.dumps(found))
'''


def _candidates() -> set[str]:
    found = {sys.executable, "/usr/bin/python3"}
    for name in unicode_tables.shipped():
        minor = name.split("_")[1]
        found.update(filter(None, [shutil.which(f"python3.{minor}"), f"/usr/bin/python3.{minor}"]))
        pyenv = os.environ.get("PYENV_ROOT", os.path.expanduser("~/.pyenv"))
        found.update(glob.glob(os.path.join(pyenv, "versions", f"3.{minor}.*", "bin", "python3")))
    return {path for path in found if os.path.exists(path)}


@functools.cache
def interpreters() -> dict[str, list[tuple[str, str]]]:
    """Table module name -> [(executable, full version)] of the interpreters on this machine."""
    by_table: dict[str, list[tuple[str, str]]] = {}
    seen = set()
    for path in sorted(_candidates()):
        try:
            probe = subprocess.run([path, "-I", "-B", "-c", _PROBE], capture_output=True, text=True,
                                   timeout=30, check=True).stdout.split(maxsplit=4)
        except (OSError, subprocess.SubprocessError, ValueError):
            continue                    # e.g. a pyenv shim for a version not enabled
        major, minor, unicode, full, base = probe
        key = (os.path.realpath(base), full)         # a virtual environment is its base
        if key not in seen:
            seen.add(key)
            name = unicode_tables.module_name((int(major), int(minor)), unicode)
            by_table.setdefault(name, []).append((path, full))
    return by_table


def verify(interpreter: str, table: Path) -> list[str]:
    """What ``interpreter`` finds wrong with the table module at ``table``."""
    command = [interpreter, "-I", "-B", "-c", _VERIFY, str(HERE / "scan.py"), str(table)]
    done = subprocess.run(command, capture_output=True, text=True, timeout=300, check=False)
    assert done.returncode == 0, done.stderr
    return json.loads(done.stdout)


@pytest.mark.parametrize("name", unicode_tables.shipped())
def test_each_shipped_table_agrees_with_re_on_every_interpreter_of_its_version(name):
    found = interpreters().get(name)
    if not found:
        pytest.skip(f"no interpreter for {name} on this machine")
    for path, full in found:
        assert verify(path, HERE / f"{name}.py") == [], (path, full)


def test_the_check_refuses_a_table_missing_a_range(tmp_path):
    name = unicode_tables.module_name(sys.version_info[:2], unicodedata.unidata_version)
    if name not in unicode_tables.shipped():
        pytest.skip(f"no table shipped for {name}")
    # Reference: re; U+00AA FEMININE ORDINAL INDICATOR is a letter, so \w matches it.
    source = (HERE / f"{name}.py").read_text(encoding="utf-8")
    assert "0xAA, 0xAA," in source
    (tmp_path / "table.py").write_text(source.replace("0xAA, 0xAA,", "", 1), encoding="utf-8")
    found = verify(sys.executable, tmp_path / "table.py")
    assert "WORD: \\w does not match every member" not in found
    assert "WORD: \\w also matches U+00AA" in found
    assert "WORD differs from the documented definition" in found
    assert not any(problem.startswith(("DIGIT", "SPACE", "ASCII", "CASE")) for problem in found)


def test_supported_versions_each_have_a_table():
    # Reference: the package's supported versions (requires-python >= 3.11); 3.11, 3.12 and
    # 3.13 ship Unicode 14.0.0, 15.0.0 and 15.1.0 (unicodedata.unidata_version of each).
    assert set(unicode_tables.shipped()) >= {"python3_11_unicode14_0_0",
                                             "python3_12_unicode15_0_0",
                                             "python3_13_unicode15_1_0"}


def test_the_running_interpreter_uses_its_table_and_its_key_matches():
    table = unicode_tables.current()
    name = unicode_tables.module_name(sys.version_info[:2], unicodedata.unidata_version)
    if name not in unicode_tables.shipped():
        assert table is None
        pytest.skip(f"no table shipped for {name}: the scan serves")
    assert table.__name__.endswith(name)
    assert (table.PYTHON, table.UNICODE) == (sys.version_info[:2], unicodedata.unidata_version)
    assert scan.problems(vars(table)) == []


def test_without_a_table_the_scan_serves_and_agrees_with_re(monkeypatch):
    monkeypatch.setattr(unicode_tables, "current", lambda: None)
    tables = {name: scan.flat(unicode_tables.ranges(name)) for name in scan.TABLE_NAMES}
    key = {"PYTHON": sys.version_info[:2], "UNICODE": unicodedata.unidata_version}
    assert scan.problems({**tables, **key}) == []


def test_problems_names_a_wrong_table():
    # Reference: re; U+00B2 SUPERSCRIPT TWO is \w (alphanumeric) but not \d.
    table = {name: scan.flat(scan.compute(name)) for name in scan.TABLE_NAMES}
    table.update(PYTHON=sys.version_info[:2], UNICODE=unicodedata.unidata_version)
    digits = table["DIGIT"]
    wrong = {**table, "DIGIT": digits + (0x10FFFF, 0x10FFFF), "SPACE": (0x20, 0x10),
             "CASE_SENSITIVE": table["CASE_SENSITIVE"][2:], "UNICODE": "0.0.0"}
    found = scan.problems(wrong)
    assert any("interpreter is" in problem for problem in found)
    assert "DIGIT: \\d does not match every member" in found
    assert any(problem.startswith("SPACE: ranges not sorted") for problem in found)
    assert any(problem.startswith("CASE_SENSITIVE:") for problem in found)
    assert not any(problem.startswith(("WORD", "ASCII_")) for problem in found)


def test_generator_writes_the_shipped_bytes_and_check_refuses_a_changed_table(tmp_path, capsys):
    name = unicode_tables.module_name(sys.version_info[:2], unicodedata.unidata_version)
    if name not in unicode_tables.shipped():
        pytest.skip(f"no table shipped for {name}")
    shipped = (HERE / f"{name}.py").read_text(encoding="utf-8")
    changed = shipped.replace("0x30, 0x39,", "0x30, 0x38,", 1)
    (tmp_path / f"{name}.py").write_text(changed, encoding="utf-8")
    assert generate.main(["--check", "--directory", str(tmp_path)]) == 1
    assert generate.main(["--directory", str(tmp_path)]) == 0
    assert (tmp_path / f"{name}.py").read_bytes() == (HERE / f"{name}.py").read_bytes()
    assert generate.main(["--check", "--directory", str(tmp_path)]) == 0
    capsys.readouterr()
