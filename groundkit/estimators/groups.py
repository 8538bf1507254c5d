"""Measurement groups: what one batch of shots measures, its basis change, and exact and sampled group moments.

A group holds a basis change U (see :mod:`.basis_change`) and the operator it measures written after U as signed
Z strings: ``coefficients[t]`` and ``masks[t]`` (bit n-1-q set for each qubit q), so the group's value on outcome
index k is sum_t coefficients[t] (-1)^popcount(k & masks[t]). ``terms`` are the Hamiltonian's Pauli strings the
group covers (empty for groups defined by a fermionic operator, as basis-rotation groups are).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np
from openfermion import QubitOperator

from .basis_change import ROTATION, BasisChange, QubitwiseChange

_ROTATION = ROTATION  # the single-qubit rotations, by Pauli (kept for callers of the former module)


@dataclass(frozen=True, eq=False)
class MeasurementGroup:
    """One measurement setting: basis change, measured Z strings (coefficients in Ha, bit masks), covered terms."""

    change: BasisChange
    coefficients: np.ndarray
    masks: np.ndarray
    terms: tuple[tuple, ...] = ()
    label: str = ""
    extra: dict[str, Any] = field(default_factory=dict)

    @property
    def basis(self) -> dict[int, str]:
        """Qubit -> Pauli of a qubit-wise group (Z for every qubit of another kind of group is not implied)."""
        if isinstance(self.change, QubitwiseChange):
            return self.change.basis
        raise AttributeError(f"a {type(self.change).__name__} group has no single-qubit basis")

    def values(self, outcomes: np.ndarray) -> np.ndarray:
        """The group's value (Ha) for each outcome index."""
        outcomes = np.asarray(outcomes, dtype=np.int64)
        out = np.empty(outcomes.size)
        for start in range(0, outcomes.size, 4096):
            chunk = outcomes[start:start + 4096]
            parity = np.bitwise_count(np.bitwise_and(chunk[:, None], self.masks[None, :])) & 1
            out[start:start + 4096] = (1.0 - 2.0 * parity) @ self.coefficients
        return out

    def probabilities(self, state: np.ndarray, n_qubits: int) -> np.ndarray:
        """Outcome probabilities of the rotated state."""
        p = np.abs(self.change.apply(state, n_qubits)) ** 2
        return p / p.sum()


def z_group(change: BasisChange, diagonal: QubitOperator, n_qubits: int, terms: tuple = (),
            label: str = "") -> tuple[float, MeasurementGroup]:
    """(identity part, group) of an operator that is diagonal (Z strings only) after ``change``."""
    constant = 0.0
    coefficients, masks = [], []
    for string, c in sorted(diagonal.terms.items(), key=lambda item: item[0]):
        if any(op != "Z" for _, op in string):
            raise ValueError(f"term {string} of a measured operator is not a Z string")
        if not string:
            constant += float(np.real(c))
            continue
        coefficients.append(float(np.real(c)))
        masks.append(sum(1 << (n_qubits - 1 - q) for q, _ in string))
    group = MeasurementGroup(change, np.array(coefficients), np.array(masks, dtype=np.int64), tuple(terms), label)
    return constant, group


def rotated_probabilities(state: np.ndarray, basis: dict[int, str], n_qubits: int) -> np.ndarray:
    """Outcome probabilities after rotating each qubit in ``basis`` so its Pauli is measured as Z."""
    p = np.abs(QubitwiseChange(basis).apply(state, n_qubits)) ** 2
    return p / p.sum()


def sample_group(rng: np.random.Generator, group: MeasurementGroup, probabilities: np.ndarray,
                 shots: int) -> tuple[float, float]:
    """Mean (Ha) of ``shots`` shots drawn from the outcome ``probabilities``, and the variance of that mean (Ha^2)
    from the sample variance of the per-shot group values."""
    counts = rng.multinomial(int(shots), probabilities)
    seen = np.flatnonzero(counts)
    values, weights = group.values(seen), counts[seen]
    mean = float(weights @ values) / shots
    return mean, float(weights @ (values - mean) ** 2) / (shots - 1) / shots


def moments_from(probabilities: np.ndarray, group: MeasurementGroup) -> tuple[float, float]:
    """Exact mean (Ha) and variance (Ha^2) of a group's per-shot value under outcome ``probabilities``."""
    support = np.flatnonzero(probabilities > 1e-300)
    v = group.values(support)
    p = probabilities[support]
    mean = float(p @ v)
    return mean, float(max(p @ (v * v) - mean * mean, 0.0))


def group_moments(state: np.ndarray, group: MeasurementGroup, n_qubits: int) -> tuple[float, float]:
    """Exact mean (Ha) and variance (Ha^2) of one group's per-shot value in ``state``: the variance is
    sum_ij c_i c_j (<P_i P_j> - <P_i><P_j>) over the group's measured strings, the exact group covariance."""
    return moments_from(group.probabilities(state, n_qubits), group)


def measurement_groups(hamiltonian: QubitOperator, n_qubits: int, grouping: Any) -> tuple[float, list]:
    """(identity coefficient, groups) of a qubit Hamiltonian under a grouping (a name or a Grouping)."""
    from .grouping import as_grouping

    return as_grouping(grouping).pauli_groups(hamiltonian, n_qubits)
