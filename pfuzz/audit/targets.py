"""The validators an audit runs: a Python function, a command, or a regular expression.

Each target takes the list of case strings and returns one ``Verdict`` per
string, in order.

- ``PythonTarget("module:function")`` imports the module from the current
  directory (which is put first on ``sys.path``) and calls the function with
  one string at a time; a truthy result accepts, an exception rejects and is
  recorded with its type. No timeout: the function runs in this process.
- ``CommandTarget("command args")`` runs the command once (split like a POSIX
  shell; no shell features: wrap pipes in ``sh -c '...'``). It receives each
  string as one JSON string literal per line on standard input (pure ASCII:
  every non-ASCII character is a ``\\u`` escape) and answers one verdict per
  line on standard output: ``1``/``0``, ``true``/``false`` or
  ``accept``/``reject`` (any case, surrounding blanks ignored). The whole run
  has one timeout; the command must exit with status 0. A crash, a hang or a
  short or unreadable answer is a ``TargetError``, never a silent verdict.
- ``RegexTarget(pattern, mode)`` calls Python's ``re`` in the mode the user's
  code uses (``fullmatch``, ``match`` or ``search``) and also offers the exact
  language of that call, compiled by ``pfuzz.compile(..., mode=...)``, which
  keeps the meaning of anchors inside R (unlike the language L(R)·U*).
"""

from __future__ import annotations

import importlib
import json
import os
import re
import shlex
import signal
import subprocess
import sys
from dataclasses import dataclass
from typing import Callable

from pfuzz.base.constants import CALL_MODES
from pfuzz.errors import TargetError

#: Seconds a command target may take for the whole run.
DEFAULT_TIMEOUT = 60.0
ACCEPT_WORDS = ("1", "true", "accept")
REJECT_WORDS = ("0", "false", "reject")


@dataclass(frozen=True)
class Verdict:
    """What the validator said about one string; ``error`` names an exception it raised."""

    accepted: bool
    error: str = ""


# -- Python functions ---------------------------------------------------------------

def load_function(spec: str, directory: str | None = None) -> Callable:
    """Import ``module:function`` (dotted names allowed on both sides) from ``directory``."""
    module_name, sep, attribute = spec.partition(":")
    if not sep or not module_name or not attribute:
        raise TargetError(f"--target must look like module:function, not {spec!r}")
    directory = os.getcwd() if directory is None else directory
    if directory not in sys.path:
        sys.path.insert(0, directory)
    try:
        thing = importlib.import_module(module_name)
    except ModuleNotFoundError as error:
        raise TargetError(f"cannot import {module_name!r} from {directory}: {error}") from None
    except Exception as error:  # the user's module failed while importing
        raise TargetError(f"importing {module_name!r} failed: {type(error).__name__}: {error}") from None
    for name in attribute.split("."):
        if not hasattr(thing, name):
            raise TargetError(f"{module_name!r} has no attribute {attribute!r}")
        thing = getattr(thing, name)
    if not callable(thing):
        raise TargetError(f"{spec} is not callable")
    return thing


class PythonTarget:
    """A Python function called with one string; truthy accepts, an exception rejects."""

    def __init__(self, spec: str, directory: str | None = None):
        self.label = spec
        self.function = load_function(spec, directory)

    def run(self, texts: list[str]) -> list[Verdict]:
        return [self.call(text) for text in texts]

    def call(self, text: str) -> Verdict:
        try:
            return Verdict(bool(self.function(text)))
        except Exception as error:  # the validator's own failure is a verdict, reported with its type
            return Verdict(False, f"{type(error).__name__}: {error}")


# -- commands -----------------------------------------------------------------------

