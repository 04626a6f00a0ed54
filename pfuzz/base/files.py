"""Atomic file writes: a temporary file in the same directory, then a rename.

A user's file is never half-written: an interrupted run leaves the old file
(or nothing), because ``os.replace`` is atomic on POSIX and Windows when the
source and target are on the same file system. The temporary sibling is
named by ``tempfile.mkstemp`` (``.NAME.PID-HOST.XXXXXXXX.tmp``, created with
``O_EXCL``), so writers running at the same time never share one; the last
rename wins and every reader sees one whole file. ``mkstemp`` makes the file
private (0600); before the rename it gets the mode of an ordinary new file
(0666 less the umask), since output is meant to be shared.

Interruption. Any exception, including ``KeyboardInterrupt``, unlinks the
temporary file. While a write runs in the main thread, SIGTERM and SIGHUP (what
``timeout``, ``kill``, a closed terminal, container stops and CI cancellation
send) raise ``Terminated``, a ``KeyboardInterrupt``, so they clean up as Ctrl-C
does (``terminate_as_interrupt``; only when the signal still has its default
action, which would kill the process on the spot). A process killed outright
(SIGKILL, power loss) cannot clean up: the target is still whole, but the
temporary sibling stays behind. Its name records the owner (``PID-HOST``: the
process id and a digest of the host name), so the next write beside the same
target removes the siblings whose owner was on this host and is gone
(``remove_stale``). A sibling of a live process, or of another host (a shared
file system), is never touched. Limit: a recycled process id keeps a stale
sibling until that process ends too.

Targets. Only a regular file (or nothing) is replaced: a symbolic link, a folder,
a device or a pipe at the target is refused with an ``OutputError``
(``check_target_file``), since renaming onto it would replace the link or the
device node itself rather than write through it. The check is repeated just
before the rename; a link made in the microseconds between is not caught.

Two faces over one mechanism:

- ``write_atomic(path, data)`` writes a whole ``str`` or ``bytes`` at once.
- ``atomic_writer(path)`` is a context manager yielding a text handle, for
  files too large to hold as one string: text is encoded and written in
  buffered blocks, and a ``Checksum`` passed in is updated as the bytes go
  out (SHA-256 with ``hashlib``'s incremental ``update``, and the size), so
  the digest of a large file costs no second read.

Cost: one write, one ``fsync`` and one rename per file, and one listing of the
target's folder (for stale siblings); the streaming writer holds one buffer
(``BUFFER_SIZE``) of encoded text at a time.
"""

from __future__ import annotations

import io
import os
import re
import signal
import stat
import threading
from contextlib import contextmanager
from pathlib import Path
from typing import BinaryIO, Callable, Iterator, TextIO

from pfuzz.base.escaping import escape_text
from pfuzz.errors import OutputError, shorten

__all__ = ["BUFFER_SIZE", "Checksum", "Terminated", "atomic_writer", "check_target_file",
           "current_umask", "owned_prefix", "remove_stale", "sha256_file", "sha256_of",
           "shown_path", "terminate_as_interrupt", "write_atomic"]

#: Bytes the streaming writer gathers before each write to the file.
BUFFER_SIZE = 1 << 20


class Checksum:
    """The SHA-256 digest and the size of the bytes written so far."""

    def __init__(self) -> None:
        import hashlib  # here and below: imported on use, so short commands start faster
        self._hash = hashlib.sha256()
        self.size = 0

    def update(self, data: "bytes | memoryview") -> None:
        self._hash.update(data)
        self.size += len(data)

    @property
    def sha256(self) -> str:
        return self._hash.hexdigest()


