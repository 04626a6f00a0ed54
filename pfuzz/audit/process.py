"""A validator process exchanged with in rounds, every wait bounded.

``Process`` starts a program in a session of its own (so it and everything it
starts share one process group), writes one round of request lines, and reads
answer lines while it writes (one ``select`` loop over its standard input,
output and error, so neither side can block the other on a full pipe).

Bounds, each a ``TargetError`` when crossed, never a hang or unbounded memory:

- time: each round has a deadline (the target's timeout); when it passes,
  the whole process group is killed and pfuzz stops reading at once. It never
  waits for end of file without a deadline, because a descendant that left the
  group (``setsid``) may hold the pipe open for as long as it likes;
- answer size: ``line_limit`` bytes per answer line, and no more lines than
  asked for (so a round reads at most (lines + 1) × ``line_limit`` bytes:
  ``yes 1`` is stopped at the first surplus line);
- error output is drained as it comes and only its last ``ERROR_TAIL`` bytes
  are kept (shown in error messages).

Ending: ``close`` sends end of input, waits ``GRACE`` seconds at most, then
kills the group whatever happened (a validator's helpers do not outlive the
audit). Processes still running when pfuzz exits, or when an exception such
as Ctrl-C's ``KeyboardInterrupt`` unwinds through a round, are killed too.

Descendants that left the group: a process that starts a new session of its
own (``setsid``) is out of the process group's reach, so each validator is
started with a run token in its environment (``RUN_TOKEN_VARIABLE``), which
its descendants inherit; when the group is killed, every process of this user
whose environment carries the token is killed as well (found by reading
``/proc/PID/environ``, Linux). What still escapes: a descendant that clears or
rewrites its environment, and any descendant on a system without ``/proc``.
The scan reads one small file per running process, once per validator's end
(a few milliseconds).
"""

from __future__ import annotations

import atexit
import itertools
import os
import selectors
import signal
import subprocess
import time
import weakref
from dataclasses import dataclass

from pfuzz.errors import TargetError

__all__ = ["ERROR_TAIL", "GRACE", "RUN_TOKEN_VARIABLE", "Process", "Round", "carriers", "describe_status",
           "error_tail", "kill_carriers"]

#: Bytes of a validator's error output kept for messages.
ERROR_TAIL = 8192
#: Seconds a validator may take to exit after end of input before its group is killed.
GRACE = 0.5
#: Bytes read or written per system call.
CHUNK = 65536

#: Environment variable carrying a validator's run token to all its descendants.
RUN_TOKEN_VARIABLE = "PFUZZ_VALIDATOR_RUN"
PROC = "/proc"

_LIVE: "weakref.WeakSet[Process]" = weakref.WeakSet()
_STARTS = itertools.count()


@dataclass
class Round:
    """What one round read: complete answer lines, and how the reading ended."""

    lines: list[bytes]
    ended: str   #: "answered", "end of output", "stalled" or "timeout"


