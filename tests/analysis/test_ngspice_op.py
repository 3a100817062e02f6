"""Breaking currents and voltages against ngspice's DC operating point (.op).

Random ladder designs are generated; for each switching element the same circuit
is handed to ngspice in the element's worst case as the spec defines it: every
element in series with it closed, every element that could bypass it open, the
rest of the design (other rungs) off. Contacts are 0 V sources, which ngspice
reports the current of. ngspice is an independent circuit simulator (Debian
package ``ngspice``); the tests skip without it.
"""

from __future__ import annotations

import random
import re
import shutil
import subprocess
from dataclasses import dataclass, field
from pathlib import Path

import pytest

from helpers import net

pytestmark = pytest.mark.skipif(
    shutil.which("ngspice") is None,
    reason="ngspice not installed (Debian package ngspice); .ci/run installs it",
)


@dataclass
class Rung:
    """One rung: contacts in series from the rail, then loads in parallel."""

    contacts: list[str]
    loads: list[tuple[str, float]]  # (ref, ohms)
    series_r: float | None = None  # a resistor between the contacts and the loads
    seal: str | None = None  # a contact in parallel with the last contact
    nodes: list[str] = field(default_factory=list)


def _design(seed: int) -> tuple[str, list[Rung], float, float]:
    rng = random.Random(seed)
    emf = rng.choice([24.0, 48.0, 110.0])
    r_int = rng.choice([0.0, 0.05, 1.5])
    lines = [f"supply G1 dc={emf:g}V r_int={r_int:g}ohm +:P -:M"]
    rungs = []
    for r in range(rng.randint(1, 4)):
        rung = Rung([f"S{r}{i}" for i in range(rng.randint(1, 3))],
                    [(f"Y{r}{i}", rng.choice([47.0, 100.0, 220.0, 680.0]))
                     for i in range(rng.randint(1, 3))],
                    rng.choice([None, 33.0]), None)
        if len(rung.contacts) >= 2 and rng.random() < 0.5:
            rung.seal = f"K{r}"
        node = "P"
        for i, contact in enumerate(rung.contacts):
            nxt = f"N{r}_{i}"
            lines.append(f"switch {contact} 13:{node} 14:{nxt}")
            rung.nodes.append(node)
            node = nxt
        rung.nodes.append(node)
        if rung.seal:
            lines.append(f"switch {rung.seal} 13:{rung.nodes[-2]} 14:{rung.nodes[-1]}")
        if rung.series_r is not None:
            lines.append(f"resistor R{r} R={rung.series_r:g}ohm 1:{node} 2:L{r}")
            node = f"L{r}"
        for ref, ohms in rung.loads:
            lines.append(f"load {ref} type=heater R={ohms:g}ohm 1:{node} 2:M")
        rungs.append(rung)
    return "\n".join(lines) + "\n", rungs, emf, r_int


def _spice(rung: Rung, emf: float, r_int: float, opened: str | None,
           bypassed: set[str]) -> str:
    """One rung alone on the supply; ``opened`` removed, ``bypassed`` left out."""
    # r_int = 0: the source feeds P directly (a 1e-9 ohm resistor would upset
    # ngspice's conditioning more than it models anything).
    out = ["rung", f"VG P0 0 DC {emf}",
           f"RINT P0 P {r_int}" if r_int > 0 else "VZERO P0 P DC 0"]
    for i, contact in enumerate(rung.contacts):
        if contact != opened and contact not in bypassed:
            out.append(f"V{contact} {rung.nodes[i]} {rung.nodes[i + 1]} DC 0")
    if rung.seal and rung.seal != opened and rung.seal not in bypassed:
        last = rung.contacts[-1]
        if last == opened or last in bypassed:
            out.append(f"V{rung.seal} {rung.nodes[-2]} {rung.nodes[-1]} DC 0")
        else:  # two ideal sources in parallel would be a singular loop for SPICE
            out.append(f"R{rung.seal} {rung.nodes[-2]} {rung.nodes[-1]} 1e-3")
    node = rung.nodes[-1]
    if rung.series_r is not None:
        out.append(f"RS {node} L {rung.series_r}")
        node = "L"
    for ref, ohms in rung.loads:
        out.append(f"R{ref} {node} 0 {ohms}")
    return "\n".join(out).replace(" M ", " 0 ") + "\n"


def _op(circuit: str, probes: list[str], tmp: Path) -> dict[str, float]:
    body = circuit + ".control\nop\n" + "".join(f"print {p}\n" for p in probes)
    path = tmp / "op.cir"
    path.write_text(body + ".endc\n.end\n", encoding="ascii")
    result = subprocess.run(["ngspice", "-b", str(path)], capture_output=True,
                            text=True, timeout=60, check=False)
    values = {}
    for name, number in re.findall(r"^(\S+) = (\S+)$", result.stdout, re.M):
        values[name.lower()] = float(number)
    return values


def _node(name: str) -> str:
    return "0" if name == "M" else name.lower()


@pytest.mark.parametrize("seed", range(12))
def test_breaking_current_and_voltage_match_ngspice(seed: int, tmp_path: Path) -> None:
    text, rungs, emf, r_int = _design(seed)
    _, analysis = net(tmp_path, text)
    for rung in rungs:
        for contact in rung.contacts + ([rung.seal] if rung.seal else []):
            element = analysis.elements[f"{contact}:13-14"]
            bypass = {b.split(":")[0] for b in element.bypass}
            closed = _op(_spice(rung, emf, r_int, None, bypass),
                         [f"i(v{contact.lower()})"], tmp_path)
            current = abs(closed[f"i(v{contact.lower()})"])
            # Breaking current: the worst-case operating point (ngspice .op).
            assert element.current.to("A").magnitude == pytest.approx(current, rel=1e-6)
            index = (rung.contacts.index(contact) if contact in rung.contacts
                     else len(rung.contacts) - 1)
            a, b = rung.nodes[index], rung.nodes[index + 1]
            opened = _op(_spice(rung, emf, r_int, contact, bypass),
                         [f"v({_node(a)})", f"v({_node(b)})"], tmp_path)
            voltage = abs(opened.get(f"v({_node(a)})", 0.0) - opened.get(f"v({_node(b)})", 0.0))
            # Breaking voltage: open-circuit voltage across the opened element.
            assert element.voltage.to("V").magnitude == pytest.approx(voltage, rel=1e-6,
                                                                      abs=1e-6)
