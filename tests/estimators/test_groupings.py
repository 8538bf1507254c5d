"""Every grouping on every mapping (tapered too): commuting groups, circuits that diagonalise them, exact sums."""

import warnings

import cirq
import numpy as np
import pytest
from openfermion import QubitOperator, get_sparse_operator

import groundkit as gk
from groundkit.errors import SymmetryError
from groundkit.estimators import SampledEstimator, grouping_names, groups_for
from groundkit.estimators.groups import group_moments, measurement_groups
from groundkit.estimators.measurement_circuits import group_circuit, measurement_cost

from ..conftest import diatomic

MAPPINGS = [(m, t) for m in ("jordan-wigner", "bravyi-kitaev", "parity") for t in (False, True)]
_PAULI = {"X": cirq.X, "Y": cirq.Y, "Z": cirq.Z}


@pytest.fixture(scope="module")
def lih_space():
    return diatomic("Li", "H", 1.5949).pipeline().active_space(electrons=2, orbitals=4)  # 8 qubits


def _setting(base, mapping, taper):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        pipeline = base.mapping(mapping, taper=taper)
        objective, encoding = pipeline.objective(), pipeline.encoding()
    theta = np.random.default_rng(3).normal(scale=0.2, size=objective.n_parameters)
    return pipeline, objective, encoding, theta


def _groups(encoding, grouping):
    try:
        return groups_for(encoding, grouping)
    except SymmetryError as exc:  # only a basis rotation mixing symmetries on a tapered register may refuse
        assert grouping == "basis-rotation" and encoding.taper is not None
        assert "taper=False" in str(exc)
        return None


@pytest.mark.parametrize("mapping, taper", MAPPINGS)
def test_groups_commute_are_diagonalised_and_sum_to_the_energy(lih_space, mapping, taper):
    _, objective, encoding, theta = _setting(lih_space, mapping, taper)
    n = encoding.n_qubits
    qubits = cirq.LineQubit.range(n)
    state = objective.register_state(theta, encoding)
    for grouping in grouping_names():
        found = _groups(encoding, grouping)
        if found is None:
            continue
        constant, groups = found
        covered = [t for g in groups for t in g.terms]
        overlapped = grouping.endswith("-overlap")  # a term in several groups, its coefficient split
        shares: dict = {}
        if overlapped:
            assert set(covered) == {t for t in encoding.hamiltonian.terms if t}
        elif grouping != "basis-rotation":  # Pauli groupings cover each term once
            assert sorted(covered) == sorted(t for t in encoding.hamiltonian.terms if t)
        for group in groups:
            for a in group.terms:  # commutation in the group's sense (symplectic form; Cirq's algebra)
                pa = cirq.PauliString({qubits[q]: _PAULI[o] for q, o in a})
                for b in group.terms:
                    pb = cirq.PauliString({qubits[q]: _PAULI[o] for q, o in b})
                    assert cirq.commutes(pa, pb)
                    if grouping.startswith("qwc"):
                        assert all(dict(a).get(q, o) == o for q, o in b)
            circuit = group_circuit(group, n)
            inverse = cirq.inverse(list(circuit.all_operations()))
            for term, c, mask in zip(group.terms, group.coefficients, group.masks):
                # Cirq's Pauli-string conjugation: C P C^dagger is the measured signed Z string
                after = cirq.PauliString({qubits[q]: _PAULI[o] for q, o in term}).conjugated_by(inverse)
                assert all(p == cirq.Z for p in after.values())
                assert sum(1 << (n - 1 - q.x) for q in after.keys()) == mask
                share = c / (np.real(after.coefficient) * np.real(encoding.hamiltonian.terms[term]))
                if overlapped:
                    assert 0 < share <= 1 + 1e-12
                    shares[term] = shares.get(term, 0.0) + share
                else:
                    assert share == pytest.approx(1.0, abs=1e-12 / abs(encoding.hamiltonian.terms[term]))
        if overlapped:  # the shares of every term sum to one: the groups sum to the Hamiltonian
            assert max(abs(v - 1) for v in shares.values()) < 1e-12
        total = constant + sum(group_moments(state, g, n)[0] for g in groups)
        assert total == pytest.approx(objective.energy(theta), abs=1e-10)  # the engine's energy