class CommandTarget:
    """A command that reads JSON string literals, one per line, and answers one verdict per line."""

    def __init__(self, command: str, timeout: float = DEFAULT_TIMEOUT):
        try:
            self.argv = shlex.split(command)
        except ValueError as error:
            raise TargetError(f"cannot split --cmd {command!r}: {error}") from None
        if not self.argv:
            raise TargetError("--cmd is empty")
        if timeout <= 0:
            raise TargetError(f"the timeout must be positive, not {timeout}")
        self.label, self.timeout = command, timeout

    def run(self, texts: list[str]) -> list[Verdict]:
        payload = "".join(json.dumps(text) + "\n" for text in texts)
        code, out, err = self._execute(payload, len(texts))
        lines = out.splitlines()
        if code != 0:
            raise TargetError(f"the command crashed: {_status(code)} after answering "
                              f"{len(lines)} of {len(texts)} strings", _tail(err))
        if len(lines) != len(texts):
            what = "a short answer" if len(lines) < len(texts) else "too many answers"
            raise TargetError(f"{what}: the command answered {len(lines)} lines for "
                              f"{len(texts)} strings", _tail(err))
        return [_verdict(line, i) for i, line in enumerate(lines, 1)]

    def _execute(self, payload: str, count: int) -> tuple[int, str, str]:
        try:
            process = subprocess.Popen(self.argv, stdin=subprocess.PIPE, stdout=subprocess.PIPE,
                                       stderr=subprocess.PIPE, start_new_session=True)
        except OSError as error:
            raise TargetError(f"cannot run {self.argv[0]!r}: {error.strerror}") from None
        try:
            out, err = process.communicate(payload.encode("ascii"), timeout=self.timeout)
        except subprocess.TimeoutExpired:
            _kill(process)
            out, err = process.communicate()
            answered = len(out.decode("utf-8", "replace").splitlines())
            raise TargetError(f"the command did not finish within {self.timeout:g} s (a hang?); "
                              f"it had answered {answered} of {count} strings; "
                              "use --timeout to allow more", _tail(err.decode("utf-8", "replace")))
        return process.returncode, out.decode("utf-8", "replace"), err.decode("utf-8", "replace")


def _kill(process: subprocess.Popen) -> None:
    """Kill the command and anything it started (it leads its own process group)."""
    try:
        os.killpg(process.pid, signal.SIGKILL)
    except (ProcessLookupError, PermissionError):
        process.kill()


def _status(code: int) -> str:
    if code < 0:
        try:
            return f"killed by signal {signal.Signals(-code).name}"
        except ValueError:
            return f"killed by signal {-code}"
    return f"exit status {code}"


def _tail(text: str, lines: int = 5) -> str:
    kept = text.strip().splitlines()[-lines:]
    return "\n".join(f"  | {line}" for line in kept)


def _verdict(line: str, number: int) -> Verdict:
    word = line.strip().lower()
    if word in ACCEPT_WORDS:
        return Verdict(True)
    if word in REJECT_WORDS:
        return Verdict(False)
    raise TargetError(f"line {number} of the answer is {line.strip()[:40]!r}; expected "
                      "1/0, true/false or accept/reject")


# -- regular expressions --------------------------------------------------------------

class RegexTarget:
    """A Python ``re`` pattern called as ``re.<mode>(pattern, text)``."""

    def __init__(self, pattern: str, mode: str = "fullmatch"):
        if mode not in CALL_MODES:
            raise TargetError(f"--mode must be one of {', '.join(CALL_MODES)}, not {mode!r}")
        try:
            compiled = re.compile(pattern)
        except re.error as error:
            raise TargetError(f"--regex is not a Python regular expression: {error}") from None
        self.pattern, self.mode = pattern, mode
        self.label = f"re.{mode}({pattern!r})"
        self._call = getattr(compiled, mode)

    def run(self, texts: list[str]) -> list[Verdict]:
        return [Verdict(self._call(text) is not None) for text in texts]

    def language(self, alphabet):
        """The exact language this call accepts over ``alphabet`` (a PatternError if not regular).

        The compiler models the call mode itself (``re.match`` is the full match
        of ``R(?s:.*)``, so ``R$`` keeps its meaning), which L(R)·U* would not.
        """
        from pfuzz.language import compile as compile_pattern

        return compile_pattern(self.pattern, alphabet, mode=self.mode)
