"""Construction: a syntax tree to its minimal DFA, every assertion and capture made exact.

`compiler` is the entry point (`compile_dfa`, `compile_tree`, `in_mode`); `simplify` rewrites the
tree; `registers` expands what groups capture into the NFA, keeping what `liveness` says is
still read; `lookback` runs the contexts and the
lookbehind trackers along the prefix; `determinise` is the subset construction over threads that
carry `obligations`; `compilation` is the judge that says what each assertion adds, across the
explicit `protocol` between it and the determiniser."""

__all__: list[str] = []
