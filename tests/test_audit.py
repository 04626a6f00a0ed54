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
from pfuzz.audit.learned import LearningSettings
from pfuzz.audit.run import CATEGORY_ORDER, Settings, audit_alphabet, build_cases, run_audit, stages
from pfuzz.errors import EmptyLanguageError
from pfuzz.audit.hostile import HOSTILE_CHARACTERS, HOSTILE_KINDS, case_flips, hostile_variants
from pfuzz.audit.targets import PythonTarget, RegexTarget
from pfuzz.nearmiss.edits import apply_edits

FIXTURES = str(Path(__file__).parent / "fixtures" / "validators")
TICKET = r"[A-Z]{2}-[0-9]{4}"
NO_MODEL = LearningSettings(enabled=False)
#: The cases alone (the learned model has tests of its own below).
SMALL = Settings(valid=150, rejects=200, learning=NO_MODEL)


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
    # A backreference to a group of unbounded length is not regular.
    report = run_audit(spec, RegexTarget(r"(\w+)\1"), Settings(valid=20, rejects=20))
    assert report.exact is None and "cannot compile" in report.exact_note
    assert any(f.wrong_accept for f in report.findings)  # e.g. "00": \w also takes digits
    assert report.evidence.basis == "cases"


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


# -- exceptions, evidence, groups and the learned model ---------------------------------------

def test_an_exception_that_is_not_a_reject_is_a_finding_even_on_invalid_input():
    # No case is shorter than 6 characters; the learned model's queries reach the short ones.
    report = audit(TICKET, "planted:ticket_index_error", settings=Settings(valid=150, rejects=200))
    assert not report.agrees and report.findings == []
    (group,) = report.raised.groups()
    assert (group.type, group.unexpected, group.message) == ("IndexError", True,
                                                             "string index out of range")
    # The planted bug reads text[2] first: exactly the strings shorter than 3 raise (hand-written
    # rule), and re rejects every one of them.
    assert group.count == group.spec_rejects > 0
    assert group.shortest[0] == "" and all(len(t) < 3 for t in group.shortest)
    assert list(group.shortest) == sorted(group.shortest, key=lambda t: (len(t), t))
    assert not any(re.fullmatch(TICKET, t) for t in group.shortest)
    assert "raised an exception that is not a reject on" in report.evidence.sentence
    assert report.learned.model.equals_specification  # the bug is an exception, not a verdict


def test_value_errors_and_named_exceptions_are_rejects():
    report = audit(TICKET, "hostile:by_value_error")
    assert report.agrees and [g.type for g in report.raised.groups()] == ["ValueError"]
    assert not report.raised.groups()[0].unexpected
    spec = pfuzz.compile(TICKET)
    plain = run_audit(spec, PythonTarget("hostile:by_framework_error", directory=FIXTURES), SMALL)
    assert not plain.agrees and plain.raised.groups()[0].type == "hostile.TicketRejected"
    named = run_audit(spec, PythonTarget("hostile:by_framework_error", directory=FIXTURES,
                                         reject_on=["hostile.TicketRejected"]), SMALL)
    assert named.agrees and not named.raised.unexpected


def test_evidence_of_cases_alone_counts_them_and_is_not_a_proof():
    report = audit(TICKET, "tickets:correct")
    deterministic, sampled = report.case_counts()
    assert deterministic + sampled == len(report.cases) and sampled >= 150 + 200 - 10
    assert report.evidence.basis == "cases"
    assert report.evidence.sentence == (f"agreement on {deterministic:,} deterministic and "
                                        f"{sampled:,} sampled cases (not a proof: strings not tried "
                                        "may still be judged differently)")
    wrong = audit(TICKET, "tickets:missing_anchor").evidence
    assert wrong.basis == "cases" and "disagreements found among" in wrong.sentence


def test_deterministic_cases_do_not_depend_on_the_seed():
    spec = pfuzz.compile("[a-z]{2,5}[0-9]?")
    first, _ = build_cases(spec, Settings(valid=40, rejects=40, seed=0))
    other, _ = build_cases(spec, Settings(valid=40, rejects=40, seed=9))
    fixed = lambda cases: [c.text for c in cases if not c.sampled]  # noqa: E731
    assert fixed(first) == fixed(other) and fixed(first)
    assert {c.text for c in first if c.sampled} != {c.text for c in other if c.sampled}


