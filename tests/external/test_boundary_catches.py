"""Planted validator bugs that the deterministic boundary suite must catch, with no random part.

Each faulty validator is written here, independently, as a plain Python
function or a Python ``re`` pattern. A bug is caught when at least one boundary
case gets a different answer from the validator than from the reference:
``re.fullmatch`` of the specification (Python's ``re``), restricted to the
specification's alphabet, which for the ``printable`` preset is U+0020 to
U+007E (the README's definition of the preset). The password field's reference
is its rules written as ``str`` predicates from the profile's own text.

Two suites are used: the field's own (``Language.boundary_cases()``, over the
specification's alphabet, as a corpus writes it) and the audit's boundary
cases (``pfuzz.audit.run.build_cases`` with every random part switched off:
no sampled valid strings, no near-miss rejects, no hostile variants or case
flips), which are built over the audit alphabet with the hostile characters as
probes. The seed cannot matter; one test checks that it does not.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

import pfuzz
from pfuzz.audit.run import Settings, build_cases
from pfuzz.boundary.suite import CATEGORIES
from pfuzz.profile.loader import load_profile

PROFILES = Path(__file__).resolve().parents[2] / "profiles"
BOUNDARY_ONLY = Settings(valid=0, rejects=0, hostile=False, case_flip=False)


def printable(text: str) -> bool:
    return all(" " <= ch <= "~" for ch in text)   # the 'printable' preset, as the README defines it


def reference(pattern: str, flags: int = 0):
    """The specification's verdict: re.fullmatch over the printable alphabet (Python's re)."""
    return lambda text: printable(text) and re.fullmatch(pattern, text, flags) is not None


def field_texts(pattern: str, flags: int = 0) -> list[str]:
    return [c.text for c in pfuzz.compile(pattern, flags=flags).boundary_cases()]


def audit_texts(pattern: str, flags: int = 0, alphabet: str = "printable", seed: int = 0) -> list[str]:
    settings = Settings(valid=0, rejects=0, hostile=False, case_flip=False, seed=seed)
    cases, _ = build_cases(pfuzz.compile(pattern, alphabet, flags), settings)
    assert {c.category for c in cases} <= set(CATEGORIES)      # boundary cases only
    return [c.text for c in cases]


def disagreements(texts, spec, validator) -> list[str]:
    return [t for t in texts if bool(validator(t)) != spec(t)]


def full(pattern: str, flags: int = 0):
    return lambda text: re.fullmatch(pattern, text, flags) is not None


# -- an off-by-one at any position of any range -----------------------------------------------

def positional(ranges: list[tuple[str, str]]):
    """A validator that checks the length and each position against its own (lo, hi) range."""
    def check(text: str) -> bool:
        return len(text) == len(ranges) and all(lo <= ch <= hi for ch, (lo, hi) in zip(text, ranges))
    return check


def shifted_validators(ranges: list[tuple[str, str]]):
    """Every validator with one end of one position's range moved by one code point."""
    for i, (lo, hi) in enumerate(ranges):
        for new in ((chr(ord(lo) + 1), hi), (chr(ord(lo) - 1), hi),
                    (lo, chr(ord(hi) - 1)), (lo, chr(ord(hi) + 1))):
            yield f"position {i}: {new[0]}-{new[1]}", positional(ranges[:i] + [new] + ranges[i + 1:])


OFF_BY_ONE_SPECS = [
    (r"[A-Z]{2}[0-9]{2}", [("A", "Z")] * 2 + [("0", "9")] * 2),
    (r"[1-9][0-9]", [("1", "9"), ("0", "9")]),
    (r"[a-f]-[0-7][0-7]", [("a", "f"), ("-", "-"), ("0", "7"), ("0", "7")]),
]


@pytest.mark.parametrize("pattern,ranges", OFF_BY_ONE_SPECS)
def test_an_off_by_one_at_any_position_of_any_range(pattern, ranges):
    spec, texts = reference(pattern), field_texts(pattern)
    assert not disagreements(texts, spec, positional(ranges))        # the correct one agrees
    for label, validator in shifted_validators(ranges):
        assert disagreements(texts, spec, validator), label


def test_named_positional_slips():
    texts = field_texts(r"[A-Z]{2}[0-9]{2}")
    spec = reference(r"[A-Z]{2}[0-9]{2}")

    def refuses_double_zero_at_the_end(text):     # '00' refused only in the last two digits
        return full(r"[A-Z]{2}[0-9]{2}")(text) and text[2:] != "00"

    assert disagreements(texts, spec, refuses_double_zero_at_the_end)
    day = r"(0[1-9]|1[0-2])/(0[1-9]|[12][0-9]|3[01])"
    for slip in (r"(0[1-9]|1[0-2])/(0[1-9]|[12][0-9]|3[0-2])",     # day 32 let through
                 r"(0[1-9]|1[0-2])/(0[1-9]|[12][0-9]|3[0])",       # day 31 refused
                 r"(0[1-9]|1[0-3])/(0[1-9]|[12][0-9]|3[01])",      # month 13 let through
                 r"(0[1-9]|1[0-2])/(0[0-9]|[12][0-9]|3[01])"):     # day 00 let through
        assert disagreements(field_texts(day), reference(day), full(slip)), slip


# -- a length off by one anywhere ------------------------------------------------------------

