"""What every pfuzz command shares: options, pattern input, output and errors.

One option vocabulary for all commands (``--seed``, ``--alphabet``,
``--ignore-case``, ``--min-length``, ``--max-length``, ``--format``,
``--out``, ``--pattern-file``), defined once here. Commands stay thin: they
parse options, call the library, and print.
"""

from __future__ import annotations

import functools
import gc
import re
import sys
from pathlib import Path
from typing import NoReturn

import click

from pfuzz.base.charset import DEFAULT_ALPHABET, ALPHABETS
from pfuzz.automata.dfa import DEFAULT_STATE_CAP
from pfuzz.errors import EmptyLanguageError, OutputError, PatternError, PfuzzError, shorten
from pfuzz.base.escaping import escape_point, escape_text
from pfuzz.base.files import Terminated, shown_path, terminate_as_interrupt, write_atomic
from pfuzz.base.jsonlines import jsonl_line
from pfuzz.base.resources import require_memory, string_bytes

EXIT_OK, EXIT_DIFFERENT, EXIT_USAGE = 0, 1, 2

ALPHABET_HELP = (f"Characters to work over: {', '.join(ALPHABETS)}, or a class such as "
                 f"'[a-z0-9]'. Default: {DEFAULT_ALPHABET} (U+0020-U+007E).")


#: Longest error line printed: a longer one keeps its head and its tail.
MESSAGE_LIMIT = 400

#: The command line's words for the library parameters that messages advise on.
OPTION_NAMES = {"out_dir": "--out", "path": "--out", "force": "--force"}


def one_line(message: str, limit: int = MESSAGE_LIMIT) -> str:
    """``message`` as one line: line breaks and control characters become escapes (a
    newline in a file name must not split the line), and a very long one is cut."""
    if not message.isprintable():
        message = "".join(ch if ch.isprintable() else escape_point(ord(ch), "text")
                          for ch in message)
    return shorten(message, limit)


def fail(message: str, detail: str = "") -> NoReturn:
    """Print one error line (and an optional detail block) and exit with status 2."""
    click.echo(f"pfuzz: error: {one_line(message)}", err=True)
    if detail:
        click.echo(detail, err=True)
    sys.exit(EXIT_USAGE)


def _debugging() -> bool:
    return bool((click.get_current_context().find_root().obj or {}).get("debug"))


def report_errors(func):
    """Turn pfuzz's own errors into one clear line and exit status 2 (``--debug`` re-raises).

    SIGTERM and SIGHUP unwind the command as Ctrl-C does (every temporary file and
    staging folder is removed), then exit with the shell's status for the signal."""
    @functools.wraps(func)
    def wrapper(*args, **kwargs):
        try:
            with terminate_as_interrupt():
                return _reporting(func, args, kwargs)
        except Terminated as stop:
            click.echo(f"pfuzz: stopped by {stop}; nothing was left half-written", err=True)
            sys.exit(128 + stop.signal_number)
    return wrapper


def _reporting(func, args, kwargs):
    try:
        return func(*args, **kwargs)
    except PatternError as error:
        if _debugging():
            raise
        where = f" at {error.where()}" if error.colno is not None else ""
        fail(f"bad pattern{where}: {error.message}", error.caret())
    except EmptyLanguageError as error:
        if _debugging():
            raise
        fail(str(error), _alphabet_hint(kwargs))
    except OutputError as error:
        if _debugging():
            raise
        fail(error.for_options(OPTION_NAMES))
    except PfuzzError as error:             # a profile's pattern may be past the state cap too
        if _debugging():
            raise
        fail(_state_cap_advice(str(error), kwargs), getattr(error, "detail", ""))
    except OSError as error:
        if _debugging():
            raise
        fail(str(error))
    except MemoryError:
        if _debugging():
            raise
    # Out of memory. Leaving the handler above dropped the exception, its traceback and the
    # frames that held the huge objects; only now, with that memory free, is there room to
    # report (reporting inside the handler failed a second time, with a traceback).
    gc.collect()
    fail("not enough memory for this request; ask for fewer strings or shorter lengths")


