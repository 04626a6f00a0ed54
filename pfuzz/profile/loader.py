"""Profiles: TOML files that describe the fields of a form or a record, read strictly.

A profile is data, read with the standard library's ``tomllib`` and never
executed. ``load_profile(path)`` checks every key of every table against the
schema below and stops at the first problem with a ``ProfileError`` that names
the file, the field (or table) and the key, and suggests the nearest known key
for a misspelt one (``difflib``'s ratio). Every pattern (``pattern``, each
``require`` and ``forbid``) is compiled while loading, so a bad pattern is
reported with the pattern and a caret under its column.

A field's language is the intersection of its pattern with every ``require``
pattern and with the strings of length ``min_length..max_length``, minus every
``forbid`` pattern, all over the field's alphabet and with its flags
(``Field.language``). Each part is a minimal DFA; the combination is a product
construction per part (``pfuzz.automata.dfa``), so its cost is the product of the parts'
state counts in the worst case.

Schema (``[profile]`` table, one or more ``[[field]]`` tables, an optional
``[record]`` table with ``[[record.context]]`` columns): see the README's
profile key reference; the keys, their types and defaults live in this module
once, in the ``*_KEYS`` tables and the ``DEFAULT_*`` constants.
"""

from __future__ import annotations

import functools
import hashlib
import re
from dataclasses import dataclass
from functools import cached_property
from pathlib import Path

from pfuzz.corpus import context as records
from pfuzz.base.charset import DEFAULT_ALPHABET
from pfuzz.automata.dfa import DEFAULT_STATE_CAP, explore
from pfuzz.automata.minimise import minimise
from pfuzz.errors import PatternError, ProfileError, StateLimitError, AlphabetError, shorten
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.boundary.suite import DEFAULT_LIMIT as DEFAULT_BOUNDARY_LIMIT
from pfuzz.profile import shipped
from pfuzz.profile.tomlcheck import TableReader, hint, read_toml

DEFAULT_VALID = 100          #: valid strings per field
DEFAULT_INVALID = 100        #: near-miss rejects per field
DEFAULT_DISTANCE = 1         #: edit distance of the rejects
MAX_DISTANCE = 3             #: larger distances build very large automata
DEFAULT_VALID_ROWS = 50      #: valid record rows
DEFAULT_INVALID_ROWS = 50    #: record rows with exactly one near-miss field
MAX_COUNT = 10_000_000       #: upper limit of any count key
FLAG_NAMES = ("IGNORECASE", "MULTILINE", "DOTALL", "ASCII", "VERBOSE")
NAME_RULE = re.compile(r"[a-z][a-z0-9_]*")
#: Column names the corpus writer adds to record tables; a record column may not use them.
RESERVED_COLUMNS = ("row_id", "bad_field", "reason", "witness", "edits")

TOP_KEYS = ("profile", "field", "record")
PROFILE_KEYS = ("title", "about", "seed")
FIELD_KEYS = ("name", "pattern", "about", "source", "alphabet", "flags", "min_length",
              "max_length", "require", "forbid", "valid", "invalid", "distance", "edits",
              "boundary_limit")
RECORD_KEYS = ("name", "columns", "valid_rows", "invalid_rows", "context")
CONTEXT_KEYS = ("column", "provider", "locale")


@dataclass(frozen=True)
class Field:
    """One pattern field: its language and how many cases of each kind to make."""

    name: str
    pattern: str
    about: str = ""
    source: str = ""
    alphabet: str = DEFAULT_ALPHABET
    flags: tuple[str, ...] = ()
    min_length: int | None = None
    max_length: int | None = None
    require: tuple[str, ...] = ()
    forbid: tuple[str, ...] = ()
    valid: int = DEFAULT_VALID
    invalid: int = DEFAULT_INVALID
    distance: int = DEFAULT_DISTANCE
    edits: tuple[str, ...] = EDIT_KINDS
    state_cap: int = DEFAULT_STATE_CAP      #: of every automaton built for the field
    boundary_limit: int = DEFAULT_BOUNDARY_LIMIT

    @property
    def flag_bits(self) -> int:
        bits = 0
        for name in self.flags:
            bits |= getattr(re, name)
        return bits

    def compile_part(self, pattern: str):
        return _compiled(pattern, self.alphabet, self.flag_bits, self.state_cap)

    @cached_property
    def _parts(self):
        return (self.compile_part(self.pattern), [self.compile_part(p) for p in self.require],
                [self.compile_part(p) for p in self.forbid])

    def language(self):
        """pattern ∩ every require − every forbid ∩ lengths [min_length, max_length]."""
        return self._language

    @cached_property
    def _language(self):
        lang, required, forbidden = self._parts
        for part in required:
            lang = lang & part
        for part in forbidden:
            lang = lang - part
        if self.min_length is not None or self.max_length is not None:
            lang = lang & _lengths_language(lang, self.min_length or 0, self.max_length)
        return lang


@dataclass(frozen=True)
class ContextColumn:
    """A record column filled by an allow-listed faker provider."""

    column: str
    provider: str
    locale: str = records.DEFAULT_LOCALE


