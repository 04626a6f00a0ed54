"""Profile: TOML profile files (fields, records, settings) read and validated strictly.

Takes a file; gives `Profile` values whose fields compile to `Language`s."""

__all__: list[str] = []
