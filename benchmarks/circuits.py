"""Two-qubit gates of UCCSD circuits, ladder against compact, and the time to count them (prints tables).

Run with ``.venv/bin/python benchmarks/circuits.py``. Both constructions go through the same Cirq optimisation
(``groundkit.circuits.optimise``) and inverse-pair removal; counts are at random parameters (generic angles).
"count ms": ``trial_resources`` (the gate-list count ``RunResult.resources`` uses, no Cirq objects), after the
pipeline's objective exists; "build ms": building the optimised Cirq circuit and counting it (``pipeline.circuit``
+ ``circuit_resources``), the route resources took before. Figures, never assertions; all-to-all connectivity.
Geometries: NIST CCCBDB r_e (from memory); LiH in a (2e, 4o) active space; water in its full STO-3G space.
"""

from __future__ import annotations

import math
import time

import numpy as np

import groundkit as gk
from groundkit.circuits import circuit_resources, jordan_wigner_excitation, trial_resources

H2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414)), name="H2")
LIH = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)), name="LiH")
_HALF = math.radians(104.48) / 2
WATER = gk.MoleculeSpec(symbols=("O", "H", "H"), coordinates=(
    (0, 0, 0), (0.9578 * math.sin(_HALF), 0, 0.9578 * math.cos(_HALF)),
    (-0.9578 * math.sin(_HALF), 0, 0.9578 * math.cos(_HALF))), name="water")
CASES = [("H2", lambda: gk.Pipeline(H2)),
         ("LiH (2e,4o)", lambda: gk.Pipeline(LIH).active_space(electrons=2, orbitals=4)),
         ("water STO-3G", lambda: gk.Pipeline(WATER))]
MAPPINGS = ("jordan-wigner", "parity", "bravyi-kitaev")


def _timed(call, repeat: int = 3) -> tuple[object, float]:
    best, value = math.inf, None
    for _ in range(repeat):
        start = time.perf_counter()
        value = call()
        best = min(best, time.perf_counter() - start)
    return value, 1000 * best


def main() -> None:
    print("UCCSD, all-to-all, two-qubit gates after Cirq optimisation (random parameters)")
    print(f"{'molecule':<14}{'mapping':<15}{'qubits':>6}{'params':>7}{'ladder 2q':>10}{'compact 2q':>11}"
          f"{'ratio':>7}{'ladder depth':>13}{'compact depth':>14}{'count ms':>9}{'build ms':>9}")
    for label, make in CASES:
        for name in MAPPINGS:
            pipeline = make().mapping(name)
            objective = pipeline.objective()
            theta = np.random.default_rng(0).uniform(-1, 1, objective.n_parameters)
            ladder = trial_resources(pipeline, theta, construction="ladder")
            compact, count_ms = _timed(lambda p=pipeline, t=theta: trial_resources(p, t))
            built, build_ms = _timed(lambda p=pipeline, t=theta: circuit_resources(p.circuit(t)), repeat=1)
            assert built == compact, (built, compact)  # the gate-list count is the built circuit's
            print(f"{label:<14}{name:<15}{pipeline.encoding().n_qubits:>6}{objective.n_parameters:>7}"
                  f"{ladder['two_qubit_gates']:>10}{compact['two_qubit_gates']:>11}"
                  f"{ladder['two_qubit_gates'] / compact['two_qubit_gates']:>7.2f}{ladder['depth']:>13}"
                  f"{compact['depth']:>14}{count_ms:>9.1f}{build_ms:>9.1f}")
    print()
    print("isolated excitations under Jordan-Wigner (CNOTs; published: Yordanov et al., PRA 102, 062612 (2020))")
    for text, creators, annihilators, published in (
            ("double 0,1 -> 2,3 (adjacent)", (2, 3), (0, 1), "13"), ("single 0 -> 1 (adjacent)", (1,), (0,), "2"),
            ("double 0,1 -> 4,5 (crosses none)", (4, 5), (0, 1), "13"), ("single 0 -> 3 (crosses 2)", (3,), (0,),
                                                                         "2 + parity")):
        steps = jordan_wigner_excitation(creators, annihilators, 0.3)
        cnots = sum(1 for s in steps if len(s.qubits) == 2)
        print(f"  {text:<34} ours {cnots:>3}   published {published}")


if __name__ == "__main__":
    main()
