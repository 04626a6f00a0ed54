"""Random command lines for the fuzz driver: patterns from a small ``re`` grammar, and
profiles of known and unknown keys with values of every TOML type, sometimes damaged.

Each case draws from its own ``random.Random(f"{seed}:{kind}:{index}")``, so a case is a
function of (seed, index) alone and can be replayed without the others.
"""

from __future__ import annotations

import datetime
import random

LITERALS = list("abcxyzAZ019_-@ ,;'\"/") + ["é", "ß", "İ", "\u212a", "ſ", "Ω", "中", "😀",
                                             "\t", "\n", "\r", "\x00", "\u2028", "\u00a0"]
SPECIALS = list(".^$*+?{}[]\\|()")
ASCII_LITERALS = 20                             #: the first LITERALS are printable ASCII
CATEGORIES = ["\\d", "\\D", "\\w", "\\W", "\\s", "\\S"]
ANCHORS = ["^", "$", "\\A", "\\Z", "\\b", "\\B"]
JUNK = ["(", ")", "[", "]", "{", "}", "{2,1}", "*", "+?", "\\", "(?", "(?P<", "\\1", "\\9",
        "(?<=a*)", "[z-a]", "\\p{L}", "(?#c)", "x{99999999999}", "a{,3}", "(?i", "\\u12"]
ALPHABETS = ["printable", "ascii", "latin1", "bmp", "unicode", "[a-c0-2]", "[a-z]", "[^a]",
             "[\\x00-\\x7f]", "", "[", "nonsense", "[\\d\\s]"]
EDIT_KINDS = ["delete", "insert", "replace", "swap"]


# -- patterns -----------------------------------------------------------------------

def _quantifier(r: random.Random, tame: bool = False) -> str:
    small = r.randint(0, 4)
    if r.random() < 0.03:                       # a large count now and then
        small = r.choice([40, 200, 1000])
    base = r.choice(["*", "+", "?", f"{{{small}}}", f"{{{small},{small + r.randint(0, 4)}}}",
                     f"{{{small},}}", f"{{,{small + 1}}}"])
    return base + r.choice(["", "", "", "?"] + ([] if tame else ["+"]))


def _class(r: random.Random) -> str:
    items = []
    for _ in range(r.randint(1, 4)):
        kind = r.random()
        if kind < 0.4:
            a, b = sorted(r.sample("abcmxz0259", 2))
            items.append(f"{a}-{b}")
        elif kind < 0.6:
            items.append(r.choice(CATEGORIES))
        elif kind < 0.7:
            items.append(r.choice(["\\-", "\\]", "^", "\\\\", "-", "\\x41", "\\u00e9"]))
        else:
            items.append(r.choice(LITERALS).replace("]", "\\]").replace("\\", "\\\\"))
    return "[" + ("^" if r.random() < 0.3 else "") + "".join(items) + "]"


def _atom(r: random.Random, depth: int, tame: bool) -> str:
    roll = r.random()
    if depth > 0 and roll < 0.25:
        opener = r.choice(["(", "(?:", f"(?P<g{r.randrange(10**6)}>", "(?=", "(?!", "(?<=",
                           "(?<!", "(?>", "(?i:", "(?-i:", "(?s:"])
        if tame and opener.startswith("(?") and opener[2] in "=!<>" and r.random() < 0.9:
            opener = "(?:"                              # fewer look-arounds: fewer empty fields
        if tame and opener.startswith("(?<"):
            return opener + r.choice("abc1") + ")"     # a look-behind of fixed width
        return opener + pattern_text(r, depth - 1, tame, top=False) + ")"
    if roll < 0.5:
        ascii_only = tame and r.random() < 0.9  # most tame fields stay inside 'printable'
        char = r.choice(LITERALS[:ASCII_LITERALS] if ascii_only else LITERALS)
        return "\\" + char if char in SPECIALS else char
    if roll < 0.6:
        return "\\" + r.choice(SPECIALS)
    if roll < 0.72:
        return _class(r)
    if roll < 0.82:
        return r.choice(CATEGORIES)
    if roll < 0.88:
        return "."
    if tame:
        return r.choice(LITERALS[:10])
    if roll < 0.97:
        return r.choice(ANCHORS)
    return r.choice(JUNK)


