"""``netcheck fix PATH``: the verified fixes of a design as a diff of its files.

Only fixes verified by re-checking the edited design are applied, and only
those that still hold when applied together (``netcheck.fixes.plan``). The
unified diff goes to standard output; ``--write`` writes the files instead,
each atomically. Exit status as ``check``: 0 when no finding at or above
``--fail-on`` is left after the fixes, 1 when some are, 2 on an input error.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import Any

from netcheck.cli import options
from netcheck.cli.output import Output

__all__ = ["add_options", "run"]

CAUTION = (
    "netcheck: review every edit against the manufacturers' data, local codes and "
    "a qualified person's judgement before wiring it; the tool checks only the "
    "rating data the design gives."
)


def add_options(parser: argparse.ArgumentParser) -> None:
    """The designs, how to read them, --write and --fail-on."""
    options.add_selection_options(parser)
    options.add_input_options(parser)
    options.add_output_options(parser)  # -o FILE: the diff, written atomically
    parser.add_argument(
        "--write", action="store_true", help="apply the edits to the files (atomically)"
    )
    parser.add_argument(
        "--fail-on",
        choices=options.FAIL_ON,
        help="lowest severity left after the fixes that makes the exit status 1",
    )


def _plan(path: Path, cache: Any) -> tuple[Any, Any, Any]:
    from netcheck.fixes.plan import plan_fixes
    from netcheck.fixes.verify import verify_fixes
    from netcheck.pipeline import analyse_path, run_checks

    settings = cache.for_design(path)
    opts = settings.options
    netlist, analysis = analyse_path(path, opts)
    findings = run_checks(netlist, analysis, opts.margins)
    findings = verify_fixes(netlist, analysis, findings, opts.margins, None)
    shown = [f for f in findings if settings.keeps(f.rule)]
    return netlist, plan_fixes(netlist, shown, opts.margins), settings


def run(args: argparse.Namespace, out: Output) -> int:
    """Print (or ``--write``) the verified edits; 1 if findings remain."""
    from netcheck.atomic import write_text_atomic
    from netcheck.catalogue import load_catalogue
    from netcheck.cli.check import request_of
    from netcheck.fixes.diff import edited_texts, unified_diff
    from netcheck.session import SettingsCache, discover_designs

    cache = SettingsCache(request_of(args, use_baseline=False), load_catalogue())
    diffs, failing, notes = [], False, []
    for path in discover_designs(args.paths):
        netlist, plan, settings = _plan(path, cache)
        about = [(f"{f.rule} at {f.element}", f.edits) for f in plan.fixed]
        texts = edited_texts(netlist, about)
        if args.write:
            for name, (old, new) in sorted(texts.items()):
                if old != new:
                    write_text_atomic(name, new)
                    notes.append(f"netcheck fix: wrote {name}")
        else:
            diffs.append(unified_diff(texts))
        notes += [f"netcheck fix: fixed {f.rule} at {f.element}" for f in plan.fixed]
        notes.append(
            f"netcheck fix: {path}: {len(plan.fixed)} finding(s) fixed, "
            f"{len(plan.remaining)} left"
        )
        threshold = settings.fail_on
        failing |= threshold is not None and any(
            settings.severity.get(f.rule, f.severity) >= threshold
            for f in plan.remaining
        )
    if not args.write:
        out.write("".join(diffs))
    print("\n".join([*notes, CAUTION]), file=sys.stderr)
    return 1 if failing else 0
