"""``make demo``: a combustion-chemistry group sizes the amino radical NH2 before booking device time.

NH2 is a bent open-shell doublet: ROHF orbitals, a high-spin determinant space, and an exact reference that must
be a doublet. The group freezes the nitrogen 1s core and asks what the remaining problem costs in qubits and how
the classical baselines compare with the exact answer in that space. Geometry: r(NH) = 1.024 Å, angle 103.4°
(experimental, from memory; a demo geometry, not a check value). STO-3G is a minimal basis: the numbers are
model energies, not quantitative.
"""

from __future__ import annotations

import math
import time

import groundkit as gk


def amino_radical_xyz(r: float = 1.024, angle_deg: float = 103.4) -> str:
    """XYZ text of NH2 with bond length ``r`` (Å) and H-N-H angle (degrees), in the xz plane."""
    half = math.radians(angle_deg) / 2
    x, z = r * math.sin(half), r * math.cos(half)
    return f"3\namino radical NH2\nN 0 0 0\nH {x:.6f} 0 {z:.6f}\nH {-x:.6f} 0 {z:.6f}\n"


def main() -> None:
    start = time.perf_counter()
    molecule = gk.MoleculeSpec.from_xyz(amino_radical_xyz(), basis="sto-3g", multiplicity=2)
    pipeline = molecule.pipeline().active_space(gk.ActiveSpace(frozen_core=True))
    problem = pipeline.problem()
    print("groundkit demo: amino radical NH2 (doublet), frozen N 1s core\n")
    print(molecule)
    print(molecule.to_xyz())
    print(f"SCF: {problem.scf.method}, {problem.scf_energy:.8f} Ha")
    print(f"active space: {problem.active_orbitals}")
    print(f"qubits before tapering: {problem.n_qubits}; determinants with N={problem.n_electrons}, "
          f"Sz={problem.sz}: {problem.n_determinants}\n")
    print(problem.active_orbitals.explain(), "\n")
    ref = problem.reference
    print(f"exact reference: {ref.energy:.8f} Ha, multiplicity {ref.multiplicity}, <S^2> = {ref.spin_square:.4f}")
    print("leading determinants of the reference (occupation per active orbital: 2, a, b, 0):")
    for label, amplitude in list(ref.amplitudes.items())[:5]:
        print(f"  {label}  {amplitude:+.5f}")
    print("\nclassical baselines (active = core frozen as in the problem; full = every electron):")
    print(problem.baselines.table())

    print("\nminimising UCCSD with BFGS from the ROHF determinant (exact energies in the determinant space)...")
    result = pipeline.trial_state(gk.UCCSD()).minimiser(gk.BFGS()).run()
    print(result.summary())
    print("\nleading determinants, trial state beside exact:")
    for label, amplitude in list(result.amplitudes.items())[:5]:
        print(f"  {label}  {amplitude:+.5f}   exact {ref.amplitudes.get(label, 0.0):+.5f}")
    print(f"\nchemical accuracy: {1000 * gk.CHEMICAL_ACCURACY:.1f} mHa (common practice, no single source)")
    print("caution: STO-3G is a minimal basis; these are model energies, not quantitative predictions.")
    print(f"time taken: {time.perf_counter() - start:.2f} s")


if __name__ == "__main__":
    main()
