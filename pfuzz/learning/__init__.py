"""Learning: inferring a black-box validator's automaton from its answers.

Takes a membership oracle (a function that answers, for a batch of strings, which ones the
validator accepts) and the specification ``Language``; gives a ``LearnedModel``: the
validator's language as an automaton over symbol classes, compared exactly with the
specification, with the guarantee it rests on. It knows nothing of how a target is run.

    learn(ask, specification, *, alphabet=None, extra_characters="", interior_probes=2,
          extra_states=1, max_queries=200_000, max_states=2_000, max_seconds=None,
          extra_tests=(), seed=0) -> LearnedModel

- ``ask(strings: Sequence[str]) -> Sequence[bool]``: one round of membership queries (True
  accepts). Each distinct string is asked once; answers are remembered.
- ``alphabet`` widens the specification's alphabet (characters it does not use lead to
  rejection in the specification); ``extra_characters`` are added to the alphabet too, each as
  a class of its own (hostile characters: a final newline, a no-break space, ...).
- ``interior_probes``: characters drawn (from ``seed``) inside each class, besides the edges of
  its ranges, and asked in place of the class's representative.
- ``extra_states``: the model is tested to be exact for validators with up to this many more
  states than it has (``LearnedModel.conformance_depth`` says how far testing got).
- ``max_queries``, ``max_states``, ``max_seconds``: budgets; when one runs out, learning stops
  with what it has and ``LearnedModel.budget_exhausted`` names it. A validator that is not
  regular (balanced brackets) always ends this way, never in a hang.
- ``extra_tests``: strings to test the final model with (the audit's cases); those with
  characters outside the alphabet are left out.

Method (each module names its sources): Kearns–Vazirani discrimination trees with
Rivest–Schapire counterexample processing (``discrimination``), symbol classes split by
bisection in the manner of symbolic automata learning (``symbols``), equivalence by exact
comparison with the specification and by Wp-method state tests (``conformance``), the loop
(``learner``).

The loop is this project's own; AALpy 2.0 (a general automata-learning library on PyPI) was
tried and not adopted. Measured on a 49-state target (a regex validator over 8 classes of
printable ASCII, Python 3.11, one core): AALpy's KV with Rivest–Schapire needed 169,527
validator calls (1.7 s) to learn it with a perfect equivalence oracle, since its ``SUL`` asks the
output after every character; with the ``SUL`` cut to one call per word (and its cache off,
which that breaks) 40,674 calls (0.25 s), L* 14,671 (0.17 s); its Wp-method oracle for one extra
state then asked 2,133,461 more (6.5-8 s). This package learns the same target with 8,253
distinct queries in 0.09 s (the specification being the target's own pattern), including its
own equivalence checks against the specification and
the probes of every class, and with 61,124 in 1.7 s when the model is also tested for one extra
state. Beyond the numbers: AALpy asks one word at a time through ``SUL.query`` (no batches, so a
command target could not answer a round at a time), would need the symbol classes and the
specification-guided equivalence oracle written around it anyway (they are most of this
package), and brings pydot and pyparsing with it.
"""

from pfuzz.learning.learner import (DEFAULT_EXTRA_STATES, DEFAULT_INTERIOR_PROBES,
                                    DEFAULT_MAX_QUERIES, DEFAULT_MAX_STATES, learn)
from pfuzz.learning.model import LearnedModel
from pfuzz.learning.symbols import SymbolClass

__all__ = ["learn", "LearnedModel", "SymbolClass", "DEFAULT_EXTRA_STATES",
           "DEFAULT_INTERIOR_PROBES", "DEFAULT_MAX_QUERIES", "DEFAULT_MAX_STATES"]
