"""Sampled estimates for every grouping: unbiased, spread equal to the reported error, budgets that deliver."""

import numpy as np
import pytest

import groundkit as gk
from groundkit.estimators import SampledEstimator, grouping_names

from ..conftest import diatomic

SEEDS = range(24)  # 16 or more seeds per check (issue 16)


@pytest.fixture(scope="module")
def lih_point():
    pipeline = diatomic("Li", "H", 1.5949).pipeline().active_space(electrons=2, orbitals=4)
    objective = pipeline.objective()
    theta = np.random.default_rng(5).normal(scale=0.1, size=objective.n_parameters)
    return pipeline, theta, objective.energy(theta)


@pytest.mark.parametrize("grouping", ["qwc", "qwc-term-order", "commuting", "basis-rotation", "qwc-overlap",
                                      "commuting-overlap"])
@pytest.mark.parametrize("allocation", ["variance", "uniform"])
def test_unbiased_and_honest_for_every_grouping(lih_point, grouping, allocation):
    pipeline, theta, exact = lih_point
    draws = [SampledEstimator(shots=20_000, grouping=grouping, allocation=allocation, seed=s).bind(pipeline)
             .estimate(theta) for s in SEEDS]
    values, errors = np.array([v for v, _ in draws]), np.array([e for _, e in draws])
    spread = values.std(ddof=1)
    assert abs(values.mean() - exact) < 3 * spread / np.sqrt(values.size)  # unbiased (statistics, common practice)
    assert spread == pytest.approx(errors.mean(), rel=0.3)  # reported error matches the spread


@pytest.mark.parametrize("grouping", ["qwc", "commuting", "basis-rotation", "commuting-overlap"])
def test_predicted_budget_delivers_its_precision(lih_point, grouping):
    # N = (sum_g sigma_g)^2 / eps^2 with exact group covariances (Rubin, Babbush, McClean, NJP 20, 053020 (2018))
    pipeline, theta, _ = lih_point
    precision = 2e-3
    shots = pipeline.shot_budget(precision=precision, parameters=theta, grouping=grouping)
    values = [SampledEstimator(shots=shots, grouping=grouping, seed=100 + s).bind(pipeline).estimate(theta)[0]
              for s in SEEDS]
    assert np.std(values, ddof=1) == pytest.approx(precision, rel=0.3)


def test_groupings_in_the_measurement_comparison(lih_point):
    pipeline, theta, _ = lih_point
    table = gk.estimators.compare_measurements(pipeline, parameters=theta)
    assert set(table.grouping) == set(grouping_names())
    jw = table[(table.mapping == "jordan-wigner") & ~table.tapered & (table.allocation == "variance")]
    assert (jw.shots > 0).all() and len(jw) == len(grouping_names())
    assert (jw[jw.grouping == "qwc"].added_two_qubit_worst == 0).all()  # single-qubit rotations only
    refused = table[table.shots.isna() & (table.grouping == "basis-rotation")]
    assert refused.tapered.all() and refused.note.str.contains("tapered").all()
