"""Refining a two-qubit decomposition to machine precision.

Cirq's √iSWAP decomposition (``two_qubit_matrix_to_sqrt_iswap_operations``) loses precision near the edges of the
Weyl chamber, where CNOT-like blocks lie: its arccos and square roots of near-zero numbers leave errors of about
1.5e-8 (√ε) per block, which add up over thousands of blocks. :func:`polished` keeps the decomposition's two-qubit
gates and refines its single-qubit gates by Gauss–Newton steps on ‖U − e^{iφ}·V‖, starting from Cirq's answer,
so the block is exact to ~1e-14.
"""

from __future__ import annotations

from collections.abc import Sequence

import cirq
import numpy as np

_PAULIS = (np.array([[0, 1], [1, 0]], dtype=complex), np.array([[0, -1j], [1j, 0]]), np.diag([1.0 + 0j, -1.0]))
TOLERANCE = 1e-13


def _segments(ops: Sequence[cirq.Operation], pair: tuple[cirq.Qid, cirq.Qid]) -> tuple[list, list]:
    """(single-qubit layers as [2×2 on pair[0], 2×2 on pair[1]], two-qubit matrices) in time order; one more
    layer than two-qubit gates."""
    layers = [[np.eye(2, dtype=complex), np.eye(2, dtype=complex)]]
    entanglers = []
    for op in ops:
        if len(op.qubits) == 2:
            entanglers.append(cirq.Circuit(op).unitary(qubit_order=list(pair)))
            layers.append([np.eye(2, dtype=complex), np.eye(2, dtype=complex)])
        elif len(op.qubits) == 1:
            k = pair.index(op.qubits[0])
            layers[-1][k] = cirq.unitary(op) @ layers[-1][k]
    return layers, entanglers


def _product(layers: list, entanglers: list) -> np.ndarray:
    total = np.kron(layers[0][0], layers[0][1])
    for entangler, layer in zip(entanglers, layers[1:]):
        total = np.kron(layer[0], layer[1]) @ entangler @ total
    return total


def _su2(t: np.ndarray) -> np.ndarray:
    """exp(i·t·σ) for a real 3-vector t (closed form)."""
    angle = float(np.linalg.norm(t))
    if angle == 0.0:
        return np.eye(2, dtype=complex)
    axis = sum(t[a] * _PAULIS[a] for a in range(3)) / angle
    return np.cos(angle) * np.eye(2) + 1j * np.sin(angle) * axis


def polished(target: np.ndarray, ops: Sequence[cirq.Operation], pair: tuple[cirq.Qid, cirq.Qid]) -> list:
    """``ops`` (a decomposition of the 4×4 ``target`` on ``pair``) with refined single-qubit gates (as 2×2 matrix
    gates, which the rewriting turns into PhasedXZ); ``ops`` unchanged when already within :data:`TOLERANCE` or
    when refining does not help. Gauss–Newton steps with the exact Jacobian (quadratic convergence from Cirq's
    ~1e-8 start)."""
    ops = list(ops)
    layers, entanglers = _segments(ops, pair)
    current = _product(layers, entanglers)
    phase = np.angle(np.vdot(current, target))
    error = np.linalg.norm(target - np.exp(1j * phase) * current)
    start = error
    if error < TOLERANCE:
        return ops
    for _ in range(4):
        columns = []
        for k in range(len(layers)):
            for j in range(2):
                for a in range(3):
                    varied = [list(layer) for layer in layers]
                    varied[k][j] = layers[k][j] @ (1j * _PAULIS[a])
                    columns.append(np.exp(1j * phase) * _product(varied, entanglers))
        columns.append(1j * np.exp(1j * phase) * current)
        jacobian = np.array([np.concatenate([c.real.ravel(), c.imag.ravel()]) for c in columns]).T
        diff = target - np.exp(1j * phase) * current
        step = np.linalg.lstsq(jacobian, np.concatenate([diff.real.ravel(), diff.imag.ravel()]), rcond=None)[0]
        layers = [[layers[k][j] @ _su2(step[6 * k + 3 * j: 6 * k + 3 * j + 3]) for j in range(2)]
                  for k in range(len(layers))]
        phase += step[-1]
        current = _product(layers, entanglers)
        error = np.linalg.norm(target - np.exp(1j * phase) * current)
        if error < TOLERANCE:
            break
    if not error < start:
        return ops
    two_qubit = [op for op in ops if len(op.qubits) == 2]
    out: list[cirq.Operation] = []
    for k, layer in enumerate(layers):
        out += [cirq.MatrixGate(layer[j]).on(pair[j]) for j in range(2)]
        if k < len(two_qubit):
            out.append(two_qubit[k])
    return out
