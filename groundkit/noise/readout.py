"""Readout: per-qubit assignment matrices, their calibration on the noise model, and tensored mitigation.

A[read, true] is the assignment matrix of one qubit. Tensored mitigation assumes independent qubits and inverts
each calibrated Â_q: a term ∏_{q∈S} Z_q is then evaluated per shot as ∏_{q∈S} w_q(b_q) with
w_q = Â_q^{-T} (1, −1), whose expectation over the noisy outcome distribution equals the ideal one when Â = A
(tensor-product readout mitigation; common practice, e.g. Bravyi, Sheldon, Kandala, McKay and Gambetta, Phys.
Rev. A 103, 042605 (2021), from memory). Calibration prepares |0…0⟩ and |1…1⟩ (an X on every qubit) under the
same noise model (gate error and relaxation of the X, then readout) and counts flips per qubit.
"""

from __future__ import annotations

import cirq
import numpy as np

from ..errors import NoiseError
from .model import DeviceNoise

PLAIN_WEIGHTS = np.array([1.0, -1.0])


def apply_per_qubit(tensor: np.ndarray, matrices: list[np.ndarray]) -> np.ndarray:
    """``tensor`` of shape (2,)*n with ``matrices[q]`` applied on axis q (A[out, in])."""
    for q, m in enumerate(matrices):
        tensor = np.moveaxis(np.tensordot(m, tensor, axes=([1], [q])), 0, q)
    return tensor


def calibrate(noise: DeviceNoise, n_qubits: int, shots: int | None, rng: np.random.Generator) -> list[np.ndarray]:
    """Calibrated assignment matrices Â_q (exact when ``shots`` is None, else from ``shots`` shots of each of the
    two calibration states). Each qubit's calibration circuit is one X gate then readout; qubits are
    independent under this model, so each is simulated on its own."""
    q = cirq.LineQubit(0)
    prepared = []
    for circuit in (cirq.Circuit(cirq.I(q)), cirq.Circuit(cirq.X(q))):
        rho = cirq.DensityMatrixSimulator(dtype=np.complex128).simulate(
            noise.noisy(circuit), qubit_order=[q]).final_density_matrix
        prepared.append(np.clip(np.real(np.diag(rho)), 0.0, 1.0))
    out = []
    for k in range(n_qubits):
        a = noise.assignment(n_qubits)[k]
        columns = []
        for true_distribution in prepared:
            read = a @ true_distribution
            if shots is not None:
                ones = rng.binomial(int(shots), min(max(read[1], 0.0), 1.0))
                read = np.array([shots - ones, ones], dtype=float) / shots
            columns.append(read)
        out.append(np.column_stack(columns))
    return out


def mitigation_weights(calibrated: list[np.ndarray]) -> list[np.ndarray]:
    """Per qubit w_q = Â_q^{-T} (1, −1): the per-shot value of Z_q read as bit b is w_q[b]."""
    out = []
    for q, a in enumerate(calibrated):
        det = np.linalg.det(a)
        if abs(det) < 1e-6:
            raise NoiseError(f"the calibrated assignment matrix of qubit {q} is singular (det {det:.2e}): readout "
                             "mitigation cannot invert a readout that carries no information")
        out.append(np.linalg.solve(a.T, PLAIN_WEIGHTS))
    return out


def term_transfer(assignment: list[np.ndarray], weights: list[np.ndarray] | None) -> list[np.ndarray]:
    """Per qubit the 2×2 map T_q with rows (1, 1) and (A_q^T w_q): applied to every axis of the true outcome
    distribution it gives, at index ``mask``, the expectation of ∏_{q∈mask} w_q(read bit) (a Walsh transform
    with readout folded in)."""
    out = []
    for q, a in enumerate(assignment):
        w = PLAIN_WEIGHTS if weights is None else weights[q]
        out.append(np.vstack([np.ones(2), a.T @ w]))
    return out


def shot_values(outcomes: np.ndarray, masks: np.ndarray, coefficients: np.ndarray, n_qubits: int,
                weights: list[np.ndarray]) -> np.ndarray:
    """Per outcome index the group value Σ_t c_t ∏_{q∈t} w_q(b_q) with mitigation weights."""
    bits = (outcomes[:, None] >> (n_qubits - 1 - np.arange(n_qubits))[None, :]) & 1
    table = np.stack([w for w in weights])  # (n, 2)
    per_qubit = table[np.arange(n_qubits)[None, :], bits]  # (m, n)
    values = np.zeros(outcomes.size)
    for c, mask in zip(coefficients, masks):
        members = [q for q in range(n_qubits) if (int(mask) >> (n_qubits - 1 - q)) & 1]
        values += c * np.prod(per_qubit[:, members], axis=1)
    return values
