"""Tests for pfuzz.boundary.suite and pfuzz.boundary.edges.

References outside the code under test:

- Python's ``re.fullmatch`` for every verdict and every witness;
- a model of a language's states built with ``re`` alone (``ReModel``): two
  prefixes are in the same state when the same suffixes complete them (the
  Myhill–Nerode residuals, enumerated over a small alphabet for languages of
  bounded length), so "state q" and "a maximal range of q" are defined without
  pfuzz's automata;
- brute-force enumeration of strings over a-c for automata built from Python
  predicates (so those do not depend on the pattern compiler either).
"""

from __future__ import annotations

import re
from functools import lru_cache

import pytest
from hypothesis import given, settings, strategies as st

import pfuzz
from helpers import flat_transitions, strings_upto
from pfuzz.automata.algebra import from_strings
from pfuzz.automata.dfa import explore
from pfuzz.automata.minimise import minimise
from pfuzz.base.charset import CharSet
from pfuzz.base.constants import UNBOUNDED_SPAN
from pfuzz.boundary.suite import CATEGORIES, DEFAULT_LIMIT, coverage, suite
from pfuzz.errors import ArgumentError

#: Realistic validator patterns; every case's verdict is checked against re.fullmatch.
PATTERNS = [
    r"[0-9]{4}-[0-9]{2}-[0-9]{2}",
    r"(0[1-9]|1[0-2])/(0[1-9]|[12][0-9]|3[01])",
    r"([01][0-9]|2[0-3]):[0-5][0-9]",
    r"[A-Z]{2}[0-9]{2}[A-Z0-9]{4}[0-9]{7}([A-Z0-9]?){0,16}",
    r"[A-Za-z_][A-Za-z0-9_]{0,30}",
    r"[a-z0-9._%+-]+@[a-z0-9.-]+\.[a-z]{2,6}",
    r"\+[1-9][0-9]{0,2}[0-9]{4,12}",
    r"#([0-9a-fA-F]{3}|[0-9a-fA-F]{6})",
    r"(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])(\.(25[0-5]|2[0-4][0-9]|1[0-9]{2}|[1-9]?[0-9])){3}",
    r"(0|[1-9][0-9]*)\.(0|[1-9][0-9]*)\.(0|[1-9][0-9]*)",
    r"[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}",
    r"[A-Z]{1,2}[0-9][A-Z0-9]? ?[0-9][A-Z]{2}",
    r"[0-9]{5}(-[0-9]{4})?",
    r"-?(0|[1-9][0-9]{0,8})(\.[0-9]{1,2})?",
    r"(?i)[a-f0-9]{2}(:[a-f0-9]{2}){5}",
    r"[a-z]+(-[a-z]+)*",
    r"(ab)+",
    r"a{3,5}|b{7}",
    r"(?=.*[0-9])(?=.*[a-z])[a-z0-9]{6,12}",
    r"(?!.*  ).{1,20}",
    r"[A-Z][a-z]+( [A-Z][a-z]+)?",
    r"[0-9]{1,3}(,[0-9]{3})*(\.[0-9]{2})?",
    r"(true|false|yes|no|on|off)",
    r"\d{2}\.\d{2}\.\d{4}",
    r"[^,;\s]{1,10}",
    r"x*y?x{2}",
    r"(foo|foobar|bar)baz?",
]
KINDS = {"shortest": {""}, "longest": {""}, "length-edge": {"valid", "shorter", "longer"},
         "range-edge": {"low", "high", "below", "above"}, "repetition": {"one-more", "one-fewer"},
         "exit": {"outside"}, "coverage": {""}}


def one_edit_apart(witness: str, text: str, edit) -> bool:
    """The edit, applied by hand, turns the witness into the text (insert, delete or replace)."""
    p = edit.position
    if edit.kind == "insert":
        made = witness[:p] + edit.new + witness[p:]
    elif edit.kind == "delete":
        made = witness[:p] + witness[p + len(edit.old):] if witness[p:p + len(edit.old)] == edit.old else None
    elif edit.kind == "replace":
        made = witness[:p] + edit.new + witness[p + 1:] if witness[p:p + 1] == edit.old else None
    else:
        return False
    return made == text


