"""Auditing a validator against a specification language.

The specification is a ``Language`` (a ``--pattern`` or a profile field); its
alphabet says which characters a valid string may hold, and every string with
any other character is invalid. The audit writes cases from the
specification's automata, asks the validator about each, and reports every
disagreement: a *wrong reject* (a valid string refused) or a *wrong accept*
(an invalid string let through).

Cases, in the order they are made (a text made twice keeps its first category):

1. the boundary suite of ``pfuzz.boundary.suite`` over the audit alphabet (below),
   with the hostile characters as probes (each tried at every position that
   refuses it): shortest, longest, length edges, the edges of every range at
   every state, one more / one fewer at every transition, exits, transition
   coverage; its first ``boundary_limit`` cases (a note says what was cut);
2. ``hostile``: the variants of ``pfuzz.audit.hostile`` (a trailing newline, tabs
   and CRs, spaces around the value, other scripts' digits, full-width
   letters, no-break and zero-width spaces) of a few valid witnesses;
3. ``case-flip``: those witnesses with a letter in the other case;
4. near-miss rejects (``pfuzz.nearmiss.rejects``) drawn over the *audit alphabet*,
   the specification's alphabet widened by ``reject_alphabet`` (default
   Latin-1: control characters, tab, CR, LF, no-break space, accented letters)
   and by the hostile characters: one in ``EDGE_SHARE`` from the range-edge
   near-misses (category ``range-edge``), the rest in equal shares drawn
   from each edit kind's own near-miss language (category ``near-miss``),
   each with its nearest witness and the edits from it (whose kind the
   report lists it under);
5. ``valid``: strings sampled uniformly by length from the specification.

Every case's expected verdict is the specification's own (extended to the
audit alphabet by ``pfuzz.audit.comparison.lift``); hostile variants and case flips
that the specification accepts are dropped. All random choices flow from one
seeded source: the same seed and specification give the same cases.

A regular-expression target is also compared exactly: its language in the
user's call mode against the specification over the audit alphabet, reported
as the two difference languages (``pfuzz.audit.comparison``). Of a Python or
command target a model is learned (``pfuzz.audit.learned``, unless
``Settings.learning`` turns it off), with the cases among its tests; the
differences it shows that the validator confirms are findings (category
``learned``). Every exception the validator raises, on a case or a learning
query, is logged by type (``pfuzz.audit.findings.RaisedLog``); one that is not
a way of saying reject (``Verdict.unexpected``) is a finding of its own. The
report says what its answer rests on (``pfuzz.audit.evidence``) and groups the
disagreements by cause (``AuditReport.groups``).

Cost: building the cases is dominated by the near-miss automata (one per
edit kind, one for range edges) and the witness of each reject; with the
defaults a whole ``pfuzz audit`` run of a typical field pattern takes about
0.3 s (measured). Limits: a large specification costs more: the 968-state
password field of ``profiles/password-policy.toml`` takes about 4 s, 2.6 s of
it for the range-edge near-misses (a 15,034-state automaton over the audit
alphabet: 1.1 s to build, 1.3 s to set up its exact count tables).
The learned model adds the learner's cost, bounded by its budgets. Measured
(whole ``pfuzz audit`` runs of the shipped profiles' fields against a Python
target, a loaded 2-core machine): 1.7-5.6 s for the single-pattern fields with
a correct validator (3,000-46,000 queries), 1.7-8.3 s with a validator that
lets a final newline through (4,600-98,000 queries); 33-45 s for the password
fields, where the default budget of 200,000 queries runs out.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from pfuzz.base import randomness
from pfuzz.base.charset import CharSet
from pfuzz.audit.comparison import Comparison, compare, lift
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.boundary.suite import DEFAULT_LIMIT as DEFAULT_BOUNDARY_LIMIT
from pfuzz.errors import EmptyLanguageError, PatternError, StateLimitError
from pfuzz.audit.hostile import HOSTILE_CHARACTERS, Variant, case_flips, hostile_variants
from pfuzz.language import Language
from pfuzz.audit.evidence import Evidence, evidence_of
from pfuzz.audit.findings import Group, RaisedLog, group_findings
from pfuzz.audit.learned import Learned, LearningSettings, learn_validator, to_confirm
from pfuzz.audit.targets import RegexTarget, Verdict
from pfuzz.syntax.alphabet import resolve_alphabet

DEFAULT_VALID = 1_000
DEFAULT_REJECTS = 1_000
#: One near-miss reject in this many is drawn from the range-edge near-misses.
EDGE_SHARE = 4
DEFAULT_REJECT_ALPHABET = "latin1"
#: Valid strings that hostile variants and case flips are made from.
WITNESSES = 8
#: Report order of categories when their shortest failures are equally long.
CATEGORY_ORDER = ("length-edge", "range-edge", "repetition", "near-miss", "hostile", "case-flip",
                  "shortest", "longest", "coverage", "exit", "valid")


@dataclass(frozen=True)
class AuditCase:
    """One string to ask the validator about, with the verdict the specification gives."""

    text: str
    expected: bool
    category: str
    kind: str = ""
    reason: str = ""
    witness: str | None = None
    edits: tuple = ()
    sampled: bool = False   #: drawn by the seeded generator (False: the same for every seed)

    @property
    def group(self) -> str:
        """The heading a failure is listed under: the category, near-misses split by edit kind."""
        return f"near-miss ({self.kind})" if self.category == "near-miss" else self.category


@dataclass(frozen=True)
class Settings:
    """How many cases of each kind to make (the documented defaults)."""

    valid: int = DEFAULT_VALID
    rejects: int = DEFAULT_REJECTS
    seed: int = 0
    distance: int = 1
    kinds: tuple[str, ...] = EDIT_KINDS
    reject_alphabet: str = DEFAULT_REJECT_ALPHABET
    boundary: bool = True
    hostile: bool = True
    case_flip: bool = True
    min_length: int | None = None   #: bounds the sampled valid strings and rejects
    max_length: int | None = None   #: ... and the boundary suite's length scan
    boundary_limit: int | None = DEFAULT_BOUNDARY_LIMIT   #: distinct boundary cases kept (None: all)
    learning: LearningSettings = LearningSettings()   #: the learned model (Python and command targets)


@dataclass(frozen=True)
class Finding:
    """A case the validator got wrong."""

    case: AuditCase
    verdict: Verdict

    @property
    def wrong_accept(self) -> bool:
        return self.verdict.accepted and not self.case.expected


@dataclass
class AuditReport:
    """Cases, verdicts and, for a regex target, the exact comparison."""

    spec: str
    target: str
    alphabet: str
    audit_alphabet: CharSet
    settings: Settings
    cases: list[AuditCase]
    verdicts: list[Verdict]
    exact: Comparison | None = None
    exact_note: str = ""
    notes: list[str] = field(default_factory=list)
    learned: Learned | None = None
    learning_note: str = ""
    raised: RaisedLog = field(default_factory=RaisedLog)   #: every exception, cases and queries

    @property
    def findings(self) -> list[Finding]:
        """Disagreements, most useful first.

        Groups (categories; near-misses by edit kind) come in order of their
        shortest failure; inside a group, the shortest failure of each kind
        comes first, then the second shortest of each, and so on (shortlex
        within a round), so one kind cannot crowd out the others.
        """
        wrong = [Finding(c, v) for c, v in zip(self.cases, self.verdicts) if v.accepted != c.expected]
        wrong.sort(key=lambda f: (len(f.case.text), f.case.text))
        first: dict[str, int] = {}
        turn: dict[Finding, int] = {}
        seen: dict[tuple[str, str], int] = {}
        for f in wrong:
            first.setdefault(f.case.group, len(f.case.text))
            key = (f.case.group, f.case.kind)
            turn[f] = seen.get(key, 0)
            seen[key] = turn[f] + 1
        return sorted(wrong, key=lambda f: (first[f.case.group], _rank(f.case.category), f.case.group,
                                            turn[f], len(f.case.text), f.case.text))

    @property
    def agrees(self) -> bool:
        """No disagreement, no exception that is a finding, no known difference of the languages."""
        return (not self.findings and not self.raised.unexpected
                and (self.exact is None or self.exact.equal))

    @property
    def evidence(self) -> Evidence:
        return evidence_of(self)

    def case_counts(self) -> tuple[int, int]:
        """Cases that are the same for every seed, and cases drawn by the seeded generator."""
        sampled = sum(c.sampled for c in self.cases)
        return len(self.cases) - sampled, sampled

    def groups(self) -> list[Group]:
        """The disagreements grouped by direction and kind of case (``pfuzz.audit.findings``)."""
        if self.exact is not None:
            sides, source = {"wrong accept": self.exact.only_b, "wrong reject": self.exact.only_a}, \
                "exact comparison"
        elif self.learned is not None:
            sides, source = {"wrong accept": self.learned.wrongly_accepted,
                             "wrong reject": self.learned.wrongly_rejected}, "learned model"
        else:
            sides, source = {}, ""
        return group_findings(self.findings, self.audit_alphabet, sides, source)

    def summary(self) -> list[dict]:
        """Per category: cases, wrong accepts, wrong rejects, exceptions raised."""
        rows: dict[str, dict] = {}
        for case, verdict in zip(self.cases, self.verdicts):
            row = rows.setdefault(case.category, {"category": case.category, "cases": 0,
                                                  "wrong_accepts": 0, "wrong_rejects": 0, "raised": 0})
            row["cases"] += 1
            row["wrong_accepts"] += verdict.accepted and not case.expected
            row["wrong_rejects"] += case.expected and not verdict.accepted
            row["raised"] += bool(verdict.error)
        ordered = sorted(rows.values(), key=lambda r: _rank(r["category"]))
        total = {"category": "total", **{k: sum(r[k] for r in ordered)
                                         for k in ("cases", "wrong_accepts", "wrong_rejects", "raised")}}
        return [*ordered, total]


def _rank(category: str) -> int:
    return CATEGORY_ORDER.index(category) if category in CATEGORY_ORDER else len(CATEGORY_ORDER)


# -- making the cases -----------------------------------------------------------------

def audit_alphabet(spec_alphabet: CharSet, reject_alphabet: str) -> CharSet:
    """The specification's alphabet widened by the reject alphabet and the hostile characters."""
    return spec_alphabet | resolve_alphabet(reject_alphabet) | HOSTILE_CHARACTERS