@dataclass(frozen=True)
class Record:
    """Rows that combine pattern fields with context columns, in ``columns`` order."""

    name: str
    columns: tuple[str, ...]
    fields: tuple[str, ...]
    context: tuple[ContextColumn, ...]
    valid_rows: int = DEFAULT_VALID_ROWS
    invalid_rows: int = DEFAULT_INVALID_ROWS


@dataclass(frozen=True)
class Profile:
    """A loaded, validated profile. ``sha256`` is the digest of the file's bytes."""

    path: str
    title: str
    about: str
    seed: int | None
    fields: tuple[Field, ...]
    record: Record | None
    sha256: str

    def field(self, name: str) -> Field:
        for f in self.fields:
            if f.name == name:
                return f
        known = ", ".join(f.name for f in self.fields)
        raise ProfileError(f"no field named {name!r} (fields: {known})", path=str(self.path))


@functools.lru_cache(maxsize=256)
def _compiled(pattern: str, alphabet: str, flags: int, state_cap: int = DEFAULT_STATE_CAP):
    """Languages are immutable, so fields that share a pattern share one compilation."""
    from pfuzz.language import Language
    return Language.compile(pattern, alphabet, flags, state_cap=state_cap)


def _lengths_language(like, lo: int, hi: int | None):
    """The Language of every string over ``like``'s alphabet with length in [lo, hi]."""
    alphabet = like.alphabet

    def step(n, _c):
        if hi is None:
            return min(n + 1, lo)
        return n + 1 if n < hi else None

    dfa = minimise(explore(0, step, lambda n: n >= lo, (alphabet,), alphabet, like.state_cap))
    return like._wrap(dfa)


# -- reading ---------------------------------------------------------------------

def load_profile(path: "str | Path", state_cap: int = DEFAULT_STATE_CAP) -> Profile:
    """Read and validate the profile at ``path`` (or the shipped profile of that bare name,
    ``pfuzz.profile.shipped``); raise ``ProfileError`` on any problem. ``state_cap`` bounds
    every automaton built for its fields."""
    path = shipped.resolve(path)
    label = str(path)
    try:
        raw = path.read_bytes()
    except OSError as error:
        raise ProfileError(f"cannot read the profile: {error.strerror}", path=label) from None
    return parse_profile(raw, label, state_cap)


def parse_profile(raw: bytes, label: str = "<profile>",
                  state_cap: int = DEFAULT_STATE_CAP) -> Profile:
    """Validate profile bytes; ``label`` names the file in error messages."""
    data = read_toml(raw, label)
    reader = _Reader(label, state_cap)
    reader.keys(data, TOP_KEYS, "")
    head = reader.table(data, "profile", "", required=True)
    reader.keys(head, PROFILE_KEYS, "[profile]")
    fields = reader.fields(data)
    record = reader.record(data, fields)
    return Profile(
        path=label,
        title=reader.get(head, "title", str, "[profile]", required=True),
        about=reader.get(head, "about", str, "[profile]", default=""),
        seed=reader.count(head, "seed", "[profile]", None, low=0, high=2**63 - 1),
        fields=fields, record=record, sha256=hashlib.sha256(raw).hexdigest())


