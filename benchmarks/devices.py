"""Routed two-qubit counts on a line, a grid and a heavy-hex lattice, and the time to compile (prints tables).

Run with ``.venv/bin/python benchmarks/devices.py`` (``--skip-full-water`` leaves out the 14-qubit case). For H2,
LiH (2e,4o), water (4e,4o) and N2 CAS(6,6) in STO-3G under Jordan–Wigner, with UCCSD, k-UpCCGSD (k = 2) and the
adaptive trial state (grown on the engine, at most 12 operators), each logical circuit is placed, routed (Cirq's
RouteCQC after Cirq's line placement) and rewritten into the built-in profiles' native gates (illustrative
profiles of our own): ``line-16`` (CNOT), ``grid-4x4`` (CZ) and ``heavy-hex-35`` (CNOT). Counts are taken at
generic angles (uniform in (−π, π), seed 0), so no block vanishes by accident. Figures, never assertions; note the
machine's load when quoting the seconds (the compilation table also gives the process's CPU seconds, which a busy
machine inflates far less than the wall time).
"""

from __future__ import annotations

import os
import sys
import time

import numpy as np

import groundkit as gk
from groundkit.circuits import trial_circuit
from groundkit.device import compile_for_device
from groundkit.device.comparison import generic_parameters

# r_e and angles as listed by NIST CCCBDB (from memory)
H2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414)), name="H2")
LIH = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)), name="LiH")
_A, _HALF = 0.9578, np.deg2rad(104.48) / 2
WATER = gk.MoleculeSpec(symbols=("O", "H", "H"), coordinates=(
    (0, 0, 0), (0, _A * np.sin(_HALF), _A * np.cos(_HALF)), (0, -_A * np.sin(_HALF), _A * np.cos(_HALF))),
    name="H2O")
N2 = gk.MoleculeSpec(symbols=("N", "N"), coordinates=((0, 0, 0), (0, 0, 1.0977)), name="N2")

MOLECULES = [
    ("H2", gk.Pipeline(H2)),
    ("LiH (2e,4o)", gk.Pipeline(LIH).active_space(electrons=2, orbitals=4)),
    ("H2O (4e,4o)", gk.Pipeline(WATER).active_space(electrons=4, orbitals=4)),
    ("N2 CAS(6,6)", gk.Pipeline(N2).active_space(electrons=6, orbitals=6)),
]
DEVICES = ("line-16", "grid-4x4", "heavy-hex-35")


def adaptive_state(pipeline: gk.Pipeline) -> object:
    result = pipeline.trial_state(gk.Adaptive(max_operators=12)).run()
    return gk.grown_trial_state(result)


def counts_table() -> None:
    print(f"{'molecule':<14}{'trial state':<14}{'qubits':>7}{'params':>7}{'logical 2q':>11}{'depth':>7}"
          + "".join(f"{d + ' 2q':>18}{'swaps':>7}{'depth':>7}{'s':>6}" for d in DEVICES))
    for name, pipeline in MOLECULES:
        for label, make in (("UCCSD", lambda p: gk.UCCSD()), ("2-UpCCGSD", lambda p: gk.UpCCGSD(k=2)),
                            ("adaptive", adaptive_state)):
            chosen = pipeline.trial_state(make(pipeline))
            theta = generic_parameters(chosen.objective().n_parameters)
            logical = trial_circuit(chosen, theta)
            n = chosen.encoding().n_qubits
            cells = ""
            base = None
            for device in DEVICES:
                compiled = compile_for_device(logical, device, n_qubits=n)
                base = compiled
                cells += (f"{compiled.two_qubit_gates:>18}{compiled.swaps:>7}{compiled.depth:>7}"
                          f"{compiled.compile_seconds:>6.1f}")
            print(f"{name:<14}{label:<14}{n:>7}{len(theta):>7}{base.logical_two_qubit_gates:>11}"
                  f"{base.logical_depth:>7}{cells}", flush=True)


def compile_time(label: str, pipeline: gk.Pipeline, device: str = "grid-4x4") -> None:
    theta = generic_parameters(pipeline.objective().n_parameters)
    start = time.perf_counter()
    logical = trial_circuit(pipeline, theta)
    built = time.perf_counter() - start
    cpu = time.process_time()
    compiled = compile_for_device(logical, device, n_qubits=pipeline.encoding().n_qubits)
    cpu = time.process_time() - cpu
    print(f"{label:<34}{device:<12}{compiled.logical_two_qubit_gates:>11}{compiled.two_qubit_gates:>10}"
          f"{compiled.swaps:>7}{built:>12.2f}{compiled.compile_seconds:>12.2f}{cpu:>12.2f}", flush=True)


def main() -> None:
    print(f"machine: {os.cpu_count()} cores, load average {os.getloadavg()[0]:.1f} at start")
    counts_table()
    print()
    print(f"{'compilation, UCCSD':<34}{'device':<12}{'logical 2q':>11}{'routed 2q':>10}{'swaps':>7}"
          f"{'logical s':>12}{'compile s':>12}{'compile CPU s':>14}")
    compile_time("H2O (4e,4o), JW", MOLECULES[2][1])
    if "--skip-full-water" not in sys.argv:
        compile_time("H2O full space (14 qubits), JW", gk.Pipeline(WATER))


if __name__ == "__main__":
    main()
