"""The learning loop: hypotheses from the discrimination tree, tested until nothing refutes them.

``learn`` builds the first hypothesis (``pfuzz.learning.discrimination``) over the first
symbol classes (``pfuzz.learning.symbols``) and then runs these checks in order, each a batch of
test words asked in rounds (``pfuzz.learning.conformance``); the first word on which the
validator and the hypothesis disagree is a counterexample, and the loop starts again with the
refined hypothesis:

1. the hypothesis against its own tree (asks nothing new);
2. the exact comparison with the specification: the validator is asked about the
   shortlex-least difference in every region of the product of hypothesis and specification.
   Where it answers like the hypothesis, the string is a *confirmed difference* between
   validator and specification (recorded); where it answers like the specification, it is a
   counterexample;
3. every class's probes in place of its representative, after every state (class splits);
4. the caller's extra test strings (the audit's cases);
5. the state tests for 1, 2, ..., k extra states;
6. ``SAMPLED_DIFFERENCES`` strings drawn uniformly by length from each difference of the
   hypothesis and the specification: the hypothesis' claims, tested at random where the
   checks above test them at their shortest (a validator outside the guarantee's conditions,
   one that tells apart characters of a class in some context, is often caught here).

A counterexample is first mapped to representatives: if that changes the validator's answer,
a binary search over positions finds a character that its representative cannot stand for,
and its class is split by bisection; otherwise the word of representatives is cut by
Rivest–Schapire. Either way the hypothesis grows (a class or a state), so the loop ends, at the
latest when a budget runs out. Learning ends with the last complete hypothesis; when a budget
ran out while a counterexample was being used, the model is known to be wrong and carries no
guarantee.

Cost (measured, ``python -m pfuzz.benchmarks learning``): the queries of Kearns–Vazirani are
about states × classes × log(states) for the hypothesis, plus log(length) per counterexample;
the state tests for k extra states add states × classes^(k+1) × (tree depth) at most.
"""

from __future__ import annotations

import itertools
import warnings
from typing import Callable, Iterable, Iterator, Sequence

from pfuzz.automata.dfa import DEAD, DFA, empty
from pfuzz.automata.minimise import minimise
from pfuzz.base.charset import CharSet
from pfuzz.base.randomness import source
from pfuzz.errors import ArgumentError, PfuzzWarning
from pfuzz.language import Language
from pfuzz.learning.conformance import (difference_witnesses, matched_states, probe_tests,
                                        specification_probes, state_tests)
from pfuzz.learning.discrimination import Tree
from pfuzz.learning.model import LearnedModel
from pfuzz.learning.oracle import Exhausted, Oracle, change_point
from pfuzz.learning.symbols import SymbolClass, Symbols, boundary, initial

__all__ = ["learn", "DEFAULT_MAX_QUERIES", "DEFAULT_MAX_STATES", "DEFAULT_INTERIOR_PROBES",
           "DEFAULT_EXTRA_STATES"]

DEFAULT_INTERIOR_PROBES = 2
DEFAULT_EXTRA_STATES = 1
#: Distinct strings the validator may be asked; about a minute for a fast Python validator.
DEFAULT_MAX_QUERIES = 200_000
#: States the model may grow to before learning stops (a validator that is not regular grows).
DEFAULT_MAX_STATES = 2_000
#: Strings drawn from each difference of hypothesis and specification by the last check.
SAMPLED_DIFFERENCES = 16
#: New strings asked in the first round of a batch of tests; each next round asks twice as many,
#: up to ROUND_SIZE (the first failure usually comes early, and ends the batch).
FIRST_ROUND = 16
ROUND_SIZE = 4_096


