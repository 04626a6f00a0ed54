"""Profiles that are not profiles: every one is a ``ProfileError`` (exit 2 on the command
line), never a traceback. Huge integers, deep nesting, byte-order marks, long echoes."""

from __future__ import annotations

import codecs

import pytest
from click.testing import CliRunner

from pfuzz.cli import main
from pfuzz.errors import ProfileError
from pfuzz.profile.loader import parse_profile
from pfuzz.base.numbers import number_text
from pfuzz.profile.tomlcheck import MAX_NESTING

HEAD = b'[profile]\ntitle = "Hostile"\n'
FIELD = b'[[field]]\nname = "code"\npattern = "[A-C][0-9]{2}"\n'
GOOD = HEAD + FIELD

# Python's limit on decimal int <-> str conversion (sys.int_info.default_max_str_digits).
DIGIT_LIMIT = 4300

HOSTILE = {
    "a decimal integer past the digit limit": GOOD + b"valid = 1" + b"0" * DIGIT_LIMIT + b"\n",
    "a negative one": GOOD + b"valid = -1" + b"0" * DIGIT_LIMIT + b"\n",
    "a hexadecimal integer of 5,000 digits in a count":
        GOOD + b"valid = 0x" + b"f" * 5000 + b"\n",
    "in the seed": b'[profile]\ntitle = "t"\nseed = 0x' + b"f" * 5000 + b"\n" + FIELD,
    "where a string belongs": b"[profile]\ntitle = 0x" + b"f" * 5000 + b"\n" + FIELD,
    "in a list of strings": GOOD + b"require = [0x" + b"f" * 5000 + b"]\n",
    "in the distance": GOOD + b"distance = 0o" + b"7" * 6000 + b"\n",
    "1,000 nested arrays": HEAD.replace(b'"Hostile"', b"[" * 1000 + b"]" * 1000) + FIELD,
    "400 nested inline tables": GOOD + b"about = " + b"{a = " * 400 + b"1" + b"}" * 400 + b"\n",
    "arrays one level past the limit": GOOD + b"require = " + b"[" * (MAX_NESTING - 2)
        + b"]" * (MAX_NESTING - 2) + b"\n",
    "UTF-16 text": codecs.BOM_UTF16_LE + GOOD.decode().encode("utf-16-le"),
    "UTF-32 text": codecs.BOM_UTF32_BE + GOOD.decode().encode("utf-32-be"),
    "a byte-order mark in the middle": HEAD + b"\xef\xbb\xbf" + FIELD,
    "a 20 KB pattern nesting too deeply":
        HEAD + b"[[field]]\nname = \"code\"\npattern = '" + b"(" * 10_000 + b"a"
        + b")" * 10_000 + b"'\n",
}


@pytest.mark.parametrize("what", list(HOSTILE))
def test_hostile_profile_is_a_profile_error(what):
    with pytest.raises(ProfileError) as caught:
        parse_profile(HOSTILE[what], "hostile.toml")
    message = str(caught.value)
    assert message.startswith("hostile.toml: ") and len(message) < 400, message
    assert "\n" not in message
    assert len(caught.value.detail) < 400


@pytest.mark.parametrize("what", list(HOSTILE))
def test_hostile_profile_exits_2_with_one_line(tmp_path, what):
    path = tmp_path / "hostile.toml"
    path.write_bytes(HOSTILE[what])
    result = CliRunner().invoke(main, ["corpus", str(path), "--out", str(tmp_path / "out")])
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    assert result.stderr.startswith("pfuzz: error: ") and len(result.stderr) < 1000


def test_the_messages_say_what_is_wrong():
    def message(what):
        with pytest.raises(ProfileError) as caught:
            parse_profile(HOSTILE[what], "h.toml")
        return str(caught.value)

    assert "more than 4,300 digits" in message("a decimal integer past the digit limit")
    assert "not a number of about 6,021 digits" in message(
        "a hexadecimal integer of 5,000 digits in a count")
    assert "must be a string, not an integer (a number of about" in message(
        "where a string belongs")
    assert f"nest more than {MAX_NESTING} levels deep" in message("1,000 nested arrays")
    assert f"nest more than {MAX_NESTING} levels deep" in message("400 nested inline tables")
    assert "is UTF-16 text" in message("UTF-16 text")
    assert "is UTF-32 text" in message("UTF-32 text")


def test_a_utf8_byte_order_mark_is_accepted_as_a_signature():
    plain = parse_profile(GOOD, "p.toml")
    marked = parse_profile(codecs.BOM_UTF8 + GOOD, "p.toml")
    assert marked.fields == plain.fields and marked.title == plain.title == "Hostile"
    assert marked.sha256 != plain.sha256            # the digest is of the file's own bytes


def test_nesting_up_to_the_limit_is_read_and_judged_by_the_schema():
    # The document, [[field]] and the field's table are three levels; require's lists the rest.
    levels = MAX_NESTING - 3
    deep = GOOD + b"require = " + b"[" * levels + b"]" * levels + b"\n"
    with pytest.raises(ProfileError, match="item 1 must be a string, not a list"):
        parse_profile(deep, "p.toml")


def test_number_text_describes_what_it_cannot_print():
    assert number_text(10**6) == "1,000,000"
    # 16**5000 - 1 has 6,021 decimal digits (5000 * log10(16) = 6020.6).
    assert number_text(16**5000 - 1) == "a number of about 6,021 digits"
    assert number_text(-(16**5000)) == "-a number of about 6,021 digits"
