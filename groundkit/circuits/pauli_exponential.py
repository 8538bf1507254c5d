"""exp(i·angle·P) for a Pauli string P as a circuit: basis change, CNOT ladder, Rz, and the undo.

A Pauli string is a sorted tuple of ``(qubit, "X" | "Y" | "Z")``, OpenFermion's ``QubitOperator`` term form.
Each X is rotated to Z by H and each Y by Rx(π/2) (Rx(π/2) Y Rx(−π/2) = Z); a CNOT ladder over the string's
qubits collects their parity on the last one, where Rz(−2·angle) = exp(i·angle·Z) acts; then everything is undone.
The gates used (H, Rx, Rz, CNOT) all export to OpenQASM 2.0. This is the "ladder" construction of excitations,
kept for comparison and for registers where no compact construction applies (see ``compact.py``).
"""

from __future__ import annotations

from collections.abc import Sequence

import cirq
import numpy as np

from .steps import Step, cnot, one

PauliString = tuple[tuple[int, str], ...]


def _to_z(op: str, qubit: cirq.Qid) -> list[cirq.Operation]:
    if op == "X":
        return [cirq.H(qubit)]
    if op == "Y":
        return [cirq.rx(np.pi / 2)(qubit)]
    if op == "Z":
        return []
    raise ValueError(f"Pauli letter {op!r} is not one of 'X', 'Y', 'Z'")


def _from_z(op: str, qubit: cirq.Qid) -> list[cirq.Operation]:
    if op == "X":
        return [cirq.H(qubit)]
    if op == "Y":
        return [cirq.rx(-np.pi / 2)(qubit)]
    return []


def pauli_string_exponential(term: PauliString, angle: float, qubits: Sequence[cirq.Qid]) -> list[cirq.Operation]:
    """Operations (in time order) implementing exp(i·angle·P) exactly, ``angle`` in radians.

    ``qubits[k]`` is the circuit qubit of Hamiltonian qubit k. The identity string gives no operations (a global
    phase exp(i·angle) is dropped).
    """
    term = tuple(sorted(term))
    if not term:
        return []
    targets = [qubits[q] for q, _ in term]
    before = [g for (_, op), qubit in zip(term, targets) for g in _to_z(op, qubit)]
    after = [g for (_, op), qubit in zip(term, targets) for g in _from_z(op, qubit)]
    ladder = [cirq.CNOT(a, b) for a, b in zip(targets, targets[1:])]
    return before + ladder + [cirq.rz(-2.0 * float(angle))(targets[-1])] + ladder[::-1] + after


def pauli_exponential_steps(term: PauliString, angle: float, variable: bool = True) -> list[Step]:
    """The gate list of exp(i·angle·P) (time order, register qubits), as :func:`pauli_string_exponential`."""
    term = tuple(sorted(term))
    if not term:
        return []
    before = [one("h", q) if op == "X" else one("rx", q, np.pi / 2) for q, op in term if op != "Z"]
    after = [one("h", q) if op == "X" else one("rx", q, -np.pi / 2) for q, op in term if op != "Z"]
    for _, op in term:
        if op not in "XYZ":
            raise ValueError(f"Pauli letter {op!r} is not one of 'X', 'Y', 'Z'")
    targets = [q for q, _ in term]
    ladder = [cnot(a, b) for a, b in zip(targets, targets[1:])]
    return before + ladder + [one("rz", targets[-1], -2.0 * angle, variable)] + ladder[::-1] + after
