"""Corpus files: exact text formats and an output directory that appears all at once.

Formats. Every string a corpus holds must come back exactly, whatever it
contains (commas, quotes, CR, LF, tabs, NUL, leading spaces, non-ASCII):

- JSON Lines, written by ``pfuzz.base.jsonlines`` (one object per physical line).
- CSV as RFC 4180 describes it: comma separated, CRLF line ends, fields that
  hold a comma, a quote, CR or LF quoted with doubled quotes (the ``csv``
  module, written and read with ``newline=''``).

Staging. ``Staging`` writes every file into a temporary sibling of the output
directory (``.NAME.PID-HOST.XXXXXXXX.partial``; each file streamed through
``pfuzz.base.files.atomic_writer``, its SHA-256 computed on the way out) and
renames the whole directory into place only when every file is written, so an
interrupted run leaves the old directory (or nothing) and never a half-written
corpus. Any exception, and SIGTERM or SIGHUP (``pfuzz.base.files.terminate_as_interrupt``),
removes the temporary directory. A run killed outright (SIGKILL) cannot; its
folder's name records its owner, and the next run beside the same target
removes the folders of owners on this host that are gone
(``pfuzz.base.files.remove_stale``).

Replacing (``replace=True``, the CLI's ``--force``). Only what pfuzz wrote is
replaced: the inventory is the manifest's file list with each file's size and
SHA-256, plus ``manifest.json`` and ``SHA256SUMS`` (which must read exactly as
pfuzz writes it, so it vouches for the manifest too). Anything else in the
folder (a user's notes, a ``.git`` folder, a file changed since pfuzz wrote it, a
link) makes the replacement refuse, naming what it found (``foreign_entries``);
an empty folder may be replaced. The check is made before any work and again
just before the swap, on the old corpus already moved aside (so nothing can be
added between the check and the deletion); if it fails there, the old corpus is
moved back. Cost: one read of the old corpus per check. The old corpus is moved
to ``.NAME.PID-HOST.XXXXXXXX.old``, the new one renamed in, and the old one
deleted; a crash between those two renames (microseconds) leaves the old corpus
there, and it is removed by a later run only once the target exists again.

Messages name the library's parameters (``out_dir``, ``force=True``): they are
``OutputError`` templates, and the command line puts its own options in their place.
"""

from __future__ import annotations

import csv
import errno
import io
import json
import os
import shutil
import tempfile
import warnings
from contextlib import ExitStack, contextmanager
from pathlib import Path
from typing import Iterator, TextIO

from pfuzz.base.files import (Checksum, atomic_writer, current_umask, owned_prefix,
                              remove_stale, sha256_file, sha256_of, shown_path,
                              terminate_as_interrupt)
from pfuzz.errors import CorpusExistsError, PfuzzWarning

__all__ = ["CHECKSUMS_NAME", "FORMAT_TAG", "MANIFEST_NAME", "PARAMETERS", "Staging",
           "check_target", "csv_text", "csv_writer", "foreign_entries", "read_csv"]

#: Written by every corpus; ``replace`` touches only a directory whose manifest lists it all.
MANIFEST_NAME = "manifest.json"
CHECKSUMS_NAME = "SHA256SUMS"
FORMAT_TAG = "pfuzz-corpus/1"
#: The library's words for the parameters that corpus messages advise on.
PARAMETERS = {"out_dir": "out_dir", "force": "force=True"}
#: Entries named in a refusal (the rest are counted).
NAMED_ENTRIES = 5


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


def _refuse(template: str, out_dir: Path, **values) -> CorpusExistsError:
    return CorpusExistsError(template, parameters=PARAMETERS, shown=shown_path(out_dir), **values)


def check_target(out_dir: Path, force: bool) -> bool:
    """Whether ``out_dir`` exists (and may be replaced); raise ``CorpusExistsError`` when it
    may not (``force`` is the caller's permission to replace an earlier corpus)."""
    if "\x00" in str(out_dir):
        raise _refuse("{shown} holds a NUL character, which no file name may hold; "
                      "give another {out_dir}", out_dir)
    if not out_dir.exists() and not out_dir.is_symlink():
        return False
    if not out_dir.is_dir() or out_dir.is_symlink():
        raise _refuse("{shown} exists and is not a directory; give another {out_dir}", out_dir)
    if not force:
        raise _refuse("{shown} already exists; pass {force} to replace it", out_dir)
    here, target = Path.cwd().resolve(), out_dir.resolve()
    if here == target or target in here.parents:
        raise _refuse("refusing to replace {shown}: it holds the current directory; run from "
                      "elsewhere or give another {out_dir}", out_dir)
    _check_inventory(out_dir, out_dir)
    return True


