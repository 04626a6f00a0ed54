"""The pattern compiler: pattern text to the minimal DFA of what ``re.fullmatch`` accepts.

Pipeline: ``pfuzz.syntax.parser.parse`` gives a tree; ``simplify`` merges runs of
repeats; every ``Chars`` node is resolved to a ``CharSet`` inside the alphabet
(``pfuzz.syntax.casefold.resolve``); all those sets (and ``'\\n'``, and the word
characters when ``\\b`` or ``\\B`` occur) are partitioned into disjoint classes
(``pfuzz.base.charset.partition``), refined so that the characters a backreference
compares fall in classes of their own; Thompson's construction
(``pfuzz.automata.nfa``) gives an ε-NFA over class indexes, expanded with the
registers of captured groups where needed (``registers``); the subset
construction of Rabin & Scott (1959), run by ``pfuzz.automata.dfa.explore`` over
threads that carry obligations (``determinise``), gives a DFA, and
``pfuzz.automata.minimise.minimise`` (partition refinement) the canonical minimal one.

Every construction of ``re`` that keeps the language regular is exact, wherever it
stands: anchors and ``\\b``/``\\B`` by the context of the position and obligations
on the rest; lookaheads as obligations; lookbehinds by trackers over the prefix
(``lookback``); conditionals and backreferences to groups of bounded width by
registers; atomic groups and possessive quantifiers by ``re``'s order of trying
(the Priority assertions of ``pfuzz.automata.nfa``). ``compilation`` is the judge
that says what each assertion adds. This gives exactly L(Y) ∩ P(X) for ``(?=X)Y``
at the start, and the password idiom ``^(?=.*\\d)(?=.{8,64}$).*$`` costs about the
product of its lookaheads' automata, as the minimal DFA must.

``mode="match"`` / ``"search"`` compile what ``re.match`` / ``re.search``
accept, as full matches of P(?s:.*) and (?s:.*)P(?s:.*) (see ``in_mode``).

Where CPython 3.11's ``sre`` departs from what its documentation and its own other
call modes say, pfuzz follows the documented meaning: a possessive repeat runs
without a repeat context, so the marks a failed alternative set inside it are not
restored (``re.fullmatch(r"(?:(b)|\\1|a){2}+", "ba")`` is None though ``a`` matches the
second copy); a conditional inside the group it tests can read the end mark a
failed attempt left; and ``re.search``'s first-character prefilter ignores a scoped
``(?a:...)`` (``re.search(r"(?a:\\W)", "à")`` is None while ``re.match`` matches).

Cost: linear in the number of DFA configurations times the classes times the
threads per configuration; bounded repeats are expanded with nested optionals so
``[a-z0-9]{1,256}`` has two threads per configuration (figures on this machine:
``python -m pfuzz.benchmarks compile``). Limits: every construction stops at
``cap`` states with ``StateLimitError``, the expanded NFA at
``NFA_STATES_PER_CAP × cap`` states before it is built, the work of the subset construction at
``CLOSURE_STEPS_PER_CAP × cap`` steps; a group a backreference reads may capture at
most ``MAX_CAPTURED_CHARACTERS`` different characters (each needs its own state).
"""

from __future__ import annotations

import functools

import _sre

from pfuzz.automata.construction.compilation import Compilation, Facts
from pfuzz.automata.construction.registers import Layout, Registers
from pfuzz.automata.construction.simplify import simplify
from pfuzz.automata.dfa import DEFAULT_STATE_CAP, DFA
from pfuzz.base.charset import ALL, CharSet, partition
from pfuzz.base.constants import CALL_MODES
from pfuzz.errors import ArgumentError, PatternError, StateLimitError
from pfuzz.syntax.tree import (Backreference, Boundary, Chars, Conditional, Group, Node, Repeat, Sequence,
                               walk, width)

#: Most characters the groups that backreferences read may capture, all together.
MAX_CAPTURED_CHARACTERS = 4096

IGNORECASE, ASCII = 2, 256  # re.IGNORECASE, re.ASCII


def compile_dfa(pattern: str, alphabet: CharSet, flags: int = 0,
                cap: int = DEFAULT_STATE_CAP, mode: str = "fullmatch") -> DFA:
    """The canonical minimal DFA of the strings over ``alphabet`` that
    ``re.fullmatch(pattern, s, flags)`` accepts (or ``re.match`` / ``re.search``
    with ``mode``)."""
    from pfuzz.syntax.parser import parse

    return compile_tree(in_mode(parse(pattern, flags), mode), alphabet, cap=cap)


def in_mode(tree: Node, mode: str) -> Node:
    """The tree whose full matches are the strings ``mode`` accepts.

    ``re.match`` accepts s when a prefix of s matches with assertions judged
    against all of s, which is a full match of P·(?s:.*); ``re.search`` is a
    full match of (?s:.*)·P·(?s:.*). Concatenating languages instead (L·U*)
    would be wrong for ``$``: ``re.match(r"\\d+$", s)`` accepts "12\\n" but not "12x".
    """
    anything = Repeat(Chars(ALL), 0, None)
    if mode == "fullmatch":
        return tree
    if mode == "match":
        return Sequence((tree, anything))
    if mode == "search":
        return Sequence((anything, tree, anything))
    raise ArgumentError(f"unknown match mode {mode!r}: use one of {', '.join(CALL_MODES)}")


