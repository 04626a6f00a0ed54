"""The semantic-version and password profiles checked against their rules in plain Python.

SemVer: a predicate written from the Backus-Naur grammar of Semantic
Versioning 2.0.0 (semver.org) without any regular expression, plus examples
quoted from the specification's text (from memory of the text, marked below)
and hand-written invalid versions, each naming the rule it breaks.
Passwords: each rule of the profile as a ``str`` predicate.
"""

from __future__ import annotations

import itertools
import string

import pytest

from test_profiles_standards import cases_to_check, field_language

VERSION = ("semver.toml", "version")
PASSWORD = ("password-policy.toml", "password")
PASSPHRASE = ("password-policy.toml", "passphrase")
IDENTIFIER_CHARS = set(string.ascii_letters + string.digits + "-")


# -- Semantic Versioning 2.0.0 -------------------------------------------------------------

def numeric(part: str) -> bool:
    # <numeric identifier> ::= "0" | <positive digit> | <positive digit> <digits>
    return part.isascii() and part.isdigit() and (part == "0" or part[0] != "0")


def pre_release_identifier(part: str) -> bool:
    # <pre-release identifier> ::= <alphanumeric identifier> | <numeric identifier>;
    # an alphanumeric identifier is [0-9A-Za-z-]+ with at least one non-digit
    if not part or not set(part) <= IDENTIFIER_CHARS:
        return False
    return numeric(part) or not part.isdigit()


def build_identifier(part: str) -> bool:
    # <build identifier> ::= <alphanumeric identifier> | <digits> (leading zeros allowed)
    return bool(part) and set(part) <= IDENTIFIER_CHARS


def semver_standard(s: str) -> bool:
    head, plus, build = s.partition("+")
    if plus and not all(build_identifier(p) for p in build.split(".")):
        return False
    core, dash, pre = head.partition("-")
    if dash and not all(pre_release_identifier(p) for p in pre.split(".")):
        return False
    parts = core.split(".")
    return len(parts) == 3 and all(numeric(p) for p in parts)


# Quoted from the Semantic Versioning 2.0.0 text (items 9, 10 and 11), from memory of the text.
SPEC_VALID = [
    "1.0.0-alpha", "1.0.0-alpha.1", "1.0.0-0.3.7", "1.0.0-x.7.z.92", "1.0.0-x-y-z.--",
    "1.0.0-alpha+001", "1.0.0+20130313144700", "1.0.0-beta+exp.sha.5114f85",
    "1.0.0+21AF26D3----117B344092BD", "1.9.0", "1.10.0", "1.11.0", "2.0.0", "2.1.0", "2.1.1",
    "1.0.0-alpha.beta", "1.0.0-beta", "1.0.0-beta.2", "1.0.0-beta.11", "1.0.0-rc.1", "1.0.0",
]
# Hand-written, each breaking one rule of the grammar.
HAND_INVALID = [
    "01.0.0", "1.01.0", "1.0.01",            # numeric identifiers: no leading zeros (item 2)
    "1.0.0-01", "1.0.0-alpha.007",           # numeric pre-release identifiers: no leading zeros (item 9)
    "1.0.0-", "1.0.0-alpha..1", "1.0.0-.a",  # pre-release identifiers must not be empty (item 9)
    "1.0.0+", "1.0.0+a..b",                  # build identifiers must not be empty (item 10)
    "1.0", "1", "1.0.0.0", "v1.0.0", "-1.0.0", "1.0.0 ", " 1.0.0",
    "1.0.0-alpha_beta", "1.0.0+build!", "1.0.0+a+b", "1.0.0-é",
]


def test_spec_examples_and_hand_written_invalids():
    lang = field_language(*VERSION)
    for text in SPEC_VALID:
        assert lang.accepts(text) and semver_standard(text), text
    for text in HAND_INVALID:
        assert not lang.accepts(text) and not semver_standard(text), text


def test_leading_zero_rule_exhaustively_on_small_parts():
    lang = field_language(*VERSION)
    numbers = ["0", "00", "01", "1", "10", "010", "99", "100"]
    for parts in itertools.product(numbers, repeat=3):
        text = ".".join(parts)
        assert lang.accepts(text) == all(p == "0" or p[0] != "0" for p in parts), text


