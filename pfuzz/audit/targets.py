"""The validators an audit runs: a Python function, a command, or a regular expression.

Every target answers in batches: ``verdicts(strings)`` gives one ``Verdict``
per string, in order, and ``ask(strings)`` the booleans alone (the membership
oracle an automata learner needs). Targets that run a process are context
managers; ``close()`` ends the process and everything it started.

- ``PythonTarget("module:function")`` imports the module in a child
  interpreter (``pfuzz.audit.worker``; the current directory is put first on
  its ``sys.path``) and calls the function with one string at a time; a truthy
  result accepts. Nothing the function does reaches pfuzz's own output or exit
  status: its printing goes to its error output (kept for messages), and
  ``sys.exit`` (at import or in a call), an import failure, a crash of the
  interpreter or a round that takes longer than the timeout is a
  ``TargetError`` naming the string it happened on. Exceptions: derived from
  ``ValueError`` or named in ``reject_on``, one counts as a reject; any other
  (``BaseException`` included) is recorded on its verdict as a finding of its
  own. Cost of the child process, measured: about 30 ms to start on an idle
  machine (plus the module's own import), and 1 µs per string on top of the
  call itself in rounds of thousands (3 µs in rounds of 100), since a whole
  round travels as one JSON line each way. In exchange a hang can be timed
  out, even in C code, and nothing the function does reaches pfuzz.
- ``CallableTarget(function)``: the same rules in this process, for library
  use (no timeout; output redirected while it runs; a ``KeyboardInterrupt``
  propagates, since in-process it may be the user's Ctrl-C).
- ``CommandTarget("command args")`` runs the command (split like a POSIX
  shell; no shell features: wrap pipes in ``sh -c '...'``) in a session of its
  own, under the round protocol below.
- ``RegexTarget(pattern, mode)`` calls Python's ``re`` in the mode the user's
  code uses (``fullmatch``, ``match`` or ``search``), in this process under the
  timeout per round (a timer signal: ``sre`` checks for signals as it
  backtracks, so a pattern such as ``(a+)+$`` cannot hang an audit), and also offers the exact
  language of that call, compiled by ``pfuzz.compile(..., mode=...)``, which
  keeps the meaning of anchors inside R (unlike the language L(R)·U*).

The round protocol of a command: each string is one JSON string literal per
line on standard input (pure ASCII: every non-ASCII character is a ``\\u``
escape); the command answers one line per string: ``1``/``0``,
``true``/``false`` or ``accept``/``reject`` (any case, blanks ignored).
pfuzz keeps the command running, writes one round of lines, flushes, and reads
exactly that many answers before it sends the next round. A command that gives
no answer within ``ANSWER_WAIT`` seconds of a round being written (one that
answers only at end of input, or whose output sits in a buffer; a quarter of
the timeout if that is shorter) gets end of input for that round, and from then on is started once per round, given the
round and end of input, and must exit with status 0. Each round must be
answered within the timeout, or the command's whole process group is killed
(``pfuzz.audit.process``); answer lines are at most ``LINE_LIMIT`` bytes,
and a line more than asked for is an error. A crash, a hang, a short or
unreadable answer is a ``TargetError``, never a silent verdict.
"""

from __future__ import annotations

import contextlib
import io
import json
import os
import re
import shlex
import signal
import sys
import tempfile
import threading
import time
from dataclasses import dataclass
from pathlib import Path
from typing import Callable, Sequence

from pfuzz.audit import worker
from pfuzz.audit.process import Process, describe_status
from pfuzz.base.constants import CALL_MODES
from pfuzz.errors import TargetError

__all__ = ["ACCEPT_WORDS", "ANSWER_WAIT", "DEFAULT_TIMEOUT", "LINE_LIMIT", "REJECT_WORDS",
           "CallableTarget", "CommandTarget", "PythonTarget", "RegexTarget", "Target", "Verdict",
           "parse_exception_names"]

#: Seconds a validator may take to answer one round.
DEFAULT_TIMEOUT = 60.0
#: Seconds without any answer after which a command is taken to answer only at end of input.
ANSWER_WAIT = 1.0
#: Longest answer line a command may write (bytes).
LINE_LIMIT = 1024
ACCEPT_WORDS = ("1", "true", "accept")
REJECT_WORDS = ("0", "false", "reject")


