"""``pfuzz draw`` through click's test runner: DOT to stdout or a file, SVG and PNG via
``dot`` (a stand-in), SVG laid out by pfuzz without it, the format from the extension.

References: the standard library's XML parser reads the SVG pfuzz lays out itself; the
PNG signature is the one the PNG specification (ISO/IEC 15948) fixes."""

from __future__ import annotations

import os
import stat
import sys

from click.testing import CliRunner

from pfuzz.cli import main

FAKE_DOT = """#!{python}
import sys
text = sys.stdin.read()
assert sys.argv[1:] in (["-Tsvg"], ["-Tpng"]), sys.argv
if "FAIL" in text:
    sys.stderr.write("Error: syntax error in line 1\\n")
    sys.exit(1)
if sys.argv[1] == "-Tpng":
    sys.stdout.buffer.write(b"\\x89PNG\\r\\n\\x1a\\n" + str(text.count("->")).encode())
else:
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


def test_svg_without_graphviz_is_laid_out_by_pfuzz(tmp_path, monkeypatch):
    import xml.etree.ElementTree as ElementTree

    monkeypatch.setenv("PATH", str(tmp_path))
    result = CliRunner().invoke(main, ["draw", "--out", str(tmp_path / "x.svg"), "a[bc]"])
    assert result.exit_code == 0, result.output
    root = ElementTree.fromstring((tmp_path / "x.svg").read_text(encoding="utf-8"))
    circles = root.findall(".//{http://www.w3.org/2000/svg}circle")
    assert len(circles) == 3 + 1          # three states, the accepting one drawn twice
    assert "[bc]" in (tmp_path / "x.svg").read_text(encoding="utf-8")


def test_png_through_dot_or_a_clear_error(tmp_path, monkeypatch):
    monkeypatch.setenv("PATH", str(tmp_path))
    result = CliRunner().invoke(main, ["draw", "--out", str(tmp_path / "x.png"), "ab"])
    assert result.exit_code == 2
    assert "apt-get install graphviz" in result.output and "Traceback" not in result.output
    assert not (tmp_path / "x.png").exists()
    monkeypatch.setenv("PATH", fake_dot(tmp_path) + os.pathsep + os.environ["PATH"])
    result = CliRunner().invoke(main, ["draw", "--out", str(tmp_path / "x.png"), "ab"])
    assert result.exit_code == 0, result.output
    assert (tmp_path / "x.png").read_bytes().startswith(b"\x89PNG\r\n\x1a\n")


def test_an_unknown_extension_is_refused(tmp_path):
    result = CliRunner().invoke(main, ["draw", "--out", str(tmp_path / "x.jpg"), "ab"])
    assert result.exit_code == 2
    assert ".dot, .gv, .svg, .png" in result.output
    assert not (tmp_path / "x.jpg").exists()
