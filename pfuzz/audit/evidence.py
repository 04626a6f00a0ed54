"""What an audit's answer rests on, in one sentence.

Every audit ends with its evidence, the strongest it has, in one of four forms:

- ``exact``: the exact difference of the two languages (a regular-expression
  target, compiled and compared over the audit alphabet: a proof over that
  alphabet);
- ``learned``: a learned model of the validator that equals the
  specification, tested to k extra states, with the guarantee's two
  conditions in plain words; or a learned model that differs, with the size of
  its two differences and how many differing strings the validator confirmed;
- ``cases``: the cases alone: agreement on N deterministic and M sampled
  cases, which is not a proof; or the disagreements found among them.

The learned model is the evidence only where the validator's answers bear it
out: a model equal to the specification while some case disagrees (learning
stopped by a budget), a model that differs while no string the validator
answered confirms it, or a model the validator contradicts on a string drawn
from its differences, leaves the cases as the evidence, with a remark. A model
that differs gives its counts under its guarantee, which the sentence states.
Unexpected exceptions are added to every form.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.base.numbers import number_text

__all__ = ["Evidence", "describe_side", "evidence_of"]


@dataclass(frozen=True)
class Evidence:
    """The basis (``exact``, ``learned`` or ``cases``) and the sentence saying it."""

    basis: str
    sentence: str

    def as_dict(self) -> dict:
        return {"basis": self.basis, "sentence": self.sentence}


def describe_side(side) -> str:
    """``no strings``, ``6,760,000 strings`` or ``infinitely many strings (12 of length 3, ...)``."""
    if side.empty:
        return "no strings"
    if side.total is not None:
        return f"{number_text(side.total)} string{'' if side.total == 1 else 's'}"
    shortest = min(side.counts) if side.counts else None
    if shortest is None:
        return "infinitely many strings"
    return f"infinitely many strings ({number_text(side.counts[shortest])} of length {shortest}, the shortest)"


def evidence_of(report) -> Evidence:
    """The evidence of an ``AuditReport`` (``pfuzz.audit.run``)."""
    deterministic, sampled = report.case_counts()
    tried = f"{deterministic:,} deterministic and {sampled:,} sampled cases"
    raised = report.raised.unexpected
    also = (f"; besides, the validator raised an exception that is not a reject on "
            f"{raised:,} input{'' if raised == 1 else 's'}") if raised else ""
    wrong = len(report.findings)
    if report.exact is not None:
        return Evidence("exact", _exact(report) + also)
    learned = report.learned
    refuted = learned is not None and bool(learned.contradicted)
    if learned is not None and not refuted and learned.model.equals_specification != bool(wrong):
        return Evidence("learned", _learned(report, tried) + also)
    if learned is None:
        unused = ""
    elif refuted:
        n, m = len(learned.contradicted), len(learned.sampled)
        unused = (f"; a learned model is not the evidence: the validator answered {n:,} of {m:,} "
                  "strings sampled from the model's differences unlike the model, so the model is "
                  "wrong there")
    elif wrong:
        unused = "; the learned model, which equals the specification, missed them"
    else:
        unused = ("; a learned model differs from the specification, but the validator confirmed "
                  "none of its differences when asked again, so the model is wrong there")
    if wrong:
        return Evidence("cases", f"{wrong:,} disagreement{'' if wrong == 1 else 's'} found among "
                                 f"{tried} (each one a string the validator answered; strings not "
                                 "tried may hide more)" + unused + also)
    return Evidence("cases", f"agreement on {tried} (not a proof: strings not tried may still be "
                             "judged differently)" + unused + also)


def _exact(report) -> str:
    exact = report.exact
    alphabet = report.audit_alphabet.describe(limit=4)
    if exact.equal:
        return (f"the exact difference is empty: the validator's language equals the specification "
                f"over the audit alphabet {alphabet} (a proof over that alphabet)")
    return (f"the exact difference over the audit alphabet {alphabet}: the validator wrongly "
            f"accepts {describe_side(exact.only_b)} and wrongly rejects "
            f"{describe_side(exact.only_a)}")


def _learned(report, tried: str) -> str:
    learned = report.learned
    model = learned.model
    states = f"{model.states:,} state{'' if model.states == 1 else 's'}"
    queries = f"{model.queries:,} queries"
    if model.equals_specification:
        depth = model.conformance_depth
        tested = (f"tested to {depth} extra state{'' if depth == 1 else 's'}" if depth is not None
                  else "not confirmed by its tests")
        return (f"a learned model of the validator ({states}) equals the specification, {tested} "
                f"({queries}, the {tried} among the tests); guarantee: {model.guarantee()}")
    wrong = len(report.findings)
    sampled = len(learned.sampled)
    return (f"a learned model of the validator ({states}, {queries}) differs from the "
            f"specification: the model wrongly accepts {describe_side(learned.wrongly_accepted)} and "
            f"wrongly rejects {describe_side(learned.wrongly_rejected)}; {wrong:,} string"
            f"{'' if wrong == 1 else 's'} the validator answered confirm{'s' if wrong == 1 else ''} "
            f"it ({tried} were tried, and {sampled:,} string{'' if sampled == 1 else 's'} sampled "
            f"from the model's differences all answered as the model says); the counts are the "
            f"validator's only under the model's guarantee: {model.guarantee()}")