@dataclass(frozen=True)
class Verdict:
    """What the validator said about one string.

    ``raised`` names the exception it raised (empty if none) and ``message``
    its text; ``unexpected`` is True for an exception that is not a way of
    saying "reject" (a finding of its own).
    """

    accepted: bool
    raised: str = ""
    message: str = ""
    unexpected: bool = False

    @property
    def error(self) -> str:
        """``Type: message`` of the exception raised, or the empty string."""
        if not self.raised:
            return ""
        return f"{self.raised}: {self.message}" if self.message else self.raised


#: The two plain verdicts, shared (a frozen dataclass costs a microsecond to build).
ACCEPTED, REJECTED = Verdict(True), Verdict(False)
_PLAIN = {"1": ACCEPTED, "0": REJECTED, True: ACCEPTED, False: REJECTED}


class Target:
    """The batch interface every validator offers."""

    label = "validator"

    def verdicts(self, texts: Sequence[str]) -> list[Verdict]:
        raise NotImplementedError

    def ask(self, texts: Sequence[str]) -> list[bool]:
        """Membership answers alone: accepted or not (an exception is not an acceptance)."""
        return [v.accepted for v in self.verdicts(texts)]

    def close(self) -> None:
        """End whatever runs for this target (nothing by default)."""

    def __enter__(self):
        return self

    def __exit__(self, *exc) -> None:
        self.close()


def parse_exception_names(text: str | Sequence[str] | None) -> tuple[str, ...]:
    """``"KeyError, pkg.Error"`` or a list of names as a tuple of names (empty entries dropped)."""
    if not text:
        return ()
    names = text.split(",") if isinstance(text, str) else list(text)
    return tuple(n.strip() for n in names if n.strip())


def _timeout(seconds: float) -> float:
    if not seconds > 0:
        raise TargetError(f"the timeout must be positive, not {seconds}")
    return float(seconds)


def _quote(text: str) -> str:
    shown = text if len(text) <= 60 else text[:59] + "\u2026"
    return json.dumps(shown, ensure_ascii=False)


class _RegexTimeout(Exception):
    """The deadline of a round of ``re`` calls passed."""


@contextlib.contextmanager
def _deadline(seconds: float):
    """Raise ``_RegexTimeout`` in the block after ``seconds`` (``sre`` checks for signals while
    it backtracks). Only in the main thread of a system with ``setitimer`` (elsewhere, as on
    a Dask worker's threads, no deadline); a timer already running is kept and fires as
    it would have."""
    if threading.current_thread() is not threading.main_thread() or not hasattr(signal, "setitimer"):
        yield
        return
    started = time.monotonic()
    outer_handler = signal.getsignal(signal.SIGALRM)
    outer_delay, outer_interval = signal.getitimer(signal.ITIMER_REAL)

    def alarm(number, frame):
        if outer_delay and time.monotonic() - started >= outer_delay and callable(outer_handler):
            outer_handler(number, frame)  # the outer timer's turn came first
        raise _RegexTimeout()

    signal.signal(signal.SIGALRM, alarm)
    signal.setitimer(signal.ITIMER_REAL, min(seconds, outer_delay) if outer_delay else seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, outer_handler)
        if outer_delay:
            left = outer_delay - (time.monotonic() - started)
            signal.setitimer(signal.ITIMER_REAL, max(left, 1e-6), outer_interval)


# -- Python functions ---------------------------------------------------------------