def learn(ask: Callable[[Sequence[str]], Sequence[bool]], specification: Language, *,
          alphabet: CharSet | None = None, extra_characters: str = "",
          interior_probes: int = DEFAULT_INTERIOR_PROBES,
          extra_states: int = DEFAULT_EXTRA_STATES, max_queries: int = DEFAULT_MAX_QUERIES,
          max_states: int = DEFAULT_MAX_STATES, max_seconds: float | None = None,
          extra_tests: Iterable[str] = (), seed=0) -> LearnedModel:
    """Learn the automaton of the validator ``ask`` (see ``pfuzz.learning``)."""
    _check_arguments(interior_probes, extra_states, max_queries, max_states, max_seconds)
    wide = specification.alphabet | (alphabet or CharSet()) | CharSet.from_chars(extra_characters)
    spec = _widen(specification, wide)
    symbols = Symbols(initial(spec.dfa.classes, wide, CharSet.from_chars(extra_characters)),
                      interior_probes, source(seed))
    oracle = Oracle(ask, max_queries=max_queries, max_seconds=max_seconds)
    tests = [t for t in dict.fromkeys(extra_tests) if all(ch in wide for ch in t)]
    run = _Learning(oracle, symbols, spec, max_states, extra_states, tests)
    run.go()
    return run.result(interior_probes)


def sample_differences(sides, seed) -> list[str]:
    """Up to ``SAMPLED_DIFFERENCES`` distinct strings drawn from each non-empty language of
    ``sides`` (all of a smaller one, without a warning)."""
    found: list[str] = []
    for side in sides:
        if not side.is_empty():
            with warnings.catch_warnings():
                warnings.simplefilter("ignore", PfuzzWarning)
                found += side.sample(SAMPLED_DIFFERENCES, seed=seed, unique=True)
    return list(dict.fromkeys(found))


def _check_arguments(interior_probes, extra_states, max_queries, max_states, max_seconds) -> None:
    for name, value, least in (("interior_probes", interior_probes, 0),
                               ("extra_states", extra_states, 0),
                               ("max_queries", max_queries, 1), ("max_states", max_states, 1)):
        if not isinstance(value, int) or value < least:
            raise ArgumentError(f"{name} must be an integer of at least {least}, not {value!r}")
    if max_seconds is not None and not max_seconds > 0:
        raise ArgumentError(f"max_seconds must be positive, not {max_seconds!r}")


def _widen(lang: Language, alphabet: CharSet) -> Language:
    """``lang`` over a wider alphabet: the new characters lead nowhere."""
    extra = alphabet - lang.alphabet
    if not extra:
        return lang
    rows = tuple((*row, DEAD) for row in lang.dfa.table)
    dfa = minimise(DFA(alphabet, (*lang.dfa.classes, extra), rows, lang.dfa.accepting))
    label = f"{lang.alphabet_name} + {extra.describe(limit=16)}"
    return Language(dfa, pattern=lang.pattern, flags=lang.flags, alphabet_name=label)


