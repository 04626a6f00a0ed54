"""Learning: queries, rounds and time to learn a model of a validator, for every standard field.

For every field of every profile in ``profiles/``, ``pfuzz.learning.learn`` is run with its
defaults against two Python validators called in this process (so the figures are the
learner's own, not a target's start-up or transport):

- ``correct``: the field's own rules, as a developer would write them with ``re``:
  ``re.fullmatch`` of the field's pattern with its flags, of each ``require`` pattern and of no
  ``forbid`` pattern, and the field's length bounds. Its language is the field's.
- ``edge moved``: the same with the first character range of the pattern ending one
  character lower (``[0-9]`` becomes ``[0-8]``, ``[ -~]`` becomes ``[ -}]``), a regular bug.

Columns: the specification's states; the model's states; ``equal``, whether the model equals
the specification; ``exact``, whether it equals the validator's true language (the field
rebuilt with the moved edge, compiled by ``pfuzz``, compared with ``distinguish``);
``queries`` (distinct strings asked), ``rounds`` (batches), ``depth`` (extra states the model
was tested for, of 1), the budget that ran out if any, and CPU seconds
(``time.process_time``, the steadier figure on a shared machine). ``--quick`` learns each
field against the correct validator only, with a budget of 20,000 queries.
"""

from __future__ import annotations

import dataclasses
import re
import time

from pfuzz.learning import learn
from pfuzz.profile import shipped
from pfuzz.profile.loader import Field, load_profile

QUICK_QUERIES = 20_000
#: A range inside a character class: its low end, the hyphen, its high end (no escapes).
RANGE = re.compile(r"(?<=[^\\])([^\\\]\[])-([^\\\]\[])(?=[^\]]*\])")


def moved_edge(pattern: str) -> str | None:
    """``pattern`` with its first class range ending one character lower (None: no range)."""
    found = RANGE.search(pattern)
    if found is None or ord(found.group(2)) <= ord(found.group(1)):
        return None
    lowered = chr(ord(found.group(2)) - 1)
    return pattern[:found.start(2)] + lowered + pattern[found.end(2):]


def validator(field: Field):
    """The field's rules written with ``re``: a correct validator of ``field.language()``."""
    flags = field.flag_bits
    main = re.compile(field.pattern, flags)
    required = [re.compile(p, flags) for p in field.require]
    forbidden = [re.compile(p, flags) for p in field.forbid]
    low, high = field.min_length or 0, field.max_length

    def accepts(text: str) -> bool:
        return (main.fullmatch(text) is not None and all(r.fullmatch(text) for r in required)
                and not any(f.fullmatch(text) for f in forbidden)
                and low <= len(text) and (high is None or len(text) <= high))

    return lambda strings: [accepts(s) for s in strings]


def _row(label: str, field: Field, kind: str, truth: Field, quick: bool) -> dict:
    spec = field.language()
    options = {"max_queries": QUICK_QUERIES} if quick else {}
    start = time.process_time()
    model = learn(validator(truth), spec, **options)
    seconds = time.process_time() - start
    return {"field": label, "validator": kind, "spec_states": spec.states,
            "model_states": model.states, "equal": model.equals_specification,
            "exact": model.model.equivalent(truth.language()), "queries": f"{model.queries:,}",
            "rounds": f"{model.rounds:,}", "depth": model.conformance_depth,
            "budget": model.budget_exhausted or "", "cpu_s": f"{seconds:.2f}"}


def run(quick: bool) -> list[dict]:
    rows = []
    for path in sorted(shipped.folder().glob(f"*{shipped.SUFFIX}")):
        for field in load_profile(path).fields:
            label = f"{path.stem}: {field.name}"
            rows.append(_row(label, field, "correct", field, quick))
            bug = moved_edge(field.pattern)
            if bug is not None and not quick:
                rows.append(_row(label, field, f"edge moved: {bug[:40]}",
                                 dataclasses.replace(field, pattern=bug), quick))
    return rows
