"""Compact excitation circuits against dense matrix exponentials (SciPy; OpenFermion's Jordan–Wigner images), and
their CNOT counts against Yordanov, Arvidsson-Shukur and Barnes, Phys. Rev. A 102, 062612 (2020)."""

from __future__ import annotations

import cirq
import numpy as np
import pytest
import scipy.linalg
from openfermion import FermionOperator, get_sparse_operator, jordan_wigner

from groundkit.circuits.compact import jordan_wigner_excitation, jordan_wigner_sign, qubit_double, qubit_single
from groundkit.circuits.linear_network import encoding_network
from groundkit.circuits.steps import operations
from groundkit.errors import ComponentError
from groundkit.qubits.transforms import basis_matrix

LOWER = np.array([[0, 1], [0, 0]])  # Q = |0><1| on one qubit (|1> occupied)


def _unitary(steps, n):
    qubits = cirq.LineQubit.range(n)
    return cirq.unitary(cirq.Circuit([cirq.I(q) for q in qubits], operations(steps, qubits)))


def _on(n, ops: dict[int, np.ndarray]) -> np.ndarray:
    out = np.array([[1.0]])
    for q in range(n):
        out = np.kron(out, ops.get(q, np.eye(2)))
    return out


def _same_up_to_phase(u, v):
    return abs(abs(np.vdot(u.ravel(), v.ravel())) - u.shape[0]) < 1e-9


def _two_qubit(steps):
    return sum(1 for s in steps if len(s.qubits) == 2)


@pytest.mark.parametrize(("a", "c", "n"), [(0, 1, 2), (1, 0, 2), (0, 3, 4), (3, 1, 4)])
def test_qubit_single_is_the_exponential_and_has_two_cnots(a, c, n):
    theta = 0.731
    tau = _on(n, {c: LOWER.T}) @ _on(n, {a: LOWER})  # Q+_c Q_a
    exact = scipy.linalg.expm(theta * (tau - tau.T))
    steps = qubit_single(a, c, theta)
    assert _same_up_to_phase(_unitary(steps, n), exact)
    # Yordanov et al. (2020): a single qubit excitation in 2 CNOTs
    assert _two_qubit(steps) == 2


@pytest.mark.parametrize(("r", "p", "n"), [((0, 1), (2, 3), 4), ((2, 3), (0, 1), 4), ((0, 3), (1, 4), 5),
                                           ((4, 1), (0, 2), 5)])
def test_qubit_double_is_the_exponential(r, p, n):
    tau = _on(n, {p[0]: LOWER.T, p[1]: LOWER.T}) @ _on(n, {r[0]: LOWER, r[1]: LOWER})
    for theta in (-0.417, 0.05, 1.3, -2.9):
        exact = scipy.linalg.expm(theta * (tau - tau.T))
        steps = qubit_double(r, p, theta)
        assert _same_up_to_phase(_unitary(steps, n), exact)
        # Yordanov, Arvidsson-Shukur and Barnes, PRA 102, 062612 (2020): 13 CNOTs for the double qubit excitation
        assert _two_qubit(steps) == 13


def _fermionic_exponential(creators, annihilators, theta, n):
    term = tuple((q, 1) for q in creators) + tuple((q, 0) for q in annihilators)
    adjoint = tuple((q, 1) for q in reversed(annihilators)) + tuple((q, 0) for q in reversed(creators))
    generator = jordan_wigner(FermionOperator(term) - FermionOperator(adjoint))  # OpenFermion
    return scipy.linalg.expm(theta * get_sparse_operator(generator, n_qubits=n).toarray())


SINGLES = [((1,), (0,)), ((0,), (1,)), ((3,), (0,)), ((0,), (4,)), ((5,), (2,))]
DOUBLES = [((2, 3), (0, 1)), ((0, 1), (2, 3)), ((4, 5), (0, 1)), ((5, 2), (0, 3)), ((2, 5), (3, 0)),
           ((3, 4), (1, 5)), ((1, 4), (0, 5)), ((0, 2), (4, 1))]


@pytest.mark.parametrize(("creators", "annihilators"), SINGLES + DOUBLES)
def test_jordan_wigner_excitation_is_the_exponential(creators, annihilators):
    n = max(creators + annihilators) + 1
    _, crossed = jordan_wigner_sign(creators, annihilators)
    for theta in (0.613, -1.7, 2.4):
        steps = jordan_wigner_excitation(creators, annihilators, theta)
        assert _same_up_to_phase(_unitary(steps, n), _fermionic_exponential(creators, annihilators, theta, n))
        # parity: one two-qubit gate per crossed spin orbital on each side of the qubit excitation
        assert _two_qubit(steps) == (2 if len(creators) == 1 else 13) + 2 * len(crossed)


def test_adjacent_excitations_need_no_parity():
    # four adjacent spin orbitals: no Jordan-Wigner string crosses a spin orbital outside the excitation
    assert jordan_wigner_sign((2, 3), (0, 1))[1] == ()
    assert _two_qubit(jordan_wigner_excitation((2, 3), (0, 1), 0.2)) == 13  # published 13 (Yordanov et al. 2020)
    assert _two_qubit(jordan_wigner_excitation((1,), (0,), 0.2)) == 2  # published 2 (Yordanov et al.)


def test_higher_ranks_have_no_compact_form():
    assert jordan_wigner_excitation((3, 4, 5), (0, 1, 2), 0.1) is None


@pytest.mark.parametrize("name", ["parity", "bravyi-kitaev", "jordan-wigner"])
@pytest.mark.parametrize("n", [4, 8, 14])
def test_encoding_network_applies_the_matrix(name, n):
    matrix = basis_matrix(name, n)
    network = encoding_network(matrix)
    rng = np.random.default_rng(n)
    for _ in range(20):
        bits = rng.integers(0, 2, n)
        out = bits.copy()
        for control, target in network:
            out[target] ^= out[control]
        assert np.array_equal(out, matrix @ bits % 2)
    if name == "parity":
        assert len(network) == n - 1  # b_k = n_0 + ... + n_k: a CNOT ladder
    if name == "jordan-wigner":
        assert network == []


def test_singular_matrix_is_refused():
    with pytest.raises(ComponentError, match="singular"):
        encoding_network(np.array([[1, 1], [1, 1]]))


def test_adjacent_double_keeps_thirteen_cnots_after_cirq_optimisation():
    from groundkit.circuits.optimise import optimise_circuit

    qubits = cirq.LineQubit.range(4)
    for steps in (qubit_double((0, 1), (2, 3), 0.37), jordan_wigner_excitation((2, 3), (0, 1), 0.37)):
        circuit = optimise_circuit(cirq.Circuit(operations(steps, qubits)))
        # Yordanov, Arvidsson-Shukur and Barnes, PRA 102, 062612 (2020): 13 CNOTs on four adjacent qubits
        assert sum(1 for op in circuit.all_operations() if cirq.num_qubits(op) == 2) == 13
        assert _same_up_to_phase(cirq.unitary(circuit), _unitary(steps, 4))
