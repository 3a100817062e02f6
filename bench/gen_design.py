"""Generate a large synthetic but valid ``.cnet`` design for benchmarks.

Usage: ``python bench/gen_design.py N OUT_DIR [--shape NAME]`` writes a top
file, sheets spliced in with ``include`` and a part library, and prints the top
file's path. The shapes (``bench/shapes.py``) are: mixed (the default), one-rail,
many-supplies, series, parallel, sheets, plc, unsuppressed. Standard library
only; the same N, shape and seed always give byte-identical files.
"""

from __future__ import annotations

import argparse
import random
import sys
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path

from shapes import SHAPES, Rung

__all__ = ["generate", "main", "SEED", "SHAPES"]

SEED = 4711
TOP_NAME = "design.cnet"
PARTS_NAME = "bench.parts.yaml"
SHEET_DIR = "sheets"

PARTS_YAML = """\
# Part library for the synthetic benchmark design (bench/gen_design.py).
format: netcheck-parts/1
note: Illustrative values for the examples; not any manufacturer's data.
parts:
  fuse-10a-dc:
    kind: fuse
    dc_voltage_rating: 220 V
    breaking_capacity: 6 kA
  pb-1no:
    kind: switch
    description: pushbutton, one NO contact block
    contacts:
      form: double-break
      voltage_max: 250 V
      ratings:
        - {category: AC-15, voltage: 230 V, current: 3 A}
        - {category: DC-13, voltage: 24 V, current: 1 A}
        - {category: DC-13, voltage: 110 V, current: 0.22 A}
  relay-24v:
    kind: relay
    description: plug-in relay, two NO contacts, 24 V DC coil
    coil:
      terminals: [A1, A2]
      supply: dc
      voltage: 24 V
      resistance: 640 ohm
      inductance: 1.1 H
      suppression: none
    contacts:
      form: single-break
      voltage_max: 250 V
      ratings:
        - {category: AC-15, voltage: 230 V, current: 3 A}
        - {category: DC-13, voltage: 24 V, current: 2 A}
        - {category: DC-13, voltage: 110 V, current: 0.5 A}
  relay-110v:
    kind: relay
    description: plug-in relay, two NO contacts, 110 V DC coil
    coil:
      terminals: [A1, A2]
      supply: dc
      voltage: 110 V
      resistance: 11 kohm
      inductance: 55 H
      suppression: none
    contacts:
      form: single-break
      voltage_max: 250 V
      ratings:
        - {category: AC-15, voltage: 230 V, current: 3 A}
        - {category: DC-13, voltage: 24 V, current: 2 A}
        - {category: DC-13, voltage: 110 V, current: 0.5 A}
  aux-relay-110v-diode:
    kind: relay
    description: auxiliary relay, 110 V DC coil with built-in diode
    coil:
      terminals: [A1, A2]
      supply: dc
      voltage: 110 V
      resistance: 11 kohm
      inductance: 55 H
      suppression: diode
    contacts:
      form: single-break
      voltage_max: 250 V
      ratings:
        - {category: DC-13, voltage: 110 V, current: 0.5 A}
  plc-do-0.5a:
    kind: output
    voltage_max: 60 V
    current_max: 0.5 A
    clamp_voltage: 47 V
    clamp_energy: 30 mJ
  valve-24v:
    kind: load
    type: valve
    R: 72 ohm
    L: 1.44 H
  solenoid-110v:
    kind: load
    type: solenoid
    R: 440 ohm
    L: 2.1 H
  lamp-24v:
    kind: load
    type: lamp
    R: 480 ohm
  lamp-110v:
    kind: load
    type: lamp
    R: 3025 ohm
  diode-1a:
    kind: diode
    voltage_rating: 1600 V
    current_rating: 1 A
    vf: 0.9 V
"""


@dataclass(frozen=True)
class Supply:
    """One DC supply of the generated design and the names of its nets."""

    ref: str
    volts: int
    plus: str
    minus: str

    def statement(self) -> str:
        """Return the supply's component statement."""
        if self.volts == 24:
            extra = "earth=minus"
        else:
            extra = "earth=none  r_int=50mohm"
        return (
            f"supply  {self.ref}  dc={self.volts}V  {extra}"
            f"  +:{self.plus}  -:{self.minus}"
        )


