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

import importlib

from pfuzz.errors import (AlphabetError, ArgumentError, CorpusExistsError, EmptyLanguageError,
                          GraphvizError, NotInLanguageError, OutputError, PatternError,
                          PfuzzError, PfuzzWarning, ProfileError, RankOutOfRangeError,
                          ResourceLimitError, StateLimitError, TargetError)

__version__ = "0.1.0"

#: The home of each other name exported here: imported on first use (PEP 562), so that
#: ``import pfuzz`` and short commands do not load every stage (nor numpy).
_HOMES = {
    "DEFAULT_STATE_CAP": "pfuzz.automata.dfa", "DFA": "pfuzz.automata.dfa",
    "ALPHABETS": "pfuzz.base.charset", "CharSet": "pfuzz.base.charset",
    "Case": "pfuzz.boundary.suite", "Language": "pfuzz.language", "compile": "pfuzz.language",
    "Edit": "pfuzz.nearmiss.edits", "Explanation": "pfuzz.nearmiss.edits",
    "Reject": "pfuzz.nearmiss.rejects",
}


def __getattr__(name: str):
    home = _HOMES.get(name)
    if home is None:
        raise AttributeError(f"module 'pfuzz' has no attribute {name!r}")
    value = globals()[name] = getattr(importlib.import_module(home), name)
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(_HOMES))

__all__ = [
    "ALPHABETS", "AlphabetError", "ArgumentError", "Case", "CharSet", "CorpusExistsError", "DFA",
    "DEFAULT_STATE_CAP", "Edit", "EmptyLanguageError", "Explanation", "GraphvizError", "Language",
    "NotInLanguageError", "OutputError", "PatternError", "PfuzzError", "PfuzzWarning",
    "ProfileError", "RankOutOfRangeError", "Reject", "ResourceLimitError", "StateLimitError",
    "TargetError", "compile", "__version__",
]
