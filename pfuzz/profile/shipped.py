"""Shipped profiles: the standard profiles that come with pfuzz, found by name.

The TOML files live in the repository's top-level ``profiles/`` folder. A built
wheel carries them inside the package as ``pfuzz/profile/standard/`` (pyproject.toml
maps the folder there); a checkout, installed in editable mode or not, reads
the folder itself. A PROFILE argument is a path when a file of that name
exists, else the bare name of a shipped profile (``ipv4`` for ``ipv4.toml``).

Cost: a directory listing; ``describe`` reads one small TOML file. Limits: the
name lookup takes bare names only (no folder, no ``.toml``), so that a path the
user typed wrongly is reported as a missing file, not replaced by a shipped
profile of the same name.
"""

from __future__ import annotations

import tomllib
from pathlib import Path

from pfuzz.errors import ProfileError

__all__ = ["SUFFIX", "folder", "names", "path_of", "resolve", "describe"]

SUFFIX = ".toml"
_HERE = Path(__file__).resolve().parent


def folder() -> Path | None:
    """The folder of shipped profiles: in the package (a wheel), else in the checkout."""
    packaged = _HERE / "standard"
    if packaged.is_dir():
        return packaged
    root = _HERE.parents[1]
    if (root / "pyproject.toml").is_file() and (root / "profiles").is_dir():
        return root / "profiles"
    return None


def names() -> list[str]:
    """The names of the shipped profiles, sorted."""
    where = folder()
    return sorted(p.stem for p in where.glob(f"*{SUFFIX}")) if where else []


def path_of(name: str) -> Path:
    """The file of the shipped profile ``name``; a ``ProfileError`` listing them otherwise."""
    if name in names():
        return folder() / f"{name}{SUFFIX}"
    known = ", ".join(names()) or "none are installed"
    raise ProfileError(f"no such file, and no shipped profile has this name (shipped: {known})",
                       path=name)


def resolve(spec: "str | Path") -> Path:
    """A PROFILE argument as a path: the file itself, or the shipped profile it names."""
    path = Path(spec)
    text = str(spec)
    bare = path.name == text and not text.endswith(SUFFIX) and text not in ("", ".", "..")
    if path.exists() or not bare:
        return path
    return path_of(text)


def describe(name: str) -> dict:
    """Name, title and field names of a shipped profile (read, not validated)."""
    data = tomllib.loads(path_of(name).read_text(encoding="utf-8"))
    return {"name": name, "title": data.get("profile", {}).get("title", ""),
            "fields": [field.get("name", "") for field in data.get("field", [])]}
