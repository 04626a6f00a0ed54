"""Profile loading: every kind of validation error names the file, the table and the key."""

from __future__ import annotations

import hashlib
import textwrap
from pathlib import Path

import pytest

from pfuzz.errors import PfuzzError, ProfileError
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.profile.loader import DEFAULT_INVALID, DEFAULT_VALID, load_profile, parse_profile

DEMO = Path(__file__).resolve().parent.parent / "profiles" / "demo.toml"

BASE = """
[profile]
title = "Test"

[[field]]
name = "code"
pattern = '[A-Z]{2}[0-9]{2}'
"""


def write(tmp_path: Path, text: str, name: str = "p.toml") -> Path:
    path = tmp_path / name
    path.write_text(textwrap.dedent(text), encoding="utf-8")
    return path


def error_of(tmp_path: Path, text: str) -> ProfileError:
    path = write(tmp_path, text)
    with pytest.raises(ProfileError) as caught:
        load_profile(path)
    assert str(path) in str(caught.value)
    return caught.value


def test_minimal_profile_takes_documented_defaults(tmp_path):
    profile = load_profile(write(tmp_path, BASE))
    field = profile.field("code")
    assert (field.valid, field.invalid, field.distance) == (DEFAULT_VALID, DEFAULT_INVALID, 1)
    assert field.edits == EDIT_KINDS and field.alphabet == "printable"
    assert profile.record is None and profile.seed is None


def test_sha256_is_the_digest_of_the_file_bytes(tmp_path):
    path = write(tmp_path, BASE)
    assert load_profile(path).sha256 == hashlib.sha256(path.read_bytes()).hexdigest()


def test_demo_profile_loads_with_its_record():
    profile = load_profile(DEMO)
    assert len(profile.fields) >= 5
    assert profile.record is not None and len(profile.record.context) >= 3
    assert set(profile.record.fields) <= {f.name for f in profile.fields}


# -- unknown keys ----------------------------------------------------------------

@pytest.mark.parametrize("text, where, key, hint", [
    (BASE + "patern = 'x'\n", "field 'code'", "patern", "pattern"),
    (BASE.replace('title = "Test"', 'title = "Test"\nseeds = 3'), "[profile]", "seeds", "seed"),
    (BASE + "\n[fields]\nx = 1\n", "", "fields", "field"),
    (BASE + "\n[record]\nname = 'r'\nvalid_row = 3\n", "[record]", "valid_row", "valid_rows"),
    (BASE + "\n[record]\nname = 'r'\n[[record.context]]\ncolumn = 'who'\nprovider = 'name'\n"
            "local = 'en_GB'\n", "record context 'who'", "local", "locale"),
])
def test_unknown_key_is_named_with_the_nearest_known_key(tmp_path, text, where, key, hint):
    error = error_of(tmp_path, text)
    assert f"key '{key}'" in str(error) and f"did you mean '{hint}'?" in str(error)
    assert where in str(error) and error.key == key


# -- wrong types and bad values --------------------------------------------------

@pytest.mark.parametrize("line, key, words", [
    ("valid = '10'", "valid", "must be an integer, not a string"),
    ("valid = true", "valid", "must be an integer, not a boolean"),
    ("invalid = 1.5", "invalid", "must be an integer, not a number"),
    ("require = 'x'", "require", "must be a list"),
    ("forbid = ['a', 3]", "forbid", "item 2 must be a string"),
    ("alphabet = 3", "alphabet", "must be a string"),
    ("distance = 0", "distance", "must be between 1 and 3"),
    ("min_length = -1", "min_length", "must be between 0"),
    ("flags = ['IGNORCASE']", "flags", "did you mean 'IGNORECASE'?"),
    ("edits = ['remove']", "edits", "is not one of delete, insert, replace, swap"),
    ("edits = []", "edits", "needs at least one edit kind"),
    ("edits = ['swap', 'swap']", "edits", "lists a value twice"),
    ("min_length = 5\nmax_length = 4", "min_length", "more than max_length"),
    ("alphabet = 'klingon'", "alphabet", "unknown alphabet"),
])
def test_wrong_type_or_value_names_field_and_key(tmp_path, line, key, words):
    error = error_of(tmp_path, BASE + line + "\n")
    assert "field 'code'" in str(error) and f"key '{key}'" in str(error)
    assert words in str(error)


def test_seed_must_be_a_non_negative_integer(tmp_path):
    error = error_of(tmp_path, BASE.replace('title = "Test"', 'title = "Test"\nseed = -4'))
    assert "[profile]" in str(error) and "key 'seed'" in str(error)


@pytest.mark.parametrize("text, words", [
    (BASE.replace('title = "Test"\n', ""), "key 'title': is required"),
    (BASE.replace("pattern = '[A-Z]{2}[0-9]{2}'\n", ""), "field 'code': key 'pattern': is required"),
    (BASE.replace('name = "code"\n', ""), "field #1: key 'name': is required"),
    (BASE.replace('name = "code"', 'name = "Code"'), "must be lower-case letters"),
    ('[profile]\ntitle = "x"\n', "at least one [[field]]"),
    ("[profile\ntitle = 'x'", "not valid TOML"),
    (BASE + "\n[[field]]\nname = 'code'\npattern = 'a'\n", "field #2: key 'name'"),
])
def test_missing_or_malformed_parts(tmp_path, text, words):
    assert words in str(error_of(tmp_path, text))


def test_missing_file_is_a_profile_error(tmp_path):
    with pytest.raises(ProfileError, match="cannot read the profile"):
        load_profile(tmp_path / "absent.toml")