def pattern_text(r: random.Random, depth: int = 3, tame: bool = False, top: bool = True) -> str:
    """A pattern; ``tame`` ones hold no junk (most of them compile)."""
    branches = []
    for _ in range(1 if r.random() < 0.7 else r.randint(2, 4)):
        pieces = []
        for _ in range(r.randint(0, 5)):
            atom = _atom(r, depth, tame)
            repeatable = not (atom in ANCHORS or atom.startswith(("(?=", "(?!", "(?<")))
            if r.random() < 0.3 and (repeatable or r.random() < 0.1):
                atom += _quantifier(r, tame)
            pieces.append(atom)
        branches.append("".join(pieces))
    text = "|".join(branches)
    if top and r.random() < 0.1:
        flags = ["(?i)", "(?m)", "(?s)"] + ([] if tame else ["(?x)", "(?a)", "(?u)", "(?L)"])
        text = r.choice(flags) + text
    return text


def _text(r: random.Random) -> str:
    return "".join(r.choice(LITERALS) for _ in range(r.randint(0, 8)))


def _language_options(r: random.Random) -> list[str]:
    options = []
    if r.random() < 0.4:
        options += ["--alphabet", r.choice(ALPHABETS[:9] if r.random() < 0.85 else ALPHABETS)]
    if r.random() < 0.2:
        options.append("-i")
    if r.random() < 0.3:
        options += ["--state-cap", str(r.choice([1, 5, 50, 1000, 20000]))]
    return options


def _lengths(r: random.Random) -> list[str]:
    options = []
    if r.random() < 0.3:
        options += ["--min-length", str(r.randint(0, 12))]
    if r.random() < 0.5:
        options += ["--max-length", str(r.choice([0, 1, 3, 8, 20, 60]))]
    return options


def pattern_case(seed: int, index: int) -> tuple[list[str], dict[str, bytes]]:
    r = random.Random(f"{seed}:pattern:{index}")
    pattern = pattern_text(r)
    files: dict[str, bytes] = {}
    if r.random() < 0.1:
        files["p.txt"] = pattern.encode("utf-8", "surrogatepass") + b"\n"
        head = ["--pattern-file", "{dir}/p.txt"]
    else:
        head = [pattern]
    command = r.choice(["info", "count", "sample", "sample", "reject", "reject", "explain",
                        "diff", "draw"])
    args = [command, *head, *_language_options(r)]
    if command == "count":
        args += _lengths(r) + r.choice([[], ["--format", "json"], ["--format", "csv"]])
    elif command == "sample":
        args += ["-n", str(r.choice([0, 1, 5, 30])), "--seed", str(r.randint(0, 9))]
        args += _lengths(r) + r.choice([[], ["--unique"], ["--method", "exact"],
                                        ["--method", "bulk"], ["--lengths", "proportional"]])
        args += r.choice([[], ["--format", "jsonl"]])
    elif command == "reject":
        args += ["-n", str(r.choice([0, 1, 5, 20])), "--seed", str(r.randint(0, 9))]
        args += _lengths(r) + r.choice([[], ["--distance", "2"], ["--edges"],
                                        ["--kind", r.choice(EDIT_KINDS)]])
        args += r.choice([[], ["--format", "jsonl"]])
    elif command == "explain":
        args.insert(2 if head[0] != "--pattern-file" else 3, _text(r))
        args += r.choice([[], ["--format", "json"]])
    elif command == "diff":
        args.insert(2, pattern_text(r))
        args += r.choice([[], ["--max-length", "6"], ["--format", "json"]])
    if r.random() < 0.05:
        args += ["--out", "{dir}/out.txt"]
    return args, files


# -- profiles -------------------------------------------------------------------------

FIELD_KEYS = ["name", "pattern", "about", "source", "alphabet", "flags", "min_length",
              "max_length", "require", "forbid", "valid", "invalid", "distance", "edits",
              "boundary_limit"]
FLAG_NAMES = ["IGNORECASE", "MULTILINE", "DOTALL", "ASCII", "VERBOSE", "LOCALE", "ignorecase"]
PROVIDERS = ["name", "first_name", "email", "city", "country", "date", "company", "ssn",
             "bothify", "nonsense", "job"]
LOCALES = ["en_US", "en_GB", "de_DE", "ja_JP", "xx_YY", "", "fr"]