@dataclass
class Sheet:
    """Writes the rungs of one sheet, keeping reference and wire counters."""

    number: int
    supply: Supply
    rng: random.Random
    hazard_rate: float
    counters: dict[str, int]
    bare: bool = False
    lines: list[str] = field(default_factory=list)
    wires: int = 0
    room: int = 0  # components the rung being written may still add

    @property
    def bus(self) -> str:
        """The sheet's fused positive bus."""
        return f"P{self.number}"

    def ref(self, letter: str) -> str:
        """Return the next reference designator with this letter."""
        self.counters[letter] = self.counters.get(letter, 0) + 1
        return f"{letter}{self.counters[letter]}"

    def wire(self) -> str:
        """Return a new wire (net) name, unique across the design."""
        self.wires += 1
        return f"W{self.number}.{self.wires}"

    def suppressed(self) -> bool:
        """Whether this rung gets its freewheel diode (a few do not; bare: none)."""
        return not self.bare and self.rng.random() >= self.hazard_rate

    def diode(self, net: str) -> None:
        """Write a freewheel diode from the negative rail to ``net``."""
        self.lines.append(
            f"diode   {self.ref('V')}  part=diode-1a  A:{self.supply.minus}  K:{net}"
        )

    # Rungs: each writes its components and returns how many it wrote.

    def relay_rung(self) -> int:
        """Pushbutton -> relay coil (diode), relay contact -> valve/solenoid (diode)."""
        low = self.supply.volts == 24
        coil, load, minus = self.wire(), self.wire(), self.supply.minus
        self.lines += [
            f"switch  {self.ref('S')}  part=pb-1no  13:{self.bus}  14:{coil}",
            f"relay   {self.ref('K')}  part={'relay-24v' if low else 'relay-110v'}",
            f"    A1:{coil}  A2:{minus}",
            f"    13:{self.bus}  14:{load}",
        ]
        count = 4
        if self.suppressed():
            self.diode(coil)
            count += 1
        kind = "valve-24v" if low else "solenoid-110v"
        self.lines.append(f"load    {self.ref('Y')}  part={kind}  1:{load}  2:{minus}")
        if self.bare:
            return count - 1  # no diode across the load either
        self.diode(load)
        return count

    def output_rung(self) -> int:
        """24 V: PLC output -> valve (diode). 110 V: button -> relay, diode built in."""
        minus = self.supply.minus
        net = self.wire()
        if self.supply.volts == 24:
            ref = f"A{self.number}.Q{self.wires}"
            self.lines.append(f"output  {ref}  part=plc-do-0.5a  +:{self.bus}  -:{net}")
            self.lines.append(
                f"load    {self.ref('Y')}  part=valve-24v  1:{net}  2:{minus}"
            )
            if self.suppressed():
                self.diode(net)
                return 3
            return 2
        self.lines.append(
            f"switch  {self.ref('S')}  part=pb-1no  13:{self.bus}  14:{net}"
        )
        part = "relay-110v" if self.bare else "aux-relay-110v-diode"
        self.lines.append(f"relay   {self.ref('K')}  part={part}  A1:{net}  A2:{minus}")
        return 2

    def lamp_rung(self) -> int:
        """A pilot lamp straight across the bus (always lit): fills the count."""
        part = "lamp-24v" if self.supply.volts == 24 else "lamp-110v"
        self.lines.append(
            f"load    {self.ref('H')}  part={part}  1:{self.bus}  2:{self.supply.minus}"
        )
        return 1

    def fill(self, quota: int, rungs: Sequence[Rung] = (), lamps: float = 0.05) -> None:
        """Write rungs until exactly ``quota`` components are on the sheet.

        ``rungs`` are (most components written, writer) pairs; empty means
        the mixed relay and output rungs. ``lamps`` is the share of pilot
        lamps drawn between rungs (they also fill what no rung fits).
        """
        menu = list(rungs) or [
            (5, lambda _: self.relay_rung()),
            (3, lambda _: self.output_rung()),
        ]
        left = quota
        while left > 0:
            fits = [rung for size, rung in menu if size <= left]
            if not fits or (lamps > 0 and self.rng.random() < lamps):
                left -= self.lamp_rung()
            else:
                # A rung writes at most its size (one less without a diode).
                self.room = left
                left -= self.rng.choice(fits)(self)


def _supply(index: int) -> Supply:
    """Supplies alternate 24 V (earthed 0 V) and 110 V (unearthed battery)."""
    number = index + 1
    if index % 2 == 0:
        return Supply(f"G{number}", 24, f"L{number}+", f"M{number}")
    return Supply(f"G{number}", 110, f"L{number}+", f"L{number}-")


