"""pytest helpers: a profile field, a pattern or a written corpus as parametrised cases.

``cases(...)`` returns a ``pytest.mark.parametrize`` decorator whose cases are the
field's valid strings (drawn uniformly by length), near-miss rejects (each with its
nearest valid string) and boundary suite, or the three files of one field of a corpus
folder; so a test runs once per case and pytest names each run readably::

    import pfuzz.pytest

    @pfuzz.pytest.cases("profiles/demo.toml", field="postcode")
    def test_postcode(text, expected):
        assert is_postcode(text) == expected

    # test_postcode[valid-LV18 3WB]  test_postcode[reject-LV18 3W(delete)]
    # test_postcode[boundary-LV1 0IA(above)] ...

The source is a profile path or shipped name with ``field=`` (or ``"PROFILE:FIELD"``), a
pattern, a ``Language``, or a corpus folder written by ``pfuzz corpus`` with ``field=``.
With one argument name (``"case"``) each run receives a ``QACase`` (text, expected,
kind, reason, witness) instead of ``(text, expected)``.

Case ids show the text with invisible characters escaped (``\\t``, ``\\u200b``) and cut
to ``ID_WIDTH`` characters; pytest adds a number to ids that repeat. The same seed gives
the same cases (``pfuzz.base.randomness``); the default seed is 0.

Cost: one sample, one reject draw and one boundary suite per decorated test, at import
of the test module (collection time).
"""

from __future__ import annotations

from pathlib import Path
from typing import NamedTuple

from pfuzz.base.charset import DEFAULT_ALPHABET
from pfuzz.base.escaping import escape_text
from pfuzz.errors import ArgumentError

__all__ = ["QACase", "cases", "field_cases", "corpus_cases"]

#: Characters of a case's text shown in its pytest id.
ID_WIDTH = 40


class QACase(NamedTuple):
    """One case: the text, whether the field must accept it, and why it is there."""

    text: str
    expected: bool
    kind: str            # valid, reject or boundary
    reason: str = ""
    witness: str | None = None

    @property
    def id(self) -> str:
        shown = escape_text(self.text).encode("ascii", "backslashreplace").decode("ascii")
        if len(shown) > ID_WIDTH:
            shown = shown[:ID_WIDTH - 3] + "..."
        tag = f"({self.reason})" if self.kind != "valid" and self.reason else ""
        return f"{self.kind}-{shown or '(empty)'}{tag}"


def cases(source, field: str | None = None, *, argnames: "str | tuple[str, ...]" = ("text", "expected"),
          valid: int = 20, rejects: int = 20, boundary: bool = True, seed: int = 0,
          alphabet: str = DEFAULT_ALPHABET):
    """A ``pytest.mark.parametrize`` decorator over the cases of ``source`` (see the module
    docstring); ``valid`` and ``rejects`` say how many of each to draw (a corpus folder
    gives the ones it holds); ``alphabet`` applies to a pattern (a field has its own)."""
    import pytest

    names = [n.strip() for n in argnames.split(",")] if isinstance(argnames, str) else list(argnames)
    if len(names) not in (1, 2):
        raise ArgumentError(f"argnames must name one or two arguments, got {names}")
    folder = Path(source) if isinstance(source, (str, Path)) else None
    if folder is not None and folder.is_dir():
        made = corpus_cases(folder, field)
    else:
        made = field_cases(source, field, valid=valid, rejects=rejects, boundary=boundary,
                           seed=seed, alphabet=alphabet)
    params = [pytest.param(c, id=c.id) if len(names) == 1
              else pytest.param(c.text, c.expected, id=c.id) for c in made]
    return pytest.mark.parametrize(names if len(names) > 1 else names[0], params)


def field_cases(source, field: str | None = None, *, valid: int = 20, rejects: int = 20,
                boundary: bool = True, seed: int = 0,
                alphabet: str = DEFAULT_ALPHABET) -> list[QACase]:
    """Valid strings, near-miss rejects and boundary cases of a pattern, Language or field."""
    from pfuzz.base.randomness import RandomSource
    from pfuzz.strategies import language_of

    language, chosen = language_of(None if field is not None else source,
                                   source if field is not None else None, field,
                                   alphabet, 0)
    distance = chosen.distance if chosen is not None else 1
    kinds = list(chosen.edits) if chosen is not None else None
    root = RandomSource(seed)
    seeds = root.child_seed(), root.child_seed()
    out = [QACase(text, True, "valid", "drawn uniformly by length")
           for text in language.sample(valid, seed=seeds[0], unique=True)]
    if rejects and not language.near_misses(distance, kinds).is_empty():
        out += [QACase(r.text, False, "reject", "/".join(r.kinds) or "mixed", r.witness)
                for r in language.rejects(rejects, distance=distance, kinds=kinds,
                                          seed=seeds[1])]
    if boundary:
        out += [QACase(c.text, c.expected, "boundary", c.kind or c.category)
                for c in language.boundary_cases()]
    return out


def corpus_cases(folder: "str | Path", field: str | None) -> list[QACase]:
    """The cases of one field of a corpus folder written by ``pfuzz corpus``."""
    fields = Path(folder) / "fields"
    names = sorted(p.name for p in fields.iterdir()) if fields.is_dir() else []
    if field is None:
        if len(names) != 1:
            raise ArgumentError(f"{folder} holds the fields {', '.join(names) or 'none'}; "
                                "choose one with field=")
        field = names[0]
    if field not in names:
        raise ArgumentError(f"{folder} has no field {field!r} (fields: {', '.join(names)})")
    out = [QACase(row["text"], True, "valid", "drawn uniformly by length")
           for row in _rows(fields / field / "valid.jsonl")]
    out += [QACase(row["text"], False, "reject", "/".join(row.get("kinds") or []) or "mixed",
                   row.get("witness")) for row in _rows(fields / field / "rejects.jsonl")]
    out += [QACase(row["text"], row["expected"] == "accept", "boundary", row.get("category", ""))
            for row in _rows(fields / field / "boundary.jsonl")]
    return out


def _rows(path: Path) -> list[dict]:
    """The rows of a corpus's JSON Lines file (none when the file is missing)."""
    from pfuzz.base.jsonlines import read_jsonl

    return read_jsonl(path.read_text(encoding="utf-8")) if path.is_file() else []