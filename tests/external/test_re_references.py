"""Second references for a few corpus entries, independent of Python's ``re``.

Each entry of tests/data/validator_patterns.toml named below is checked
against a second reference that knows the format itself: Python's ``float()``,
``json.loads``, ``int(s, 0)``, ``ipaddress.IPv4Address``/``IPv6Address``,
``uuid.UUID``, ``datetime.date.fromisoformat``, a greedy Roman-numeral
converter (common practice) and the integer range 0-65535 of a port. On
examples of the format and on random strings over its alphabet, the corpus
pattern under ``re`` must agree with the second reference, and pfuzz with
``re`` (the reference verdict of ``test_re_corpus.py``).
"""

from __future__ import annotations

import datetime
import ipaddress
import json
import random
import uuid

import pytest

from test_re_corpus import BY_NAME, describe, disagreements


def parses(function, text: str) -> bool:
    try:
        function(text)
    except ValueError:
        return False
    return True


ROMAN_VALUES = [(1000, "M"), (900, "CM"), (500, "D"), (400, "CD"), (100, "C"), (90, "XC"),
                (50, "L"), (40, "XL"), (10, "X"), (9, "IX"), (5, "V"), (4, "IV"), (1, "I")]


def to_roman(number: int) -> str:
    """Subtractive Roman numeral by the greedy method (common practice)."""
    out = []
    for value, letters in ROMAN_VALUES:
        count, number = divmod(number, value)
        out.append(letters * count)
    return "".join(out)


ROMAN_NUMERALS = frozenset(to_roman(n) for n in range(1, 4000))


def float_examples(rng):
    xs = [rng.uniform(-1e6, 1e6) * 10 ** rng.randint(-12, 12) for _ in range(300)]
    return [repr(x) for x in xs] + [f"{x:.3e}" for x in xs] + [f"{x:.2f}" for x in xs]


def json_examples(rng):
    return float_examples(rng) + [json.dumps(rng.randint(-10 ** 9, 10 ** 9)) for _ in range(200)]


def int_examples(rng):
    ns = [rng.randint(0, 10 ** rng.randint(1, 9)) for _ in range(300)]
    return ([hex(n) for n in ns] + [oct(n) for n in ns] + [bin(n) for n in ns]
            + [f"{n:_}" for n in ns] + [f"0x{n:_x}" for n in ns])


def ipv4_examples(rng):
    return [str(ipaddress.IPv4Address(rng.getrandbits(rng.choice([8, 16, 32])) << rng.randint(0, 24)
                                      & 0xFFFFFFFF)) for _ in range(500)]


def ipv6_examples(rng):
    out = []
    for _ in range(500):
        groups = [rng.choice([0, 0, rng.getrandbits(16)]) for _ in range(8)]
        address = ipaddress.IPv6Address(sum(g << (16 * i) for i, g in enumerate(groups)))
        out += [str(address), address.exploded, str(address).upper()]
    for _ in range(1500):  # near-valid shapes: group counts, :: and group widths vary
        parts = ["".join(rng.choice("0123456789abcdefABCDEF") for _ in range(rng.randint(0, 5)))
                 for _ in range(rng.randint(1, 9))]
        out.append(":".join(parts))
    return out


def uuid_examples(rng):
    values = [str(uuid.UUID(int=rng.getrandbits(128), version=v)) for v in (4, 1) for _ in range(300)]
    return values + [value.upper() for value in values]


def leap_date_examples(rng):
    years = list(range(1, 10000, 37)) + list(range(1890, 2110)) + [100, 400, 1600, 2000, 2100]
    out = [f"{y:04d}-02-{d:02d}" for y in years for d in (28, 29, 30)]
    out += [f"{rng.randint(1, 9999):04d}-{rng.randint(0, 13):02d}-{rng.randint(0, 32):02d}"
            for _ in range(3000)]
    return out


def port_examples(rng):
    numbers = [*range(0, 2000), *range(64000, 70000), *(rng.randint(0, 99999) for _ in range(3000))]
    return [str(n) for n in numbers] + [f"0{n}" for n in range(0, 1000)]


#: name: (second reference, its source, alphabet for extra random strings or None, examples)
ORACLES = {
    "scientific": (lambda s: parses(float, s), "Python float()", "0123456789.eE+-", float_examples),
    "json-number": (lambda s: parses(json.loads, s), "json.loads", "0123456789.eE+-", json_examples),
    "python-int-literal": (lambda s: parses(lambda t: int(t, 0), s), "int(s, 0)",
                           "0123456789_bBoOxXaAfF", int_examples),
    "ipv4-strict": (lambda s: parses(ipaddress.IPv4Address, s), "ipaddress.IPv4Address",
                    "0123456789.", ipv4_examples),
    "ipv6-compressed": (lambda s: parses(ipaddress.IPv6Address, s), "ipaddress.IPv6Address",
                        "0123:abcF", ipv6_examples),
    "uuid-v4": (lambda s: parses(uuid.UUID, s) and len(s) == 36 and uuid.UUID(s).version == 4
                and s[19].lower() in "89ab", "uuid.UUID", None, uuid_examples),
    "iso-date-leap": (lambda s: parses(datetime.date.fromisoformat, s), "datetime.date.fromisoformat",
                      None, leap_date_examples),
    "roman-numeral": (ROMAN_NUMERALS.__contains__, "greedy Roman converter", "MDCLXVI", lambda rng: []),
    "port": (lambda s: s.isascii() and s.isdigit() and str(int(s)) == s and int(s) <= 65535,
             "integer range 0-65535", "0123456789", port_examples),
}


@pytest.mark.parametrize("name", list(ORACLES))
def test_second_reference_agrees(name):
    oracle, source, alphabet, examples = ORACLES[name]
    entry, rng = BY_NAME[name], random.Random(f"oracle:{name}")
    strings = set(examples(rng))
    if alphabet:
        strings |= {"".join(rng.choice(alphabet) for _ in range(rng.randint(0, 9)))
                    for _ in range(3000)}
    corpus_wrong = sorted(s for s in strings if entry.expected(s) != oracle(s))
    assert not corpus_wrong, f"re and {source} disagree on {corpus_wrong[:8]!r}"
    wrong = disagreements(entry, strings)
    assert not wrong, describe(entry, wrong)
