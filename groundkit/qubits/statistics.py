"""Pauli statistics of a qubit Hamiltonian and qubit-wise commuting measurement groups."""

from __future__ import annotations

from dataclasses import dataclass

from openfermion import QubitOperator

from .sorted_insertion import sorted_insertion


def qubitwise_commute(a: tuple, b: tuple) -> bool:
    """True when on every qubit the two Pauli strings act with the same Pauli or one of them is the identity."""
    ops = dict(a)
    return all(ops.get(q, op) == op for q, op in b)


def qwc_groups(operator: QubitOperator) -> list[list[tuple]]:
    """Greedy colouring into qubit-wise commuting groups: terms by descending |coefficient| (ties by the Pauli
    string), each into the first group it commutes with qubit-wise (first fit; this is sorted insertion, see
    :mod:`groundkit.qubits.sorted_insertion`). The identity term is left out: it needs no measurement."""
    return sorted_insertion(operator, "qubitwise")


@dataclass(frozen=True)
class PauliStatistics:
    """Counts for one qubit Hamiltonian. ``pauli_terms`` counts the identity; ``one_norm`` (Ha) leaves it out."""

    qubits: int
    pauli_terms: int
    largest_weight: int
    one_norm: float
    measurement_groups: int
    grouping: str = "qubit-wise commuting, greedy first fit by descending |coefficient|, ties by Pauli string"


def pauli_statistics(operator: QubitOperator, n_qubits: int) -> PauliStatistics:
    """Term count, largest Pauli weight, 1-norm of the non-identity coefficients, number of QWC groups."""
    terms = operator.terms
    return PauliStatistics(
        qubits=n_qubits,
        pauli_terms=len(terms),
        largest_weight=max((len(t) for t in terms), default=0),
        one_norm=float(sum(abs(c) for t, c in terms.items() if t)),
        measurement_groups=len(qwc_groups(operator)),
    )
