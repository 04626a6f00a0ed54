"""The elements of a sequence while parsing, and the nodes they build.

``re``'s parser splices a group without flags into its parent and merges an
alternation of single literals and non-negated classes into one class
(``re/_parser.py``, ``_parse_sub``); ``Item`` keeps what that needs to know, and
``build`` gives the node for a run of items. Cost: linear in the items.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.base.charset import CharSet
from pfuzz.syntax.tree import Chars, Node, Sequence


@dataclass(frozen=True)
class Item:
    """One element of a sequence while parsing.

    ``ops`` is how many elements ``re``'s own parser sees here (its groups
    without flags dissolve into their parent), ``plain`` whether it is a
    single literal or non-negated class, which ``re`` merges across ``|``.
    """

    node: Node
    ops: int = 1
    plain: bool = False



def dissolved(items: list[Item], start: int) -> Item:
    """A group without flags: re splices its elements into the parent sequence."""
    ops = sum(item.ops for item in items)
    return Item(build(items, start), ops, single_plain(items) is not None)


def single_plain(items: list[Item]) -> Chars | None:
    """The one literal or non-negated class these items amount to in re's eyes, if so."""
    counted = [item for item in items if item.ops]
    if len(counted) != 1 or counted[0].ops != 1 or not counted[0].plain:
        return None
    node = build(items, 0)
    return node if isinstance(node, Chars) else None


def merge_options(options: list[list[Item]], start: int) -> Chars | None:
    """The one class re makes of ``a|[bc]|\\d`` (options that are single plain atoms), or None."""
    atoms = [single_plain(option) for option in options]
    if any(atom is None for atom in atoms) or len({atom.flags for atom in atoms}) != 1:
        return None
    chars = CharSet.union([atom.chars for atom in atoms])
    source = "|".join(atom.source for atom in atoms)
    return Chars(chars, start, source, atoms[0].flags)


def build(items: list[Item], position: int) -> Node:
    """The node for a run of items: nested sequences spliced, a single item as itself."""
    nodes: list[Node] = []
    for item in items:
        if isinstance(item.node, Sequence):
            nodes.extend(item.node.items)
        else:
            nodes.append(item.node)
    if len(nodes) == 1:
        return nodes[0]
    return Sequence(tuple(nodes), position)
