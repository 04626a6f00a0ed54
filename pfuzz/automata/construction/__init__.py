"""Construction: a pattern to its DFA, with anchors and lookaheads carried as obligations.

`compiler` builds the NFA and drives `determinise`, the subset construction over threads grouped
by the obligations they carry."""

__all__: list[str] = []