def _state_cap_advice(message: str, options: dict) -> str:
    """The library says "raise the cap" (``StateLimitError``); a command with --state-cap
    names the option, which reaches every automaton it builds."""
    if "state_cap" not in options:
        return message
    return message.replace("raise the cap", f"raise --state-cap (now {options['state_cap']:,})")


def _alphabet_hint(options: dict) -> str:
    """When a pattern is empty only because of the alphabet, say so.

    The empty language may be a derived one (no near-miss rejects of ``.*``):
    then the pattern itself is not empty over the alphabet and no hint is given.
    """
    pattern, alphabet = options.get("pattern"), options.get("alphabet")
    if pattern is None or alphabet in (None, "unicode"):
        return ""
    flags, cap = options.get("flags", 0), options.get("state_cap", DEFAULT_STATE_CAP)
    try:
        if not compile_language(pattern, alphabet, flags, cap).is_empty():
            return ""
        wider = compile_language(pattern, "unicode", flags, cap)
    except PfuzzError:
        return ""
    if wider.is_empty():
        return ""
    example = wider.shortest()
    return (f"  the pattern matches {escape_text(example)!r}, but only with characters outside the "
            f"alphabet {alphabet!r}; widen it, e.g. --alphabet unicode")


class FilePath(click.Path):
    """``click.Path`` that turns a name no file can have (a NUL character; ``os.stat`` raises
    ``ValueError`` for it) into a usage error, exit status 2, instead of a traceback."""

    def convert(self, value, param, ctx):
        if "\x00" in str(value):
            self.fail(f"{shown_path(value)} holds a NUL character, which no file name may hold",
                      param, ctx)
        return super().convert(value, param, ctx)


def pattern_input(func):
    """PATTERN argument (or PROFILE:FIELD), or --pattern-file FILE; passes ``pattern`` (str)."""
    @click.argument("pattern_arg", metavar="PATTERN", required=False)
    @click.option("--pattern-file", type=FilePath(dir_okay=False, path_type=Path),
                  help="Read the pattern from FILE (one pattern; a final newline is dropped).")
    @functools.wraps(func)
    def wrapper(*args, pattern_arg=None, pattern_file=None, **kwargs):
        if (pattern_arg is None) == (pattern_file is None):
            fail("give a PATTERN argument or --pattern-file FILE (exactly one)")
        if pattern_file is not None:
            pattern_arg = read_pattern_file(pattern_file)
        return func(*args, pattern=pattern_arg, **kwargs)
    return wrapper


def read_pattern_file(path: Path) -> str:
    """A pattern from a file (one pattern; a final newline is dropped); exit 2 if unreadable."""
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as error:
        fail(f"cannot read pattern file {shown_path(path)}: {error.strerror}")
    except UnicodeDecodeError as error:
        fail(f"pattern file {shown_path(path)} is not UTF-8 text (byte {error.start})")
    except ValueError:                      # a NUL in the name
        fail(f"cannot read pattern file {shown_path(path)}: no file name holds a NUL character")
    return text[:-1] if text.endswith("\n") else text


#: --state-cap N; passes ``state_cap``. Every automaton a command builds honours it.
state_cap_option = click.option(
    "--state-cap", type=click.IntRange(min=1), default=DEFAULT_STATE_CAP, show_default=True,
    help="Stop with an error past this many states in any automaton the command builds.")


def language_options(func):
    """--alphabet, --ignore-case, --state-cap; passes ``alphabet``, ``flags``, ``state_cap``."""
    @click.option("--alphabet", default=DEFAULT_ALPHABET, show_default=True, help=ALPHABET_HELP)
    @click.option("--ignore-case", "-i", is_flag=True, help="Compile as with re.IGNORECASE.")
    @state_cap_option
    @functools.wraps(func)
    def wrapper(*args, ignore_case=False, **kwargs):
        return func(*args, flags=re.IGNORECASE if ignore_case else 0, **kwargs)
    return wrapper


