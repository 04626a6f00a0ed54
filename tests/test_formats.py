"""Corpus staging and replacement: what ``force`` may delete, interruption by signals,
stale staging folders, runs at the same time (``pfuzz.corpus.formats``)."""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

from pfuzz.base import files
from pfuzz.corpus import formats
from pfuzz.corpus.writer import write_corpus
from pfuzz.errors import CorpusExistsError, OutputError

PROFILE = """
[profile]
title = "Staging"
seed = 3

[[field]]
name = "code"
pattern = '[A-C][0-9]{2}'
valid = 6
invalid = 4
"""


@pytest.fixture
def profile(tmp_path) -> Path:
    path = tmp_path / "p.toml"
    path.write_text(textwrap.dedent(PROFILE), encoding="utf-8")
    return path


def tree(root: Path) -> dict[str, bytes]:
    return {p.relative_to(root).as_posix(): p.read_bytes()
            for p in sorted(root.rglob("*")) if p.is_file()}


def hidden(folder: Path) -> list[str]:
    """The hidden siblings a run may leave (staging ``.partial``, replaced ``.old``)."""
    return sorted(p.name for p in folder.iterdir() if p.name.startswith("."))


def seed_of(out: Path) -> int:
    return json.loads((out / "manifest.json").read_text())["seed"]


# -- force replaces only what pfuzz wrote -------------------------------------------------

@pytest.mark.parametrize("extra, named", [("my_notes/todo.txt", "my_notes/"),
                                          (".git/HEAD", ".git/"), ("notes.txt", "notes.txt"),
                                          ("fields/code/mine.txt", "fields/code/mine.txt"),
                                          ("empty_folder/", "empty_folder/")])
def test_force_refuses_a_corpus_with_anything_else_in_it(tmp_path, profile, extra, named):
    out = tmp_path / "out"
    write_corpus(profile, out, seed=1)
    if extra.endswith("/"):
        (out / extra).mkdir()
    else:
        (out / extra).parent.mkdir(parents=True, exist_ok=True)
        (out / extra).write_text("the user's own")
    before = tree(out)
    with pytest.raises(CorpusExistsError, match="what pfuzz did not write") as caught:
        write_corpus(profile, out, seed=2, force=True)
    assert f"'{named}'" in str(caught.value)
    assert tree(out) == before and (out / extra).exists()
    assert hidden(tmp_path) == []


def test_force_refuses_a_file_changed_since_pfuzz_wrote_it(tmp_path, profile):
    out = tmp_path / "out"
    write_corpus(profile, out, seed=1)
    with open(out / "cases.csv", "a", encoding="utf-8") as handle:
        handle.write("a row the user added\r\n")
    with pytest.raises(CorpusExistsError, match=r"'cases.csv' \(changed since pfuzz wrote it\)"):
        write_corpus(profile, out, seed=2, force=True)
    assert "a row the user added" in (out / "cases.csv").read_text()


def test_force_refuses_a_hand_written_manifest_beside_other_files(tmp_path, profile):
    out = tmp_path / "project"
    (out / "src").mkdir(parents=True)
    (out / "src" / "main.py").write_text("print('mine')\n")
    (out / formats.MANIFEST_NAME).write_text(json.dumps({"format": formats.FORMAT_TAG}))
    with pytest.raises(CorpusExistsError, match="refusing to replace"):
        write_corpus(profile, out, force=True)
    (out / formats.MANIFEST_NAME).write_text(json.dumps({"format": formats.FORMAT_TAG,
                                                         "files": {}}))
    with pytest.raises(CorpusExistsError, match="'src/'"):
        write_corpus(profile, out, force=True)
    assert (out / "src" / "main.py").read_text() == "print('mine')\n"


@pytest.mark.parametrize("manifest", ["[1, 2]", '"pfuzz-corpus/1"', "{", "null",
                                      '{"format": "pfuzz-corpus/1", "files": [1]}',
                                      '{"format": "pfuzz-corpus/1", "files": {"a": 1}}'])
def test_a_manifest_of_another_shape_is_not_a_corpus(tmp_path, profile, manifest):
    out = tmp_path / "out"
    out.mkdir()
    (out / formats.MANIFEST_NAME).write_text(manifest)
    with pytest.raises(CorpusExistsError, match="holds no pfuzz manifest.json"):
        write_corpus(profile, out, force=True)
    assert (out / formats.MANIFEST_NAME).read_text() == manifest


def test_force_refuses_a_link_inside(tmp_path, profile):
    out = tmp_path / "out"
    write_corpus(profile, out, seed=1)
    (tmp_path / "elsewhere").mkdir()
    (out / "data").symlink_to(tmp_path / "elsewhere")
    with pytest.raises(CorpusExistsError, match="'data/'"):
        write_corpus(profile, out, seed=2, force=True)
    assert (out / "data").is_symlink()


def test_force_replaces_an_earlier_corpus_or_an_empty_folder(tmp_path, profile):
    out = tmp_path / "out"
    write_corpus(profile, out, seed=1)
    write_corpus(profile, out, seed=2, force=True)
    assert seed_of(out) == 2
    empty = tmp_path / "empty"
    empty.mkdir()
    write_corpus(profile, empty, seed=4, force=True)
    assert seed_of(empty) == 4 and hidden(tmp_path) == []


def test_the_check_is_repeated_just_before_the_swap(tmp_path, profile):
    out = tmp_path / "out"
    write_corpus(profile, out, seed=1)

    def meddle(label: str) -> None:
        if label == "written":
            return
        (out / "added_meanwhile.txt").write_text("written while pfuzz ran")

    with pytest.raises(CorpusExistsError, match="'added_meanwhile.txt'"):
        write_corpus(profile, out, seed=2, force=True, progress=meddle)
    assert seed_of(out) == 1 and (out / "added_meanwhile.txt").exists()
    assert hidden(tmp_path) == []                  # the old corpus is back, staging gone


