"""Orbital rotations of an active-space problem, and the orbital gradient from reduced density matrices.

Pure NumPy on plain arrays. The orbitals ``C U`` with ``U = exp(K)``, ``K`` real antisymmetric, are rotated from a
base set ``C`` (ordered core, active, external); only rotations between the three spaces change the energy of a
state that is exact in the active space, so :func:`rotation_pairs` lists those (p in a later space than q, with
``K[p, q] = kappa`` and ``K[q, p] = -kappa``). Energies are in Hartree.

With the spin-summed 1- and 2-RDMs ``D`` and ``G`` over the core and active orbitals (PySCF's conventions, so
``E = E_nuc + sum h D + 1/2 sum (pq|rs) G``), the generalised Fock matrix ``F[x, y] = sum_q h[x, q] D[y, q] +
sum_qrs (xq|rs) G[y, q, r, s]`` gives the gradient at ``K = 0`` as ``dE/dkappa_pq = 2 (F[p, q] - F[q, p])``
(Helgaker, Jørgensen, Olsen, *Molecular Electronic-Structure Theory*, section 10.8, from memory); away from
``K = 0`` the chain rule through ``exp`` is applied exactly by :func:`exponential_gradient`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.linalg import expm


@dataclass(frozen=True, eq=False)
class FullIntegrals:
    """Integrals over every orbital of a base set: nuclear repulsion (Ha), h1 (n, n), h2 (n, n, n, n) in
    chemists' notation; the first ``n_core`` orbitals are core, the next ``n_active`` active."""

    nuclear: float
    h1: np.ndarray
    h2: np.ndarray
    n_core: int
    n_active: int

    @property
    def n_orbitals(self) -> int:
        return int(self.h1.shape[0])

    @property
    def n_kept(self) -> int:
        """Core plus active orbitals: the ones a density matrix touches."""
        return self.n_core + self.n_active


def rotation_pairs(n_core: int, n_active: int, n_orbitals: int) -> list[tuple[int, int]]:
    """Non-redundant rotations (p, q), p > q: core–active, core–external and active–external."""
    core, active = range(n_core), range(n_core, n_core + n_active)
    external = range(n_core + n_active, n_orbitals)
    return [(p, q) for q in core for p in list(active) + list(external)] + [(p, q) for q in active for p in external]


def generator(kappa: np.ndarray, pairs: list[tuple[int, int]], n_orbitals: int) -> np.ndarray:
    """The antisymmetric matrix K of the rotation parameters ``kappa`` (radians)."""
    k = np.zeros((n_orbitals, n_orbitals))
    if pairs:
        rows, cols = np.array(pairs).T
        k[rows, cols] = kappa
        k[cols, rows] = -np.asarray(kappa)
    return k


def rotation(kappa: np.ndarray, pairs: list[tuple[int, int]], n_orbitals: int) -> np.ndarray:
    """U = exp(K), orthogonal (n, n): the new orbitals are ``C @ U``."""
    return expm(generator(kappa, pairs, n_orbitals))