class _CheckedFile(io.RawIOBase):
    """A raw binary sink that writes every byte to ``target`` and feeds ``checksum``;
    after ``abandon`` it drops what it is given (the file is about to be removed)."""

    def __init__(self, target: BinaryIO, checksum: Checksum | None):
        super().__init__()
        self._target, self._checksum = target, checksum

    def writable(self) -> bool:
        return True

    def write(self, data) -> int:
        view = memoryview(data).cast("B")
        if self._target is not None:
            self._target.write(view)
            if self._checksum is not None:
                self._checksum.update(view)
        return len(view)

    def abandon(self) -> None:
        self._target = None


def current_umask() -> int:
    """The process umask (read by setting and restoring it; there is no getter)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


# -- interruption ---------------------------------------------------------------------

class Terminated(KeyboardInterrupt):
    """SIGTERM or SIGHUP arrived inside ``terminate_as_interrupt``; raised like Ctrl-C's
    ``KeyboardInterrupt`` so that every ``finally`` and ``except BaseException`` cleans up.
    ``signal_number`` is the signal (``128 + signal_number`` is the shell's exit status)."""

    def __init__(self, signal_number: int):
        super().__init__(signal.Signals(signal_number).name)
        self.signal_number = signal_number


#: Signals whose default action kills the process without cleaning up.
CAUGHT_SIGNALS = tuple(getattr(signal, name) for name in ("SIGTERM", "SIGHUP")
                       if hasattr(signal, name))


@contextmanager
def terminate_as_interrupt() -> Iterator[None]:
    """While the block runs, SIGTERM and SIGHUP raise ``Terminated``; later ones during the
    cleanup are ignored. A signal whose action is not the default one (the program set its
    own) is left alone, and so is every signal outside the main thread. Blocks nest."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    taken = [s for s in CAUGHT_SIGNALS if signal.getsignal(s) is signal.SIG_DFL]

    def stop(number, _frame):
        for s in taken:
            signal.signal(s, signal.SIG_IGN)
        raise Terminated(number)

    for s in taken:
        signal.signal(s, stop)
    try:
        yield
    finally:
        for s in taken:
            signal.signal(s, signal.SIG_DFL)


# -- owners of temporary siblings ------------------------------------------------------

def _host_tag() -> str:
    import hashlib
    import socket
    return hashlib.sha256(socket.gethostname().encode("utf-8", "replace")).hexdigest()[:12]


_OWNER = re.compile(r"(?P<pid>[0-9]+)-(?P<host>[0-9a-f]{12})\.[A-Za-z0-9_]+")


def owned_prefix(path: Path) -> str:
    """The name prefix of a temporary sibling of ``path`` made by this process:
    ``.NAME.PID-HOST.`` (``mkstemp``/``mkdtemp`` add a random part and the suffix)."""
    return f".{path.name}.{os.getpid()}-{_host_tag()}."


def _alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OverflowError):
        return True             # another user's process (or no such number): not ours to judge
    return True


def remove_stale(path: Path, suffix: str, keep: Callable[[Path], bool] = lambda p: False) -> None:
    """Remove the temporary siblings of ``path`` ending in ``suffix`` whose owner ran on this
    host and is gone (see the module docstring), unless ``keep(sibling)``. Best effort:
    a sibling that cannot be removed stays."""
    head, host = f".{path.name}.", _host_tag()
    try:
        names = os.listdir(path.parent)
    except OSError:
        return
    for name in names:
        if not (name.startswith(head) and name.endswith(suffix)):
            continue
        owner = _OWNER.fullmatch(name[len(head):len(name) - len(suffix)])
        if owner is None or owner["host"] != host or _alive(int(owner["pid"])):
            continue
        sibling = path.parent / name
        if keep(sibling):
            continue
        if sibling.is_dir() and not sibling.is_symlink():
            import shutil
            shutil.rmtree(sibling, ignore_errors=True)
        else:
            try:
                sibling.unlink()
            except OSError:
                pass


# -- targets ----------------------------------------------------------------------------

def shown_path(path: "str | Path") -> str:
    """A path as one line of a message: control characters escaped, long ones cut."""
    return f"'{shorten(escape_text(str(path)), 160)}'"


_KINDS = ((stat.S_ISDIR, "a folder"), (stat.S_ISCHR, "a character device"),
          (stat.S_ISBLK, "a block device"), (stat.S_ISFIFO, "a pipe"), (stat.S_ISSOCK, "a socket"))


def check_target_file(path: "str | Path", parameter: str = "path") -> None:
    """Raise ``OutputError`` unless ``path`` names nothing yet or a regular file (not a link).

    ``parameter`` is the caller's name for the path, used in the advice."""
    if "\x00" in str(path):
        raise OutputError("{shown} holds a NUL character, which no file name may hold; "
                          "give another {path}", parameters={"path": parameter},
                          shown=shown_path(path))
    try:
        info = os.lstat(path)
    except (FileNotFoundError, NotADirectoryError):
        return
    if stat.S_ISREG(info.st_mode):
        return
    if stat.S_ISLNK(info.st_mode):
        kind = "a symbolic link (pfuzz replaces a file whole, which would replace the link, " \
               "not write through it)"
    else:
        kind = next((name for test, name in _KINDS if test(info.st_mode)), "not a regular file")
    raise OutputError("refusing to replace {shown}: it is " + kind + "; give {path} a regular "
                      "file or a new name", parameters={"path": parameter},
                      shown=shown_path(path))


@contextmanager
def _temporary_sibling(path: Path) -> Iterator[BinaryIO]:
    """A new binary file beside ``path``; renamed onto ``path`` if the block succeeds."""
    check_target_file(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    remove_stale(path, ".tmp")
    import tempfile
    with terminate_as_interrupt():
        fd, temp = tempfile.mkstemp(prefix=owned_prefix(path), suffix=".tmp", dir=path.parent)
        try:
            with os.fdopen(fd, "wb") as handle:
                yield handle
                handle.flush()
                os.chmod(handle.fileno(), 0o666 & ~current_umask())
                os.fsync(handle.fileno())
            check_target_file(path)
            os.replace(temp, path)
        except BaseException:
            try:
                os.unlink(temp)
            except FileNotFoundError:
                pass
            raise


def write_atomic(path: "str | Path", data: "str | bytes", encoding: str = "utf-8") -> None:
    """Write ``data`` to ``path`` via a temporary sibling and an atomic rename."""
    raw = data.encode(encoding) if isinstance(data, str) else data
    with _temporary_sibling(Path(path)) as handle:
        handle.write(raw)


@contextmanager
def atomic_writer(path: "str | Path", encoding: str = "utf-8", newline: str | None = "",
                  checksum: Checksum | None = None) -> Iterator[TextIO]:
    """A text handle whose contents replace ``path`` atomically when the block ends.

    ``newline`` is as for ``open``; the default ``""`` writes line ends exactly
    as given (the same bytes on every platform; what ``csv`` needs). When the
    block raises, ``path`` is left as it was and the temporary file is removed.
    ``checksum`` (optional) sees every byte written.
    """
    with _temporary_sibling(Path(path)) as target:
        sink = _CheckedFile(target, checksum)
        text = io.TextIOWrapper(io.BufferedWriter(sink, buffer_size=BUFFER_SIZE),
                                encoding=encoding, newline=newline)
        try:
            yield text
            if not text.closed:
                text.flush()
        except BaseException:
            sink.abandon()          # the buffered rest goes nowhere; the file is removed
            raise
        finally:
            text.close()


def sha256_of(data: "str | bytes") -> str:
    import hashlib
    raw = data.encode("utf-8") if isinstance(data, str) else data
    return hashlib.sha256(raw).hexdigest()


def sha256_file(path: "str | Path") -> tuple[int, str]:
    """(size, SHA-256 hex digest) of a file, read in ``BUFFER_SIZE`` blocks."""
    checksum = Checksum()
    with open(path, "rb") as handle:
        while block := handle.read(BUFFER_SIZE):
            checksum.update(block)
    return checksum.size, checksum.sha256
