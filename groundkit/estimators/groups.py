"""Measurement groups of a qubit Hamiltonian: bases, bit masks, rotations to the Z basis, exact group moments."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from openfermion import QubitOperator

from ..errors import ComponentError
from ..qubits.statistics import qwc_groups

GROUPINGS = ("qwc", "none")
_H = np.array([[1, 1], [1, -1]], dtype=complex) / np.sqrt(2)
_ROTATION = {"X": _H, "Y": _H @ np.diag([1, -1j]), "Z": np.eye(2, dtype=complex)}  # Y: H S^dagger


@dataclass(frozen=True, eq=False)
class MeasurementGroup:
    """Terms measured together after rotating each qubit of ``basis`` to Z. ``masks[t]`` has bit (n-1-q) set for
    each qubit q of term t, so the term's value on outcome index k is (-1)^popcount(k & mask)."""

    basis: dict[int, str]
    coefficients: np.ndarray
    masks: np.ndarray

    def values(self, outcomes: np.ndarray) -> np.ndarray:
        """The group's value (Ha) for each outcome index."""
        bits = np.bitwise_and(outcomes[:, None], self.masks[None, :])
        signs = 1.0 - 2.0 * (_popcount(bits) & 1)
        return signs @ self.coefficients


def measurement_groups(hamiltonian: QubitOperator, n_qubits: int, grouping: str) -> tuple[float, list]:
    """(identity coefficient, groups) for 'qwc' (greedy qubit-wise commuting) or 'none' (one term per group)."""
    if grouping not in GROUPINGS:
        raise ComponentError(f"unknown grouping {grouping!r}; accepted: {', '.join(GROUPINGS)}")
    constant = float(np.real(hamiltonian.terms.get((), 0.0)))
    if grouping == "qwc":
        term_groups = qwc_groups(hamiltonian)
    else:
        term_groups = [[t] for t in hamiltonian.terms if t]
    groups = []
    for terms in term_groups:
        basis: dict[int, str] = {}
        masks = []
        for term in terms:
            basis.update(dict(term))
            masks.append(sum(1 << (n_qubits - 1 - q) for q, _ in term))
        coefficients = np.array([np.real(hamiltonian.terms[t]) for t in terms])
        groups.append(MeasurementGroup(basis, coefficients, np.array(masks, dtype=np.int64)))
    return constant, groups


def rotated_probabilities(state: np.ndarray, basis: dict[int, str], n_qubits: int) -> np.ndarray:
    """Outcome probabilities after rotating each qubit in ``basis`` so its Pauli is measured as Z."""
    tensor = np.asarray(state, dtype=complex).reshape((2,) * n_qubits)
    for q, op in basis.items():
        if op != "Z":
            tensor = np.moveaxis(np.tensordot(_ROTATION[op], tensor, axes=([1], [q])), 0, q)
    probabilities = np.abs(tensor.reshape(-1)) ** 2
    return probabilities / probabilities.sum()


def sample_group(rng: np.random.Generator, group: MeasurementGroup, probabilities: np.ndarray,
                 shots: int) -> tuple[float, float]:
    """Mean (Ha) of ``shots`` shots drawn from the outcome ``probabilities``, and the variance of that mean (Ha^2)
    from the sample variance of the per-shot group values."""
    counts = rng.multinomial(int(shots), probabilities)
    seen = np.flatnonzero(counts)
    values, weights = group.values(seen), counts[seen]
    mean = float(weights @ values) / shots
    return mean, float(weights @ (values - mean) ** 2) / (shots - 1) / shots


def group_moments(state: np.ndarray, group: MeasurementGroup, n_qubits: int) -> tuple[float, float]:
    """Exact mean (Ha) and variance (Ha^2) of one group's per-shot value in ``state``."""
    p = rotated_probabilities(state, group.basis, n_qubits)
    support = np.flatnonzero(p > 1e-300)
    v = group.values(support)
    mean = float(p[support] @ v)
    return mean, float(max(p[support] @ (v * v) - mean * mean, 0.0))


def _popcount(values: np.ndarray) -> np.ndarray:
    v = values.astype(np.int64)
    count = np.zeros(v.shape, dtype=np.int64)
    while np.any(v):
        count += v & 1
        v = v >> 1
    return count
