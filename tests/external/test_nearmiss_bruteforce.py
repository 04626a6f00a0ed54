"""Near-miss languages and witnesses against a brute force from the definitions.

References: Python's ``re.fullmatch`` (the standard library) decides what the
pattern accepts; the optimal string alignment distance is the textbook
dynamic program written out below (insertion, deletion, substitution, and
transposition of adjacent characters with no substring edited twice). A
string s is a near miss at distance d when ``re`` rejects it and some string
``re`` accepts lies within OSA distance d.

Candidates come from the definition too: if OSA(w, s) <= d, then w is made
from s by at most d single edits applied one after another, so the strings
within d single edits of s contain every w we need; the DP then decides the
distance exactly (sequential edits may edit a substring twice, which OSA
does not allow). Kinds name edits that turn the valid w into s; the DP with
only those operations gives the restricted distance.

Sizes: distance 1 over {a, b, c} up to length 7; distance 2 over {a, b} up
to length 7 and over {a, b, c} up to length 5; the per-kind languages and
the witnesses up to length 6 (all to keep the run short).
"""

from __future__ import annotations

import random
import re

import pytest

import pfuzz
from helpers import strings_upto
from pfuzz.counting.tables import Counter
from pfuzz.base.constants import EDIT_KINDS
from pfuzz.nearmiss.rejects import near_miss_dfa, sample_rejects
from pfuzz.nearmiss.edits import apply_edits

INVERSE = {"delete": "insert", "insert": "delete", "replace": "replace", "swap": "swap"}


def osa(w: str, s: str, kinds=EDIT_KINDS) -> int:
    """OSA distance from w to s using only ``kinds`` (edits that turn w into s)."""
    far = len(w) + len(s) + 1
    d = [[far] * (len(s) + 1) for _ in range(len(w) + 1)]
    d[0][0] = 0
    for i in range(len(w) + 1):
        for j in range(len(s) + 1):
            if i and j and w[i - 1] == s[j - 1]:
                d[i][j] = min(d[i][j], d[i - 1][j - 1])
            if i and "delete" in kinds:
                d[i][j] = min(d[i][j], d[i - 1][j] + 1)
            if j and "insert" in kinds:
                d[i][j] = min(d[i][j], d[i][j - 1] + 1)
            if i and j and "replace" in kinds and w[i - 1] != s[j - 1]:
                d[i][j] = min(d[i][j], d[i - 1][j - 1] + 1)
            if (i > 1 and j > 1 and "swap" in kinds and w[i - 1] == s[j - 2]
                    and w[i - 2] == s[j - 1] and w[i - 1] != w[i - 2]):
                d[i][j] = min(d[i][j], d[i - 2][j - 2] + 1)
    return d[len(w)][len(s)]


def single_edits(s: str, alphabet: str, kinds=EDIT_KINDS) -> set[str]:
    """Every string made from s by one edit of the given kinds."""
    out = set()
    for i in range(len(s) + 1):
        if "insert" in kinds:
            out.update(s[:i] + ch + s[i:] for ch in alphabet)
        if i < len(s) and "delete" in kinds:
            out.add(s[:i] + s[i + 1:])
        if i < len(s) and "replace" in kinds:
            out.update(s[:i] + ch + s[i + 1:] for ch in alphabet if ch != s[i])
        if i + 1 < len(s) and "swap" in kinds and s[i] != s[i + 1]:
            out.add(s[:i] + s[i + 1] + s[i] + s[i + 2:])
    return out


def within(s: str, alphabet: str, distance: int, kinds=EDIT_KINDS) -> list[set[str]]:
    """rings[k]: strings first reached from s by k sequential single edits (k <= distance)."""
    undo = [INVERSE[k] for k in kinds]  # w -> s by ``kinds`` means s -> w by their inverses
    rings, seen = [{s}], {s}
    for _ in range(distance):
        ring = set()
        for t in rings[-1]:
            ring |= single_edits(t, alphabet, undo)
        ring -= seen
        seen |= ring
        rings.append(ring)
    return rings


def nearest(rx, s: str, alphabet: str, distance: int, kinds=EDIT_KINDS):
    """(OSA distance, shortlex-least valid string at it), or None beyond ``distance``."""
    rings = within(s, alphabet, distance, kinds)
    if any(rx.fullmatch(w) for w in rings[1]):  # one edit is OSA distance 1
        return 1, min((w for w in rings[1] if rx.fullmatch(w)), key=lambda w: (len(w), w))
    valid = sorted((w for ring in rings[2:] for w in ring if rx.fullmatch(w)),
                   key=lambda w: (len(w), w))
    found = {w: osa(w, s, kinds) for w in valid}
    for k in range(2, distance + 1):
        for w in valid:
            if found[w] == k:
                return k, w
    return None


# -- random patterns from a small grammar ------------------------------------------------

def random_pattern(rng: random.Random, alphabet: str, depth: int = 3) -> str:
    if depth == 0 or rng.random() < 0.25:
        atoms = list(alphabet) * 3 + ["[" + "".join(sorted(rng.sample(alphabet, 2))) + "]", "."]
        return rng.choice(atoms)
    kind = rng.choice(["seq", "seq", "alt", "repeat"])
    if kind == "seq":
        return "".join(random_pattern(rng, alphabet, depth - 1) for _ in range(rng.randint(2, 3)))
    if kind == "alt":
        return "(?:" + "|".join(random_pattern(rng, alphabet, depth - 1) for _ in range(2)) + ")"
    quantifier = rng.choice(["*", "+", "?", "{2}", "{1,2}", "{0,3}"])
    return "(?:" + random_pattern(rng, alphabet, depth - 1) + ")" + quantifier