def _write(path: Path, lines: Sequence[str]) -> None:
    path.write_text("\n".join(lines) + "\n", encoding="utf-8", newline="\n")


def generate(
    n: int,
    out_dir: Path,
    *,
    seed: int = SEED,
    hazard_rate: float = 0.01,
    one_rail: bool = False,
    shape: str = "mixed",
) -> Path:
    """Write a design of about ``n`` components under ``out_dir``; return the top file.

    The count is exact for ``n`` of a few components per bus and up. About
    ``hazard_rate`` of the coils and valves have no freewheel diode, so the
    checks have something to find. ``shape`` names one of ``SHAPES``;
    ``one_rail`` is ``shape="one-rail"``: every rung on one fused bus, one
    supply, one rail pair, the shape of a real cabinet.
    """
    if n < 1:
        raise ValueError("n must be at least 1")
    form = SHAPES["one-rail" if one_rail else shape]
    out_dir = Path(out_dir)
    sheet_dir = out_dir / SHEET_DIR
    sheet_dir.mkdir(parents=True, exist_ok=True)
    rng = random.Random(seed)
    shape_name = "one-rail" if one_rail else shape
    plan = form.plan(n)
    quotas, n_supplies = plan.quotas, plan.supplies
    n_sheets = len(quotas)
    supplies = [_supply(i) for i in range(n_supplies)]
    counters: dict[str, int] = {}
    top = [
        "# Synthetic benchmark design generated by bench/gen_design.py",
        f"# ({n} components requested, seed {seed}); illustrative only.",
        f'title "Synthetic benchmark design, {n} components ({shape_name})"'
        if shape_name != "mixed"
        else f'title "Synthetic benchmark design, {n} components"',
        f'parts "{PARTS_NAME}"',
        "",
        *(s.statement() for s in supplies),
        "",
    ]
    written: set[str] = set()
    page: list[str] = []
    for index, quota in enumerate(quotas):
        number = index + 1
        supply = supplies[index * n_supplies // n_sheets]
        sheet = Sheet(number, supply, rng, hazard_rate, counters, form.bare)
        sheet.lines += [
            f"# Sheet {number}: rungs on {supply.ref} ({supply.volts} V DC).",
            f"fuse    F{number}  part=fuse-10a-dc  1:{supply.plus}  2:{sheet.bus}",
        ]
        sheet.fill(quota, form.rungs, form.lamp_rate)
        page += sheet.lines
        if number % plan.buses_per_file and number != n_sheets:
            continue
        name = f"sheet-{len(written) + 1:04d}.cnet"
        _write(sheet_dir / name, page)
        page = []
        written.add(name)
        top.append(f'include "{SHEET_DIR}/{name}"')
    for stale in sheet_dir.glob("sheet-*.cnet"):
        if stale.name not in written:
            stale.unlink()
    (out_dir / PARTS_NAME).write_text(PARTS_YAML, encoding="utf-8", newline="\n")
    top_path = out_dir / TOP_NAME
    _write(top_path, top)
    return top_path


def main(argv: Sequence[str] | None = None) -> int:
    """Command line: ``gen_design.py N OUT_DIR [--shape NAME] [--seed S]``.

    Also ``--hazards F`` (the share of loads left without a diode) and
    ``--one-rail`` (the same as ``--shape one-rail``).
    """
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("n", type=int, help="number of components, about")
    parser.add_argument("out_dir", type=Path, help="directory to write into")
    parser.add_argument("--seed", type=int, default=SEED)
    parser.add_argument(
        "--hazards",
        type=float,
        default=0.01,
        help="fraction of coils/valves left without a diode (default 0.01)",
    )
    parser.add_argument(
        "--one-rail", action="store_true", help="every rung on one rail pair"
    )
    parser.add_argument(
        "--shape", choices=sorted(SHAPES), default="mixed", help="design shape"
    )
    args = parser.parse_args(argv)
    if args.n < 1:
        parser.error("N must be at least 1")
    top = generate(
        args.n,
        args.out_dir,
        seed=args.seed,
        hazard_rate=args.hazards,
        one_rail=args.one_rail,
        shape=args.shape,
    )
    print(top)
    return 0


if __name__ == "__main__":
    sys.exit(main())