def test_exact_evidence_for_a_regex_target():
    spec = pfuzz.compile(TICKET)
    different = run_audit(spec, RegexTarget(TICKET + "$", "match"), Settings(valid=20, rejects=20))
    assert different.evidence.basis == "exact" and different.learned is None
    assert "wrongly accepts 6,760,000 strings and wrongly rejects no strings" in different.evidence.sentence
    (group,) = different.groups()  # every wrong accept lies in the one exact difference
    assert group.difference_source == "exact comparison" and group.difference.pattern == TICKET + r"\n"
    same = run_audit(spec, RegexTarget(TICKET), Settings(valid=20, rejects=20))
    assert same.evidence.basis == "exact" and "equals the specification" in same.evidence.sentence


def test_a_correct_validator_ends_with_a_learned_model_equal_to_the_specification():
    report = audit(TICKET, "tickets:correct", settings=Settings(valid=150, rejects=200))
    model = report.learned.model
    assert report.agrees and model.equals_specification and model.conformance_depth == 1
    assert report.evidence.basis == "learned"
    assert "equals the specification, tested to 1 extra state" in report.evidence.sentence
    assert model.guarantee() in report.evidence.sentence


def test_learned_differences_are_confirmed_findings():
    report = audit(TICKET, "tickets:dollar_newline", settings=Settings(valid=150, rejects=200))
    learned = [f for f in report.findings if f.case.category == "learned"]
    assert learned and not report.agrees and report.evidence.basis == "learned"
    for f in learned:
        # reference: the validator's own call, and re.fullmatch for the specification
        assert re.match(r"^[A-Z]{2}-[0-9]{4}$", f.case.text) and not re.fullmatch(TICKET, f.case.text)
        assert f.case.witness + "\n" == f.case.text
    side = report.learned.wrongly_accepted
    assert side.examples and all(re.match(r"^[A-Z]{2}-[0-9]{4}$", t) and not re.fullmatch(TICKET, t)
                                 for t in side.examples)


def test_a_model_the_validator_would_contradict_is_refined_before_it_counts():
    # With no valid samples, every case with a lower-case letter also holds an upper-case one, so
    # the validator (re.fullmatch("[a-z]{3,12}") without the case flag) accepts none of them and
    # the first hypotheses are empty; strings sampled from their differences (all lower case,
    # say) refute them.
    report = audit("(?i)[a-z]{3,12}", "planted:vessel_missing_case_flag",
                   settings=Settings(valid=0, rejects=50))
    learned = report.learned
    assert learned.sampled and not learned.contradicted
    # reference, by counting: 52**n strings of n letters, of which the 26**n all lower-case ones
    # are accepted by the validator
    assert learned.wrongly_rejected.total == sum(52 ** n - 26 ** n for n in range(3, 13))
    assert learned.wrongly_accepted.empty
    for text in learned.sampled:  # reference: re.fullmatch, the validator's own call
        assert learned.model.model.accepts(text) == bool(re.fullmatch("[a-z]{3,12}", text))
    assert report.evidence.basis == "learned" and "only under the model's guarantee" in report.evidence.sentence


def test_a_large_group_is_summarised_by_its_difference_language():
    spec = "(?i)[a-z]{3,12}"
    report = audit(spec, "planted:vessel_missing_case_flag", settings=Settings(valid=1000, rejects=200))
    groups = report.groups()
    (group,) = groups
    assert group.direction == "wrong reject" and group.difference_source == "learned model"
    assert group.size == len(report.findings) > 998
    assert group.kinds["valid"] >= 950
    # The pattern, judged by re, against the hand-written reason: valid, yet not all lower case.
    pattern = re.compile(group.difference.pattern)
    for text in map("".join, __import__("itertools").product("aZq", repeat=4)):
        truth = bool(re.fullmatch(spec, text)) and not re.fullmatch("[a-z]{3,12}", text)
        assert bool(pattern.fullmatch(text)) == truth, text
    without = audit(spec, "planted:vessel_missing_case_flag", settings=Settings(valid=1000,
                                                                                rejects=200,
                                                                                learning=NO_MODEL))
    valid = [g for g in without.groups() if g.label == "valid"]
    assert valid and valid[0].difference is None and valid[0].size > 900