def _check_inventory(folder: Path, out_dir: Path) -> None:
    """Raise ``CorpusExistsError`` when ``folder`` holds anything pfuzz did not write."""
    found = foreign_entries(folder)
    if found is None:
        raise _refuse("refusing to replace {shown}: it is not empty and holds no pfuzz "
                      f"{MANIFEST_NAME}; remove it yourself or give another {{out_dir}}", out_dir)
    if found:
        named = ", ".join(shown_path(entry) + why for entry, why in found[:NAMED_ENTRIES])
        more = f" and {len(found) - NAMED_ENTRIES:,} more" if len(found) > NAMED_ENTRIES else ""
        raise _refuse("refusing to replace {shown}: it holds what pfuzz did not write: "
                      "{named}{more}; move them out, or give another {out_dir}", out_dir,
                      named=named, more=more)


def foreign_entries(folder: Path) -> "list[tuple[str, str]] | None":
    """What in ``folder`` is not pfuzz's own (see the module docstring), as (relative path,
    why) pairs: a folder's path ends in ``/``, ``why`` is "" for an entry pfuzz did not list
    and says what is wrong with one it did. ``[]`` when everything is pfuzz's or the folder
    is empty; None when it is not empty and has no pfuzz manifest."""
    entries = sorted(folder.iterdir())
    if not entries:
        return []
    listed = _inventory(folder)
    if listed is None:
        return None
    allowed_dirs = {parent.as_posix() for name in listed for parent in Path(name).parents} - {"."}
    found: list[tuple[str, str]] = []

    def unreadable(error: OSError) -> None:
        found.append((Path(error.filename).relative_to(folder).as_posix() + "/",
                      f" (unreadable: {error.strerror})"))

    for root, dirs, files in os.walk(folder, onerror=unreadable):
        base = Path(root).relative_to(folder)
        for name in sorted(dirs):
            relative = (base / name).as_posix()
            if relative not in allowed_dirs or (Path(root) / name).is_symlink():
                found.append((relative + "/", ""))
                dirs.remove(name)           # named once; its contents are not listed
        for name in sorted(files):
            relative = (base / name).as_posix()
            why = _file_problem(folder / relative, listed.get(relative))
            if why is not None:
                found.append((relative, why))
    return found


def _file_problem(path: Path, expected: "dict | None") -> "str | None":
    """None when ``path`` is a regular file with the size and digest pfuzz wrote, else what
    is wrong ("" for a file pfuzz did not list)."""
    if expected is None:
        return ""
    if path.is_symlink() or not path.is_file():
        return " (not a regular file)"
    try:
        size, digest = sha256_file(path)
    except OSError as error:
        return f" (unreadable: {error.strerror})"
    if size != expected.get("bytes") or digest != expected.get("sha256"):
        return " (changed since pfuzz wrote it)"
    return None


def _inventory(folder: Path) -> "dict[str, dict] | None":
    """The files pfuzz wrote in ``folder`` by its manifest: relative path -> {bytes, sha256}
    (manifest.json and SHA256SUMS included); None without a pfuzz manifest."""
    manifest_path = folder / MANIFEST_NAME
    try:
        if manifest_path.is_symlink():
            return None
        manifest = json.loads(manifest_path.read_text(encoding="utf-8"))
        size, digest = sha256_file(manifest_path)
    except (OSError, ValueError, RecursionError):
        return None
    if not isinstance(manifest, dict) or manifest.get("format") != FORMAT_TAG:
        return None
    files = manifest.get("files")
    if not isinstance(files, dict) or not all(isinstance(info, dict) for info in files.values()):
        return None
    listed = {name: dict(info) for name, info in files.items()}
    listed[MANIFEST_NAME] = {"bytes": size, "sha256": digest}
    sums = checksums_text(listed).encode("utf-8")
    listed[CHECKSUMS_NAME] = {"bytes": len(sums), "sha256": sha256_of(sums)}
    return listed


