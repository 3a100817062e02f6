"""The edits of verified fixes as new ``.cnet`` text, and as a unified diff.

New components are written after the statement of the load they suppress,
under a comment line that marks them as added by the tool; changed components
keep their layout: only the words an edit changes are rewritten (a terminal's
net, ``part=``, a rating), and comments stay where they were.
"""

from __future__ import annotations

import difflib
import re
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path

from netcheck.fixes.edits import (
    AddComponent,
    Edit,
    Reconnect,
    Remove,
    SetValues,
    UsePart,
    statement_text,
)
from netcheck.model import Component, Netlist

__all__ = ["FileEdit", "edited_texts", "unified_diff", "MARK"]

MARK = "# added by netcheck fix"
REMOVED = "# removed by netcheck fix:"
_WORD = r"(?<![^\s]){key}=(?:\"(?:[^\"\\]|\\.)*\"|[^\s#\"]+)"


@dataclass
class FileEdit:
    """The lines of one file and what the edits do to them."""

    lines: list[str]
    changed: dict[int, str] = field(default_factory=dict)  # 0-based line -> text
    inserted: dict[int, list[str]] = field(default_factory=dict)  # after line


def _split(line: str) -> tuple[str, str]:
    """A line's code and its comment (a ``#`` outside quotes starts it)."""
    quoted = False
    for index, char in enumerate(line):
        if char == '"' and (index == 0 or line[index - 1] != "\\"):
            quoted = not quoted
        elif char == "#" and not quoted:
            return line[:index], line[index:]
    return line, ""


def _statement_lines(lines: list[str], first: int) -> range:
    """0-based lines of the statement starting at ``first``: its continuations."""
    end = first + 1
    probe = end
    while probe < len(lines):
        text = lines[probe]
        if not text.strip():
            probe += 1
            continue
        if not text[0].isspace():
            break
        probe += 1
        end = probe
    return range(first, end)


class _Editor:
    def __init__(self, netlist: Netlist) -> None:
        self.netlist = netlist
        self.files: dict[str, FileEdit] = {}

    def file(self, name: str) -> FileEdit:
        if name not in self.files:
            text = Path(name).read_text(encoding="utf-8")
            self.files[name] = FileEdit(text.split("\n"))
        return self.files[name]

    def current(self, edit: FileEdit, index: int) -> str:
        return edit.changed.get(index, edit.lines[index])

    def rewrite(self, component: Component, pattern: str, new: str | None) -> bool:
        """Replace the first match of ``pattern`` in the statement's code."""
        edit = self.file(component.span.file)
        for index in _statement_lines(edit.lines, component.span.line - 1):
            code, comment = _split(self.current(edit, index))
            if re.search(pattern, code):
                if new is None:
                    code = re.sub(r"\s*" + pattern, "", code, count=1)
                else:
                    code = re.sub(pattern, lambda _m: new, code, count=1)
                edit.changed[index] = code + comment
                return True
        return False

    def append(self, component: Component, words: str, last: bool = False) -> None:
        """Add words at the end of the statement's first (or last) line."""
        edit = self.file(component.span.file)
        index = component.span.line - 1
        if last:
            index = _statement_lines(edit.lines, index)[-1]
        code, comment = _split(self.current(edit, index))
        code = code.rstrip() + " " + words
        edit.changed[index] = code + (" " + comment if comment else "")

    def apply(self, edit: Edit, about: str) -> None:
        netlist = self.netlist
        if isinstance(edit, AddComponent):
            anchor = netlist.component(edit.after)
            if anchor is None:  # after a component added by an earlier edit
                raise KeyError(edit.after)
            target = self.file(anchor.span.file)
            last = _statement_lines(target.lines, anchor.span.line - 1)[-1]
            lines = target.inserted.setdefault(last, [])
            if not lines or lines[0] != f"{MARK}: {about}":
                lines.append(f"{MARK}: {about}")
            lines.append(statement_text(edit, netlist))
            return
        component = netlist.component(edit.ref)
        if component is None:
            raise KeyError(edit.ref)
        if isinstance(edit, Remove):
            # Commented out, not deleted: the designer sees what went and why.
            target = self.file(component.span.file)
            for index in _statement_lines(target.lines, component.span.line - 1):
                line = self.current(target, index)
                target.changed[index] = f"{REMOVED} {about}: {line.strip()}"
            return
        if isinstance(edit, Reconnect):
            present = {c.terminal for c in component.connections}
            nets = {t: n for t, n in edit.connections if t in present}
            new = [f"{t}:{n}" for t, n in edit.connections if t not in present]
            if new:
                self.append(component, "  ".join(new), last=True)
            # Two passes through placeholders so that swapped nets do not collide.
            for terminal in nets:
                pattern = rf"(?<![^\s]){re.escape(terminal)}:[^\s#]+"
                self.rewrite(component, pattern, f"{terminal}:\x00{terminal}")
            for terminal, net in nets.items():
                self.rewrite(
                    component,
                    rf"{re.escape(terminal)}:\x00{re.escape(terminal)}",
                    f"{terminal}:{net}",
                )
            return
        if isinstance(edit, UsePart):
            for key in edit.drop:
                self.rewrite(component, _WORD.format(key=re.escape(key)), None)
            if not self.rewrite(
                component, _WORD.format(key="part"), f"part={edit.part}"
            ):
                self.rewrite(
                    component,
                    rf"(?<![^\s]){re.escape(component.ref)}(?=\s|$)",
                    f"{component.ref} part={edit.part}",
                )
            return
        assert isinstance(edit, SetValues)
        for key, text in edit.attributes:
            word = f"{key}={text}"
            if not self.rewrite(component, _WORD.format(key=re.escape(key)), word):
                self.append(component, word)


def edited_texts(
    netlist: Netlist, fixes: Sequence[tuple[str, Sequence[Edit]]]
) -> dict[str, tuple[str, str]]:
    """``file -> (old text, new text)`` with each fix's edits applied.

    ``fixes`` pairs the words of the marker comment (the finding fixed) with
    its edits; edits that repeat an earlier one are written once.
    """
    editor = _Editor(netlist)
    seen: set[Edit] = set()
    for about, edits in fixes:
        for edit in edits:
            if edit not in seen:
                seen.add(edit)
                editor.apply(edit, about)
    out = {}
    for name, edit in editor.files.items():
        new: list[str] = []
        for index, line in enumerate(edit.lines):
            new.append(edit.changed.get(index, line))
            new.extend(edit.inserted.get(index, []))
        out[name] = ("\n".join(edit.lines), "\n".join(new))
    return out


def unified_diff(texts: dict[str, tuple[str, str]]) -> str:
    """A unified diff (``a/`` and ``b/`` prefixes) of every changed file."""
    chunks = []
    for name in sorted(texts):
        old, new = texts[name]
        if old == new:
            continue
        chunks.extend(
            difflib.unified_diff(
                old.splitlines(keepends=True) if old.endswith("\n") else _lines(old),
                new.splitlines(keepends=True) if new.endswith("\n") else _lines(new),
                f"a/{name}",
                f"b/{name}",
            )
        )
    return "".join(chunks)


def _lines(text: str) -> list[str]:
    return [line + "\n" for line in text.split("\n")]
