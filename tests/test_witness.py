"""Nearest valid strings and edit scripts: hand-derived cases, direction, limits."""

from __future__ import annotations

import random

import pytest

import pfuzz
from pfuzz.errors import EmptyLanguageError
from pfuzz.nearmiss.edits import Edit, Explanation, apply_edits
from pfuzz.nearmiss.witness import corrector, explain, nearest

PLATE = r"[A-Z]{2}[0-9]{4}"


@pytest.fixture(scope="module")
def plate():
    return pfuzz.compile(PLATE).dfa


def test_accepted_text_is_its_own_witness(plate):
    why = explain(plate, "AB1234")
    assert why == Explanation("AB1234", True, "AB1234", 0, ())
    assert str(why) == "accepted: 'AB1234'"


def test_a_substitution(plate):
    why = explain(plate, "AB12O4")
    assert (why.witness, why.distance, why.edits) == ("AB1204", 1, (Edit("replace", 4, "0", "O"),))
    assert str(why).splitlines() == ["rejected: 'AB12O4'",
                                     "nearest valid string: 'AB1204' (distance 1)",
                                     "edits that turn it into the text:",
                                     "  replace '0' with 'O' at 4"]


def test_a_missing_digit_is_a_deletion_from_the_witness(plate):
    # Any digit inserted among the digits repairs "AB123"; the least result is "AB0123".
    why = explain(plate, "AB123")
    assert why.witness == "AB0123" and why.edits == (Edit("delete", 2, "0", ""),)


def test_an_extra_character_is_an_insertion(plate):
    assert explain(plate, "AB1234X").edits == (Edit("insert", 6, "", "X"),)


def test_a_transposition(plate):
    why = explain(plate, "A1B234")
    assert why.witness == "AB1234" and why.edits == (Edit("swap", 1, "B1", "1B"),)


def test_shorter_witness_wins_over_alphabetical_order():
    # L = {aab, b}; "ab" is one edit from both; shortlex puts "b" first.
    dfa = pfuzz.compile("aab|b", alphabet="[ab]").dfa
    why = explain(dfa, "ab")
    assert why.witness == "b" and why.edits == (Edit("insert", 0, "", "a"),)


def test_alphabetical_order_breaks_ties_within_a_length():
    dfa = pfuzz.compile("ab|ba", alphabet="[ab]").dfa
    why = explain(dfa, "bb")
    assert why.witness == "ab" and why.edits == (Edit("replace", 0, "a", "b"),)


def test_characters_outside_the_alphabet(plate):
    why = explain(plate, "AB12\u00e934")
    assert why.witness == "AB1234" and why.edits == (Edit("insert", 4, "", "\u00e9"),)


def test_far_texts_deepen_the_bound(plate):
    # 30 x's against six characters: 24 deletions, and each of the six kept
    # characters must be substituted ('x' is neither A-Z nor a digit).
    why = explain(plate, "x" * 30)
    assert why.distance == 30 and why.witness == "AA0000"
    assert apply_edits(why.witness, why.edits) == "x" * 30


def test_the_empty_string():
    dfa = pfuzz.compile("abc", alphabet="[abc]").dfa
    why = explain(dfa, "")
    assert why.distance == 3 and [e.kind for e in why.edits] == ["delete"] * 3


def test_a_first_guess_at_the_bound_changes_nothing(plate):
    rng = random.Random(4)
    for _ in range(200):
        text = "".join(rng.choice("AB01x-") for _ in range(rng.randint(0, 9)))
        assert nearest(plate, text, 5) == explain(plate, text)


def test_empty_language_is_reported():
    dfa = pfuzz.compile("[^\\s\\S]").dfa
    with pytest.raises(EmptyLanguageError, match="empty"):
        explain(dfa, "abc")


def test_tables_are_cached_per_automaton(plate):
    assert corrector(plate) is corrector(plate)
    assert corrector(pfuzz.compile(PLATE).dfa) is not corrector(plate)


def test_as_dict_is_plain_data(plate):
    assert explain(plate, "AB12O4").as_dict() == {
        "text": "AB12O4", "accepted": False, "witness": "AB1204", "distance": 1,
        "edits": [{"kind": "replace", "position": 4, "old": "0", "new": "O"}]}


def test_one_edit_answers_equal_the_full_program(monkeypatch):
    # The quick path (candidates written out only at the witness length) against the
    # correction program alone, which sees every alignment: same witness, same script.
    from pfuzz.nearmiss import witness as module

    dfa = pfuzz.compile(r"[a-c]{1,4}@[a-c]{1,3}\.(ab|cab)").dfa
    tables = corrector(dfa)
    rng = random.Random(11)
    seen = 0
    for _ in range(400):  # a valid string, then one random edit of it
        text = "".join(rng.choice("abc") for _ in range(rng.randint(1, 4))) + "@" + \
            "".join(rng.choice("abc") for _ in range(rng.randint(1, 3))) + rng.choice([".ab", ".cab"])
        i = rng.randrange(len(text) + 1)
        edited = rng.choice([text[:i] + rng.choice("abc@.x") + text[i:], text[:i] + text[i + 1:],
                             text[:i] + rng.choice("abc@.x") + text[i + 1:]])
        quick = tables.one_edit(edited)
        if quick is None:
            continue
        seen += 1
        monkeypatch.setattr(module._Corrector, "_one_edit", lambda self, text, cls: None)
        full = tables.nearest(edited)
        monkeypatch.undo()
        assert (quick[0].witness, quick[0].edits, quick[0].distance) == \
            (full.witness, full.edits, full.distance)
        assert apply_edits(full.witness, full.edits) == edited
    assert seen > 200


def test_a_small_memo_changes_nothing(plate, monkeypatch):
    from pfuzz.nearmiss import witness as module

    texts = ["AB12O4", "AB1234X", "A1234", "BA1234", "AB 1234", "ab1234"]
    expected = [explain(plate, t) for t in texts]
    module.clear_caches()
    monkeypatch.setattr(module, "MEMO_BITS", 64)  # forgets after almost every entry
    assert [explain(plate, t) for t in texts] == expected
