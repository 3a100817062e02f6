"""The table of report formats of ``check --format``: name -> writer.

A writer is ``function(report, catalogue) -> str`` in a module of
``netcheck.report`` (``view=True``: it also takes the terminal view, to choose
between the grouped terminal view and one finding a line). A new format is one
module plus one row; the module loads only when its format is asked for.
``stream`` optionally names the same writer in pieces,
``function(report, catalogue, sink)`` (with the view and style too where
``view``): ``check`` writes a large report through it, chunk by chunk, so that
the whole text is never held as one string.
"""

from __future__ import annotations

import importlib
from collections.abc import Callable, Mapping
from typing import TYPE_CHECKING, NamedTuple

from netcheck.cli.output import Terminal

if TYPE_CHECKING:
    from netcheck.catalogue import RuleMeta
    from netcheck.report import Report

__all__ = ["FORMATS", "Format", "render_text", "write_text"]


class Format(NamedTuple):
    """One output format of ``check``."""

    module: str
    function: str
    view: bool = False
    stream: str | None = None

    def render(
        self,
        report: Report,
        catalogue: Mapping[str, RuleMeta],
        view: Terminal,
        **style: bool,
    ) -> str:
        """The report in this format (``style``: how much a view shows)."""
        writer = getattr(importlib.import_module(self.module), self.function)
        if self.view:
            return str(writer(report, catalogue, view, **style))
        return str(writer(report, catalogue))

    def write(
        self,
        report: Report,
        catalogue: Mapping[str, RuleMeta],
        view: Terminal,
        sink: Callable[[str], object],
        **style: bool,
    ) -> None:
        """Write ``render(...)`` to ``sink``: in pieces where the format can."""
        if self.stream is None:
            sink(self.render(report, catalogue, view, **style))
            return
        writer = getattr(importlib.import_module(self.module), self.stream)
        if self.view:
            writer(report, catalogue, view, sink, **style)
        else:
            writer(report, catalogue, sink)


def render_text(
    report: Report,
    catalogue: Mapping[str, RuleMeta],
    view: Terminal,
    *,
    details: bool = False,
    quiet: bool = False,
) -> str:
    """The grouped view on a terminal, else one finding a line (cli.md).

    ``details`` adds values and fix under each line (the terminal view always
    shows them); ``quiet`` leaves only the summary.
    """
    from netcheck.report.text import render_plain, render_rich

    if view.is_terminal:
        return render_rich(report, color=view.color, width=view.width, quiet=quiet)
    return render_plain(report, details=details, quiet=quiet)


def write_text(
    report: Report,
    catalogue: Mapping[str, RuleMeta],
    view: Terminal,
    sink: Callable[[str], object],
    *,
    details: bool = False,
    quiet: bool = False,
) -> None:
    """``render_text`` to ``sink``: the one-a-line report in chunks of lines."""
    if view.is_terminal:
        sink(render_text(report, catalogue, view, details=details, quiet=quiet))
        return
    from netcheck.report.text import write_plain

    write_plain(report, sink, details=details, quiet=quiet)


FORMATS: dict[str, Format] = {
    "text": Format("netcheck.cli.formats", "render_text", True, "write_text"),
    "json": Format("netcheck.report.json", "render_json", stream="write_json"),
    "sarif": Format("netcheck.report.sarif", "render_sarif", stream="write_sarif"),
}
