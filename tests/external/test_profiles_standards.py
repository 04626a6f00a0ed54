"""The shipped profiles checked against the standards they follow.

The subject is each field's language as the profile loader builds it. Every
reference is computed without pfuzz: the exact count of every length from a
closed form, stdlib ``datetime`` or a count written from the standard's rules
(``REFERENCE_COUNTS`` below), every string of the shortest lengths judged by
Python's ``re.fullmatch`` on the profile's own patterns (read with stdlib
``tomllib``), and every valid sample, boundary case and near-miss reject
judged twice: by ``re`` and by a plain-Python predicate written from the
standard's text (``STANDARD`` below, one per field, its source beside it).
Calendar, time, version and password predicates are in
``test_profile_calendar.py`` and ``test_profile_semver_password.py``.
"""

from __future__ import annotations

import datetime
import functools
import ipaddress
import itertools
import re
import string
import tomllib
import uuid
from pathlib import Path

import pytest
from faker import Faker

from pfuzz.profile.loader import load_profile

PROFILES = Path(__file__).resolve().parents[2] / "profiles"
HEX = set(string.hexdigits)  # 0-9, a-f, A-F
PRINTABLE = [chr(c) for c in range(0x20, 0x7F)]  # printable ASCII (RFC 20), the default alphabet
SAMPLES = 200
#: Range-edge rejects (near misses in edges mode) take about a minute to build for the
#: password field (968 states); the boundary suite's range-edge cases cover it instead.
EDGE_REJECTS_UP_TO = 200


# -- the subject, and the field as the file states it -----------------------------------------

@functools.lru_cache(maxsize=None)
def field_spec(profile: str, name: str) -> dict:
    data = tomllib.loads((PROFILES / profile).read_text("utf-8"))
    (spec,) = [f for f in data["field"] if f["name"] == name]
    return spec


def flag_bits(spec: dict) -> int:
    bits = 0
    for flag in spec.get("flags", []):
        bits |= getattr(re, flag)
    return bits


@functools.lru_cache(maxsize=None)
def field_language(profile: str, name: str):
    """The code under test: the field's language as the profile loader builds it."""
    return load_profile(PROFILES / profile).field(name).language()


def re_verdict(profile: str, name: str, text: str) -> bool:
    """The field's verdict from Python's re (reference matcher) on the profile's own patterns:
    pattern, every require, no forbid, the length bounds, printable ASCII (the default alphabet)."""
    spec = field_spec(profile, name)
    flags = flag_bits(spec)
    lo, hi = spec.get("min_length", 0), spec.get("max_length", len(text))
    return (re.fullmatch(spec["pattern"], text, flags) is not None
            and all(re.fullmatch(p, text, flags) for p in spec.get("require", []))
            and not any(re.fullmatch(p, text, flags) for p in spec.get("forbid", []))
            and lo <= len(text) <= hi
            and all(" " <= c <= "~" for c in text))