def _odd_value(r: random.Random, depth: int = 0):
    """A value of any TOML type, sometimes a hostile one."""
    roll = r.random()
    if roll < 0.15:
        return r.choice([0, -1, 1, 7, 2**63, -(2**63), 10**30, 10**4400, 16**5000 - 1])
    if roll < 0.25:
        return r.choice([0.5, -1.0, 1e308, float("inf"), float("nan")])
    if roll < 0.3:
        return r.choice([True, False])
    if roll < 0.4:
        return r.choice([datetime.date(1979, 5, 27), datetime.time(7, 32),
                         datetime.datetime(1979, 5, 27, 7, 32)])
    if roll < 0.6 and depth < 6:
        return [_odd_value(r, depth + 1) for _ in range(r.randint(0, 3))]
    if roll < 0.7 and depth < 6:
        return {r.choice(["a", "b", "name"]): _odd_value(r, depth + 1)
                for _ in range(r.randint(0, 2))}
    return r.choice(["", "x", "é", "a" * 300, pattern_text(r), "\x00", "\u2028", "[a-z]"])


class _Values:
    """Values for profile keys: of the right type and range when ``clean``, else sometimes
    of any type or past their range (``odd`` is the share of such values)."""

    def __init__(self, r: random.Random, clean: bool):
        self.r, self.odd = r, 0.0 if clean else 0.15

    def hostile(self) -> bool:
        return self.r.random() < self.odd

    def pick(self, good: list, bad: list):
        return self.r.choice(bad if self.hostile() else good)

    def count(self):
        r = self.r
        if self.hostile():
            return r.choice([-1, 10**7, 10**8, 2**63, _odd_value(r)])
        return r.choice([0, 1, 3, 10, 30, r.randint(0, 60)])


def _field(v: _Values, number: int) -> dict:
    r = v.r
    field: dict = {"name": v.pick([f"f{number}"], ["F", "", "f-1", _odd_value(r)]),
                   "pattern": pattern_text(r, 2, tame=True) if not v.hostile() else _odd_value(r)}
    for key in r.sample(FIELD_KEYS[2:], r.randint(0, 5)):
        if key in ("valid", "invalid", "min_length", "max_length", "boundary_limit"):
            field[key] = v.count()
        elif key == "distance":
            field[key] = v.pick([1, 1, 2, 3], [0, 4, _odd_value(r)])
        elif key == "flags":
            field[key] = r.sample(FLAG_NAMES[:5] if not v.hostile() else FLAG_NAMES,
                                  r.randint(0, 2))
        elif key == "edits":
            kinds = EDIT_KINDS if not v.hostile() else EDIT_KINDS + ["typo"]
            field[key] = r.sample(kinds, r.randint(1 if kinds is EDIT_KINDS else 0, 3))
        elif key in ("require", "forbid"):
            field[key] = [pattern_text(r, 1, tame=True) for _ in range(r.randint(0, 2))]
        elif key == "alphabet":
            field[key] = v.pick(ALPHABETS[:7], ALPHABETS)
        else:
            field[key] = v.pick(["", "about it", "é\u2028"], [_odd_value(r)])
    if v.hostile():
        field[r.choice(["valdi", "universe", "Pattern", "x"])] = _odd_value(r)
    return field


def _profile_data(r: random.Random) -> dict:
    v = _Values(r, clean=r.random() < 0.6)
    data: dict = {"profile": {"title": v.pick(["Fuzz"], [_odd_value(r)])}}
    if r.random() < 0.3:
        data["profile"]["seed"] = v.pick([0, 5, 2**40], [-1, 2**64, _odd_value(r)])
    fields = [_field(v, i) for i in range(r.randint(0, 3) if v.hostile() else
                                           r.randint(1, 3))]
    data["field"] = fields
    if r.random() < 0.3 and fields:
        names = [f.get("name") for f in fields if isinstance(f.get("name"), str)]
        record: dict = {"name": "rec", "valid_rows": v.count(), "invalid_rows": v.count()}
        context = [{"column": f"c{i}", "provider": v.pick(PROVIDERS[:7], PROVIDERS),
                    "locale": v.pick(LOCALES[:4], LOCALES)} for i in range(r.randint(0, 2))]
        if context:
            record["context"] = context
        if r.random() < 0.5:
            record["columns"] = names + [c["column"] for c in context] + \
                (["row_id"] if r.random() < 0.1 else [])
        data["record"] = record
    if v.hostile():
        data[r.choice(["extra", "fields", "universe"])] = _odd_value(r)
    return data


