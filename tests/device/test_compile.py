"""Routed native circuits against the engine: every trial-state kind, mapping (tapered too) and device kind.

For each case the routed circuit is simulated with Cirq's simulator (reference library), the final placement is
undone, and the state is compared with the engine's (overlap ≥ 1 − 1e-10) and its energy under the qubit
Hamiltonian (OpenFermion's sparse operator, reference library) with the engine's (1e-9 Ha). Every two-qubit gate
must act on an edge of the device graph and every gate must be native (PhasedXZ plus the device's one two-qubit
gate). The matrix is a covering design: each trial-state kind meets a different mapping and device, and each
mapping, device kind and native gate appears at least once.
"""

from __future__ import annotations

import cirq
import networkx as nx
import numpy as np
import pytest
import sympy
from openfermion import get_sparse_operator

import groundkit as gk
from groundkit.adaptive import grown_trial_state
from groundkit.device import DeviceProfile, compile_for_device

H2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414)), basis="sto-3g")  # NIST r_e
LIH = gk.MoleculeSpec(symbols=("Li", "H"), coordinates=((0, 0, 0), (0, 0, 1.5949)), basis="sto-3g")  # NIST r_e

DEVICES = {
    "line": DeviceProfile(name="t-line", connectivity="line", size=8, native_gate="cnot"),
    "ring": DeviceProfile(name="t-ring", connectivity="ring", size=7, native_gate="cz"),
    "grid": DeviceProfile(name="t-grid", connectivity="grid", size=(3, 3), native_gate="cz"),
    "grid-iswap": DeviceProfile(name="t-grid-iswap", connectivity="grid", size=(2, 3), native_gate="sqrt-iswap"),
    "heavy-hex": DeviceProfile(name="t-hh", connectivity="heavy-hex", size=(1, 1), native_gate="cnot"),
    "graph": DeviceProfile.from_graph(nx.star_graph(6), name="t-star", native_gate="cz"),  # hub 0 and 6 leaves
    "all-to-all": DeviceProfile(name="t-all", connectivity="all-to-all", size=6, native_gate="sqrt-iswap"),
}

theta_symbol, phi_symbol = sympy.symbols("theta phi")
USER_CIRCUIT = cirq.Circuit([
    cirq.X(cirq.LineQubit(0)), cirq.X(cirq.LineQubit(1)), cirq.ry(theta_symbol).on(cirq.LineQubit(1)),
    cirq.CNOT(cirq.LineQubit(1), cirq.LineQubit(3)), cirq.rz(phi_symbol).on(cirq.LineQubit(3)),
    cirq.CZ(cirq.LineQubit(0), cirq.LineQubit(2)),
])

# (trial-state kind, molecule, active space, mapping, device)
CASES = [
    ("uccsd", LIH, (2, 3), gk.QubitMapping("jordan-wigner"), "line"),
    ("uccsd", LIH, (2, 3), gk.QubitMapping("parity", taper=True), "grid-iswap"),
    ("upccgsd", LIH, (2, 3), gk.QubitMapping("bravyi-kitaev"), "heavy-hex"),
    ("pair-doubles", LIH, (2, 3), gk.QubitMapping("parity"), "ring"),
    ("excitation-list", H2, None, gk.QubitMapping("jordan-wigner", taper=True), "graph"),
    ("reference", LIH, (2, 3), gk.QubitMapping("bravyi-kitaev", taper=True), "grid"),
    ("hardware-efficient", H2, None, gk.QubitMapping("parity"), "grid"),
    ("user-circuit", H2, None, gk.QubitMapping("jordan-wigner"), "ring"),
    ("adaptive", H2, None, gk.QubitMapping("bravyi-kitaev"), "all-to-all"),
    ("uccsd", H2, None, gk.QubitMapping("jordan-wigner"), "line"),
]


def trial_state(kind: str, pipeline: gk.Pipeline):
    if kind == "uccsd":
        return gk.UCCSD()
    if kind == "upccgsd":
        return gk.UpCCGSD(k=2)
    if kind == "pair-doubles":
        return gk.PairDoubles()
    if kind == "excitation-list":
        return gk.ExcitationList([((2, 3), (0, 1)), ((2,), (0,))])
    if kind == "reference":
        return gk.ReferenceDeterminant()
    if kind == "hardware-efficient":
        return gk.HardwareEfficient(layers=2)
    if kind == "user-circuit":
        return gk.CircuitTrialState(USER_CIRCUIT)
    if kind == "adaptive":
        return grown_trial_state(pipeline.trial_state(gk.Adaptive(max_operators=3)).run())
    raise AssertionError(kind)


def native_gate_of(profile: DeviceProfile) -> cirq.Gate:
    return {"cnot": cirq.CNOT, "cz": cirq.CZ, "sqrt-iswap": cirq.SQRT_ISWAP}[profile.native_gate]


@pytest.mark.parametrize("kind, molecule, space, mapping, device", CASES,
                         ids=[f"{c[0]}-{c[3].name if hasattr(c[3], 'name') else c[3]}-{c[4]}" for c in CASES])
