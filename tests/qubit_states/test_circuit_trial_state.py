"""CircuitTrialState: a user's own parametrised Cirq circuit, checked against the register."""

from __future__ import annotations

import cirq
import numpy as np
import pytest
import sympy

import groundkit as gk
from groundkit.circuits import state_of
from groundkit.errors import ComponentError, ParameterError
from groundkit.qubit_states import CircuitTrialState, QubitObjective, QubitTrialState
from tests.circuits.helpers import H2
from tests.outside_references import diatomic, pyscf_exact

a, b = sympy.symbols("a b")
Q = cirq.LineQubit.range(4)


def givens_like() -> cirq.Circuit:
    """|1100> (Jordan-Wigner H2 reference) turned by an XX-type rotation shared as a, 2a and b."""
    return cirq.Circuit([cirq.X(Q[0]), cirq.X(Q[1]), cirq.ry(a)(Q[0]), cirq.CNOT(Q[0], Q[2]),
                         cirq.XXPowGate(exponent=2 * a / np.pi + 0.1)(Q[1], Q[3]), cirq.rz(b)(Q[3])])


def test_energy_gradient_and_circuit_of_a_user_circuit():
    state = CircuitTrialState(givens_like(), symbols=["a", "b"], initial=[0.2, -0.1])
    pipeline = gk.Pipeline(H2).trial_state(state)
    objective = pipeline.objective()
    assert isinstance(objective, QubitObjective) and objective.parameter_labels == ("a", "b")
    theta = np.array([0.37, -0.8])
    psi = state_of(pipeline.circuit(theta), 4)  # cirq.Simulator
    assert abs(np.vdot(objective.state(theta), psi)) == pytest.approx(1.0, abs=1e-10)
    energy, gradient = objective.energy_and_gradient(theta)
    step = 1e-5
    central = [(objective.energy(theta + step * e) - objective.energy(theta - step * e)) / (2 * step)
               for e in np.eye(2)]
    assert np.allclose(gradient, central, atol=1e-6)
    assert np.allclose(objective.initial_parameters(), [0.2, -0.1])


def test_value_equality_and_caching():
    first, second = CircuitTrialState(givens_like()), CircuitTrialState(givens_like())
    assert first == second and hash(first) == hash(second)
    pipeline = gk.Pipeline(H2).trial_state(first)
    assert pipeline.objective() is gk.Pipeline(H2).trial_state(second).objective()


def test_more_qubits_than_the_hamiltonian_is_refused():
    circuit = cirq.Circuit(cirq.ry(a)(cirq.LineQubit(5)))
    pipeline = gk.Pipeline(H2).mapping(gk.QubitMapping("parity", taper=True)).trial_state(CircuitTrialState(circuit))
    with pytest.raises(ComponentError, match=r"acts on 6 qubits.*has 1 qubits"):
        pipeline.objective()
    with pytest.raises(ComponentError, match=r"acts on 6 qubits.*has 1 qubits"):
        pipeline.circuit([0.1])


def test_wrong_parameter_length_is_refused():
    objective = gk.Pipeline(H2).trial_state(CircuitTrialState(givens_like())).objective()
    with pytest.raises(ParameterError, match="expected 2 values"):
        objective.energy([0.1])
    with pytest.raises(ParameterError, match="expected 2 finite values"):
        CircuitTrialState(givens_like(), initial=[0.1, 0.2, 0.3])


class Opaque(cirq.Gate):
    """A parametrised one-qubit gate with no decomposition: its gradient is unknown."""

    def __init__(self, angle):
        self.angle = angle

    def _num_qubits_(self):
        return 1

    def _is_parameterized_(self):
        return cirq.is_parameterized(self.angle)

    def _parameter_names_(self):
        return cirq.parameter_names(self.angle)


def test_decomposable_parametrised_gates_are_differentiated():
    circuit = cirq.Circuit([cirq.X(Q[0]), cirq.X(Q[1]), cirq.givens(a)(Q[0], Q[2]),
                            cirq.PhasedXPowGate(phase_exponent=b, exponent=0.3)(Q[3]), cirq.CZPowGate(exponent=a)(
                                Q[2], Q[3])])
    pipeline = gk.Pipeline(H2).trial_state(CircuitTrialState(circuit))
    objective = pipeline.objective()
    theta = np.array([0.4, 0.25])
    assert abs(np.vdot(objective.state(theta), state_of(pipeline.circuit(theta), 4))) == pytest.approx(1, abs=1e-10)
    _, gradient = objective.energy_and_gradient(theta)
    step = 1e-5
    central = [(objective.energy(theta + step * e) - objective.energy(theta - step * e)) / (2 * step)
               for e in np.eye(2)]
    assert np.allclose(gradient, central, atol=1e-6)


@pytest.mark.parametrize(("circuit", "match"), [
    (cirq.Circuit(cirq.ry(a)(cirq.NamedQubit("x"))), "LineQubit"),
    (cirq.Circuit(Opaque(a).on(Q[0])), "nor decomposable"),
    (cirq.Circuit(cirq.ry(a)(Q[0]), cirq.measure(Q[1])), "no unitary"),
])
def test_unsupported_circuits_are_refused(circuit, match):
    with pytest.raises(ComponentError, match=match):
        gk.Pipeline(H2).trial_state(CircuitTrialState(circuit)).objective()


def test_symbols_must_cover_the_circuit():
    with pytest.raises(ComponentError, match=r"\['b'\]"):
        gk.Pipeline(H2).trial_state(CircuitTrialState(givens_like(), symbols=["a"])).objective()


def test_subclass_hook_builds_from_the_encoding():
    class Rotations(CircuitTrialState):
        def parametrised_circuit(self, encoding):
            qubits = cirq.LineQubit.range(encoding.n_qubits)
            flips = [cirq.X(q) for q, bit in zip(qubits, encoding.reference_bits) if bit]
            return cirq.Circuit(flips, [cirq.ry(sympy.Symbol(f"t{k}"))(q) for k, q in enumerate(qubits)])

    pipeline = gk.Pipeline(H2).mapping(gk.QubitMapping("bravyi-kitaev", taper=True)).trial_state(Rotations())
    result = pipeline.run()
    exact = pyscf_exact(diatomic("H", "H", 0.7414)).exact  # PySCF FCI of H2's geometry (reference library)
    assert result.energy == pytest.approx(exact, abs=1e-6)  # one qubit: a single Ry reaches the exact state


def test_not_a_trial_state_is_refused():
    with pytest.raises(ComponentError, match="QubitTrialState"):
        QubitObjective(gk.Pipeline(H2).encoding(), gk.UCCSD())
    assert issubclass(CircuitTrialState, QubitTrialState)
