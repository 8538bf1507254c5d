"""Moller-Plesset first-order amplitudes from active-space integrals and the reference's Fock diagonal."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from groundkit.sector.excitation import Excitation
from groundkit.sector.strings import occupied
from groundkit.sector.tables import ExcitationTable, determinant_image


def orbital_energies(h1: np.ndarray, h2: np.ndarray, alpha: int, beta: int) -> np.ndarray:
    """Fock diagonal of the determinant (alpha string, beta string) per interleaved spin orbital; Hartree.

    f_pp(alpha) = h1_pp + sum_{i in alpha} [(pp|ii) - (pi|ip)] + sum_{j in beta} (pp|jj), and alike for beta. For
    canonical RHF or ROHF orbitals these are the canonical orbital energies of the active space.
    """
    occ_a, occ_b = occupied(alpha), occupied(beta)
    coulomb = np.einsum("ppii->pi", h2)
    exchange = np.einsum("piip->pi", h2)
    base = np.diag(h1).copy()
    j_a, k_a = coulomb[:, occ_a].sum(axis=1), exchange[:, occ_a].sum(axis=1)
    j_b, k_b = coulomb[:, occ_b].sum(axis=1), exchange[:, occ_b].sum(axis=1)
    out = np.empty(2 * h1.shape[0])
    out[0::2] = base + j_a - k_a + j_b
    out[1::2] = base + j_a + j_b - k_b
    return out


def first_order_amplitudes(
    excitations: Sequence[Excitation],
    tables: Sequence[ExcitationTable],
    reference_index: tuple[int, int],
    h_reference: np.ndarray,
    energies: np.ndarray,
) -> np.ndarray:
    """Angle per excitation making exp(theta G) phi agree with first-order perturbation theory.

    theta = <tau phi|H|phi> / (sum eps_annihilated - sum eps_created) for doubles that move electrons from occupied
    to empty spin orbitals of the reference phi; 0 for singles and every other excitation. ``h_reference`` is
    H phi as a CI array, ``energies`` the spin-orbital Fock diagonal (Hartree).
    """
    angles = np.zeros(len(excitations))
    ia, ib = reference_index
    for k, (excitation, table) in enumerate(zip(excitations, tables)):
        if excitation.rank != 2:
            continue
        image = determinant_image(table, ia, ib)
        if image is None:
            continue
        ja, jb, sign = image
        gap = energies[list(excitation.annihilators)].sum() - energies[list(excitation.creators)].sum()
        if abs(gap) < 1e-12:
            continue
        angles[k] = sign * h_reference[ja, jb] / gap
    return angles
