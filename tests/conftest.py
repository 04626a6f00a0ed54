"""pytest configuration for the whole suite.

This file puts the tests directory on ``sys.path`` (pytest's default
``prepend`` import mode adds the directory of a top-level conftest), so every
test, also those in tests/external/, imports the shared ``helpers`` module.

Hypothesis profiles (DEVELOPERS.md, "Set up"):

- ``ci``, the default: derandomised (the examples are a function of each
  test's source, so every run on every machine draws the same ones), no
  example database, and no deadline (a deadline is a wall-clock check).
- ``thorough`` (``--hypothesis-profile=thorough``), for local runs: fresh
  random examples, the local example database (a failure found is replayed
  first next time), and ``THOROUGH_FACTOR`` times the examples each test asks
  for, at least ``THOROUGH_EXAMPLES``.
"""

from __future__ import annotations

from hypothesis import settings

THOROUGH_FACTOR = 10
THOROUGH_EXAMPLES = 1_000

settings.register_profile("ci", derandomize=True, database=None, deadline=None)
settings.register_profile("thorough", derandomize=False, deadline=None,
                          max_examples=THOROUGH_EXAMPLES)
# Loaded here, before the test modules are imported, so the settings objects they build
# inherit it; Hypothesis's own plugin then loads --hypothesis-profile when one is given.
settings.load_profile("ci")


def pytest_collection_modifyitems(config, items):
    """Under ``thorough``, raise the examples of tests that fix their own ``max_examples``
    (an explicit value would otherwise win over the profile's)."""
    if config.getoption("hypothesis_profile", None) != "thorough":
        return
    for item in items:
        test = getattr(getattr(item, "obj", None), "__func__", getattr(item, "obj", None))
        chosen = getattr(test, "_hypothesis_internal_use_settings", None)
        if chosen is None:
            continue
        examples = max(chosen.max_examples * THOROUGH_FACTOR, THOROUGH_EXAMPLES)
        test._hypothesis_internal_use_settings = settings(chosen, max_examples=examples)
