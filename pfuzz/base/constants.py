"""Facts shared by several stages, each defined once: edit kinds, call modes, length spans.

Data only; every stage imports what it needs from here rather than defining its own copy.
"""

__all__ = ["EDIT_KINDS", "CALL_MODES", "UNBOUNDED_SPAN", "COUNT_SPAN"]

#: The single-character edits of the optimal-string-alignment distance, in the
#: order reports list them: delete, insert, replace, and swap of two neighbours.
EDIT_KINDS = ("delete", "insert", "replace", "swap")

#: How validator code calls a pattern: ``re.fullmatch``, ``re.match`` or ``re.search``.
CALL_MODES = ("fullmatch", "match", "search")

#: For a language without a longest string, sampling, boundary suites and corpora
#: look at most this many characters above the shortest length considered.
UNBOUNDED_SPAN = 32

#: Lengths that ``diff`` counts past the shortest length of an unbounded difference:
#: smaller than UNBOUNDED_SPAN because a difference is counted per length for two
#: products at once and shown in a table a person reads.
COUNT_SPAN = 16
