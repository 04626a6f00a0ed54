"""Validator targets (pfuzz.audit.targets, pfuzz.audit.process, pfuzz.audit.worker).

Command validators are small Python scripts in tests/fixtures/validators run
with ``sys.executable``; the faulty ones crash, hang, flood, answer short or
answer nonsense, and each failure must be a ``TargetError`` naming what
happened. Python validators in tests/fixtures/validators/hostile.py exit,
print, close their output, raise every kind of exception and hang: none of it
may change a verdict, pfuzz's output or its exit status. Expected verdicts
come from Python's ``re`` (the reference matcher). Timeout tests bound the
elapsed time from above: they test that a timeout is kept.
"""

from __future__ import annotations

import itertools
import os
import re
import shlex
import sys
import time
from pathlib import Path

import pytest

import pfuzz
from pfuzz.audit.targets import (CallableTarget, CommandTarget, PythonTarget, RegexTarget, Verdict,
                                 parse_exception_names)
from pfuzz.errors import TargetError

FIXTURES = Path(__file__).parent / "fixtures" / "validators"
TICKET = r"[A-Z]{2}-[0-9]{4}"
TEXTS = ["AB-1234", "ab-1234", "AB-12345", "AB-1234\n", "\u00e9", "", "ZZ-0000"]
EXPECTED = [re.fullmatch(TICKET, t) is not None for t in TEXTS]  # reference: re


def command(script: str, *args: str, timeout: float = 10) -> CommandTarget:
    """The fixture script as a command; a short answer wait keeps the tests quick."""
    argv = [sys.executable, str(FIXTURES / script), *args]
    return CommandTarget(shlex.join(argv), timeout, answer_wait=0.2)


def python(spec: str, **options) -> PythonTarget:
    return PythonTarget(spec, directory=str(FIXTURES), **options)


# -- commands: the round protocol ------------------------------------------------------

@pytest.mark.parametrize("args", [(), ("words",), ("batch",), ("buffered",)])
def test_command_answers_are_read_in_rounds(args):
    with command("cmd_ticket.py", *args) as target:
        for texts in (TEXTS, TEXTS * 2000, TEXTS[:2]):
            assert target.ask(texts) == [re.fullmatch(TICKET, t) is not None for t in texts]
        # Answering line by line keeps one process; only at end of input, once per round.
        assert target.once_per_round == (args in [("batch",), ("buffered",)])


def test_command_sees_each_string_exactly():
    with command("cmd_ticket.py", "loose") as target:
        verdicts = target.verdicts(TEXTS)
    assert [v.accepted for v in verdicts] == [re.match(TICKET, t) is not None for t in TEXTS]


@pytest.mark.parametrize("how, message", [
    ("crash", "crashed: exit status 3 after answering 3 of 7 strings"),
    ("raise", "crashed: exit status 1 after answering 0 of 7 strings"),
    ("short", "a short answer: the command answered 5 lines for 7 strings"),
    ("extra", "too many answers: the command answered more than 7 lines for 7 strings"),
    ("garbage", "line 1 of the answer is 'maybe'"),
])
def test_command_failures_are_reported(how, message):
    with pytest.raises(TargetError) as caught, command("cmd_faulty.py", how) as target:
        target.verdicts(TEXTS)
    assert message in str(caught.value)
    if how == "crash":
        assert "out of coffee" in caught.value.detail
    if how == "raise":
        assert "RuntimeError: cannot parse AB-1234" in caught.value.detail


def test_command_hang_hits_the_timeout():
    started = time.monotonic()
    with pytest.raises(TargetError) as caught, command("cmd_faulty.py", "hang", timeout=1) as target:
        target.verdicts(TEXTS)
    assert time.monotonic() - started < 8
    assert "did not finish within 1 s" in str(caught.value)
    assert "answered 1 of 7" in str(caught.value)


def test_timeout_is_kept_when_a_descendant_holds_the_output_open():
    # The descendant leaves the process group (setsid) and keeps the pipes for 40 s.
    target = CommandTarget("sh -c 'setsid sleep 40 & cat >/dev/null; sleep 1000'", timeout=3)
    started = time.monotonic()
    with pytest.raises(TargetError, match="did not finish within 3 s"), target:
        target.verdicts(["AB-1234"])
    assert time.monotonic() - started < 15


