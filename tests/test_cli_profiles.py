"""``pfuzz profiles`` and shipped names as PROFILE arguments, through click's test runner.

Reference: the repository's top-level ``profiles/`` folder, read here with stdlib ``tomllib``."""

from __future__ import annotations

import json
import tomllib
from pathlib import Path

from click.testing import CliRunner

from pfuzz.cli import main

PROFILES = Path(__file__).resolve().parent.parent / "profiles"


def run(*args: str):
    return CliRunner().invoke(main, list(args), catch_exceptions=False)


def expected() -> list[dict]:
    rows = []
    for path in sorted(PROFILES.glob("*.toml")):
        data = tomllib.loads(path.read_text(encoding="utf-8"))
        rows.append({"name": path.stem, "title": data["profile"]["title"],
                     "fields": [field["name"] for field in data["field"]]})
    return rows


def test_profiles_lists_every_shipped_profile_with_its_title_and_fields():
    result = run("profiles", "--format", "json")
    assert result.exit_code == 0
    assert json.loads(result.stdout) == expected()
    text = run("profiles").stdout
    for row in expected():
        assert row["title"] in text and ", ".join(row["fields"]) in text
        assert any(line.startswith(row["name"] + " ") for line in text.splitlines())


def test_a_shipped_name_is_a_profile_argument(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)            # no ipv4 file here: the shipped one is meant
    result = run("corpus", "ipv4", "--out", "out")
    assert result.exit_code == 0, result.output
    manifest = json.loads((tmp_path / "out" / "manifest.json").read_text(encoding="utf-8"))
    assert list(manifest["fields"]) == ["ipv4"]


def test_an_unknown_name_is_one_line_and_exit_2(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    result = run("corpus", "ipv5", "--out", "out")
    assert result.exit_code == 2 and "Traceback" not in result.output
    assert "no shipped profile has this name" in result.stderr and "ipv4" in result.stderr
    assert not (tmp_path / "out").exists()
