"""The PySCF calls of the orbital work: natural orbitals, CASSCF, full-space MO integrals and the 1- and 2-RDMs.

Like :mod:`groundkit.chemistry` (whose SCF solutions these functions take), every function here returns plain
numbers and arrays; PySCF objects stay private. Orbital coefficient matrices are (n_ao, n_mo) with every
column's sign fixed by :func:`groundkit.chemistry.canonical_phases`.
"""

from __future__ import annotations

import warnings
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..chemistry import ScfSolution, canonical_phases, scf_threads
from ..errors import ConvergenceError

CASSCF_CONV_TOL = 1e-11  # Ha, energy change between macro iterations
CASSCF_GRAD_TOL = 1e-6  # orbital gradient norm
CASSCF_MAX_CYCLES = 100  # macro iterations per attempt
CASSCF_FCI_TOL = 1e-12  # Ha, the CI solver inside CASSCF
CASSCF_SPIN_SHIFT = 0.2  # Ha: penalty on <S^2> - S(S+1) in the CI step, so CASSCF keeps the requested spin


@dataclass(frozen=True)
class CasscfSolution:
    """A converged CASSCF: total energy (Ha), orbitals (core, active natural orbitals by descending occupation,
    external), active natural occupations (electrons) and the attempts made (the last one converged)."""

    energy: float
    mo_coeff: np.ndarray
    occupations: np.ndarray
    attempts: tuple[str, ...]


def natural_orbitals(scf: ScfSolution, method: str, frozen: list[int]) -> tuple[np.ndarray, np.ndarray]:
    """(occupations, coefficients) of the MP2 (``method='mp2'``) or CCSD (``'ccsd'``) natural orbitals.

    The spin-summed 1-RDM of the method (orbitals in ``frozen`` uncorrelated) is diagonalised over the
    correlated orbitals in the MO basis; frozen orbitals are kept as they are with occupation 2. Orbitals come
    frozen first, then by descending occupation (electrons, 0 to 2). Open shells use PySCF's unrestricted codes
    on the ROHF orbitals. Raises :class:`ConvergenceError` when CCSD does not converge.
    """
    from pyscf import cc, mp

    mf = scf._mf
    frozen_arg = sorted(frozen) or None
    with scf_threads(), warnings.catch_warnings(), np.errstate(all="ignore"):
        warnings.simplefilter("ignore")
        if method == "mp2":
            solver = mp.MP2(mf, frozen=frozen_arg)
        elif method == "ccsd":
            solver = cc.CCSD(mf, frozen=frozen_arg)
            solver.conv_tol = 1e-9
            solver.max_cycle = 200
        else:
            raise ValueError(f"unknown natural-orbital method {method!r}")
        solver.verbose = 0
        solver.kernel()
        if method == "ccsd" and not solver.converged:
            raise ConvergenceError(f"CCSD for natural orbitals did not converge in {solver.max_cycle} iterations")
        dm = solver.make_rdm1()
    if isinstance(dm, (tuple, list)) or np.asarray(dm).ndim == 3:
        dm = np.asarray(dm[0]) + np.asarray(dm[1])
    dm = 0.5 * (np.asarray(dm) + np.asarray(dm).T)
    n_mo = scf.n_orbitals
    kept = [i for i in range(n_mo) if i not in set(frozen)]
    values, vectors = np.linalg.eigh(dm[np.ix_(kept, kept)])
    order = np.argsort(-values, kind="stable")
    rotation = np.zeros((n_mo, n_mo))
    frozen_sorted = sorted(frozen)
    for j, i in enumerate(frozen_sorted):
        rotation[i, j] = 1.0
    rotation[np.ix_(kept, range(len(frozen_sorted), n_mo))] = vectors[:, order]
    occupations = np.concatenate([np.full(len(frozen_sorted), 2.0), np.clip(values[order], 0.0, 2.0)])
    return occupations, canonical_phases(scf.mo_coeff @ rotation)


def casscf(scf: ScfSolution, mo_coeff: np.ndarray, n_core: int, n_active: int, n_alpha: int, n_beta: int,
           spin: float, starts: Callable[[], list[tuple[str, np.ndarray]]] | None = None) -> CasscfSolution:
    """PySCF's CASSCF in (n_alpha + n_beta electrons, ``n_active`` orbitals) from the orbitals ``mo_coeff``
    (ordered core, active, external), keeping total spin ``spin``.

    Tries in turn: the given orbitals with PySCF's defaults; the same with a smaller orbital step and more
    iterations; then each start that ``starts()`` gives (label, orbitals; called only when the first two fail).
    Raises :class:`ConvergenceError` naming every attempt
    when none converges. The result's orbitals are canonicalised in the core and external blocks and natural
    orbitals (descending occupation) in the active block.
    """
    attempts: list[str] = []
    tries: list[tuple[str, np.ndarray, dict[str, Any]]] = [
        ("the given orbitals, PySCF's default step", mo_coeff, {}),
        ("the given orbitals, orbital step 0.01 and three times the iterations", mo_coeff,
         {"max_stepsize": 0.01, "cycles": 3 * CASSCF_MAX_CYCLES}),
    ]
    def every_try():
        yield from tries
        for label, c in (starts() if starts is not None else []):
            yield label, c, {}

    for label, start, options in every_try():
        try:
            mc = _run_casscf(scf, start, n_core, n_active, n_alpha, n_beta, spin, options)
        except Exception as err:  # PySCF raises many kinds on hard cases
            attempts.append(f"{label}: {type(err).__name__}: {' '.join(str(err).split())}")
            continue
        if not mc.converged:
            attempts.append(f"{label}: not converged after {mc.max_cycle_macro} macro iterations "
                            f"(energy {mc.e_tot:.8f} Ha)")
            continue
        attempts.append(f"{label}: converged")
        occupations = np.asarray(mc.mo_occ, dtype=float)[n_core:n_core + n_active]
        return CasscfSolution(float(mc.e_tot), canonical_phases(np.asarray(mc.mo_coeff, dtype=float)),
                              occupations, tuple(attempts))
    raise ConvergenceError(
        f"CASSCF in ({n_alpha + n_beta}e, {n_active}o) did not converge; tried: " + "; ".join(attempts)
        + ". Choose another active space (orbitals that cut a degenerate set or a near-empty orbital are the usual "
        "cause) or orbital_set='mp2-natural'"
    )


