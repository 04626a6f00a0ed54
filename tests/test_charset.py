"""CharSet algebra and partition, checked against plain Python sets (brute force)."""

from hypothesis import given, settings, strategies as st

from pfuzz.base.charset import ALL, ALPHABETS, CharSet, partition

small_ranges = st.lists(st.tuples(st.integers(0, 40), st.integers(0, 40)), max_size=5)


def as_set(ranges):
    return {p for lo, hi in ranges for p in range(lo, hi + 1)}


@settings(max_examples=200, deadline=None, database=None)
@given(small_ranges, small_ranges)
def test_algebra_matches_python_sets(a, b):
    x, y = CharSet.of(a), CharSet.of(b)
    alphabet = CharSet.range(0, 40)
    assert set(x) == as_set(a)
    assert set(x | y) == as_set(a) | as_set(b)
    assert set(x & y) == as_set(a) & as_set(b)
    assert set((x - y) & alphabet) == as_set(a) - as_set(b)
    assert set(x.complement(alphabet)) == set(range(41)) - as_set(a)
    assert len(x) == len(as_set(a))
    # normal form: sorted, disjoint, not adjacent
    for (lo1, hi1), (lo2, hi2) in zip(x.ranges, x.ranges[1:]):
        assert hi1 + 1 < lo2


@settings(max_examples=200, deadline=None, database=None)
@given(st.lists(small_ranges, max_size=5))
def test_partition_refines_every_set(sets):
    alphabet = CharSet.range(0, 40)
    charsets = [CharSet.of(r) for r in sets]
    classes = partition(charsets, alphabet)
    covered = [p for c in classes for p in c]
    assert sorted(covered) == list(range(41))          # disjoint and covering
    for s in charsets:
        for c in classes:
            inter = set(c) & set(s)
            assert not inter or inter == set(c)         # each class is in or out
    # coarsest: two classes never have the same membership signature
    signatures = [tuple(c.min in s for s in charsets) for c in classes]
    assert len(set(signatures)) == len(signatures)
    assert [c.min for c in classes] == sorted(c.min for c in classes)


def test_nth_and_index_are_inverse():
    s = CharSet.of([(10, 12), (20, 20), (30, 35)])
    for i in range(len(s)):
        assert s.index(s.nth(i)) == i
    assert [s.nth(i) for i in range(len(s))] == list(s)


def test_alphabets():
    assert len(ALPHABETS["printable"]) == 95              # U+0020..U+007E
    assert len(ALPHABETS["ascii"]) == 128
    assert len(ALPHABETS["latin1"]) == 256
    assert len(ALPHABETS["bmp"]) == 0x10000 - 0x800      # surrogates excluded
    assert len(ALPHABETS["unicode"]) == 0x110000 - 0x800
    assert 0xD800 not in ALPHABETS["unicode"]
    assert len(ALL) == 0x110000


def test_describe_is_readable():
    assert CharSet.range("0", "9").describe() == "[0-9]"
    assert CharSet.single("a").describe() == "a"
    assert CharSet.from_chars("-]").describe() == "[\\-\\]]"
    assert CharSet.single("\n").describe() == "\\n"  # the name re and Python literals both read