def check_against_re(pattern: str, cases, alphabet, flags=0) -> None:
    for case in cases:
        reference = re.fullmatch(pattern, case.text, flags) is not None   # reference: Python's re
        assert case.expected == reference, (pattern, case)
        assert case.category in CATEGORIES and case.kind in KINDS[case.category], case
        assert case.reason
        assert all(ch in alphabet for ch in case.text), case
        if not case.expected:
            assert re.fullmatch(pattern, case.witness, flags), case         # reference: Python's re
            (edit,) = case.edits
            assert one_edit_apart(case.witness, case.text, edit), case
        else:
            assert case.witness is None and case.edits == ()
    assert len({c.text for c in cases}) == len(cases)


@pytest.mark.parametrize("pattern", PATTERNS)
def test_every_case_agrees_with_re_and_carries_a_witness(pattern):
    lang = pfuzz.compile(pattern)
    cases = suite(lang.dfa)
    assert cases and cases.cut == 0
    check_against_re(pattern, cases, lang.alphabet)


@pytest.mark.parametrize("pattern", [r"[0-9]{3}-[A-Z]", r"(?i)[a-f]{2}", r"\w+@\w+"])
def test_every_case_agrees_with_re_over_a_wide_alphabet_with_probes(pattern):
    probes = CharSet.from_chars("\n\r\t\u00a0") | CharSet.range(0x0660, 0x0669)
    lang = pfuzz.compile(pattern, alphabet="bmp")
    cases = suite(lang.dfa, probes=probes)
    check_against_re(pattern, cases, lang.alphabet)
    # every probe character appears somewhere, refused where the pattern refuses it
    for ch in "\n\r\t\u00a0\u0660":
        assert any(ch in c.text for c in cases), ch


# -- position-aware edges against a model of the states made with re alone ---------------

class ReModel:
    """States and transitions of a language of bounded length, from re.fullmatch only.

    A prefix's residual is the set of suffixes (up to ``bound`` characters in
    all) that complete it; equal residuals are one state (Myhill–Nerode). This
    is exact when no valid string is longer than ``bound``.
    """

    def __init__(self, pattern: str, letters: str, bound: int):
        self.pattern, self.letters, self.bound = pattern, "".join(sorted(letters)), bound
        self.residual = lru_cache(maxsize=None)(self._residual)

    def accepts(self, text: str) -> bool:
        return re.fullmatch(self.pattern, text) is not None

    def _residual(self, prefix: str) -> frozenset:
        if len(prefix) > self.bound:
            return frozenset()
        return frozenset(w for w in strings_upto(self.letters, self.bound - len(prefix))
                         if self.accepts(prefix + w))

    def states(self) -> dict[frozenset, str]:
        """Each live state with its shortlex-least prefix."""
        found: dict[frozenset, str] = {}
        for u in strings_upto(self.letters, self.bound):
            r = self.residual(u)
            if r and r not in found:
                found[r] = u
        return found

    def ranges(self, prefix: str) -> list[tuple[int, int, frozenset]]:
        """Maximal code-point ranges of characters that lead from the prefix's state to one state."""
        out: list[list] = []
        for ch in self.letters:
            target = self.residual(prefix + ch)
            if not target:
                continue
            if out and out[-1][1] == ord(ch) - 1 and out[-1][2] == target:
                out[-1][1] = ord(ch)
            else:
                out.append([ord(ch), ord(ch), target])
        return [tuple(r) for r in out]


SMALL = [
    (r"[b-d]{2}[a-c]e?", "abcdef"),
    (r"(a|[c-e]f)[b-f]", "abcdef"),
    (r"(?i)[b-d]a?", "ABCDEabcde"),
    (r"[a-c]{1,3}", "abcde"),
    (r"x?[0-3][2-5]", "0123456x"),
    (r"(ab|b[a-c]c)d?", "abcd"),
]


