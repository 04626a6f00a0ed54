"""pytest configuration for the whole suite.

This file puts the tests directory on ``sys.path`` (pytest's default
``prepend`` import mode adds the directory of a top-level conftest), so every
test, also those in tests/external/, imports the shared ``helpers`` module.
"""
