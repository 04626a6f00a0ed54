"""Audits of deliberately faulty validators (pfuzz.audit.run, pfuzz.audit.hostile).

The fixtures in tests/fixtures/validators each carry one classic bug; the
audit must find it and must report nothing for the correct validators. The
expected verdict of every case is checked against Python's ``re.fullmatch``
on the specification pattern (the reference matcher).
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

import pfuzz
from pfuzz.audit.run import CATEGORY_ORDER, Settings, audit_alphabet, build_cases, run_audit, stages
from pfuzz.errors import EmptyLanguageError
from pfuzz.audit.hostile import HOSTILE_CHARACTERS, HOSTILE_KINDS, case_flips, hostile_variants
from pfuzz.audit.targets import PythonTarget, RegexTarget
from pfuzz.nearmiss.edits import apply_edits

FIXTURES = str(Path(__file__).parent / "fixtures" / "validators")
TICKET = r"[A-Z]{2}-[0-9]{4}"
SMALL = Settings(valid=150, rejects=200)


def audit(pattern: str, function: str, alphabet: str = "printable", settings: Settings = SMALL):
    spec = pfuzz.compile(pattern, alphabet)
    return run_audit(spec, PythonTarget(function, directory=FIXTURES), settings)


def wrong_accepts(report) -> list:
    return [f.case for f in report.findings if f.wrong_accept]


@pytest.mark.parametrize("function", ["tickets:correct", "tickets:correct_by_hand"])
def test_correct_validators_have_no_findings(function):
    report = audit(TICKET, function)
    assert report.agrees and report.findings == []
    assert report.summary()[-1]["cases"] == len(report.cases) > 400


def test_off_by_one_range():
    report = audit(r"(0[1-9]|1[0-2])/[0-9]{2}", "cards:off_by_one_month")
    texts = {case.text[:2] for case in wrong_accepts(report)}
    assert texts == {"13"}
    first = report.findings[0].case
    assert first.category == "range-edge" and first.text.startswith("13/")


def test_missing_anchor():
    report = audit(TICKET, "tickets:missing_anchor")
    found = wrong_accepts(report)
    assert found and all(re.fullmatch(TICKET, c.text[:7]) for c in found)  # reference: re
    assert report.findings[0].case.text == "AA-00000"  # shortest first: the length edge
    assert {"length-edge", "hostile", "near-miss"} <= {c.category for c in found}


def test_length_bound_off_by_one():
    report = audit("[a-z0-9_]{3,16}", "accounts:user_name_too_long")
    found = wrong_accepts(report)
    assert found and all(len(c.text) == 17 for c in found)
    assert found[0].category == "length-edge"


def test_case_sensitivity_slip():
    report = audit("[0-9a-f]{6}", "accounts:colour_ignores_case")
    found = wrong_accepts(report)
    assert any(c.category == "case-flip" for c in found)
    assert all(re.fullmatch("[0-9a-f]{6}", c.text.lower()) for c in found)  # reference: re


@pytest.mark.parametrize("alphabet", ["printable", "unicode"])
def test_unicode_digits_through_backslash_d(alphabet):
    report = audit(TICKET, "tickets:unicode_digits", alphabet)
    found = wrong_accepts(report)
    assert any(c.category == "hostile" and c.kind == "non-ascii-digit" for c in found)
    assert all(any(not ("0" <= ch <= "9") and ch.isdecimal() for ch in c.text) for c in found)


def test_dollar_lets_a_final_newline_through():
    report = audit(TICKET, "tickets:dollar_newline")
    found = wrong_accepts(report)
    assert found and all(c.text.endswith("\n") and c.witness + "\n" == c.text for c in found)
    # the hostile variants, and the boundary suite's exits after a complete valid string
    assert {c.kind for c in found} == {"trailing-newline", "outside"}


def test_exceptions_are_rejects_reported_with_their_type():
    report = audit("0|[1-9][0-9]{0,3}", "seats:by_int")
    raised = [v.error for v in report.verdicts if v.error]
    assert raised and all(e.startswith("ValueError") for e in raised)
    assert report.summary()[-1]["raised"] == len(raised)
    accepted = {c.text for c in wrong_accepts(report)}
    assert {"00", "0 ", " 0"} & accepted  # int() takes leading zeros and blanks


def test_every_expected_verdict_agrees_with_re():
    spec = pfuzz.compile(TICKET)
    cases, _ = build_cases(spec, SMALL)
    for case in cases:
        inside = all(ch in spec.alphabet for ch in case.text)
        # Reference: Python's re; outside the alphabet a string is invalid by definition.
        assert case.expected == (inside and re.fullmatch(TICKET, case.text) is not None), case
        if case.witness is not None:
            assert re.fullmatch(TICKET, case.witness) and apply_edits(case.witness, case.edits) == case.text
    assert len({c.text for c in cases}) == len(cases)
    assert {c.category for c in cases} <= set(CATEGORY_ORDER)


def test_cases_are_reproducible():
    spec = pfuzz.compile("[a-z]{2,5}[0-9]?")
    first, _ = build_cases(spec, Settings(valid=50, rejects=50, seed=3))
    again, _ = build_cases(spec, Settings(valid=50, rejects=50, seed=3))
    other, _ = build_cases(spec, Settings(valid=50, rejects=50, seed=4))
    assert first == again and first != other


def test_rejects_use_the_wider_alphabet():
    spec = pfuzz.compile("[0-9]{3}")
    cases, _ = build_cases(spec, Settings(valid=0, rejects=400))
    wide = audit_alphabet(spec.alphabet, "latin1")
    outside = [c for c in cases if any(ch not in spec.alphabet for ch in c.text)]
    assert outside and all(all(ch in wide for ch in c.text) for c in outside)
    assert any(c.category == "near-miss" and c.kind for c in cases)


def test_options_turn_categories_off():
    spec = pfuzz.compile(TICKET)
    cases, _ = build_cases(spec, Settings(valid=10, rejects=0, boundary=False, hostile=False,
                                          case_flip=False))
    assert {c.category for c in cases} == {"valid"}


def test_empty_specification_is_an_error():
    with pytest.raises(EmptyLanguageError):
        build_cases(pfuzz.compile(r"[^\s\S]"))


def test_universal_specification_has_no_rejects_to_draw():
    latin1 = pfuzz.ALPHABETS["latin1"]
    cases, notes = build_cases(pfuzz.compile(r"[\s\S]*", "latin1"), Settings(valid=20, rejects=20))
    rejects = [c for c in cases if not c.expected]
    assert rejects and all(any(ch not in latin1 for ch in c.text) for c in rejects)


def test_hostile_variants_and_case_flips():
    variants = hostile_variants(["AB 12"])
    assert {v.kind for v in variants} == set(HOSTILE_KINDS)
    for v in variants:
        assert apply_edits(v.witness, v.edits) == v.text != v.witness
        assert all(ch in HOSTILE_CHARACTERS or ch in "AB 12" for ch in v.text)
    digits = [v.text for v in variants if v.kind == "non-ascii-digit"]
    assert all(re.fullmatch(r"AB \d\d", t) for t in digits)  # reference: re's \d takes them
    flips = case_flips(["aB1"])
    assert [f.text for f in flips] == ["AB1", "ab1", "Ab1"]
    assert all(apply_edits(f.witness, f.edits) == f.text for f in flips)


def test_regex_target_is_compared_exactly():
    spec = pfuzz.compile(TICKET)
    report = run_audit(spec, RegexTarget(TICKET + "$", "match"), Settings(valid=20, rejects=20))
    exact = report.exact
    assert not exact.equal and exact.only_a.empty
    assert exact.only_b.pattern == r"[A-Z]{2}-[0-9]{4}\n"
    assert exact.distinguishing == "AA-0000\n"
    assert not report.agrees
    same = run_audit(spec, RegexTarget(TICKET), Settings(valid=20, rejects=20))
    assert same.exact.equal and same.agrees


def test_unsupported_regex_still_runs_the_cases():
    spec = pfuzz.compile("[a-z]{2}")
    report = run_audit(spec, RegexTarget(r"(\w)\1"), Settings(valid=20, rejects=20))
    assert report.exact is None and "cannot compile" in report.exact_note
    assert any(f.wrong_accept for f in report.findings)  # e.g. "00": \w also takes digits


def test_progress_reports_every_stage_in_order():
    seen: list[str] = []
    settings = Settings(valid=10, rejects=10)
    run_audit(pfuzz.compile("[a-z]{2}"), RegexTarget("[a-z]{2}"), settings, progress=seen.append)
    assert seen == stages(settings, exact=True)


def test_length_bounds_apply_to_sampled_cases():
    cases, _ = build_cases(pfuzz.compile("[a-z]+[0-9]*"), Settings(valid=60, rejects=60, min_length=3,
                                                                    max_length=5))
    sampled = [c for c in cases if c.category in ("valid", "near-miss")]
    assert sampled and all(3 <= len(c.text) <= 5 for c in sampled)


def test_each_kind_shows_its_shortest_failure_first():
    report = run_audit(pfuzz.compile(TICKET), RegexTarget(TICKET.replace("[0-9]", r"\d") + "$", "match"),
                       Settings(valid=50, rejects=50))
    hostile = [f.case for f in report.findings if f.case.group == "hostile"]
    kinds = {c.kind for c in hostile}
    assert kinds == {"non-ascii-digit", "trailing-newline"}
    assert {c.kind for c in hostile[:2]} == kinds
    newline = [c.text for c in hostile if c.kind == "trailing-newline"]
    assert hostile[1].text == newline[0] == min(newline, key=lambda t: (len(t), t))
    # 'AA-0000\n' itself is found first by the boundary suite (an exit after a valid string)
    assert any(f.case.text == "AA-0000\n" and f.case.category == "exit" for f in report.findings)
