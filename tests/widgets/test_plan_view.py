"""Plan pictures: PNG, HTML and the notebook widget carry the frontier, the target, the labelled recommendation,
the curve and the table."""

from __future__ import annotations

import pytest

from groundkit.widgets.plan_view import draw_frontier, plan_figure
from tests.studies.plan_cases import h2_plan

pytestmark = pytest.mark.slow


def test_png_is_written(tmp_path):
    path = h2_plan().plot(str(tmp_path / "plan.png"))
    with open(path, "rb") as fh:
        assert fh.read(8) == b"\x89PNG\r\n\x1a\n"


def test_frontier_panel_has_target_line_and_labelled_recommendation():
    plan = h2_plan()
    figure = plan_figure(plan)
    ax = figure.axes[0]
    labels = [t.get_text() for t in ax.get_legend().get_texts()]
    assert "target 1.6 mHa" in labels and "frontier" in labels
    notes = [t.get_text() for t in ax.texts]
    assert f"recommended: {plan.recommend().configuration}" in notes
    curve = figure.axes[2]
    curve_labels = [t.get_text() for t in curve.get_legend().get_texts()]
    assert "exact reference" in curve_labels and "hf" in curve_labels


def test_html_and_widget():
    plan = h2_plan()
    html = plan._repr_html_()
    assert "data:image/png;base64," in html and plan.recommend().justification[:40] in html
    assert "illustrative" in html and "worst |error| / mHa" in html
    widget = plan.show()
    assert len(widget.children) == 3


def test_frontier_without_rows_says_so():
    from groundkit.studies.plan_result import PlanResult
    from groundkit.widgets.figures import new_figure

    _, (ax,) = new_figure(panels=1)
    draw_frontier(ax, PlanResult(rows=(), curves=()))
    assert "no configuration has both figures" in [t.get_text() for t in ax.texts]
