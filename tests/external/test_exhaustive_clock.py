"""Exhaustive audit of a clock field (hh:mm, 24-hour) with a planted bug: hour 24 accepted.

References, computed without pfuzz:
- the affected strings are "24:00" .. "24:59", formatted with Python's str.format (the
  bug's own definition: a validator regex that also allows hour 24);
- the number of valid strings is 24 * 60 = 1,440 (ISO 8601 times of day hh:mm, 00:00..23:59);
- the exact difference between the specification and the validator's regex, from
  ``pfuzz diff``'s comparison, agrees with both.
The same report comes from one process, a local Dask cluster of 1 and 2 workers, and a
Dask scheduler and worker started by hand.
"""

import functools
import re
import subprocess
import sys
import time

import pytest

import pfuzz
from pfuzz.audit.comparison import compare
from pfuzz.audit.exhaustive import plan_exhaustive, run_exhaustive
from pfuzz.audit.targets import RegexTarget
from pfuzz.base.charset import ALPHABETS
from pfuzz.errors import ResourceLimitError
from pfuzz.scale import RunSettings

SPEC = r"([01][0-9]|2[0-3]):[0-5][0-9]"
BUGGY = r"([01][0-9]|2[0-4]):[0-5][0-9]"
HOUR_24 = [f"24:{minute:02d}" for minute in range(60)]


@pytest.fixture(scope="module")
def plan():
    return plan_exhaustive(pfuzz.compile(SPEC), ALPHABETS["printable"], distance=1,
                           shard_size=200_000)


def buggy_target():
    return functools.partial(RegexTarget, BUGGY, "fullmatch")


def check_report(result):
    assert result.plan.valid_cases == 24 * 60
    assert result.wrong_accepts == HOUR_24 and result.wrong_accept_total == 60
    assert result.wrong_rejects == [] and not result.errors
    assert result.checked == result.plan.cases


def test_the_planted_bug_is_exactly_the_sixty_strings(plan):
    result = run_exhaustive(plan, buggy_target(), settings=RunSettings(workers=0))
    check_report(result)
    difference = compare(pfuzz.compile(BUGGY), pfuzz.compile(SPEC), max_length=5)
    assert list(difference.only_a.examples) == HOUR_24[:len(difference.only_a.examples)]
    assert sum(difference.only_a.counts.values()) == 60
    assert all(re.fullmatch(BUGGY, s) and not re.fullmatch(SPEC, s) for s in result.wrong_accepts)


@pytest.mark.parametrize("workers", [1, 2])
def test_local_cluster_gives_the_same_report(plan, workers):
    check_report(run_exhaustive(plan, buggy_target(), settings=RunSettings(workers=workers)))


def test_a_scheduler_started_by_hand_gives_the_same_report(plan, tmp_path):
    address_file = tmp_path / "scheduler.json"
    dask = [sys.executable, "-m", "distributed.cli.dask_scheduler"]
    scheduler = subprocess.Popen(dask + ["--scheduler-file", str(address_file), "--port", "0",
                                         "--no-dashboard"], stderr=subprocess.DEVNULL)
    worker = None
    try:
        deadline = time.monotonic() + 60
        while not address_file.exists() and time.monotonic() < deadline:
            time.sleep(0.2)
        worker = subprocess.Popen([sys.executable, "-m", "distributed.cli.dask_worker",
                                   "--scheduler-file", str(address_file), "--nworkers", "1",
                                   "--nthreads", "1", "--no-dashboard"], stderr=subprocess.DEVNULL)
        import json
        address = json.loads(address_file.read_text())["address"]
        from distributed import Client
        with Client(address, timeout="30s") as client:
            client.wait_for_workers(1, timeout=60)
        check_report(run_exhaustive(plan, buggy_target(), settings=RunSettings(scheduler=address)))
    finally:
        for process in (worker, scheduler):
            if process is not None:
                process.terminate()
                process.wait(timeout=30)


def test_too_many_cases_is_refused_with_the_count():
    with pytest.raises(ResourceLimitError, match="1,025,460 cases"):
        plan_exhaustive(pfuzz.compile(SPEC), ALPHABETS["printable"], max_cases=1000)
