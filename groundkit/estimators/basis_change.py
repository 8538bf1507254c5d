"""Basis changes before a Z-basis measurement: applied to a statevector, and as Cirq operations.

Three kinds, one per family of groupings:

- :class:`QubitwiseChange`: one single-qubit rotation per qubit (X: H; Y: S† then H), for qubit-wise commuting
  groups;
- :class:`CliffordChange`: a Clifford circuit of H, S, CNOT and CZ (from :mod:`groundkit.qubits.clifford`), for
  fully commuting groups;
- :class:`PauliRotationChange`: a product of Pauli-string exponentials exp(i·a·P), here the Givens rotations of
  an orbital rotation written on the register, for basis-rotation groups.

Qubit 0 is the most significant bit of a basis-state index, and ``cirq.LineQubit(q)`` is qubit q.
"""

from __future__ import annotations

from dataclasses import dataclass

import cirq
import numpy as np

_H = np.array([[1, 1], [1, -1]], dtype=complex) / np.sqrt(2)
_S = np.diag([1.0, 1j])
ROTATION = {"X": _H, "Y": _H @ np.diag([1, -1j]), "Z": np.eye(2, dtype=complex)}  # Y: H S^dagger
_ONE_QUBIT = {"H": _H, "S": _S}
_CNOT = np.array([[1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 0, 1], [0, 0, 1, 0]], dtype=complex).reshape(2, 2, 2, 2)
_CZ = np.diag([1, 1, 1, -1]).astype(complex).reshape(2, 2, 2, 2)


def _one_qubit(tensor: np.ndarray, matrix: np.ndarray, q: int) -> np.ndarray:
    return np.moveaxis(np.tensordot(matrix, tensor, axes=([1], [q])), 0, q)


def _two_qubit(tensor: np.ndarray, matrix: np.ndarray, a: int, b: int) -> np.ndarray:
    out = np.tensordot(matrix, tensor, axes=([2, 3], [a, b]))
    return np.moveaxis(out, [0, 1], [a, b])


class BasisChange:
    """A unitary applied before measuring every qubit in the Z basis."""

    def apply(self, state: np.ndarray, n_qubits: int) -> np.ndarray:
        """The rotated statevector."""
        raise NotImplementedError

    def operations(self, qubits: list[cirq.Qid]) -> list[cirq.Operation]:
        """The change as Cirq operations on ``qubits`` (qubit q is ``qubits[q]``)."""
        raise NotImplementedError


@dataclass(frozen=True, eq=False)
class QubitwiseChange(BasisChange):
    """Rotate qubit q so that ``basis[q]`` (X, Y or Z) is measured as Z."""

    basis: dict[int, str]

    def apply(self, state: np.ndarray, n_qubits: int) -> np.ndarray:
        tensor = np.asarray(state, dtype=complex).reshape((2,) * n_qubits)
        for q, op in sorted(self.basis.items()):
            if op != "Z":
                tensor = _one_qubit(tensor, ROTATION[op], q)
        return tensor.reshape(-1)

    def operations(self, qubits: list[cirq.Qid]) -> list[cirq.Operation]:
        ops: list[cirq.Operation] = []
        for q, op in sorted(self.basis.items()):
            if op == "Y":
                ops += [cirq.S(qubits[q]) ** -1, cirq.H(qubits[q])]
            elif op == "X":
                ops.append(cirq.H(qubits[q]))
        return ops


@dataclass(frozen=True, eq=False)
class CliffordChange(BasisChange):
    """A Clifford circuit: ``gates`` are ("H" | "S" | "CNOT" | "CZ", qubits) in circuit order."""

    gates: tuple[tuple[str, tuple[int, ...]], ...]

    def apply(self, state: np.ndarray, n_qubits: int) -> np.ndarray:
        tensor = np.asarray(state, dtype=complex).reshape((2,) * n_qubits)
        for name, qubits in self.gates:
            if name in _ONE_QUBIT:
                tensor = _one_qubit(tensor, _ONE_QUBIT[name], qubits[0])
            else:
                tensor = _two_qubit(tensor, _CNOT if name == "CNOT" else _CZ, *qubits)
        return tensor.reshape(-1)

    def operations(self, qubits: list[cirq.Qid]) -> list[cirq.Operation]:
        gate = {"H": cirq.H, "S": cirq.S, "CNOT": cirq.CNOT, "CZ": cirq.CZ}
        return [gate[name](*(qubits[q] for q in where)) for name, where in self.gates]


@dataclass(frozen=True, eq=False)
class PauliRotationChange(BasisChange):
    """The product of exp(i·angle·P) over ``rotations`` = ((Pauli string, angle in radians), ...), first first."""

    rotations: tuple[tuple[tuple, float], ...]

    def apply(self, state: np.ndarray, n_qubits: int) -> np.ndarray:
        psi = np.asarray(state, dtype=complex).copy()
        index = np.arange(psi.size, dtype=np.int64)
        for string, angle in self.rotations:
            x = z = 0
            n_y = 0
            for q, op in string:
                bit = 1 << (n_qubits - 1 - q)
                if op in "XY":
                    x |= bit
                if op in "YZ":
                    z |= bit
                n_y += op == "Y"
            source = index ^ x
            parity = np.bitwise_count(source & z) & 1
            p_psi = (1j ** n_y) * np.where(parity, -1.0, 1.0) * psi[source]
            psi = np.cos(angle) * psi + 1j * np.sin(angle) * p_psi
        return psi

    def operations(self, qubits: list[cirq.Qid]) -> list[cirq.Operation]:
        from ..circuits.pauli_exponential import pauli_string_exponential
        from ..circuits.simplify import cancel_inverse_pairs

        ops: list[cirq.Operation] = []
        for string, angle in self.rotations:
            ops += pauli_string_exponential(string, angle, qubits)
        return cancel_inverse_pairs(ops)
