"""PNG files of runs and scans, drawn with matplotlib's Agg backend (no display needed)."""

from __future__ import annotations

import os
from typing import Any

from .figures import draw_scan, new_figure, run_figure
from .series import AmplitudeSeries, EnergySeries


def save_result_png(result: Any, path: str | os.PathLike) -> str:
    """Energy by iteration and leading determinants of ``result`` as a PNG at ``path``; returns the path."""
    figure = run_figure(EnergySeries.from_result(result), AmplitudeSeries.from_result(result))
    figure.savefig(os.fspath(path), format="png")
    return os.fspath(path)


def save_scan_png(scan: Any, path: str | os.PathLike, baselines: tuple[str, ...] = ("hf",)) -> str:
    """The scan's energy curve beside the exact reference and baselines as a PNG at ``path``; returns the path."""
    figure, (ax,) = new_figure(width=7.0, height=4.2, panels=1)
    draw_scan(ax, scan.table, scan.configuration.get("trial_state", "trial state"), baselines)
    figure.savefig(os.fspath(path), format="png")
    return os.fspath(path)
