"""Edit scripts between a witness and a text, and the explanation that carries them.

An edit script is a tuple of ``Edit`` steps that turns a witness (a valid
string) into a text. The steps apply one after another, each to the string
the previous ones made, and come in order of position; a position therefore
counts both in that intermediate string and in the final text.

- ``delete c at p``: the witness had a c the text lacks, just before text index p;
- ``insert c at p``: the text has an extra c at index p;
- ``replace a with b at p``: the witness had a where the text has b at index p;
- ``swap a and b at p``: the witness had a, b at p, p+1; the text has b, a.

These are plain values (frozen dataclasses) with a readable ``str`` and an
``as_dict`` for JSON; ``pfuzz.nearmiss.witness`` computes them.
"""

from __future__ import annotations

from dataclasses import dataclass

from pfuzz.errors import ArgumentError


@dataclass(frozen=True)
class Edit:
    """One step of an edit script (see the module docstring for direction and positions)."""

    kind: str        # delete, insert, replace or swap
    position: int
    old: str         # the witness characters the step removes ("" for insert)
    new: str         # the characters it writes ("" for delete)

    def apply(self, text: str) -> str:
        p = self.position
        if text[p:p + len(self.old)] != self.old:
            raise ArgumentError(f"{self} does not apply to {text!r}")
        return text[:p] + self.new + text[p + len(self.old):]

    def __str__(self) -> str:
        if self.kind == "delete":
            return f"delete {self.old!r} at {self.position}"
        if self.kind == "insert":
            return f"insert {self.new!r} at {self.position}"
        if self.kind == "replace":
            return f"replace {self.old!r} with {self.new!r} at {self.position}"
        return f"swap {self.old[0]!r} and {self.old[1]!r} at {self.position}"

    def as_dict(self) -> dict:
        return {"kind": self.kind, "position": self.position, "old": self.old, "new": self.new}


def apply_edits(witness: str, edits) -> str:
    """The text an edit script makes from its witness."""
    for edit in edits:
        witness = edit.apply(witness)
    return witness


@dataclass(frozen=True)
class Explanation:
    """Verdict on a text, its nearest valid string and the edits from that string to it."""

    text: str
    accepted: bool
    witness: str
    distance: int
    edits: tuple[Edit, ...]

    def __str__(self) -> str:
        if self.accepted:
            return f"accepted: {self.text!r}"
        lines = [f"rejected: {self.text!r}",
                 f"nearest valid string: {self.witness!r} (distance {self.distance})",
                 "edits that turn it into the text:"]
        lines += [f"  {edit}" for edit in self.edits]
        return "\n".join(lines)

    def as_dict(self) -> dict:
        return {"text": self.text, "accepted": self.accepted, "witness": self.witness,
                "distance": self.distance, "edits": [e.as_dict() for e in self.edits]}
