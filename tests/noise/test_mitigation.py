"""Error mitigation: readout inversion, zero-noise extrapolation, symmetry post-selection; results keep it all."""

from math import comb

import numpy as np
import pytest

import groundkit as gk
from groundkit.device import ErrorFigures
from groundkit.errors import NoiseError
from groundkit.estimators import NoisyEstimator
from groundkit.noise import extrapolate, fold
from groundkit.noise.readings import GroupReader
from groundkit.noise.symmetry import kept_outcomes, sector_mask

READOUT_ONLY = ErrorFigures(one_qubit=0.0, two_qubit=0.0, readout=0.05, t1=None, t2=None)
DEPOLARISING = ErrorFigures(one_qubit=1e-4, two_qubit=1e-3, readout=0.0, t1=None, t2=None)


def test_readout_mitigation_removes_the_readout_bias(h2_pipeline, h2_theta):
    exact = h2_pipeline.objective().energy(h2_theta)
    raw = NoisyEstimator(errors=READOUT_ONLY).bind(h2_pipeline).estimate(h2_theta)[0]
    assert raw - exact > 1e-2  # 5 % flips bias H2 by tens of mHa
    mitigated = NoisyEstimator(errors=READOUT_ONLY, mitigation="readout").bind(h2_pipeline).estimate(h2_theta)[0]
    assert mitigated == pytest.approx(exact, abs=1e-10)  # exact calibration: exact inversion
    value, error = NoisyEstimator(errors=READOUT_ONLY, mitigation="readout", shots=200_000,
                                  calibration_shots=10_000_000, seed=4).bind(h2_pipeline).estimate(h2_theta)
    assert abs(value - exact) < 3 * error


def test_zero_noise_extrapolation_reduces_the_depolarising_bias(h2_pipeline, h2_theta):
    exact = h2_pipeline.objective().energy(h2_theta)
    raw = NoisyEstimator(errors=DEPOLARISING).bind(h2_pipeline).estimate(h2_theta)[0]
    for fit, factor in (("linear", 4.0), ("richardson", 50.0), ("exponential", 50.0)):
        measurement = NoisyEstimator(errors=DEPOLARISING, mitigation="zne", zne_fit=fit).bind(h2_pipeline)
        value = measurement.estimate(h2_theta)[0]
        assert abs(raw - exact) > factor * abs(value - exact), fit  # measured 6, 133, 5000 (benchmarks/noise.py)
        record = measurement.record()["extrapolation"]
        assert record["fit"] == fit and record["scales"] == [1.0, 3.0, 5.0]


def test_richardson_and_linear_fits_are_exact_on_polynomials():
    x = [1.0, 2.0, 3.5]
    quadratic = [2.0 - 0.3 * s + 0.05 * s * s for s in x]
    fit = extrapolate(x, quadratic, [0.01, 0.01, 0.01], "richardson")
    assert fit.value == pytest.approx(2.0, abs=1e-12)
    # Lagrange coefficients at 0 for nodes 1, 2, 3.5, propagated: sqrt(sum c_i^2) * 0.01
    c = [np.prod([s / (s - r) for s in x if s != r]) for r in x]
    assert fit.standard_error == pytest.approx(0.01 * np.sqrt(np.sum(np.square(c))), rel=1e-5)
    assert extrapolate([1, 3, 5], [1.1, 1.3, 1.5], [0, 0, 0], "linear").value == pytest.approx(1.0)
    decaying = [0.5 + 0.4 * np.exp(-0.3 * s) for s in (1.0, 3.0, 5.0)]
    assert extrapolate([1, 3, 5], decaying, [0, 0, 0], "exponential").value == pytest.approx(0.9, abs=1e-6)
    with pytest.raises(NoiseError, match="unknown zero-noise fit"):
        extrapolate([1, 3], [1, 2], [0, 0], "cubic")


def test_folding_keeps_the_unitary_and_scales_the_gate_count(h2_pipeline, h2_theta):
    import cirq

    measurement = NoisyEstimator().bind(h2_pipeline)
    circuit, qubits = measurement.circuit(h2_theta)
    for scale in (3.0, 2.0):
        folded, achieved = fold(circuit, scale)
        assert achieved == pytest.approx(scale, abs=2.0 / len(circuit))
        assert np.allclose(cirq.unitary(folded), cirq.unitary(circuit), atol=1e-9)