def compile_tree(tree: Node, alphabet: CharSet, cap: int = DEFAULT_STATE_CAP,
                 resolve=None) -> DFA:
    """The minimal DFA of a syntax tree under full-match semantics over ``alphabet``."""
    if resolve is None:
        from pfuzz.syntax.casefold import resolve
    tree = simplify(tree)
    sets = {node: resolve(node, alphabet) & alphabet for node in walk(tree) if isinstance(node, Chars)}
    facts = _facts(tree)
    words = _words(tree, alphabet)
    extra = [CharSet.single("\n") & alphabet, *words.values()]
    classes = partition([*sets.values(), *extra], alphabet)
    backreferences = [n for n in walk(tree) if isinstance(n, Backreference)]
    keys = {}
    if backreferences:
        classes = _refine(classes, backreferences, facts, sets, alphabet)
        keys = {flags: tuple(_key(flags)(cls.min) for cls in classes)
                for flags in {b.flags & (IGNORECASE | ASCII) for b in backreferences}}
    adjacency = frozenset(c.index for group in facts.groups.values() for c in walk(group.item)
                          if isinstance(c, Conditional) and c.index == group.index)
    registers = Registers(Layout(tuple(sorted(facts.tracked)), facts.valued, adjacency), keys)
    compilation = Compilation(classes, alphabet, cap, sets, facts, registers,
                              {False: words.get(False, CharSet()), True: words.get(True, CharSet())})
    lookback = compilation.lookback_for(tree)
    return compilation.compile(tree, lookback, lookback.start, any_suffix=False)


def _facts(tree: Node) -> Facts:
    groups = {n.index: n for n in walk(tree) if isinstance(n, Group)}
    widths: dict = {}
    for index in sorted(groups):
        widths[index] = width(groups[index].item, widths)
    valued = frozenset(n.index for n in walk(tree) if isinstance(n, Backreference))
    for index in valued:
        if widths.get(index, (0, None))[1] is None:
            raise PatternError(f"backreference \\{index} refers to a group that can match strings of any "
                               "length; pfuzz compiles backreferences only to groups with finitely many strings")
    return Facts(groups, widths, frozenset(groups), valued)


def _words(tree: Node, alphabet: CharSet) -> dict[bool, CharSet]:
    """The word characters (by ASCII-ness) that the tree's \\b and \\B ask about."""
    from pfuzz.syntax.categories import category

    kinds = {n.ascii for n in walk(tree) if isinstance(n, Boundary)}
    return {ascii_only: category("w", ascii_only) & alphabet for ascii_only in kinds}


def _key(flags: int):
    """How a backreference with ``flags`` compares a character (sre's GROUPREF ops)."""
    if not flags & IGNORECASE:
        return lambda point: point
    return _sre.ascii_tolower if flags & ASCII else _sre.unicode_tolower


def _refine(classes: list[CharSet], backreferences: list, facts: Facts, sets: dict,
            alphabet: CharSet) -> list[CharSet]:
    """Split the classes so that each class holds characters that every backreference
    compares alike: captured characters then stand for themselves (or their case)."""
    captured = CharSet()
    for node in backreferences:
        captured |= _captured(node.index, facts, sets)
    if len(captured) > MAX_CAPTURED_CHARACTERS:
        raise StateLimitError(
            f"the groups that backreferences read can capture {len(captured):,} different characters "
            f"over this alphabet, and telling them apart needs an automaton state for each; pfuzz "
            f"stops at {MAX_CAPTURED_CHARACTERS:,} (use a smaller alphabet)")
    functions = [_key(flags) for flags in sorted({b.flags & (IGNORECASE | ASCII) for b in backreferences})]
    related = CharSet.from_chars(point for function in functions
                                 for point in _preimage(function, captured, alphabet))
    refined = []
    for cls in classes:
        inside = cls & related
        rest = cls - inside
        if rest:
            refined.append(rest)
        by_key: dict[tuple, list[int]] = {}
        for char in inside.chars():
            by_key.setdefault(tuple(f(ord(char)) for f in functions), []).append(ord(char))
        refined.extend(CharSet.from_chars(points) for points in by_key.values())
    return sorted(refined, key=lambda cls: cls.min)


def _captured(index: int, facts: Facts, sets: dict) -> CharSet:
    """The characters group ``index`` may capture (those nested references read included)."""
    found = CharSet()
    for node in walk(facts.groups[index].item):
        if isinstance(node, Chars):
            found |= sets[node]
        elif isinstance(node, Backreference):
            inner = _captured(node.index, facts, sets)
            found |= CharSet.from_chars(_preimage(_key(node.flags), inner, ALL))
    return found


def _preimage(function, chars: CharSet, alphabet: CharSet) -> set[int]:
    """Every code point of ``alphabet`` that ``function`` maps where it maps some of ``chars``."""
    keys = {function(ord(char)) for char in chars.chars()}
    found = {key for key in keys if key in alphabet and function(key) == key}
    for point in _cased_points():
        if point in alphabet and function(point) in keys:
            found.add(point)
    return found | {ord(char) for char in chars.chars()}


@functools.cache
def _cased_points() -> tuple[int, ...]:
    from pfuzz.syntax.casefold import case_sensitive_points

    return tuple(point for lo, hi in case_sensitive_points().ranges for point in range(lo, hi + 1))
