"""Access to the data shipped with netcheck: grammar, rule YAML and schemas."""

from __future__ import annotations

from importlib import resources
from pathlib import Path

__all__ = ["data_path", "read_text"]

_PACKAGE_DATA = "netcheck._data"


def data_path(*parts: str) -> Path:
    """Return the path of a shipped data file (``data_path("grammar", "cnet.lark")``).

    In a checkout the files live at the top level (``grammar/``, ``rules/``); an
    installed wheel carries them inside the package as ``netcheck/_data/``.
    """
    packaged = resources.files("netcheck").joinpath("_data", *parts)
    if packaged.is_file() or packaged.is_dir():
        return Path(str(packaged))
    top = Path(__file__).resolve().parent.parent
    return top.joinpath(*parts)


def read_text(*parts: str) -> str:
    """Return the text of a shipped data file."""
    return data_path(*parts).read_text(encoding="utf-8")