def rotated_integrals(full: FullIntegrals, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """h1 (n, n) and (xq|rs) (n, m, m, m) in the orbitals ``C U``, m = core + active orbitals (the only ones the
    energy and the generalised Fock matrix need as the last three indices)."""
    m = full.n_kept
    h1 = u.T @ full.h1 @ u
    kept = u[:, :m]
    g = np.einsum("abcd,ds->abcs", full.h2, kept, optimize=True)
    g = np.einsum("abcs,cr->abrs", g, kept, optimize=True)
    g = np.einsum("abrs,bq->aqrs", g, kept, optimize=True)
    g = np.einsum("aqrs,ax->xqrs", g, u, optimize=True)
    return h1, g


def active_hamiltonian(full: FullIntegrals, h1: np.ndarray, g: np.ndarray) -> tuple[float, np.ndarray, np.ndarray]:
    """(core energy with nuclear repulsion, active h1, active h2) from rotated integrals, core folded in as in
    CASCI: h_eff[t, u] = h[t, u] + sum_i 2 (tu|ii) - (ti|iu)."""
    c, m = full.n_core, full.n_kept
    core, active = slice(0, c), slice(c, m)
    coulomb = np.einsum("pqii->pq", g[:m, :, core, core]) if c else np.zeros((m, m))
    exchange = np.einsum("piiq->pq", g[:m, core, core, :]) if c else np.zeros((m, m))
    veff = 2.0 * coulomb - exchange
    core_energy = full.nuclear + float(np.trace(2.0 * h1[core, core] + veff[core, core]))
    h1_active = h1[active, active] + veff[active, active]
    h2_active = np.ascontiguousarray(g[active, active, active, active])
    return core_energy, np.ascontiguousarray(h1_active), h2_active


def full_densities(d_active: np.ndarray, g_active: np.ndarray, n_core: int) -> tuple[np.ndarray, np.ndarray]:
    """Spin-summed 1-RDM (m, m) and 2-RDM (m, m, m, m) over core and active orbitals, from the active ones and a
    doubly occupied core (PySCF's conventions: G[p, q, r, s] = <a+_p a+_r a_s a_q> summed over spins)."""
    n_active = d_active.shape[0]
    m = n_core + n_active
    d = np.zeros((m, m))
    g = np.zeros((m, m, m, m))
    core, active = np.arange(n_core), slice(n_core, m)
    d[core, core] = 2.0
    d[active, active] = d_active
    g[active, active, active, active] = g_active
    for i in core:
        for j in core:
            g[i, i, j, j] += 4.0
            g[i, j, j, i] -= 2.0
        g[i, i, active, active] += 2.0 * d_active
        g[active, active, i, i] += 2.0 * d_active
        g[i, active, active, i] -= d_active.T
        g[active, i, i, active] -= d_active
    return d, g


def density_energy(full: FullIntegrals, h1: np.ndarray, g: np.ndarray, d: np.ndarray, gamma: np.ndarray) -> float:
    """E_nuc + sum h D + 1/2 sum (pq|rs) G in the rotated orbitals (Ha)."""
    m = full.n_kept
    return float(full.nuclear + np.sum(h1[:m, :m] * d) + 0.5 * np.sum(g[:m] * gamma))


def generalised_fock(h1: np.ndarray, g: np.ndarray, d: np.ndarray, gamma: np.ndarray) -> np.ndarray:
    """F (n, n): F[x, y] = sum_q h[x, q] D[y, q] + sum_qrs (xq|rs) G[y, q, r, s] for y in core or active, zero
    for external y."""
    n, m = h1.shape[0], d.shape[0]
    f = np.zeros((n, n))
    f[:, :m] = h1[:, :m] @ d.T + np.einsum("xqrs,yqrs->xy", g, gamma, optimize=True)
    return f


def exponential_gradient(k: np.ndarray, a: np.ndarray) -> np.ndarray:
    """dE/dK (n, n) at the rotation exp(K), given the antisymmetric gradient ``a`` at K' = 0 of the rotated
    orbitals (E(C exp(K) exp(K')) = E + 1/2 sum a K' + ...): ``1/2 Re V ((V^H a V) * conj(phi)) V^H`` with
    K = V diag(lambda) V^H and phi_ij = (1 - exp(-(lambda_i - lambda_j))) / (lambda_i - lambda_j), the exact
    derivative of exp (exp(-K) dexp(K)[X] = integral_0^1 exp(-tK) X exp(tK) dt)."""
    w, v = np.linalg.eigh(1j * k)  # iK is Hermitian: K = V diag(-i w) V^H
    lam = -1j * w
    z = lam[:, None] - lam[None, :]
    small = np.abs(z) < 1e-8
    safe = np.where(small, 1.0, z)
    phi = np.where(small, 1.0 - z / 2.0, (1.0 - np.exp(-safe)) / safe)
    a_tilde = v.conj().T @ a @ v
    return 0.5 * np.real(v @ (a_tilde * np.conj(phi)) @ v.conj().T)


def pair_gradient(k: np.ndarray, fock: np.ndarray, pairs: list[tuple[int, int]]) -> np.ndarray:
    """dE/dkappa for every pair at the rotation exp(K), from the generalised Fock matrix of the rotated orbitals."""
    a = 2.0 * (fock - fock.T)
    gk = exponential_gradient(k, a)
    if not pairs:
        return np.zeros(0)
    rows, cols = np.array(pairs).T
    return gk[rows, cols] - gk[cols, rows]
