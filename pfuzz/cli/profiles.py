"""``pfuzz profiles``: the shipped profiles, by name, with their titles and fields."""

from __future__ import annotations

import click

from pfuzz.base.jsonlines import json_text
from pfuzz.profile import shipped

from .common import emit, fail, format_option, out_option, report_errors


@click.command("profiles")
@format_option(("text", "json"), "text")
@out_option
@report_errors
def profiles(fmt, out):
    """List the profiles that come with pfuzz: name, title and fields.

    A name stands for its file wherever a command takes a PROFILE.

    \b
    Example:
      pfuzz profiles
      pfuzz corpus ipv4 --out ipv4-corpus
    """
    names = shipped.names()
    if not names:
        fail("no shipped profiles are installed with this pfuzz")
    rows = [shipped.describe(name) for name in names]
    if fmt == "json":
        emit(json_text(rows, indent=2, sort_keys=False) + "\n", out)
        return
    width = max(len(row["name"]) for row in rows)
    emit("".join(f"{row['name']:<{width}}  {row['title']}\n{'':<{width}}  fields: "
                 f"{', '.join(row['fields'])}\n" for row in rows), out)


COMMANDS = [profiles]
