"""Wall time of the chemistry layer: SCF, integrals, exact reference, baselines (prints a table).

Run with ``make bench`` or ``.venv/bin/python benchmarks/problem_setup.py``. Figures depend on the machine and
on what else runs on it; they are never assertions.
"""

from __future__ import annotations

import math
import time

import groundkit as gk
from groundkit import chemistry


def chain(n: int, spacing: float = 1.0) -> gk.MoleculeSpec:
    return gk.MoleculeSpec(symbols=("H",) * n, coordinates=tuple((0, 0, spacing * k) for k in range(n)),
                           name=f"H{n} chain")


def water() -> gk.MoleculeSpec:
    half = math.radians(104.48) / 2
    x, z = 0.9578 * math.sin(half), 0.9578 * math.cos(half)
    return gk.MoleculeSpec(symbols=("O", "H", "H"), coordinates=((0, 0, 0), (x, 0, z), (-x, 0, z)))


CASES = [
    ("H2O full", water(), gk.ActiveSpace()),
    ("H2O/6-31g (6e,6o)", water().with_options(basis="6-31g"), gk.ActiveSpace(electrons=6, orbitals=6)),
    ("N2 full", gk.MoleculeSpec(symbols=("N", "N"), coordinates=((0, 0, 0), (0, 0, 1.0977))), gk.ActiveSpace()),
    ("O2 singlet (12e,8o)", gk.MoleculeSpec(symbols=("O", "O"), coordinates=((0, 0, 0), (0, 0, 1.2075))),
     gk.ActiveSpace(electrons=12, orbitals=8)),
    ("H10 chain", chain(10), gk.ActiveSpace()),
    ("H12 chain", chain(12), gk.ActiveSpace()),
]


def main() -> None:
    header = f"{'case':<22}{'qubits':>7}{'dets':>10}{'SCF+ints/s':>12}{'reference/s':>13}{'baselines/s':>13}"
    print(header)
    print("-" * len(header))
    for name, molecule, space in CASES:
        chemistry.clear_cache()
        t0 = time.perf_counter()
        problem = gk.Problem(molecule, space)
        t1 = time.perf_counter()
        _ = problem.reference
        t2 = time.perf_counter()
        for method in ("mp2", "cisd", "ccsd", "ccsd(t)"):
            problem.baselines[method]
        t3 = time.perf_counter()
        print(f"{name:<22}{problem.n_qubits:>7}{problem.n_determinants:>10,}{t1 - t0:>12.2f}{t2 - t1:>13.2f}"
              f"{t3 - t2:>13.2f}")


if __name__ == "__main__":
    main()
