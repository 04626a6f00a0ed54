"""The patterns of the regex tests shipped with Python compile, and agree with ``re``.

Source: CPython's own test package, read at run time from the running interpreter
(nothing of it is copied here): ``test.re_tests`` (its tuples start with a pattern
and a subject string) and ``test/test_re.py``, whose source is parsed for the string
literals passed as the pattern of ``re.compile``, ``re.match``, ``re.search``,
``re.fullmatch``, ``re.findall``, ``re.finditer``, ``re.split``, ``re.sub`` and
``re.subn`` (with their constant flags and subject, when given). Reference matcher:
``re`` itself.

Every str pattern that ``re`` compiles must compile in pfuzz in all three call modes,
except a backreference to a group of unbounded width, which pfuzz refuses by design
(checked: refused with that reason, and nothing else is refused). Each compiled
automaton must agree with ``re.fullmatch`` / ``re.match`` / ``re.search`` on the
pattern's subjects, their prefixes and suffixes, short strings over a small alphabet
and seeded random strings, over the alphabet of the characters in the subjects and
the pattern.

The default (CI) run checks a seeded sample of about 40 strings per pattern and mode
and leaves out the few patterns whose NFA is large (over ``LARGE_NFA`` states, the
``x{65535}`` family); the full run checks every string over the small alphabet up to
length 4, some 200 more, and the large patterns too:

    PFUZZ_RE_SUITE=full python -m pytest tests/external/test_re_suite.py

(minutes rather than seconds). A search for a counted repeat of 65,535 copies stops at
the work budget with ``StateLimitError`` (its subset construction holds O(n²) NFA
states; the message says so): the full run accepts that and only that.

One behaviour of CPython 3.11 contradicts its own documentation and is compared with
the documented meaning instead: ``re.search``'s first-character prefilter ignores a
scoped ``(?a:...)``, so ``re.search(r'(?a:\\W)', 'à')`` finds nothing although
``re.match(r'(?a:\\W)', 'à')`` matches. For the patterns in ``PREFILTER`` the search
reference is "``re`` matches at some position" (``pattern.match(s, i)`` for some i,
which judges ``^`` and lookbehind against the whole string, as a search does).
"""

from __future__ import annotations

import ast
import importlib.util
import itertools
import os
import random
import re
import sys
import sysconfig
import warnings
from pathlib import Path

import pytest

from pfuzz.automata.construction.compiler import compile_dfa
from pfuzz.automata.nfa import estimate_states
from pfuzz.base.charset import CharSet
from pfuzz.errors import PatternError, StateLimitError
from pfuzz.syntax.parser import parse

FULL = os.environ.get("PFUZZ_RE_SUITE") == "full"
LARGE_NFA = 20_000
SAMPLE = 40
MODES = ("fullmatch", "match", "search")
#: Patterns whose re.search contradicts re.match at some position (see the module docstring).
PREFILTER = {r"(?a:\W(?u:\w)\W)"}
UNBOUNDED = "refers to a group that can match strings of any length"

_FLAGS = {name: int(getattr(re, name)) for name in
          ("I", "IGNORECASE", "M", "MULTILINE", "S", "DOTALL", "X", "VERBOSE", "A", "ASCII",
           "U", "UNICODE", "L", "LOCALE", "T", "TEMPLATE", "DEBUG")}
#: Index of the subject and of the flags among each function's positional arguments.
_SUBJECT_AT = {"match": 1, "search": 1, "fullmatch": 1, "findall": 1, "finditer": 1, "split": 1,
               "sub": 2, "subn": 2}
_FLAGS_AT = {"compile": 1, "match": 2, "search": 2, "fullmatch": 2, "findall": 2, "finditer": 2,
             "split": 3, "sub": 4, "subn": 4}


def _test_package_dir() -> Path | None:
    """The interpreter's own ``test`` package, or its copy under the base interpreter's stdlib."""
    try:
        import test.re_tests as module  # noqa: F401

        return Path(module.__file__).parent
    except ImportError:
        pass
    for root in {sysconfig.get_paths()["stdlib"], os.path.join(sys.base_prefix, "lib",
                                                              f"python{sys.version_info[0]}.{sys.version_info[1]}")}:
        if (Path(root) / "test" / "re_tests.py").exists():
            return Path(root) / "test"
    return None


