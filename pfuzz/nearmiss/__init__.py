"""Near misses: the edit neighbourhood of a language minus the language, and nearest witnesses.

Takes a minimal DFA; gives the near-miss DFA, sampled rejects, and for each reject its nearest
valid string with the edit script between them."""

__all__: list[str] = []
