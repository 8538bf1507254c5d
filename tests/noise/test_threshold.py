"""The noise threshold: monotone errors in the factor, a bracketing search, reproducible with a seed."""

import dataclasses

import pytest

from groundkit.device import ErrorFigures
from groundkit.errors import ComponentError, NoiseError
from groundkit.noise.threshold import ThresholdSearch, noise_threshold

FIGURES = ErrorFigures(one_qubit=1e-4, two_qubit=1e-3, readout=1e-3, t1=200.0, t2=150.0)


@pytest.fixture(scope="module")
def h2_result(h2_pipeline):
    return h2_pipeline.estimator("exact").run()


def test_the_error_grows_with_the_factor_and_the_threshold_brackets_the_target(h2_pipeline, h2_result):
    search = ThresholdSearch(h2_pipeline, errors=FIGURES, result=h2_result)
    errors = [search.error_at(f)[0] for f in (0.0, 0.1, 0.3, 1.0, 3.0)]
    assert all(a < b for a, b in zip(errors, errors[1:]))  # monotone in the factor for this case
    found = noise_threshold(h2_pipeline, errors=FIGURES, result=h2_result, tolerance=0.05)
    assert abs(ThresholdSearch(h2_pipeline, errors=FIGURES, result=h2_result).error_at(found.factor)[0]) <= 1.6e-3
    assert abs(ThresholdSearch(h2_pipeline, errors=FIGURES, result=h2_result).error_at(
        found.failing_factor)[0]) > 1.6e-3
    assert found.failing_factor / found.factor <= 1.05 + 1e-12
    assert found.two_qubit == pytest.approx(found.factor * FIGURES.two_qubit)
    assert "exact expectation" in found.confidence


def test_mitigation_raises_the_threshold(h2_pipeline, h2_result):
    plain = noise_threshold(h2_pipeline, errors=FIGURES, result=h2_result, tolerance=0.2)
    mitigated = noise_threshold(h2_pipeline, errors=FIGURES, result=h2_result, mitigation=("symmetry", "zne"),
                                tolerance=0.2)
    assert mitigated.two_qubit > plain.two_qubit and mitigated.mitigation == ("symmetry", "zne")


def test_sampled_thresholds_are_reproducible_with_a_seed_and_state_their_confidence(h2_pipeline, h2_result):
    options = dict(errors=FIGURES, result=h2_result, shots=20_000, tolerance=0.3)
    first = noise_threshold(h2_pipeline, seed=11, **options)
    again = noise_threshold(h2_pipeline, seed=11, **options)
    assert first == again and "one-sided confidence" in first.confidence


def test_thresholds_refuse_bad_input_and_explain_a_missed_target(h2_pipeline, h2_result):
    with pytest.raises(ComponentError, match="must"):
        noise_threshold(h2_pipeline, errors=FIGURES, result=h2_result, mitigation="prayer")
    with pytest.raises(NoiseError, match="target"):
        noise_threshold(h2_pipeline, errors=FIGURES, result=h2_result, target=-1.0)
    with pytest.raises(NoiseError, match="all zero"):
        noise_threshold(h2_pipeline, errors=FIGURES.scaled(0), result=h2_result)
    far = dataclasses.replace(h2_result, parameters=h2_result.parameters * 0 + 0.5)  # far from the optimum
    missed = noise_threshold(h2_pipeline, errors=FIGURES, result=far)
    assert missed.two_qubit == 0.0 and "without noise" in missed.reason


def test_compare_adds_threshold_columns(h2_pipeline):
    import groundkit as gk

    table = gk.compare(h2_pipeline, trial_states=["uccsd"], noise_threshold={"errors": FIGURES, "tolerance": 0.5})
    row = table.iloc[0]
    assert row["threshold_two_qubit"] > 0 and row["threshold_note"] == ""
    assert row["threshold_two_qubit"] == pytest.approx(row["threshold_factor"] * FIGURES.two_qubit)