@pytest.mark.parametrize("pattern,letters", SMALL)
def test_every_state_and_range_has_its_edges_and_neighbours(pattern, letters):
    model = ReModel(pattern, letters, 5)
    cases = suite(pfuzz.compile(pattern, alphabet=f"[{letters}]").dfa)
    check_against_re(pattern, cases, CharSet.from_chars(letters))

    def tested(state, point, valid):
        """Some case reaches ``state`` and then writes chr(point), with the verdict ``valid``."""
        return any(c.expected == valid and model.residual(c.text[:i]) == state
                   and c.text[i] == chr(point)
                   for c in cases for i in range(len(c.text)))

    def repeated(state, point, more):
        """Some case is one more (or one fewer) chr(point) than a valid string, at ``state``."""
        ch = chr(point)
        for c in cases:
            for i in range(len(c.text) + 1):
                if model.residual(c.text[:i]) != state:
                    continue
                if more and c.text[i:i + 2] == ch * 2 and model.accepts(c.text[:i] + c.text[i + 1:]):
                    return True
                if not more and model.accepts(c.text[:i] + ch + c.text[i:]):
                    return True
        return False

    pairs = 0
    for state, prefix in model.states().items():
        for lo, hi, _ in model.ranges(prefix):
            pairs += 1
            assert tested(state, lo, True) and tested(state, hi, True), (prefix, chr(lo), chr(hi))
            for outside in (lo - 1, hi + 1):
                if chr(outside) in letters and not model.residual(prefix + chr(outside)):
                    assert tested(state, outside, False), (prefix, chr(outside))
            assert repeated(state, lo, True) and repeated(state, lo, False), (prefix, chr(lo))
    assert pairs >= 3


def test_range_edges_at_every_position():
    cases = suite(pfuzz.compile(r"[0-9]{3}-x").dfa)
    by_text = {c.text: c for c in cases}
    # '/' and ':' are the neighbours of '0' and '9' in ASCII (common practice: the ASCII table)
    for text in ("/00-x", "0/0-x", "00/-x", ":00-x", "0:0-x", "00:-x"):
        assert not by_text[text].expected and by_text[text].category == "range-edge"
        assert re.fullmatch(r"[0-9]{3}-x", text) is None
    for text in ("900-x", "090-x", "009-x"):
        assert by_text[text].expected and by_text[text].kind == "high"
    assert "at position 1" in by_text["0/0-x"].reason and "just below" in by_text["0/0-x"].reason
    # one more and one fewer digit, one edit from the shortest valid string
    assert not by_text["0000-x"].expected and not by_text["00-x"].expected
    assert by_text["000-xx"].category == "length-edge"


def test_a_character_between_two_ranges_is_one_case():
    # 'd' is refused between [a-c] and [e-g]: just above one, just below the other
    cases = suite(pfuzz.compile(r"([a-c]|[e-g]x)y", alphabet="[a-z]").dfa)
    first_d = [c for c in cases if c.text.startswith("d")]
    assert len(first_d) == 1 and not first_d[0].expected


def test_repeats_are_merged_and_keep_the_first_category():
    cases = suite(pfuzz.compile(r"[0-9]{2,3}").dfa)
    (shortest,) = [c for c in cases if c.text == "00"]
    # '00' is the shortest string, a length edge, a low edge and one fewer than '000': one case
    assert shortest.category == "shortest"
    assert "low end of '0'-'9' at position 0" in shortest.reason
    assert "one fewer of '0'-'9' at position 2" in shortest.reason
    assert len({c.text for c in cases}) == len(cases)


def test_probe_characters_are_tried_where_they_are_refused():
    # the audit's use: a final newline after a complete valid string, other scripts' digits
    lang = pfuzz.compile(r"[0-9]{2}", alphabet="[\\x00-\\xff\u0660-\u0669]")
    probes = CharSet.single("\n") | CharSet.range(0x0660, 0x0669)
    texts = {c.text: c for c in suite(lang.dfa, probes=probes)}
    assert not texts["00\n"].expected and texts["00\n"].witness == "00"
    assert not texts["\u06600"].expected and not texts["0\u0660"].expected
    without = {c.text for c in suite(lang.dfa)}
    assert "00\n" not in without      # '\n' is inside the refused range '\x00'-'/' without probes


# -- the limit and what it cuts --------------------------------------------------------------

def test_the_limit_keeps_a_prefix_and_reports_the_cut():
    dfa = pfuzz.compile(r"[a-z0-9]{1,40}").dfa
    full = suite(dfa, limit=None)
    assert full.cut == 0 and full.note() is None and len(full) > 300
    cut = suite(dfa, limit=300)
    assert list(cut) == list(full)[:300]
    assert len(cut) == 300 and cut.cut == len(full) - 300
    left_out = {k: sum(c.category == k for c in list(full)[300:]) for k in CATEGORIES}
    assert cut.cut_by_category == {k: n for k, n in left_out.items() if n}
    assert "300 of" in cut.note() and f"{len(full):,}" in cut.note()
    assert suite(dfa, limit=0).cut == len(full)
    assert suite(dfa).limit == DEFAULT_LIMIT


