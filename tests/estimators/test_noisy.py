"""Noisy estimation on Cirq's density-matrix simulator."""

import numpy as np
import pytest

import groundkit as gk
from groundkit.estimators import NOISY_QUBIT_LIMIT, NoisyEstimator

from ..conftest import diatomic, water


@pytest.fixture(scope="module")
def h2():
    pipeline = diatomic("H", "H", 0.7414).pipeline()  # NIST CCCBDB r_e (from memory)
    theta = np.array([0.04, -0.02, 0.11])[: pipeline.objective().n_parameters]
    return pipeline, theta


def test_zero_noise_equals_the_exact_energy(h2):
    pipeline, theta = h2
    noiseless = NoisyEstimator(one_qubit=0.0, two_qubit=0.0, readout=0.0).bind(pipeline).estimate(theta)[0]
    assert noiseless == pytest.approx(pipeline.objective().energy(theta), abs=1e-10)  # Cirq density matrix


def test_noise_raises_the_energy(h2):
    pipeline, theta = h2
    exact = pipeline.objective().energy(theta)
    energies = [NoisyEstimator(one_qubit=p / 10, two_qubit=p, readout=p).bind(pipeline).estimate(theta)[0]
                for p in (1e-4, 1e-3, 1e-2)]
    assert exact < energies[0] < energies[1] < energies[2]


def test_sampled_noisy_estimate_is_centred_on_the_noisy_expectation(h2):
    pipeline, theta = h2
    expectation = NoisyEstimator().bind(pipeline).estimate(theta)[0]
    value, error = NoisyEstimator(shots=200_000, seed=3).bind(pipeline).estimate(theta)
    assert abs(value - expectation) < 4 * error


def test_noisy_run_reports_its_bias(h2):
    pipeline, _ = h2
    result = pipeline.estimator(NoisyEstimator(two_qubit=1e-3, one_qubit=1e-4, readout=1e-3)).minimiser(
        gk.COBYLA(max_iterations=60)).run()
    assert result.estimator_bias > 0 and "estimator bias" in result.summary()


@pytest.mark.parametrize("options", [dict(one_qubit=-0.1), dict(two_qubit=1.5), dict(readout=2), dict(shots=0)])
def test_bad_noise_options(options):
    with pytest.raises(gk.ComponentError, match="must"):
        NoisyEstimator(**options)


def test_noisy_simulation_above_the_qubit_limit_is_refused():
    big = water().pipeline().active_space(electrons=8, orbitals=6)  # 12 qubits
    with pytest.raises(gk.SizeLimitError, match=f"limit of {NOISY_QUBIT_LIMIT} qubits"):
        NoisyEstimator().bind(big)
