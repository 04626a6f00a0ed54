"""Atomic writes: whole-file and streaming, interruption, concurrent writers, checksums."""

from __future__ import annotations

import hashlib
import os
import subprocess
import sys
import threading
from pathlib import Path

import pytest
from hypothesis import given, settings, strategies as st

from pfuzz.base import files
from pfuzz.base.files import BUFFER_SIZE, Checksum, atomic_writer, sha256_of, write_atomic

OLD = "old contents\n"


def leftovers(directory: Path) -> list[str]:
    """The temporary siblings (``.NAME.XXXX.tmp``) present in ``directory``."""
    return sorted(p.name for p in directory.iterdir() if p.name.endswith(".tmp"))


@pytest.fixture
def old_file(tmp_path) -> Path:
    path = tmp_path / "data.txt"
    path.write_text(OLD, encoding="utf-8")
    return path


# -- whole-file writes ------------------------------------------------------------

def test_write_atomic_writes_text_as_utf8_and_bytes_as_given(tmp_path):
    write_atomic(tmp_path / "a" / "t.txt", "é\r\n")         # parent directories are made
    write_atomic(tmp_path / "b.bin", b"\x00\xff")
    assert (tmp_path / "a" / "t.txt").read_bytes() == "é\r\n".encode("utf-8")
    assert (tmp_path / "b.bin").read_bytes() == b"\x00\xff"
    assert leftovers(tmp_path) == [] and leftovers(tmp_path / "a") == []


def test_failed_rename_keeps_the_old_file_and_no_temporary(old_file, monkeypatch):
    def broken(source, target):
        raise OSError("simulated: rename failed")

    monkeypatch.setattr(files.os, "replace", broken)
    with pytest.raises(OSError, match="rename failed"):
        write_atomic(old_file, "new")
    assert old_file.read_text(encoding="utf-8") == OLD
    assert leftovers(old_file.parent) == []


# -- the streaming writer ------------------------------------------------------------

def test_streaming_writer_replaces_the_file_when_the_block_ends(old_file):
    with atomic_writer(old_file) as out:
        out.write("new ")
        assert old_file.read_text(encoding="utf-8") == OLD     # not yet visible
        out.write("text")
    assert old_file.read_text(encoding="utf-8") == "new text"
    assert out.closed
    with pytest.raises(ValueError):
        out.write("late")


@pytest.mark.parametrize("interruption", [KeyboardInterrupt, RuntimeError])
def test_interrupted_stream_keeps_the_old_file_and_no_temporary(old_file, interruption):
    # More than one buffer, so part of the new text has reached the temporary file.
    with pytest.raises(interruption):
        with atomic_writer(old_file) as out:
            out.write("x" * (3 * BUFFER_SIZE))
            assert leftovers(old_file.parent)                  # the temporary exists
            raise interruption("simulated interruption")
    assert old_file.read_text(encoding="utf-8") == OLD
    assert leftovers(old_file.parent) == []


def test_unencodable_text_keeps_the_old_file(old_file):
    with pytest.raises(UnicodeEncodeError):
        with atomic_writer(old_file) as out:
            out.write("fine, then a lone surrogate: \ud800")
    assert old_file.read_text(encoding="utf-8") == OLD
    assert leftovers(old_file.parent) == []


_KILLED_WRITER = """
import os, signal, sys
from pfuzz.base.files import BUFFER_SIZE, atomic_writer
with atomic_writer(sys.argv[1]) as out:
    out.write("x" * (2 * BUFFER_SIZE))
    out.flush()
    os.kill(os.getpid(), signal.SIGKILL)
"""


@pytest.mark.skipif(sys.platform == "win32", reason="SIGKILL is POSIX")
def test_process_killed_mid_write_leaves_the_old_file_whole(old_file):
    done = subprocess.run([sys.executable, "-c", _KILLED_WRITER, str(old_file)])
    assert done.returncode == -9
    assert old_file.read_text(encoding="utf-8") == OLD
    # Nothing can clean up after SIGKILL: the hidden temporary stays, the target is intact ...
    assert len(leftovers(old_file.parent)) == 1
    # ... until the next write beside the same target, which removes it (its owner is gone).
    write_atomic(old_file, "next\n")
    assert leftovers(old_file.parent) == []
    assert old_file.read_text(encoding="utf-8") == "next\n"