def _toml_string(text: str) -> str:
    out = []
    for ch in text:
        point = ord(ch)
        if ch in '"\\':
            out.append("\\" + ch)
        elif point < 0x20 or point == 0x7F or 0xD800 <= point <= 0xDFFF:
            out.append(f"\\u{point:04x}" if not 0xD800 <= point <= 0xDFFF else "\\ufffd")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def toml_value(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        if value.bit_length() > 13000:
            return "0x" + format(value, "x")        # past the decimal limit: hexadecimal
        return str(value)
    if isinstance(value, float):
        return {float("inf"): "inf"}.get(value, "nan" if value != value else repr(value))
    if isinstance(value, str):
        return _toml_string(value)
    if isinstance(value, (datetime.date, datetime.time)):
        return value.isoformat()
    if isinstance(value, list):
        return "[" + ", ".join(toml_value(v) for v in value) + "]"
    if isinstance(value, dict):
        return "{" + ", ".join(f"{_toml_key(k)} = {toml_value(v)}" for k, v in value.items()) + "}"
    raise TypeError(value)


def _toml_key(key: str) -> str:
    return key if key.replace("_", "").isalnum() and key.isascii() else _toml_string(key)


def toml_text(data: dict) -> str:
    lines = []
    for table in ("profile", "extra", "fields", "universe"):
        if table in data and not isinstance(data[table], dict):
            lines.append(f"{table} = {toml_value(data[table])}")
    lines.append("[profile]")
    lines += [f"{_toml_key(k)} = {toml_value(v)}" for k, v in data["profile"].items()]
    for field in data["field"]:
        lines.append("[[field]]")
        lines += [f"{_toml_key(k)} = {toml_value(v)}" for k, v in field.items()]
    if "record" in data:
        record = dict(data["record"])
        context = record.pop("context", [])
        lines.append("[record]")
        lines += [f"{_toml_key(k)} = {toml_value(v)}" for k, v in record.items()]
        for column in context:
            lines.append("[[record.context]]")
            lines += [f"{_toml_key(k)} = {toml_value(v)}" for k, v in column.items()]
    return "\n".join(lines) + "\n"


def _damage(r: random.Random, raw: bytes) -> bytes:
    roll = r.random()
    if roll < 0.2:
        return b"\xef\xbb\xbf" + raw
    if roll < 0.3:
        return raw.decode().encode("utf-16")
    if roll < 0.45 and raw:
        at = r.randrange(len(raw))
        return raw[:at] + bytes([r.randrange(256)]) + raw[at + 1:]
    if roll < 0.55:
        return raw[: r.randrange(len(raw) + 1)]
    if roll < 0.65:
        depth = r.choice([40, 400, 1000, 5000])
        opener, closer = r.choice([(b"[", b"]"), (b"{a = ", b"}")])
        return raw + b"deep = " + opener * depth + b"1" + closer * depth + b"\n"
    if roll < 0.75:
        return raw + b"huge = 1" + b"0" * r.choice([4300, 5000, 100000]) + b"\n"
    if roll < 0.85:
        return raw.replace(b"\n", b"\r\n")
    return raw + b"\x00"


def profile_case(seed: int, index: int) -> tuple[list[str], dict[str, bytes]]:
    r = random.Random(f"{seed}:profile:{index}")
    raw = toml_text(_profile_data(r)).encode("utf-8")
    if r.random() < 0.15:
        raw = _damage(r, raw)
    files = {"p.toml": raw}
    if r.random() < 0.8:
        args = ["corpus", "{dir}/p.toml", "--out", "{dir}/out"]
        if r.random() < 0.3:
            args += ["--seed", str(r.randint(0, 5))]
        if r.random() < 0.2:
            args += ["--state-cap", str(r.choice([5, 100, 5000]))]
        if r.random() < 0.2:
            args.append("--force")
    else:
        args = ["audit", "{dir}/p.toml", "--field", "f0", "--regex", pattern_text(r, 1),
                "--valid", "5", "--rejects", "5"]
    return args, files
