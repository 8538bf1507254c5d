"""Overlapped groupings: every term measured in every sorted-insertion group it is compatible with.

Sorted insertion puts each Pauli term in one group; a term is often compatible with several. In an overlapped
grouping (Wu, Sun, Zhang, Yung et al., "Overlapped grouping measurement", Quantum 7, 896 (2023), from memory)
each term t is added to every group it is compatible with, and its coefficient is split over those groups,
c_t = sum_g w_tg c_t with sum_g w_tg = 1, so the groups still sum to the Hamiltonian exactly and each group's
sample mean stays unbiased. The weights follow the minimum-variance rule for independent estimates of one term,
w_tg proportional to the group's shots N_g, with N_g proportional to the group's standard deviation estimated in
the maximally mixed state (sigma_g^2 = sum_t (w_tg c_t)^2: no state, so the grouping is deterministic and
state-independent); the two are iterated to a fixed point (:data:`SPLIT_ITERATIONS` rounds). Budgets then use
the exact covariances of the trial state, as for every grouping.

- ``qwc-overlap``: qubit-wise commuting groups of ``qwc``, overlapped; single-qubit rotations.
- ``commuting-overlap``: fully commuting groups of ``commuting``, overlapped; each enlarged group is
  diagonalised afresh by the symplectic elimination of :mod:`groundkit.qubits.clifford`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from openfermion import QubitOperator

from ..qubits.sorted_insertion import clashes, masks, sorted_insertion
from ..registry import register
from .grouping import Grouping
from .pauli_groupings import commuting_groups, constant_term, qubitwise_groups

SPLIT_ITERATIONS = 200  # rounds of the weight / shot fixed point (converged well before on water STO-3G)


def overlapped_term_groups(hamiltonian: QubitOperator, compatibility: str) -> list[list[tuple]]:
    """Sorted-insertion groups, each extended (in sorted-term order) by every other term compatible with all its
    members. Deterministic: the order is that of :func:`sorted_insertion`."""
    base = sorted_insertion(hamiltonian, compatibility)
    order = [t for group in base for t in group]
    bits = {t: masks(t) for t in order}
    groups = []
    for group in base:
        members = list(group)
        inside = set(group)
        xs = np.array([bits[m][0] for m in members], dtype=np.int64)
        zs = np.array([bits[m][1] for m in members], dtype=np.int64)
        for t in order:
            if t not in inside and not clashes(compatibility, xs, zs, *bits[t]).any():
                members.append(t)
                inside.add(t)
                xs, zs = np.append(xs, bits[t][0]), np.append(zs, bits[t][1])
        groups.append(members)
    return groups


def _shares(shots: np.ndarray, members: list[np.ndarray], n_terms: int) -> list[np.ndarray]:
    """w_tg = N_g / (sum of N over the groups holding t), one array per group."""
    total = np.zeros(n_terms)
    for g, m in enumerate(members):
        total[m] += shots[g]
    return [shots[g] / total[m] for g, m in enumerate(members)]


def split_weights(coefficients: dict[tuple, float], term_groups: list[list[tuple]],
                  iterations: int = SPLIT_ITERATIONS) -> list[np.ndarray]:
    """Per group, the share w_tg of each member's coefficient (shares of a term sum to 1), from the fixed point
    of w_tg ∝ N_g and N_g ∝ sqrt(sum_t (w_tg c_t)^2) (maximally mixed state)."""
    index = {t: k for k, t in enumerate(coefficients)}
    c2 = np.array([coefficients[t] ** 2 for t in coefficients])
    members = [np.array([index[t] for t in g]) for g in term_groups]
    shots = np.ones(len(term_groups))
    for _ in range(iterations):
        weights = _shares(shots, members, len(c2))
        shots = np.array([np.sqrt(np.sum((w ** 2) * c2[m])) for w, m in zip(weights, members)])
        shots /= shots.sum()
    return _shares(shots, members, len(c2))


def _build(hamiltonian: QubitOperator, n_qubits: int, compatibility: str) -> tuple[float, list]:
    term_groups = overlapped_term_groups(hamiltonian, compatibility)
    coefficients = {t: float(np.real(hamiltonian.terms[t])) for g in term_groups for t in g}
    shares = split_weights(coefficients, term_groups)
    build = qubitwise_groups if compatibility == "qubitwise" else commuting_groups
    return constant_term(hamiltonian), build(hamiltonian, n_qubits, term_groups, shares)


@register("grouping", "qwc-overlap", label="qubit-wise commuting, overlapped groups with split coefficients")
@dataclass(frozen=True)
class QubitwiseOverlapped(Grouping):
    """``qwc`` groups, each term also measured in every other group it qubit-wise commutes with."""

    def pauli_groups(self, hamiltonian: QubitOperator, n_qubits: int) -> tuple[float, list]:
        return _build(hamiltonian, n_qubits, "qubitwise")


@register("grouping", "commuting-overlap", label="fully commuting, overlapped groups with split coefficients")
@dataclass(frozen=True)
class CommutingOverlapped(Grouping):
    """``commuting`` groups, each term also measured in every other group it commutes with."""

    def pauli_groups(self, hamiltonian: QubitOperator, n_qubits: int) -> tuple[float, list]:
        return _build(hamiltonian, n_qubits, "commuting")