def stages(settings: Settings, exact: bool = False) -> list[str]:
    """The names of the steps an audit takes, in order (for a progress display)."""
    names = ["boundary suite"] if settings.boundary else []
    names += ["valid strings", "hostile and case-flip cases", "range-edge rejects"]
    names += [f"{kind} rejects" for kind in settings.kinds]
    names += ["running the validator"]
    if exact:
        return names + ["exact comparison"]
    return names + (["learning a model of the validator"] if settings.learning.enabled else [])


def _silent(_stage: str) -> None:
    return None


def build_cases(spec: Language, settings: Settings = Settings(),
                progress=_silent) -> tuple[list[AuditCase], list[str]]:
    """The audit's cases in the documented order, and notes on anything left out.

    ``progress(stage)`` is called as each of ``stages(settings)`` begins.
    """
    if spec.is_empty():
        raise EmptyLanguageError("the specification accepts no string: there is nothing to audit")
    wide = lift(spec, audit_alphabet(spec.alphabet, settings.reject_alphabet))
    rng = randomness.source(settings.seed)
    notes: list[str] = []
    boundary = []
    if settings.boundary:
        progress("boundary suite")
        drawn = wide.boundary_cases(settings.max_length, limit=settings.boundary_limit,
                                    probes=HOSTILE_CHARACTERS)
        boundary = [_boundary_case(c) for c in drawn]
        notes += [drawn.note()] if drawn.cut else []
    progress("valid strings")
    bounds = {"min_length": settings.min_length, "max_length": settings.max_length}
    valid = spec.sample(settings.valid, seed=rng, **bounds) if settings.valid else []
    progress("hostile and case-flip cases")
    witnesses = _witnesses([c.text for c in boundary if c.expected] + valid, spec)
    drawn_witnesses = set(witnesses) & set(valid) - {c.text for c in boundary}
    cases = [*boundary,
             *(_variant_case(v, "hostile", drawn_witnesses) for v in hostile_variants(witnesses)
               if settings.hostile),
             *(_variant_case(v, "case-flip", drawn_witnesses) for v in case_flips(witnesses)
               if settings.case_flip),
             *_near_misses(wide, settings, rng, notes, progress),
             *(AuditCase(t, True, "valid", "sample", "sampled uniformly by length", sampled=True)
               for t in valid)]
    return _keep_first(cases, wide), notes


