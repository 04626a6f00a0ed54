"""Fuzz driver: random profiles and random patterns through the command line, in process.

    python tests/fuzz/driver.py --profiles 10000 --patterns 10000 [--seed 0] [--slice 2/8]
    python -m pytest tests/fuzz -m fuzz          (300 of each; skipped in the default run)

Every case is a command line built from one seeded ``random.Random`` (the case's own
seed, ``SEED:kind:INDEX``, so any case can be replayed alone with ``--only``), run by
click's test runner inside this process. A case *fails* when a command lets an
exception other than ``SystemExit`` escape (a traceback) or exits with a status
other than 0, 1 or 2. Cases that run past ``--timeout`` seconds (SIGALRM) are
counted apart as slow: slowness is a separate finding, not a crash.

Patterns come from a small grammar of Python ``re`` syntax (literals including
specials, control and non-ASCII characters, classes, category escapes, anchors,
groups of every kind, lookarounds, back-references, inline flags, quantifiers
lazy and possessive, alternation) with a dash of raw junk. They go through
``info``, ``count``, ``sample``, ``reject``, ``explain``, ``diff`` and ``draw``
with random alphabets, flags, state caps and length bounds.

Profiles are drawn as tables of known and unknown keys whose values are of every
TOML type (huge and negative integers, floats, dates, nested arrays and inline
tables), written as TOML text, then sometimes damaged byte-wise (a byte-order mark,
invalid UTF-8, a NUL, a truncation, deep nesting). They go through ``corpus`` (with
``--force`` and a state cap at times) and ``audit --regex``.

The process's address space is limited (``--memory``, 3 GiB by default) so that
a request past pfuzz's own estimates ends in ``MemoryError``, which pfuzz must
report as one line with status 2, instead of in the machine's out-of-memory killer.
"""

from __future__ import annotations

import argparse
import resource
import shutil
import signal
import sys
import tempfile
import time
import traceback
from dataclasses import dataclass, field
from pathlib import Path

from click.testing import CliRunner

sys.path.insert(0, str(Path(__file__).resolve().parent))

from generate import pattern_case, profile_case  # noqa: E402

from pfuzz.cli import main  # noqa: E402

ALLOWED_STATUS = (0, 1, 2)


class CaseTimeout(BaseException):
    """Raised by SIGALRM when a case runs past its time."""


def _alarm(_number, _frame):
    raise CaseTimeout()


@dataclass
class Outcome:
    """What one kind of case did."""

    cases: int = 0
    by_status: dict = field(default_factory=dict)
    slow: list = field(default_factory=list)
    failures: list = field(default_factory=list)
    seconds: float = 0.0


def run_case(args: list[str], files: dict[str, bytes], folder: Path, timeout: float):
    """(status or "slow" or "traceback", detail) of one command line. ``files`` are written
    into ``folder`` first; ``{dir}`` in an argument names ``folder``."""
    for name, data in files.items():
        (folder / name).write_bytes(data)
    argv = [a.replace("{dir}", str(folder)) for a in args]
    signal.signal(signal.SIGALRM, _alarm)
    signal.setitimer(signal.ITIMER_REAL, timeout)
    try:
        result = CliRunner().invoke(main, argv, catch_exceptions=True)
    except CaseTimeout:
        return "slow", ""
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
    if result.exception is not None and not isinstance(result.exception, SystemExit):
        trace = "".join(traceback.format_exception(*result.exc_info))
        return "traceback", trace[-3000:]
    if "CaseTimeout" in result.output:  # the timer fired in a finaliser ("Exception ignored in")
        return "slow", ""
    if "Traceback (most recent call last)" in result.output:
        return "traceback", result.output[-3000:]
    return result.exit_code, ""


def run_kind(kind: str, count: int, seed: int, part: tuple[int, int], timeout: float,
             only: int | None, report) -> Outcome:
    make = pattern_case if kind == "pattern" else profile_case
    outcome = Outcome()
    indices = [only] if only is not None else [i for i in range(count)
                                               if i % part[1] == part[0] - 1]
    started = time.monotonic()
    with tempfile.TemporaryDirectory(prefix=f"pfuzz-fuzz-{kind}-") as scratch:
        for n, index in enumerate(indices):
            folder = Path(scratch) / str(index)
            folder.mkdir()
            args, files = make(seed, index)
            status, detail = run_case(args, files, folder, timeout)
            shutil.rmtree(folder, ignore_errors=True)
            outcome.cases += 1
            outcome.by_status[status] = outcome.by_status.get(status, 0) + 1
            if status == "slow":
                outcome.slow.append(index)
            elif status not in ALLOWED_STATUS:
                outcome.failures.append((index, status, args, detail))
                report(f"FAIL {kind} #{index}: status {status}: {_shown(args)}\n{detail}")
            if (n + 1) % 500 == 0:
                report(f"  {kind}: {n + 1:,} of {len(indices):,} cases, "
                       f"{time.monotonic() - started:,.0f} s, statuses {outcome.by_status}")
    outcome.seconds = time.monotonic() - started
    return outcome


def _shown(args: list[str]) -> str:
    return " ".join(repr(a) if len(a) < 200 else repr(a[:200]) + "..." for a in args)


def limit_memory(gib: float) -> None:
    limit = int(gib * (1 << 30))
    soft, hard = resource.getrlimit(resource.RLIMIT_AS)
    if hard != resource.RLIM_INFINITY:
        limit = min(limit, hard)
    resource.setrlimit(resource.RLIMIT_AS, (limit, hard))


def main_(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--profiles", type=int, default=1000)
    parser.add_argument("--patterns", type=int, default=1000)
    parser.add_argument("--seed", type=int, default=0)
    parser.add_argument("--slice", default="1/1", help="K/M: run the K-th of M slices")
    parser.add_argument("--timeout", type=float, default=20.0, help="seconds per case")
    parser.add_argument("--memory", type=float, default=3.0, help="GiB of address space")
    parser.add_argument("--only", type=int, default=None, help="replay one case index")
    options = parser.parse_args(argv)
    part = tuple(int(x) for x in options.slice.split("/"))
    limit_memory(options.memory)
    say = lambda text: print(text, flush=True)  # noqa: E731
    total_failures = 0
    for kind, count in (("pattern", options.patterns), ("profile", options.profiles)):
        if not count:
            continue
        outcome = run_kind(kind, count, options.seed, part, options.timeout, options.only, say)
        total_failures += len(outcome.failures)
        say(f"{kind}s: {outcome.cases:,} cases in {outcome.seconds:,.0f} s; exit statuses "
            f"{dict(sorted(outcome.by_status.items(), key=str))}; failures "
            f"{len(outcome.failures)}; slow (> {options.timeout:g} s) {len(outcome.slow)}"
            + (f" {outcome.slow[:20]}" if outcome.slow else ""))
    return 1 if total_failures else 0


if __name__ == "__main__":
    sys.exit(main_())
