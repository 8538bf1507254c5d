"""CASSCF cost model against PySCF timings: measured mcscf.CASSCF seconds beside groundkit's prediction.

Run ``.venv/bin/python benchmarks/casscf_cost.py`` (about a minute on 2 cores); ``--fit`` prints the constant
``CASSCF_SIGMA_CALLS`` (H·ψ-equivalents per CASSCF) that best fits the measured times (geometric mean of ratios).
"""

from __future__ import annotations

import sys
import time

import numpy as np
from pyscf import gto, mcscf, scf

from groundkit.orbitals.cost import casscf_cost

CASES = [  # (label, atoms, basis, electrons, orbitals)
    ("N2 1.1 Å", "N 0 0 0; N 0 0 1.1", "cc-pvdz", 6, 6),
    ("N2 1.1 Å", "N 0 0 0; N 0 0 1.1", "cc-pvdz", 10, 8),
    ("N2 1.1 Å", "N 0 0 0; N 0 0 1.1", "cc-pvdz", 10, 10),
    ("H2O", "O 0 0 0; H 0 0.757 0.587; H 0 -0.757 0.587", "cc-pvdz", 8, 8),
    ("H2O", "O 0 0 0; H 0 0.757 0.587; H 0 -0.757 0.587", "cc-pvdz", 8, 10),
]


def measure(atoms: str, basis: str, electrons: int, orbitals: int) -> tuple[float, int, int]:
    mol = gto.M(atom=atoms, basis=basis, verbose=0)
    mf = scf.RHF(mol).run()
    mc = mcscf.CASSCF(mf, orbitals, electrons)
    mc.verbose = 0
    mc.conv_tol = 1e-11
    start = time.perf_counter()
    mc.kernel()
    return time.perf_counter() - start, mol.nao, mol.nelectron


def main() -> None:
    rows = []
    print(f"{'case':<10} {'basis':<8} {'CAS':<9} {'n_ao':>5} {'measured s':>11} {'predicted s':>12} {'ratio':>6}")
    for label, atoms, basis, electrons, orbitals in CASES:
        seconds, n_ao, _ = measure(atoms, basis, electrons, orbitals)
        _, predicted = casscf_cost(n_ao, orbitals, electrons // 2, electrons // 2)
        rows.append(seconds / predicted)
        print(f"{label:<10} {basis:<8} ({electrons}e,{orbitals}o) {n_ao:>5} {seconds:>11.3f} {predicted:>12.3f} "
              f"{seconds / predicted:>6.2f}")
    if "--fit" in sys.argv:
        from groundkit.orbitals import cost

        scale = float(np.exp(np.mean(np.log(rows))))
        print(f"geometric-mean measured/predicted {scale:.2f}: multiply CASSCF_SIGMA_CALLS "
              f"({cost.CASSCF_SIGMA_CALLS}) by it where the large cases dominate")


if __name__ == "__main__":
    main()
