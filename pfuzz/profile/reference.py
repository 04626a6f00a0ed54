"""``PROFILE:FIELD``: one field of a profile named where a pattern would stand.

Every command and strategy that takes a pattern also takes a profile field, written
``PROFILE:FIELD``: PROFILE is a path to a profile file or the name of a shipped profile
(``pfuzz.profile.shipped``), FIELD the name of one of its ``[[field]]``
tables. The field's
language is ``Field.language()``: its pattern with its flags and alphabet, every
``require`` and ``forbid`` and its length bounds applied.

A text is read as a reference only when its PROFILE part names an existing ``.toml``
file or a shipped profile: a pattern such as ``[a-z]:[0-9]`` stays a pattern. A pattern
argument that is exactly an existing ``.toml`` file (``brightwater.toml``) is almost
certainly a mistake, so ``pattern_or_field`` refuses it and shows the field form.

Cost: loading a profile compiles each of its patterns once (``pfuzz.profile.loader``).
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from pfuzz.errors import ArgumentError, ProfileError

__all__ = ["FieldReference", "find_profile", "parse_reference", "pattern_or_field",
           "resolve_field"]

SEPARATOR = ":"


@dataclass(frozen=True)
class FieldReference:
    """A profile (path or shipped name) and, optionally, one of its fields."""

    profile: str
    field: str | None = None

    def __str__(self) -> str:
        return self.profile if self.field is None else f"{self.profile}{SEPARATOR}{self.field}"


def find_profile(name_or_path: "str | Path") -> Path | None:
    """The profile file meant by a path or a shipped profile's bare name, or None."""
    path = Path(name_or_path)
    if path.is_file():
        return path
    try:
        from pfuzz.profile import shipped
    except ImportError:         # an installation without shipped profiles
        return None
    if path.name != str(name_or_path) or str(name_or_path) not in shipped.names():
        return None
    return shipped.path_of(str(name_or_path))


def parse_reference(text: str) -> FieldReference | None:
    """``PROFILE:FIELD`` when the part before the last ``:`` names a profile; else None
    (the split is at the last ``:`` so that a Windows drive letter stays in the path)."""
    head, sep, tail = text.rpartition(SEPARATOR)
    if sep and head and tail and find_profile(head) is not None:
        return FieldReference(head, tail)
    return None


def resolve_field(reference: "FieldReference | str", field: str | None = None):
    """The ``pfuzz.profile.loader.Field`` a reference names (``field`` overrides its own);
    a profile with one field needs no field name."""
    from pfuzz.profile.loader import load_profile

    if isinstance(reference, str):
        reference = parse_reference(reference) or FieldReference(reference)
    path = find_profile(reference.profile)
    if path is None:
        raise ProfileError(f"no profile file or shipped profile named {reference.profile!r}")
    profile = load_profile(path)
    name = field if field is not None else reference.field
    if name is None:
        if len(profile.fields) != 1:
            names = ", ".join(f.name for f in profile.fields)
            raise ProfileError(f"the profile has {len(profile.fields)} fields ({names}); name one "
                               f"with field=... or as {reference.profile}{SEPARATOR}FIELD",
                               path=str(path))
        return profile.fields[0]
    return profile.field(name)


def pattern_or_field(text: str):
    """The ``Field`` that ``PROFILE:FIELD`` names, or None when ``text`` is a pattern.

    A text that is only the path of an existing ``.toml`` file is refused with the field
    form spelt out (it is a profile given where a pattern was expected)."""
    reference = parse_reference(text)
    if reference is not None:
        return resolve_field(reference)
    path = Path(text)
    if path.suffix.lower() == ".toml" and path.is_file():
        from pfuzz.profile.loader import load_profile

        names = [f.name for f in load_profile(path).fields]
        raise ArgumentError(
            f"{text!r} is a profile, not a pattern; name a field as {text}{SEPARATOR}FIELD, "
            f"e.g. {text}{SEPARATOR}{names[0]} (fields: {', '.join(names)})")
    return None
