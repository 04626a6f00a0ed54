"""``pfuzz draw`` through click's test runner: DOT to stdout or a file, SVG via ``dot``."""

from __future__ import annotations

import os
import stat
import sys

from click.testing import CliRunner

from pfuzz.cli import main

FAKE_DOT = """#!{python}
import sys
text = sys.stdin.read()
assert sys.argv[1:] == ["-Tsvg"], sys.argv
if "FAIL" in text:
    sys.stderr.write("Error: syntax error in line 1\\n")
    sys.exit(1)
sys.stdout.write("<svg><!-- " + str(text.count("->")) + " edges --></svg>\\n")
"""


def fake_dot(directory) -> str:
    """A stand-in 'dot' on the PATH (Graphviz is not a test dependency)."""
    path = directory / "dot"
    path.write_text(FAKE_DOT.format(python=sys.executable))
    path.chmod(path.stat().st_mode | stat.S_IXUSR)
    return str(directory)


def test_dot_to_stdout():
    result = CliRunner().invoke(main, ["draw", "[a-z]{2}"])
    assert result.exit_code == 0
    assert result.output.startswith("digraph dfa {")
    assert "shape=doublecircle" in result.output and 'label="[a-z]"' in result.output


def test_dot_to_a_file(tmp_path):
    target = tmp_path / "out.dot"
    result = CliRunner().invoke(main, ["draw", "--out", str(target), "x+"])
    assert result.exit_code == 0
    assert target.read_text().startswith("digraph dfa {")


def test_svg_through_dot(tmp_path, monkeypatch):
    monkeypatch.setenv("PATH", fake_dot(tmp_path) + os.pathsep + os.environ["PATH"])
    target = tmp_path / "out.svg"
    result = CliRunner().invoke(main, ["draw", "--out", str(target), "[a-z]{2}"])
    assert result.exit_code == 0, result.output
    assert target.read_text() == "<svg><!-- 3 edges --></svg>\n"  # start arrow and two edges


def test_svg_without_graphviz_says_how_to_install_it(tmp_path, monkeypatch):
    monkeypatch.setenv("PATH", str(tmp_path))
    result = CliRunner().invoke(main, ["draw", "--out", str(tmp_path / "x.svg"), "ab"])
    assert result.exit_code == 2
    assert "apt-get install graphviz" in result.output and "Traceback" not in result.output
    assert not (tmp_path / "x.svg").exists()


def test_dot_failure_is_reported(tmp_path, monkeypatch):
    monkeypatch.setenv("PATH", fake_dot(tmp_path) + os.pathsep + os.environ["PATH"])
    result = CliRunner().invoke(main, ["draw", "--out", str(tmp_path / "x.svg"), "FAIL"])
    assert result.exit_code == 2
    assert "'dot' failed: Error: syntax error in line 1" in result.output


def test_bad_pattern_exits_2():
    result = CliRunner().invoke(main, ["draw", "(ab"])
    assert result.exit_code == 2 and "bad pattern" in result.output
