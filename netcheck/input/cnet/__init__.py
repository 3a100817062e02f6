"""The .cnet netlist language: parse (lark), read files, build the model."""

from netcheck.input.cnet.build import load_cnet
from netcheck.input.cnet.includes import included_files

__all__ = ["load_cnet", "included_files"]