def test_a_failed_move_aside_leaves_no_hidden_folder(tmp_path, profile, monkeypatch):
    out = tmp_path / "out"
    write_corpus(profile, out, seed=1)
    real = os.rename

    def refuse_moving_the_target(source, target):
        if Path(source) == out.absolute():
            raise PermissionError(13, "simulated: cannot move", str(source))
        return real(source, target)

    monkeypatch.setattr(formats.os, "rename", refuse_moving_the_target)
    with pytest.raises(PermissionError):
        write_corpus(profile, out, seed=2, force=True)
    assert seed_of(out) == 1 and hidden(tmp_path) == []


def test_an_old_corpus_that_cannot_be_deleted_is_said(tmp_path, profile, monkeypatch):
    out = tmp_path / "out"
    write_corpus(profile, out, seed=1)
    monkeypatch.setattr(formats.shutil, "rmtree", lambda path, **options: None)
    with pytest.warns(formats.PfuzzWarning, match="could not be deleted whole"):
        write_corpus(profile, out, seed=2, force=True)
    assert seed_of(out) == 2
    assert [name.endswith(".old") for name in hidden(tmp_path)] == [True]


# -- names and runs at the same time --------------------------------------------------------

def test_a_nul_in_out_dir_is_an_output_error(tmp_path, profile):
    with pytest.raises(OutputError, match="NUL character.*give another out_dir"):
        write_corpus(profile, str(tmp_path / "a\x00b"))


def test_library_messages_name_parameters_not_options(tmp_path, profile):
    out = tmp_path / "out"
    write_corpus(profile, out)
    with pytest.raises(CorpusExistsError) as caught:
        write_corpus(profile, out)
    assert "pass force=True to replace it" in str(caught.value) and "--" not in str(caught.value)
    assert "pass --force to replace it" in caught.value.for_options({"force": "--force"})


def test_the_loser_of_two_runs_gets_a_clear_error(tmp_path, profile):
    out = tmp_path / "out"

    def other_run_finishes_first(label: str) -> None:
        if label == "code: boundary":
            write_corpus(profile, out, seed=9)

    with pytest.raises(CorpusExistsError, match="appeared while this corpus was being written") \
            as caught:
        write_corpus(profile, out, seed=1, progress=other_run_finishes_first)
    assert ".partial" not in str(caught.value)
    assert seed_of(out) == 9 and hidden(tmp_path) == []


# -- signals and stale staging folders ---------------------------------------------------

_SLOW = """
[profile]
title = "Slow"

[[field]]
name = "word"
pattern = '[a-z]{6,12}'
valid = 3000000
invalid = 10
"""


def _start_slow_run(tmp_path: Path, out: Path) -> subprocess.Popen:
    path = tmp_path / "slow.toml"
    path.write_text(textwrap.dedent(_SLOW), encoding="utf-8")
    run = subprocess.Popen([sys.executable, "-c", "from pfuzz.cli import main; main()",
                            "corpus", str(path), "--out", str(out)],
                           stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    while not any(name.endswith(".partial") for name in hidden(tmp_path)):
        assert run.poll() is None, run.communicate()
    return run


@pytest.mark.skipif(sys.platform == "win32", reason="signals are POSIX")
def test_sigterm_removes_the_staging_folder(tmp_path):
    out = tmp_path / "out"
    run = _start_slow_run(tmp_path, out)
    run.send_signal(signal.SIGTERM)
    _, stderr = run.communicate(timeout=120)
    assert run.returncode == 128 + signal.SIGTERM, stderr
    assert "stopped by SIGTERM" in stderr and "Traceback" not in stderr
    assert hidden(tmp_path) == [] and not out.exists()


@pytest.mark.skipif(sys.platform == "win32", reason="signals are POSIX")
def test_the_next_run_removes_the_staging_folder_of_a_killed_run(tmp_path, profile):
    out = tmp_path / "out"
    run = _start_slow_run(tmp_path, out)
    run.kill()
    run.communicate(timeout=60)
    stale = hidden(tmp_path)
    assert len(stale) == 1 and stale[0].endswith(".partial")
    assert f".{run.pid}-" in stale[0]              # the owner's process id is in its name
    write_corpus(profile, out)
    assert hidden(tmp_path) == [] and seed_of(out) == 3


def test_staging_folders_of_live_runs_and_other_hosts_stay(tmp_path, profile):
    out = tmp_path / "out"
    host = files._host_tag()
    live = tmp_path / f".out.{os.getppid()}-{host}.abcd1234.partial"
    foreign = tmp_path / f".out.1234-{'f' * 12}.abcd1234.partial"
    for folder in (live, foreign):
        folder.mkdir()
    write_corpus(profile, out)
    assert hidden(tmp_path) == sorted([live.name, foreign.name])


def test_a_replaced_corpus_left_by_a_killed_run_is_kept_until_the_target_exists(tmp_path,
                                                                                 profile):
    # A crash between the two renames leaves the old corpus aside and no target: that copy
    # is the user's only one and stays; once the target exists again it is removed.
    out = tmp_path / "out"
    child = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"],
                           capture_output=True, text=True, check=True)
    old = tmp_path / f".out.{int(child.stdout)}-{files._host_tag()}.abcd1234.old"
    (old / "corpus").mkdir(parents=True)
    other = tmp_path / "other"
    write_corpus(profile, other)
    assert old.exists()                             # another target: not this one's
    write_corpus(profile, out)
    assert old.exists()                             # created now: it was not there before
    write_corpus(profile, out, seed=5, force=True)
    assert not old.exists() and hidden(tmp_path) == []
