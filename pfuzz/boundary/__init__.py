"""Boundary: deterministic QA suites from a DFA (shortest paths, length edges, position-aware edges).

Takes a minimal DFA; gives cases with expected verdicts, each invalid one with a valid string one
edit away: ``paths`` (shortest prefixes and completions, lengths, transition cover), ``edges``
(the edges of every (state, range) in place), ``suite`` (order, merging, limit). Makes no random
choice."""

__all__: list[str] = []
