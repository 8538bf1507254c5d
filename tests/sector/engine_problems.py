"""Small active-space problems straight from PySCF, shaped like groundkit's Problem, for the engine's tests.

Every geometry is in angstrom. Exact references are PySCF's CASCI (full CI in the active space), named as the source
wherever a test compares against them.
"""

from __future__ import annotations

import math
from functools import cache
from types import SimpleNamespace

import numpy as np
from pyscf import ao2mo, gto, mcscf, scf
from pyscf.fci import spin_op


def water(bond: float = 0.9578, angle: float = 104.48) -> str:
    """H2O with the given O-H length (angstrom) and H-O-H angle (degrees)."""
    half = math.radians(angle) / 2
    x, z = bond * math.sin(half), bond * math.cos(half)
    return f"O 0 0 0; H {x:.10f} 0 {z:.10f}; H {-x:.10f} 0 {z:.10f}"


def chain(n_atoms: int, spacing: float) -> str:
    """Linear chain of hydrogen atoms along z."""
    return "; ".join(f"H 0 0 {k * spacing:.10f}" for k in range(n_atoms))


GEOMETRIES = {
    "h2": ("H 0 0 0; H 0 0 0.7414", 0, None),  # NIST CCCBDB experimental r(H-H)
    # LiH: r_e as listed by NIST CCCBDB (from memory; Huber-Herzberg via the NIST WebBook: 1.5957 Å)
    "lih": ("Li 0 0 0; H 0 0 1.5949", 0, None),
    "h2o": (water(), 0, None),  # NIST CCCBDB experimental r(O-H), angle(H-O-H)
    "h2o_cas44": (water(), 0, (4, 4)),
    "h4": (chain(4, 1.0), 0, None),
    "nh": ("N 0 0 0; H 0 0 1.0362", 2, None),  # triplet NH; r from memory (NIST CCCBDB)
    "oh": ("O 0 0 0; H 0 0 0.9697", 1, None),  # doublet OH; r from memory (NIST CCCBDB)
    "n2": ("N 0 0 0; N 0 0 1.0977", 0, None),  # NIST CCCBDB experimental r(N-N)
}


def build_problem(atom: str, spin: int = 0, active: tuple[int, int] | None = None, basis: str = "sto-3g"):
    """Problem-like namespace: active-space integrals, core energy, HF determinant energy and CASCI reference."""
    mol = gto.M(atom=atom, basis=basis, spin=spin, unit="Angstrom", verbose=0)
    mf = scf.RHF(mol) if spin == 0 else scf.ROHF(mol)
    mf.conv_tol = 1e-12
    mf.kernel()
    n_orbitals, n_electrons = active if active else (mol.nao, mol.nelectron)
    mc = mcscf.CASCI(mf, n_orbitals, n_electrons)
    mc.verbose = 0
    h1, core_energy = mc.get_h1eff()
    h2 = ao2mo.restore(1, mc.get_h2eff(), n_orbitals)
    n_alpha, n_beta = mc.nelecas
    mc.fcisolver.conv_tol = 1e-13
    mc.kernel()
    energy, ci = mc.e_tot, mc.ci
    ss, _ = spin_op.spin_square0(ci, n_orbitals, (n_alpha, n_beta))
    s = spin / 2
    assert abs(ss - s * (s + 1)) < 1e-6, f"CASCI ground state has <S^2> = {ss}, expected {s * (s + 1)}"
    return SimpleNamespace(
        n_orbitals=n_orbitals,
        n_alpha=int(n_alpha),
        n_beta=int(n_beta),
        h1=np.asarray(h1),
        h2=np.asarray(h2),
        core_energy=float(core_energy),
        multiplicity=spin + 1,
        reference=SimpleNamespace(energy=float(energy), ci=np.asarray(ci), spin_square=float(ss)),
        hf_energy=float(mf.e_tot),
    )


@cache
def problem(name: str):
    """The named test problem, built once per session."""
    atom, spin, active = GEOMETRIES[name]
    return build_problem(atom, spin, active)
