"""pfuzz: valid and near-miss test data for input validators, from patterns.

A pattern (Python ``re`` syntax, the regular subset) is compiled to its
minimal DFA over an alphabet of characters. From that automaton pfuzz counts
the accepted strings of each length exactly, samples them uniformly by
length, builds near-miss rejects from the complement intersected with the
edit neighbourhood, and writes boundary suites and paired corpora.

    >>> import pfuzz
    >>> lang = pfuzz.compile(r"[A-Z]{2}[0-9]{4}")
    >>> lang.accepts("AB1234")
    True
"""

from pfuzz.base.charset import CharSet, ALPHABETS
from pfuzz.automata.dfa import DEFAULT_STATE_CAP, DFA
from pfuzz.errors import (ArgumentError, EmptyLanguageError, GraphvizError, NotInLanguageError, PatternError,
                     PfuzzError, ProfileError, RankOutOfRangeError, StateLimitError, TargetError,
                     AlphabetError)
from pfuzz.language import Language, compile

__version__ = "0.1.0"

__all__ = [
    "ArgumentError", "CharSet", "DFA", "DEFAULT_STATE_CAP", "EmptyLanguageError", "GraphvizError",
    "Language", "NotInLanguageError", "PatternError", "PfuzzError", "ProfileError",
    "RankOutOfRangeError", "StateLimitError", "TargetError", "ALPHABETS", "AlphabetError", "compile",
    "__version__",
]
