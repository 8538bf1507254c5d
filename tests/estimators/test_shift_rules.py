"""Parameter-shift gradients: exact with exact expectation values, honest standard errors with sampled ones."""

import numpy as np
import pytest

import groundkit as gk
from groundkit.estimators import SampledEstimator
from groundkit.estimators.shift_rules import rotation_frequencies, shift_gradient

from ..conftest import diatomic


def _exact(encoding):
    matrix = encoding.sparse_hamiltonian()

    def estimate(state):
        return float(np.real(np.vdot(state, matrix @ state))), 0.0

    return estimate


@pytest.mark.parametrize("mapping, taper, trial", [
    ("jordan-wigner", False, "uccsd"), ("parity", True, "uccsd"), ("bravyi-kitaev", False, "upccgsd")])
def test_four_term_rule_equals_the_adjoint_gradient(lih, mapping, taper, trial):
    # Anselmetti et al., NJP 23, 113010 (2021): exact for exp(theta G) with G^3 = -G; the adjoint sweep is exact
    pipeline = lih.pipeline().active_space(electrons=2, orbitals=4).mapping(mapping, taper=taper).trial_state(trial)
    objective, encoding = pipeline.objective(), pipeline.encoding()
    theta = np.random.default_rng(11).normal(scale=0.3, size=objective.n_parameters)
    gradient, error, method = shift_gradient(objective, encoding, theta, _exact(encoding))
    assert method == "four-term"
    assert np.abs(gradient - objective.energy_and_gradient(theta)[1]).max() < 1e-8
    assert not error.any()


def test_two_term_rule_equals_the_adjoint_gradient():
    # Mitarai et al., PRA 98, 032309 (2018): exact for a parameter driving one Pauli rotation
    pipeline = diatomic("H", "H", 0.7414).pipeline().trial_state(gk.HardwareEfficient(layers=2))
    objective, encoding = pipeline.objective(), pipeline.encoding()
    assert all(a is not None for a in rotation_frequencies(objective))
    theta = np.random.default_rng(2).normal(scale=0.5, size=objective.n_parameters)
    gradient, error, method = shift_gradient(objective, encoding, theta, _exact(encoding))
    assert method == "two-term"
    assert np.abs(gradient - objective.energy_and_gradient(theta)[1]).max() < 1e-8


def test_sampled_shift_gradient_is_unbiased_with_honest_errors():
    pipeline = diatomic("H", "H", 0.7414).pipeline()
    objective = pipeline.objective()
    theta = np.array([0.05] * objective.n_parameters)
    exact = objective.energy_and_gradient(theta)[1]
    draws, errors = [], []
    for seed in range(24):
        measurement = SampledEstimator(shots=4000, seed=seed, grouping="commuting").bind(pipeline)
        g, e = measurement.gradient(theta)
        draws.append(g)
        errors.append(e)
    draws, errors = np.array(draws), np.array(errors)
    spread = draws.std(axis=0, ddof=1)
    assert np.all(np.abs(draws.mean(axis=0) - exact) < 3 * spread / np.sqrt(len(draws)) + 1e-12)  # unbiased
    assert spread == pytest.approx(errors.mean(axis=0), rel=0.35)  # reported error = spread (24 seeds)


def test_differences_remain_the_fallback():
    pipeline = diatomic("H", "H", 0.7414).pipeline()
    measurement = SampledEstimator(shots=20_000, seed=3, gradient="differences").bind(pipeline)
    energy, gradient = measurement.energy_and_gradient(np.zeros(pipeline.objective().n_parameters))
    assert measurement.last_gradient_error.shape == gradient.shape and np.all(measurement.last_gradient_error > 0)
    with pytest.raises(gk.ComponentError, match="gradient must be one of 'shift', 'differences'"):
        SampledEstimator(gradient="guess")