def _run_casscf(scf: ScfSolution, mo_coeff: np.ndarray, n_core: int, n_active: int, n_alpha: int, n_beta: int,
                spin: float, options: dict[str, Any]) -> Any:
    from pyscf import mcscf

    mc = mcscf.CASSCF(scf._mf, n_active, (n_alpha, n_beta))
    assert mc.ncore == n_core, (mc.ncore, n_core)
    mc.verbose = 0
    mc.conv_tol = CASSCF_CONV_TOL
    mc.conv_tol_grad = CASSCF_GRAD_TOL
    mc.max_cycle_macro = options.get("cycles", CASSCF_MAX_CYCLES)
    if "max_stepsize" in options:
        mc.max_stepsize = options["max_stepsize"]
    mc.natorb = True
    mc.fcisolver.conv_tol = CASSCF_FCI_TOL
    mc.fix_spin_(shift=CASSCF_SPIN_SHIFT, ss=spin * (spin + 1))
    with scf_threads(), warnings.catch_warnings():
        warnings.simplefilter("ignore")
        mc.kernel(np.asarray(mo_coeff, dtype=float))
    return mc


def full_integrals(scf: ScfSolution, mo_coeff: np.ndarray) -> tuple[float, np.ndarray, np.ndarray]:
    """(nuclear repulsion in Ha, h1 (n, n), h2 (n, n, n, n) in chemists' notation) over every orbital of
    ``mo_coeff``: the input of an orbital rotation, which then needs no more PySCF calls."""
    from pyscf import ao2mo

    mol = scf._mf.mol
    c = np.asarray(mo_coeff, dtype=float)
    n = c.shape[1]
    h1 = c.T @ scf._mf.get_hcore() @ c
    h2 = ao2mo.restore(1, ao2mo.full(mol, c, compact=True), n)
    return scf.nuclear_repulsion, np.ascontiguousarray(h1), np.ascontiguousarray(h2)


def determinant_energy_from_density(scf: ScfSolution, mo_coeff: np.ndarray, n_doubly: int, n_singly: int) -> float:
    """Total energy (Ha) of the determinant filling the first ``n_doubly`` orbitals of ``mo_coeff`` twice and the
    next ``n_singly`` once (alpha), by PySCF's SCF energy functional of that determinant's density.

    An independent route to the energy that the active-space integrals give the same determinant (AO-basis
    Coulomb and exchange instead of transformed MO integrals); for the SCF orbitals it is the SCF energy.
    """
    uhf, dm, _ = _determinant(scf, mo_coeff, n_doubly, n_singly)
    with scf_threads():
        return float(uhf.energy_tot(dm=dm))


def reference_fock(scf: ScfSolution, mo_coeff: np.ndarray, n_doubly: int, n_singly: int) -> np.ndarray:
    """The spin-averaged Fock matrix (Ha) of that determinant in the basis of ``mo_coeff``, (n_mo, n_mo)."""
    uhf, dm, c = _determinant(scf, mo_coeff, n_doubly, n_singly)
    with scf_threads():
        fock = uhf.get_fock(dm=dm)
    return c.T @ (0.5 * (fock[0] + fock[1])) @ c


def _determinant(scf: ScfSolution, mo_coeff: np.ndarray, n_doubly: int, n_singly: int) -> tuple[Any, np.ndarray,
                                                                                                    np.ndarray]:
    """(a quiet PySCF UHF on the molecule, the determinant's (alpha, beta) AO densities, the orbitals as floats)."""
    from pyscf import scf as pyscf_scf

    c = np.asarray(mo_coeff, dtype=float)
    d_alpha = c[:, :n_doubly + n_singly] @ c[:, :n_doubly + n_singly].T
    d_beta = c[:, :n_doubly] @ c[:, :n_doubly].T
    uhf = pyscf_scf.UHF(scf._mf.mol)
    uhf.verbose = 0
    return uhf, np.array([d_alpha, d_beta]), c


def state_densities(ci: np.ndarray, n_orbitals: int, n_alpha: int, n_beta: int) -> tuple[np.ndarray, np.ndarray]:
    """Spin-summed 1-RDM (n, n) and 2-RDM (n, n, n, n) of a normalised CI vector in PySCF order, with PySCF's
    conventions: E = sum h1[p,q] D[p,q] + 1/2 sum (pq|rs) G[p,q,r,s] (chemists' notation)."""
    from pyscf import fci

    (d1a, d1b), (d2aa, d2ab, d2bb) = fci.direct_spin1.make_rdm12s(
        np.ascontiguousarray(ci, dtype=float), n_orbitals, (n_alpha, n_beta))
    return d1a + d1b, d2aa + d2ab + d2ab.transpose(2, 3, 0, 1) + d2bb
