"""Case-insensitive atoms: resolve() agrees with re over all code points."""

from __future__ import annotations

import itertools
import re

import _sre
import pytest

from pfuzz.syntax.casefold import case_sensitive_points, resolve
from pfuzz.syntax.categories import every_code_point_text
from pfuzz.base.charset import ALPHABETS, CharSet, MAX_CODE_POINT
from pfuzz.syntax.parser import parse

UNICODE = ALPHABETS["unicode"]
PRINTABLE = ALPHABETS["printable"]

I, IA, IS = re.I, re.I | re.A, re.I | re.S
ATOMS = [(I, "k"), (I, "[a-z]"), (I, "[^a-z]"), (I, r"[\Wa]"), (I, r"\W"), (I, "[K]"), (I, "s"), (I, "ß"),
         (I, "[ǅ]"), (IA, "[a-z]"), (IA, "[^a-z]"), (IA, "k"), (I, r"[^\W]"), (I, "."), (IS, "."),
         (I, r"\w|a"), (I, r"[\d\s]|k"), (I, "\u0345"), (I, "[^ι]"), (I, "İ"), (I, "ı"), (I, r"\u212a"),
         (I, r"[^\x00-\x7f]"), (I, r"\d"), (I, "[Σσς]"), (0, "k"), (0, "[^a-z]")]


def members_by_re(pattern: str, alphabet: CharSet) -> CharSet:
    """Reference: Python's re; every character of ``alphabet`` it matches (each atom matches one)."""
    text = "".join(alphabet.chars())
    return CharSet.from_chars(m.group() for m in re.finditer(pattern, text))


@pytest.fixture(scope="module")
def all_text():
    return every_code_point_text()


@pytest.mark.parametrize("flags, pattern", ATOMS)
def test_atoms_match_what_re_matches_over_all_code_points(flags, pattern, all_text):
    # Reference: Python's re; the maximal runs of characters the atom matches, as ranges.
    runs = re.finditer(f"(?:{pattern})+", all_text, flags)
    expected = CharSet(tuple((m.start(), m.end() - 1) for m in runs)) & UNICODE
    assert resolve(parse(pattern, flags), UNICODE) == expected


@pytest.mark.parametrize("pattern", [r"(?i)[^a-z]", r"(?i)[\Wa]"])
def test_brute_force_with_fullmatch_one_code_point_at_a_time(pattern):
    # Reference: Python's re.fullmatch, asked for every code point (surrogates excluded).
    matcher = re.compile(pattern).fullmatch
    ranges: list[list[int]] = []
    for point in UNICODE:
        if matcher(chr(point)):
            if ranges and ranges[-1][1] == point - 1:
                ranges[-1][1] = point
            else:
                ranges.append([point, point])
    assert resolve(parse(pattern), UNICODE) == CharSet.of(map(tuple, ranges))


def test_printable_alphabet():
    assert resolve(parse("(?i)k"), PRINTABLE) == CharSet.from_chars("kK")
    assert resolve(parse("(?i)[^a-z]"), PRINTABLE) == PRINTABLE - CharSet.from_chars("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ")
    assert resolve(parse("k"), PRINTABLE) == CharSet.single("k")
    assert resolve(parse("(?i)k"), CharSet.range("0", "9")) == CharSet()


def test_kelvin_sign_and_long_s():
    # Reference: Python's re; U+212A KELVIN SIGN folds to k, U+017F LONG S to s.
    assert "\u212a" in resolve(parse("(?i)k"), UNICODE) and re.fullmatch("(?i)k", "\u212a")
    assert "\u017f" in resolve(parse("(?i)s"), UNICODE) and re.fullmatch("(?i)s", "\u017f")
    assert "\u212a" not in resolve(parse("(?i)[^a-z]"), UNICODE)
    assert "\u212a" not in resolve(parse("(?ia)k"), UNICODE)


def test_case_sensitive_points_cover_every_cased_code_point_and_its_lower_case():
    points = case_sensitive_points()
    for point in range(MAX_CODE_POINT + 1):
        if _sre.unicode_iscased(point):
            assert point in points and _sre.unicode_tolower(point) in points
    assert 2900 < len(points) < 4000
    assert len(points & PRINTABLE) == 52


def test_alternations_of_atoms_mean_the_union_of_the_atoms():
    # re merges a|b|\W into one set, and after factoring prefixes out of xa|x\W as well
    # (re/_parser.py, _parse_sub); the parser merges only the first kind. Reference: Python's
    # re; on the cased code points (the only ones where IGNORECASE acts) both readings agree.
    cased = case_sensitive_points()
    atoms = [r"\W", r"\w", r"\S", r"\d", "a", "k", "ß", "\u0345", "ι", "[a-z]", r"[\Wk]", "[Σ]"]
    for flags, (x, y) in itertools.product(("(?i)", "(?ia)"), itertools.combinations(atoms, 2)):
        merged = members_by_re(f"{flags}(?:{x}|{y})", cased)
        assert merged == members_by_re(flags + x, cased) | members_by_re(flags + y, cased), (flags, x, y)
