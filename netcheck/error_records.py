"""Input errors as plain records: what a report says about a file it could not check.

An ``InputError`` is flattened here, in the process that read the file, into
records of strings and numbers: they cross process boundaries (``--jobs``)
unchanged, and the text keeps the excerpt with its caret, which needs the
file's lines only this process has.
"""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path

from netcheck.errors import InputError, InputErrors

__all__ = ["ErrorRecord", "records_of", "os_error_record"]


@dataclass(frozen=True, order=True)
class ErrorRecord:
    """One input error: where (line and column 0 when not located) and what.

    ``rendered`` is the ``file:line:col: error: ...`` block with the line and a
    caret, as printed on standard error.
    """

    file: str
    line: int
    column: int
    message: str
    rendered: str


def records_of(err: InputError, file: str) -> list[ErrorRecord]:
    """Every error of ``err``; one without a span is put on ``file``."""
    errors = err.errors if isinstance(err, InputErrors) else [err]
    out = []
    for one in errors or [err]:
        span = one.span
        if span is None:
            out.append(ErrorRecord(file, 0, 0, one.message, one.render()))
        else:
            out.append(
                ErrorRecord(
                    span.file, span.line, span.column, one.message, one.render()
                )
            )
    return out


def os_error_record(err: OSError, file: str) -> ErrorRecord:
    """A file that could not be read at all (``file``: the design being checked)."""
    text = err.strerror or str(err)
    if err.filename is None:
        return ErrorRecord(file, 0, 0, text, f"netcheck: error: {text}")
    where = _from_working_directory(str(err.filename))
    return ErrorRecord(where, 0, 0, text, f"{where}: error: {text}")


def _from_working_directory(file: str) -> str:
    absolute = Path(os.path.abspath(file))
    try:
        return absolute.relative_to(Path(os.path.abspath(os.getcwd()))).as_posix()
    except ValueError:
        return absolute.as_posix()
