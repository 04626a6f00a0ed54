"""The fuzz run is opt-in: its tests carry the ``fuzz`` mark and are skipped unless the
mark is selected (``python -m pytest tests/fuzz -m fuzz``)."""

from __future__ import annotations

import pytest


def pytest_configure(config):
    config.addinivalue_line("markers", "fuzz: the fuzz driver's run (opt-in: -m fuzz)")


def pytest_collection_modifyitems(config, items):
    if "fuzz" in (config.getoption("markexpr") or ""):
        return
    skip = pytest.mark.skip(reason="the fuzz run is opt-in: python -m pytest tests/fuzz -m fuzz")
    for item in items:
        if "fuzz" in item.keywords:
            item.add_marker(skip)