@functools.lru_cache(maxsize=None)
def cases_to_check(profile: str, name: str) -> list[str]:
    """Valid samples, the boundary suite, near-miss rejects and range-edge rejects of the field."""
    lang = field_language(profile, name)
    texts = list(lang.sample(SAMPLES, seed=0, max_length=80))
    texts += [case.text for case in lang.boundary_cases()]
    texts += [reject.text for reject in lang.rejects(SAMPLES, seed=0, max_length=80)]
    if lang.states <= EDGE_REJECTS_UP_TO:
        texts += [r.text for r in lang.rejects(SAMPLES // 4, seed=1, max_length=80, edges=True)]
    return texts


# -- predicates written from each standard's text ------------------------------------------

def ipv4_standard(s: str) -> bool:
    # Python's ipaddress (stdlib) as the reference: since Python 3.9.5 it rejects octets
    # with leading zeros (bpo-36384), which matches RFC 3986 dec-octet exactly.
    try:
        ipaddress.IPv4Address(s)
    except ValueError:
        return False
    return True


def uuid_shape(s: str) -> bool:
    # RFC 9562, section 4: 8-4-4-4-12 hex digits separated by hyphens (stdlib uuid.UUID also
    # takes braces, 'urn:uuid:', no hyphens and int() quirks such as '+', so the shape is checked here)
    return (len(s) == 36 and all(s[i] == "-" for i in (8, 13, 18, 23))
            and all(c in HEX for i, c in enumerate(s) if i not in (8, 13, 18, 23)))


def uuid_standard(s: str) -> bool:
    return uuid_shape(s) and str(uuid.UUID(s)) == s.lower()  # stdlib uuid round trip


def uuid_v4_standard(s: str) -> bool:
    if not (uuid_shape(s) and s == s.lower()):  # RFC 9562, section 4: lower case on output
        return False
    value = uuid.UUID(s)
    # RFC 9562, section 5.4: version 4; section 4.1: variant bits 10 (stdlib: uuid.RFC_4122)
    return value.version == 4 and value.variant == uuid.RFC_4122 and str(value) == s


def mac_standard(s: str) -> bool:
    # IEEE Std 802-2014, clause 8.1: six octets as two hex digits, separated by hyphens;
    # colons: common practice. One separator throughout (the profile's stated choice).
    seps = {s[i] for i in (2, 5, 8, 11, 14)} if len(s) == 17 else set()
    return (len(seps) == 1 and seps <= {"-", ":"}
            and all(c in HEX for i, c in enumerate(s) if i % 3 != 2))


def phone_standard(s: str) -> bool:
    # ITU-T E.164: at most 15 digits, country code not starting with 0; E.123: '+' prefix.
    # The lower bound of 7 digits is the profile's own choice (E.164 sets none).
    digits = s[1:]
    return (s[:1] == "+" and digits.isascii() and digits.isdigit()
            and digits[0] != "0" and 7 <= len(digits) <= 15)


def colour_standard(s: str) -> bool:
    # CSS Color Module Level 4, section 5.2: '#' then 3, 4, 6 or 8 hex digits (ASCII case-insensitive)
    return s[:1] == "#" and len(s) - 1 in (3, 4, 6, 8) and all(c in HEX for c in s[1:])


STANDARD = {
    ("ipv4.toml", "ipv4"): ipv4_standard,
    ("uuid.toml", "uuid"): uuid_standard,
    ("uuid.toml", "uuid_v4"): uuid_v4_standard,
    ("mac-address.toml", "mac"): mac_standard,
    ("e164.toml", "phone"): phone_standard,
    ("css-hex-colour.toml", "colour"): colour_standard,
}

ALL_FIELDS = [(path.name, spec["name"]) for path in sorted(PROFILES.glob("*.toml"))
              if not path.name.startswith("demo")
              for spec in tomllib.loads(path.read_text("utf-8"))["field"]]


def test_every_shipped_profile_is_listed_and_names_its_source():
    assert len(ALL_FIELDS) >= 10
    for profile, name in ALL_FIELDS:
        assert field_spec(profile, name).get("source"), (profile, name)
        assert "alphabet" not in field_spec(profile, name)    # re_verdict assumes printable


@pytest.mark.parametrize("profile,name", ALL_FIELDS)
def test_every_string_of_the_shortest_lengths_agrees_with_re(profile, name):
    # brute force: all 1 + 95 + 95**2 strings of length 0-2 over printable ASCII, judged by re
    lang = field_language(profile, name)
    for n in range(3):
        accepted = 0
        for chars in itertools.product(PRINTABLE, repeat=n):
            text = "".join(chars)
            verdict = re_verdict(profile, name, text)
            assert lang.accepts(text) == verdict, text
            accepted += verdict
        assert lang.count(n) == accepted, n


@pytest.mark.parametrize("profile,name", ALL_FIELDS)
def test_every_case_agrees_with_re(profile, name):
    lang = field_language(profile, name)
    for text in cases_to_check(profile, name):
        assert lang.accepts(text) == re_verdict(profile, name, text), text  # reference: re


@pytest.mark.parametrize("profile,name", list(STANDARD))
def test_every_case_agrees_with_the_standard(profile, name):
    lang, standard = field_language(profile, name), STANDARD[profile, name]
    texts = cases_to_check(profile, name)
    assert any(lang.accepts(t) for t in texts) and not all(lang.accepts(t) for t in texts)
    for text in texts:
        assert lang.accepts(text) == standard(text), text


# -- exact counts of every length, from outside pfuzz -------------------------------------------

LONGEST = 80  # every finite shipped field is at most 64 characters long


def series(terms) -> list[int]:
    """Coefficients 0..LONGEST of a generating function given as {length: count}."""
    return [terms.get(n, 0) for n in range(LONGEST + 1)]


def times(*factors: list[int]) -> list[int]:
    """The product of generating functions (concatenation of uniquely split parts)."""
    out = series({0: 1})
    for factor in factors:
        out = [sum(out[k] * factor[n - k] for k in range(n + 1)) for n in range(LONGEST + 1)]
    return out


def dotted(item: list[int]) -> list[int]:
    """Non-empty '.'-separated lists of items: L = X + X . '.' . L (no item holds a dot)."""
    out = [0] * (LONGEST + 1)
    for n in range(LONGEST + 1):
        out[n] = item[n] + sum(item[k] * out[n - k - 1] for k in range(1, n))
    return out


def ipv4_counts() -> list[int]:
    # RFC 3986 dec-octet: 10 values of one digit (0-9), 90 of two (10-99), 156 of three
    # (100-255), each spelt one way; four octets and three dots
    octet = series({1: 10, 2: 90, 3: 156})
    return times(octet, series({1: 1}), octet, series({1: 1}), octet, series({1: 1}), octet)


def semver_counts() -> list[int]:
    # Semantic Versioning 2.0.0, BNF: <valid semver> ::= <version core> ["-" <pre-release>]
    # ["+" <build>]; no identifier holds '.', '+' (and the core no '-'), so splits are unique.
    numeric = series({k: (10 if k == 1 else 9 * 10 ** (k - 1)) for k in range(1, LONGEST + 1)})
    # alphanumeric identifier: [0-9A-Za-z-]+ (63 characters) with at least one non-digit
    pre = [numeric[k] + (63**k - 10**k if k else 0) for k in range(LONGEST + 1)]
    build = series({k: 63**k for k in range(1, LONGEST + 1)})
    dot, none = series({1: 1}), series({0: 1})
    core = times(numeric, dot, numeric, dot, numeric)
    optional_pre = [a + b for a, b in zip(none, times(dot, dotted(pre)))]
    optional_build = [a + b for a, b in zip(none, times(dot, dotted(build)))]
    return times(core, optional_pre, optional_build)


def password_count(n: int) -> int:
    # The 'password' rules (its profile's about): printable ASCII is 26 lower-case, 26
    # upper-case, 10 digits, 32 symbols and the space. Inclusion-exclusion over the kinds
    # that are missing; the first and last characters are never the space.
    if not 12 <= n <= 64:
        return 0
    total = 0
    for missing in itertools.chain.from_iterable(
            itertools.combinations((26, 26, 10, 32), r) for r in range(5)):
        allowed = 95 - sum(missing)
        total += (-1) ** len(missing) * (allowed - 1) ** 2 * allowed ** (n - 2)
    return total


def passphrase_count(n: int) -> int:
    # The 'passphrase' rules: printable ASCII, no space at either end, no 'password' in any
    # case. Strings are counted by how much of the word they end in (the word has no border,
    # so a mismatch falls back to 0, or to 1 on a 'p'); each letter has 2 spellings.
    if not 15 <= n <= 64:
        return 0
    word = "password"
    ending = [1] + [0] * (len(word) - 1)       # the empty string matched no letter yet
    for position in range(n):
        others = 95 - (1 if position in (0, n - 1) else 0)   # all but the space at either end
        nxt = [0] * len(word)
        for j, ways in enumerate(ending):
            if j + 1 < len(word):
                nxt[j + 1] += 2 * ways                  # the word's next letter, either case
            if j:
                nxt[1] += 2 * ways                      # 'p' or 'P' begins it again
            nxt[0] += (others - (4 if j else 2)) * ways  # any other character
        ending = nxt
    return sum(ending)


def one_length(length: int, count: int) -> list[int]:
    return series({length: count})


#: (count of every length 0..LONGEST, total or None when unbounded), computed without pfuzz.
REFERENCE_COUNTS = {
    ("ipv4.toml", "ipv4"): (ipv4_counts(), 256**4),
    # RFC 9562, section 4: 32 hex positions, each 10 digits + 6 letters in 2 cases = 22 spellings
    ("uuid.toml", "uuid"): (one_length(36, 22**32), 22**32),
    # version 4: the version nibble is '4' and the variant nibble one of 8, 9, a, b
    # (RFC 9562, sections 5.4 and 4.1), lower case only: 16**30 * 4 = 2**122
    ("uuid.toml", "uuid_v4"): (one_length(36, 16**30 * 4), 2**122),
    # IEEE 802 form: 12 hex positions with 22 spellings each, times 2 separators (- or :)
    ("mac-address.toml", "mac"): (one_length(17, 2 * 22**12), 2 * 22**12),
    # ITU-T E.164: '+', a first digit 1-9, then d-1 digits, for d = 7..15: 9 * 10**(d-1) each
    ("e164.toml", "phone"): (series({1 + d: 9 * 10 ** (d - 1) for d in range(7, 16)}),
                             10**15 - 10**6),
    # CSS Color 4: '#' then 3, 4, 6 or 8 hex positions with 22 spellings each
    ("css-hex-colour.toml", "colour"): (series({1 + k: 22**k for k in (3, 4, 6, 8)}),
                                        22**3 + 22**4 + 22**6 + 22**8),
    # stdlib datetime: one string per day from 0001-01-01 to 9999-12-31
    ("iso-date.toml", "date"): (
        one_length(10, (datetime.date(9999, 12, 31) - datetime.date(1, 1, 1)).days + 1),
        3_652_059),
    # stdlib datetime: one string per second of a day
    ("time24.toml", "time"): (one_length(8, int(datetime.timedelta(days=1).total_seconds())),
                              86_400),
    ("semver.toml", "version"): (semver_counts(), None),
    ("password-policy.toml", "password"): (
        series({n: password_count(n) for n in range(LONGEST + 1)}),
        sum(password_count(n) for n in range(65))),
    ("password-policy.toml", "passphrase"): (
        series({n: passphrase_count(n) for n in range(LONGEST + 1)}),
        sum(passphrase_count(n) for n in range(65))),
}


def test_every_shipped_field_has_a_reference_count():
    assert set(REFERENCE_COUNTS) == set(ALL_FIELDS)


@pytest.mark.parametrize("profile,name", ALL_FIELDS)
def test_counts_of_every_length_match_the_reference(profile, name):
    expected, total = REFERENCE_COUNTS[profile, name]
    lang = field_language(profile, name)
    assert lang.counts(0, LONGEST) == dict(enumerate(expected))
    assert lang.total == total


# -- IPv4 -----------------------------------------------------------------------------------

def test_ipv4_against_ipaddress_on_tricky_octets():
    lang = field_language("ipv4.toml", "ipv4")
    octets = ["0", "00", "01", "1", "9", "10", "09", "99", "100", "199", "249", "250",
              "255", "256", "260", "300", "1000", "", "a", " 1"]
    for parts in itertools.product(octets, repeat=4):
        text = ".".join(parts)
        assert lang.accepts(text) == ipv4_standard(text), text  # reference: stdlib ipaddress
    for text in ["1.2.3", "1.2.3.4.5", "1.2.3.4.", ".1.2.3.4", "1..2.3", "1.2.3.4\n"]:
        assert not lang.accepts(text) and not ipv4_standard(text)


def faker_values(method: str, n: int = 300) -> list[str]:
    fake = Faker()
    fake.seed_instance(2024)  # faker's own seeded generator
    return [str(getattr(fake, method)()) for _ in range(n)]


@pytest.mark.parametrize("profile,name,method", [
    ("ipv4.toml", "ipv4", "ipv4"),
    ("uuid.toml", "uuid", "uuid4"),
    ("uuid.toml", "uuid_v4", "uuid4"),
    ("mac-address.toml", "mac", "mac_address"),
    ("css-hex-colour.toml", "colour", "hex_color"),
    ("iso-date.toml", "date", "date"),
    ("time24.toml", "time", "time"),
])
def test_faker_values_are_accepted(profile, name, method):
    lang = field_language(profile, name)
    for value in faker_values(method):
        assert lang.accepts(value), (method, value)  # reference: faker's own providers


# -- UUID -------------------------------------------------------------------------------------

def test_uuid_rejects_the_other_spellings_that_stdlib_uuid_takes():
    lang = field_language("uuid.toml", "uuid")
    value = "0f8fad5b-d9cb-469f-a165-70867728950e"
    for other in [value.replace("-", ""), "{" + value + "}", "urn:uuid:" + value]:
        assert uuid.UUID(other) == uuid.UUID(value)  # stdlib uuid accepts these forms
        assert not lang.accepts(other)
    assert lang.accepts(value.upper()) and lang.accepts("00000000-0000-0000-0000-000000000000")
    assert lang.accepts("FFFFFFFF-ffff-FFFF-ffff-FFFFFFFFFFFF")  # Max UUID, RFC 9562 section 5.10
    assert not field_language("uuid.toml", "uuid_v4").accepts(value.upper())


# -- MAC, E.164, CSS --------------------------------------------------------------------------

def test_mac_forms():
    lang = field_language("mac-address.toml", "mac")
    for value in faker_values("mac_address", 100):
        assert lang.accepts(value.upper()) and lang.accepts(value.replace(":", "-"))
        mixed = value[:2] + "-" + value[3:]
        assert not lang.accepts(mixed) and not mac_standard(mixed)
    for text in ["ac-de-48-00-00-80", "AC-DE-48-00-00-80", "acde.4800.0080", "acde48000080"]:
        assert lang.accepts(text) == mac_standard(text)


def test_e164_forms():
    lang = field_language("e164.toml", "phone")
    # E.123 writes groups with spaces; the profile takes the compact form only (see its about)
    assert not lang.accepts("+44 20 7946 0000") and lang.accepts("+442079460000")
    assert not lang.accepts("+0442079460000") and not lang.accepts("+1234567890123456")
