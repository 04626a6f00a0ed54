"""``pfuzz report``: one self-contained HTML page for a profile or a pattern (``pfuzz.report.page``)."""

from __future__ import annotations

import json
from pathlib import Path

import click

from .common import compile_language, fail, language_options, note, report_errors, seed_option
from .common import FilePath


@click.command("report")
@click.argument("profile", required=False, metavar="PROFILE")
@click.option("--pattern", "-p", help="A pattern (or PROFILE:FIELD) instead of a PROFILE.")
@click.option("--field", "fields", multiple=True,
              help="Only this field of the PROFILE (repeatable). Default: every field.")
@click.option("--audit", "audit_file", type=FilePath(dir_okay=False, path_type=Path),
              help="Add the findings of an audit: the file 'pfuzz audit --format json' wrote.")
@language_options
@click.option("--valid", type=click.IntRange(min=0), default=100, show_default=True,
              help="Valid strings shown per field.")
@click.option("--rejects", type=click.IntRange(min=0), default=100, show_default=True,
              help="Near-miss rejects shown per field.")
@seed_option
@click.option("--out", "-o", type=FilePath(dir_okay=False, path_type=Path), required=True,
              help="The HTML file to write (atomically).")
@click.pass_context
@report_errors
def report(ctx, profile, pattern, fields, audit_file, alphabet, flags, state_cap, valid, rejects,
           seed, out):
    """Write an HTML report of a PROFILE's fields or of a --pattern to --out FILE.

    One file that opens in any browser with no network: per field the pattern
    and its meaning in words, counts by length as a chart, the minimal DFA
    drawn (a summary past 40 states), and the valid strings, near-miss rejects
    and boundary cases in a table that filters by kind, verdict and text, with
    spaces, tabs and invisible characters made visible. With --audit, the
    audit's evidence and its disagreements grouped by cause come first.

    \b
    Examples:
      pfuzz report profiles/demo.toml --out demo.html
      pfuzz report --pattern '[A-Z]{2}-[0-9]{4}' --out ticket.html
      pfuzz audit profiles/demo.toml --field postcode --target checks:is_postcode \\
          --format json --out audit.json; pfuzz report profiles/demo.toml \\
          --field postcode --audit audit.json --out postcode.html
    """
    from pfuzz.report.page import field_view, profile_views, write_report

    if (profile is None) == (pattern is None):
        fail("give a PROFILE or --pattern P (exactly one)")
    audit_report = _read_audit(audit_file) if audit_file is not None else None
    if pattern is not None:
        from pfuzz.profile.reference import pattern_or_field

        chosen = pattern_or_field(pattern)
        if chosen is not None:
            views = [field_view(chosen.language(), chosen.name, chosen.pattern, about=chosen.about,
                                flags=chosen.flag_bits, valid=valid, rejects=rejects, seed=seed)]
        else:
            lang = compile_language(pattern, alphabet, flags, state_cap)
            views = [field_view(lang, "pattern", pattern, flags=flags, valid=valid,
                                rejects=rejects, seed=seed)]
        title = f"pfuzz report: {pattern}"
        about = ""
    else:
        from pfuzz.profile.loader import load_profile
        from pfuzz.profile.shipped import resolve

        loaded = load_profile(resolve(profile))
        if fields:
            loaded = _only(loaded, fields)
        chosen_seed = seed if ctx.get_parameter_source("seed") is not \
            click.core.ParameterSource.DEFAULT else None
        views = profile_views(loaded, chosen_seed)
        title, about = f"pfuzz report: {loaded.title}", loaded.about
    write_report(out, title, views, audit_report, about)
    note(f"wrote {out}")


def _only(loaded, names):
    import dataclasses

    return dataclasses.replace(loaded, fields=tuple(loaded.field(n) for n in names))


def _read_audit(path: Path) -> dict:
    try:
        document = json.loads(path.read_text(encoding="utf-8"))
    except OSError as error:
        fail(f"cannot read the audit report {str(path)!r}: {error.strerror}")
    except ValueError:
        fail(f"{path} is not JSON; write it with 'pfuzz audit --format json --out {path}'")
    if not isinstance(document, dict) or "findings" not in document:
        fail(f"{path} is not a pfuzz audit report (pfuzz audit --format json)")
    return document


COMMANDS = [report]
