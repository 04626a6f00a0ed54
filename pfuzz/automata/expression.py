"""Regular expressions as values that simplify themselves, written as ``re`` text.

State elimination (``pfuzz.automata.elimination``) builds its expressions here. The
smart constructors of ``Algebra`` keep expressions small and readable while
preserving the language exactly:

- ε/∅ algebra (∅ absorbs concatenation and vanishes from alternation, ε is
  the unit of concatenation, ``ε|x`` is ``x?``), flattening, deduplication;
- character alternatives merge into one class, written over the alphabet as
  ``[...]`` ranges or a negated ``[^...]`` class, whichever is shorter
  (gaps holding no character of the alphabet are bridged);
- runs ``x{a,b} x{c,d}`` merge into ``x{a+c,b+d}``; nested counts
  ``(x{a,b}){c,d}`` merge into ``x{ac,bd}`` when no count is skipped;
  alternatives ``x{a,b}|x{c,d}`` with touching count ranges merge;
- common first and last items of alternatives are factored out
  (``ab|ac`` → ``a[bc]``) when that makes the text no longer.

Every node carries its rendered text; two nodes are equal when their texts
are, which is sound because equal texts denote equal languages. Rendering at
construction costs O(size) per node, so ``Algebra`` can charge every node
against a work budget and stop (``TooLarge``) before the text explodes, as
state elimination can make it do. The rules are the usual identities of
Kleene algebra (common practice); the gap-free rule for nested counts is
proved in ``_gap_free``.
"""

from __future__ import annotations

from pfuzz.base.charset import CharSet
from pfuzz.base.escaping import escape_point

#: What each node built is charged against a work budget, besides its text.
NODE_CHARGE = 64
#: The pattern of the empty language: a class with no character in it.
NOTHING_TEXT = r"[^\s\S]"

ALT, CAT, ATOM = 0, 1, 2


class TooLarge(Exception):
    """An intermediate expression outgrew the work limit."""


class Expr:
    """An expression node; two nodes are equal when they render the same text."""

    __slots__ = ("text", "prec", "nullable", "lead")

    def __init__(self, text: str, prec: int, nullable: bool, lead: int = -1):
        self.text, self.prec, self.nullable = text, prec, nullable
        self.lead = lead  # smallest code point the expression's first item can read (a sort key)

    def __eq__(self, other) -> bool:
        return isinstance(other, Expr) and self.text == other.text

    def __hash__(self) -> int:
        return hash(self.text)

    def __repr__(self) -> str:
        return f"{type(self).__name__}({self.text!r})"


class Nothing(Expr):
    __slots__ = ()


class Empty(Expr):
    __slots__ = ()


class Sym(Expr):
    __slots__ = ("chars",)

    def __init__(self, chars: CharSet, text: str):
        super().__init__(text, ATOM, False, chars.min)
        self.chars = chars


class Cat(Expr):
    __slots__ = ("parts",)

    def __init__(self, parts: tuple[Expr, ...]):
        super().__init__("".join(_wrap(p, CAT) for p in parts), CAT,
                         all(p.nullable for p in parts), parts[0].lead)
        self.parts = parts


class Alt(Expr):
    __slots__ = ("options",)

    def __init__(self, options: tuple[Expr, ...]):
        super().__init__("|".join(o.text for o in options), ALT, any(o.nullable for o in options),
                         min(o.lead for o in options))
        self.options = options


class Rep(Expr):
    __slots__ = ("base", "lo", "hi")

    def __init__(self, base: Expr, lo: int, hi: int | None):
        text, prec = _render_rep(base, lo, hi)
        super().__init__(text, prec, lo == 0 or base.nullable, base.lead)
        self.base, self.lo, self.hi = base, lo, hi


NOTHING = Nothing(NOTHING_TEXT, ATOM, False)
EMPTY = Empty("", ATOM, True)


def _wrap(expr: Expr, need: int) -> str:
    return expr.text if expr.prec >= need else f"(?:{expr.text})"


def _quantifier(lo: int, hi: int | None) -> str:
    if hi is None:
        return {0: "*", 1: "+"}.get(lo, f"{{{lo},}}")
    if (lo, hi) == (0, 1):
        return "?"
    return f"{{{lo}}}" if lo == hi else f"{{{lo},{hi}}}"


def _render_rep(base: Expr, lo: int, hi: int | None) -> tuple[str, int]:
    inner = base.text if base.prec == ATOM and not isinstance(base, Rep) else f"(?:{base.text})"
    quantified = inner + _quantifier(lo, hi)
    if isinstance(base, Sym) and lo == hi and len(base.text) * lo <= len(quantified):
        return base.text * lo, CAT
    return quantified, ATOM


def _runs(expr: Expr) -> tuple[Expr, int, int | None]:
    """``expr`` as base{lo,hi}: a Rep's own parts, otherwise (expr, 1, 1)."""
    if isinstance(expr, Rep):
        return expr.base, expr.lo, expr.hi
    return expr, 1, 1


def _add(a: int | None, b: int | None) -> int | None:
    return None if a is None or b is None else a + b


