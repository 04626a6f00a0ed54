"""Hypothesis strategies over pfuzz languages: ``accepted`` and ``rejected``.

Method: a walk over the minimal DFA in which every step is a Hypothesis choice
weighted by the exact counts of ``pfuzz.counting.tables`` (the recursive method of
Nijenhuis & Wilf, 1978). First the length: one choice among the lengths of the window
that have strings, all equally likely. Then each character in turn: from state ``s``
with ``r`` characters still to come there are ``N = completions(s, r)`` ways to finish,
and the next character ``c`` is taken with probability (ways to finish after ``c``) / N
by drawing an index below N and decoding only its first character
(``Counter.step``). So each length of the window is equally likely and, within a
length, each string is equally likely.

Why not one integer for the whole rank: Hypothesis's integer choices are uniform only
within 256 of zero; wider ranges are drawn from a heavy-tailed law that favours small
values (``integers(0, 10**6 - 1)`` falls below 1,000 about 30% of the time), and a
small rank is a shortlex-small string, so long strings came out starting with the
lowest characters. Here every Hypothesis choice has at most 256 values: an index below
N ≤ 256 is one choice; a larger N is read as a base-256 fraction, one digit (one
choice) at a time, until the digits read so far fix the character (arithmetic
decoding). This is exact except that after ``MAX_DIGITS`` digits beyond what N needs
the lower character is taken: a deviation below 2^-32 per step. Hypothesis also
injects a few "interesting" values (about 5% of choices), fills the rest of some early
examples with the simplest choices, and copies choices between places drawn by the same
strategy; each choice here is a strategy of its own place (``_choice``), so that copying
does not turn a string into repeats of its lowest character. Measured over 1,000
examples (``tests/test_strategies.py``): total variation from the exact uniform shares
0.03 by length and 0.045 by first character (the old one-integer rank: 0.12 and 0.74).

Boundary cases: by default a quarter of the examples (``boundary=``) are not drawn by
the walk but taken from the language's boundary suite (``pfuzz.boundary.suite``: the ends
of every range at every position and the characters just outside them, one more and one
fewer of a repeated class, the length edges), valid cases for ``accepted``, near-miss
rejects for ``rejected``: off-by-one values that a uniform draw rarely hits. One choice
below 256 decides (its low values pick the suite), a second picks the case.

Shrinking, exactly what is guaranteed. Every choice shrinks toward 0. In the walk, 0
means the shortest length of the window and the lowest possible next character, and
each character is a non-decreasing function of its own choices given the characters
before it. Hence, for the walk alone (``boundary=0``): (1) the simplest choices decode
to the shortlex-least string of the shortest length; (2) a property that fails exactly
on some set of lengths reports the shortlex-least string of the shortest failing length;
(3) in a language whose count of ways to finish does not depend on the characters
already chosen (fixed formats such as ``[A-Z]{2}[0-9]{4}``), a property that fails
whenever one position holds a character at or above a threshold reports that position
at the threshold and every other position at its lowest character. With boundary cases
(the default): (1') the simplest example is the suite's first case of its verdict (for
``accepted`` the shortlex-least valid string, as in (1)); a suite case takes two choices,
fewer than a walk, and Hypothesis counts fewer choices as simpler, so a failure found
either way is reported as a failing suite case whenever the shrinker reaches one, and
otherwise as in (2) and (3). Beyond these, shrinking is Hypothesis's heuristic and may
stop at a local minimum: for ``[0-9]{2,5}`` and "the number is at most 500", a run can
stop at "600" instead of "501" (no single choice can be lowered). The strings come from
our automata; Hypothesis's own pattern-based string strategy is not used.

Cost: per example O(length) steps of O(d + log pieces) big-integer operations (d the
out-degree) and about one to two choices per character; the count tables are built
once per language and shared.
"""

from __future__ import annotations

import functools

from hypothesis import strategies as st

