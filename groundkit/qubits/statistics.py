"""Pauli statistics of a qubit Hamiltonian and qubit-wise commuting measurement groups."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from openfermion import QubitOperator


def qubitwise_commute(a: tuple, b: tuple) -> bool:
    """True when on every qubit the two Pauli strings act with the same Pauli or one of them is the identity."""
    ops = dict(a)
    return all(ops.get(q, op) == op for q, op in b)


def qwc_groups(operator: QubitOperator) -> list[list[tuple]]:
    """Greedy colouring into qubit-wise commuting groups: terms by descending |coefficient|, each into the first
    group it commutes with qubit-wise (first fit). The identity term is left out: it needs no measurement.

    Each group keeps its measurement basis as X and Z bit masks, so one term is checked against every group at
    once with integer arithmetic.
    """
    terms = sorted((t for t in operator.terms if t), key=lambda t: -abs(operator.terms[t]))
    groups: list[list[tuple]] = []
    x_masks: list[int] = []
    z_masks: list[int] = []
    for term in terms:
        x, z = _masks(term)
        support = x | z
        chosen = -1
        if groups:
            gx = np.fromiter(x_masks, dtype=object, count=len(x_masks))
            gz = np.fromiter(z_masks, dtype=object, count=len(z_masks))
            overlap = (gx | gz) & support
            fits = np.flatnonzero(((gx ^ x) & overlap | (gz ^ z) & overlap) == 0)
            chosen = int(fits[0]) if fits.size else -1
        if chosen < 0:
            groups.append([term])
            x_masks.append(x)
            z_masks.append(z)
        else:
            groups[chosen].append(term)
            x_masks[chosen] |= x
            z_masks[chosen] |= z
    return groups


def _masks(term: tuple) -> tuple[int, int]:
    """X and Z bit masks of a Pauli string (Y sets both)."""
    x = z = 0
    for q, op in term:
        if op in "XY":
            x |= 1 << q
        if op in "YZ":
            z |= 1 << q
    return x, z


@dataclass(frozen=True)
class PauliStatistics:
    """Counts for one qubit Hamiltonian. ``pauli_terms`` counts the identity; ``one_norm`` (Ha) leaves it out."""

    qubits: int
    pauli_terms: int
    largest_weight: int
    one_norm: float
    measurement_groups: int
    grouping: str = "qubit-wise commuting, greedy first fit by descending |coefficient|"


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
