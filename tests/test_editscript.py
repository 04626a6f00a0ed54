"""Edit steps and explanations: printing, sequential application, plain data."""

from __future__ import annotations

import pytest

from pfuzz.nearmiss.edits import Edit, Explanation, apply_edits


def test_edits_print_readably():
    assert str(Edit("delete", 5, "7", "")) == "delete '7' at 5"
    assert str(Edit("replace", 2, "0", "O")) == "replace '0' with 'O' at 2"
    assert str(Edit("insert", 3, "", "x")) == "insert 'x' at 3"
    assert str(Edit("swap", 4, "21", "12")) == "swap '2' and '1' at 4"


def test_edits_apply_one_after_another():
    edits = [Edit("delete", 0, "A", ""), Edit("insert", 2, "", "\\"),
             Edit("replace", 3, "0", "n"), Edit("insert", 6, "", "x")]
    assert apply_edits("AB1034", edits) == "B1\\n34x"
    with pytest.raises(ValueError):
        Edit("replace", 0, "Q", "A").apply("AB")


def test_explanations_print_the_verdict_and_the_script():
    why = Explanation("AB12O4", False, "AB1204", 1, (Edit("replace", 4, "0", "O"),))
    assert str(why).splitlines() == ["rejected: 'AB12O4'",
                                     "nearest valid string: 'AB1204' (distance 1)",
                                     "edits that turn it into the text:",
                                     "  replace '0' with 'O' at 4"]
    assert str(Explanation("AB1234", True, "AB1234", 0, ())) == "accepted: 'AB1234'"
    assert why.as_dict()["edits"] == [{"kind": "replace", "position": 4, "old": "0", "new": "O"}]
