"""Shot sampling speed: 10^6 shots of H2O/STO-3G (14 qubits, about a thousand Pauli terms), per grouping.

Prints a table; figures depend on the machine (2 cores here) and on what else runs. Target: under 5 s.
"""

from __future__ import annotations

import math
import time

import numpy as np

import groundkit as gk
from groundkit.estimators import SampledEstimator


def water() -> gk.MoleculeSpec:
    half = math.radians(104.48) / 2  # NIST CCCBDB experimental geometry (from memory)
    x, z = 0.9578 * math.sin(half), 0.9578 * math.cos(half)
    return gk.MoleculeSpec(symbols=("O", "H", "H"), coordinates=((0, 0, 0), (x, 0, z), (-x, 0, z)))


def main() -> None:
    pipeline = water().pipeline()
    t0 = time.perf_counter()
    encoding = pipeline.encoding()
    objective = pipeline.objective()
    theta = np.random.default_rng(3).normal(scale=0.02, size=objective.n_parameters)
    t_setup = time.perf_counter() - t0
    print(f"H2O/STO-3G, {encoding.n_qubits} qubits, {len(encoding.hamiltonian.terms)} Pauli terms; "
          f"encoding and objective {t_setup:.2f} s")
    print(f"{'grouping':<10}{'allocation':<12}{'groups':>8}{'bind/s':>9}{'10^6 shots/s':>14}{'stderr/mHa':>12}")
    for grouping, allocation in (("qwc", "variance"), ("qwc", "uniform"), ("none", "variance")):
        t0 = time.perf_counter()
        measurement = SampledEstimator(shots=1_000_000, grouping=grouping, allocation=allocation, seed=1).bind(
            pipeline)
        t1 = time.perf_counter()
        _, error = measurement.estimate(theta)
        t2 = time.perf_counter()
        print(f"{grouping:<10}{allocation:<12}{len(measurement.groups):>8}{t1 - t0:>9.2f}{t2 - t1:>14.2f}"
              f"{1000 * error:>12.3f}")


if __name__ == "__main__":
    main()
