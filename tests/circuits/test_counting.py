"""Every trial-state kind under every mapping, tapered or not: the compact circuit prepares the engine's state
(Cirq's simulator and OpenFermion's sparse Hamiltonian as independent references), and the resources counted from
the gate list equal those of the built, Cirq-optimised circuit (``circuit_resources``)."""

from __future__ import annotations

import cirq
import numpy as np
import pytest
import sympy
from openfermion import get_sparse_operator

import groundkit as gk
from groundkit.adaptive.qubit_pool import generator_strings
from groundkit.circuits import CONSTRUCTIONS, circuit_resources, state_of, trial_resources
from groundkit.errors import ComponentError
from tests.circuits.helpers import H2, MAPPINGS, lih_pipeline, random_angles


class TwoQubitRotation(gk.CircuitTrialState):
    """A user's circuit that follows the register: reference bits, a Givens-type block, rotations."""

    def parametrised_circuit(self, encoding):
        q = cirq.LineQubit.range(encoding.n_qubits)
        a, b = sympy.symbols("a b")
        ops = [cirq.X(q[k]) for k, bit in enumerate(encoding.reference_bits) if bit] + [cirq.ry(a)(q[0])]
        if len(q) > 1:
            ops += [cirq.CNOT(q[0], q[1]), cirq.rz(b)(q[1]), cirq.CNOT(q[0], q[1]), cirq.H(q[1]), cirq.H(q[1])]
        else:
            ops += [cirq.rz(b)(q[0])]
        return cirq.Circuit(ops)


def _pauli_rotations(pipeline):
    encoding = pipeline.encoding()
    strings = generator_strings(encoding, gk.UCCSD().plan(pipeline.problem()).excitations)
    return gk.PauliRotations(list(strings[:6]))


KINDS = {
    "uccsd": lambda p: gk.UCCSD(),
    "pair-doubles": lambda p: gk.PairDoubles(),
    "upccgsd": lambda p: gk.UpCCGSD(k=2),
    "reference": lambda p: gk.ReferenceDeterminant(),
    "excitation-list": lambda p: gk.ExcitationList([((2,), (0,)), ((3,), (1,)), ((2, 3), (0, 1))]),
    "hardware-efficient": lambda p: gk.HardwareEfficient(layers=1),
    "pauli-rotations": _pauli_rotations,
    "circuit": lambda p: TwoQubitRotation(),
}
MOLECULES = {"H2": lambda: gk.Pipeline(H2), "LiH": lih_pipeline}
CASES = [pytest.param(molecule, name, taper, kind, id=f"{molecule}-{name}-{'tapered' if taper else 'full'}-{kind}")
         for molecule in MOLECULES for name in MAPPINGS for taper in (False, True) for kind in KINDS
         if molecule == "H2" or kind in ("uccsd", "upccgsd", "hardware-efficient", "pauli-rotations")]


def _pipeline(molecule, name, taper, kind):
    base = MOLECULES[molecule]().mapping(gk.QubitMapping(name, taper=taper))
    return base.trial_state(KINDS[kind](base))


@pytest.mark.parametrize(("molecule", "name", "taper", "kind"), CASES)
def test_circuit_state_energy_and_counts(molecule, name, taper, kind):
    pipeline = _pipeline(molecule, name, taper, kind)
    objective = pipeline.objective()
    encoding = pipeline.encoding()
    n = encoding.n_qubits
    hamiltonian = get_sparse_operator(pipeline.qubit_hamiltonian(), n_qubits=n)  # OpenFermion
    theta = random_angles(objective.n_parameters, 11)
    engine = np.asarray(objective.state(theta))
    if not isinstance(objective, gk.QubitObjective):  # the determinant engine's CI vector, embedded
        engine = encoding.embed(engine)
    for construction in CONSTRUCTIONS:
        circuit = pipeline.circuit(theta, construction=construction)
        psi = state_of(circuit, n)  # cirq.Simulator, complex128
        assert abs(np.vdot(engine, psi)) >= 1 - 1e-10
        assert np.vdot(psi, hamiltonian @ psi).real == pytest.approx(objective.energy(theta), abs=1e-9)
        # counted from the gate list, without building Cirq objects, equal to the built circuit's counts
        assert trial_resources(pipeline, theta, construction=construction) == circuit_resources(circuit)


def test_compact_is_the_default_and_cheaper_under_jordan_wigner():
    pipeline = lih_pipeline()  # UCCSD, Jordan-Wigner
    theta = random_angles(pipeline.objective().n_parameters, 2)
    compact = trial_resources(pipeline, theta)
    ladder = trial_resources(pipeline, theta, construction="ladder")
    assert compact == trial_resources(pipeline, theta, construction="compact")
    assert compact == circuit_resources(pipeline.circuit(theta))
    assert ladder["two_qubit_gates"] >= 2.5 * compact["two_qubit_gates"]


def test_run_resources_are_the_circuits_counts():
    pipeline = gk.Pipeline(H2).mapping("parity")
    result = pipeline.run()
    # H2's singles end at zero by symmetry, where Cirq drops their rotations: resources count the circuit at
    # generic parameters, as built at random ones
    counts = circuit_resources(pipeline.circuit(random_angles(3, 5)))
    assert (result.resources.two_qubit_gates, result.resources.depth) == (counts["two_qubit_gates"],
                                                                          counts["depth"])
    assert result.resources.qubits == 4 and result.resources.parameters == 3


def test_unknown_construction_is_refused():
    with pytest.raises(ComponentError, match="construction 'ladders' is not one of 'compact', 'ladder'"):
        gk.Pipeline(H2).circuit(construction="ladders")
    with pytest.raises(ComponentError, match="construction"):
        trial_resources(gk.Pipeline(H2), construction="")
