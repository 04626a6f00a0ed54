"""Boundary: deterministic QA suites from a DFA (shortest paths, range edges, length edges, exits).

Takes a minimal DFA; gives cases with expected verdicts. Makes no random choice."""

__all__: list[str] = []
