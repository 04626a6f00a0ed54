"""Universe specifications: presets by name, classes in pattern syntax, clear errors otherwise."""

from __future__ import annotations

import pytest

from pfuzz.syntax.categories import category
from pfuzz.base.charset import DEFAULT_UNIVERSE, UNIVERSES, CharSet
from pfuzz.errors import UniverseError
from pfuzz.syntax.alphabet import resolve_universe, universe_label


def test_presets_and_default():
    assert resolve_universe(None) == UNIVERSES[DEFAULT_UNIVERSE] == CharSet.range(0x20, 0x7E)
    for name, chars in UNIVERSES.items():
        assert resolve_universe(name) == chars


def test_classes_in_pattern_syntax():
    assert resolve_universe("[ab]") == CharSet.from_chars("ab")
    assert resolve_universe(r"[ -~\t\n]") == CharSet.range(0x20, 0x7E) | CharSet.from_chars("\t\n")
    assert resolve_universe(r"[\d]") == category("d")
    assert resolve_universe("[^a]") == UNIVERSES["unicode"] - CharSet.single("a")  # surrogates left out


def test_charset_passes_through_limited_to_unicode():
    assert resolve_universe(CharSet.from_chars("xy")) == CharSet.from_chars("xy")


@pytest.mark.parametrize("spec", ["nope", "[ab]c", "[ab]*", "[b-a]", "[ab", "[\ud800]", r"[\q]"])
def test_bad_specifications(spec):
    with pytest.raises(UniverseError):
        resolve_universe(spec)


def test_labels():
    assert universe_label(None) == DEFAULT_UNIVERSE
    assert universe_label("[ab]") == "[ab]"
    assert universe_label(CharSet.from_chars("ab")) == "[ab]"


@pytest.mark.parametrize("spec", [["a"], 3, b"printable"])
def test_specifications_of_other_types(spec):
    with pytest.raises(UniverseError):
        resolve_universe(spec)
