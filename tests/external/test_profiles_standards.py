"""The shipped profiles checked against the standards they follow.

Each field's language is computed here directly from the TOML (stdlib
``tomllib``, then ``pfuzz.compile`` of the pattern, intersected with every
``require``, minus every ``forbid``, within the length bounds), independently
of the profile loader, and compared with the loader's result. Then every
valid sample, every boundary case and every near-miss reject gets two
verdicts from outside pfuzz: Python's ``re.fullmatch`` applied to the
profile's own patterns, and a plain-Python predicate written from the
standard's text (``STANDARD`` below, one per field, its source beside it).
Counts are derived by hand in comments. Calendar, time, version and
password checks are in ``test_profile_calendar.py`` and
``test_profile_semver_password.py``.
"""

from __future__ import annotations

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

import pfuzz
from pfuzz.profile.loader import load_profile

PROFILES = Path(__file__).resolve().parents[2] / "profiles"
HEX = set(string.hexdigits)  # 0-9, a-f, A-F
SAMPLES = 200
#: Range-edge rejects (near misses in edges mode) take about a minute to build for the
#: password field (968 states); the boundary suite's range-edge cases cover it instead.
EDGE_REJECTS_UP_TO = 200


# -- the field's language, computed directly from the file --------------------------------

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
def field_language(profile: str, name: str) -> pfuzz.Language:
    """pattern ∩ require − forbid ∩ lengths, over the field's alphabet (schema of the profile format)."""
    spec = field_spec(profile, name)
    alphabet, flags = spec.get("alphabet", "printable"), flag_bits(spec)
    lang = pfuzz.compile(spec["pattern"], alphabet, flags)
    for pattern in spec.get("require", []):
        lang = lang & pfuzz.compile(pattern, alphabet, flags)
    for pattern in spec.get("forbid", []):
        lang = lang - pfuzz.compile(pattern, alphabet, flags)
    if "min_length" in spec or "max_length" in spec:
        bounds = f"(?s).{{{spec.get('min_length', 0)},{spec.get('max_length', '')}}}"
        lang = lang & pfuzz.compile(bounds, alphabet)
    return lang


def re_verdict(profile: str, name: str, text: str) -> bool:
    """The field's verdict from Python's re (reference matcher) on the profile's own patterns."""
    spec = field_spec(profile, name)
    flags = flag_bits(spec)
    lo, hi = spec.get("min_length", 0), spec.get("max_length", len(text))
    return (re.fullmatch(spec["pattern"], text, flags) is not None
            and all(re.fullmatch(p, text, flags) for p in spec.get("require", []))
            and not any(re.fullmatch(p, text, flags) for p in spec.get("forbid", []))
            and lo <= len(text) <= hi)


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


@pytest.mark.parametrize("profile,name", ALL_FIELDS)
def test_loader_and_direct_computation_agree(profile, name):
    loaded = load_profile(PROFILES / profile).field(name).language()
    assert loaded.distinguish(field_language(profile, name)) is None


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


# -- IPv4 -----------------------------------------------------------------------------------

def test_ipv4_accepts_exactly_two_to_the_32_strings():
    # RFC 3986 dec-octet spells each value 0-255 in exactly one way, so 256**4 addresses
    assert field_language("ipv4.toml", "ipv4").total == 2**32


def test_ipv4_counts_by_length_derived_by_hand():
    # octets by digits: 10 of one digit (0-9), 90 of two (10-99), 156 of three (100-255);
    # length n = 3 dots + digits, so count(n) is the coefficient of x**(n-3) in (10x+90x²+156x³)⁴
    coefficients: dict[int, int] = {0: 1}
    for _ in range(4):
        nxt: dict[int, int] = {}
        for k, v in coefficients.items():
            for digits, ways in ((1, 10), (2, 90), (3, 156)):
                nxt[k + digits] = nxt.get(k + digits, 0) + v * ways
        coefficients = nxt
    lang = field_language("ipv4.toml", "ipv4")
    assert lang.counts(0, 20) == {n: coefficients.get(n - 3, 0) for n in range(21)}


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

def test_uuid_counts_derived_by_hand():
    # 32 hex positions, each 10 digits + 6 letters in 2 cases = 22 spellings
    assert field_language("uuid.toml", "uuid").total == 22**32
    # version 4: 4 bits of version and 2 of variant fixed, 122 free bits (RFC 9562, section 5.4)
    assert field_language("uuid.toml", "uuid_v4").total == 2**122


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

def test_mac_counts_and_forms():
    lang = field_language("mac-address.toml", "mac")
    # 12 hex positions with 22 spellings each, times 2 separators (hyphen or colon)
    assert lang.total == 2 * 22**12
    for value in faker_values("mac_address", 100):
        assert lang.accepts(value.upper()) and lang.accepts(value.replace(":", "-"))
        mixed = value[:2] + "-" + value[3:]
        assert not lang.accepts(mixed) and not mac_standard(mixed)
    for text in ["ac-de-48-00-00-80", "AC-DE-48-00-00-80", "acde.4800.0080", "acde48000080"]:
        assert lang.accepts(text) == mac_standard(text)


def test_e164_counts_by_length_derived_by_hand():
    lang = field_language("e164.toml", "phone")
    # '+', a first digit 1-9, then d-1 digits 0-9, for d = 7..15 digits: 9 * 10**(d-1) each
    expected = {1 + d: 9 * 10 ** (d - 1) for d in range(7, 16)}
    assert lang.counts(0, 20) == {n: expected.get(n, 0) for n in range(21)}
    assert lang.total == 10**15 - 10**6
    # E.123 writes groups with spaces; the profile takes the compact form only (see its about)
    assert not lang.accepts("+44 20 7946 0000") and lang.accepts("+442079460000")
    assert not lang.accepts("+0442079460000") and not lang.accepts("+1234567890123456")


def test_css_hex_colour_counts_derived_by_hand():
    lang = field_language("css-hex-colour.toml", "colour")
    # after '#': 3, 4, 6 or 8 positions with 22 spellings each (16 values, 6 letters in 2 cases)
    assert lang.counts(0, 10) == {n: (22 ** (n - 1) if n - 1 in (3, 4, 6, 8) else 0)
                                  for n in range(11)}
    assert lang.total == 22**3 + 22**4 + 22**6 + 22**8
