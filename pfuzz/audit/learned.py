"""The learned model of a validator, inside an audit.

For a Python or command target the audit asks ``pfuzz.learning.learn`` for the
validator's automaton: its membership oracle is the target itself, asked a round
at a time (``Target.verdicts``); the audit's own cases are answered from the
verdicts already in hand (not asked twice) and are given to the learner as
extra tests; every exception a query raises is logged with the cases' own
(``pfuzz.audit.findings.RaisedLog``). The learning alphabet is the audit
alphabet, with the single hostile characters (line ends, blanks, the byte order
mark) as classes of their own.

After learning (whose last check already asks strings drawn from the differences
of each hypothesis), the final model's claims are tested once more: up to
``SAMPLED_DIFFERENCES`` strings drawn uniformly by length from each difference
language are asked of the validator; where it answers one unlike the model (the
model is wrong there: a validator outside the guarantee's conditions), the model
is not the audit's evidence (``pfuzz.audit.evidence``). The two difference
languages (model − specification: wrongly accepted; specification − model:
wrongly rejected) are summarised exactly
(``pfuzz.audit.comparison.summarise``: counts per length, shortest members, a
pattern by state elimination). The learner's confirmed differences and the
shortest members of each difference language are asked of the validator once
more, with their full verdicts; each one it answers against the
specification is a finding (category ``learned``).

Cost: the learner's (its budgets bound queries, states and time; see
``pfuzz.learning``) plus one summary per difference language.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.audit.comparison import DEFAULT_EXAMPLES, Side, summarise
from pfuzz.audit.findings import RaisedLog
from pfuzz.language import Language

__all__ = ["LearningSettings", "Learned", "learn_validator", "HOSTILE_SINGLES"]

#: Hostile characters given to the learner as classes of their own.
HOSTILE_SINGLES = "\n\r\t \u00a0\u200b\ufeff"


def _defaults() -> dict:
    from pfuzz import learning

    return {"max_queries": learning.DEFAULT_MAX_QUERIES, "max_states": learning.DEFAULT_MAX_STATES,
            "extra_states": learning.DEFAULT_EXTRA_STATES,
            "interior_probes": learning.DEFAULT_INTERIOR_PROBES}


@dataclass(frozen=True)
class LearningSettings:
    """Whether to learn a model, and its budgets (None: the learner's defaults)."""

    enabled: bool = True
    max_queries: int | None = None
    max_states: int | None = None
    max_seconds: float | None = None
    extra_states: int | None = None
    interior_probes: int | None = None

    def options(self) -> dict:
        chosen = {k: getattr(self, k) for k in ("max_queries", "max_states", "extra_states",
                                                 "interior_probes")}
        out = {k: v if v is not None else _defaults()[k] for k, v in chosen.items()}
        return {**out, "max_seconds": self.max_seconds}


@dataclass(frozen=True)
class Learned:
    """A learned model and its difference languages, summarised; ``sampled`` are strings drawn
    from those differences and asked of the validator, ``contradicted`` the ones it answered
    unlike the model (the model is wrong there, whatever its guarantee says)."""

    model: object            #: ``pfuzz.learning.LearnedModel``
    wrongly_accepted: Side
    wrongly_rejected: Side
    sampled: tuple[str, ...] = ()
    contradicted: tuple[str, ...] = ()

    def as_dict(self) -> dict:
        """The model and its differences; without the time it took (same seed, same report)."""
        model = {k: v for k, v in self.model.as_dict().items() if k != "seconds"}
        return {**model, "wrongly_accepted": self.wrongly_accepted.as_dict(),
                "wrongly_rejected": self.wrongly_rejected.as_dict(),
                "differences_sampled": len(self.sampled), "contradicted_by": list(self.contradicted)}


class _Asker:
    """The learner's oracle: known answers from the audit's cases, the rest asked of the target."""

    def __init__(self, target, known: dict[str, bool], spec: Language, log: RaisedLog):
        self.target, self.known, self.spec, self.log = target, known, spec, log

    def __call__(self, strings) -> list[bool]:
        new = [s for s in dict.fromkeys(strings) if s not in self.known]
        answers = {}
        for text, verdict in zip(new, self.target.verdicts(new) if new else []):
            answers[text] = verdict.accepted
            self.log.add(text, verdict, self.spec.accepts(text))
        return [self.known[s] if s in self.known else answers[s] for s in strings]


def learn_validator(spec: Language, target, cases, verdicts, alphabet, settings: LearningSettings,
                    seed: int, log: RaisedLog) -> Learned:
    """Learn the validator's automaton over ``alphabet`` (the audit alphabet), then test the
    model's claims once more on strings drawn from its differences."""
    from pfuzz.audit.comparison import lift
    from pfuzz.learning import learn
    from pfuzz.learning.learner import sample_differences

    known = {c.text: v.accepted for c, v in zip(cases, verdicts)}
    asker = _Asker(target, known, lift(spec, alphabet), log)
    model = learn(asker, spec, alphabet=alphabet, extra_characters=HOSTILE_SINGLES,
                  extra_tests=[c.text for c in cases], seed=seed, **settings.options())
    sampled = sample_differences((model.wrongly_accepted, model.wrongly_rejected), seed)
    answers = asker(sampled)
    contradicted = tuple(t for t, a in zip(sampled, answers) if model.model.accepts(t) != a)
    return Learned(model, summarise(model.wrongly_accepted), summarise(model.wrongly_rejected),
                   tuple(sampled), contradicted)


def to_confirm(learned: Learned, already: set[str]) -> list[str]:
    """Strings to ask once more: confirmed differences and the shortest of each side, new ones only."""
    texts = [*learned.model.confirmed_differences, *learned.wrongly_accepted.examples,
             *learned.wrongly_rejected.examples, *learned.sampled]
    return [t for t in dict.fromkeys(texts) if t not in already][:4 * DEFAULT_EXAMPLES + len(learned.sampled)]
