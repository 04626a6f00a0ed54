"""Shard execution (pfuzz.scale): in-process and on Dask give the same results in order;
a state folder resumes an interrupted run; a worker killed mid-run changes nothing."""

import os
from pathlib import Path

import pytest

from pfuzz.errors import ScaleError
from pfuzz.scale import RunSettings, run_shards

SHARDS = [{"id": i, "start": 10 * i, "stop": 10 * i + 10} for i in range(12)]


def square_sum(shard: dict, offset: int) -> dict:
    """A pure shard function: the sum of squares of its range, plus a shared offset."""
    return {"id": shard["id"], "sum": sum(k * k for k in range(shard["start"], shard["stop"])) + offset}


def expected(offset: int) -> list[dict]:
    # Reference: the closed form sum_{k<n} k^2 = (n-1)n(2n-1)/6 (common practice).
    def upto(n):
        return (n - 1) * n * (2 * n - 1) // 6
    return [{"id": s["id"], "sum": upto(s["stop"]) - upto(s["start"]) + offset} for s in SHARDS]


class Interrupted(Exception):
    pass


def fail_after_five(shard: dict, offset: int) -> dict:
    if shard["id"] >= 5:
        raise Interrupted
    return square_sum(shard, offset)


def die_once(shard: dict, marker: str, offset: int) -> dict:
    """Kills its worker process the first time it sees shard 3 (the marker file remembers)."""
    if shard["id"] == 3 and not os.path.exists(marker):
        Path(marker).write_text("died")
        os._exit(1)
    return square_sum(shard, offset)


def test_in_process_results_are_in_shard_order():
    seen = []
    results = run_shards(square_sum, SHARDS, (5,), settings=RunSettings(workers=0),
                         on_result=lambda shard, result: seen.append(shard["id"]))
    assert results == expected(5) and sorted(seen) == list(range(12))


def test_a_state_folder_resumes_only_the_missing_shards(tmp_path):
    settings = RunSettings(workers=0, state_dir=str(tmp_path / "state"))
    with pytest.raises(Interrupted):
        run_shards(fail_after_five, SHARDS, (1,), settings=settings, fingerprint="f")
    assert len(list((tmp_path / "state").glob("shard-*.json"))) == 5
    ran = []
    results = run_shards(lambda s, o: ran.append(s["id"]) or square_sum(s, o), SHARDS, (1,),
                         settings=settings, fingerprint="f")
    assert results == expected(1) and ran == list(range(5, 12))


def test_a_state_folder_of_another_plan_is_refused(tmp_path):
    settings = RunSettings(workers=0, state_dir=str(tmp_path))
    run_shards(square_sum, SHARDS, (1,), settings=settings, fingerprint="one")
    with pytest.raises(ScaleError, match="another run"):
        run_shards(square_sum, SHARDS, (1,), settings=settings, fingerprint="two")


def test_local_dask_cluster_gives_the_same_results_after_a_worker_dies(tmp_path):
    marker = str(tmp_path / "died")
    results = run_shards(die_once, SHARDS, (marker, 7), settings=RunSettings(workers=2))
    assert Path(marker).exists()  # the worker really died once
    assert [{"id": r["id"], "sum": r["sum"]} for r in results] == expected(7)