CASES = ([("abc", 1, 7, seed) for seed in range(12)] + [("ab", 2, 7, seed) for seed in range(10)]
         + [("abc", 2, 5, seed) for seed in range(20, 24)])


def _case(alphabet, seed):
    """A random pattern of the grammar above: never empty (no anchors or lookarounds)."""
    pattern = random_pattern(random.Random(seed * 31 + len(alphabet)), alphabet)
    return pattern, re.compile(pattern), pfuzz.compile(pattern, alphabet=f"[{alphabet}]")


@pytest.mark.parametrize("alphabet,distance,max_length,seed", CASES)
def test_near_miss_language_is_the_definition(alphabet, distance, max_length, seed):
    pattern, rx, lang = _case(alphabet, seed)
    nm = near_miss_dfa(lang.dfa, distance)
    for s in strings_upto(alphabet, max_length):
        expected = rx.fullmatch(s) is None and nearest(rx, s, alphabet, distance) is not None
        assert nm.accepts(s) == expected, (pattern, s)


@pytest.mark.parametrize("alphabet,distance,max_length,seed",
                         [c for c in CASES if c[1] == 1][:6] + [c for c in CASES if c[1] == 2][:4])
@pytest.mark.parametrize("kind", EDIT_KINDS)
def test_each_kind_is_its_own_language(alphabet, distance, max_length, seed, kind):
    pattern, rx, lang = _case(alphabet, seed)
    nm = near_miss_dfa(lang.dfa, distance, [kind])
    for s in strings_upto(alphabet, min(max_length, 6)):
        expected = rx.fullmatch(s) is None and nearest(rx, s, alphabet, distance, [kind]) is not None
        assert nm.accepts(s) == expected, (pattern, kind, s)


@pytest.mark.parametrize("alphabet,distance,max_length,seed", CASES[::2])
def test_witnesses_are_the_shortlex_least_nearest(alphabet, distance, max_length, seed):
    pattern, rx, lang = _case(alphabet, seed)
    for s in strings_upto(alphabet, min(max_length, 6)):
        if rx.fullmatch(s):
            continue
        found = nearest(rx, s, alphabet, distance)
        why = lang.explain(s)
        assert apply_edits(why.witness, why.edits) == s and len(why.edits) == why.distance
        assert rx.fullmatch(why.witness), (pattern, s, why)
        if found is not None:
            assert (why.distance, why.witness) == found, (pattern, s)
        else:
            assert why.distance > distance


@pytest.mark.parametrize("alphabet,distance,max_length,seed", CASES[1::3])
def test_sampled_rejects_and_their_kinds(alphabet, distance, max_length, seed):
    pattern, rx, lang = _case(alphabet, seed)
    # the case has near misses by the definition (the first one found suffices)
    assert any(rx.fullmatch(s) is None and nearest(rx, s, alphabet, distance) is not None
               for s in strings_upto(alphabet, max_length)), pattern
    for reject in sample_rejects(lang.dfa, 60, distance=distance, seed=seed, max_length=8):
        assert rx.fullmatch(reject.text) is None
        assert rx.fullmatch(reject.witness)
        assert apply_edits(reject.witness, reject.edits) == reject.text
        assert reject.distance == len(reject.edits) <= distance
        kinds = tuple(k for k in EDIT_KINDS
                      if nearest(rx, reject.text, alphabet, distance, [k]) is not None)
        assert reject.kinds == kinds, (pattern, reject)


def test_counts_agree_with_the_brute_force_set():
    pattern, rx, lang = _case("ab", 3)
    nm = Counter(near_miss_dfa(lang.dfa, 2))
    for n in range(7):
        expected = sum(1 for s in strings_upto("ab", n) if len(s) == n and rx.fullmatch(s) is None
                       and nearest(rx, s, "ab", 2) is not None)
        assert nm.count(n) == expected


def true_nearest(rx, s: str, alphabet: str) -> tuple[int, str]:
    """(least OSA distance from any valid string to s, the shortlex-least valid string at it),
    by brute force over valid strings of growing length. A string at OSA distance k from s is
    at most |s| + k long, so once the pool holds every valid string up to |s| + best, no
    longer one can be nearer or tie."""
    limit = len(s)
    while True:
        pool = [w for w in strings_upto(alphabet, limit) if rx.fullmatch(w)]
        if pool:
            best = min(osa(w, s) for w in pool)
            if limit >= len(s) + best:
                ties = [w for w in pool if osa(w, s) == best]
                return best, min(ties, key=lambda w: (len(w), w))
        limit += 1


def test_far_texts_get_a_true_nearest_string():
    # Beyond the near-miss distance: the reported distance is the least OSA distance to any
    # valid string, whatever that distance is (no case is skipped).
    checked = 0
    for seed in range(6):
        pattern, rx, lang = _case("ab", seed)
        for s in ["", "b", "aaaa", "babab", "bbbbbb"]:
            if rx.fullmatch(s):
                continue
            why = lang.explain(s)
            assert (why.distance, why.witness) == true_nearest(rx, s, "ab"), (pattern, s)
            checked += 1
    assert checked >= 20