@pytest.mark.skipif(not Path("/proc/self/environ").exists(), reason="needs Linux /proc")
def test_a_descendant_in_a_session_of_its_own_is_ended_with_the_validator(tmp_path):
    # The descendant calls setsid, so the process group cannot reach it; it is found by
    # the run token its environment inherited. Whether it runs is read from /proc.
    pid_file = tmp_path / "pid"
    cmd = f"sh -c 'setsid sleep 40 & echo $! > {pid_file}; cat >/dev/null; sleep 1000'"
    with pytest.raises(TargetError, match="did not finish within 2 s"), CommandTarget(cmd, timeout=2) as target:
        target.verdicts(["AB-1234"])
    pid = int(pid_file.read_text())
    deadline = time.monotonic() + 5
    while _running(pid) and time.monotonic() < deadline:
        time.sleep(0.05)   # a killed process is reaped by its new parent, not by pfuzz
    assert not _running(pid)


@pytest.mark.parametrize("cmd, message", [
    ("yes 1", "too many answers: the command "),  # answered more, or wrote before it was asked
    ("sh -c 'yes 1 | tr -d \"\\n\"'", "wrote an answer line longer than 1,024 bytes"),
    ("sh -c 'cat >/dev/null; yes 1'", "too many answers"),
])
def test_flooding_output_is_stopped_at_a_bound(cmd, message):
    with pytest.raises(TargetError, match=re.escape(message)), CommandTarget(cmd, 20, answer_wait=0.2) as target:
        target.verdicts(["AB-1234", "x"])


def test_ending_a_command_target_ends_its_process_group(tmp_path):
    pid_file = tmp_path / "pid"
    with command("cmd_ticket.py", f"pid={pid_file}") as target:
        assert target.ask(["AB-1234"]) == [True]
        pid = int(pid_file.read_text())
        assert _running(pid)
    assert not _running(pid)


def _running(pid: int) -> bool:
    """Alive and not a zombie (reference: /proc, Linux; kill(pid, 0) elsewhere)."""
    stat = Path(f"/proc/{pid}/stat")
    if stat.parent.parent.exists() and stat.parent.parent.joinpath("self").exists():
        try:
            return stat.read_text().rsplit(")", 1)[1].split()[0] != "Z"
        except OSError:
            return False
    try:
        os.kill(pid, 0)
    except OSError:
        return False
    return True


def test_command_setup_errors():
    with pytest.raises(TargetError, match="cannot run"):
        CommandTarget("pfuzz-no-such-program --flag").verdicts(["x"])
    with pytest.raises(TargetError, match="cannot split"):
        CommandTarget("python 'unclosed")
    with pytest.raises(TargetError, match="empty"):
        CommandTarget("  ")
    with pytest.raises(TargetError, match="positive"):
        CommandTarget("cat", 0)


# -- Python targets in a child interpreter ---------------------------------------------

def test_python_target_calls_and_classifies_exceptions():
    with python("seats:by_int") as target:
        assert target.verdicts(["12", "x"]) == [
            Verdict(True), Verdict(False, "ValueError", "invalid literal for int() with base 10: 'x'")]
    with python("hostile:by_value_error") as target:
        assert target.ask(TEXTS) == EXPECTED


def test_reject_on_names_other_exceptions():
    with python("hostile:by_framework_error") as target:
        plain = target.verdicts(TEXTS)
    assert [v.accepted for v in plain] == EXPECTED
    assert {v.raised for v, ok in zip(plain, EXPECTED) if not ok} == {"hostile.TicketRejected"}
    assert all(v.unexpected for v, ok in zip(plain, EXPECTED) if not ok)
    with python("hostile:by_framework_error", reject_on="hostile.TicketRejected") as target:
        named = target.verdicts(TEXTS)
    assert [v.accepted for v in named] == EXPECTED and not any(v.unexpected for v in named)
    with python("seats:by_int", reject_on=["KeyError", "LookupError"]) as target:
        assert target.verdicts(["x"])[0].raised == "ValueError"
    with pytest.raises(TargetError, match="--reject-on 'NoSuchError' is not an exception class"):
        python("seats:by_int", reject_on="NoSuchError")
    assert parse_exception_names(" KeyError, ,pkg.Error ") == ("KeyError", "pkg.Error")


def test_every_base_exception_is_recorded():
    with python("hostile:raises_base") as target:
        verdicts = target.verdicts(["", "A", "B", "AB-1234"])
    assert [(v.accepted, v.raised, v.unexpected) for v in verdicts] == [
        (False, "GeneratorExit", True), (False, "KeyboardInterrupt", True),
        (False, "hostile.Stop", True), (True, "", False)]
    assert verdicts[2].error == "hostile.Stop: stop here"


@pytest.mark.parametrize("spec, message", [
    ("hostile:exits", "it called sys.exit(0) on \"ab-1234\""),
    ("hostile:exits_one", "called sys.exit(1) on \"AB-1234\""),
    ("exits_at_import:check", "importing 'exits_at_import' called sys.exit(0)"),
])
def test_exiting_is_a_target_error(spec, message):
    with pytest.raises(TargetError, match=re.escape(message)):
        with python(spec) as target:
            target.verdicts(TEXTS)


