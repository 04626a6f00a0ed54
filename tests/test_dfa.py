"""DFA minimisation checked by brute force over all short strings on a 3-letter alphabet.

The reference is direct simulation of randomly generated automata (which the
minimised automata must agree with on every string up to length 6) and the
Myhill–Nerode characterisation of minimality: no two states of a minimal DFA
accept the same set of suffixes.
"""

from hypothesis import given, settings

from helpers import ALL_STRINGS, ALPHABET, language, random_dfas
from pfuzz.automata import algebra, dfa as automata, minimise as minimisation
from pfuzz.base.charset import CharSet, partition
from pfuzz.automata.dfa import DEAD, explore
from pfuzz.automata.minimise import minimise


def suffixes(d, state: int) -> frozenset[str]:
    """The strings up to length 6 that ``d`` accepts when read from ``state``."""
    return frozenset(w for w in ALL_STRINGS if d.run(w, state) in d.accepting)


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


def test_window_family_is_minimal():
    # (a|b)*a(a|b){k}: the minimal DFA remembers the last k+1 letters, 2**(k+1) states
    # (a standard fact of automata theory).
    alphabet = CharSet.range("a", "b")
    classes = partition([CharSet.single("a")], alphabet)
    for k in range(0, 9):
        def step(window, c, k=k):
            return (window + ("ab"[c],))[-(k + 1):]
        d = explore((), step, lambda w, k=k: len(w) == k + 1 and w[0] == "a", classes, alphabet)
        assert minimise(d).n_states == 2 ** (k + 1)


def test_moore_and_hopcroft_agree():
    alphabet = CharSet.range("a", "b")
    classes = partition([CharSet.single("a")], alphabet)
    def step(window, c):
        return (window + ("ab"[c],))[-7:]
    d = minimisation.trim(explore((), step, lambda w: len(w) == 7 and w[0] == "a", classes, alphabet))
    moore = minimisation._moore_blocks(d, 10**9)
    hopcroft = minimisation._hopcroft_blocks(d)
    assert len(set(moore)) == len(set(hopcroft))
    pairs = {(m, h) for m, h in zip(moore, hopcroft)}
    assert len(pairs) == len(set(moore))                  # the same partition


def test_from_strings_and_class_lookup():
    d = algebra.from_strings(["ab", "abc", "c"], ALPHABET)
    assert language(d) == {"ab", "abc", "c"}
    assert d.class_of("z") == -1 and not d.accepts("abz")
    assert automata.universal(ALPHABET).accepts("cab")
    assert automata.empty(ALPHABET).is_empty()


def test_explore_numbers_breadth_first_and_stops_at_the_cap():
    import pytest

    from pfuzz.errors import StateLimitError

    alphabet = CharSet.from_chars("ab")
    classes = partition([CharSet.single("a")], alphabet)

    def step(word, c):  # the binary words of length up to 4, one state each
        return word + "ab"[c] if len(word) < 4 else None

    d = explore("", step, lambda w: len(w) == 4, classes, alphabet)
    assert d.n_states == 31  # 1 + 2 + 4 + 8 + 16 (common practice: a full binary tree)
    assert d.table[0] == (1, 2) and d.table[1] == (3, 4) and d.table[30] == (DEAD, DEAD)
    assert d.accepting == frozenset(range(15, 31))
    assert explore("", step, lambda w: len(w) == 4, classes, alphabet, cap=31) == d
    with pytest.raises(StateLimitError, match="30"):
        explore("", step, lambda w: len(w) == 4, classes, alphabet, cap=30)


def test_explore_without_classes():
    d = explore(0, lambda s, c: None, lambda s: True, (), CharSet())
    assert d.n_states == 1 and d.table == ((),) and d.accepting == frozenset({0})


def test_run_remembers_classes_up_to_its_limit_without_changing_answers(monkeypatch):
    # Reference: Python's re on the same pattern; the remembered classes (DFA.run) must not
    # change any answer, with room for every character or for one only.
    import re

    import pfuzz
    pattern = r"[a-cß中]\w{2,}[^\W\d]"
    texts = ["abcd", "中ßßß", "a12x", "a1", "中中中中中", "aé_é", "bΩΩ9", "x中中中", "ßa\n"]
    for limit in (1, 1 << 16):
        monkeypatch.setattr(automata, "SEEN_LIMIT", limit)
        d = pfuzz.compile(pattern, alphabet="unicode").dfa
        for text in texts * 2:
            assert (d.run(text) in d.accepting) == (re.fullmatch(pattern, text) is not None), text
        assert len(d._seen) <= limit
