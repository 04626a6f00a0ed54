"""Rewrites of a syntax tree that keep its language and shrink its NFA.

Thompson's construction of ``(?:a?){2500}`` is 2,500 copies of an optional item in
a row: from the start, the ε-closure holds all of them, and every later closure
most of them, so the subset construction costs O(n²) although the minimal DFA has
n + 1 states. Two identities of repeats remove the cause before the NFA is built:

- a run of the same item, ``X{a,b}X{c,d}``, is ``X{a+c,b+d}`` (so ``a?`` written
  5,000 times is ``a{0,5000}``);
- ``(X{a,b}){m,n}`` is ``X{m·a,n·b}`` when the counts it allows have no gaps:
  when m = n, when a = 0, or when b is unbounded and m ≥ 1 (or a = 1).

Both hold for the sequences of copies of X, so they hold with assertions inside X
too; they are applied only where ``re``'s order of trying and what groups capture
cannot matter (no groups that are referred to, conditionals, atomic groups,
possessive or marked-lazy repeats below).

A possessive repeat of one character class C takes the longest run of C it may
and never gives one back, which needs no atomic groups (whose priority checks
cost O(n²) over n nested copies: ``a{,1001}+`` took 8 s):

- ``C{m,}+`` is ``C{m,}(?!C)``;
- ``C{m,n}+`` (m < n) is ``(?:C{n}|C{m,n-1}(?!C))``: n of them, or fewer with no C after;
- ``C{m}+`` is ``C{m}``.

Cost: linear in the tree size.
"""

from __future__ import annotations

from pfuzz.syntax.tree import (Alternation, Anchor, Boundary, Chars, Lookahead, Lookbehind, Node, Repeat,
                               Sequence)

_ASSERTIONS = (Anchor, Boundary, Lookahead, Lookbehind)


def simplify(tree: Node) -> Node:
    """``tree`` with runs merged and nested repeats folded where exact (see the module doc)."""
    return _simplify(tree, {})[0]


def _simplify(node: Node, shapes: dict) -> tuple[Node, bool]:
    """The simplified node and whether it is *plain* (order and captures cannot matter)."""
    if isinstance(node, (Chars,) + _ASSERTIONS):
        if isinstance(node, (Lookahead, Lookbehind)):
            item, plain = _simplify(node.item, shapes)
            return type(node)(item, node.negative, node.position), plain
        return node, True
    if isinstance(node, Sequence):
        parts = [_simplify(item, shapes) for item in node.items]
        plain = all(p for _, p in parts)
        items = [item for item, _ in parts]
        if not plain:
            return Sequence(tuple(items), node.position), plain
        merged = _merge_runs(items, shapes)
        return (merged[0] if len(merged) == 1 else Sequence(merged, node.position)), plain
    if isinstance(node, Alternation):
        parts = [_simplify(option, shapes) for option in node.options]
        return Alternation(tuple(o for o, _ in parts), node.position), all(p for _, p in parts)
    if isinstance(node, Repeat):
        run = _longest_run(node)
        if run is not None:
            return run, True
        item, plain = _simplify(node.item, shapes)
        plain = plain and not node.lazy and not node.possessive
        repeat = Repeat(item, node.min, node.max, node.position, node.lazy, node.possessive)
        return (_fold(repeat) if plain else repeat), plain
    return node, False  # groups, references, conditionals, atomic groups: left as they are


def _longest_run(node: Repeat) -> Node | None:
    """A possessive repeat of one character class without atomic groups (see the module doc);
    None for any other repeat."""
    if not (node.possessive and isinstance(node.item, Chars)):
        return None
    chars, low, high, at = node.item, node.min, node.max, node.position
    if high == low:
        return Repeat(chars, low, high, at)
    fewer = Sequence((Repeat(chars, low, None if high is None else high - 1, at),
                      Lookahead(chars, True, at)), at)
    if high is None:
        return fewer
    return Alternation((Repeat(chars, high, high, at), fewer), at)


def _fold(node: Repeat) -> Node:
    inner = node.item
    if not isinstance(inner, Repeat) or inner.lazy or inner.possessive:
        return node
    a, b, m, n = inner.min, inner.max, node.min, node.max
    if m == n:
        return Repeat(inner.item, m * a, None if b is None else m * b, node.position)
    if a == 0:
        high = 0 if b == 0 or n == 0 else None if b is None or n is None else n * b
        return Repeat(inner.item, 0, high, node.position)
    if b is None and (m >= 1 or a == 1):
        return Repeat(inner.item, m * a, None, node.position)
    return node


def _merge_runs(items: list[Node], shapes: dict) -> tuple[Node, ...]:
    """Adjacent copies of one item (bare or repeated) merged into one repeat."""
    out: list[Node] = []
    for item in items:
        base, low, high = _counted(item)
        if out and not isinstance(base, _ASSERTIONS):
            previous, p_low, p_high = _counted(out[-1])
            if _shape(previous, shapes) == _shape(base, shapes):
                total = None if high is None or p_high is None else high + p_high
                position = out[-1].position
                out[-1] = Repeat(previous, low + p_low, total, position)
                continue
        out.append(item)
    return tuple(out)


def _counted(node: Node) -> tuple[Node, int, int | None]:
    if isinstance(node, Repeat) and not node.lazy and not node.possessive:
        return node.item, node.min, node.max
    return node, 1, 1


def _shape(node: Node, shapes: dict):
    """A key equal for trees that differ only in positions."""
    key = id(node)
    hit = shapes.get(key)
    if hit is None:
        if isinstance(node, Chars):
            hit = ("chars", node.chars, node.source, node.flags)
        elif isinstance(node, (Sequence, Alternation)):
            parts = node.items if isinstance(node, Sequence) else node.options
            hit = (type(node).__name__, tuple(_shape(part, shapes) for part in parts))
        elif isinstance(node, Repeat):
            hit = ("repeat", _shape(node.item, shapes), node.min, node.max, node.lazy, node.possessive)
        else:
            hit = ("node", id(node))  # assertions and the rest: equal only to themselves
        shapes[key] = (hit, node)  # keep the node alive so that its id stays its own
        return hit
    return hit[0]
