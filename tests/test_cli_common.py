"""Shared command-line behaviour: errors, hints and escaping."""

from click.testing import CliRunner

from pfuzz.cli import main
from pfuzz.cli.common import escape_text, needs_escape


def run(*args):
    return CliRunner().invoke(main, list(args))


def test_empty_language_because_of_the_universe_gets_a_hint():
    result = run("sample", "é+", "-n", "2")
    assert result.exit_code == 2
    assert "language is empty" in result.stderr
    assert "outside the universe 'printable'" in result.stderr
    assert "Traceback" not in result.output


def test_truly_empty_language_gets_no_universe_hint():
    result = run("sample", "a(?!a)a", "-n", "2")
    assert result.exit_code == 2
    assert "outside the universe" not in result.stderr


def test_empty_near_miss_language_of_a_non_empty_pattern_gets_no_universe_hint():
    # '.*' accepts every string over printable (no newline in it), so nothing is a near miss;
    # the pattern itself is not empty over the universe, so the hint would be false.
    result = run("reject", ".*", "-n", "2")
    assert result.exit_code == 2
    assert "no near-miss rejects" in result.stderr
    assert "outside the universe" not in result.stderr


def test_escape_text_round_trips_through_python_literal_syntax():
    for text in ["plain", "tab\there", "new\nline", "back\\slash", "nul\x00", "zw\u200bsp"]:
        escaped = escape_text(text)
        assert "\n" not in escaped and "\t" not in escaped
        assert needs_escape(text) == (escaped != text)
        # the escapes are Python's own (unicode_escape), so a literal reads them back
        assert eval("'" + escaped.replace("'", "\\'") + "'") == text
