"""``netcheck schema [NAME]``: list the shipped JSON Schemas, or print one."""

from __future__ import annotations

import argparse

from netcheck.cli import options
from netcheck.cli.output import Output

__all__ = ["add_options", "run"]

DESCRIPTION = (
    "Without NAME, list the JSON Schemas of every file netcheck reads or writes; "
    "with NAME, print that schema as shipped (for editors and CI validators)."
)


def add_options(parser: argparse.ArgumentParser) -> None:
    """An optional schema name and the output options."""
    parser.add_argument("name", nargs="?", metavar="NAME", help="a schema name")
    options.add_output_options(parser)


def _listing() -> str:
    from netcheck.schema import describe, load_schema, schema_names

    rows = [(name, load_schema(name)["$id"], describe(name)) for name in schema_names()]
    widths = [max(len(row[i]) for row in rows) for i in range(2)]
    lines = [
        f"{name.ljust(widths[0])}  {ident.ljust(widths[1])}  {about}"
        for name, ident, about in rows
    ]
    return "\n".join(lines) + "\n"


def run(args: argparse.Namespace, out: Output) -> int:
    """0, or 2 for an unknown schema name (with the known ones)."""
    from netcheck.config import did_you_mean
    from netcheck.schema import schema_names, schema_text

    if args.name is None:
        out.write(_listing())
        return 0
    if args.name not in schema_names():
        out.error(
            f"netcheck schema: error: no schema '{args.name}'"
            f"{did_you_mean(args.name, schema_names())} "
            f"(known: {', '.join(schema_names())})"
        )
        return 2
    text = schema_text(args.name)
    out.write(text if text.endswith("\n") else text + "\n")
    return 0