class _Reader(TableReader):
    """The profile schema, read with typed access and errors that say where they are."""

    count_limit = MAX_COUNT

    def __init__(self, label: str, state_cap: int = DEFAULT_STATE_CAP):
        super().__init__(label)
        self.state_cap = state_cap

    def name(self, table: dict, key: str, where: str) -> str:
        value = self.get(table, key, str, where, required=True)
        if not NAME_RULE.fullmatch(value):
            self.fail(f"'{value}' must be lower-case letters, digits and '_', starting with a "
                      "letter", where, key)
        return value

    # -- fields ----------------------------------------------------------------------
    def fields(self, data: dict) -> tuple[Field, ...]:
        tables = self.tables(data, "field", "")
        if not tables:
            self.fail("the profile needs at least one [[field]] table")
        fields: list[Field] = []
        for i, table in enumerate(tables):
            field = self.field(table, i)
            if any(f.name == field.name for f in fields):
                self.fail(f"the name '{field.name}' is used by two fields", f"field #{i + 1}",
                          "name")
            fields.append(field)
        return tuple(fields)

    def field(self, table: dict, index: int) -> Field:
        where = f"field #{index + 1}"
        name = self.name(table, "name", where)
        where = f"field '{name}'"
        self.keys(table, FIELD_KEYS, where)
        field = Field(
            name=name,
            pattern=self.get(table, "pattern", str, where, required=True),
            about=self.get(table, "about", str, where, default=""),
            source=self.get(table, "source", str, where, default=""),
            alphabet=self.get(table, "alphabet", str, where, default=DEFAULT_ALPHABET),
            flags=self.choices(table, "flags", where, FLAG_NAMES, ()),
            min_length=self.count(table, "min_length", where, None),
            max_length=self.count(table, "max_length", where, None),
            require=self.strings(table, "require", where),
            forbid=self.strings(table, "forbid", where),
            valid=self.count(table, "valid", where, DEFAULT_VALID),
            invalid=self.count(table, "invalid", where, DEFAULT_INVALID),
            distance=self.count(table, "distance", where, DEFAULT_DISTANCE, 1, MAX_DISTANCE),
            edits=self.choices(table, "edits", where, EDIT_KINDS, EDIT_KINDS),
            state_cap=self.state_cap,
            boundary_limit=self.count(table, "boundary_limit", where, DEFAULT_BOUNDARY_LIMIT),
        )
        if field.min_length is not None and field.max_length is not None \
                and field.min_length > field.max_length:
            self.fail(f"is {field.min_length}, more than max_length ({field.max_length})",
                      where, "min_length")
        if not field.edits:
            self.fail("needs at least one edit kind", where, "edits")
        self.compile_all(field, where)
        return field

    def compile_all(self, field: Field, where: str) -> None:
        parts = [("pattern", field.pattern)]
        parts += [(f"require[{i + 1}]", p) for i, p in enumerate(field.require)]
        parts += [(f"forbid[{i + 1}]", p) for i, p in enumerate(field.forbid)]
        for key, pattern in parts:
            try:
                field.compile_part(pattern)
            except PatternError as error:
                column = f" at {error.where()}" if error.colno is not None else ""
                caret = error.caret() or f"  {shorten(pattern)}"
                self.fail(f"bad pattern {shorten(repr(pattern))}{column}: {error.message}",
                          where, key, caret)
            except AlphabetError as error:
                self.fail(str(error), where, "alphabet")
            except StateLimitError as error:
                self.fail(f"pattern {shorten(repr(pattern))}: {error}", where, key)

    # -- record ----------------------------------------------------------------------
    def record(self, data: dict, fields: tuple[Field, ...]) -> Record | None:
        if "record" not in data:
            return None
        where = "[record]"
        table = self.table(data, "record", "")
        self.keys(table, RECORD_KEYS, where)
        name = self.name(table, "name", where)
        if any(f.name == name for f in fields):
            self.fail(f"the record's name '{name}' is also a [[field]] name", where, "name")
        context = tuple(self.context(t, i) for i, t in
                        enumerate(self.tables(table, "context", where)))
        field_names = [f.name for f in fields]
        default_columns = tuple(field_names) + tuple(c.column for c in context)
        columns = self.strings(table, "columns", where) if "columns" in table else default_columns
        self.check_columns(columns, field_names, context, where)
        record_fields = tuple(c for c in columns if c in field_names)
        invalid_rows = self.count(table, "invalid_rows", where, DEFAULT_INVALID_ROWS)
        if not record_fields:
            self.fail("must name at least one [[field]]", where, "columns")
        return Record(name=name, columns=columns, fields=record_fields, context=context,
                      valid_rows=self.count(table, "valid_rows", where, DEFAULT_VALID_ROWS),
                      invalid_rows=invalid_rows)

    def check_columns(self, columns, field_names, context, where) -> None:
        context_names = [c.column for c in context]
        for i, column in enumerate(context_names):
            if column in field_names:
                self.fail(f"'{column}' is also a [[field]] name", f"record context #{i + 1}",
                          "column")
            if column in context_names[:i]:
                self.fail(f"'{column}' is used by two context columns",
                          f"record context #{i + 1}", "column")
        known = field_names + context_names
        for column in columns:
            if column not in known:
                why = hint(column, known, "known: " + ", ".join(known))
                self.fail(f"'{column}' is neither a [[field]] nor a context column ({why})",
                          where, "columns")
            if column in RESERVED_COLUMNS:
                self.fail(f"'{column}' is reserved for the corpus tables", where, "columns")
        if len(set(columns)) != len(columns):
            self.fail("lists a column twice", where, "columns")
        for column in context_names:
            if column not in columns:
                self.fail(f"the context column '{column}' is missing", where, "columns")

    def context(self, table: dict, index: int) -> ContextColumn:
        where = f"record context #{index + 1}"
        column = self.name(table, "column", where)
        where = f"record context '{column}'"
        self.keys(table, CONTEXT_KEYS, where)
        provider = self.get(table, "provider", str, where, required=True)
        locale = self.get(table, "locale", str, where, default=records.DEFAULT_LOCALE)
        if provider not in records.CONTEXT_PROVIDERS:
            allowed = sorted(records.CONTEXT_PROVIDERS)
            why = hint(provider, allowed, "allowed: " + ", ".join(allowed))
            self.fail(f"'{provider}' is not an allowed context provider ({why})", where,
                      "provider")
        if locale not in records.available_locales():
            why = hint(locale, records.available_locales(), "for example en_US, en_GB")
            self.fail(f"'{locale}' is not a faker locale ({why})", where, "locale")
        if not records.supports(provider, locale):
            self.fail(f"faker's locale '{locale}' has no provider '{provider}'", where,
                      "provider")
        return ContextColumn(column=column, provider=provider, locale=locale)