def test_non_utf8_file_is_a_profile_error(tmp_path):
    path = tmp_path / "latin.toml"
    path.write_bytes(BASE.encode("utf-8") + b"about = '\xe9'\n")
    with pytest.raises(ProfileError, match="not UTF-8"):
        load_profile(path)


# -- patterns --------------------------------------------------------------------

@pytest.mark.parametrize("line, key", [
    ("pattern = '[A-Z'", "pattern"),
    ("pattern = '(a+)\\1'", "pattern"),           # a backreference to a group of unbounded width
    ("require = ['.*', 'a{2,1}']", "require[2]"),
    ("forbid = ['(a*)b\\1']", "forbid[1]"),         # the same, refused by pfuzz
])
def test_bad_pattern_names_the_pattern_the_field_and_the_key(tmp_path, line, key):
    text = BASE.replace("pattern = '[A-Z]{2}[0-9]{2}'\n", "") if key == "pattern" else BASE
    error = error_of(tmp_path, text + line + "\n")
    assert "field 'code'" in str(error) and f"key '{key}'" in str(error)
    assert "bad pattern" in str(error) and error.detail


def test_bad_pattern_detail_puts_a_caret_under_the_column(tmp_path):
    text = BASE.replace("'[A-Z]{2}[0-9]{2}'", "'ab)cd'")
    error = error_of(tmp_path, text)
    lines = error.detail.splitlines()
    assert lines[0].strip() == "ab)cd"
    assert lines[1].index("^") == lines[0].index(")")


# -- records ---------------------------------------------------------------------

RECORD = BASE + """
[record]
name = "row"
columns = ["code", "who"]

[[record.context]]
column = "who"
provider = "name"
"""


def test_record_defaults_and_columns(tmp_path):
    record = load_profile(write(tmp_path, RECORD)).record
    assert record.columns == ("code", "who") and record.fields == ("code",)
    assert record.context[0].locale == "en_US"
    assert (record.valid_rows, record.invalid_rows) == (50, 50)


@pytest.mark.parametrize("old, new, words", [
    ('columns = ["code", "who"]', 'columns = ["cod", "who"]',
     "'cod' is neither a [[field]] nor a context column (did you mean 'code'?)"),
    ('columns = ["code", "who"]', 'columns = ["code"]', "context column 'who' is missing"),
    ('columns = ["code", "who"]', 'columns = ["who"]', "must name at least one [[field]]"),
    ('columns = ["code", "who"]', 'columns = ["code", "who", "code"]', "lists a column twice"),
    ('provider = "name"', 'provider = "bothify"', "'bothify' is not an allowed context provider"),
    ('provider = "name"', 'provider = "nmae"', "did you mean 'name'?"),
    ('provider = "name"', 'provider = "name"\nlocale = "xx_YY"', "'xx_YY' is not a faker locale"),
    ('column = "who"', 'column = "code"', "'code' is also a [[field]] name"),
    ('column = "who"', 'column = "reason"', "is reserved"),
    ('name = "row"', 'name = "code"', "the record's name 'code' is also a [[field]] name"),
])
def test_record_errors(tmp_path, old, new, words):
    text = RECORD.replace(old, new)
    if new == 'column = "reason"':
        text = text.replace('"who"]', '"reason"]')
    assert words in str(error_of(tmp_path, text))


@pytest.mark.parametrize("helper", ["bothify", "lexify", "numerify", "hexify", "regexify"])
def test_faker_pattern_filling_helpers_are_never_allowed(tmp_path, helper):
    error = error_of(tmp_path, RECORD.replace('provider = "name"', f'provider = "{helper}"'))
    assert "key 'provider'" in str(error)


def test_profile_error_is_a_pfuzz_error():
    with pytest.raises(PfuzzError):
        parse_profile(b"[profile]\n", "inline.toml")


def test_nothing_in_a_profile_is_executed(tmp_path):
    # A provider naming a Python expression is a name that is not allow-listed, nothing more.
    text = RECORD.replace('provider = "name"', 'provider = "__import__(\'os\').getcwd"')
    assert "is not an allowed context provider" in str(error_of(tmp_path, text))


# -- shipped profiles: a PROFILE argument is a path or a shipped name -------------------------

PROFILES = Path(__file__).resolve().parent.parent / "profiles"


def test_every_file_of_the_profiles_folder_is_shipped_under_its_name():
    from pfuzz.profile import shipped

    # reference: the repository's top-level profiles/ folder, listed here
    assert shipped.names() == sorted(p.stem for p in PROFILES.glob("*.toml"))
    for path in PROFILES.glob("*.toml"):
        loaded = load_profile(path.stem)
        assert loaded.sha256 == hashlib.sha256(path.read_bytes()).hexdigest()


def test_an_existing_file_wins_over_a_shipped_name(tmp_path, monkeypatch):
    write(tmp_path, BASE, name="ipv4")
    monkeypatch.chdir(tmp_path)
    assert load_profile("ipv4").title == "Test"
    assert load_profile(Path("ipv4")).fields[0].name == "code"


@pytest.mark.parametrize("spec", ["ipv5", "ipv4.toml", "somewhere/ipv4", ""])
def test_only_bare_shipped_names_are_looked_up(tmp_path, monkeypatch, spec):
    # a missing path stays a missing path; an unknown bare name lists the shipped ones
    monkeypatch.chdir(tmp_path)
    with pytest.raises(ProfileError) as caught:
        load_profile(spec)
    message = str(caught.value)
    if spec == "ipv5":
        assert "no shipped profile has this name" in message and "ipv4, iso-date" in message
    else:
        assert "shipped" not in message
