"""Audit: running a validator (regex, Python callable or command) over cases and comparing.

Takes a specification `Language` and a target; gives findings and the evidence a verdict rests on."""

__all__: list[str] = []
