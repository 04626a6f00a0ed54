"""``pfuzz corpus`` through click's test runner: exit codes, messages, seed choice, --force."""

from __future__ import annotations

import json
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest
from click.testing import CliRunner

from pfuzz.cli import main

PROFILE = """
[profile]
title = "CLI"
seed = 5

[[field]]
name = "code"
pattern = '[A-C][0-9]{2}'
valid = 6
invalid = 4
"""


def run(*args: str):
    return CliRunner().invoke(main, list(args), catch_exceptions=False)


def profile(tmp_path: Path, text: str = PROFILE) -> str:
    path = tmp_path / "p.toml"
    path.write_text(textwrap.dedent(text), encoding="utf-8")
    return str(path)


def seed_of(out: Path) -> int:
    return json.loads((out / "manifest.json").read_text())["seed"]


def test_writes_a_corpus_and_a_summary_on_stderr(tmp_path):
    out = tmp_path / "out"
    result = run("corpus", profile(tmp_path), "--out", str(out))
    assert result.exit_code == 0, result.output
    assert result.stdout == ""
    assert f"wrote {out}/" in result.stderr and "code" in result.stderr
    assert "cases.csv" in result.stderr
    assert (out / "cases.csv").exists() and seed_of(out) == 5


def test_seed_option_overrides_the_profile_seed(tmp_path):
    out = tmp_path / "out"
    assert run("corpus", profile(tmp_path), "--out", str(out), "--seed", "0").exit_code == 0
    assert seed_of(out) == 0


def test_existing_output_needs_force(tmp_path):
    out = tmp_path / "out"
    path = profile(tmp_path)
    assert run("corpus", path, "--out", str(out)).exit_code == 0
    again = run("corpus", path, "--out", str(out), "--seed", "9")
    assert again.exit_code == 2 and "already exists; pass --force to replace it" in again.stderr
    assert "Traceback" not in again.output and seed_of(out) == 5
    forced = run("corpus", path, "--out", str(out), "--seed", "9", "--force")
    assert forced.exit_code == 0 and seed_of(out) == 9


def test_bad_profile_exits_2_naming_file_field_and_key(tmp_path):
    path = profile(tmp_path, PROFILE.replace("valid = 6", "valdi = 6"))
    result = run("corpus", path, "--out", str(tmp_path / "out"))
    assert result.exit_code == 2
    assert f"{path}: field 'code': key 'valdi': is not known (did you mean 'valid'?)" \
        in result.stderr
    assert not (tmp_path / "out").exists()


def test_bad_pattern_shows_a_caret(tmp_path):
    path = profile(tmp_path, PROFILE.replace("'[A-C][0-9]{2}'", "'[A-C][0-9{2}'"))
    result = run("corpus", path, "--out", str(tmp_path / "out"))
    assert result.exit_code == 2 and "key 'pattern'" in result.stderr
    lines = result.stderr.splitlines()
    assert lines[-2].strip() == "[A-C][0-9{2}" and lines[-1].strip() == "^"


def test_missing_profile_and_missing_out_exit_2(tmp_path):
    missing = run("corpus", str(tmp_path / "nope.toml"), "--out", str(tmp_path / "o"))
    assert missing.exit_code == 2 and "cannot read the profile" in missing.stderr
    no_out = run("corpus", profile(tmp_path))
    assert no_out.exit_code == 2 and "--out" in no_out.stderr


def test_help_has_a_worked_example():
    result = run("corpus", "--help")
    assert result.exit_code == 0
    assert "pfuzz corpus profiles/demo.toml --out demo-corpus" in result.output
    assert "--force" in result.output and "--seed" in result.output


def test_installed_console_script_runs_the_demo(tmp_path):
    script = Path(sys.executable).parent / "pfuzz"
    if not script.exists():
        pytest.skip("the pfuzz console script is not installed beside this Python")
    demo = Path(__file__).resolve().parent.parent / "profiles" / "demo.toml"
    out = tmp_path / "demo-corpus"
    done = subprocess.run([str(script), "corpus", str(demo), "--out", str(out)],
                          capture_output=True, text=True, timeout=300)
    assert done.returncode == 0, done.stderr
    assert done.stdout == "" and "record member" in done.stderr
    again = subprocess.run([str(script), "corpus", str(demo), "--out", str(out)],
                           capture_output=True, text=True, timeout=300)
    assert again.returncode == 2 and "Traceback" not in again.stderr
