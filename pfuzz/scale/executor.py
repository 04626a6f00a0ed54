"""Run shards in order-independent pieces: in this process, on an embedded local Dask cluster,
or on an existing Dask scheduler; record finished shards so a rerun does only the missing ones.

Why Dask (``dask.distributed``): it gives, from one API, an embedded cluster of worker
processes on this machine (one per core) and a client for a remote cluster, with
retries of tasks whose worker died. A shard is a pure function of (specification,
rank range, seed), so a retried shard gives the same answer, and results stream
back with ``as_completed`` as they finish, carrying only disagreements, not every
verdict. Workers must run the same pfuzz and Python versions as the client: the
executor asks every worker before it submits anything and refuses otherwise.

Security: a Dask scheduler runs whatever code it is sent, and so does every worker.
Connect only to clusters you trust; Dask's TLS (``tls://`` addresses, with the
certificates named in Dask's configuration under ``distributed.comm.tls``) keeps
others off the wire.

Resuming: with ``state_dir``, the plan's fingerprint is written first and every
finished shard's result is written atomically as ``shard-N.json``; a rerun with the
same plan reads those back and submits only the rest, so its final result equals an
uninterrupted run's. A different plan in the same folder is refused.
"""

from __future__ import annotations

import hashlib
import json
import os
import sys
from dataclasses import dataclass
from pathlib import Path
from typing import Callable, Sequence

from pfuzz.base.files import write_atomic
from pfuzz.errors import ArgumentError, ScaleError

__all__ = ["RunSettings", "run_shards"]


@dataclass(frozen=True)
class RunSettings:
    """Where shards run: ``workers`` processes of an embedded cluster (None: one per core;
    0: this process, no Dask), or the Dask ``scheduler`` at an address; ``state_dir`` to resume."""

    workers: int | None = None
    scheduler: str | None = None
    state_dir: str | None = None

    def where(self) -> str:
        if self.scheduler:
            return f"Dask scheduler {self.scheduler}"
        if self.workers == 0 or not dask_available():
            return "this process"
        return f"a local Dask cluster of {self.workers or os.cpu_count() or 1} workers"


def dask_available() -> bool:
    try:
        import distributed  # noqa: F401
    except ImportError:
        return False
    return True


def run_shards(check: Callable, shards: Sequence[dict], shared: tuple = (), *,
               settings: RunSettings = RunSettings(), fingerprint: str = "",
               on_result: Callable[[dict, dict], None] | None = None) -> list[dict]:
    """``check(shard, *shared)`` for every shard; results in shard order.

    ``check`` must be a module-level function (workers import it by name) returning a
    JSON-able dict; ``fingerprint`` names what the plan was made from, so a state
    folder is never resumed against another specification. ``on_result`` sees each
    result as it arrives (progress)."""
    if settings.scheduler is None and settings.workers is not None and settings.workers < 0:
        raise ArgumentError(f"workers must be 0 or more, not {settings.workers}")
    store = _Store(settings.state_dir, shards, fingerprint) if settings.state_dir else None
    results: dict[int, dict] = store.finished() if store else {}
    for shard in shards:
        if shard["id"] in results and on_result:
            on_result(shard, results[shard["id"]])
    pending = [s for s in shards if s["id"] not in results]

    def record(shard: dict, result: dict) -> None:
        results[shard["id"]] = result
        if store:
            store.save(shard["id"], result)
        if on_result:
            on_result(shard, result)

    if pending:
        if settings.scheduler is None and (settings.workers == 0 or not dask_available()):
            for shard in pending:
                record(shard, check(shard, *shared))
        else:
            _run_on_dask(check, pending, shared, settings, record)
    return [results[s["id"]] for s in shards]


# -- Dask -----------------------------------------------------------------------------------

def _versions() -> tuple[str, str]:
    import pfuzz

    return pfuzz.__version__, "%d.%d" % sys.version_info[:2]


def _run_on_dask(check, pending, shared, settings: RunSettings, record) -> None:
    if not dask_available():
        raise ScaleError("--scheduler needs Dask: pip install 'pfuzz[scale]'")
    import logging

    from distributed import Client, LocalCluster, as_completed

    cluster = None
    try:
        if settings.scheduler:
            client = Client(settings.scheduler, timeout="10s")
        else:
            cluster = LocalCluster(n_workers=settings.workers or os.cpu_count() or 1,
                                   threads_per_worker=1, processes=True, dashboard_address=None,
                                   silence_logs=logging.ERROR)
            client = Client(cluster)
    except (OSError, TimeoutError) as error:
        raise ScaleError(f"cannot reach the Dask scheduler {settings.scheduler}: {error}") from None
    try:
        _check_versions(client)
        scattered = [client.scatter(item, broadcast=True) for item in shared]
        futures = {client.submit(check, shard, *scattered, pure=False, retries=3): shard
                   for shard in pending}
        for future in as_completed(futures):
            record(futures[future], future.result())
    finally:
        client.close()
        if cluster is not None:
            cluster.close()


def _check_versions(client) -> None:
    mine = _versions()
    theirs = client.run(_versions)
    if not theirs:
        raise ScaleError("the Dask cluster has no workers")
    wrong = {address: tuple(v) for address, v in theirs.items() if tuple(v) != mine}
    if wrong:
        listed = "; ".join(f"{a}: pfuzz {v[0]}, Python {v[1]}" for a, v in sorted(wrong.items()))
        raise ScaleError(f"workers must run pfuzz {mine[0]} on Python {mine[1]}, as this "
                         f"client does; these do not: {listed}")


# -- resuming -------------------------------------------------------------------------------

class _Store:
    """A folder of finished shard results for one plan."""

    def __init__(self, folder: str, shards: Sequence[dict], fingerprint: str):
        self.folder = Path(folder)
        self.folder.mkdir(parents=True, exist_ok=True)
        digest = hashlib.sha256(json.dumps([fingerprint, list(shards)], sort_keys=True)
                                .encode("utf-8")).hexdigest()
        plan = self.folder / "plan.json"
        if plan.exists():
            recorded = json.loads(plan.read_text(encoding="utf-8")).get("plan")
            if recorded != digest:
                raise ScaleError(f"{folder} holds the state of another run (a different "
                                 "specification, window or shard size); use a new folder")
        else:
            write_atomic(plan, json.dumps({"plan": digest, "shards": len(shards)}) + "\n")
        self.ids = {s["id"] for s in shards}

    def finished(self) -> dict[int, dict]:
        done = {}
        for path in self.folder.glob("shard-*.json"):
            try:
                number = int(path.stem.split("-", 1)[1])
                if number in self.ids:
                    done[number] = json.loads(path.read_text(encoding="utf-8"))
            except (ValueError, json.JSONDecodeError):
                continue  # a damaged record is simply redone
        return done

    def save(self, number: int, result: dict) -> None:
        write_atomic(self.folder / f"shard-{number}.json", json.dumps(result, ensure_ascii=False))
