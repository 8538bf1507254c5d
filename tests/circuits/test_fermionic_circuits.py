"""Circuits of fermionic trial states prepare the engine's states: Cirq's simulator and OpenFermion's sparse
Hamiltonian (independent reference libraries) against the determinant engine, every mapping, tapered or not."""

from __future__ import annotations

import cirq
import numpy as np
import pytest
from openfermion import get_sparse_operator

import groundkit as gk
from groundkit.circuits import circuit_from_openqasm, circuit_resources, fermionic_circuit, openqasm_text, state_of
from groundkit.errors import ComponentError, ParameterError, SymmetryError
from tests.circuits.helpers import H2, MAPPINGS, lih_pipeline, random_angles, sector_keeping

EXPORTABLE = (cirq.XPowGate, cirq.HPowGate, cirq.CXPowGate, cirq.IdentityGate)


CASES = [pytest.param(make, name, taper, id=f"{molecule}-{name}-{'tapered' if taper else 'full'}")
         for molecule, make in (("H2", lambda: gk.Pipeline(H2)), ("LiH", lih_pipeline))
         for name in MAPPINGS for taper in (False, True)]


@pytest.mark.parametrize(("make", "name", "taper"), CASES)
def test_circuit_energy_and_state_match_the_engine(make, name, taper):
    pipeline = make().mapping(gk.QubitMapping(name, taper=taper))  # UCCSD; tapered: its conserving excitations
    objective = pipeline.objective()
    assert objective.n_parameters >= 1
    encoding = pipeline.encoding()
    n = encoding.n_qubits
    hamiltonian = get_sparse_operator(pipeline.qubit_hamiltonian(), n_qubits=n)  # OpenFermion
    for seed in (1, 2):
        theta = random_angles(objective.n_parameters, seed)
        circuit = pipeline.circuit(theta).circuit
        assert sorted(circuit.all_qubits()) == cirq.LineQubit.range(n)
        psi = state_of(circuit, n)  # cirq.Simulator, complex128
        assert np.vdot(psi, hamiltonian @ psi).real == pytest.approx(objective.energy(theta), abs=1e-8)
        # the circuit's state is the embedded engine state up to a global phase
        assert abs(np.vdot(encoding.embed(objective.state(theta)), psi)) == pytest.approx(1.0, abs=1e-8)
    # OpenQASM 2.0 export parses back (Cirq's importer) to the same state up to a global phase
    text = openqasm_text(circuit)
    assert text.lstrip().startswith("// groundkit") and "OPENQASM 2.0;" in text
    assert abs(np.vdot(state_of(circuit_from_openqasm(text), n), psi)) == pytest.approx(1.0, abs=1e-8)


def test_gate_set_and_counts_do_not_depend_on_the_angles():
    pipeline = gk.Pipeline(H2).mapping("bravyi-kitaev")
    n = pipeline.objective().n_parameters
    first, second = pipeline.circuit(random_angles(n, 3)).circuit, pipeline.circuit(random_angles(n, 4)).circuit
    assert circuit_resources(first) == circuit_resources(second)
    # at zero angles Cirq drops rotations that became the identity: the depth may shrink, two-qubit gates stay
    zero = circuit_resources(pipeline.circuit(np.zeros(n)))
    assert zero["two_qubit_gates"] == circuit_resources(first)["two_qubit_gates"]
    assert zero["depth"] <= circuit_resources(first)["depth"]
    for op in first.all_operations():  # after Cirq's merging: one PhasedXZ gate per single-qubit run
        assert isinstance(op.gate, EXPORTABLE + (cirq.PhasedXZGate, cirq.CZPowGate)), op


def test_default_angles_are_the_initial_parameters():
    pipeline = gk.Pipeline(H2).trial_state(gk.UCCSD(init="mp2"))
    theta = pipeline.objective().initial_parameters()
    assert cirq.approx_eq(pipeline.circuit().circuit, pipeline.circuit(theta).circuit)


def test_hartree_fock_circuit_is_the_reference_bits():
    pipeline = gk.Pipeline(H2).mapping(gk.QubitMapping("parity", taper=True)).trial_state(gk.ReferenceDeterminant())
    bits = pipeline.encoding().reference_bits
    ops = list(pipeline.circuit().circuit.all_operations())
    assert {op.qubits[0].x for op in ops if op.gate == cirq.X} == {q for q, b in enumerate(bits) if b}


def test_symmetry_breaking_excitation_on_a_tapered_register_is_refused():
    # H2's single 0a -> 1a changes the g/u symmetry that tapering fixed: the pipeline drops it, the compiler refuses it
    pipeline = gk.Pipeline(H2).mapping(gk.QubitMapping("jordan-wigner", taper=True)).trial_state(
        gk.ExcitationList([((2,), (0,))]))
    assert pipeline.objective().n_parameters == 0
    assert [op.gate for op in pipeline.circuit().circuit.all_operations()] in ([cirq.X], [cirq.I])
    plan = pipeline.components["trial_state"].plan(pipeline.problem())
    with pytest.raises(SymmetryError, match="leaves the tapered symmetry sector"):
        fermionic_circuit(pipeline.encoding(), plan, [0.1])


def test_tapered_circuit_uses_the_objectives_excitations():
    pipeline = lih_pipeline().mapping(gk.QubitMapping("bravyi-kitaev", taper=True))
    assert pipeline.objective().plan.excitations == sector_keeping(pipeline).excitations_given


def test_wrong_parameter_length_is_refused():
    pipeline = gk.Pipeline(H2)
    with pytest.raises(ParameterError, match="expected 3 values"):
        pipeline.circuit([0.1, 0.2])
    with pytest.raises(ParameterError, match="finite"):
        pipeline.circuit([0.1, np.nan, 0.2])


def test_trial_circuit_source_is_checked():
    from groundkit.circuits import trial_circuit

    with pytest.raises(ComponentError, match="Pipeline or"):
        trial_circuit("H2")


@pytest.mark.parametrize("name", MAPPINGS)
def test_water_uccsd_circuit_matches_the_engine(name, h2o):
    pipeline = gk.Pipeline(h2o).active_space(electrons=4, orbitals=4).mapping(name)
    objective = pipeline.objective()
    n = pipeline.encoding().n_qubits
    theta = random_angles(objective.n_parameters, 5)
    psi = state_of(pipeline.circuit(theta), n)  # cirq.Simulator
    hamiltonian = get_sparse_operator(pipeline.qubit_hamiltonian(), n_qubits=n)  # OpenFermion
    assert np.vdot(psi, hamiltonian @ psi).real == pytest.approx(objective.energy(theta), abs=1e-8)
