"""The fuzz driver (``driver.py``) as a test: no traceback, no exit status but 0, 1, 2.

Opt-in (``python -m pytest tests/fuzz -m fuzz``); ``PFUZZ_FUZZ_CASES`` sets the number of
patterns and of profiles (300 each by default), ``PFUZZ_FUZZ_SEED`` the seed. For the full
figures run the driver itself: ``python tests/fuzz/driver.py --profiles 10000 --patterns 10000``.
"""

from __future__ import annotations

import os

import pytest

from driver import run_kind

CASES = int(os.environ.get("PFUZZ_FUZZ_CASES", "300"))
SEED = int(os.environ.get("PFUZZ_FUZZ_SEED", "0"))


@pytest.mark.fuzz
@pytest.mark.parametrize("kind", ["pattern", "profile"])
def test_no_command_ends_in_a_traceback_or_a_stray_status(kind):
    lines: list[str] = []
    outcome = run_kind(kind, CASES, SEED, (1, 1), timeout=20.0, only=None, report=lines.append)
    assert outcome.cases == CASES
    assert outcome.failures == [], "\n".join(lines)
