"""Minimised inputs that the fuzzing (test_fuzz.py, the long run) broke netcheck with.

Each stays here as a regression test; ``why`` says what went wrong before the
fix.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from robust_helpers import assert_well_behaved, run_cli

RUNG = (
    "supply  G1  dc=24V  earth=minus  +:L+  -:M\n"
    "switch  S1  13:L+  14:W1\n"
    "load    Y1  type=valve  R=72ohm  L=1H  1:W1  2:M\n"
)

FOUND = {
    # A typo in the net of a clamp: the TVS's other net touches nothing else.
    "tvs-bidirectional-on-a-dangling-net": (
        RUNG + "tvs  V1  standoff=33V  vclamp=53V  bidirectional=yes  1:W1  2:W9\n",
        "KeyError in analysis/domain.py _internal_components: a TVS does not join "
        "domains (NON_CONDUCTING), so the net only it touches has no group, yet "
        "its branch is looked up in state.group",
    ),
    "tvs-unidirectional-on-a-dangling-net": (
        RUNG + "tvs  V1  standoff=33V  vclamp=53V  A:W1  K:W9\n",
        "KeyError in analysis/domain.py _internal_components (as above)",
    ),
    # 1 µΩ in series with 1 TΩ: conductances 18 decades apart.
    "micro-ohm-in-series-with-tera-ohm": (
        "supply  G1  dc=48V  +:B+  -:B-\n"
        "switch  S1  13:B+  14:W1\n"
        "resistor  R1  R=1e-6ohm  1:W1  2:W2\n"
        "load  E1  type=heater  R=1e12ohm  1:W2  2:B-\n",
        "numpy.linalg.LinAlgError (singular matrix) from analysis/circuit.py "
        "_linear_solve: nodal matrix too ill-conditioned for np.linalg.solve",
    ),
}


@pytest.mark.parametrize(
    ("name", "design"),
    [pytest.param(n, d, id=n) for n, (d, _why) in FOUND.items()],
)
@pytest.mark.parametrize("command", ["check", "inspect"])
def test_found_by_fuzzing(tmp_path: Path, name: str, design: str, command: str) -> None:
    folder = tmp_path / name
    folder.mkdir()
    (folder / "top.cnet").write_text(design, encoding="utf-8")
    outcome = run_cli([command, f"{name}/top.cnet"], tmp_path)
    assert_well_behaved(outcome, root=tmp_path, limit=20)
    assert outcome.code in (0, 1), outcome.describe()