def test_raised_log_keeps_counts_and_the_shortest_inputs():
    from pfuzz.audit.findings import RaisedLog
    from pfuzz.audit.targets import Verdict

    log = RaisedLog(keep=3)
    texts = ["dddd", "b", "aa", "c", "", "eeeee"]
    for text in texts:
        log.add(text, Verdict(False, "KeyError", f"on {text}", True), spec_accepts=len(text) == 1)
    log.add("x", Verdict(False, "ValueError", "no"), spec_accepts=False)
    log.add("ok", Verdict(True), spec_accepts=True)
    key_error, value_error = log.groups()
    assert (key_error.type, key_error.count, key_error.spec_rejects) == ("KeyError", 6, 4)
    assert key_error.shortest == ("", "b", "c") and key_error.message == "on "
    assert not value_error.unexpected and log.unexpected == 6


def test_a_small_set_without_a_difference_language_gets_its_own_pattern():
    from pfuzz.audit.findings import group_findings
    from pfuzz.audit.run import AuditCase, Finding
    from pfuzz.audit.targets import Verdict

    texts = [f"A{d}" for d in "0123456789"] + ["B0", "B1"]
    found = [Finding(AuditCase(t, False, "near-miss", "replace"), Verdict(True)) for t in texts]
    (group,) = group_findings(found, pfuzz.ALPHABETS["ascii"])
    own = re.compile(group.own_pattern)
    universe = [a + b for a in "ABC" for b in "0129x"]
    assert [t for t in universe if own.fullmatch(t)] == [t for t in universe if t in texts]  # re


def test_a_learned_model_is_the_evidence_only_where_the_answers_bear_it_out():
    from types import SimpleNamespace

    from pfuzz.audit.evidence import evidence_of

    def report(equal: bool, wrong: int, contradicted=()):
        model = SimpleNamespace(equals_specification=equal, states=3, queries=10,
                                conformance_depth=1, guarantee=lambda: "exact, provided ...")
        empty = SimpleNamespace(empty=True, total=0, counts={})
        return SimpleNamespace(case_counts=lambda: (5, 7), raised=SimpleNamespace(unexpected=0),
                               findings=[object()] * wrong, exact=None,
                               learned=SimpleNamespace(model=model, wrongly_accepted=empty,
                                                       wrongly_rejected=empty, sampled=("x", "y"),
                                                       contradicted=contradicted))

    assert evidence_of(report(True, 0)).basis == "learned"
    assert evidence_of(report(False, 2)).basis == "learned"
    missed = evidence_of(report(True, 2))
    assert missed.basis == "cases" and "the learned model, which equals the specification, missed" \
        in missed.sentence
    unconfirmed = evidence_of(report(False, 0))
    assert unconfirmed.basis == "cases" and unconfirmed.sentence.startswith(
        "agreement on 5 deterministic and 7 sampled cases (not a proof")
    assert "confirmed none of its differences" in unconfirmed.sentence
    assert "only under the model's guarantee: exact, provided" in evidence_of(report(False, 2)).sentence
    refuted = evidence_of(report(False, 2, contradicted=("x",)))
    assert refuted.basis == "cases" and "answered 1 of 2 strings sampled from the model's differences " \
        "unlike the model" in refuted.sentence


def test_a_difference_of_more_than_4300_digits_is_described_not_a_traceback():
    # Found by the profile fuzz run: describe_side turned an exact count of thousands of digits
    # into text and Python refused (its int-to-str limit, sys.get_int_max_str_digits()).
    from types import SimpleNamespace

    from pfuzz.audit.evidence import describe_side
    from pfuzz.base.jsonlines import json_text

    huge = 95 ** 2200  # 4,351 digits, beginning 981593 (str() with the limit lifted, by hand)
    side = SimpleNamespace(empty=False, total=None, counts={2200: huge})
    assert re.fullmatch(r"infinitely many strings \(a number of about 4,35[0-2] digits of length 2200, "
                        r"the shortest\)", describe_side(side))
    assert re.fullmatch(r"a number of about 4,35[0-2] digits strings",
                        describe_side(SimpleNamespace(empty=False, total=huge, counts={})))
    assert json_text({"count": huge}).startswith('{"count": 981593') and len(json_text(huge)) == 4351