def checksums_text(files: dict[str, dict]) -> str:
    """``sha256sum`` format ("DIGEST  PATH"), so ``sha256sum -c`` can check the corpus."""
    return "".join(f"{info.get('sha256')}  {name}\n" for name, info in sorted(files.items()))


class Staging:
    """A temporary sibling directory that becomes ``out_dir`` on ``commit``.

    Use as a context manager: leaving the block by an exception (or SIGTERM) removes the
    temporary directory and leaves ``out_dir`` untouched.
    """

    def __init__(self, out_dir: "str | Path", replace: bool = False):
        self.out_dir = Path(out_dir)
        self.target = Path(os.path.abspath(out_dir))    # "." and "x/" get a real name
        self.replace = replace
        self.files: dict[str, dict] = {}
        self.temp: Path | None = None
        self._stack = ExitStack()

    def __enter__(self) -> "Staging":
        self.target.parent.mkdir(parents=True, exist_ok=True)
        self._stack.enter_context(terminate_as_interrupt())
        try:
            remove_stale(self.target, ".partial")
            remove_stale(self.target, ".old", keep=lambda old: not self.target.exists())
            self.temp = Path(tempfile.mkdtemp(prefix=owned_prefix(self.target),
                                              suffix=".partial", dir=self.target.parent))
            # mkdtemp makes the folder private (0700); the corpus is for handing to others,
            # so it gets the permissions of an ordinary new folder.
            os.chmod(self.temp, 0o777 & ~current_umask())
        except BaseException:
            self.__exit__(None, None, None)
            raise
        return self

    def __exit__(self, kind, error, trace) -> None:
        try:
            if self.temp is not None and self.temp.exists():
                shutil.rmtree(self.temp, ignore_errors=True)
        finally:
            self._stack.close()

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
        return checksums_text(self.files)

    def commit(self) -> None:
        """Move the finished directory into place (replacing the old one if allowed)."""
        if not self.replace:
            self._install()
            return
        old = Path(tempfile.mkdtemp(prefix=owned_prefix(self.target), suffix=".old",
                                    dir=self.target.parent))
        aside = old / "corpus"
        try:
            os.rename(self.target, aside)
        except FileNotFoundError:
            aside = None                    # removed meanwhile: nothing to replace
        except BaseException:
            os.rmdir(old)
            raise
        if aside is not None:
            self._recheck(aside, old)
        try:
            self._install()
        except BaseException:
            if aside is not None and not self.target.exists():
                os.rename(aside, self.target)
            raise
        _remove_old(old, self.out_dir)

    def _recheck(self, aside: Path, old: Path) -> None:
        """The inventory check once more, on the old corpus already moved aside: what is
        deleted is exactly what was checked. On failure the old corpus goes back."""
        try:
            _check_inventory(aside, self.out_dir)
        except BaseException:
            os.rename(aside, self.target)
            os.rmdir(old)
            raise

    def _install(self) -> None:
        """Rename the staging folder onto the target (which must be gone or empty)."""
        try:
            os.rename(self.temp, self.target)
        except OSError as error:
            if error.errno not in (errno.ENOTEMPTY, errno.EEXIST, errno.ENOTDIR, errno.EISDIR):
                raise
            raise _refuse("{shown} appeared while this corpus was being written (another run "
                          "at the same time?); it was left as it is and this corpus was not "
                          "written; pass {force} to replace it", self.out_dir) from None
        self.temp = None


def _remove_old(old: Path, out_dir: Path) -> None:
    """Delete the replaced corpus; what cannot be deleted is said (a ``PfuzzWarning``)."""
    def retry(function, path, _info):
        os.chmod(os.path.dirname(path), 0o700)        # a read-only folder inside: open it
        function(path)

    shutil.rmtree(old, onerror=lambda f, path, info: _quietly(retry, f, path, info))
    if old.exists():
        warnings.warn(f"the new corpus is in {shown_path(out_dir)}, but the old one could not "
                      f"be deleted whole; what is left is in {shown_path(old)}",
                      PfuzzWarning, stacklevel=3)


def _quietly(retry, function, path, info) -> None:
    try:
        retry(function, path, info)
    except OSError:
        pass