from pfuzz.base.charset import DEFAULT_ALPHABET
from pfuzz.errors import ArgumentError, EmptyLanguageError
from pfuzz.language import Language

__all__ = ["accepted", "rejected", "walk", "language_of"]

#: Values of one Hypothesis choice: Hypothesis draws integers uniformly up to 256.
BASE = 256
#: Digits read beyond those N itself needs before the lower character is taken.
MAX_DIGITS = 4
#: Share of examples taken from the boundary suite.
BOUNDARY_SHARE = 0.25


def accepted(pattern_or_language: "str | Language | None" = None, *,
             profile: "str | None" = None, field: str | None = None,
             boundary: float = BOUNDARY_SHARE, min_length: int | None = None,
             max_length: int | None = None, alphabet: str = DEFAULT_ALPHABET,
             flags: int = 0) -> st.SearchStrategy[str]:
    """Strings the pattern accepts (``re.fullmatch``), over ``alphabet``.

    Give a pattern, a ``Language``, a profile field (``profile="profiles/x.toml",
    field="postcode"``, or ``"profiles/x.toml:postcode"`` in place of the pattern) or a
    loaded ``Field``. For an unbounded language ``max_length`` defaults to
    ``pfuzz.base.constants.UNBOUNDED_SPAN`` characters above the shortest length
    considered. A share ``boundary`` of the examples (a quarter by default; 0 for none)
    are the valid cases of the language's boundary suite (``pfuzz.boundary.suite``):
    the ends of every range at every position, the length edges.
    """
    language, _ = language_of(pattern_or_language, profile, field, alphabet, flags)
    uniform = walk(language, min_length, max_length, what="accepted strings")
    return _with_boundary(uniform, language, language, True, boundary, min_length, max_length)


def rejected(pattern_or_language: "str | Language | None" = None, *,
             profile: "str | None" = None, field: str | None = None,
             distance: int | None = None, kinds: "list[str] | None" = None,
             boundary: float = BOUNDARY_SHARE, min_length: int | None = None,
             max_length: int | None = None, alphabet: str = DEFAULT_ALPHABET,
             flags: int = 0) -> st.SearchStrategy[str]:
    """Near-miss rejects: strings the pattern rejects within OSA ``distance`` of one it accepts.

    Drawn like ``accepted``, over the near-miss language (``Language.near_misses``;
    ``kinds`` restricts the edits as in ``pfuzz.nearmiss.rejects``). A share
    ``boundary`` of the examples (a quarter by default; 0 for none) are the invalid
    cases of the boundary suite that are such near misses: the characters just outside
    every range at every position (``'0'`` against ``[1-9]``, ``'I'`` against
    ``[A-HJ-N]``), one more and one fewer of a repeated class, the length edges; the
    classic off-by-one values, which a uniform reject rarely hits. For a profile field
    ``distance`` and ``kinds`` default to the field's own; otherwise to 1 and every kind.
    ``Language.explain`` gives a reject's nearest valid string and edits.
    """
    language, chosen = language_of(pattern_or_language, profile, field, alphabet, flags)
    if chosen is not None:
        distance = chosen.distance if distance is None else distance
        kinds = list(chosen.edits) if kinds is None else kinds
    near = language.near_misses(1 if distance is None else distance, kinds)
    uniform = walk(near, min_length, max_length, what="near-miss rejects")
    return _with_boundary(uniform, language, near, False, boundary, min_length, max_length)


def _with_boundary(uniform, language: Language, target: Language, expected: bool,
                   share: float, min_length, max_length):
    """``uniform``, with a share of its examples taken from the boundary cases of
    ``language`` that ``target`` holds, whose verdict is ``expected``, within the lengths."""
    if not 0 <= share <= 1:
        raise ArgumentError(f"boundary must be a share between 0 and 1, got {share!r}")
    cut = round(BASE * share)
    if cut == 0:
        return uniform
    low, high = target.counter.bounds(min_length, max_length)

    @functools.cache
    def suite() -> tuple[str, ...]:
        """Built at the first draw, not when the strategy is made (a test module's import)."""
        return tuple(c.text for c in language.boundary_cases()
                     if c.expected == expected and low <= len(c.text) <= high
                     and target.accepts(c.text))

    @st.composite
    def mixed(draw) -> str:
        if draw(_choice(-1, 0, BASE)) >= cut or not suite():
            return draw(uniform)
        return suite()[_choose(draw, len(suite()), lambda index: index, -2)]

    return mixed()


