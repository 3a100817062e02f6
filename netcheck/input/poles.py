"""Poles and switching elements, from part data or the terminal-marking convention.

Convention (IEC 60947-1 Annex L / EN 50005 style terminal marking, as the spec
describes it; the 5-6 and 7-8 function digits are from memory): coil A1/A2;
two-digit terminals whose units digit is 1-2 form a normally closed contact,
3-4 a normally open one, and 1/2/4 a changeover with 1 as common; 5-6 (NC) and
7-8 (NO) mark special-function (e.g. time-delayed) contacts, 5/6/8 their
changeover; the tens digit is the pole's sequence number. Main (power) poles
use single digits 1-2, 3-4, 5-6, 7-8 (normally open).
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Sequence

from netcheck.errors import InputError
from netcheck.model import Pole, SwitchingElement
from netcheck.source import Span

__all__ = ["infer_poles", "poles_from_part", "elements_of", "COIL_TERMINALS"]

COIL_TERMINALS = ("A1", "A2")
_TWO_DIGIT = re.compile(r"\A([1-9])([1-8])\Z")
_MAIN = {"1": "2", "3": "4", "5": "6", "7": "8"}


def _auxiliary(sequence: str, units: set[str]) -> tuple[list[Pole], set[str]]:
    """Poles of one sequence number from the function digits used."""
    poles: list[Pole] = []
    used: set[str] = set()
    for common, nc, no in (("1", "2", "4"), ("5", "6", "8")):
        if common in units and (nc in units or no in units):
            poles.append(
                Pole(
                    sequence + common,
                    no=sequence + no if no in units else None,
                    nc=sequence + nc if nc in units else None,
                )
            )
            used |= {common, nc, no} & units
    for first, second in (("3", "4"), ("7", "8")):
        if {first, second} <= units and first not in used:
            poles.append(Pole(sequence + first, no=sequence + second))
            used |= {first, second}
    return poles, used


def infer_poles(
    terminals: Iterable[str], has_coil: bool
) -> tuple[list[Pole], list[str]]:
    """Infer poles from terminal numbers; return (poles, unexplained terminals)."""
    groups: dict[str, set[str]] = {}
    main: set[str] = set()
    unexplained: list[str] = []
    for terminal in terminals:
        if has_coil and terminal in COIL_TERMINALS:
            continue
        match = _TWO_DIGIT.match(terminal)
        if match:
            groups.setdefault(match.group(1), set()).add(match.group(2))
        elif terminal in _MAIN or terminal in _MAIN.values():
            main.add(terminal)
        else:
            unexplained.append(terminal)
    poles: list[Pole] = []
    for line, load in _MAIN.items():
        if {line, load} <= main:
            poles.append(Pole(line, no=load))
            main -= {line, load}
    unexplained.extend(sorted(main))
    for sequence in sorted(groups):
        found, used = _auxiliary(sequence, groups[sequence])
        poles.extend(found)
        unexplained.extend(sequence + unit for unit in sorted(groups[sequence] - used))
    return poles, unexplained


def poles_from_part(entries: Sequence[dict]) -> list[Pole]:
    """Poles as a part's ``poles:`` list gives them."""
    return [
        Pole(
            str(entry["common"]),
            no=str(entry["no"]) if "no" in entry else None,
            nc=str(entry["nc"]) if "nc" in entry else None,
        )
        for entry in entries
    ]


def elements_of(
    device: str, poles: Sequence[Pole], used: set[str], span: Span
) -> list[SwitchingElement]:
    """The switching elements of the poles whose terminals are connected."""
    elements = []
    for pole in poles:
        for form, other in (("nc", pole.nc), ("no", pole.no)):
            if other is not None and pole.common in used and other in used:
                elements.append(
                    SwitchingElement(device, pole.common, other, form, span)
                )
    return elements


def check_terminals(
    ref: str,
    poles: Sequence[Pole],
    used: Iterable[str],
    has_coil: bool,
    spans: dict[str, Span],
) -> list[InputError]:
    """Errors for connected terminals that no pole (or coil) explains."""
    known = {t for p in poles for t in (p.common, p.no, p.nc) if t}
    if has_coil:
        known |= set(COIL_TERMINALS)
    errors: list[InputError] = []
    for terminal in used:
        if terminal not in known:
            errors.append(
                InputError(
                    f"terminal {terminal!r} of {ref} is not a terminal of its poles "
                    f"({', '.join(sorted(known)) or 'none'})",
                    spans[terminal],
                )
            )
    return errors
