"""The child side of a Python target: import the validator, call it, answer in rounds.

A ``--target module:function`` runs in a child interpreter started as
``python -c <this file's source> CONFIG`` (``pfuzz.audit.targets.PythonTarget``),
so nothing the function does can reach pfuzz itself: ``sys.exit`` and
``os._exit``, printing or closing standard output, reading standard input,
raising any ``BaseException``, hanging in C code (a regular expression that
backtracks for ever), crashing the interpreter. This file imports only the
standard library (the child never imports pfuzz) and is also used in-process by
``CallableTarget`` for its one rule of calling (``call``).

Private protocol (pfuzz talks to its own worker; commands use the line protocol
of ``pfuzz.audit.targets``):

- the worker's first line is ``{"ready": true}`` or ``{"failed": MESSAGE}``;
- pfuzz sends one line per round, a JSON array of strings; the worker answers
  one line, ``{"verdicts": V, "raised": [[i, TYPE, MESSAGE, REJECT], ...]}``,
  where ``V`` has one character per string: ``1`` accepted, ``0`` rejected,
  ``!`` raised (details under ``raised``); a ``SystemExit`` stops the round
  with ``"exit": [i, CODE]`` and the verdicts of the strings before it;
- before each call the worker writes the string's index + 1 into an 8-byte
  shared slot (a file pfuzz passes by descriptor), so that after a hang pfuzz
  can name the string it hung on (0: between calls).

Isolation inside the child: the protocol runs over private duplicates of file
descriptors 0 and 1; descriptor 0 then reads ``/dev/null`` and descriptor 1
writes to standard error (which pfuzz drains and keeps the tail of, for error
messages), and ``sys.stdout``/``sys.stderr`` are put back before a call when
the function closed them. On Linux the child asks to be killed when pfuzz
dies (``PR_SET_PDEATHSIG``), so a hung worker never outlives it.
"""

from __future__ import annotations

import builtins
import importlib
import io
import json
import mmap
import os
import sys

__all__ = ["Refused", "call", "exception_name", "load", "resolve_exception", "main"]

#: Longest exception message kept (characters); longer ones are cut with an ellipsis.
MESSAGE_LIMIT = 300


class Refused(Exception):
    """A target or exception name that cannot be used; the message says why."""


def exception_name(kind: type) -> str:
    """``IndexError`` for builtins, ``package.module.Name`` for the rest."""
    module = getattr(kind, "__module__", "") or ""
    name = getattr(kind, "__qualname__", kind.__name__)
    return name if module in ("builtins", "exceptions", "__main__") else f"{module}.{name}"


def _message(error: BaseException) -> str:
    try:
        text = str(error)
    except BaseException:  # a __str__ that fails is the validator's own problem
        text = "<the exception's message could not be written>"
    return text if len(text) <= MESSAGE_LIMIT else text[:MESSAGE_LIMIT - 1] + "\u2026"


def resolve_exception(name: str) -> type:
    """An exception class from a builtin name (``KeyError``) or a dotted one (``pkg.mod.Error``).

    Raises ``Refused`` with a plain message when the name is not an exception class.
    """
    name = name.strip()
    thing = getattr(builtins, name, None) if "." not in name else None
    if thing is None and "." in name:
        module_name, _, rest = name.rpartition(".")
        parts = rest.split(".")
        while thing is None and module_name:
            try:
                thing = importlib.import_module(module_name)
            except ImportError:
                module_name, _, head = module_name.rpartition(".")
                parts.insert(0, head)
                continue
            for part in parts:
                thing = getattr(thing, part, None)
    if not (isinstance(thing, type) and issubclass(thing, BaseException)):
        raise Refused(f"--reject-on {name!r} is not an exception class "
                          "(give a builtin name such as KeyError or a dotted name such as "
                          "package.module.Error)")
    return thing


def load(spec: str, directory: str):
    """Import ``module:function`` from ``directory``; ``Refused`` says what is wrong with the name.

    What the module itself raises while importing propagates.
    """
    module_name, sep, attribute = spec.partition(":")
    if not sep or not module_name or not attribute:
        raise Refused(f"--target must look like module:function, not {spec!r}")
    if directory not in sys.path:
        sys.path.insert(0, directory)
    thing = importlib.import_module(module_name)
    for name in attribute.split("."):
        if not hasattr(thing, name):
            raise Refused(f"{module_name!r} has no attribute {attribute!r}")
        thing = getattr(thing, name)
    if not callable(thing):
        raise Refused(f"{spec} is not callable")
    return thing