class PythonTarget(Target):
    """``module:function`` called in a child interpreter (see the module docstring)."""

    def __init__(self, spec: str, directory: str | None = None, *,
                 timeout: float = DEFAULT_TIMEOUT, reject_on: Sequence[str] = ()):
        self.label, self.timeout = spec, _timeout(timeout)
        self._slot = tempfile.TemporaryFile()
        self._slot.truncate(8)
        config = {"target": spec, "directory": str(Path(directory or ".").resolve()),
                  "reject_on": list(parse_exception_names(reject_on)),
                  "slot": self._slot.fileno()}
        argv = [sys.executable, "-c", Path(worker.__file__).read_text(encoding="utf-8"),
                json.dumps(config)]
        self._process = Process(argv, f"the validator {spec}", pass_fds=(self._slot.fileno(),))
        self._texts: Sequence[str] = ()
        answer = self._exchange(b"", "importing it")
        if "failed" in answer:
            self.close()
            raise TargetError(answer["failed"], self._process.error_tail())

    def verdicts(self, texts: Sequence[str]) -> list[Verdict]:
        if not texts:
            return []
        self._texts = texts
        data = (json.dumps(list(texts), ensure_ascii=True) + "\n").encode("ascii")
        answer = self._exchange(data, "checking a round of strings")
        if "exit" in answer:
            index, code = answer["exit"]
            self.close()
            raise TargetError(f"it called sys.exit({code}) on {_quote(texts[index])}; "
                              "a validator must return or raise")
        out = [_PLAIN.get(c) for c in answer["verdicts"]]
        for index, kind, message, rejects in answer["raised"]:
            out[index] = Verdict(False, kind, message, not rejects)
        return out

    def _exchange(self, data: bytes, doing: str) -> dict:
        n = max(1, len(self._texts) if data else 1)
        deadline = time.monotonic() + self.timeout
        got = self._process.exchange(data, 1, deadline, 4096 + 4096 * n)
        if got.ended == "answered":
            return json.loads(got.lines[0])
        where = self._where(doing)
        if got.ended == "timeout":
            self.close()
            raise TargetError(f"it did not answer within {self.timeout:g} s {where} (a hang?); "
                              "use --timeout to allow more",
                              self._process.error_tail())
        status = self._process.wait(deadline)
        self.close()
        raise TargetError(f"its process ended ({describe_status(status)}) {where}",
                          self._process.error_tail())

    def _where(self, doing: str) -> str:
        """Which string the child was checking (read from the shared slot), or what it did."""
        index = int.from_bytes(os.pread(self._slot.fileno(), 8, 0), sys.byteorder, signed=True) - 1
        if 0 <= index < len(self._texts):
            return f"while checking {_quote(self._texts[index])}"
        return f"while {doing}"

    def close(self) -> None:
        self._process.close()
        if not self._slot.closed:
            self._slot.close()


class CallableTarget(Target):
    """A Python callable called in this process, under the rules of ``PythonTarget``."""

    def __init__(self, function: Callable[[str], object], label: str | None = None, *,
                 reject_on: Sequence[str | type] = ()):
        self.function = function
        self.label = label or getattr(function, "__qualname__", repr(function))
        try:
            self.reject_on = tuple(n if isinstance(n, type) else worker.resolve_exception(n)
                                   for n in reject_on)
        except worker.Refused as error:
            raise TargetError(str(error)) from None

    def verdicts(self, texts: Sequence[str]) -> list[Verdict]:
        out = []
        sink = _Sink()
        with contextlib.redirect_stdout(sink), contextlib.redirect_stderr(sink):
            for text in texts:
                if sys.stdout is not sink or sys.stderr is not sink or sink.closed:
                    sink = _Sink()  # the function closed or replaced it
                    sys.stdout = sys.stderr = sink
                try:
                    answer = worker.call(self.function, text, self.reject_on,
                                         (SystemExit, KeyboardInterrupt))
                except SystemExit as error:
                    raise TargetError(f"it called sys.exit({error.code!r}) on {_quote(text)}; "
                                      "a validator must return or raise") from None
                if answer is True or answer is False:
                    out.append(_PLAIN[answer])
                else:
                    kind, message, rejects = answer
                    out.append(Verdict(False, kind, message, not rejects))
        return out


class _Sink(io.TextIOBase):
    """Where an in-process validator's printing goes: nowhere, in constant memory."""

    def writable(self) -> bool:
        return True

    def write(self, text: str) -> int:
        return len(text)


# -- commands -----------------------------------------------------------------------

