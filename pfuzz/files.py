"""Atomic file writes: a temporary file in the same directory, then a rename.

A user's file is never half-written: an interrupted run leaves the old file
(or nothing), because ``os.replace`` is atomic on POSIX and Windows when the
source and target are on the same file system.
"""

from __future__ import annotations

import hashlib
import os
import tempfile
from pathlib import Path


def write_atomic(path: "str | Path", data: "str | bytes", encoding: str = "utf-8") -> None:
    """Write ``data`` to ``path`` via a temporary sibling and an atomic rename."""
    path = Path(path)
    raw = data.encode(encoding) if isinstance(data, str) else data
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, temp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(raw)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(temp, path)
    except BaseException:
        try:
            os.unlink(temp)
        except FileNotFoundError:
            pass
        raise


def sha256_of(data: "str | bytes") -> str:
    raw = data.encode("utf-8") if isinstance(data, str) else data
    return hashlib.sha256(raw).hexdigest()