def call(function, text: str, reject_on: tuple[type, ...], passthrough: tuple[type, ...] = (SystemExit,)):
    """One call: ``True``/``False``, or ``(TYPE, MESSAGE, counts_as_reject)`` when it raised.

    An exception of a ``passthrough`` type that ``reject_on`` does not name
    propagates (a ``SystemExit`` is reported by the caller as a validator that
    exits); every other ``BaseException`` is caught and described. Derived from
    ``ValueError`` or named in ``reject_on``, it counts as a reject.
    """
    try:
        return bool(function(text))
    except BaseException as error:
        if isinstance(error, reject_on):
            return exception_name(type(error)), _message(error), True
        if isinstance(error, passthrough):
            raise
        return exception_name(type(error)), _message(error), isinstance(error, ValueError)


# -- the child process --------------------------------------------------------------

class _Channel:
    """The protocol's private descriptors, and what the validator sees instead."""

    def __init__(self):
        self.requests = os.fdopen(os.dup(0), "rb")
        self.answers = os.fdopen(os.dup(1), "wb")
        null = os.open(os.devnull, os.O_RDONLY)
        os.dup2(null, 0)
        os.close(null)
        os.dup2(2, 1)  # the validator's own output joins its error output
        sys.stdin = io.StringIO("")
        self.restore()

    @staticmethod
    def restore() -> None:
        for name in ("stdout", "stderr"):
            stream = getattr(sys, name)
            if stream is None or getattr(stream, "closed", True):
                fresh = io.TextIOWrapper(io.FileIO(os.dup(2), "w"), line_buffering=True,
                                         errors="backslashreplace")
                setattr(sys, name, fresh)
                setattr(sys, f"__{name}__", fresh)

    def send(self, answer: dict) -> None:
        self.answers.write(json.dumps(answer, ensure_ascii=True).encode("ascii") + b"\n")
        self.answers.flush()


def _die_with_parent() -> None:
    try:
        import ctypes
        import signal

        ctypes.CDLL(None, use_errno=True).prctl(1, signal.SIGKILL)  # PR_SET_PDEATHSIG
    except (OSError, AttributeError, ImportError):
        return


def _start(channel: _Channel, config: dict):
    module = config["target"].partition(":")[0]
    try:
        function = load(config["target"], config["directory"])
        return function, tuple(resolve_exception(n) for n in config["reject_on"])
    except Refused as error:
        channel.send({"failed": str(error)})
    except SystemExit as error:
        channel.send({"failed": f"importing {module!r} called sys.exit({error.code!r})"})
    except ModuleNotFoundError as error:
        channel.send({"failed": f"cannot import {module!r} from {config['directory']}: {error}"})
    except BaseException as error:  # the user's module failed while importing
        channel.send({"failed": f"importing {module!r} failed: "
                                f"{exception_name(type(error))}: {_message(error)}"})
    return None


def _round(function, reject_on, texts: list, slot) -> dict:
    verdicts, raised = [], []
    for index, text in enumerate(texts):
        slot[0] = index + 1
        out, err = sys.stdout, sys.stderr
        if out is None or err is None or out.closed or err.closed:
            _Channel.restore()
        try:
            answer = call(function, text, reject_on)
        except SystemExit as error:
            slot[0] = 0
            return {"verdicts": "".join(verdicts), "raised": raised, "exit": [index, repr(error.code)]}
        if answer is True or answer is False:
            verdicts.append("1" if answer else "0")
        else:
            verdicts.append("!")
            raised.append([index, *answer])
    slot[0] = 0
    return {"verdicts": "".join(verdicts), "raised": raised}


def main(argv: list[str]) -> None:
    config = json.loads(argv[1])
    _die_with_parent()
    channel = _Channel()
    slot = memoryview(mmap.mmap(config["slot"], 8)).cast("q")
    started = _start(channel, config)
    if started is None:
        return
    function, reject_on = started
    channel.send({"ready": True})
    for line in channel.requests:
        channel.send(_round(function, reject_on, json.loads(line), slot))


if __name__ == "__main__":
    main(sys.argv)
