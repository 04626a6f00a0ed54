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

What users receive is exported here; the stage packages below it (``base``,
``syntax``, ``automata``, ``counting``, ``nearmiss``, ``boundary``, ``profile``,
``corpus``, ``audit``) are the pipeline's rooms, importable but not the API.
"""

from pfuzz.automata.dfa import DEFAULT_STATE_CAP, DFA
from pfuzz.base.charset import ALPHABETS, CharSet
from pfuzz.boundary.suite import Case
from pfuzz.errors import (AlphabetError, ArgumentError, CorpusExistsError, EmptyLanguageError,
                          GraphvizError, NotInLanguageError, OutputError, PatternError,
                          PfuzzError, PfuzzWarning, ProfileError, RankOutOfRangeError,
                          ResourceLimitError, StateLimitError, TargetError)
from pfuzz.language import Language, compile
from pfuzz.nearmiss.edits import Edit, Explanation
from pfuzz.nearmiss.rejects import Reject

__version__ = "0.1.0"

__all__ = [
    "ALPHABETS", "AlphabetError", "ArgumentError", "Case", "CharSet", "CorpusExistsError", "DFA",
    "DEFAULT_STATE_CAP", "Edit", "EmptyLanguageError", "Explanation", "GraphvizError", "Language",
    "NotInLanguageError", "OutputError", "PatternError", "PfuzzError", "PfuzzWarning",
    "ProfileError", "RankOutOfRangeError", "Reject", "ResourceLimitError", "StateLimitError",
    "TargetError", "compile", "__version__",
]
