"""Limits through the command line: --state-cap reaches every automaton a command builds,
memory estimates refuse before allocating, running out of memory frees before it reports,
and every error is one line."""

from __future__ import annotations

import json
import textwrap
import weakref
from pathlib import Path

import pytest
from click.testing import CliRunner

from pfuzz.base import resources
from pfuzz.cli import common, main
from pfuzz.errors import StateLimitError
from pfuzz.language import Language

# '[a-c]{12}' has a 13-state minimal DFA; its near-miss automaton at distance 1 has more
# than 20 states (a state per position, inside and one edit off the pattern).
SMALL_PATTERN, SMALL_CAP = "[a-c]{12}", 20

PROFILE = f"""
[profile]
title = "Limits"

[[field]]
name = "code"
pattern = '{SMALL_PATTERN}'
valid = 5
invalid = 5
"""


def run(*args: str):
    return CliRunner().invoke(main, list(args))


def profile(tmp_path: Path, text: str = PROFILE) -> str:
    path = tmp_path / "p.toml"
    path.write_text(textwrap.dedent(text), encoding="utf-8")
    return str(path)


def one_error_line(result) -> str:
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    lines = result.stderr.splitlines()
    assert len(lines) == 1 and lines[0].startswith("pfuzz: error: "), result.stderr
    return lines[0]


# -- --state-cap ---------------------------------------------------------------------

def test_the_pattern_itself_fits_under_the_small_cap():
    assert Language.compile(SMALL_PATTERN, "printable", state_cap=SMALL_CAP).states == 13


def test_the_cap_travels_with_a_language_to_its_near_miss_automaton():
    # Built without a cap first: the cached automaton must not serve the capped language.
    assert Language.compile(SMALL_PATTERN, "printable").near_misses().states > SMALL_CAP
    lang = Language.compile(SMALL_PATTERN, "printable", state_cap=SMALL_CAP)
    with pytest.raises(StateLimitError):
        lang.near_misses()
    with pytest.raises(StateLimitError):
        lang.rejects(3, seed=0)


def test_the_cap_travels_to_products():
    a = Language.compile("[ab]{0,3}", "[ab]", state_cap=SMALL_CAP)
    b = Language.compile("(ab|ba)*", "[ab]")
    assert (a & b).state_cap == SMALL_CAP and (b - a).state_cap == SMALL_CAP
    # 31 and 16 states; their product needs 398 (measured without a cap).
    lengths = Language.compile("[ab]{0,30}", "[ab]", state_cap=40)
    fourth_last = Language.compile("(a|b)*a(a|b){3}", "[ab]")
    assert (Language.compile("[ab]{0,30}", "[ab]") & fourth_last).states == 398
    with pytest.raises(StateLimitError):
        lengths & fourth_last
    with pytest.raises(StateLimitError):
        fourth_last & lengths                       # the smaller cap of the two


def test_reject_stops_at_the_cap_and_names_the_option():
    line = one_error_line(run("reject", SMALL_PATTERN, "--state-cap", str(SMALL_CAP)))
    assert f"raise --state-cap (now {SMALL_CAP})" in line
    assert run("reject", SMALL_PATTERN, "-n", "3").exit_code == 0


def test_corpus_accepts_the_cap_and_names_the_option(tmp_path):
    out = tmp_path / "out"
    line = one_error_line(run("corpus", profile(tmp_path), "--out", str(out),
                              "--state-cap", str(SMALL_CAP)))
    assert f"raise --state-cap (now {SMALL_CAP})" in line
    assert not out.exists() and list(tmp_path.iterdir()) == [tmp_path / "p.toml"]
    assert run("corpus", profile(tmp_path), "--out", str(out)).exit_code == 0


def test_corpus_cap_reaches_the_profile_s_own_patterns(tmp_path):
    result = run("corpus", profile(tmp_path), "--out", str(tmp_path / "out"),
                 "--state-cap", "5")
    line = one_error_line(result)
    assert "key 'pattern'" in line and "raise --state-cap (now 5)" in line


def test_audit_of_a_profile_field_honours_the_cap(tmp_path):
    line = one_error_line(run("audit", profile(tmp_path), "--regex", SMALL_PATTERN,
                              "--state-cap", str(SMALL_CAP)))
    assert f"raise --state-cap (now {SMALL_CAP})" in line


def test_audit_compiles_a_regex_validator_under_the_cap_too():
    # '(a|b)*a(a|b){5}' needs 64 states (2^6: the last six letters); '[ab]{3}' needs 4.
    result = run("audit", "--pattern", "[ab]{3}", "--alphabet", "[ab]", "--regex",
                 "(a|b)*a(a|b){5}", "--state-cap", "30", "--format", "json")
    report = json.loads(result.stdout)
    assert report["exact"] is None and "more than 30 states" in report["exact_note"]
    uncapped = json.loads(run("audit", "--pattern", "[ab]{3}", "--alphabet", "[ab]", "--regex",
                              "(a|b)*a(a|b){5}", "--format", "json").stdout)
    assert uncapped["exact"] is not None


# -- memory estimates -------------------------------------------------------------------

@pytest.fixture
def small_budget(monkeypatch):
    """A memory budget of 1 MiB, so that modest requests are past it."""
    monkeypatch.setattr(resources, "memory_budget", lambda: (1 << 20, "a test's budget"))


@pytest.mark.parametrize("command", ["sample", "reject"])
def test_output_past_the_budget_is_refused_before_drawing(small_budget, command):
    line = one_error_line(run(command, "[a-z]{200}", "-n", "20000"))
    assert "not enough memory for 20,000 strings of up to" in line
    assert "a test's budget" in line and "ask for fewer (-n)" in line
    assert run(command, "[a-z]{200}", "-n", "10").exit_code == 0