def test_identifiers_exhaustively_over_a_small_alphabet():
    lang = field_language(*VERSION)
    for n in range(0, 4):
        for chars in itertools.product("0a-.", repeat=n):
            tail = "".join(chars)
            for text in ("1.0.0-" + tail, "1.0.0+" + tail, "1.0.0-rc+" + tail, "1.0.0-" + tail + "+b"):
                assert lang.accepts(text) == semver_standard(text), text


def test_semver_counts_by_length_derived_by_hand():
    lang = field_language(*VERSION)
    # length 5: d.d.d, 10**3. length 6: one two-digit part (90 spellings, no leading zero)
    # in one of 3 places: 3 * 90 * 100. length 7: parts of 3,1,1 digits (3 * 900 * 100) or
    # 2,2,1 (3 * 90 * 90 * 10), or d.d.d plus '-' or '+' and one identifier character
    # (10 digits + 52 letters + '-' = 63 each): 2 * 1000 * 63.
    assert lang.count(5) == 1000
    assert lang.count(6) == 27_000
    assert lang.count(7) == 270_000 + 243_000 + 2 * 63_000
    assert [lang.count(n) for n in range(5)] == [0] * 5
    assert lang.total is None  # the grammar sets no length limit


def test_semver_cases_agree_with_the_grammar():
    lang = field_language(*VERSION)
    for text in cases_to_check(*VERSION):
        assert lang.accepts(text) == semver_standard(text), text


# -- password rules ----------------------------------------------------------------------------

def printable_ascii(s: str) -> bool:
    return all(" " <= c <= "~" for c in s)


def composition_rules(s: str) -> dict[str, bool]:
    """Each rule of the 'password' field as a plain str predicate."""
    return {
        "length 12-64": 12 <= len(s) <= 64,
        "printable ASCII": printable_ascii(s),
        "a lower-case letter": any(c.islower() for c in s),
        "an upper-case letter": any(c.isupper() for c in s),
        "a digit": any(c.isdigit() for c in s),
        "a symbol": any(not c.isalnum() and c != " " for c in s),
        "no space at the start": not s.startswith(" "),
        "no space at the end": not s.endswith(" "),
    }


def blocklist_rules(s: str) -> dict[str, bool]:
    """Each rule of the 'passphrase' field as a plain str predicate."""
    return {
        "length 15-64": 15 <= len(s) <= 64,
        "printable ASCII": printable_ascii(s),
        "no space at the start": not s.startswith(" "),
        "no space at the end": not s.endswith(" "),
        "no 'password'": "password" not in s.lower(),
    }


@pytest.mark.parametrize("field,rules", [(PASSWORD, composition_rules), (PASSPHRASE, blocklist_rules)])
def test_valid_strings_keep_every_rule_and_rejects_break_one(field, rules):
    lang = field_language(*field)
    texts = cases_to_check(*field)
    broken = set()
    for text in texts:
        failed = [rule for rule, ok in rules(text).items() if not ok]
        assert lang.accepts(text) == (not failed), (text, failed)
        broken.update(failed)
    # the near misses and boundary cases together break every rule at least once, except
    # "printable ASCII": the alphabet is printable ASCII, so no case leaves it
    expected = set(rules("x")) - {"printable ASCII"}
    assert broken == expected, broken ^ expected


def test_hand_written_passwords():
    password, passphrase = field_language(*PASSWORD), field_language(*PASSPHRASE)
    assert password.accepts("Abcdefghij1!") and password.accepts("Tr0ub4dor&3x")
    for text in ["abcdefghij1!", "ABCDEFGHIJ1!", "Abcdefghijk!", "Abcdefghij12",
                 "Abcdefghi1!", " Abcdefghij1!", "Abcdefghij1! ", "Abcdefghij1!" * 6]:
        assert not password.accepts(text) and not all(composition_rules(text).values()), text
    assert passphrase.accepts("correct horse battery staple")
    for text in ["my PassWord is long enough", "short phrase", " leading space here"]:
        assert not passphrase.accepts(text) and not all(blocklist_rules(text).values()), text
