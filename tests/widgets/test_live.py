"""The live run view: its data series are the run's history, its amplitudes the result's and the reference's."""

from __future__ import annotations

import numpy as np
import pytest

import groundkit as gk
from groundkit.minimisers import IterationRecord
from groundkit.widgets import live
from groundkit.widgets.live import RunView
from groundkit.widgets.series import AmplitudeSeries, known_baselines

pytestmark = pytest.mark.filterwarnings("ignore::groundkit.DegenerateBoundaryWarning")


def test_series_follow_the_history_while_running(lih_pipeline):
    view = RunView.for_pipeline(lih_pipeline)
    result = lih_pipeline.run(view.update)
    assert view.energy.energies == list(result.history.energies)
    assert view.energy.gradient_norms == list(result.history.gradient_norms)
    assert view.energy.reference == result.reference.energy
    view.finish(result)
    assert view.energy.energies == list(result.history.energies)
    assert view.energy.iterations == list(range(1, result.iterations + 1))
    assert view.energy.baselines == known_baselines(result.baselines)
    assert view.png().startswith(b"\x89PNG")


def test_amplitude_chart_holds_the_result_and_reference_amplitudes(lih_pipeline):
    result = lih_pipeline.run()
    view = result.show()
    chart = view.amplitudes
    assert chart.labels and chart.labels[0] == "200"
    for label, trial, exact in zip(chart.labels, chart.trial, chart.exact):
        assert trial == result.amplitudes.get(label, 0.0)
        assert exact == result.reference.amplitudes.get(label, 0.0)
    weights = [max(abs(t), abs(e)) for t, e in zip(chart.trial, chart.exact)]
    others = [max(abs(result.amplitudes.get(k, 0.0)), abs(result.reference.amplitudes.get(k, 0.0)))
              for k in set(result.amplitudes) | set(result.reference.amplitudes) if k not in chart.labels]
    assert min(weights) >= max(others, default=0.0)  # the leading determinants, none left out


def test_amplitudes_followed_during_the_run_match_the_final_ones(lih_pipeline, monkeypatch):
    monkeypatch.setattr(live, "MIN_INTERVAL", 0.0)
    monkeypatch.setattr(live, "DRAW_SHARE", 1e9)  # redraw at every iteration
    view = RunView.for_pipeline(lih_pipeline)
    result = lih_pipeline.run(view.update)
    assert view.redraws == result.iterations
    final = AmplitudeSeries.from_result(result)
    assert view.amplitudes.labels[:3] == final.labels[:3]
    np.testing.assert_allclose(view.amplitudes.trial[:3], final.trial[:3], atol=1e-10)


def test_redraws_are_throttled():
    view = RunView(reference=-1.0, baselines={"hf": -0.99})
    for k in range(200):
        view.update(IterationRecord(iteration=k + 1, energy=-1.0 + 1e-3 / (k + 1), parameters=np.zeros(1),
                                    gradient_norm=None, wall_time=1e-4, evaluations=k + 1))
    assert len(view.energy.energies) == 200
    assert view.redraws <= 2  # 200 records in well under a second: one draw, perhaps a second


def test_run_live_displays_the_view_and_keeps_the_final_figure(h2_pipeline, monkeypatch):
    import IPython.display

    shown = []

    class Handle:
        def update(self, obj):
            shown.append(("update", obj))

    def fake_display(obj, display_id=None):
        shown.append(("display", obj))
        return Handle()

    monkeypatch.setattr(IPython.display, "display", fake_display)
    result = h2_pipeline.run(live=True)
    assert [kind for kind, _ in shown] == ["display", "update"]
    view = shown[0][1]
    assert isinstance(view, RunView)
    assert view.energy.energies == list(result.history.energies)
    assert "finished" in view.status.value
    bundle = view._repr_mimebundle_()
    assert "application/vnd.jupyter.widget-view+json" in bundle and "image/png" in bundle


def test_sampled_run_carries_its_standard_error(h2_pipeline):
    p = h2_pipeline.estimator(gk.SampledEstimator(shots=4000, seed=5)).minimiser(gk.SPSA(seed=3, max_iterations=15))
    result = p.run()
    view = result.show()
    assert result.standard_error > 0
    assert view.energy.standard_error == result.standard_error
    assert "±" in view.status.value


def test_progress_bar_counts_iterations(h2_pipeline, capsys):
    seen = []
    result = h2_pipeline.run(seen.append, progress=True)
    assert len(seen) == result.iterations
    err = capsys.readouterr().err
    assert "minimising" in err and f"{result.iterations}it" in err.replace(" ", "")