def test_every_position_gets_an_invalid_edge_before_any_gets_a_second():
    pattern = r"[0-9]{6}"
    full = suite(pfuzz.compile(pattern).dfa, limit=None)
    head = sum(c.category in ("shortest", "longest", "length-edge") for c in full)
    first = list(full)[head:head + 6]
    # one refused character per position, each in a different place (reference: re)
    places = sorted(next(i for i, ch in enumerate(c.text) if not ch.isdigit()) for c in first)
    assert places == list(range(6))
    assert all(re.fullmatch(pattern, c.text) is None for c in first)


def test_bad_arguments_are_refused():
    dfa = pfuzz.compile("a").dfa
    for bad in (-1, 1.5, True):
        with pytest.raises(ArgumentError, match="limit"):
            suite(dfa, limit=bad)
    with pytest.raises(ArgumentError, match="max_length"):
        suite(dfa, max_length=-1)


@pytest.mark.parametrize("pattern", PATTERNS[:10])
def test_suite_is_deterministic(pattern):
    assert suite(pfuzz.compile(pattern).dfa) == suite(pfuzz.compile(pattern).dfa)


@pytest.mark.parametrize("pattern", PATTERNS)
def test_size_is_linear_in_the_transitions(pattern):
    dfa = pfuzz.compile(pattern).dfa
    cases = suite(dfa, limit=None)
    edges = flat_transitions(dfa)
    ranges = sum(len(label.ranges) for _, label, _ in edges)
    states = len({s for s, _, _ in edges}) + 1
    count = {k: sum(c.category == k for c in cases) for k in CATEGORIES}
    assert count["shortest"] == 1 and count["longest"] <= 1
    assert count["coverage"] <= len(edges)
    # at most 4 per range (two ends, two repetitions), 2 per refused range (at most ranges + 1
    # per state over a one-range alphabet), the length edges and the cover
    assert len(cases) <= 4 * ranges + 2 * (ranges + states) + count["length-edge"] + len(edges) + 2


# -- automata built from predicates, checked by brute force --------------------------

AB = CharSet.range("a", "c")

FINITE_PREDICATES = [
    lambda s: 2 <= len(s) <= 5 and s.count("a") % 2 == 0,
    lambda s: s in {"ab", "abc", "b", "ca", "cab", "ccccc"},
    lambda s: len(s) in (1, 4, 5) and s.startswith("a"),
    lambda s: len(s) <= 4 and "bb" not in s,
    lambda s: len(s) == 3 and s[1] != "c",
    lambda s: s == "",
]


def mod_dfa(modulus, residue, letter="a"):
    """Strings over a-c whose count of ``letter`` is ``residue`` modulo ``modulus`` (infinite)."""
    classes = [CharSet.single(c) for c in "abc"]

    def step(k, c):
        return (k + (1 if "abc"[c] == letter else 0)) % modulus

    return minimise(explore(0, step, lambda k: k == residue, classes, AB)), \
        (lambda s: s.count(letter) % modulus == residue)


@pytest.mark.parametrize("index", range(len(FINITE_PREDICATES)))
def test_finite_suites_against_brute_force(index):
    member = FINITE_PREDICATES[index]
    valid = [s for s in strings_upto("abc", 6) if member(s)]
    lengths = sorted({len(s) for s in valid})
    cases = suite(from_strings(valid, AB))
    for case in cases:
        assert case.expected == member(case.text), case  # reference: the predicate itself
    assert cases[0].category == "shortest" and cases[0].text == min(valid, key=lambda s: (len(s), s))
    longest = min(valid, key=lambda s: (-len(s), s))
    assert any(c.text == longest for c in cases)
    for n in (n for n in lengths if n - 1 not in lengths or n + 1 not in lengths):
        assert min(s for s in valid if len(s) == n) in {c.text for c in cases}
        for m in (m for m in (n - 1, n + 1) if m >= 0 and m not in lengths):
            assert any(len(c.text) == m and not c.expected for c in cases), (n, m)