class _Learning:
    """One run of the loop; ``go`` learns, ``result`` reports."""

    def __init__(self, oracle: Oracle, symbols: Symbols, spec: Language, max_states: int,
                 extra_states: int, tests: list[str]):
        self.oracle, self.symbols, self.spec = oracle, symbols, spec
        self.max_states, self.extra_states, self.tests = max_states, extra_states, tests
        self.tree: Tree | None = None
        self.hypothesis: DFA | None = None
        self.classes: list[SymbolClass] = [symbols.classes[a] for a in symbols.ordered()]
        self.depth: int | None = None
        self.exhausted: str | None = None
        self.pending = False
        self.confirmed: set[str] = set()
        self.counterexamples = self.splits = 0

    def go(self) -> None:
        try:
            self.tree = Tree(self.oracle, self.symbols, self.spec.alphabet, self.max_states)
            self._snapshot()
            while self._refuted():
                pass
        except Exhausted as error:
            self.exhausted = error.budget

    def _snapshot(self) -> None:
        self.hypothesis = self.tree.hypothesis()
        self._columns: dict[str, int] = {}
        self.classes = [self.symbols.classes[a] for a in self.symbols.ordered()]
        self.depth = None

    def predict(self, word: str) -> bool:
        """The hypothesis' answer (its classes looked up once per character, not per use)."""
        hypothesis, columns, state = self.hypothesis, self._columns, 0
        table = hypothesis.table
        for ch in word:
            column = columns.get(ch)
            if column is None:
                column = columns[ch] = hypothesis.class_of(ch)
            if column < 0:
                return False
            state = table[state][column]
        return state in hypothesis.accepting

    def _refuted(self) -> bool:
        """Run the checks in order; True when one of them refined the hypothesis."""
        if self._use(self._failures(state_tests(self.tree, self.hypothesis, 0))):
            return True
        if self._against_specification() or self._probes():
            return True
        self.depth = 0
        if self._use(self._failures(self._extra_tests())):
            return True
        for depth in range(1, self.extra_states + 1):
            if self._use(self._failures(state_tests(self.tree, self.hypothesis, depth + 1))):
                return True
            self.depth = depth
        return self._use(self._failures(self._sampled_differences()))

    # -- the checks ----------------------------------------------------------------------
    def _against_specification(self) -> bool:
        """Ask the differences with the specification; use each that refutes the hypothesis.

        The differences through every product pair and every single class after it are worked
        through to their end, the hypothesis refined on the way (a word is asked only while it
        is still a difference), and computed again while that refines the hypothesis; then
        once more with paths of k + 1 classes (k the extra states), back to the single class
        if that refines it.
        """
        changed = False
        depth = 1
        while True:
            refined = self._differences(depth)
            changed = changed or refined
            if refined:
                depth = 1
            elif depth < self.extra_states + 1:
                depth = self.extra_states + 1
            else:
                return changed

    def _differences(self, depth: int) -> bool:
        spec_answers = dict(difference_witnesses(self.hypothesis, self.spec.dfa, depth))
        words = iter(spec_answers)
        refined = False
        try:
            while self._use(self._failures(self._still_different(words, spec_answers))):
                refined = True
        finally:  # a difference answered unlike the specification is a confirmed one
            answers = self.oracle.answers
            self.confirmed.update(w for w, spec in spec_answers.items()
                                  if answers.get(w, spec) != spec)
        return refined

    def _still_different(self, words, spec_answers) -> Iterator[tuple[str, bool]]:
        """The words on which the current hypothesis and the specification still differ."""
        for word in words:
            model = self.predict(word)
            if model != spec_answers[word]:
                yield word, model

    def _probes(self) -> bool:
        """Ask every probe beside its representative; split the first class found wanting."""
        matched = matched_states(self.hypothesis, self.spec.dfa, self.tree.access)
        tests = itertools.chain(specification_probes(self.spec.dfa, self.symbols),
                                probe_tests(self.tree, self.hypothesis, matched, self.extra_states))
        answers = self.oracle.answers
        failed = self._failures(tests, lambda context, answer: answers[context[0]] == answer)
        if not failed:
            return False
        self.pending, self.depth = True, None
        _, (_, before, probe, after) = failed[0]
        self._split(probe, before, after)
        self._snapshot()
        self.pending = False
        return True

    def _sampled_differences(self) -> Iterator[tuple[str, bool]]:
        model = Language(minimise(self.hypothesis), alphabet_name=self.spec.alphabet_name)
        for word in sample_differences((model - self.spec, self.spec - model), self.symbols.random):
            yield word, self.predict(word)

    def _extra_tests(self) -> Iterator[tuple[str, bool]]:
        for word in self.tests:
            yield word, self.predict(word)

    # -- asking tests in rounds ----------------------------------------------------------------
    def _failures(self, tests, passes=lambda expected, answer: expected == answer) -> list:
        """The failing tests of the first round that has any.

        A test is ``(word, expected)``: ``passes(expected, answer)`` judges the validator's
        answer for ``word``. Where ``expected`` is a tuple, its first item is a reference word
        that is asked in the same round, so that ``passes`` can read its answer. Tests already
        answered are judged at once; the others are asked in rounds of ``FIRST_ROUND`` new
        strings, doubling up to ``ROUND_SIZE``. When the query budget cannot take the next new
        string, what fits is asked and judged, and then ``Exhausted`` is raised.
        """
        answers, oracle = self.oracle.answers, self.oracle
        batch, fresh, size = [], {}, FIRST_ROUND
        for count, (word, expected) in enumerate(tests):
            needed = (word, expected[0]) if isinstance(expected, tuple) else (word,)
            unknown = [w for w in needed if w not in answers and w not in fresh]
            if not unknown and all(w in answers for w in needed):
                if not passes(expected, answers[word]):
                    return [(word, expected)]
                if count % ROUND_SIZE == 0:
                    oracle.check_time()
                continue
            if len(fresh) + len(unknown) > oracle.room():
                failed = self._judge(batch, fresh, passes)
                if failed:
                    return failed
                raise Exhausted("queries")
            fresh.update(dict.fromkeys(unknown))
            batch.append((word, expected))
            if len(fresh) >= size:
                failed = self._judge(batch, fresh, passes)
                if failed:
                    return failed
                batch, fresh, size = [], {}, min(2 * size, ROUND_SIZE)
        return self._judge(batch, fresh, passes)

    def _judge(self, batch: list, fresh: dict, passes) -> list:
        self.oracle.ask(fresh)
        answers = self.oracle.answers
        return [(word, expected) for word, expected in batch if not passes(expected, answers[word])]

    # -- using counterexamples -----------------------------------------------------------------
    def _use(self, failed: list) -> bool:
        """Refine the hypothesis with each failing word that still refutes it."""
        if not failed:
            return False
        self.pending, self.depth = True, None
        for word, _ in failed:
            self._counterexample(word)
        self.pending = False
        return True

    def _counterexample(self, word: str) -> None:
        oracle, symbols = self.oracle, self.symbols
        while oracle.accepts(word) != self.predict(word):
            self.counterexamples += 1
            abstract = symbols.abstract(word)
            concrete, represented = oracle.ask([word, abstract])
            if concrete != represented:
                self._split_inside(word)
            else:
                self.tree.refine(abstract)
            self._snapshot()

    def _split_inside(self, word: str) -> None:
        """Find a character of ``word`` its representative does not stand for; split its class."""
        abstract = self.symbols.abstract

        def value(i: int) -> bool:
            return self.oracle.accepts(abstract(word[:i]) + word[i:])

        i = change_point(0, len(word), value)
        self._split(word[i], abstract(word[:i]), word[i + 1:])

    def _split(self, char: str, before: str, after: str) -> None:
        symbol = self.symbols.symbol_of(char)
        point = boundary(self.symbols, char, before, after, self.oracle)
        self.tree.add_symbol(self.symbols.split(symbol, point))
        self.splits += 1

    # -- the result -------------------------------------------------------------------------------
    def result(self, interior_probes: int) -> LearnedModel:
        spec = self.spec
        hypothesis = self.hypothesis or empty(spec.alphabet)
        model = Language(minimise(hypothesis), alphabet_name=spec.alphabet_name)
        confirmed = sorted(self.confirmed, key=lambda w: (len(w), w))
        return LearnedModel(
            model=model, specification=spec, wrongly_accepted=model - spec,
            wrongly_rejected=spec - model, states=model.states,
            hypothesis_states=hypothesis.n_states, equals_specification=model.equivalent(spec),
            classes=tuple(self.classes),
            interior_probes=interior_probes, extra_states=self.extra_states,
            conformance_depth=self.depth if self.hypothesis is not None else None,
            confirmed_differences=tuple(confirmed), queries=self.oracle.queries,
            rounds=self.oracle.rounds, seconds=self.oracle.seconds,
            counterexamples=self.counterexamples, splits=self.splits,
            budget_exhausted=self.exhausted, counterexample_pending=self.pending)

