"""Noise channels from error figures and durations: relaxation, idle qubits, depolarising identity, bad input."""

import math

import cirq
import pytest

import groundkit as gk
from groundkit.device import ErrorFigures, GateDurations
from groundkit.errors import DeviceError, NoiseError
from groundkit.estimators import NoisyEstimator
from groundkit.noise import DeviceNoise, relaxation_rates
from groundkit.noise.simulation import density_matrix, qsim_available, statevector_runs


def test_relaxation_of_an_idle_qubit_follows_t1_and_t2():
    # textbook: P(1) decays as exp(-t/T1), the coherence |rho_01| as exp(-t/T2) (Nielsen and Chuang, 8.3)
    q0, q1 = cirq.LineQubit.range(2)
    t1, t2, gate = 20.0, 15.0, 500.0  # µs, µs, ns
    noise = DeviceNoise(ErrorFigures(one_qubit=0, two_qubit=0, readout=0, t1=t1, t2=t2),
                        GateDurations(one_qubit=gate))
    moments = 6
    circuit = cirq.Circuit([cirq.Moment(cirq.H(q0), cirq.X(q1))] + [cirq.Moment(cirq.X(q1))] * (moments - 1))
    rho = density_matrix(noise.noisy(circuit), [q0])  # q0 idle after the first moment, q1 traced out
    t = moments * gate * 1e-3
    assert abs(rho[0, 1]) == pytest.approx(0.5 * math.exp(-t / t2), rel=1e-9)
    circuit = cirq.Circuit([cirq.Moment(cirq.X(q0), cirq.X(q1))] + [cirq.Moment(cirq.X(q1))] * (moments - 1))
    rho = density_matrix(noise.noisy(circuit), [q0])
    assert rho[1, 1].real == pytest.approx(math.exp(-t / t1), rel=1e-9)


def test_moments_of_identities_take_no_time():
    q0 = cirq.LineQubit(0)
    noise = DeviceNoise(ErrorFigures(t1=10.0, t2=10.0))
    assert noise.moment_duration(cirq.Moment(cirq.I(q0))) == 0.0
    assert len(noise.noisy(cirq.Circuit(cirq.I(q0)))) == 1


def test_rates_at_t2_equal_to_twice_t1_have_no_pure_dephasing():
    assert relaxation_rates(100.0, 10.0, 20.0)[1] == 0.0
    gamma1, _ = relaxation_rates(100.0, 10.0, 20.0)
    assert gamma1 == pytest.approx(1 - math.exp(-0.01))


def test_zero_noise_equals_the_exact_energy_on_both_simulators(h2_pipeline, h2_theta):
    exact = h2_pipeline.objective().energy(h2_theta)
    none = ErrorFigures(one_qubit=0, two_qubit=0, readout=0, t1=None, t2=None)
    for simulator in ("density-matrix", "trajectories"):
        value, error = NoisyEstimator(errors=none, simulator=simulator, trajectories=3, seed=1, backend="cirq").bind(
            h2_pipeline).estimate(h2_theta)
        assert value == pytest.approx(exact, abs=1e-10) and error == pytest.approx(0.0, abs=1e-10)
    if qsim_available():  # qsim computes in single precision
        value, _ = NoisyEstimator(errors=none, simulator="trajectories", trajectories=2, backend="qsim").bind(
            h2_pipeline).estimate(h2_theta)
        assert value == pytest.approx(exact, abs=1e-6)


def test_global_depolarising_gives_the_textbook_mixture(h2_pipeline, h2_theta):
    # (1 - p) E + p Tr(H)/2^n for rho -> (1 - p) rho + p 1/2^n (textbook identity); Tr(H)/2^n is the identity
    # coefficient of the Pauli expansion. Cirq's n-qubit depolarize(q) leaves the state with probability 1 - q
    # and applies each of the 4^n - 1 other Paulis with q/(4^n - 1), so q = p (4^n - 1)/4^n.
    p = 0.2
    none = ErrorFigures(one_qubit=0, two_qubit=0, readout=0, t1=None, t2=None)
    measurement = NoisyEstimator(errors=none).bind(h2_pipeline)
    circuit, qubits = measurement.circuit(h2_theta)
    n = len(qubits)
    noisy = circuit + cirq.Circuit(cirq.depolarize(p * (4 ** n - 1) / 4 ** n, n_qubits=n).on(*qubits))
    expected = (1 - p) * h2_pipeline.objective().energy(h2_theta) + p * measurement.constant
    reading = measurement.reader.exact([density_matrix(noisy, qubits)], True)
    assert reading.energy == pytest.approx(expected, abs=1e-10)
    runs = statevector_runs(noisy, qubits, 200, seed=5, backend=measurement.backend)
    sampled = measurement.reader.exact(runs, False)
    assert abs(sampled.energy - expected) < 3 * sampled.standard_error


