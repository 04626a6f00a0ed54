"""Base: code-point sets (`CharSet`), the one seeded random source, atomic file writing.

Takes nothing from the rest of pfuzz; every other stage builds on it."""

__all__: list[str] = []