def _load_re_tests(directory: Path):
    spec = importlib.util.spec_from_file_location("_cpython_re_tests", directory / "re_tests.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module.tests


def _flag_value(node: ast.AST) -> int | None:
    if isinstance(node, ast.Attribute) and isinstance(node.value, ast.Name) and node.value.id == "re":
        return _FLAGS.get(node.attr)
    if isinstance(node, ast.BinOp) and isinstance(node.op, ast.BitOr):
        left, right = _flag_value(node.left), _flag_value(node.right)
        return None if left is None or right is None else left | right
    if isinstance(node, ast.Constant) and isinstance(node.value, int):
        return node.value
    return None


def _calls_in_test_re(path: Path):
    """(pattern, flags, subject) of each re.<function>(<str literal>, ...) call in test_re.py."""
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if not (isinstance(node, ast.Call) and isinstance(node.func, ast.Attribute)
                and isinstance(node.func.value, ast.Name) and node.func.value.id == "re"
                and node.func.attr in _FLAGS_AT and node.args):
            continue
        first, name = node.args[0], node.func.attr
        if not (isinstance(first, ast.Constant) and isinstance(first.value, str)):
            continue
        flags = 0
        for keyword in node.keywords:
            if keyword.arg == "flags":
                flags = _flag_value(keyword.value)
        if len(node.args) > _FLAGS_AT[name]:
            flags = _flag_value(node.args[_FLAGS_AT[name]])
        at = _SUBJECT_AT.get(name)
        subject = node.args[at].value if at is not None and len(node.args) > at and isinstance(
            node.args[at], ast.Constant) and isinstance(node.args[at].value, str) else ""
        if flags is not None:
            yield first.value, flags, subject


def suite_cases() -> list[tuple[str, int, tuple[str, ...]]]:
    """(pattern, flags, subjects) for every distinct str pattern and flags re compiles."""
    directory = _test_package_dir()
    if directory is None:
        return []
    found: dict[tuple[str, int], set[str]] = {}
    for case in _load_re_tests(directory):
        if isinstance(case[0], str):
            found.setdefault((case[0], 0), set()).add(case[1] if isinstance(case[1], str) else "")
    for pattern, flags, subject in _calls_in_test_re(directory / "test_re.py"):
        found.setdefault((pattern, flags), set()).add(subject)
    cases = []
    for (pattern, flags), subjects in sorted(found.items()):
        if flags & (re.LOCALE | re.DEBUG):
            continue  # LOCALE is for bytes patterns; DEBUG only prints
        try:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                re.compile(pattern, flags)
        except (re.error, ValueError, OverflowError, RecursionError):
            continue
        cases.append((pattern, flags, tuple(sorted(subjects))))
    return cases


CASES = suite_cases()


def test_the_test_package_is_found():
    assert _test_package_dir() is not None, (
        "the interpreter ships no test package (test.re_tests), nor is one under the base "
        "interpreter's standard library; install the python3-test package of the distribution")
    assert len(CASES) > 500


def _strings(pattern: str, subjects: tuple[str, ...], seed: int) -> tuple[CharSet, list[str]]:
    """The alphabet and the strings to check for one pattern."""
    rng = random.Random(seed)
    chars = set("".join(subjects)) | {c for c in pattern if c.isprintable()} | {"\n", " "}
    small = sorted({c for c in "".join(subjects) + pattern if c.isalnum()})[:5] or ["a"]
    small = sorted(set(small) | {"\n", " "})
    chars |= set(small)
    strings = set(subjects)
    for subject in subjects:
        strings.update(subject[:i] for i in range(len(subject) + 1))
        strings.update(subject[i:] for i in range(len(subject) + 1))
    pool = sorted(chars)
    strings.update("".join(rng.choice(pool) for _ in range(rng.randint(0, 8))) for _ in range(200))
    strings.update("".join(rng.choice(small) for _ in range(rng.randint(0, 6))) for _ in range(100))
    if FULL:
        strings.update("".join(t) for n in range(5) for t in itertools.product(small, repeat=n))
        ordered = sorted(strings)
    else:
        ordered = sorted(subjects) + rng.sample(sorted(strings - set(subjects)), SAMPLE)
    return CharSet.from_chars(chars), ordered


def _reference(rx: re.Pattern, mode: str, pattern: str):
    if mode == "search" and pattern in PREFILTER:
        return lambda s: next(filter(None, (rx.match(s, i) for i in range(len(s) + 1))), None)
    return getattr(rx, mode)


@pytest.mark.parametrize("pattern, flags, subjects", CASES, ids=[repr(c[0])[:60] for c in CASES])
def test_pattern_compiles_and_agrees_with_re(pattern, flags, subjects):
    try:
        tree = parse(pattern, flags)
    except PatternError as error:
        assert UNBOUNDED in error.message, error.message  # the one construct refused by design
        return
    if estimate_states(tree) > LARGE_NFA and not FULL:
        pytest.skip("a large counted repeat: checked in the full run (PFUZZ_RE_SUITE=full)")
    alphabet, strings = _strings(pattern, subjects, seed=len(pattern) * 7919 + flags)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        rx = re.compile(pattern, flags)
    for mode in MODES:
        try:
            dfa = compile_dfa(pattern, alphabet, flags=flags, mode=mode)
        except StateLimitError as error:
            assert mode == "search" and "work budget" in str(error), error
            continue
        reference = _reference(rx, mode, pattern)
        for s in strings:
            assert dfa.accepts(s) == (reference(s) is not None), (mode, s)


def test_prefilter_patterns_really_contradict_re_match():
    # The documented meaning of search is a match at some position; for these patterns CPython's
    # re.search disagrees with its own re.match (reference: re, both ways).
    assert re.match(r"(?a:\W)", "\u00e0") and not re.search(r"(?a:\W)", "\u00e0")


def test_only_unbounded_backreferences_are_refused():
    refused = []
    for pattern, flags, _ in CASES:
        try:
            parse(pattern, flags)
        except PatternError as error:
            refused.append((pattern, error.message))
    assert refused and all(UNBOUNDED in message for _, message in refused), refused
