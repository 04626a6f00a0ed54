"""The package list in pyproject.toml names every package folder and maps the profiles.

Reference: the folders themselves (every directory under ``pfuzz/`` with an ``__init__.py``,
found with ``pathlib``). That the installed wheel holds the profiles is checked by ``.ci/run``,
which runs ``pfuzz profiles`` and ``pfuzz corpus ipv4`` from outside the checkout.
"""

from __future__ import annotations

import tomllib
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def _declared() -> dict:
    return tomllib.loads((ROOT / "pyproject.toml").read_text())["tool"]["setuptools"]


def test_every_package_folder_is_declared():
    found = {".".join(p.parent.relative_to(ROOT).parts) for p in (ROOT / "pfuzz").rglob("__init__.py")}
    declared = set(_declared()["packages"])
    assert declared - {"pfuzz.profile.standard"} == found


def test_the_shipped_profiles_are_mapped_from_the_top_level_folder():
    setuptools = _declared()
    assert setuptools["package-dir"] == {"pfuzz.profile.standard": "profiles"}
    assert list((ROOT / "profiles").glob("*.toml"))