@pytest.mark.parametrize("options", [dict(one_qubit=-0.1), dict(two_qubit=1.5), dict(readout=2), dict(shots=0),
                                     dict(mitigation=("readout", "magic")), dict(mitigation="zero-noise"),
                                     dict(simulator="tensor"), dict(zne_scales=(1.0, 0.5)), dict(trajectories=1)])
def test_bad_noisy_options_are_refused_with_the_accepted_values(options):
    with pytest.raises(gk.ComponentError, match="must"):
        NoisyEstimator(**options)


def test_bad_figures_are_refused():
    with pytest.raises(DeviceError, match="T2 must be at most 2·T1"):
        ErrorFigures(t1=10.0, t2=25.0)
    with pytest.raises(DeviceError, match="must"):
        ErrorFigures(two_qubit=-1e-3)
    with pytest.raises(NoiseError, match="above 2·T1"):
        relaxation_rates(10.0, 10.0, 25.0)
    with pytest.raises(gk.ComponentError, match="give the error rates once"):
        NoisyEstimator(errors=ErrorFigures(), two_qubit=1e-3)


def test_the_shorthand_options_mean_figures_without_relaxation():
    assert NoisyEstimator(two_qubit=2e-2).figures() == ErrorFigures(one_qubit=1e-3, two_qubit=2e-2, readout=1e-2,
                                                                    t1=None, t2=None)
    estimator = NoisyEstimator(errors=ErrorFigures(t1=50.0, t2=60.0), mitigation=("zne", "readout"))
    assert gk.component_from_dict(estimator.to_dict()) == estimator


def test_density_matrix_and_trajectories_agree_within_three_sigma(h2_pipeline, h2_theta):
    figures = ErrorFigures(one_qubit=2e-3, two_qubit=2e-2, readout=3e-2, t1=40.0, t2=30.0)
    dm = NoisyEstimator(errors=figures).bind(h2_pipeline).estimate(h2_theta)[0]
    value, error = NoisyEstimator(errors=figures, simulator="trajectories", trajectories=120,
                                  seed=2).bind(h2_pipeline).estimate(h2_theta)
    assert error > 0 and abs(value - dm) < 3 * error
    value, error = NoisyEstimator(errors=figures, simulator="trajectories", trajectories=40, shots=40_000,
                                  seed=3).bind(h2_pipeline).estimate(h2_theta)
    assert abs(value - dm) < 3 * error


def test_the_density_matrix_equals_cirqs_density_matrix_simulator(h2_pipeline, h2_theta):
    import numpy as np

    figures = ErrorFigures(one_qubit=2e-3, two_qubit=2e-2, readout=3e-2, t1=40.0, t2=30.0)
    measurement = NoisyEstimator(errors=figures).bind(h2_pipeline)
    noisy = measurement.noisy_circuit(h2_theta)
    qubits = cirq.LineQubit.range(4)
    reference = cirq.DensityMatrixSimulator(dtype=np.complex128).simulate(noisy, qubit_order=qubits)
    assert np.allclose(density_matrix(noisy, qubits), reference.final_density_matrix, atol=1e-10)
    q = cirq.LineQubit.range(3)  # a routing ancilla (q[2]) is traced out
    small = cirq.Circuit(cirq.H(q[0]), cirq.CNOT(q[0], q[2]), cirq.SWAP(q[2], q[1]), cirq.amplitude_damp(0.3).on(q[1]))
    full = cirq.DensityMatrixSimulator(dtype=np.complex128).simulate(small, qubit_order=q).final_density_matrix
    traced = cirq.partial_trace(full.reshape((2,) * 6), [0, 1]).reshape(4, 4)
    assert np.allclose(density_matrix(small, q[:2]), traced, atol=1e-12)