def language_of(given, profile, field, alphabet, flags):
    """(Language, Field or None) from whatever the strategies were given."""
    from pfuzz.profile.loader import Field

    if profile is not None:
        if given is not None:
            raise ArgumentError("give a pattern or profile=..., not both")
        from pfuzz.profile.reference import resolve_field
        chosen = resolve_field(str(profile), field)
        return chosen.language(), chosen
    if field is not None:
        raise ArgumentError("field=... names a field of profile=...; give the profile too")
    if isinstance(given, Language):
        return given, None
    if isinstance(given, Field):
        return given.language(), given
    if isinstance(given, str):
        from pfuzz.profile.reference import pattern_or_field
        chosen = pattern_or_field(given)
        if chosen is not None:
            return chosen.language(), chosen
        return Language.compile(given, alphabet, flags), None
    if callable(given):
        name = getattr(given, "__qualname__", type(given).__name__)
        raise ArgumentError(f"got the function {name}, not a language: call it "
                            f"({name.rsplit('.', 1)[-1]}()) or pass profile=..., field=...")
    raise ArgumentError("give a pattern (str), a Language, a profile Field or "
                        f"profile=..., field=...; got {type(given).__name__}")


def walk(language: Language, min_length: int | None = None, max_length: int | None = None,
         what: str = "strings") -> st.SearchStrategy[str]:
    """Strings of ``language`` by the weighted walk of the module docstring."""
    counter = language.counter
    lengths = counter.lengths(max_length=max_length, min_length=min_length)
    if not lengths:
        low, high = counter.bounds(min_length, max_length)
        raise EmptyLanguageError(f"no {what} with length {low} to {high}")

    @st.composite
    def strings(draw) -> str:
        length = lengths[_choose(draw, len(lengths), lambda index: index, 0)]
        state, out = 0, []
        for left in range(length, 0, -1):
            ways = counter.completions(state, left)
            char, state = _choose(draw, ways, lambda index: counter.step(state, left, index)[:2],
                                  left)
            out.append(char)
        return "".join(out)

    return strings()


def _choose(draw, n: int, decode, place: int):
    """``decode(index)`` for an index drawn uniformly below ``n``, reading only as many
    base-256 digits as it takes for ``decode`` to give one answer over the whole interval
    (``decode`` must be non-decreasing in the index)."""
    if n <= BASE:
        return decode(draw(_choice(place, 0, n)))
    numerator, scale = 0, 1
    most = (n.bit_length() + 7) // 8 + MAX_DIGITS
    for digit in range(most):
        numerator = numerator * BASE + draw(_choice(place, digit, BASE))
        scale *= BASE
        low = decode(numerator * n // scale)
        if low == decode(((numerator + 1) * n - 1) // scale):
            return low


@functools.lru_cache(maxsize=4096)
def _choice(place: int, digit: int, n: int) -> st.SearchStrategy[int]:
    """One choice below ``n``, labelled by where it is drawn (see the module docstring)."""
    offset = (place * (MAX_DIGITS + 32) + digit) * BASE
    return st.sampled_from(range(offset, offset + n)).map(lambda value: value - offset)
    return low


@functools.lru_cache(maxsize=4096)
def _choice(place: int, digit: int, n: int) -> st.SearchStrategy[int]:
    """One choice below ``n``, labelled by where it is drawn (see the module docstring)."""
    offset = (place * (MAX_DIGITS + 32) + digit) * BASE
    return st.sampled_from(range(offset, offset + n)).map(lambda value: value - offset)
