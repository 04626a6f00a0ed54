"""Corpus: profiles to paired valid/invalid files on disk, written atomically.

Takes a `Profile`; gives a folder of case files, a manifest and checksums. `context` holds the
faker context columns, `rows` the record rows, `formats` the file formats and staging."""

__all__: list[str] = []
