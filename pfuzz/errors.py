"""The exceptions pfuzz raises on bad input.

Every error a user can cause is one of these, so the command line can print
one clear line (and, for patterns, a caret under the column) instead of a
traceback.
"""

from __future__ import annotations


class PfuzzError(Exception):
    """Base class of every error pfuzz raises on purpose."""


class PatternError(PfuzzError, ValueError):
    """A pattern pfuzz cannot compile: bad syntax, or a backreference to a group of unbounded width.

    ``position`` is the 0-based index into ``pattern`` (as ``re.error.pos``),
    or None when the error concerns the pattern as a whole; ``lineno`` and
    ``colno`` are its 1-based line and column (as ``re.error``), so an error in a
    verbose ``(?x)`` pattern written over several lines points at its own line.
    """

    def __init__(self, message: str, pattern: str | None = None, position: int | None = None):
        super().__init__(message)
        self.message = message
        self.pattern = pattern
        self.position = position
        self.lineno: int | None = None
        self.colno: int | None = None
        if pattern is not None and position is not None:
            self.lineno = pattern.count("\n", 0, position) + 1
            self.colno = position - (pattern.rfind("\n", 0, position) + 1) + 1

    def where(self) -> str:
        """``column C`` for a one-line pattern, ``line L, column C`` otherwise ("" if unknown)."""
        if self.colno is None:
            return ""
        if self.pattern is not None and "\n" in self.pattern:
            return f"line {self.lineno}, column {self.colno}"
        return f"column {self.colno}"

    def caret(self) -> str:
        """The offending line of the pattern and a caret under the offending column.

        Tabs show as one space so that the caret lines up; a wide (East Asian full-width)
        character takes two columns of the caret line. A long line is shown as a window of
        ``CARET_CONTEXT`` characters each side of the column, cut with "..."."""
        if self.pattern is None or self.position is None:
            return ""
        line = self.pattern.split("\n")[self.lineno - 1].replace("\t", " ")
        start = max(0, self.colno - 1 - CARET_CONTEXT)
        shown = line[start: self.colno - 1 + CARET_CONTEXT]
        before = line[start: self.colno - 1]
        if start:
            shown, before = "..." + shown, "..." + before
        if len(line) > self.colno - 1 + CARET_CONTEXT:
            shown += "..."
        return f"  {shown}\n  {' ' * _display_width(before)}^"


#: Characters of a long pattern line shown on each side of the caret.
CARET_CONTEXT = 36
#: Longest echo of user text (a pattern, a value) inside a one-line message.
ECHO_LIMIT = 80


def shorten(text: str, limit: int = ECHO_LIMIT) -> str:
    """``text`` itself, or its head and tail around "..." when it is longer than ``limit``:
    an error echoes what the user gave without repeating a 20 KB pattern."""
    if len(text) <= limit:
        return text
    head = (limit - 3) * 2 // 3
    return f"{text[:head]}...{text[len(text) - (limit - 3 - head):]}"


def _display_width(text: str) -> int:
    """Terminal columns of ``text``: two for wide and full-width characters."""
    import unicodedata

    return sum(2 if unicodedata.east_asian_width(ch) in "WF" else 1 for ch in text)


class StateLimitError(PfuzzError):
    """The automaton would exceed the configured state cap."""


class AlphabetError(PfuzzError, ValueError):
    """An alphabet specification pfuzz does not understand."""


class EmptyLanguageError(PfuzzError, ValueError):
    """Sampling or explaining was asked of a language with no strings."""


class ArgumentError(PfuzzError, ValueError):
    """A bad argument to a library call: a negative count, an unknown edit kind, ..."""


class NotInLanguageError(PfuzzError, ValueError):
    """A string was given to ``rank`` that the language does not accept."""


class RankOutOfRangeError(PfuzzError, IndexError):
    """``unrank`` was asked for an index past the number of strings of that length."""


class ProfileError(PfuzzError, ValueError):
    """A profile that cannot be used; the message names the file, the table and the key.

    ``detail`` holds an extra block (a pattern with a caret) or is empty.
    """

    def __init__(self, message: str, *, path: str = "", where: str = "", key: str = "",
                 detail: str = ""):
        prefix = ": ".join(p for p in (path, where, f"key '{key}'" if key else "") if p)
        super().__init__(f"{prefix}: {message}" if prefix else message)
        self.path, self.where, self.key, self.detail = path, where, key, detail


class TargetError(PfuzzError):
    """The validator could not be run to the end; ``detail`` holds its error output."""

    def __init__(self, message: str, detail: str = ""):
        super().__init__(message)
        self.detail = detail


class OutputError(PfuzzError):
    """A path pfuzz will not write to: a symlink, a device or another file that is not a
    regular file, a name with a NUL character, a folder it did not make.

    ``template`` holds a ``{name}`` for each library parameter the advice names;
    ``str()`` reads them in the library's words (``parameters``: ``out_dir``,
    ``force=True``) and ``for_options`` in a command line's (``--out``, ``--force``).
    ``values`` fill the other fields (the path itself).
    """

    def __init__(self, template: str, *, parameters: dict[str, str] | None = None, **values):
        self.template, self.parameters, self.values = template, dict(parameters or {}), values
        super().__init__(template.format(**self.parameters, **values))

    def for_options(self, options: dict[str, str]) -> str:
        """The message with ``options[name]`` in place of each parameter it knows."""
        words = {name: options.get(name, word) for name, word in self.parameters.items()}
        return self.template.format(**words, **self.values)


class CorpusExistsError(OutputError):
    """The output folder exists and may not (or cannot safely) be replaced."""


class ResourceLimitError(PfuzzError):
    """A request would need more memory or work than a limit allows; the message names
    the limit and how to lower the request."""


class ScaleError(PfuzzError):
    """Sharded work cannot run: Dask missing or unreachable, workers of another version,
    or a state folder that belongs to another run."""


class GraphvizError(PfuzzError):
    """The ``dot`` program is missing or failed."""


class PfuzzWarning(UserWarning):
    """Something worth saying that is not an error (e.g. fewer distinct strings than asked)."""
