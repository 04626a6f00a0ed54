"""Memory estimates, checked before big allocations.

A request that would need more memory than the budget is refused with a
``ResourceLimitError`` before anything is allocated, instead of growing until the
operating system stops the process (or Python raises ``MemoryError`` half-way).
The error says what would be held, how much that is, the budget, and what to ask
for instead.

Budget (``memory_budget``): half the machine's physical memory, or the process's
own limit (``RLIMIT_AS`` / ``RLIMIT_DATA``, as ``ulimit -v`` / ``-d`` set it) when
that is lower. Half, because the estimates cover the dominant term only (the strings
a step holds), not the interpreter and the tables beside them.

Estimates are upper bounds of that dominant term, from CPython's object layout:
a ``str`` of n characters takes at most 80 bytes of header plus n bytes (code points
below U+0100), 2n (below U+10000) or 4n, and a list slot 8 more
(``string_bytes``). Cost: a few arithmetic operations.
"""

from __future__ import annotations

import os

from pfuzz.errors import ResourceLimitError

__all__ = ["REJECT_BYTES", "memory_budget", "require_memory", "size_text", "string_bytes"]

#: Bytes of a ``str`` object beyond its characters, and of its slot in a list (upper bound).
STRING_OVERHEAD = 80 + 8
#: Bytes of a near-miss reject beside its text and witness: its kinds, edit script and the
#: object itself (about 0.45 KB, measured with ``tracemalloc`` over 10^5 rejects).
REJECT_BYTES = 450


def string_bytes(length: int, widest_point: int = 0x7F) -> int:
    """Upper bound of the memory a list of one ``str`` of ``length`` characters takes, when
    no character is above ``widest_point``."""
    width = 1 if widest_point < 0x100 else 2 if widest_point < 0x10000 else 4
    return STRING_OVERHEAD + length * width


def _process_limit() -> int | None:
    try:
        import resource
    except ImportError:                     # not POSIX
        return None
    limits = []
    for name in ("RLIMIT_AS", "RLIMIT_DATA"):
        if hasattr(resource, name):
            soft, _hard = resource.getrlimit(getattr(resource, name))
            if soft != resource.RLIM_INFINITY and soft > 0:
                limits.append(soft)
    return min(limits) if limits else None


def _physical_memory() -> int | None:
    try:
        return os.sysconf("SC_PHYS_PAGES") * os.sysconf("SC_PAGE_SIZE")
    except (AttributeError, ValueError, OSError):
        return None


def memory_budget() -> tuple[int, str]:
    """(bytes, where that number comes from) of the memory one request may plan to hold."""
    process, machine = _process_limit(), _physical_memory()
    if process is not None and (machine is None or process < machine // 2):
        return process, "the process's memory limit (ulimit)"
    if machine is not None:
        return machine // 2, "half of this machine's memory"
    return 8 << 30, "an assumed 8 GiB (this system does not say its memory)"


#: Binary units, smallest first, with their powers of two.
UNITS = (("KiB", 10), ("MiB", 20), ("GiB", 30), ("TiB", 40), ("PiB", 50))


def size_text(n: int) -> str:
    """Bytes as a person reads them: "512 bytes", "3.2 MiB", "8.0 PiB"."""
    if n < 1024:
        return f"{n:,} bytes"
    unit, shift = next(((u, s) for u, s in UNITS if n < 1 << (s + 10)), UNITS[-1])
    return f"{n / (1 << shift):,.1f} {unit}"


def require_memory(needed: int, what: str, advice: str) -> None:
    """Raise ``ResourceLimitError`` when ``needed`` bytes (for ``what``) is past the budget.

    ``what`` says what would be held ("10,000,000 valid strings of up to 20,000
    characters"); ``advice`` how to ask for less ("lower valid or max_length")."""
    budget, source = memory_budget()
    if needed > budget:
        raise ResourceLimitError(
            f"not enough memory for {what}: about {size_text(needed)}, past the limit of "
            f"{size_text(budget)} ({source}); {advice}")