def _witnesses(candidates: list[str], spec: Language) -> list[str]:
    chosen: list[str] = []
    for text in [spec.shortest(), *candidates]:
        if text not in chosen:
            chosen.append(text)
        if len(chosen) == WITNESSES:
            break
    return chosen


def _boundary_case(case) -> AuditCase:
    """A boundary case as it is: an invalid one carries its one-edit witness already."""
    return AuditCase(case.text, case.expected, case.category, case.kind, case.reason,
                     case.witness, case.edits)


def _variant_case(variant: Variant, category: str, drawn: set[str]) -> AuditCase:
    return AuditCase(variant.text, False, category, variant.kind, variant.reason,
                     variant.witness, variant.edits, sampled=variant.witness in drawn)


def _near_misses(wide: Language, settings: Settings, rng, notes: list[str],
                 progress=_silent) -> list[AuditCase]:
    """Range-edge near-misses first, then an equal share for each edit kind."""
    edges = settings.rejects // EDGE_SHARE
    rest = settings.rejects - edges
    kinds = settings.kinds
    draws = [(edges, {"edges": True}, "range-edge", "")]
    draws += [(rest // len(kinds) + (i < rest % len(kinds)), {"kinds": [kind]}, "near-miss", kind)
              for i, kind in enumerate(kinds)]
    out = []
    for count, options, category, kind in draws:
        progress(f"{kind or category} rejects")
        if not count:
            continue
        try:
            drawn = wide.rejects(count, distance=settings.distance, seed=rng, **options,
                                 min_length=settings.min_length, max_length=settings.max_length)
        except EmptyLanguageError as error:
            notes.append(f"no {category} {kind} rejects: {error}".replace("  ", " "))
            continue
        reason = _edits_away(settings.distance, category == "range-edge")
        out.extend(AuditCase(r.text, False, category, _script_kind(r.edits) if kind else "", reason,
                             r.witness, r.edits, sampled=True) for r in drawn)
    return out


def _script_kind(edits) -> str:
    """The kinds of edit in the witness's script (the kind a failure is listed under)."""
    return "+".join(dict.fromkeys(e.kind for e in edits)) or "none"


def _edits_away(distance: int, edge: bool) -> str:
    edits = "one edit" if distance == 1 else f"up to {distance} edits"
    if edge:
        return f"{edits} from a valid string, writing characters just outside a range"
    return f"{edits} from a valid string"


def _keep_first(cases: list[AuditCase], wide: Language) -> list[AuditCase]:
    """Drop repeated texts and variants the specification accepts after all."""
    seen: set[str] = set()
    kept = []
    for case in cases:
        if case.text in seen or (not case.expected and wide.accepts(case.text)):
            continue
        seen.add(case.text)
        kept.append(case)
    return kept


# -- running ----------------------------------------------------------------------------

def run_audit(spec: Language, target, settings: Settings = Settings(), *,
              spec_label: str | None = None, progress=_silent) -> AuditReport:
    """Build the cases, ask the target, and (for a regex target) compare the languages exactly.

    ``progress(stage)`` is called as each of ``stages(settings, exact)`` begins.
    """
    cases, notes = build_cases(spec, settings, progress)
    progress("running the validator")
    verdicts = target.verdicts([c.text for c in cases])
    wide_alphabet = audit_alphabet(spec.alphabet, settings.reject_alphabet)
    report = AuditReport(spec_label or spec.pattern or "specification", target.label,
                         spec.alphabet_name, wide_alphabet, settings, cases, verdicts, notes=notes)
    for case, verdict in zip(cases, verdicts):
        report.raised.add(case.text, verdict, case.expected)
    if isinstance(target, RegexTarget):
        progress("exact comparison")
        report.exact, report.exact_note = exact_comparison(spec, target, wide_alphabet)
    elif settings.learning.enabled:
        progress("learning a model of the validator")
        _learn(report, spec, target)
    return report


def _learn(report: AuditReport, spec: Language, target) -> None:
    """The learned model, and the differences it shows that the validator confirms, as findings."""
    try:
        learned = learn_validator(spec, target, report.cases, report.verdicts, report.audit_alphabet,
                                  report.settings.learning, report.settings.seed, report.raised)
    except ImportError:
        report.learning_note = "no learned model: this installation has no pfuzz.learning"
        return
    except StateLimitError as error:
        report.learning_note = f"no learned model: {error}"
        return
    report.learned = learned
    texts = to_confirm(learned, {c.text for c in report.cases})
    wide = lift(spec, report.audit_alphabet)
    for text, verdict in zip(texts, target.verdicts(texts)):
        expected = wide.accepts(text)
        if verdict.accepted != expected:
            side = "wrongly accepted" if verdict.accepted else "wrongly rejected"
            why = None if expected else _explained(wide, text)
            report.cases.append(AuditCase(text, expected, "learned", "",
                                          f"a string the learned model has {side}, asked again",
                                          why.witness if why else None, why.edits if why else ()))
            report.verdicts.append(verdict)
        report.raised.add(text, verdict, expected)


def _explained(wide: Language, text: str):
    """The nearest valid string and the edits from it, or None where there is none."""
    try:
        return wide.explain(text)
    except (EmptyLanguageError, StateLimitError):
        return None


def exact_comparison(spec: Language, target: RegexTarget,
                     alphabet: CharSet) -> tuple[Comparison | None, str]:
    """Specification − validator (wrong rejects) and validator − specification (wrong accepts)."""
    try:
        accepted = target.language(alphabet, spec.state_cap)
    except (PatternError, StateLimitError) as error:
        return None, f"no exact comparison: pfuzz cannot compile the validator's regex ({error})"
    return compare(lift(spec, alphabet), accepted), ""
