"""Atomic file writes: a temporary file in the same directory, then a rename.

A user's file is never half-written: an interrupted run leaves the old file
(or nothing), because ``os.replace`` is atomic on POSIX and Windows when the
source and target are on the same file system. The temporary sibling is
named by ``tempfile.mkstemp`` (``.NAME.XXXXXXXX.tmp``, created with
``O_EXCL``), so writers running at the same time never share one; the last
rename wins and every reader sees one whole file. ``mkstemp`` makes the file
private (0600); before the rename it gets the mode of an ordinary new file
(0666 less the umask), since output is meant to be shared. Any exception, including
``KeyboardInterrupt``, unlinks the temporary file. Limit: a process killed
outright (SIGKILL, power loss) cannot clean up; the target is still whole,
but the hidden temporary sibling stays behind.

Two faces over one mechanism:

- ``write_atomic(path, data)`` writes a whole ``str`` or ``bytes`` at once.
- ``atomic_writer(path)`` is a context manager yielding a text handle, for
  files too large to hold as one string: text is encoded and written in
  buffered blocks, and a ``Checksum`` passed in is updated as the bytes go
  out (SHA-256 with ``hashlib``'s incremental ``update``, and the size), so
  the digest of a large file costs no second read.

Cost: one write, one ``fsync`` and one rename per file; the streaming writer
holds one buffer (``BUFFER_SIZE``) of encoded text at a time.
"""

from __future__ import annotations

import hashlib
import io
import os
import tempfile
from contextlib import contextmanager
from pathlib import Path
from typing import BinaryIO, Iterator, TextIO

#: Bytes the streaming writer gathers before each write to the file.
BUFFER_SIZE = 1 << 20


class Checksum:
    """The SHA-256 digest and the size of the bytes written so far."""

    def __init__(self) -> None:
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


@contextmanager
def _temporary_sibling(path: Path) -> Iterator[BinaryIO]:
    """A new binary file beside ``path``; renamed onto ``path`` if the block succeeds."""
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, temp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as handle:
            yield handle
            handle.flush()
            os.chmod(handle.fileno(), 0o666 & ~current_umask())
            os.fsync(handle.fileno())
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
    raw = data.encode("utf-8") if isinstance(data, str) else data
    return hashlib.sha256(raw).hexdigest()