@pytest.mark.parametrize("modulus,residue,letter", [(3, 0, "a"), (2, 1, "b"), (4, 2, "c")])
def test_unbounded_suite_uses_the_documented_bound(modulus, residue, letter):
    dfa, member = mod_dfa(modulus, residue, letter)
    cases = suite(dfa)
    for case in cases:
        assert case.expected == member(case.text), case
    shortest = min((s for s in strings_upto("abc", 4) if member(s)), key=lambda s: (len(s), s))
    assert cases[0].text == shortest
    (longest,) = [c for c in cases if c.category == "longest"]
    assert len(longest.text) == len(shortest) + UNBOUNDED_SPAN
    assert "no upper limit" in longest.reason
    (longest,) = [c for c in suite(dfa, max_length=9) if c.category == "longest"]
    assert longest.text == min(s for s in strings_upto("abc", 9) if len(s) == 9 and member(s))


def test_length_edges_of_a_periodic_language():
    # valid lengths of (ab)+ over a-c: 2, 4, 6, ...: the scan stops once the pattern repeats
    classes = [CharSet.single(c) for c in "abc"]
    dfa = minimise(explore(
        (0, False), lambda st, c: ((st[0] + 1) % 2, True) if "abc"[c] == "ab"[st[0]] else None,
        lambda st: st[1] and st[0] == 0, classes, AB))
    edges = [c for c in suite(dfa) if c.category == "length-edge"]
    assert sorted(len(c.text) for c in edges) == [1, 3]
    assert all(not c.expected for c in edges)


def test_empty_language_has_an_empty_suite():
    assert list(suite(from_strings([], AB))) == [] and suite(from_strings([], AB)).cut == 0
    assert coverage(from_strings([], AB)) == []


# -- coverage -------------------------------------------------------------------------

def taken(dfa, text):
    pairs, s = set(), 0
    for ch in text:
        t = dfa.table[s][dfa.class_of(ch)]
        pairs.add((s, t))
        s = t
    return pairs


def live_transitions_from_table(dfa):
    """Every (state, next state) pair of the table between live states (independent of boundary)."""
    live = dfa.live_states()
    return {(s, t) for s in live for t in dfa.table[s] if t >= 0 and t in live}


def assert_covers(dfa):
    strings = coverage(dfa)
    assert all(dfa.accepts(s) for s in strings)
    union = set().union(*(taken(dfa, s) for s in strings)) if strings else set()
    assert union == live_transitions_from_table(dfa)
    assert len(strings) <= len(flat_transitions(dfa))


@pytest.mark.parametrize("index", range(len(FINITE_PREDICATES)))
def test_coverage_takes_every_transition_of_small_automata(index):
    valid = [s for s in strings_upto("abc", 6) if FINITE_PREDICATES[index](s)]
    assert_covers(from_strings(valid, AB))


def test_coverage_of_cyclic_automata():
    for args in [(3, 0, "a"), (5, 2, "b")]:
        assert_covers(mod_dfa(*args)[0])


@pytest.mark.parametrize("pattern", PATTERNS[:12])
def test_valid_edges_take_every_transition(pattern):
    dfa = pfuzz.compile(pattern).dfa
    valid = [c.text for c in suite(dfa, limit=None) if c.expected and c.category != "coverage"]
    assert set().union(*(taken(dfa, s) for s in valid)) == live_transitions_from_table(dfa)


# -- random small patterns (Hypothesis) against re.fullmatch ------------------------------

ATOMS = ["a", "b", "[ab]", "[^a]", ".", "[a-c]", "c"]


@st.composite
def small_patterns(draw, depth=2):
    if depth == 0 or draw(st.booleans()):
        return draw(st.sampled_from(ATOMS))
    kind = draw(st.sampled_from(["seq", "alt", "repeat"]))
    inner = small_patterns(depth - 1)
    if kind == "seq":
        return "".join(draw(st.lists(inner, min_size=2, max_size=3)))
    if kind == "alt":
        return "(" + "|".join(draw(st.lists(inner, min_size=2, max_size=3))) + ")"
    return "(" + draw(inner) + ")" + draw(st.sampled_from(["*", "+", "?", "{2}", "{1,3}", "{0,2}"]))


@settings(max_examples=150, deadline=None, database=None)
@given(small_patterns())
def test_random_patterns_agree_with_re_and_are_covered(pattern):
    lang = pfuzz.compile(pattern, alphabet="[a-d]")
    cases = suite(lang.dfa)
    check_against_re(pattern, cases, lang.alphabet)
    if not lang.is_empty():
        assert_covers(lang.dfa)
        assert cases[0].text == lang.shortest()