def compile_language(pattern: str, alphabet: str, flags: int, state_cap: int):
    """The language of a pattern, or of a profile field named as ``PROFILE:FIELD`` (with the
    field's own alphabet, flags, lengths, require and forbid; ``pfuzz.profile.reference``)."""
    from pfuzz.language import Language
    from pfuzz.profile.reference import pattern_or_field

    field = pattern_or_field(pattern)
    if field is not None:
        return field.language()
    return Language.compile(pattern, alphabet, flags, state_cap=state_cap)


#: Most strings one command may be asked for: far beyond any memory (8 bytes a string
#: would already be 8 PiB), yet small enough that numpy can size the arrays and say
#: that it is out of memory (which ``report_errors`` turns into one line).
MAX_HOW_MANY = 2**50


def require_output_memory(how_many: int, longest: int, lang, per_item: int = 0,
                          copies: int = 3) -> None:
    """Refuse (``ResourceLimitError``) before drawing when ``how_many`` strings of up to
    ``longest`` characters, held ``copies`` times over (the strings, their rendered lines,
    the finished text) plus ``per_item`` bytes each, would be past the memory budget."""
    widest = lang.alphabet.max if lang.alphabet else 0
    each = copies * string_bytes(longest, widest) + per_item
    characters = "character" if longest == 1 else "characters"
    require_memory(how_many * each, f"{how_many:,} strings of up to {longest:,} {characters}",
                   "ask for fewer (-n) or shorter ones (--max-length)")


def how_many_option(what: str):
    """-n N, how many strings to write; passes ``how_many``."""
    return click.option("-n", "how_many", type=click.IntRange(min=0, max=MAX_HOW_MANY),
                        default=10, show_default=True, help=f"How many {what} to write.")


seed_option = click.option("--seed", type=click.IntRange(min=0), default=0, show_default=True,
                           help="Seed of the one random generator; same seed, same output.")
min_length_option = click.option("--min-length", type=click.IntRange(min=0), default=None,
                                 help="Shortest length to consider.")
max_length_option = click.option("--max-length", type=click.IntRange(min=0), default=None,
                                 help="Longest length to consider.")
out_option = click.option("--out", "-o", type=FilePath(path_type=Path), default=None,
                          help="Write to FILE (atomically) instead of standard output.")


def format_option(choices: tuple[str, ...], default: str):
    return click.option("--format", "fmt", type=click.Choice(choices), default=default,
                        show_default=True, help="Output format.")


def emit(text: str, out: "Path | None") -> None:
    """Send finished output to stdout or, atomically, to a file."""
    if out is None:
        click.echo(text, nl=False)
    else:
        write_atomic(out, text)
        click.echo(f"pfuzz: wrote {out}", err=True)


#: A progress bar is shown from this many items on when standard error is a terminal ...
PROGRESS_TTY_MIN = 10_000
#: ... and from this many on in any case.
PROGRESS_MIN = 1_000_000


def wants_progress(n: int) -> bool:
    """Whether a run of ``n`` items shows a progress bar on stderr."""
    return n >= PROGRESS_MIN or (n >= PROGRESS_TTY_MIN and sys.stderr.isatty())


def note(message: str) -> None:
    """A remark for the user on stderr (never on stdout, which carries data)."""
    click.echo(f"pfuzz: {message}", err=True)


def render_strings(strings: list[str], fmt: str) -> str:
    """Strings as ``text`` (one per line, escaped where needed, said on stderr) or ``jsonl``."""
    if fmt == "jsonl":
        return "".join(jsonl_line(s) for s in strings)
    lines, escaped = [], 0
    for s in strings:
        # Same test as common.needs_escape, in C speed: printable and no backslash.
        if s.isprintable() and "\\" not in s:
            lines.append(s)
        else:
            lines.append(escape_text(s))
            escaped += 1
    if escaped:
        note(f"{escaped} of {len(strings)} strings hold control characters, newlines or "
              "backslashes and are written with Python-style escapes; "
              "use --format jsonl to keep them exactly")
    return "".join(line + "\n" for line in lines)
