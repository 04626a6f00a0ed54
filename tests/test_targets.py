"""Validator targets (pfuzz.audit.targets): Python functions, commands, regexes.

Command validators are small Python scripts in tests/fixtures/validators run
with ``sys.executable``; the faulty ones crash, hang, answer short or answer
nonsense, and each failure must be a ``TargetError`` naming what happened.
Call modes are checked against Python's ``re`` itself (the reference).
"""

from __future__ import annotations

import itertools
import re
import shlex
import sys
import time
from pathlib import Path

import pytest

import pfuzz
from pfuzz.errors import TargetError
from pfuzz.audit.targets import CommandTarget, PythonTarget, RegexTarget, Verdict, load_function

FIXTURES = Path(__file__).parent / "fixtures" / "validators"
TEXTS = ["AB-1234", "ab-1234", "AB-12345", "AB-1234\n", "\u00e9", "", "ZZ-0000"]
EXPECTED = [re.fullmatch(r"[A-Z]{2}-[0-9]{4}", t) is not None for t in TEXTS]  # reference: re


def command(script: str, *args: str, timeout: float = 10) -> CommandTarget:
    argv = [sys.executable, str(FIXTURES / script), *args]
    return CommandTarget(shlex.join(argv), timeout)


@pytest.mark.parametrize("args", [(), ("words",)])
def test_command_answers_are_read(args):
    verdicts = command("cmd_ticket.py", *args).run(TEXTS)
    assert [v.accepted for v in verdicts] == EXPECTED


def test_command_sees_each_string_exactly():
    verdicts = command("cmd_ticket.py", "loose").run(TEXTS)
    assert [v.accepted for v in verdicts] == [re.match(r"[A-Z]{2}-[0-9]{4}", t) is not None
                                              for t in TEXTS]


@pytest.mark.parametrize("how, message", [
    ("crash", "crashed: exit status 3 after answering 3 of 7 strings"),
    ("raise", "crashed: exit status 1 after answering 0 of 7 strings"),
    ("short", "a short answer: the command answered 5 lines for 7 strings"),
    ("extra", "too many answers: the command answered 14 lines for 7 strings"),
    ("garbage", "line 1 of the answer is 'maybe'"),
])
def test_command_failures_are_reported(how, message):
    with pytest.raises(TargetError) as caught:
        command("cmd_faulty.py", how).run(TEXTS)
    assert message in str(caught.value)
    if how == "crash":
        assert "out of coffee" in caught.value.detail
    if how == "raise":
        assert "RuntimeError: cannot parse AB-1234" in caught.value.detail


def test_command_hang_hits_the_timeout():
    started = time.perf_counter()
    with pytest.raises(TargetError) as caught:
        command("cmd_faulty.py", "hang", timeout=1).run(TEXTS)
    assert time.perf_counter() - started < 8
    assert "did not finish within 1 s" in str(caught.value)
    assert "answered 1 of 7" in str(caught.value)


def test_command_setup_errors():
    with pytest.raises(TargetError, match="cannot run"):
        CommandTarget("pfuzz-no-such-program --flag").run(["x"])
    with pytest.raises(TargetError, match="cannot split"):
        CommandTarget("python 'unclosed")
    with pytest.raises(TargetError, match="empty"):
        CommandTarget("  ")


def test_python_target_calls_and_catches():
    target = PythonTarget("seats:by_int", directory=str(FIXTURES))
    assert target.run(["12", "x"]) == [Verdict(True), Verdict(False, "ValueError: invalid literal "
                                                                      "for int() with base 10: 'x'")]


@pytest.mark.parametrize("spec, message", [
    ("tickets", "must look like module:function"),
    ("no_such_module_here:f", "cannot import 'no_such_module_here'"),
    ("tickets:nope", "has no attribute 'nope'"),
    ("tickets:TICKET.pattern", "is not callable"),
])
def test_python_target_errors(spec, message):
    with pytest.raises(TargetError, match=re.escape(message)):
        load_function(spec, str(FIXTURES))


def test_python_import_failure_is_reported(tmp_path):
    (tmp_path / "broken_validator.py").write_text("raise ImportError('missing helper')\n")
    with pytest.raises(TargetError, match="importing 'broken_validator' failed: ImportError"):
        load_function("broken_validator:check", str(tmp_path))


@pytest.mark.parametrize("pattern", [r"ab", r"a$", r"^a|b$", r"(?i)a\Z", r"(?x) a b # note", r"a\n?$"])
@pytest.mark.parametrize("mode", ["fullmatch", "match", "search"])
def test_regex_language_is_what_the_call_accepts(pattern, mode):
    lang = RegexTarget(pattern, mode).language(pfuzz.ALPHABETS["ascii"])
    for n in range(5):
        for letters in itertools.product("aAb\n", repeat=n):
            text = "".join(letters)
            truth = getattr(re, mode)(pattern, text) is not None  # reference: Python's re
            assert lang.accepts(text) == truth, (pattern, mode, text)


def test_regex_target_verdicts_and_errors():
    target = RegexTarget(r"\d+", "search")
    assert [v.accepted for v in target.run(["x1", "xy"])] == [True, False]
    with pytest.raises(TargetError, match="not a Python regular expression"):
        RegexTarget("(")
    with pytest.raises(TargetError, match="--mode"):
        RegexTarget("a", "findall")