class CommandTarget(Target):
    """A command under the round protocol (module docstring)."""

    def __init__(self, command: str, timeout: float = DEFAULT_TIMEOUT, *,
                 answer_wait: float = ANSWER_WAIT):
        try:
            self.argv = shlex.split(command)
        except ValueError as error:
            raise TargetError(f"cannot split --cmd {command!r}: {error}") from None
        if not self.argv:
            raise TargetError("--cmd is empty")
        self.label, self.timeout = command, _timeout(timeout)
        self.answer_wait = min(answer_wait, self.timeout / 4)
        self.once_per_round = False   #: set when the command answers only at end of input
        self._process: Process | None = None

    def verdicts(self, texts: Sequence[str]) -> list[Verdict]:
        if not texts:
            return []
        data = "".join(json.dumps(t) + "\n" for t in texts).encode("ascii")
        deadline = time.monotonic() + self.timeout
        if self.once_per_round:
            lines = self._once(data, len(texts), deadline)
        else:
            lines = self._lines(data, len(texts), deadline)
        return [_verdict(line, i) for i, line in enumerate(lines, 1)]

    def _start(self) -> Process:
        return Process(self.argv, "the command")

    def _lines(self, data: bytes, n: int, deadline: float) -> list[bytes]:
        """A round to the running command; on silence, end of input and once per round from then on."""
        if self._process is None:
            self._process = self._start()
        process = self._process
        if process.surplus():
            self._fail(process, "too many answers: the command wrote lines no string asked for")
        got = process.exchange(data, n, deadline, LINE_LIMIT, stall=self.answer_wait)
        if got.ended == "answered":
            if process.surplus():
                self._fail(process, f"too many answers: the command answered more than {n:,} "
                                    f"lines for {n:,} strings")
            return got.lines
        self._process = None
        if got.ended == "stalled":
            self.once_per_round = True
            rest = process.exchange(b"", n - len(got.lines), deadline, LINE_LIMIT,
                                    end_input=True, until_end=True)
            return self._finish(process, got.lines + rest.lines, rest.ended, n, deadline)
        return self._finish(process, got.lines, got.ended, n, deadline)

    def _once(self, data: bytes, n: int, deadline: float) -> list[bytes]:
        process = self._start()
        got = process.exchange(data, n, deadline, LINE_LIMIT, end_input=True, until_end=True)
        return self._finish(process, got.lines, got.ended, n, deadline)

    def _finish(self, process: Process, lines: list[bytes], ended: str, n: int,
                deadline: float) -> list[bytes]:
        """Once the output ended (or time ran out): the exit status and the count decide."""
        status = process.wait(deadline) if ended != "timeout" else None
        process.kill()
        if status is None:
            raise TargetError(f"the command did not finish within {self.timeout:g} s (a hang?); "
                              f"it had answered {len(lines):,} of {n:,} strings; "
                              "use --timeout to allow more", process.error_tail())
        if status != 0:
            raise TargetError(f"the command crashed: {describe_status(status)} after answering "
                              f"{len(lines):,} of {n:,} strings", process.error_tail())
        if len(lines) != n:
            raise TargetError(f"a short answer: the command answered {len(lines):,} lines for "
                              f"{n:,} strings", process.error_tail())
        return lines

    def _fail(self, process: Process, message: str):
        self._process = None
        process.kill()
        raise TargetError(message, process.error_tail())

    def close(self) -> None:
        if self._process is not None:
            self._process.close()
            self._process = None


def _verdict(line: bytes, number: int) -> Verdict:
    text = line.decode("utf-8", "replace").strip()
    word = text.lower()
    if word in ACCEPT_WORDS:
        return ACCEPTED
    if word in REJECT_WORDS:
        return REJECTED
    raise TargetError(f"line {number} of the answer is {text[:40]!r}; expected "
                      "1/0, true/false or accept/reject")


# -- regular expressions --------------------------------------------------------------

class RegexTarget(Target):
    """A Python ``re`` pattern called as ``re.<mode>(pattern, text)``; a round that runs past
    ``timeout`` seconds (catastrophic backtracking) is a ``TargetError`` (see ``_deadline``)."""

    def __init__(self, pattern: str, mode: str = "fullmatch", timeout: float = DEFAULT_TIMEOUT):
        if mode not in CALL_MODES:
            raise TargetError(f"--mode must be one of {', '.join(CALL_MODES)}, not {mode!r}")
        try:
            compiled = re.compile(pattern)
        except (re.error, OverflowError) as error:    # OverflowError: a count past 2**32 - 1
            raise TargetError(f"--regex is not a Python regular expression: {error}") from None
        self.pattern, self.mode, self.timeout = pattern, mode, _timeout(timeout)
        self.label = f"re.{mode}({pattern!r})"
        self._call = getattr(compiled, mode)

    def verdicts(self, texts: Sequence[str]) -> list[Verdict]:
        call, found = self._call, []
        try:
            with _deadline(self.timeout):
                for text in texts:
                    found.append(REJECTED if call(text) is None else ACCEPTED)
        except _RegexTimeout:
            raise TargetError(f"re.{self.mode} did not finish within {self.timeout:g} s on "
                              f"{_quote(texts[len(found)])} (catastrophic backtracking?); "
                              "use --timeout to allow more") from None
        return found

    def language(self, alphabet, state_cap: int | None = None):
        """The exact language this call accepts over ``alphabet`` (a PatternError if not regular;
        a StateLimitError past ``state_cap`` states, default ``DEFAULT_STATE_CAP``).

        The compiler models the call mode itself (``re.match`` is the full match
        of ``R(?s:.*)``, so ``R$`` keeps its meaning), which L(R)·U* would not.
        """
        from pfuzz.language import compile as compile_pattern

        from pfuzz.automata.dfa import DEFAULT_STATE_CAP

        return compile_pattern(self.pattern, alphabet, mode=self.mode,
                               state_cap=state_cap or DEFAULT_STATE_CAP)
