"""Shared command-line behaviour: errors, hints and escaping."""

from click.testing import CliRunner

from pfuzz.cli import main
from pfuzz.base.escaping import escape_text, needs_escape


def run(*args):
    return CliRunner().invoke(main, list(args))


def test_empty_language_because_of_the_alphabet_gets_a_hint():
    result = run("sample", "é+", "-n", "2")
    assert result.exit_code == 2
    assert "language is empty" in result.stderr
    assert "outside the alphabet 'printable'" in result.stderr
    assert "Traceback" not in result.output


def test_truly_empty_language_gets_no_alphabet_hint():
    result = run("sample", "a(?!a)a", "-n", "2")
    assert result.exit_code == 2
    assert "outside the alphabet" not in result.stderr


def test_empty_near_miss_language_of_a_non_empty_pattern_gets_no_alphabet_hint():
    # '.*' accepts every string over printable (no newline in it), so nothing is a near miss;
    # the pattern itself is not empty over the alphabet, so the hint would be false.
    result = run("reject", ".*", "-n", "2")
    assert result.exit_code == 2
    assert "no near-miss rejects" in result.stderr
    assert "outside the alphabet" not in result.stderr


def test_a_count_beyond_memory_is_one_line_not_a_traceback():
    for command in ("sample", "reject"):
        # 10**15 int64 lengths are 8 PB, more than a 64-bit process can map (common practice:
        # 47-bit user address space), so the allocation fails whatever the overcommit policy
        result = run(command, "[a-z]", "-n", str(10**15))
        assert result.exit_code == 2, command
        assert "not enough memory" in result.stderr
        assert "Traceback" not in result.output
        result = run(command, "[a-z]", "-n", str(10**23))  # beyond what numpy can size
        assert result.exit_code == 2, command
        assert "not in the range" in result.stderr


def test_escape_text_round_trips_through_python_literal_syntax():
    for text in ["plain", "tab\there", "new\nline", "back\\slash", "nul\x00", "zw\u200bsp"]:
        escaped = escape_text(text)
        assert "\n" not in escaped and "\t" not in escaped
        assert needs_escape(text) == (escaped != text)
        # the escapes are Python's own (unicode_escape), so a literal reads them back
        assert eval("'" + escaped.replace("'", "\\'") + "'") == text