def test_routed_native_circuit_prepares_the_engine_state(kind, molecule, space, mapping, device):
    pipeline = gk.Pipeline(molecule).mapping(mapping)
    if space is not None:
        pipeline = pipeline.active_space(electrons=space[0], orbitals=space[1])
    pipeline = pipeline.trial_state(trial_state(kind, pipeline))
    profile = DEVICES[device]
    objective = pipeline.objective()
    encoding = pipeline.encoding()
    n = encoding.n_qubits
    theta = np.random.default_rng(7).uniform(-np.pi, np.pi, objective.n_parameters)
    compiled = pipeline.device(profile).circuit(theta)
    assert compiled.device is profile and compiled.n_qubits == n
    # Cirq's simulator (reference library), the final placement undone
    psi = compiled.logical_state()
    engine = objective.register_state(theta, encoding)
    assert abs(np.vdot(engine, psi)) >= 1 - 1e-10
    hamiltonian = get_sparse_operator(pipeline.qubit_hamiltonian(), n_qubits=n)  # OpenFermion
    assert np.vdot(psi, hamiltonian @ psi).real == pytest.approx(objective.energy(theta), abs=1e-9)
    # every two-qubit gate on a coupled pair; every gate native
    graph = profile.graph
    allowed = (native_gate_of(profile),)
    for op in compiled.circuit.all_operations():
        if len(op.qubits) == 2:
            a, b = (q.x for q in op.qubits)
            assert graph.has_edge(a, b), op
            assert op.gate in allowed, op
        else:
            assert isinstance(op.gate, (cirq.PhasedXZGate, cirq.GlobalPhaseGate)), op
    assert not any(cirq.is_measurement(op) for op in compiled.circuit.all_operations())
    # placements: distinct device qubits, a permutation of the register's homes
    assert sorted(compiled.initial_placement) == list(range(n)) == sorted(compiled.final_placement)
    assert len(set(compiled.initial_placement.values())) == n == len(set(compiled.final_placement.values()))
    assert compiled.logical_two_qubit_gates == gk.circuit_resources(gk.trial_circuit(pipeline, theta))[
        "two_qubit_gates"]


def test_without_a_device_the_circuit_is_the_logical_one():
    pipeline = gk.Pipeline(H2)
    theta = np.array([0.3, -0.2, 0.5])
    compiled = pipeline.circuit(theta)
    assert compiled.device is None and compiled.swaps == 0
    assert compiled.initial_placement == compiled.final_placement == dict(enumerate(cirq.LineQubit.range(4)))
    assert cirq.approx_eq(compiled.circuit, gk.trial_circuit(pipeline, theta))
    assert compiled.two_qubit_gates == compiled.logical_two_qubit_gates


def test_swaps_move_the_qubits_and_the_final_permutation_is_reported():
    # three CNOTs that need every pair of 3 qubits on a line of 3: at least one SWAP (common practice, no single
    # source: a triangle does not embed in a path)
    q = cirq.LineQubit.range(3)
    logical = cirq.Circuit([cirq.H(q[0]), cirq.CNOT(q[0], q[1]), cirq.CNOT(q[1], q[2]), cirq.CNOT(q[0], q[2]),
                            cirq.ry(0.4)(q[2])])
    profile = DeviceProfile(name="three", connectivity="line", size=3, native_gate="cz")
    compiled = compile_for_device(logical, profile)
    assert compiled.swaps >= 1
    assert compiled.final_placement != compiled.initial_placement
    expected = cirq.Simulator(dtype=np.complex128).simulate(logical, qubit_order=q).final_state_vector
    assert abs(np.vdot(expected, compiled.logical_state())) == pytest.approx(1.0, abs=1e-10)  # Cirq


def test_measurements_are_kept_on_the_routed_qubit():
    q = cirq.LineQubit.range(3)
    logical = cirq.Circuit([cirq.H(q[0]), cirq.CNOT(q[0], q[2]), cirq.CNOT(q[1], q[2]), cirq.CNOT(q[0], q[1]),
                            cirq.measure(*q, key="m")])
    compiled = compile_for_device(logical, DeviceProfile(name="three", connectivity="line", size=3))
    measurements = [op for op in compiled.circuit.all_operations() if cirq.is_measurement(op)]
    assert len(measurements) == 1
    assert list(measurements[0].qubits) == [compiled.final_placement[i] for i in range(3)]


def test_a_device_smaller_than_the_register_is_refused():
    pipeline = gk.Pipeline(H2).device(DeviceProfile(name="pair", connectivity="line", size=3))
    with pytest.raises(gk.DeviceError, match="has 3 qubits, fewer than the register's 4"):
        pipeline.circuit()


def test_a_registered_device_name_selects_a_builtin():
    pipeline = gk.Pipeline(H2).device("grid-4x4")
    assert pipeline.device_profile.name == "grid-4x4" and pipeline.device_profile.n_qubits == 16
    assert gk.Pipeline(H2).device_profile is None
    assert pipeline.device(None).device_profile is None  # a new pipeline, the old one untouched
    assert pipeline.device_profile is not None
    with pytest.raises(gk.DeviceError, match="unknown device 'grid-9x9'"):
        gk.Pipeline(H2).device("grid-9x9")