def _gap_free(inner_lo: int, inner_hi: int | None, lo: int, hi: int | None) -> bool:
    """True when (x{inner_lo,inner_hi}){lo,hi} is x{inner_lo*lo, inner_hi*hi}.

    The counts reachable with k copies form [k·il, k·ih]; consecutive intervals
    touch for every k ≥ lo exactly when they touch at k = lo, since the gap
    between them only shrinks as k grows.
    """
    if hi is not None and hi == lo:
        return True
    end = 0 if lo == 0 else (None if inner_hi is None else lo * inner_hi)
    return end is None or inner_lo * (lo + 1) <= end + 1


class Algebra:
    """Smart constructors over one alphabet (class texts depend on it)."""

    def __init__(self, alphabet: CharSet, work_limit: int | None = None,
                 budget: int | None = None):
        self.alphabet = alphabet
        self.work_limit = work_limit
        self.budget = budget
        self._alts: dict[tuple[str, ...], Expr] = {}  # alternation is the costly step: memoised

    def charge(self, expr: Expr) -> Expr:
        """Count a new node against the limits; raise TooLarge past them."""
        if self.work_limit is not None and len(expr.text) > self.work_limit:
            raise TooLarge
        if self.budget is not None:
            self.budget -= len(expr.text) + NODE_CHARGE
            if self.budget < 0:
                raise TooLarge
        return expr

    # -- atoms ------------------------------------------------------------------
    def sym(self, chars: CharSet) -> Expr:
        return Sym(chars, class_text(chars, self.alphabet)) if chars else NOTHING

    # -- repetition -------------------------------------------------------------
    def rep(self, base: Expr, lo: int, hi: int | None) -> Expr:
        if hi == 0 or isinstance(base, Empty):
            return EMPTY
        if isinstance(base, Nothing):
            return EMPTY if lo == 0 else NOTHING
        if lo == hi == 1:
            return base
        if isinstance(base, Rep) and _gap_free(base.lo, base.hi, lo, hi):
            return self.rep(base.base, base.lo * lo,
                            None if hi is None or base.hi is None else base.hi * hi)
        if lo == 0 and hi is None and isinstance(base, Alt):
            base = self._star_body(base)
        return self.charge(Rep(base, lo, hi))

    def _star_body(self, body: Alt) -> Expr:
        """Inside x*, an option y{0|1,h} (h ≥ 1) may be replaced by y."""
        options = [o.base if isinstance(o, Rep) and o.lo <= 1 else o for o in body.options]
        return self.alt(*options)

    # -- concatenation ----------------------------------------------------------
    def cat(self, *parts: Expr) -> Expr:
        merged: list[Expr] = []
        for part in parts:
            if isinstance(part, Nothing):
                return NOTHING
            for item in part.parts if isinstance(part, Cat) else (part,):
                if isinstance(item, Empty):
                    continue
                if merged and _runs(merged[-1])[0] == _runs(item)[0]:
                    base, lo, hi = _runs(merged[-1])
                    _, lo2, hi2 = _runs(item)
                    merged[-1] = self.rep(base, lo + lo2, _add(hi, hi2))
                else:
                    merged.append(item)
        if not merged:
            return EMPTY
        return merged[0] if len(merged) == 1 else self.charge(Cat(tuple(merged)))

    # -- alternation ------------------------------------------------------------
    def alt(self, *options: Expr) -> Expr:
        flat: list[Expr] = []
        for option in options:
            flat.extend(option.options if isinstance(option, Alt) else (option,))
        key = tuple(sorted(o.text for o in flat))
        if key not in self._alts:
            self._alts[key] = self._alt(flat)
        return self._alts[key]

    def _alt(self, flat: list[Expr]) -> Expr:
        optional = [o for o in flat if isinstance(o, Rep) and (o.lo, o.hi) == (0, 1)]
        if optional:  # x? is ε|x: let x merge and factor with the other options
            flat = [o for o in flat if o not in optional] + [EMPTY] + [o.base for o in optional]
        has_empty = any(isinstance(o, Empty) for o in flat)
        chars = [o.chars for o in flat if isinstance(o, Sym)]
        rest = [o for o in flat if not isinstance(o, (Empty, Nothing, Sym))]
        if chars:
            rest.append(self.sym(CharSet.of(r for c in chars for r in c.ranges)))
        rest = self._merge_counts(rest)
        rest = self._factor(self._factor(rest, first=True), first=False)
        rest = sorted(set(rest), key=lambda e: (e.lead, e.text))
        if has_empty and not any(o.nullable for o in rest):
            return self.rep(self._alt_node(rest), 0, 1) if rest else EMPTY
        return self._alt_node(rest)

    # -- a final pass ------------------------------------------------------------
    def polish(self, expr: Expr) -> Expr:
        """Rewrite repeated blocks of a concatenation as counts: X.X.X.X → (?:X.){3}X.

        Costly (quadratic in the items of each concatenation), so it runs once,
        on the finished expression, not on every intermediate label.
        """
        if isinstance(expr, Cat):
            return self.cat(*_blocks([self.polish(p) for p in expr.parts], self))
        if isinstance(expr, Alt):
            return self.alt(*(self.polish(o) for o in expr.options))
        if isinstance(expr, Rep):
            return self.rep(self.polish(expr.base), expr.lo, expr.hi)
        return expr

    def _alt_node(self, options: list[Expr]) -> Expr:
        if not options:
            return NOTHING
        return options[0] if len(options) == 1 else self.charge(Alt(tuple(options)))

    def _merge_counts(self, options: list[Expr]) -> list[Expr]:
        """x{a,b} | x{c,d} → x{min,max} when the count ranges overlap or touch."""
        by_base: dict[Expr, list[tuple[int, int | None]]] = {}
        for option in options:
            base, lo, hi = _runs(option)
            by_base.setdefault(base, []).append((lo, hi))
        out = []
        for base, spans in by_base.items():
            spans.sort(key=lambda s: s[0])
            joined: list[list] = []
            for lo, hi in spans:
                last = joined[-1] if joined else None
                if last is not None and (last[1] is None or lo <= last[1] + 1):
                    last[1] = None if hi is None or last[1] is None else max(hi, last[1])
                else:
                    joined.append([lo, hi])
            out.extend(self.rep(base, lo, hi) for lo, hi in joined)
        return out

    def _factor(self, options: list[Expr], first: bool) -> list[Expr]:
        """Factor a common first (or last) item out of alternatives: ab|ac → a(?:b|c)."""
        groups: dict[Expr, list[tuple[Expr, tuple[Expr, ...]]]] = {}
        for option in options:
            head, rest = self._split(option, first)
            groups.setdefault(head, []).append((option, rest))
        out = []
        for head, members in groups.items():
            if len(members) == 1:
                out.append(members[0][0])
                continue
            inner = self.alt(*(self.cat(*rest) for _, rest in members))
            factored = self.cat(head, inner) if first else self.cat(inner, head)
            plain = sum(len(option.text) + 1 for option, _ in members) - 1
            if len(factored.text) <= plain:
                out.append(factored)
            else:
                out.extend(option for option, _ in members)
        return out

    def _split(self, option: Expr, first: bool) -> tuple[Expr, tuple[Expr, ...]]:
        """The first (or last) item of an option and the items left; x{m,n} (m ≥ 1) gives x."""
        items = option.parts if isinstance(option, Cat) else (option,)
        end = items[0] if first else items[-1]
        rest = items[1:] if first else items[:-1]
        if isinstance(end, Rep) and end.lo >= 1:
            less = self.rep(end.base, end.lo - 1, None if end.hi is None else end.hi - 1)
            rest = (less, *rest) if first else (*rest, less)
            end = end.base
        return end, rest


