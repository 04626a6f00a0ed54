"""Every command that takes a PATTERN also takes PROFILE:FIELD (pfuzz.profile.reference).

References: Python's ``re`` applies the field's pattern, require and forbid keys by hand
(profiles/demo.toml: member_id forbids LV0000000; card_name forbids two separators in a
row and is at most 20 characters).
"""

from __future__ import annotations

import re

from click.testing import CliRunner

from pfuzz.cli import main

DEMO = "profiles/demo.toml"


def run(*args):
    return CliRunner().invoke(main, list(args))


def test_sample_draws_from_the_field_with_its_keys_applied():
    result = run("sample", f"{DEMO}:card_name", "-n", "200", "--seed", "4")
    assert result.exit_code == 0, result.output
    names = result.stdout.splitlines()
    assert len(names) == 200
    for name in names:   # reference: re with the field's pattern, forbid and max_length
        assert re.fullmatch(r"[A-Za-z][A-Za-z '-]*[A-Za-z]", name) and len(name) <= 20
        assert not re.fullmatch(r".*[ '-][ '-].*", name)


def test_a_shipped_profile_name_works_and_the_count_matches_re():
    result = run("count", "demo:member_id", "--format", "json")
    assert result.exit_code == 0, result.output
    assert '"total": 9999999' in result.stdout    # 10^7 numbers after LV, less LV0000000


def test_explain_diff_and_draw_take_a_field():
    assert run("explain", "demo:member_id", "LV0000000").exit_code == 1
    assert run("explain", "demo:member_id", "LV0000001").exit_code == 0
    result = run("diff", "demo:member_id", "LV[0-9]{7}")
    assert result.exit_code == 1 and '"LV0000000"' in result.stdout
    assert run("draw", "demo:home_branch").stdout.startswith("digraph")


def test_a_profile_file_given_as_a_pattern_is_a_clear_error():
    result = run("sample", DEMO, "-n", "2")
    assert result.exit_code == 2
    assert f"name a field as {DEMO}:FIELD" in result.output and "postcode" in result.output
    assert result.stdout == ""
    result = run("info", f"{DEMO}:nope")
    assert result.exit_code == 2 and "no field named 'nope'" in result.output


def test_a_pattern_with_a_colon_stays_a_pattern():
    result = run("sample", "[a-c]:[0-2]", "-n", "3")
    assert result.exit_code == 0
    assert all(re.fullmatch(r"[a-c]:[0-2]", s) for s in result.stdout.splitlines())
