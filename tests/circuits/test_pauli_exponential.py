"""Pauli-string exponentials and the peephole pass, against dense matrix exponentials (SciPy, OpenFermion)."""

from __future__ import annotations

import cirq
import numpy as np
import pytest
import scipy.linalg
from openfermion import QubitOperator, get_sparse_operator

from groundkit.circuits import cancel_inverse_pairs, circuit_resources, pauli_string_exponential

QUBITS = cirq.LineQubit.range(4)


def _unitary(operations: list[cirq.Operation]) -> np.ndarray:
    circuit = cirq.Circuit([cirq.I(q) for q in QUBITS], operations)
    return cirq.unitary(circuit)


@pytest.mark.parametrize("term", [((0, "X"),), ((1, "Y"),), ((2, "Z"),), ((0, "X"), (3, "Y")),
                                  ((0, "Y"), (1, "Z"), (2, "X"), (3, "Y")), ((1, "Z"), (3, "Z"))])
def test_exponential_matches_dense_expm(term):
    angle = 0.731
    expected = scipy.linalg.expm(1j * angle * get_sparse_operator(QubitOperator(term), n_qubits=4).toarray())
    assert np.allclose(_unitary(pauli_string_exponential(term, angle, QUBITS)), expected, atol=1e-12)


def test_identity_string_gives_no_gates():
    assert pauli_string_exponential((), 0.3, QUBITS) == []


def test_ladder_uses_two_cnots_per_extra_qubit():
    ops = pauli_string_exponential(((0, "X"), (1, "Y"), (3, "Z")), 0.2, QUBITS)
    assert circuit_resources(cirq.Circuit(ops))["two_qubit_gates"] == 4


def test_cancellation_keeps_the_unitary_and_removes_pairs():
    a, b = ((0, "X"), (1, "X"), (2, "Y")), ((0, "X"), (1, "X"), (2, "X"))
    ops = pauli_string_exponential(a, 0.4, QUBITS) + pauli_string_exponential(b, -0.9, QUBITS)
    reduced = cancel_inverse_pairs(ops)
    assert len(reduced) < len(ops)
    assert np.allclose(_unitary(reduced), _unitary(ops), atol=1e-12)
    # the basis change of the shared prefix X0 X1 and then its CNOT cancel between the two exponentials: 8 -> 6
    assert circuit_resources(cirq.Circuit(reduced))["two_qubit_gates"] == 6


def test_resources_count_two_qubit_gates_and_pack_moments():
    q = QUBITS
    circuit = cirq.Circuit([cirq.I(q[3]), cirq.H(q[0]), cirq.H(q[1]), cirq.CNOT(q[0], q[1]), cirq.CZ(q[1], q[2]),
                            cirq.rz(0.1)(q[0])])
    assert circuit_resources(circuit) == {"two_qubit_gates": 2, "depth": 3}
