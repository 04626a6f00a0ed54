"""Alphabet specifications: presets by name, classes in pattern syntax, clear errors otherwise."""

from __future__ import annotations

import pytest

from pfuzz.syntax.categories import category
from pfuzz.base.charset import DEFAULT_ALPHABET, ALPHABETS, CharSet
from pfuzz.errors import AlphabetError
from pfuzz.syntax.alphabet import resolve_alphabet, alphabet_label


def test_presets_and_default():
    assert resolve_alphabet(None) == ALPHABETS[DEFAULT_ALPHABET] == CharSet.range(0x20, 0x7E)
    for name, chars in ALPHABETS.items():
        assert resolve_alphabet(name) == chars


def test_classes_in_pattern_syntax():
    assert resolve_alphabet("[ab]") == CharSet.from_chars("ab")
    assert resolve_alphabet(r"[ -~\t\n]") == CharSet.range(0x20, 0x7E) | CharSet.from_chars("\t\n")
    assert resolve_alphabet(r"[\d]") == category("d")
    assert resolve_alphabet("[^a]") == ALPHABETS["unicode"] - CharSet.single("a")  # surrogates left out


def test_charset_passes_through_limited_to_unicode():
    assert resolve_alphabet(CharSet.from_chars("xy")) == CharSet.from_chars("xy")


@pytest.mark.parametrize("spec", ["nope", "[ab]c", "[ab]*", "[b-a]", "[ab", "[\ud800]", r"[\q]"])
def test_bad_specifications(spec):
    with pytest.raises(AlphabetError):
        resolve_alphabet(spec)


def test_labels():
    assert alphabet_label(None) == DEFAULT_ALPHABET
    assert alphabet_label("[ab]") == "[ab]"
    assert alphabet_label(CharSet.from_chars("ab")) == "[ab]"


@pytest.mark.parametrize("spec", [["a"], 3, b"printable"])
def test_specifications_of_other_types(spec):
    with pytest.raises(AlphabetError):
        resolve_alphabet(spec)
