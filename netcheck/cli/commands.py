"""The table of commands: name -> module, function and help.

Each module ``netcheck.cli.<module>`` defines ``add_options(parser)`` and the
function named here, ``function(args, out) -> exit status`` (``out`` is the
:class:`netcheck.cli.output.Output` funnel). Command modules import only
``argparse``-level things at the top; the pipeline loads when a command runs, so
``netcheck --help`` stays fast. A new command is one module plus one row.
"""

from __future__ import annotations

import importlib
from types import ModuleType
from typing import NamedTuple

__all__ = ["COMMANDS", "Command"]


class Command(NamedTuple):
    """One subcommand of ``netcheck``."""

    name: str
    module: str  # below netcheck.cli
    function: str
    help: str

    def load(self) -> ModuleType:
        """The command's module (light: its pipeline imports wait for a run)."""
        return importlib.import_module(f"netcheck.cli.{self.module}")


COMMANDS: tuple[Command, ...] = (
    Command("check", "check", "run", "check design files and report findings"),
    Command(
        "inspect", "inspect", "run", "show what the analysis sees for each element"
    ),
    Command("size", "size", "run", "size suppression for one inductive DC load"),
    Command("rules", "rules", "run", "list the rules"),
    Command("explain", "explain", "run", "explain one rule"),
    Command("baseline", "baseline", "run", "write the current findings as a baseline"),
    Command("schema", "schema", "run", "list the shipped JSON Schemas or print one"),
    Command(
        "fix", "fix", "run", "print the verified fixes as a diff (--write applies)"
    ),
)