def _blocks(items: list[Expr], algebra: "Algebra") -> list[Expr]:
    """Greedily replace k ≥ 2 adjacent copies of a block of items by block{k} where that is shorter."""
    out: list[Expr] = []
    i = 0
    while i < len(items):
        best = (0, 1, 1)  # (characters saved, block length, copies)
        for size in range(2, (len(items) - i) // 2 + 1):
            block = items[i:i + size]
            copies = 1
            while items[i + copies * size:i + (copies + 1) * size] == block:
                copies += 1
            width = sum(len(e.text) for e in block)
            saved = (copies - 1) * width - len(f"(?:){{{copies}}}")
            if copies > 1 and saved > best[0]:
                best = (saved, size, copies)
        _, size, copies = best
        if copies > 1:
            out.append(algebra.rep(algebra.cat(*items[i:i + size]), copies, copies))
        else:
            out.append(items[i])
        i += size * copies
    return out


# -- class texts ------------------------------------------------------------------

def _class_body(ranges) -> str:
    parts = []
    for lo, hi in ranges:
        first = escape_point(lo, "class")
        if lo == hi:
            parts.append(first)
        elif hi == lo + 1:
            parts.append(first + escape_point(hi, "class"))
        else:
            parts.append(f"{first}-{escape_point(hi, 'class')}")
    return "".join(parts)


def _bridge(chars: CharSet, alphabet: CharSet) -> list[tuple[int, int]]:
    """Ranges of ``chars``, joined across gaps holding no character of the alphabet."""
    out: list[list[int]] = []
    for lo, hi in chars.ranges:
        if out and not (CharSet.range(out[-1][1] + 1, lo - 1) & alphabet):
            out[-1][1] = hi
        else:
            out.append([lo, hi])
    return [(lo, hi) for lo, hi in out]


def class_text(chars: CharSet, alphabet: CharSet) -> str:
    """The shortest of a literal, ``[...]``, ``[^...]`` or ``.`` that means ``chars`` within the alphabet."""
    chars = chars & alphabet
    if len(chars.ranges) == 1 and chars.min == chars.max:
        return escape_point(chars.min)
    candidates = [f"[{_class_body(_bridge(chars, alphabet))}]"]
    others = alphabet - chars
    if others:
        candidates.append(f"[^{_class_body(_bridge(others, alphabet))}]")
    if chars == alphabet - CharSet.single("\n"):
        candidates.append(".")
    return min(candidates, key=len)
