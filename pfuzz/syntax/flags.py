"""``re``'s flag values as plain ints (RegexFlag arithmetic is slow in a hot loop), the
flags pfuzz supports, and the letters of inline flags ``(?aiLmsux)``."""

from __future__ import annotations

import re
import warnings

IGNORECASE, MULTILINE, DOTALL, VERBOSE = (int(flag) for flag in (re.I, re.M, re.S, re.X))
ASCII, UNICODE, LOCALE = (int(flag) for flag in (re.A, re.U, re.L))
with warnings.catch_warnings():
    warnings.simplefilter("ignore", DeprecationWarning)  # re deprecates TEMPLATE from 3.11
    TEMPLATE = int(re.T)
# TEMPLATE changes no match: re refuses it only with repeats, at compile time.
SUPPORTED_FLAGS = IGNORECASE | MULTILINE | DOTALL | VERBOSE | ASCII | UNICODE | TEMPLATE
ATOM_FLAGS = IGNORECASE | ASCII | DOTALL
TYPE_FLAGS = ASCII | UNICODE | LOCALE
INLINE_FLAGS = {
    "i": IGNORECASE, "m": MULTILINE, "s": DOTALL, "x": VERBOSE,
    "a": ASCII, "u": UNICODE, "L": LOCALE, "t": TEMPLATE,
}