_TERMINATED_WRITER = """
import os, signal, sys
from pfuzz.base.files import BUFFER_SIZE, Terminated, atomic_writer
try:
    with atomic_writer(sys.argv[1]) as out:
        out.write("x" * (2 * BUFFER_SIZE))
        out.flush()
        os.kill(os.getpid(), signal.SIGTERM)
        out.write("never reached")
except Terminated as stop:
    sys.exit(128 + stop.signal_number)
"""


@pytest.mark.skipif(sys.platform == "win32", reason="SIGTERM is POSIX")
def test_sigterm_mid_write_cleans_up_like_ctrl_c(old_file):
    done = subprocess.run([sys.executable, "-c", _TERMINATED_WRITER, str(old_file)])
    assert done.returncode == 128 + 15                 # the shell's status for SIGTERM
    assert old_file.read_text(encoding="utf-8") == OLD
    assert leftovers(old_file.parent) == []


@pytest.mark.skipif(sys.platform == "win32", reason="signals are POSIX")
def test_a_program_s_own_sigterm_handler_is_left_alone(tmp_path):
    import signal

    def own(_number, _frame):
        pass

    previous = signal.signal(signal.SIGTERM, own)
    try:
        with files.terminate_as_interrupt():
            assert signal.getsignal(signal.SIGTERM) is own
        with atomic_writer(tmp_path / "x.txt") as out:
            assert signal.getsignal(signal.SIGTERM) is own
            out.write("x")
        assert signal.getsignal(signal.SIGTERM) is own
    finally:
        signal.signal(signal.SIGTERM, previous)
    with files.terminate_as_interrupt():
        assert signal.getsignal(signal.SIGTERM) is not signal.SIG_DFL
    assert signal.getsignal(signal.SIGTERM) is signal.SIG_DFL


def _dead_pid() -> int:
    """The id of a process that has ended (a child, waited for)."""
    child = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"],
                           capture_output=True, text=True, check=True)
    return int(child.stdout)


def test_remove_stale_takes_only_siblings_of_gone_owners_on_this_host(tmp_path):
    target = tmp_path / "data.txt"
    host = files._host_tag()
    dead, alive = _dead_pid(), os.getpid()
    names = {
        "dead": f".data.txt.{dead}-{host}.abcd1234.tmp",
        "alive": f".data.txt.{alive}-{host}.abcd1234.tmp",
        "other host": f".data.txt.{dead}-{'0' * 12}.abcd1234.tmp",
        "other target": f".data.txt2.{dead}-{host}.abcd1234.tmp",
        "no owner": ".data.txt.abcd1234.tmp",
        "other suffix": f".data.txt.{dead}-{host}.abcd1234.partial",
    }
    for name in names.values():
        (tmp_path / name).write_text("x")
    files.remove_stale(target, ".tmp")
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted(
        name for what, name in names.items() if what != "dead")


# -- what a write may replace ---------------------------------------------------------------

@pytest.mark.parametrize("writer", ["whole", "streaming"])
def test_a_symbolic_link_is_not_replaced(tmp_path, writer):
    from pfuzz.errors import OutputError

    real = tmp_path / "real.txt"
    real.write_text(OLD)
    link = tmp_path / "link.txt"
    link.symlink_to(real.name)
    with pytest.raises(OutputError, match="symbolic link"):
        if writer == "whole":
            write_atomic(link, "new")
        else:
            with atomic_writer(link) as out:
                out.write("new")
    assert link.is_symlink() and os.readlink(link) == real.name
    assert real.read_text() == OLD and leftovers(tmp_path) == []


@pytest.mark.skipif(sys.platform == "win32", reason="FIFOs are POSIX")
def test_folders_pipes_and_devices_are_not_replaced(tmp_path):
    from pfuzz.errors import OutputError

    (tmp_path / "folder").mkdir()
    os.mkfifo(tmp_path / "pipe")
    for path, kind in [(tmp_path / "folder", "a folder"), (tmp_path / "pipe", "a pipe"),
                       (Path(os.devnull), "a character device")]:
        with pytest.raises(OutputError, match=kind):
            write_atomic(path, "x")
    assert (tmp_path / "folder").is_dir() and Path(os.devnull).is_char_device()
    assert leftovers(tmp_path) == []


def test_a_nul_in_the_name_is_an_output_error_naming_the_parameter(tmp_path):
    from pfuzz.errors import OutputError

    with pytest.raises(OutputError, match="NUL character") as caught:
        write_atomic(str(tmp_path / "a\x00b"), "x")
    assert "give another path" in str(caught.value)
    assert "give another --out" in caught.value.for_options({"path": "--out"})


