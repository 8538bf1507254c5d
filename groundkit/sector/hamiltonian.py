"""The active-space Hamiltonian acting on CI arrays, through PySCF's FCI contraction (``direct_spin1``).

H = sum_pq h1[p,q] E_pq + 1/2 sum_pqrs (pq|rs) (E_pq E_rs - delta_qr E_ps) + core_energy, chemists' notation.
The one-electron part is absorbed into the two-electron tensor once; each product H.psi is then one call of
``contract_2e`` (OpenMP-parallel C). Small sectors (up to ``DENSE_LIMIT`` determinants) instead keep the whole
matrix, built once by PySCF's ``pspace`` (Slater-Condon rules in C), and multiply with NumPy: there the cost of
a ``contract_2e`` call is its fixed overhead, which grows when the cores are busy. This module and
:mod:`groundkit.sector.spin` are the only places in the engine that call PySCF.
"""

from __future__ import annotations

import numpy as np
from pyscf.fci import cistring, direct_spin1

DENSE_LIMIT = 3000
"""Sectors up to this many determinants keep H as a dense matrix (at most 72 MB)."""


class SectorHamiltonian:
    """H restricted to the determinants with ``n_alpha`` and ``n_beta`` electrons in ``n_orbitals`` orbitals.

    ``h1`` (n, n) and ``h2`` (n, n, n, n) in Hartree, chemists' notation; ``core_energy`` in Hartree is added by
    :meth:`energy` but not by :meth:`apply`. ``dense`` forces (True) or forbids (False) the dense matrix; the
    default decides by ``DENSE_LIMIT``.
    """

    def __init__(
        self,
        h1: np.ndarray,
        h2: np.ndarray,
        n_alpha: int,
        n_beta: int,
        core_energy: float = 0.0,
        dense: bool | None = None,
    ):
        h1 = np.ascontiguousarray(h1, dtype=float)
        h2 = np.ascontiguousarray(h2, dtype=float)
        n = h1.shape[0]
        self.n_orbitals = n
        self.nelec = (int(n_alpha), int(n_beta))
        self.core_energy = float(core_energy)
        self._h1 = h1
        self._h2 = h2
        self._absorbed = direct_spin1.absorb_h1e(h1, h2, n, self.nelec, 0.5)
        self._links = (
            cistring.gen_linkstr_index_trilidx(range(n), self.nelec[0]),
            cistring.gen_linkstr_index_trilidx(range(n), self.nelec[1]),
        )
        self.shape = (self._links[0].shape[0], self._links[1].shape[0])
        size = self.shape[0] * self.shape[1]
        self.dense = size <= DENSE_LIMIT if dense is None else bool(dense)
        self._matrix = None
        if self.dense:
            _, self._matrix = direct_spin1.pspace(h1, h2, n, self.nelec, np=size)

    def apply(self, ci: np.ndarray) -> np.ndarray:
        """(H - core_energy) ci, same shape as ``ci``; Hartree."""
        ci = np.ascontiguousarray(ci, dtype=float)
        if self._matrix is not None:
            return (self._matrix @ ci.reshape(-1)).reshape(ci.shape)
        out = direct_spin1.contract_2e(self._absorbed, ci, self.n_orbitals, self.nelec, self._links)
        return np.asarray(out).reshape(ci.shape)

    def energy(self, ci: np.ndarray) -> float:
        """<ci|H|ci> / <ci|ci> including the core energy; Hartree."""
        h_ci = self.apply(ci)
        return float(np.vdot(ci, h_ci) / np.vdot(ci, ci)) + self.core_energy

    def diagonal(self) -> np.ndarray:
        """<D|H|D> - core_energy for every determinant, shape (alpha strings, beta strings); Hartree."""
        hdiag = direct_spin1.make_hdiag(self._h1, self._h2, self.n_orbitals, self.nelec)
        return np.asarray(hdiag).reshape(self.shape)