@pytest.mark.parametrize("mapping", ["jordan-wigner", "bravyi-kitaev", "parity"])
def test_basis_rotation_circuit_rotates_like_the_simulation(lih_space, mapping):
    # each group's Cirq circuit (Givens networks as Pauli exponentials) gives the probabilities the estimator uses
    _, objective, encoding, theta = _setting(lih_space, mapping, False)
    state = objective.register_state(theta, encoding)
    qubits = cirq.LineQubit.range(encoding.n_qubits)
    _, groups = groups_for(encoding, "basis-rotation")
    for group in groups:
        after = cirq.final_state_vector(group_circuit(group, encoding.n_qubits), initial_state=state,
                                        qubit_order=qubits, dtype=np.complex128)
        assert np.abs(after) ** 2 == pytest.approx(group.probabilities(state, encoding.n_qubits), abs=1e-6)


def test_basis_rotation_groups_are_the_hamiltonian_in_dense_matrices():
    # H2: sum over groups of U^dagger D U (dense matrices of the circuits) equals the qubit Hamiltonian
    pipeline = diatomic("H", "H", 0.7414).pipeline()
    encoding = pipeline.encoding()
    n = encoding.n_qubits
    constant, groups = groups_for(encoding, "basis-rotation")
    total = constant * np.eye(2 ** n, dtype=complex)
    for group in groups:
        u = cirq.unitary(group_circuit(group, n)) if len(group_circuit(group, n)) else np.eye(2 ** n)
        diagonal = QubitOperator()
        for c, mask in zip(group.coefficients, group.masks):
            diagonal += QubitOperator(tuple((q, "Z") for q in range(n) if mask >> (n - 1 - q) & 1), c)
        d = get_sparse_operator(diagonal, n_qubits=n).toarray() if diagonal.terms else np.zeros((2 ** n,) * 2)
        total += u.conj().T @ d @ u
    h = encoding.sparse_hamiltonian().toarray()
    number = get_sparse_operator(encoding.number_operator(), n_qubits=n).toarray()
    two = np.diag(np.isclose(np.real(np.diag(number)), 2))  # the factorisation is exact on every particle number;
    assert np.abs(total - h).max() < 1e-9  # compare everywhere
    assert two.any()


def test_measurement_costs(lih_space):
    encoding = lih_space.encoding()
    qwc = measurement_cost(encoding, "qwc")
    commuting = measurement_cost(encoding, "commuting")
    assert qwc.worst == 0 and qwc.mean == 0.0  # single-qubit rotations only
    assert commuting.groups < qwc.groups and commuting.worst > 0
    result = lih_space.estimator(SampledEstimator(shots=20_000, grouping="commuting", seed=1)).minimiser(
        gk.COBYLA(max_iterations=3)).run()
    assert result.resources.measurement_groups == commuting.groups
    assert result.resources.measurement_two_qubit_gates_worst == commuting.worst
    assert result.resources.measurement_two_qubit_gates_mean == pytest.approx(commuting.mean)


# bad input ------------------------------------------------------------------------------------------------------
def test_unknown_grouping_lists_the_accepted_ones(lih_space):
    with pytest.raises(gk.ComponentError, match="accepted names: qwc, qwc-term-order, commuting, none, basis-rotation"):
        lih_space.shot_budget(grouping="psychic")
    with pytest.raises(gk.ComponentError, match="grouping must be one of the grouping names 'qwc'"):
        SampledEstimator(grouping="psychic")


def test_basis_rotation_refuses_a_qubit_only_hamiltonian():
    hamiltonian = QubitOperator("Z0 Z1", 0.5) + QubitOperator("X0 X1", 0.2)
    with pytest.raises(gk.ComponentError, match="needs the molecule's integrals"):
        measurement_groups(hamiltonian, 2, "basis-rotation")
    assert len(measurement_groups(hamiltonian, 2, "commuting")[1]) == 1