def test_sector_mask_matches_the_counted_determinants(h2_pipeline):
    for mapping in ("jordan-wigner", "bravyi-kitaev", "parity"):
        encoding = h2_pipeline.mapping(mapping).encoding()
        mask = sector_mask(encoding)
        assert mask.sum() == comb(2, 1) ** 2  # C(orbitals, N_alpha) C(orbitals, N_beta) for H2
        reference = int("".join(map(str, encoding.reference_bits_full)), 2)
        assert mask[reference]
    mask = sector_mask(h2_pipeline.encoding())  # Jordan-Wigner: bits are occupations, alpha on even qubits
    outcomes = np.arange(16)
    kept = kept_outcomes(outcomes, mask)
    bits = (kept[:, None] >> np.arange(3, -1, -1)) & 1
    assert np.all(bits.sum(axis=1) == 2) and np.all(bits[:, 0::2].sum(axis=1) == 1)


def test_symmetry_post_selection_reduces_the_bias_and_reports_the_kept_fraction(h2_pipeline, h2_theta):
    exact = h2_pipeline.objective().energy(h2_theta)
    raw = NoisyEstimator(errors=DEPOLARISING).bind(h2_pipeline).estimate(h2_theta)[0]
    measurement = NoisyEstimator(errors=DEPOLARISING, mitigation="symmetry").bind(h2_pipeline)
    value = measurement.estimate(h2_theta)[0]
    kept = measurement.record()["kept_fraction"]
    assert 0.5 < kept < 1.0 and abs(value - exact) < abs(raw - exact)
    rho = measurement.density_matrix(h2_theta)
    assert kept == pytest.approx(float(np.sum(np.diag(rho).real * sector_mask(h2_pipeline.encoding()))))
    shots = NoisyEstimator(errors=DEPOLARISING, mitigation="symmetry", shots=20_000, seed=2).bind(h2_pipeline)
    value, error = shots.estimate(h2_theta)
    assert abs(value - measurement.estimate(h2_theta)[0]) < 4 * error
    assert shots.record()["kept_fraction"] == pytest.approx(kept, abs=0.02)


def test_symmetry_on_a_tapered_register_and_zero_kept_shots_are_explained(h2_pipeline, h2_theta):
    tapered = h2_pipeline.mapping(gk.QubitMapping("parity", taper=True))
    with pytest.raises(NoiseError, match="tapered"):
        NoisyEstimator(mitigation="symmetry").bind(tapered)
    measurement = NoisyEstimator(mitigation="symmetry").bind(h2_pipeline)
    reader = measurement.reader
    nowhere = GroupReader(reader.constant, reader.groups, reader.n, reader.assignment, None,
                          np.zeros(16, dtype=bool))
    rho = measurement.density_matrix(h2_theta)
    with pytest.raises(NoiseError, match="kept fraction 0"):
        nowhere.exact([rho], True)
    with pytest.raises(NoiseError, match="passed symmetry post-selection"):
        nowhere.sampled([rho], True, np.full(len(reader.groups), 10), np.random.default_rng(1))


def test_noisy_results_keep_noise_and_mitigation_through_a_file(h2_pipeline, tmp_path):
    estimator = NoisyEstimator(errors=ErrorFigures(t1=80.0, t2=60.0), mitigation=("readout", "symmetry"),
                               shots=4000, seed=3)
    result = h2_pipeline.estimator(estimator).minimiser(gk.COBYLA(max_iterations=15)).run()
    noise = result.noise
    assert noise["mitigation"] == ["readout", "symmetry"] and 0 < result.kept_fraction <= 1
    assert noise["noise_model"]["errors"]["options"]["t1"] == 80.0
    assert result.estimator_bias is not None and "noise" in result.summary()
    path = tmp_path / "noisy.json"
    result.save(str(path))
    again = gk.load_result(str(path))
    assert again.noise == noise and again == result
    assert again.estimator_bias == pytest.approx(result.estimator_bias)
