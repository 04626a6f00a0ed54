"""DFA algebra checked by brute force over all short strings on a 3-letter alphabet.

The reference is direct simulation of randomly generated automata (which the
minimised and combined automata must agree with on every string up to
length 6) and the Myhill–Nerode characterisation of minimality: no two
states of a minimal DFA accept the same set of suffixes.
"""

import itertools

from hypothesis import given, settings, strategies as st

from pfuzz import dfa as automata
from pfuzz.charset import CharSet, partition
from pfuzz.dfa import DEAD, DFA, explore, minimise

UNIVERSE = CharSet.range("a", "c")
CLASSES = tuple(partition([CharSet.single("a"), CharSet.single("b")], UNIVERSE))
ALL_STRINGS = ["".join(p) for n in range(7) for p in itertools.product("abc", repeat=n)]


@st.composite
def random_dfas(draw):
    n = draw(st.integers(1, 6))
    table = tuple(tuple(draw(st.integers(-1, n - 1)) for _ in CLASSES) for _ in range(n))
    accepting = frozenset(s for s in range(n) if draw(st.booleans()))
    return DFA(UNIVERSE, CLASSES, table, accepting)


def language(d: DFA) -> set[str]:
    return {w for w in ALL_STRINGS if d.accepts(w)}


def suffixes(d: DFA, state: int, depth: int = 6) -> frozenset[str]:
    words = ["".join(p) for n in range(depth + 1) for p in itertools.product("abc", repeat=n)]
    return frozenset(w for w in words if d.run(w, state) in d.accepting)


settings_ = settings(max_examples=150, deadline=None, database=None)


@settings_
@given(random_dfas())
def test_minimise_keeps_language_and_is_minimal(d):
    m = minimise(d)
    assert language(m) == language(d)
    live = m.live_states()
    if m.accepting:
        assert live == set(range(m.n_states))            # trimmed: every state is live
        seen = [suffixes(m, s) for s in range(m.n_states)]
        assert len(set(seen)) == len(seen)                # no two equivalent states
    else:
        assert m.n_states == 1 and all(t == DEAD for t in m.table[0])
    assert minimise(m) == m                               # canonical: a fixed point


@settings_
@given(random_dfas(), random_dfas())
def test_boolean_algebra(a, b):
    la, lb = language(a), language(b)
    everything = set(ALL_STRINGS)
    assert language(automata.intersection(a, b)) == la & lb
    assert language(automata.union(a, b)) == la | lb
    assert language(automata.difference(a, b)) == la - lb
    assert language(automata.symmetric_difference(a, b)) == la ^ lb
    assert language(automata.complement(a)) == everything - la


@settings_
@given(random_dfas(), random_dfas())
def test_distinguish_is_shortlex_least(a, b):
    diff = sorted(language(a) ^ language(b), key=lambda w: (len(w), w))
    word = automata.distinguish(a, b)
    if word is None:
        assert not diff
        assert minimise(a) == minimise(b)                 # equal languages, equal values
    else:
        assert word == diff[0]


@settings_
@given(random_dfas(), random_dfas())
def test_concatenation(a, b):
    la, lb = language(a), language(b)
    expected = {w for w in ALL_STRINGS
                if any(w[:i] in la and w[i:] in lb for i in range(len(w) + 1))}
    assert language(automata.concatenate(a, b)) == expected


@settings_
@given(random_dfas())
def test_lengths_and_finiteness(d):
    words = language(d)
    m = minimise(d)
    if words:
        assert automata.min_length(m) == min(map(len, words))
        assert automata.shortest(m) == min(words, key=lambda w: (len(w), w))
    else:
        assert automata.shortest(m) is None
    m_lengths = accepted_lengths(m, 2 * m.n_states + 2)
    if automata.is_finite(m):
        bound = automata.max_length(m)
        assert bound is None or bound < m.n_states        # a finite language is shorter than n
        assert not words or bound == max(m_lengths)
    else:
        # pumping lemma: an infinite regular language accepted by an n-state DFA
        # has a word whose length lies in [n, 2n)
        n = m.n_states
        assert any(n <= k < 2 * n for k in m_lengths)
        assert automata.max_length(m) is None


def accepted_lengths(d: DFA, up_to: int) -> set[int]:
    """Lengths k <= up_to with an accepted word, by layered simulation of state sets."""
    layer, found = {0}, set()
    for k in range(up_to + 1):
        if layer & d.accepting:
            found.add(k)
        layer = {t for s in layer for t in d.table[s] if t >= 0}
    return found


def test_window_family_is_minimal():
    # (a|b)*a(a|b){k}: the minimal DFA remembers the last k+1 letters, 2**(k+1) states
    # (a standard fact of automata theory).
    universe = CharSet.range("a", "b")
    classes = partition([CharSet.single("a")], universe)
    for k in range(0, 9):
        def step(window, c, k=k):
            return (window + ("ab"[c],))[-(k + 1):]
        d = explore((), step, lambda w, k=k: len(w) == k + 1 and w[0] == "a", classes, universe)
        assert minimise(d).n_states == 2 ** (k + 1)


def test_moore_and_hopcroft_agree():
    universe = CharSet.range("a", "b")
    classes = partition([CharSet.single("a")], universe)
    def step(window, c):
        return (window + ("ab"[c],))[-7:]
    d = automata.trim(explore((), step, lambda w: len(w) == 7 and w[0] == "a", classes, universe))
    moore = automata._moore_blocks(d, 10**9)
    hopcroft = automata._hopcroft_blocks(d)
    assert len(set(moore)) == len(set(hopcroft))
    pairs = {(m, h) for m, h in zip(moore, hopcroft)}
    assert len(pairs) == len(set(moore))                  # the same partition


def test_from_strings_and_class_lookup():
    d = automata.from_strings(["ab", "abc", "c"], UNIVERSE)
    assert language(d) == {"ab", "abc", "c"}
    assert d.class_of("z") == -1 and not d.accepts("abz")
    assert automata.universal(UNIVERSE).accepts("cab")
    assert automata.empty(UNIVERSE).is_empty()
