"""The ``pfuzz`` command line: a thin click skin over the library.

Each command lives in a module of this package that exports ``COMMANDS``; the
table ``COMMANDS`` below names the module of every command, and a command's
module is imported only when that command runs (or ``--help`` lists them all),
so a short command does not pay for the others' imports. They share the
options of ``pfuzz.cli.common``. Exit status: 0 success (or
"equal"/"accepted"), 1 "different"/"rejected"/"validator disagrees",
2 bad input.
"""

from __future__ import annotations

import importlib

import click

from pfuzz import __version__

#: One line per command: its name and the module of this package that defines it.
COMMANDS = {
    "info": "info",
    "count": "sampling",
    "sample": "sampling",
    "reject": "rejects",
    "explain": "rejects",
    "corpus": "corpus",
    "profiles": "profiles",
    "diff": "diff",
    "draw": "draw",
    "audit": "audit",
    "learn": "learn",
    "report": "report",
}


class _LazyGroup(click.Group):
    """A group whose commands are imported from ``COMMANDS`` on first use."""

    def list_commands(self, ctx: click.Context) -> list[str]:
        return sorted(set(COMMANDS) | set(self.commands))

    def get_command(self, ctx: click.Context, name: str) -> click.Command | None:
        if name not in self.commands and name in COMMANDS:
            module = importlib.import_module(f"{__name__}.{COMMANDS[name]}")
            for command in module.COMMANDS:
                self.commands.setdefault(command.name, command)
        return self.commands.get(name)


@click.group(cls=_LazyGroup,
             context_settings={"help_option_names": ["-h", "--help"], "max_content_width": 100})
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