def test_a_corpus_past_the_budget_is_refused_naming_field_and_keys(small_budget, tmp_path):
    text = PROFILE.replace("\nvalid = 5", "\nvalid = 20000").replace(SMALL_PATTERN, "[a-z]{100}")
    out = tmp_path / "out"
    line = one_error_line(run("corpus", profile(tmp_path, text), "--out", str(out)))
    assert "field 'code': 20,000 valid strings of up to 100 characters" in line
    assert "lower its valid or max_length key" in line
    assert not out.exists() and list(tmp_path.iterdir()) == [tmp_path / "p.toml"]


def test_a_profile_that_would_hold_hundreds_of_gigabytes_stops_at_once(tmp_path):
    text = PROFILE.replace("\nvalid = 5", "\nvalid = 10000000\nmin_length = 20000\n"
                           "max_length = 20000").replace(SMALL_PATTERN, "[a-z]+")
    line = one_error_line(run("corpus", profile(tmp_path, text), "--out", str(tmp_path / "o")))
    assert "not enough memory for field 'code': 10,000,000 valid strings" in line


# -- out of memory --------------------------------------------------------------------------

class _Big:
    """Stands for the huge objects a command holds when an allocation fails."""


def test_out_of_memory_frees_the_command_s_objects_before_reporting(monkeypatch):
    held: list = []

    def exhausted(*args, **kwargs):
        big = _Big()
        held.append(weakref.ref(big))
        raise MemoryError

    freed_at_report: list[bool] = []
    real_echo = common.click.echo

    def echo(message=None, *args, **kwargs):
        freed_at_report.append(held[0]() is None)
        return real_echo(message, *args, **kwargs)

    monkeypatch.setattr(common, "compile_language", exhausted)
    monkeypatch.setattr(common.click, "echo", echo)
    from pfuzz.cli import sampling
    monkeypatch.setattr(sampling, "compile_language", exhausted)
    line = one_error_line(run("count", "[a-z]"))
    assert "not enough memory" in line
    assert freed_at_report == [True]


# -- one line, short echoes ----------------------------------------------------------------

def test_a_newline_in_a_name_does_not_split_the_error_line(tmp_path):
    out = tmp_path / "a\nb"
    out.mkdir()
    line = one_error_line(run("corpus", profile(tmp_path), "--out", str(out)))
    assert "a\\nb" in line and "pass --force" in line


def test_a_deeply_nested_pattern_is_not_echoed_whole(tmp_path):
    pattern = "(" * 10_000 + "a" + ")" * 10_000
    for result in (run("sample", pattern),
                   run("sample", "--pattern-file", _write(tmp_path / "p.txt", pattern)),
                   run("corpus", profile(tmp_path, PROFILE.replace(f"'{SMALL_PATTERN}'",
                                                                   f"'{pattern}'")),
                       "--out", str(tmp_path / "out"))):
        assert result.exit_code == 2 and "Traceback" not in result.output
        assert "nests too deeply" in result.stderr
        assert len(result.stderr) < 1000, len(result.stderr)


def test_a_long_pattern_line_gets_a_window_around_the_caret():
    pattern = "a" * 5000 + "(" + "b" * 5000
    result = run("sample", pattern)
    assert result.exit_code == 2
    *_, shown, caret = result.stderr.splitlines()
    assert len(shown) < 100 and shown.strip().startswith("...")
    assert shown[caret.index("^")] == "("


def test_out_may_not_be_a_symbolic_link(tmp_path):
    real = tmp_path / "real.txt"
    real.write_text("mine\n")
    (tmp_path / "link.txt").symlink_to(real)
    line = one_error_line(run("sample", "a", "--out", str(tmp_path / "link.txt")))
    assert "symbolic link" in line and "give --out a regular file" in line
    assert real.read_text() == "mine\n" and (tmp_path / "link.txt").is_symlink()


def _write(path: Path, text: str) -> str:
    path.write_text(text, encoding="utf-8")
    return str(path)


@pytest.mark.parametrize("args", [["sample", "--pattern-file", "a\x00b"],
                                  ["sample", "a", "--out", "a\x00b"],
                                  ["corpus", "p\x00.toml", "--out", "x"],
                                  ["diff", "--pattern-file", "a\x00b", "x"],
                                  ["audit", "p\x00.toml", "--regex", "a"],
                                  ["learn", "--pattern-file", "a\x00", "--regex", "a"],
                                  ["report", "--pattern", "a", "--out", "a\x00b"]])
def test_a_nul_in_a_path_is_a_usage_error(args):
    result = run(*args)
    assert result.exit_code == 2 and result.exception is not None
    assert isinstance(result.exception, SystemExit)
    assert "holds a NUL character" in result.stderr


def test_count_over_an_empty_length_range_is_one_line():
    # The language of '' has one string, of length 0 (found by the fuzz driver).
    line = one_error_line(run("count", "", "--min-length", "6"))
    assert "the length range 6 to 0 is empty" in line


# -- found by the fuzz driver ---------------------------------------------------------------

def test_a_control_character_in_the_profile_title_is_one_corpus(tmp_path):
    text = PROFILE.replace('title = "Limits"', 'title = "Limits\\u0001"')
    out = tmp_path / "out"
    result = run("corpus", profile(tmp_path, text), "--out", str(out))
    assert result.exit_code == 0, result.output
    assert (out / "manifest.json").exists() and (out / "qa.xlsx").exists()


def test_a_regex_validator_with_a_count_past_re_s_limit_is_one_line():
    # re raises OverflowError, not re.error, for a repeat count past 2**32 - 1.
    line = one_error_line(run("audit", "--pattern", "[ab]", "--regex", "x{99999999999}"))
    assert "is not a Python regular expression" in line
