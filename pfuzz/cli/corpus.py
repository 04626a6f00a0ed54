"""``pfuzz corpus``: a profile in, a folder of paired QA data out (``pfuzz.corpus.writer``)."""

from __future__ import annotations

import sys
import warnings
from pathlib import Path

import click

from pfuzz.boundary.suite import DEFAULT_LIMIT as DEFAULT_BOUNDARY_LIMIT
from pfuzz.corpus.writer import step_count, write_corpus
from pfuzz.errors import PfuzzWarning
from pfuzz.profile.loader import load_profile
from .common import FilePath, note, report_errors, state_cap_option


@click.command("corpus")
@click.argument("profile_path", metavar="PROFILE",
                type=FilePath(dir_okay=False, path_type=Path))
@click.option("--out", "-o", metavar="DIR", type=FilePath(file_okay=False, path_type=Path),
              required=True, help="The folder to write (required; it appears all at once).")
@click.option("--seed", type=click.IntRange(min=0), default=None,
              help="Seed of the one random generator. Default: the profile's seed key, else 0.")
@click.option("--html", "html_out", metavar="FILE", type=FilePath(dir_okay=False, path_type=Path),
              default=None, help="Also write an HTML report of the corpus's cases to FILE.")
@click.option("--force", is_flag=True,
              help="Replace OUT if it holds an earlier corpus and nothing else (or is empty).")
@state_cap_option
@click.option("--boundary-limit", type=click.IntRange(min=0), default=None,
              help="Boundary cases kept per field (default: each field's boundary_limit key, "
                   f"else {DEFAULT_BOUNDARY_LIMIT:,}).")
@click.option("--shards", type=click.IntRange(min=1), default=None, metavar="K",
              help="Keyed sampling, each field's valid strings and rejects split into K files "
                   "(the union is the same for every K; no cases.csv, qa.xlsx or record).")
@click.option("--workers", type=click.IntRange(min=0), default=0, show_default=True,
              help="With --shards: make shards on a local Dask cluster of N processes "
                   "(0: in this process).")
@click.pass_context
@report_errors
def corpus(ctx, profile_path, out, seed, force, boundary_limit, state_cap, html_out=None,
           shards=None, workers=0):
    """Write valid strings, near-miss rejects and boundary cases for every field of PROFILE.

    PROFILE is a TOML file describing fields (pattern, require, forbid,
    lengths, counts) and optionally a record with faker context columns, or
    the name of a shipped profile (pfuzz profiles lists them). OUT
    receives, all at once or not at all: fields/NAME/{valid,rejects,boundary}.jsonl,
    records/NAME/{valid,invalid}.csv, cases.csv (every case in one table),
    manifest.json (versions, counts per length, checksums) and SHA256SUMS.
    Without --seed the profile's own seed is used (else 0).

    \b
    Example:
      pfuzz corpus profiles/demo.toml --out demo-corpus
      pfuzz corpus ipv4 --out ipv4-corpus --seed 7 --force
      pfuzz corpus time24 --out time-corpus --shards 4
    """
    profile = load_profile(profile_path, state_cap)
    if workers and shards is None:
        from pfuzz.errors import ArgumentError
        raise ArgumentError("--workers applies to --shards; add --shards K")
    if shards is not None:
        return _run_sharded(profile, out, seed, force, boundary_limit, shards, workers, html_out)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", PfuzzWarning)
        summary = _run(profile, out, seed, force, boundary_limit)
    _print_summary(summary)
    if html_out is not None:
        from pfuzz.report.page import corpus_views, write_report
        write_report(html_out, f"pfuzz corpus: {profile.title}", corpus_views(profile, out),
                     about=profile.about)
        note(f"wrote {html_out}")
    for warning in caught:
        if issubclass(warning.category, PfuzzWarning):
            note(f"warning: {warning.message}")


def _run(profile, out: Path, seed, force: bool, boundary_limit=None):
    steps = step_count(profile)
    if not sys.stderr.isatty():
        return write_corpus(profile, out, seed, force=force, boundary_limit=boundary_limit)
    with click.progressbar(length=steps, label="pfuzz corpus", file=sys.stderr,
                           item_show_func=lambda label: label) as bar:
        return write_corpus(profile, out, seed, force=force, boundary_limit=boundary_limit,
                            progress=lambda label: bar.update(1, label))


def _run_sharded(profile, out: Path, seed, force: bool, boundary_limit, shards: int,
                 workers: int, html_out) -> None:
    from pfuzz.corpus.shards import write_sharded_corpus
    from pfuzz.errors import ArgumentError
    from pfuzz.scale import RunSettings

    if html_out is not None:
        raise ArgumentError("--html reads a corpus's single files; it cannot be combined "
                            "with --shards")
    run = lambda progress=None: write_sharded_corpus(  # noqa: E731
        profile, out, seed, shards=shards, force=force, boundary_limit=boundary_limit,
        settings=RunSettings(workers=workers), progress=progress)
    if not sys.stderr.isatty():
        summary = run()
    else:
        steps = len(profile.fields) * (1 + 2 * shards) + 1
        with click.progressbar(length=steps, label="pfuzz corpus", file=sys.stderr,
                               item_show_func=lambda label: label) as bar:
            summary = run(lambda label: bar.update(1, label))
    total = sum(info["bytes"] for info in summary.files.values())
    note(f"wrote {summary.out_dir}/ ({len(summary.files)} files, {_size(total)}, "
         f"seed {summary.seed}, {shards} shards, keyed sampling)")
    for name, counts in summary.fields.items():
        click.echo(f"  {name}: {counts['valid']:,} valid, {counts['rejects']:,} rejects, "
             f"{counts['boundary']:,} boundary", err=True)
    if profile.record:
        note(f"record {profile.record.name} is not written with --shards")


def _print_summary(summary) -> None:
    say = lambda text="": click.echo(text, err=True)  # noqa: E731
    total = sum(info["bytes"] for info in summary.files.values())
    say(f"pfuzz: wrote {summary.out_dir}/ ({len(summary.files)} files, {_size(total)}, "
        f"seed {summary.seed})")
    width = max(len("field"), *(len(name) for name in summary.fields))
    say(f"  {'field':<{width}}  {'valid':>7}  {'rejects':>7}  {'boundary':>8}")
    for name, counts in summary.fields.items():
        say(f"  {name:<{width}}  {counts['valid']:>7,}  {counts['rejects']:>7,}  "
            f"{counts['boundary']:>8,}")
    for name, counts in summary.fields.items():
        if counts.get("boundary_cut"):
            say(f"  note: {name}: {counts['boundary_note']} (--boundary-limit N keeps more)")
    if summary.record:
        rec = summary.record
        say(f"  record {rec['name']}: {rec['valid_rows']:,} valid rows, "
            f"{rec['invalid_rows']:,} rows with one near-miss field")
    say(f"  cases.csv: {summary.cases:,} cases; manifest.json and SHA256SUMS list every file")
    if "qa.xlsx" in summary.files:
        say("  qa.xlsx: the same cases as a spreadsheet for people who test by hand")
    else:
        say("  qa.xlsx not written: the QA workbook needs openpyxl (pip install 'pfuzz[report]')")


def _size(n: int) -> str:
    if n < 1000:
        return f"{n} bytes"
    return f"{n / 1000:,.1f} KB" if n < 10**6 else f"{n / 10**6:,.1f} MB"


COMMANDS = [corpus]
