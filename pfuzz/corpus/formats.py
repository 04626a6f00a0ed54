"""Corpus files: exact text formats and an output directory that appears all at once.

Formats. Every string a corpus holds must come back exactly, whatever it
contains (commas, quotes, CR, LF, tabs, NUL, leading spaces, non-ASCII):

- JSON Lines, written by ``pfuzz.base.jsonlines`` (one object per physical line).
- CSV as RFC 4180 describes it: comma separated, CRLF line ends, fields that
  hold a comma, a quote, CR or LF quoted with doubled quotes (the ``csv``
  module, written and read with ``newline=''``).

Staging. ``Staging`` writes every file into a temporary sibling of the output
directory (each file streamed through ``pfuzz.base.files.atomic_writer``, its
SHA-256 computed on the way out) and renames the whole
directory into place only when every file is written, so an interrupted run
leaves the old directory (or nothing) and never a half-written corpus. Any
exception removes the temporary directory. With ``replace=True`` an existing
corpus is moved aside, the new one renamed in, and the old one deleted; a
crash between those two renames (microseconds) leaves the old corpus in the
hidden ``.NAME.old-*`` sibling.
"""

from __future__ import annotations

import csv
import io
import os
import shutil
import tempfile
from contextlib import contextmanager
import json
from pathlib import Path
from typing import Iterator, TextIO

from pfuzz.errors import CorpusExistsError
from pfuzz.base.files import Checksum, atomic_writer, current_umask

#: Written by every corpus; ``--force`` replaces only a directory that holds it.
MANIFEST_NAME = "manifest.json"
CHECKSUMS_NAME = "SHA256SUMS"
FORMAT_TAG = "pfuzz-corpus/1"

def csv_writer(handle: TextIO):
    """An RFC 4180 writer on ``handle`` (which must not translate line ends)."""
    return csv.writer(handle)


def csv_text(header: list[str], rows) -> str:
    buffer = io.StringIO(newline="")
    writer = csv_writer(buffer)
    writer.writerow(header)
    writer.writerows(rows)
    return buffer.getvalue()


def read_csv(text: str) -> list[dict]:
    return list(csv.DictReader(io.StringIO(text, newline="")))


def check_target(out_dir: Path, force: bool) -> bool:
    """Whether ``out_dir`` exists (and may be replaced); raise when it may not."""
    if not out_dir.exists() and not out_dir.is_symlink():
        return False
    if not out_dir.is_dir() or out_dir.is_symlink():
        raise CorpusExistsError(f"{out_dir} exists and is not a directory; choose another --out")
    if not force:
        raise CorpusExistsError(f"{out_dir} already exists; use --force to replace it")
    here, target = Path.cwd().resolve(), out_dir.resolve()
    if here == target or target in here.parents:
        raise CorpusExistsError(f"refusing to replace {out_dir}: it holds the current "
                                "directory; run from elsewhere or choose another --out")
    if any(out_dir.iterdir()) and not _is_corpus(out_dir):
        raise CorpusExistsError(
            f"refusing to replace {out_dir}: it is not empty and holds no pfuzz "
            f"{MANIFEST_NAME}; remove it yourself or choose another --out")
    return True


def _is_corpus(directory: Path) -> bool:
    try:
        manifest = json.loads((directory / MANIFEST_NAME).read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return False
    return isinstance(manifest, dict) and manifest.get("format") == FORMAT_TAG


class Staging:
    """A temporary sibling directory that becomes ``out_dir`` on ``commit``.

    Use as a context manager: leaving the block by an exception removes the
    temporary directory and leaves ``out_dir`` untouched.
    """

    def __init__(self, out_dir: "str | Path", replace: bool = False):
        self.out_dir = Path(out_dir)
        self.target = Path(os.path.abspath(out_dir))    # "." and "x/" get a real name
        self.replace = replace
        self.files: dict[str, dict] = {}
        self.temp: Path | None = None

    def __enter__(self) -> "Staging":
        self.target.parent.mkdir(parents=True, exist_ok=True)
        self.temp = Path(tempfile.mkdtemp(prefix=f".{self.target.name}.", suffix=".partial",
                                          dir=self.target.parent))
        # mkdtemp makes the folder private (0700); the corpus is for handing to others,
        # so it gets the permissions of an ordinary new folder.
        os.chmod(self.temp, 0o777 & ~current_umask())
        return self

    def __exit__(self, kind, error, trace) -> None:
        if self.temp is not None and self.temp.exists():
            shutil.rmtree(self.temp, ignore_errors=True)

    @contextmanager
    def open(self, relative: str) -> Iterator[TextIO]:
        """A text handle (UTF-8, line ends written as given) for one file under the staging
        directory; the file and its digest count only once the block ends without error."""
        checksum = Checksum()
        with atomic_writer(self.temp / relative, checksum=checksum) as handle:
            yield handle
        self.files[relative] = {"bytes": checksum.size, "sha256": checksum.sha256}

    def write(self, relative: str, text: str) -> None:
        """Write one whole file (UTF-8) under the staging directory."""
        with self.open(relative) as handle:
            handle.write(text)

    def checksums_text(self) -> str:
        """``sha256sum`` format ("DIGEST  PATH"), so ``sha256sum -c`` can check the corpus."""
        return "".join(f"{info['sha256']}  {name}\n" for name, info in sorted(self.files.items()))

    def commit(self) -> None:
        """Move the finished directory into place (replacing the old one if allowed)."""
        if not self.replace:
            os.rename(self.temp, self.target)
            self.temp = None
            return
        old = Path(tempfile.mkdtemp(prefix=f".{self.target.name}.old-", dir=self.target.parent))
        os.rename(self.target, old / "corpus")
        os.rename(self.temp, self.target)
        self.temp = None
        shutil.rmtree(old, ignore_errors=True)
