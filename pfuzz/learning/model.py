"""The result of learning: the model, how it compares with the specification, and its evidence."""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.language import Language
from pfuzz.learning.symbols import SymbolClass

__all__ = ["LearnedModel", "BUDGET_WORDS"]

#: What each budget is called in a sentence.
BUDGET_WORDS = {"queries": "query", "states": "state", "seconds": "time"}


@dataclass(frozen=True)
class LearnedModel:
    """A learned automaton of a validator and what it rests on.

    ``model`` is the validator's language as learned (a ``Language`` over the learning
    alphabet); ``specification`` the specification over the same alphabet.
    ``wrongly_accepted`` is model − specification, ``wrongly_rejected`` specification − model.
    ``states`` counts the model's states as ``Language.states`` does (no dead state);
    ``hypothesis_states`` counts the complete automaton the tests speak of (with the state that
    rejects everything, where there is one). ``conformance_depth`` is the number of extra
    states the model was tested for (``extra_states`` asked), None when not even the
    hypothesis' own states were confirmed. ``confirmed_differences`` are strings on which the
    validator was asked and disagreed with the specification (shortlex order).
    ``budget_exhausted`` names the budget that ran out (``"queries"``, ``"states"`` or
    ``"seconds"``), None when learning ended by itself.
    """

    model: Language
    specification: Language
    wrongly_accepted: Language
    wrongly_rejected: Language
    states: int
    hypothesis_states: int
    equals_specification: bool
    classes: tuple[SymbolClass, ...]
    interior_probes: int
    extra_states: int
    conformance_depth: int | None
    confirmed_differences: tuple[str, ...]
    queries: int
    rounds: int
    seconds: float
    counterexamples: int
    splits: int
    budget_exhausted: str | None
    counterexample_pending: bool = False

    def guarantee(self) -> str:
        """The guarantee of the model in plain words, with both of its conditions."""
        depth = self.conformance_depth
        if depth is None:
            return self._no_guarantee()
        sentence = (f"exact, provided the validator treats every character of each class alike "
                    f"(each class was probed at its ends and at {self.interior_probes} interior "
                    f"characters, or at all of them where it has fewer) and needs at most "
                    f"{self.hypothesis_states + depth} states ({self._count(depth)})")
        if depth < self.extra_states and self.budget_exhausted:
            plural = "" if self.extra_states == 1 else "s"
            sentence += (f"; testing for {self.extra_states} extra state{plural} stopped when "
                         f"the {BUDGET_WORDS[self.budget_exhausted]} budget ran out")
        return sentence

    def _count(self, depth: int) -> str:
        """How N + k is made up: the model's states, its dead state, the extra states."""
        parts = [f"the model's {self.states}"]
        if self.hypothesis_states > self.states:
            parts.append("one that rejects everything")
        if depth:
            parts.append(f"{depth} more")
        return ", ".join(parts[:-1]) + " and " + parts[-1] if len(parts) > 1 else parts[0]

    def _no_guarantee(self) -> str:
        budget = BUDGET_WORDS.get(self.budget_exhausted or "", "")
        if self.counterexample_pending:
            when = ("while the model was being corrected for a string on which the validator "
                    "and the model disagree")
        else:
            when = "before the model was tested"
        return (f"none: the {budget} budget ran out {when}; the model is what was learned "
                f"until then and may be wrong either way")

    def as_dict(self) -> dict:
        return {
            "states": self.states,
            "hypothesis_states": self.hypothesis_states,
            "equals_specification": self.equals_specification,
            "conformance_depth": self.conformance_depth,
            "extra_states": self.extra_states,
            "interior_probes": self.interior_probes,
            "budget_exhausted": self.budget_exhausted,
            "queries": self.queries,
            "rounds": self.rounds,
            "seconds": round(self.seconds, 3),
            "counterexamples": self.counterexamples,
            "splits": self.splits,
            "classes": [c.as_dict() for c in self.classes],
            "confirmed_differences": list(self.confirmed_differences),
            "guarantee": self.guarantee(),
        }
