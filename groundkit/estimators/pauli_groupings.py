"""Groupings of Pauli strings: qubit-wise commuting (two orders), fully commuting with a Clifford circuit, none.

Every ordering is documented in :mod:`groundkit.qubits.sorted_insertion` (|coefficient|, ties by Pauli string).

- ``qwc``: qubit-wise commuting groups, first fit by descending |coefficient|. This is the greedy grouping groundkit
  has always used, and it is the sorted insertion of Crawford et al., Quantum 5, 385 (2021) (aliases
  ``qwc-sorted-insertion``).
- ``qwc-term-order``: qubit-wise commuting, first fit over the terms in Pauli-string order (no sorting), to show
  what the sorting buys.
- ``commuting``: fully commuting groups by sorted insertion, each measured after a Clifford circuit that maps every
  term of the group to a signed Z string (:mod:`groundkit.qubits.clifford`).
- ``none``: one term per group.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from openfermion import QubitOperator

from ..qubits.clifford import diagonalising_gates
from ..qubits.sorted_insertion import ordered_terms, sorted_insertion
from ..registry import register
from .basis_change import CliffordChange, QubitwiseChange
from .grouping import Grouping
from .groups import MeasurementGroup


def constant_term(hamiltonian: QubitOperator) -> float:
    """The identity term's coefficient (Hartree), measured by no group."""
    return float(np.real(hamiltonian.terms.get((), 0.0)))


def _coefficients(hamiltonian: QubitOperator, terms: list[tuple], share: np.ndarray | None) -> np.ndarray:
    coefficients = np.array([float(np.real(hamiltonian.terms[t])) for t in terms])
    return coefficients if share is None else share * coefficients


def _mask(term: tuple, n_qubits: int) -> int:
    return sum(1 << (n_qubits - 1 - q) for q, _ in term)


def qubitwise_groups(hamiltonian: QubitOperator, n_qubits: int, term_groups: list[list[tuple]],
                     shares: list[np.ndarray] | None = None) -> list:
    """Measurement groups of qubit-wise commuting term lists (each qubit rotated to its group's Pauli); ``shares``
    (one array per group) scales each member's coefficient when a term is split over several groups."""
    groups = []
    for g, terms in enumerate(term_groups):
        basis: dict[int, str] = {}
        for term in terms:
            basis.update(dict(term))
        coefficients = _coefficients(hamiltonian, terms, None if shares is None else shares[g])
        masks = np.array([_mask(t, n_qubits) for t in terms], dtype=np.int64)
        groups.append(MeasurementGroup(QubitwiseChange(dict(sorted(basis.items()))), coefficients, masks,
                                       tuple(terms)))
    return groups


def commuting_groups(hamiltonian: QubitOperator, n_qubits: int, term_groups: list[list[tuple]],
                     shares: list[np.ndarray] | None = None) -> list:
    """Measurement groups of fully commuting term lists, each after its diagonalising Clifford circuit; ``shares``
    as in :func:`qubitwise_groups`."""
    weights = 1 << np.arange(n_qubits - 1, -1, -1, dtype=np.int64)
    groups = []
    for g, terms in enumerate(term_groups):
        gates, z_masks, signs = diagonalising_gates(terms, n_qubits)
        coefficients = signs * _coefficients(hamiltonian, terms, None if shares is None else shares[g])
        groups.append(MeasurementGroup(CliffordChange(tuple(gates)), coefficients,
                                       z_masks.astype(np.int64) @ weights, tuple(terms)))
    return groups


@register("grouping", "qwc", aliases=("qwc-sorted-insertion",),
          label="qubit-wise commuting, sorted insertion (first fit by descending |c|)")
@dataclass(frozen=True)
class QubitwiseSorted(Grouping):
    """Qubit-wise commuting groups by sorted insertion; single-qubit rotations only."""

    def pauli_groups(self, hamiltonian: QubitOperator, n_qubits: int) -> tuple[float, list]:
        term_groups = sorted_insertion(hamiltonian, "qubitwise")
        return constant_term(hamiltonian), qubitwise_groups(hamiltonian, n_qubits, term_groups)


@register("grouping", "qwc-term-order", label="qubit-wise commuting, first fit in Pauli-string order")
@dataclass(frozen=True)
class QubitwiseTermOrder(Grouping):
    """Qubit-wise commuting groups, first fit over the terms in Pauli-string order (no magnitude sorting)."""

    def pauli_groups(self, hamiltonian: QubitOperator, n_qubits: int) -> tuple[float, list]:
        term_groups = sorted_insertion(hamiltonian, "qubitwise", by_magnitude=False)
        return constant_term(hamiltonian), qubitwise_groups(hamiltonian, n_qubits, term_groups)


@register("grouping", "commuting", aliases=("fully-commuting",),
          label="fully commuting, sorted insertion, Clifford diagonalisation")
@dataclass(frozen=True)
class CommutingSorted(Grouping):
    """Fully commuting groups by sorted insertion, each measured after a diagonalising Clifford circuit."""

    def pauli_groups(self, hamiltonian: QubitOperator, n_qubits: int) -> tuple[float, list]:
        term_groups = sorted_insertion(hamiltonian, "commuting")
        return constant_term(hamiltonian), commuting_groups(hamiltonian, n_qubits, term_groups)


@register("grouping", "none", aliases=("single-terms",), label="one Pauli term per group")
@dataclass(frozen=True)
class SingleTerms(Grouping):
    """Every Pauli term measured on its own."""

    def pauli_groups(self, hamiltonian: QubitOperator, n_qubits: int) -> tuple[float, list]:
        term_groups = [[t] for t in ordered_terms(hamiltonian)]
        return constant_term(hamiltonian), qubitwise_groups(hamiltonian, n_qubits, term_groups)
