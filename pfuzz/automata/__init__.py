"""Automata: syntax tree to minimal DFA, and what can be done with DFAs.

Takes a syntax tree; gives the immutable `DFA` value (Thompson NFA, subset construction with
obligations, minimisation), its boolean algebra, simulation orders, patterns back from automata
(state elimination) and drawings."""

__all__: list[str] = []
