"""The ``pfuzz`` command line: a thin click skin over the library.

Each command lives in its own module and registers itself on ``main``; they
share the options of ``pfuzz.cli.common``. Exit status: 0 success (or
"equal"/"accepted"), 1 "different"/"rejected"/"validator disagrees",
2 bad input.
"""

from __future__ import annotations

import click

from pfuzz import __version__


@click.group(context_settings={"help_option_names": ["-h", "--help"], "max_content_width": 100})
@click.version_option(__version__, prog_name="pfuzz")
@click.option("--debug", is_flag=True, help="Show a traceback on errors.")
@click.pass_context
def main(ctx: click.Context, debug: bool) -> None:
    """Valid and near-miss test data for input validators, from patterns.

    pfuzz compiles a Python regular expression to its minimal DFA, counts the
    strings it accepts, samples them uniformly by length, and builds near-miss
    rejects one edit away from a valid string.
    """
    ctx.obj = {"debug": debug}


def _register() -> None:
    import importlib

    for name in COMMAND_MODULES:
        module = importlib.import_module(f"{__name__}.{name}")
        for command in module.COMMANDS:
            main.add_command(command)


#: One line per command module; each module exports ``COMMANDS``.
COMMAND_MODULES = [
    "info",
    "sampling",
    "rejects",
    "corpus",
    "diff",
    "draw",
    "audit",
]

_register()
