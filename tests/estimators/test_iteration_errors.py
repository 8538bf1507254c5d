"""Sampled runs record each iteration's own standard error; saved, reloaded, drawn as the live view's bars."""

import json

import numpy as np
import pytest

import groundkit as gk
from groundkit.estimators import SampledEstimator
from groundkit.widgets.series import EnergySeries

from ..conftest import diatomic


@pytest.fixture(scope="module")
def sampled_run():
    records = []
    pipeline = diatomic("H", "H", 0.7414).pipeline().estimator(SampledEstimator(shots=4000, seed=3)).minimiser(
        gk.COBYLA(max_iterations=12))
    result = pipeline.run(callback=records.append)
    return result, records


def test_each_iteration_has_its_own_standard_error(sampled_run):
    result, records = sampled_run
    errors = result.history.standard_errors
    assert len(errors) == len(result.history) == len(records) > 3
    assert all(e is not None and e > 0 for e in errors)
    assert [r.standard_error for r in records] == list(errors)  # the callback saw the same numbers
    assert len(set(errors)) > 1  # not the final error repeated: each estimate's own sample variance
    assert np.median(errors) == pytest.approx(result.standard_error, rel=0.5)  # same shots, similar error


def test_saved_and_reloaded(sampled_run, tmp_path):
    result, _ = sampled_run
    path = tmp_path / "run.json"
    result.save(path)
    assert gk.load_result(path).history.standard_errors == result.history.standard_errors
    data = json.loads(path.read_text())
    del data["history"]["standard_errors"]  # a file written before issue 16
    path.write_text(json.dumps(data))
    old = gk.load_result(path)
    assert old.history.standard_errors == ()
    assert EnergySeries.from_result(old).error_bars() == [result.standard_error] * len(result.history)


def test_live_series_draws_the_per_iteration_bars(sampled_run):
    result, records = sampled_run
    live = EnergySeries()
    for record in records:
        live.add(record)
    assert live.error_bars() == list(result.history.standard_errors)
    assert EnergySeries.from_result(result).error_bars() == list(result.history.standard_errors)


def test_exact_runs_record_zero_errors():
    result = diatomic("H", "H", 0.7414).pipeline().run()
    assert result.history.standard_errors == (0.0,) * len(result.history)
    assert EnergySeries.from_result(result).error_bars() is None