class Process:
    """One running validator in its own session; ``label`` names it in messages."""

    def __init__(self, argv: list[str], label: str, pass_fds: tuple[int, ...] = ()):
        self.token = f"{os.getpid()}.{next(_STARTS)}.{time.monotonic_ns()}"
        environment = {**os.environ, RUN_TOKEN_VARIABLE: self.token}
        try:
            self.popen = subprocess.Popen(argv, stdin=subprocess.PIPE, stdout=subprocess.PIPE,
                                          stderr=subprocess.PIPE, start_new_session=True,
                                          pass_fds=pass_fds, bufsize=0, env=environment)
        except OSError as error:
            raise TargetError(f"cannot run {argv[0]!r}: {error.strerror}") from None
        self.label = label
        self.pending = bytearray()   # answer bytes read but not yet handed out
        self.tail = bytearray()
        self.output_open = True
        self.input_open = True
        self.killed = False
        for stream in (self.popen.stdin, self.popen.stdout, self.popen.stderr):
            os.set_blocking(stream.fileno(), False)
        _LIVE.add(self)

    # -- one round ------------------------------------------------------------------

    def exchange(self, data: bytes, lines: int, deadline: float, line_limit: int, *,
                 stall: float | None = None, end_input: bool = False,
                 until_end: bool = False) -> Round:
        """Write ``data``, then read until ``lines`` answer lines have come (or the output ends).

        ``stall``: give up (``ended="stalled"``) when all was written, the
        round is not complete and nothing new came for this many seconds.
        ``end_input``: close standard input once ``data`` is written.
        ``until_end``: read on to the end of the output (a surplus line is an error).
        Never returns after ``deadline`` (``time.monotonic()``).
        """
        try:
            return self._exchange(memoryview(data), lines, deadline, line_limit, stall, end_input,
                                  until_end)
        except BaseException:
            self.kill()
            raise

    def _exchange(self, data, lines, deadline, line_limit, stall, end_input, until_end) -> Round:
        selector = selectors.DefaultSelector()
        last = time.monotonic()
        try:
            self._register(selector, data, end_input)
            while True:
                done = self._complete(lines, line_limit, until_end)
                if done is not None:
                    return done
                if not self.output_open:
                    if self.pending and not self.pending.endswith(b"\n"):
                        self.pending += b"\n"  # a last answer without its line end
                        self._complete(lines, line_limit, True)
                    return Round(self._take(lines), "end of output")
                now = time.monotonic()
                if now >= deadline:
                    return Round(self._take(lines), "timeout")
                wait = deadline - now
                if stall is not None and not data:
                    if now - last >= stall:
                        return Round(self._take(lines), "stalled")
                    wait = min(wait, stall - (now - last))
                for key, _ in selector.select(wait):
                    if key.data == "in":
                        data = self._write(selector, data, end_input)
                        if not data:
                            last = time.monotonic()  # the wait for answers starts now
                    elif self._read(selector, key.data):
                        last = time.monotonic()
        finally:
            selector.close()

    def _register(self, selector, data, end_input: bool) -> None:
        if self.input_open and data:
            selector.register(self.popen.stdin, selectors.EVENT_WRITE, "in")
        elif end_input:
            self.end_input()
        if self.output_open:
            selector.register(self.popen.stdout, selectors.EVENT_READ, "out")
        if not self.popen.stderr.closed:
            selector.register(self.popen.stderr, selectors.EVENT_READ, "err")

    def _write(self, selector, data, end_input: bool):
        try:
            written = os.write(self.popen.stdin.fileno(), data[:CHUNK])
        except BlockingIOError:
            return data
        except (BrokenPipeError, ConnectionResetError):
            written = len(data)  # it stopped reading; what it answers decides
            self.input_open = False
        data = data[written:]
        if not data:
            selector.unregister(self.popen.stdin)
            if end_input:
                self.end_input()
        return data

    def _read(self, selector, which: str) -> bool:
        """Read what is there; True when new answer bytes came."""
        stream = self.popen.stdout if which == "out" else self.popen.stderr
        try:
            chunk = os.read(stream.fileno(), CHUNK)
        except BlockingIOError:
            return False
        if not chunk:
            selector.unregister(stream)
            if which == "out":
                self.output_open = False
            else:
                stream.close()
            return which == "out"
        if which == "err":
            self.tail += chunk
            del self.tail[:-ERROR_TAIL]
            return False
        self.pending += chunk
        return True

    def _complete(self, lines: int, line_limit: int, until_end: bool) -> Round | None:
        """The round once ``lines`` lines are in; a TargetError past the bounds."""
        count = self.pending.count(b"\n")
        if len(self.pending) > line_limit and max(map(len, self.pending.split(b"\n"))) > line_limit:
            raise TargetError(f"{self.label} wrote an answer line longer than {line_limit:,} bytes "
                              f"(after {min(count, lines):,} of {lines:,} answers)", self.error_tail())
        if count <= lines:
            return Round(self._take(lines), "answered") if count == lines and not until_end else None
        raise TargetError(f"too many answers: {self.label} answered more than {lines:,} lines "
                          f"for {lines:,} strings", self.error_tail())

    def _take(self, lines: int) -> list[bytes]:
        parts = bytes(self.pending).split(b"\n")
        kept, rest = parts[:lines], parts[lines:]
        if len(parts) <= lines:
            kept, rest = parts[:-1], parts[-1:]
        self.pending = bytearray(b"\n".join(rest))
        return kept

    def surplus(self) -> bool:
        """Whether answer bytes are waiting that no round asked for (read without waiting)."""
        if self.output_open:
            try:
                chunk = os.read(self.popen.stdout.fileno(), CHUNK)
                self.pending += chunk
                self.output_open = bool(chunk)
            except BlockingIOError:
                pass
        return bool(self.pending.strip())

    # -- ending ---------------------------------------------------------------------

    def end_input(self) -> None:
        if self.input_open or not self.popen.stdin.closed:
            self.input_open = False
            try:
                self.popen.stdin.close()
            except OSError:
                pass

    def wait(self, deadline: float) -> int | None:
        """The exit status, waiting until ``deadline`` at most (None: still running)."""
        try:
            return self.popen.wait(max(0.0, deadline - time.monotonic()))
        except subprocess.TimeoutExpired:
            return None

    def kill(self) -> None:
        """Kill the whole process group and close the pipes; never waits for end of file."""
        if self.killed:
            return
        self.killed = True
        try:
            os.killpg(self.popen.pid, signal.SIGKILL)
        except (ProcessLookupError, PermissionError):
            pass
        try:
            self.popen.kill()
        except OSError:
            pass
        kill_carriers(self.token)
        try:
            self.popen.wait(5)
        except subprocess.TimeoutExpired:
            pass
        for stream in (self.popen.stdin, self.popen.stdout, self.popen.stderr):
            try:
                stream.close()
            except OSError:
                pass
        self.input_open = self.output_open = False
        _LIVE.discard(self)

    def close(self) -> int | None:
        """End of input, ``GRACE`` seconds to exit, then the group is killed; the exit status."""
        self.end_input()
        status = self.wait(time.monotonic() + GRACE)
        self.kill()
        return status

    def error_tail(self) -> str:
        return error_tail(self.tail.decode("utf-8", "replace"))


