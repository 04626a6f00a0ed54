"""Counting: exact per-length counts of a DFA, rank/unrank, enumeration and uniform sampling.

Takes a minimal DFA; gives counts, ranks, strings in shortlex order and samples uniform by length
(exact big-integer tables, or numpy float tables for bulk draws)."""

__all__: list[str] = []
