"""Scale-out: independent shards of rank ranges, run in one process or on a Dask cluster.

Takes a list of shards (small JSON-able descriptions, each a pure function of the
specification, its rank range and the seed) and a module-level function that checks
one shard; gives the shards' results in order, recording each as it finishes so an
interrupted run resumes where it stopped. Dask (``pip install 'pfuzz[scale]'``) is
optional: without it, or with ``workers=0``, shards run in this process.
"""

from pfuzz.scale.executor import RunSettings, run_shards

__all__ = ["RunSettings", "run_shards"]
