"""Outside references for the accuracy tests, computed straight from PySCF and OpenFermion (reference libraries).

Nothing here imports groundkit: each function builds its own PySCF molecule from an atom string (angstrom), runs
RHF or ROHF and full CI (CASCI over every orbital, or over the active window PySCF picks by default: the lowest
orbitals doubly occupied as core, the next ``orbitals`` active), and keeps the lowest root whose ⟨S²⟩ is S(S+1)
for the requested spin. Results are cached for the whole session (``functools.cache``), so the tests of one
molecule share one calculation.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cache

import numpy as np
from openfermion import InteractionOperator, QubitOperator, jordan_wigner
from pyscf import ao2mo, gto, mcscf, scf
from pyscf.fci import cistring, spin_op

# Roots asked of PySCF's CI solver: the lowest of them with the requested spin is kept. They are the lowest roots of
# the whole Sz block, so the kept one is the lowest state of that spin; if none has it, the lookup raises.
ROOTS = 3


def chain(n_atoms: int, spacing: float) -> str:
    """Linear chain of ``n_atoms`` hydrogen atoms ``spacing`` Å apart along z."""
    return "; ".join(f"H 0 0 {k * spacing:.10f}" for k in range(n_atoms))


def diatomic(a: str, b: str, r: float) -> str:
    """Two atoms on the z axis, ``r`` Å apart."""
    return f"{a} 0 0 0; {b} 0 0 {r:.10f}"


def water(bond: float = 0.9578, angle: float = 104.48) -> str:
    """H2O in the xz plane with the given O-H length (Å) and H-O-H angle (degrees), oxygen at the origin."""
    half = math.radians(angle) / 2
    x, z = bond * math.sin(half), bond * math.cos(half)
    return f"O 0 0 0; H {x:.10f} 0 {z:.10f}; H {-x:.10f} 0 {z:.10f}"


@dataclass(frozen=True)
class OutsideReference:
    """SCF and exact energies (Ha) of one molecule, and ⟨S²⟩ of the exact state, all from PySCF."""

    hf: float
    exact: float
    spin_square: float

    @property
    def correlation(self) -> float:
        """E(SCF) - E(exact), Ha: how much a trial state has to recover."""
        return self.hf - self.exact


def _scf(atom: str, basis: str, charge: int, spin: int):
    mol = gto.M(atom=atom, basis=basis, charge=charge, spin=spin, unit="Angstrom", verbose=0)
    mf = scf.RHF(mol) if spin == 0 else scf.ROHF(mol)
    mf.conv_tol = 1e-12
    mf.kernel()
    assert mf.converged, f"PySCF SCF did not converge for {atom!r}"
    return mol, mf


@cache
def pyscf_exact(atom: str, basis: str = "sto-3g", *, charge: int = 0, spin: int = 0,
                active: tuple[int, int] | None = None) -> OutsideReference:
    """PySCF RHF/ROHF and CASCI (= full CI in the window) of ``atom``; ``spin`` = 2S; ``active`` = (electrons,
    orbitals), default every electron in every orbital."""
    mol, mf = _scf(atom, basis, charge, spin)
    n_electrons, n_orbitals = active if active else (mol.nelectron, mol.nao)
    mc = mcscf.CASCI(mf, n_orbitals, n_electrons)
    mc.verbose = 0
    n_alpha, n_beta = mc.nelecas
    determinants = cistring.num_strings(n_orbitals, n_alpha) * cistring.num_strings(n_orbitals, n_beta)
    mc.fcisolver.nroots = min(ROOTS, determinants)
    mc.fcisolver.conv_tol = 1e-12
    mc.kernel()
    energies = np.atleast_1d(mc.e_tot)
    vectors = mc.ci if isinstance(mc.ci, list) else [mc.ci]
    s = spin / 2
    for energy, vector in sorted(zip(energies, vectors), key=lambda pair: pair[0]):
        ss, _ = spin_op.spin_square0(vector, n_orbitals, (n_alpha, n_beta))
        if abs(ss - s * (s + 1)) < 1e-4:
            return OutsideReference(hf=float(mf.e_tot), exact=float(energy), spin_square=float(ss))
    raise AssertionError(f"none of the {len(energies)} lowest PySCF CASCI roots of {atom!r} has S = {s}")


@cache
def openfermion_interaction(atom: str, basis: str = "sto-3g") -> InteractionOperator:
    """The full-space molecular Hamiltonian as an OpenFermion InteractionOperator, on PySCF RHF orbitals.

    The spin-orbital tensors are written out here from PySCF's MO integrals (interleaved: 2p = alpha, 2p+1 = beta):
    H = E_nuc + sum h_pq a+_p a_q + 1/2 sum (pq|rs) a+_{p s} a+_{r t} a_{s t} a_{q s} over spins s, t.
    """
    mol, mf = _scf(atom, basis, 0, 0)
    c = mf.mo_coeff
    n = c.shape[1]
    h1 = c.T @ mf.get_hcore() @ c
    eri = ao2mo.restore(1, ao2mo.kernel(mol, c), n)  # chemists' notation (pq|rs)
    one = np.zeros((2 * n, 2 * n))
    two = np.zeros((2 * n,) * 4)
    for sigma in (0, 1):
        one[sigma::2, sigma::2] = h1
        for tau in (0, 1):
            two[sigma::2, tau::2, tau::2, sigma::2] = 0.5 * eri.transpose(0, 2, 3, 1)  # [p, r, s, q] = (pq|rs)
    return InteractionOperator(mol.energy_nuc(), one, two)


@cache
def openfermion_jordan_wigner(atom: str, basis: str = "sto-3g") -> QubitOperator:
    """The full-space molecular Hamiltonian (:func:`openfermion_interaction`) under Jordan-Wigner (OpenFermion)."""
    hamiltonian = jordan_wigner(openfermion_interaction(atom, basis))
    hamiltonian.compress(1e-12)
    return hamiltonian