PLATE = r"[A-Z]{3} [0-9]{4}"
LENGTH_SLIPS = [
    r"[A-Z]{3} [0-9]{4,5}",      # one digit too many at the end
    r"[A-Z]{3} [0-9]{3,4}",      # one digit too few at the end
    r"[A-Z]{3,4} [0-9]{4}",      # one letter too many
    r"[A-Z]{2,3} [0-9]{4}",      # one letter too few
    r"[A-Z]{3} ?[0-9]{4}",       # the space left out
    r"[A-Z]{3} {1,2}[0-9]{4}",   # a second space
    r"[A-Z]{3} [0-9]{2}[0-9]?[0-9]",   # one digit too few in the middle
]


@pytest.mark.parametrize("slip", LENGTH_SLIPS)
def test_a_length_off_by_one_anywhere(slip):
    assert disagreements(field_texts(PLATE), reference(PLATE), full(slip))


def test_one_more_in_the_middle_of_a_field():
    def five_digit_middle(text):   # hand-written: accepts 4 or 5 digits between the letters
        head, _, rest = text.partition(" ")
        return (len(head) == 3 and head.isascii() and head.isupper() and head.isalpha()
                and len(rest) in (6, 7) and rest[:-2].isdigit() and rest[:-2].isascii()
                and rest[-2:].isascii() and rest[-2:].isalpha() and rest[-2:].isupper()
                and len(rest[:-2]) in (4, 5))

    pattern = r"[A-Z]{3} [0-9]{4}[A-Z]{2}"
    assert disagreements(field_texts(pattern), reference(pattern), five_digit_middle)


# -- a missing case flag ---------------------------------------------------------------------

def test_a_missing_case_flag():
    mac = r"[a-f0-9]{2}(:[a-f0-9]{2}){5}"
    assert disagreements(field_texts(mac, re.IGNORECASE), reference(mac, re.IGNORECASE), full(mac))
    answers = r"yes|no"
    assert disagreements(field_texts(answers, re.IGNORECASE), reference(answers, re.IGNORECASE),
                         lambda text: text in ("yes", "no"))


# -- '$' before a final newline, Unicode \d and \w: the audit alphabet --------------------------

def test_dollar_before_a_final_newline():
    # re.match with '$' also accepts the string with a final '\n' (Python's re documentation)
    for pattern, slip in ((PLATE, lambda t: re.match(r"[A-Z]{3} [0-9]{4}$", t)),
                          (r"[0-9]{5}(-[0-9]{4})?", lambda t: re.search(r"^[0-9]{5}(-[0-9]{4})?$", t))):
        found = disagreements(audit_texts(pattern), reference(pattern), slip)
        assert found and all(t.endswith("\n") for t in found), found


@pytest.mark.parametrize("pattern,slip", [
    (r"[A-Z]{3} [0-9]{4}", lambda t: re.fullmatch(r"[A-Z]{3} \d{4}", t)),
    (r"[0-9]{4}", lambda t: len(t) == 4 and t.isdigit()),
    (r"[A-Za-z0-9_]{3,8}", lambda t: re.fullmatch(r"\w{3,8}", t)),
    (r"[a-z]+", lambda t: t.isalpha() and t.islower()),
])
def test_unicode_digits_and_word_characters(pattern, slip):
    found = disagreements(audit_texts(pattern), reference(pattern), slip)
    assert found and all(not t.isascii() for t in found), found


def test_unicode_digits_when_the_alphabet_holds_them():
    # the specification's alphabet is the basic multilingual plane: the digit blocks are no
    # longer set apart by gaps in the alphabet; the probes still reach them
    def spec(text):
        return re.fullmatch(r"[0-9]{4}", text) is not None      # every character of bmp is allowed

    found = disagreements(audit_texts(r"[0-9]{4}", alphabet="bmp"), spec, full(r"\d{4}"))
    assert any("\u0660" in t for t in found), found


def test_the_audit_boundary_cases_do_not_depend_on_the_seed():
    assert audit_texts(PLATE, seed=0) == audit_texts(PLATE, seed=12345)


# -- the 968-state password field, under the default limit ------------------------------------

def policy(low=12, high=64, allowed=printable, final_newline=False, end_space=False):
    """The composition policy of profiles/password-policy.toml, rule by rule, from its text;
    the keywords plant one slip each."""
    def check(text: str) -> bool:
        if final_newline and text.endswith("\n"):
            text = text[:-1]
        symbols = [ch for ch in text if ch != " " and not ch.isalnum()]
        return (low <= len(text) <= high and allowed(text)
                and any("a" <= ch <= "z" for ch in text) and any("A" <= ch <= "Z" for ch in text)
                and any("0" <= ch <= "9" for ch in text) and bool(symbols)
                and not text.startswith(" ") and (end_space or not text.endswith(" ")))
    return check


password_rules = policy()
PASSWORD_SLIPS = {
    "65 characters let through": policy(high=65),
    "11 characters let through": policy(low=11),
    "12 characters refused": policy(low=13),
    "64 characters refused": policy(high=63),
    "'$' before a final newline": policy(final_newline=True),
    "str.isprintable for the alphabet": policy(allowed=str.isprintable),
    "a space at the end let through": policy(end_space=True),
}


@pytest.fixture(scope="module")
def password_cases():
    lang = load_profile(PROFILES / "password-policy.toml").field("password").language()
    cases, notes = build_cases(lang, BOUNDARY_ONLY)
    return [c.text for c in cases], notes


def test_the_password_suite_is_cut_and_says_so(password_cases):
    texts, notes = password_cases
    assert len(texts) == 20_000
    assert any("boundary suite cut" in note for note in notes)
    assert not disagreements(texts, password_rules, password_rules)


@pytest.mark.parametrize("name", sorted(PASSWORD_SLIPS))
def test_password_slips_are_caught_within_the_default_limit(password_cases, name):
    texts, _ = password_cases
    assert disagreements(texts, password_rules, PASSWORD_SLIPS[name]), name
