"""Input errors: bad input carries a span and is rendered as file:line:col: error."""

from __future__ import annotations

from collections.abc import Iterable

from netcheck.source import Span, excerpt

__all__ = [
    "InputError",
    "SyntaxInputError",
    "UnknownKindError",
    "QuantityError",
    "IncludeError",
    "PartsError",
    "ConfigError",
    "InputErrors",
]


class InputError(Exception):
    """A problem with the user's input, located by a span."""

    def __init__(self, message: str, span: Span | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.span = span

    def __reduce__(self):  # type: ignore[no-untyped-def]
        # Keep message and span across processes (--jobs).
        return (self.__class__, (self.message, self.span))

    def render(self) -> str:
        """Return ``file:line:col: error: message`` plus the line and a caret."""
        if self.span is None:
            return f"netcheck: error: {self.message}"
        head = f"{self.span}: error: {self.message}"
        shown = excerpt(self.span)
        return f"{head}\n{shown}" if shown else head


class SyntaxInputError(InputError):
    """The text does not follow the .cnet grammar."""


class UnknownKindError(InputError):
    """A component kind that the language does not know."""


class QuantityError(InputError):
    """A quantity that does not parse, has the wrong dimension or is out of range."""


class IncludeError(InputError):
    """A missing, cyclic or confined include or part library."""


class PartsError(InputError):
    """A part library that is not valid."""


class ConfigError(InputError):
    """A configuration file or option that is not valid."""


class InputErrors(InputError):
    """Several input errors of one run, reported together."""

    def __init__(self, errors: Iterable[InputError]) -> None:
        self.errors = sorted(
            errors, key=lambda e: (e.span is None, e.span or Span("", 0, 0))
        )
        first = self.errors[0] if self.errors else InputError("unknown error")
        super().__init__(first.message, first.span)

    def __reduce__(self):  # type: ignore[no-untyped-def]
        return (self.__class__, (self.errors,))

    def render(self) -> str:
        """Render every error, one block each."""
        return "\n".join(e.render() for e in self.errors)
