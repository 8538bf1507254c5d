"""HardwareEfficient: options, structure, gradients, and chemical accuracy on H2."""

from __future__ import annotations

import numpy as np
import pytest
import scipy.optimize
from openfermion import get_sparse_operator

import groundkit as gk
from groundkit.circuits import circuit_resources, state_of
from groundkit.errors import ComponentError, ParameterError
from groundkit.qubit_states import HardwareEfficient, QubitObjective
from tests import outside_references as outside
from tests.circuits.helpers import H2, MAPPINGS, lih_pipeline, random_angles

H2_EXACT = outside.diatomic("H", "H", 0.7414)  # the test's own PySCF molecule, the geometry of H2
LIH_EXACT = outside.diatomic("Li", "H", 1.5949)  # the geometry of LIH


@pytest.mark.parametrize("options", [{"layers": -1}, {"layers": 1.5}, {"rotations": ()}, {"rotations": ("ry", "u3")},
                                     {"entangler": "iswap"}, {"ring": 1}, {"init": "hf"}, {"jitter": -0.1},
                                     {"seed": -2}])
def test_bad_options_are_refused(options):
    with pytest.raises(ComponentError, match=next(iter(options))):
        HardwareEfficient(**options)


def test_value_equality_and_names():
    assert HardwareEfficient(layers=1, rotations=["ry"]) == HardwareEfficient(layers=1, rotations=("ry",))
    assert gk.Pipeline(H2).trial_state("hardware-efficient", layers=1).components["trial_state"] == \
        HardwareEfficient(layers=1)


@pytest.mark.parametrize(("entangler", "ring"), [("cnot", False), ("cz", False), ("cz", True)])
def test_parameter_and_gate_counts(entangler, ring):
    pipeline = gk.Pipeline(H2).trial_state(HardwareEfficient(layers=3, entangler=entangler, ring=ring))
    n = pipeline.encoding().n_qubits
    assert pipeline.objective().n_parameters == n * 2 * 4
    counts = circuit_resources(pipeline.circuit())
    assert counts["two_qubit_gates"] == 3 * (n if ring else n - 1)


@pytest.mark.parametrize("name", MAPPINGS)
def test_objective_energy_matches_cirq_simulation(name):
    pipeline = gk.Pipeline(H2).mapping(name).trial_state(HardwareEfficient(layers=2, rotations=("rx", "ry", "rz")))
    objective = pipeline.objective()
    assert isinstance(objective, QubitObjective)
    theta = random_angles(objective.n_parameters, 11)
    n = pipeline.encoding().n_qubits
    psi = state_of(pipeline.circuit(theta), n)  # cirq.Simulator
    hamiltonian = get_sparse_operator(pipeline.qubit_hamiltonian(), n_qubits=n)  # OpenFermion
    assert objective.energy(theta) == pytest.approx(np.vdot(psi, hamiltonian @ psi).real, abs=1e-10)
    assert abs(np.vdot(objective.state(theta), psi)) == pytest.approx(1.0, abs=1e-10)


@pytest.mark.parametrize(("entangler", "taper"), [("cnot", False), ("cz", True)])
def test_adjoint_gradient_matches_central_differences(entangler, taper):
    pipeline = lih_pipeline().mapping(gk.QubitMapping("parity", taper=taper)).trial_state(
        HardwareEfficient(layers=2, entangler=entangler, ring=True))
    objective = pipeline.objective()
    theta = random_angles(objective.n_parameters, 4)
    energy, gradient = objective.energy_and_gradient(theta)
    assert energy == pytest.approx(objective.energy(theta), abs=1e-12)
    step = 1e-5
    central = np.array([(objective.energy(theta + step * e) - objective.energy(theta - step * e)) / (2 * step)
                        for e in np.eye(theta.size)])
    assert np.max(np.abs(gradient - central)) < 1e-6


@pytest.mark.parametrize("mapping", [gk.QubitMapping("jordan-wigner"), gk.QubitMapping("parity", taper=True)])
def test_h2_reaches_chemical_accuracy(mapping):
    # H2/STO-3G at 0.7414 Å (NIST CCCBDB r_e, from memory); 1.6 mHa chemical accuracy (common practice)
    pipeline = gk.Pipeline(H2).mapping(mapping).trial_state(HardwareEfficient(layers=1))
    result = pipeline.run()
    exact = outside.pyscf_exact(H2_EXACT).exact  # PySCF FCI (reference library)
    assert result.converged
    assert -1e-9 < result.energy - exact <= 1.6e-3  # variational, and within chemical accuracy of PySCF FCI
    assert result.within_chemical_accuracy  # internal consistency: the verdict agrees
    assert result.fidelity == pytest.approx(1.0, abs=1e-4)
    assert result.particle_number == pytest.approx(2.0, abs=1e-4)
    assert result.spin_square == pytest.approx(0.0, abs=1e-4)


def test_variational_for_random_parameters():
    pipeline = lih_pipeline().trial_state(HardwareEfficient(layers=1))
    objective = pipeline.objective()
    exact = outside.pyscf_exact(LIH_EXACT, active=(2, 4)).exact  # PySCF CASCI (2e, 4o) (reference library)
    for seed in range(3):
        assert objective.energy(random_angles(objective.n_parameters, seed)) >= exact - 1e-9


def test_cz_layers_at_zero_angles_keep_the_reference():
    pipeline = gk.Pipeline(H2).trial_state(HardwareEfficient(layers=2, entangler="cz", jitter=0.0))
    objective = pipeline.objective()
    energy = objective.energy(objective.initial_parameters())
    assert energy == pytest.approx(outside.pyscf_exact(H2_EXACT).hf, abs=1e-8)  # PySCF RHF (reference library)
    assert list(objective.amplitudes(objective.initial_parameters())) == ["20"]


def test_wrong_parameter_length_is_refused():
    objective = gk.Pipeline(H2).trial_state(HardwareEfficient(layers=1)).objective()
    with pytest.raises(ParameterError, match="expected 16 values"):
        objective.energy(np.zeros(15))
    with pytest.raises(ParameterError, match="expected 16 values"):
        objective.energy_and_gradient(np.zeros((4, 4)))
    with pytest.raises(ParameterError, match="not numbers"):
        objective.state(["a"] * 16)
    with pytest.raises(ParameterError, match="expected 16 values"):
        gk.Pipeline(H2).trial_state(HardwareEfficient(layers=1)).circuit(np.zeros(3))


def test_minimiser_from_scipy_directly():
    objective = gk.Pipeline(H2).mapping(gk.QubitMapping("bravyi-kitaev", taper=True)).trial_state(
        HardwareEfficient(layers=1, rotations=("ry",))).objective()
    best = scipy.optimize.minimize(objective.energy_and_gradient, objective.initial_parameters(), jac=True)
    assert best.success
    assert best.fun == pytest.approx(outside.pyscf_exact(H2_EXACT).exact, abs=1e-8)  # PySCF FCI (reference library)