def test_line_ends_are_the_callers_choice(tmp_path):
    text = "a\nb\r\nc\r"
    with atomic_writer(tmp_path / "exact.txt") as out:            # default: as written
        out.write(text)
    with atomic_writer(tmp_path / "crlf.txt", newline="\r\n") as out:
        out.write(text)
    assert (tmp_path / "exact.txt").read_bytes() == text.encode()
    # newline="\r\n" turns each "\n" written into "\r\n", as for open() (Python io docs).
    assert (tmp_path / "crlf.txt").read_bytes() == b"a\r\nb\r\r\nc\r"


def test_other_encodings(tmp_path):
    with atomic_writer(tmp_path / "l1.txt", encoding="latin-1") as out:
        out.write("é")
    assert (tmp_path / "l1.txt").read_bytes() == b"\xe9"      # ISO 8859-1: U+00E9 is 0xE9


# -- checksums while streaming ---------------------------------------------------------

@settings(max_examples=60, deadline=None, database=None)
@given(st.lists(st.text(), max_size=30), st.integers(0, 3))
def test_streamed_checksum_is_sha256_of_the_final_file(tmp_path_factory, pieces, repeat):
    path = tmp_path_factory.mktemp("sum") / "f.txt"
    checksum = Checksum()
    with atomic_writer(path, checksum=checksum) as out:
        for _ in range(repeat):
            for piece in pieces:                 # st.text() draws no lone surrogates
                out.write(piece)
    raw = path.read_bytes()
    assert raw == "".join(pieces * repeat).encode("utf-8")
    # Reference: hashlib over the bytes on disk (Python standard library).
    assert checksum.sha256 == hashlib.sha256(raw).hexdigest() == sha256_of(raw)
    assert checksum.size == len(raw)


def test_checksum_of_a_file_larger_than_the_buffer(tmp_path):
    path, checksum = tmp_path / "big.txt", Checksum()
    with atomic_writer(path, checksum=checksum) as out:
        for i in range(200_000):
            out.write(f"{i},é,\u2028\r\n")
    raw = path.read_bytes()
    assert len(raw) > BUFFER_SIZE
    assert checksum.sha256 == hashlib.sha256(raw).hexdigest() and checksum.size == len(raw)


def test_empty_file_checksum(tmp_path):
    checksum = Checksum()
    with atomic_writer(tmp_path / "empty", checksum=checksum):
        pass
    # SHA-256 of the empty string, FIPS 180-4 test value (quoted from memory; hashlib agrees).
    empty = "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855"
    assert checksum.sha256 == empty == hashlib.sha256(b"").hexdigest()
    assert (tmp_path / "empty").read_bytes() == b"" and checksum.size == 0


# -- writers at the same time ------------------------------------------------------------

def test_open_writers_get_distinct_temporaries(tmp_path):
    path = tmp_path / "shared.txt"
    with atomic_writer(path) as first, atomic_writer(path) as second:
        first.write("first")
        second.write("second")
        assert len(leftovers(tmp_path)) == 2
    # The inner block ends first, so the outer writer's rename comes last and wins.
    assert path.read_text(encoding="utf-8") == "first"
    assert leftovers(tmp_path) == []


def test_concurrent_threads_leave_one_whole_file(tmp_path):
    path = tmp_path / "shared.txt"
    contents = [f"writer {n}\n" * 20_000 for n in range(8)]
    start = threading.Barrier(len(contents))
    errors = []

    def write(text: str) -> None:
        try:
            start.wait()
            with atomic_writer(path) as out:
                for line in text.splitlines(keepends=True):
                    out.write(line)
        except BaseException as error:          # reported below, not lost in the thread
            errors.append(error)

    threads = [threading.Thread(target=write, args=(text,)) for text in contents]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join()
    assert errors == []
    assert path.read_text(encoding="utf-8") in contents       # one writer's text, whole
    assert leftovers(tmp_path) == []
    assert os.listdir(tmp_path) == ["shared.txt"]


def test_written_files_get_ordinary_permissions(tmp_path):
    # mkstemp's private 0600 must not leak into files meant for handing over (POSIX modes).
    import os
    import stat

    from pfuzz.base.files import current_umask, write_atomic

    target = tmp_path / "out.txt"
    write_atomic(target, "x\n")
    assert stat.S_IMODE(os.stat(target).st_mode) == 0o666 & ~current_umask()
