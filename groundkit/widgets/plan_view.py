"""Pictures of a plan: the frontier (cost against worst error, target line, recommended point labelled), the
recommended configuration's curve beside the exact reference and baselines, and the table, as a PNG, as HTML and
as a notebook widget. Every coloured mark has a text label; colours come from :mod:`.palette`."""

from __future__ import annotations

import base64
import os
from html import escape
from typing import Any

import numpy as np

from . import palette
from .figures import draw_scan, new_figure, png_bytes
from .html import box, table

CURVE_BASELINES = ("hf", "ccsd", "casci")


def draw_frontier(ax: Any, plan: Any, cost: str = "device_hours") -> None:
    """Worst |error| (mHa) against ``cost`` for every row with both; frontier members joined by a line; the
    target as a horizontal line; the recommended row ringed and labelled."""
    from groundkit.studies.plan_result import FRONTIER_COSTS, non_dominated

    rows = [r for r in plan.rows if r.get(cost) is not None and r.get("worst_error_mha") is not None]
    words = FRONTIER_COSTS[cost]
    ax.axhline(1000 * plan.target, color=palette.GREEN, lw=1.4, ls=(0, (5, 3)),
               label=f"target {1000 * plan.target:.3g} mHa")
    if not rows:
        ax.text(0.5, 0.5, "no configuration has both figures", transform=ax.transAxes, ha="center")
    else:
        x = np.array([float(r[cost]) for r in rows])
        y = np.array([max(float(r["worst_error_mha"]), 1e-6) for r in rows])
        meets = np.array([bool(r["meets"]) for r in rows])
        ax.scatter(x[meets], y[meets], color=palette.BLUE, marker="o", s=28, label="meets target and limits")
        ax.scatter(x[~meets], y[~meets], color=palette.VERMILION, marker="x", s=28, label="does not")
        on = np.array(non_dominated([(r[cost], r["worst_error_mha"]) for r in rows]))
        order = np.argsort(x[on], kind="stable")
        ax.plot(x[on][order], y[on][order], "-", color=palette.GREY, lw=1.0, label="frontier")
        ax.set_xscale("log" if x.min() > 0 and x.max() / max(x.min(), 1e-300) > 30 else "linear")
        ax.set_yscale("log" if y.max() / y.min() > 30 else "linear")
        chosen = plan.recommend().configuration
        for r, xi, yi in zip(rows, x, y):
            if r["configuration"] == chosen:
                ax.scatter([xi], [yi], s=160, facecolors="none", edgecolors=palette.BLACK, lw=1.5)
                ax.annotate(f"recommended: {chosen}", xy=(xi, yi), xytext=(8, 10), textcoords="offset points",
                            fontsize=7, color=palette.BLACK, arrowprops={"arrowstyle": "-", "lw": 0.6})
    unit = " / h" if cost == "device_hours" else ""
    ax.set_xlabel(f"{words}{unit} (whole curve)" if cost == "device_hours" else f"{words} (worst geometry)")
    ax.set_ylabel("worst |error| / mHa")
    ax.set_title(f"Configurations: {words} against worst error", fontsize=10, loc="left")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=7, loc="best")


def draw_recommended_curve(ax: Any, plan: Any) -> None:
    """The recommended configuration's energies along the curve beside the exact reference and baselines."""
    choice = plan.recommend()
    label = choice.configuration or (choice.runner_up or "")
    if not label:
        ax.text(0.5, 0.5, "no configuration to draw", transform=ax.transAxes, ha="center")
        return
    scan = plan.curve(label)
    draw_scan(ax, scan.table, label[:60], CURVE_BASELINES)
    title = "Recommended configuration along the curve" if choice.configuration else \
        "Closest configuration (none meets the target)"
    ax.set_title(title, fontsize=10, loc="left")


def plan_figure(plan: Any) -> Any:
    """Three panels: frontier by device time, frontier by two-qubit gates, the recommended curve."""
    figure, axes = new_figure(width=16.0, height=4.6, panels=3)
    draw_frontier(axes[0], plan, "device_hours")
    draw_frontier(axes[1], plan, "two_qubit_gates")
    draw_recommended_curve(axes[2], plan)
    return figure


def save_plan_png(plan: Any, path: str | os.PathLike) -> str:
    """The plan's figure as a PNG at ``path``; returns the path."""
    plan_figure(plan).savefig(os.fspath(path), format="png")
    return os.fspath(path)


def _cell(value: Any) -> str:
    if value is None or (isinstance(value, float) and np.isnan(value)):
        return "—"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        return f"{value:.4g}"
    return escape(str(value))


TABLE_COLUMNS = (("configuration", "configuration"), ("worst_error_mha", "worst |error| / mHa"),
                 ("non_parallelity_mha", "NPE / mHa"), ("qubits", "qubits"), ("two_qubit_gates", "2q gates"),
                 ("depth", "depth"), ("shots_per_energy", "shots / energy"), ("device_hours", "device h"),
                 ("noise_threshold", "noise threshold"), ("meets", "meets"), ("reason", "why not"))


def plan_table_html(plan: Any) -> str:
    """The plan's rows as an HTML table (the recommended one in bold), then the skipped configurations."""
    chosen = plan.recommend().configuration
    columns = [(k, h) for k, h in TABLE_COLUMNS if k != "noise_threshold" or plan.noise_threshold]
    rows = [[_cell(r.get(k)) if k != "reason" else f"<span class='gk-note'>{_cell(r.get(k))}</span>"
             for k, _ in columns] for r in plan.rows]
    classes = ["gk-active" if r["configuration"] == chosen else "" for r in plan.rows]
    parts = [table([h for _, h in columns], rows, row_classes=classes)]
    if plan.skipped:
        parts.append("<div>skipped configurations</div>")
        parts.append(table(["configuration", "reason"], [[escape(s["configuration"]),
                                                          f"<span class='gk-note'>{escape(s['reason'])}</span>"]
                                                         for s in plan.skipped]))
    return "".join(parts)


def plan_html(plan: Any) -> str:
    """The figure as an inline PNG, the recommendation in words, and the table."""
    encoded = base64.b64encode(png_bytes(plan_figure(plan))).decode("ascii")
    choice = plan.recommend()
    shared = plan.shared
    work = (f"{shared.get('configurations', 0)} configurations from {shared.get('minimisations', 0)} "
            f"minimisations ({shared.get('runs', 0)} runs × {shared.get('geometries', 0)} geometries)")
    caution = ("Model energies in the chosen basis; device durations and error figures are illustrative.")
    return box(f"Plan: {work}", f"<div><img alt='plan frontier and curve' src='data:image/png;base64,{encoded}'/>"
               f"</div>", f"<p>{escape(choice.justification)}</p>", plan_table_html(plan),
               f"<div class='gk-note'>{escape(caution)}</div>")


def plan_widget(plan: Any) -> Any:
    """An ipywidgets box: the figure, the recommendation, and the table."""
    import ipywidgets as widgets

    image = widgets.Image(value=png_bytes(plan_figure(plan)), format="png")
    words = widgets.HTML(f"<p>{escape(plan.recommend().justification)}</p>")
    rows = widgets.HTML(box("Configurations", plan_table_html(plan)))
    return widgets.VBox([image, words, rows])