def test_output_closing_and_reading_change_nothing(capfd):
    for spec in ("hostile:prints", "hostile:closes_stdout", "hostile:reads_stdin"):
        with python(spec) as target:
            assert target.ask(TEXTS) == EXPECTED
            assert target.ask(TEXTS) == EXPECTED
    with python("prints_at_import:check") as target:
        assert target.ask(["ab", "abc"]) == [True, False]
    out, _ = capfd.readouterr()
    assert out == ""


def test_a_crash_or_a_hang_names_the_string():
    with pytest.raises(TargetError, match=r"its process ended \(exit status 7\) while checking \"ZZ-9999\""):
        with python("hostile:kills_interpreter") as target:
            target.verdicts(["AB-1234", "ZZ-9999", "x"])
    started = time.monotonic()
    with pytest.raises(TargetError, match="it did not answer within 1 s while checking \"hang\""):
        with python("hostile:hangs", timeout=1) as target:
            target.verdicts(["AB-1234", "hang", "x"])
    assert time.monotonic() - started < 8


@pytest.mark.parametrize("spec, message", [
    ("tickets", "must look like module:function"),
    ("no_such_module_here:f", "cannot import 'no_such_module_here'"),
    ("tickets:nope", "has no attribute 'nope'"),
    ("tickets:TICKET.pattern", "is not callable"),
])
def test_python_target_errors(spec, message):
    with pytest.raises(TargetError, match=re.escape(message)):
        python(spec)


def test_python_import_failure_is_reported(tmp_path):
    (tmp_path / "broken_validator.py").write_text("raise ImportError('missing helper')\n")
    with pytest.raises(TargetError, match="importing 'broken_validator' failed: ImportError"):
        PythonTarget("broken_validator:check", str(tmp_path))


# -- in-process callables ------------------------------------------------------------

def test_callable_target_follows_the_same_rules(capsys):
    sys.path.insert(0, str(FIXTURES))
    try:
        import hostile
    finally:
        sys.path.remove(str(FIXTURES))
    assert CallableTarget(hostile.prints).ask(TEXTS) == EXPECTED
    assert capsys.readouterr().out == ""
    verdicts = CallableTarget(hostile.raises_base).verdicts(["", "B"])
    assert [(v.raised, v.unexpected) for v in verdicts] == [("GeneratorExit", True),
                                                            ("hostile.Stop", True)]
    named = CallableTarget(hostile.by_framework_error, reject_on=[hostile.TicketRejected])
    assert not any(v.unexpected for v in named.verdicts(TEXTS))
    with pytest.raises(TargetError, match=r"called sys.exit\(0\)"):
        CallableTarget(hostile.exits).verdicts(TEXTS)
    with pytest.raises(KeyboardInterrupt):  # in-process it may be the user's Ctrl-C
        CallableTarget(hostile.raises_base).verdicts(["A"])


# -- regular expressions --------------------------------------------------------------

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
    assert target.ask(["x1", "xy"]) == [True, False]
    with pytest.raises(TargetError, match="not a Python regular expression"):
        RegexTarget("(")
    with pytest.raises(TargetError, match="--mode"):
        RegexTarget("a", "findall")


CATASTROPHIC = r"(a+)+$"  # exponential backtracking in re on a run of a's that does not match


def test_a_regex_that_backtracks_for_ever_hits_the_timeout():
    target = RegexTarget(CATASTROPHIC, timeout=0.3)
    assert target.ask(["aaa", "ab"]) == [True, False]  # reference: re.fullmatch
    started = time.monotonic()
    with pytest.raises(TargetError, match=r"did not finish within 0.3 s on \"a{30}b\""):
        target.verdicts(["aa", "a" * 30 + "b"])
    assert time.monotonic() - started < 10


def test_the_regex_deadline_keeps_a_timer_already_running():
    import signal

    class Outer(Exception):
        pass

    def outer(number, frame):
        raise Outer()

    previous = signal.signal(signal.SIGALRM, outer)
    try:
        signal.setitimer(signal.ITIMER_REAL, 5.0)
        RegexTarget(r"\d+").verdicts(["12", "x"])
        left, _ = signal.getitimer(signal.ITIMER_REAL)
        assert 0 < left <= 5.0 and signal.getsignal(signal.SIGALRM) is outer
        signal.setitimer(signal.ITIMER_REAL, 0.3)  # the outer timer is due before the round's
        with pytest.raises(Outer):
            RegexTarget(CATASTROPHIC, timeout=30).verdicts(["a" * 30 + "b"])
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)