def carriers(token: str, proc: str = PROC) -> list[int]:
    """Processes (other than this one) whose environment carries ``token`` (Linux ``/proc``)."""
    needle = f"{RUN_TOKEN_VARIABLE}={token}".encode()
    try:
        entries = os.listdir(proc)
    except OSError:
        return []
    found = []
    for entry in entries:
        if not entry.isdigit() or int(entry) == os.getpid():
            continue
        try:
            with open(os.path.join(proc, entry, "environ"), "rb") as environ:
                variables = environ.read().split(b"\0")
        except OSError:
            continue  # gone, or not ours to read
        if needle in variables:
            found.append(int(entry))
    return found


def kill_carriers(token: str) -> None:
    """Kill every process found by ``carriers``: the descendants that left the group."""
    for pid in carriers(token):
        try:
            os.kill(pid, signal.SIGKILL)
        except OSError:
            pass


def error_tail(text: str, lines: int = 5) -> str:
    """The last lines of a validator's error output, indented for a message."""
    kept = text.strip().splitlines()[-lines:]
    return "\n".join(f"  | {line[:200]}" for line in kept)


def describe_status(code: int | None) -> str:
    if code is None:
        return "still running"
    if code < 0:
        try:
            return f"killed by signal {signal.Signals(-code).name}"
        except ValueError:
            return f"killed by signal {-code}"
    return f"exit status {code}"


@atexit.register
def _kill_leftovers() -> None:
    for process in list(_LIVE):
        process.kill()
