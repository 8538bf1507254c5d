"""Which orbitals let the smallest active space reach a target: active-space error against full-space FCI.

Scenario: a battery-materials group screens lithium hydride as a model of Li–H bonding at a stretched bond
(2.2 Å, beyond the 1.5949 Å equilibrium) in 6-31G, with the Li 1s core frozen. For each window of two electrons
in k orbitals, the exact active-space energy in canonical Hartree–Fock, MP2 natural and CASSCF orbitals is
compared with full-space FCI (every orbital, every electron). Prints one table; model energies in one basis set.

    .venv/bin/python benchmarks/orbital_choice.py [--bond 2.2] [--basis 6-31g]
"""

from __future__ import annotations

import argparse
import time
import warnings

import groundkit as gk

SETS = ("canonical", "mp2-natural", "casscf")


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--bond", type=float, default=2.2)
    parser.add_argument("--basis", default="6-31g")
    parser.add_argument("--largest", type=int, default=8)
    args = parser.parse_args()
    molecule = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, args.bond)), basis=args.basis)
    print(f"LiH {args.bond} Å {args.basis}, Li 1s frozen; active-space error (mHa) against full-space FCI")
    print(f"{'window':>8} {'qubits':>6}" + "".join(f"{s:>14}" for s in SETS) + f"{'seconds':>9}")
    for k in range(2, args.largest + 1):
        start = time.perf_counter()
        cells = []
        for orbital_set in SETS:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                problem = gk.build_problem(molecule, gk.ActiveSpace(electrons=2, orbitals=k, frozen_core=True,
                                                                    orbital_set=orbital_set))
                error = problem.active_space_error
            assert error.against == "full-space FCI"
            cells.append(f"{error.mha:14.3f}")
        print(f"{f'(2e,{k}o)':>8} {2 * k:>6}" + "".join(cells) + f"{time.perf_counter() - start:9.1f}")


if __name__ == "__main__":
    main()
