"""Matplotlib drawings of runs and scans on plain Agg figures (no pyplot state, no GUI backend).

Every coloured element has a text label in a legend or beside it; colours come from :mod:`.palette`.
"""

from __future__ import annotations

import io
from typing import Any

import numpy as np
from matplotlib.ticker import MaxNLocator, NullLocator

from ..result import CHEMICAL_ACCURACY
from . import palette
from .series import AmplitudeSeries, EnergySeries

SMALLEST_SHOWN = 1e-4  # amplitudes below this sit at the left edge of the log axis


def new_figure(width: float = 11.0, height: float = 4.0, panels: int = 2) -> tuple[Any, list[Any]]:
    """An Agg-backed figure with ``panels`` axes side by side."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    figure = Figure(figsize=(width, height), dpi=90)
    figure.subplots_adjust(left=0.09 if panels > 1 else 0.16, right=0.95, bottom=0.14, top=0.9, wspace=0.45)
    FigureCanvasAgg(figure)
    axes = figure.subplots(1, panels, squeeze=False)[0]
    return figure, list(axes)


def png_bytes(figure: Any) -> bytes:
    """The figure as PNG bytes."""
    buffer = io.BytesIO()
    figure.savefig(buffer, format="png")
    return buffer.getvalue()


def draw_energy(ax: Any, series: EnergySeries) -> None:
    """Energy against iteration: exact reference line, chemical-accuracy band, baselines as labelled lines."""
    x = np.asarray(series.iterations, dtype=float)
    y = np.asarray(series.energies, dtype=float)
    span: list[float] = list(y)
    if series.reference is not None:
        ref = series.reference
        ax.axhspan(ref - CHEMICAL_ACCURACY, ref + CHEMICAL_ACCURACY, color=palette.BAND, alpha=0.18,
                   label="chemical accuracy, ±1.6 mHa")
        ax.axhline(ref, color=palette.EXACT, lw=1.6, label=f"exact reference {ref:.6f} Ha")
        span += [ref - 1.5 * CHEMICAL_ACCURACY, ref + 1.5 * CHEMICAL_ACCURACY]
    if len(y):
        bars = series.error_bars()
        if bars is not None:
            label = f"trial state (±1σ per iteration, last {1000 * bars[-1]:.2f} mHa)"
            ax.errorbar(x, y, yerr=bars, fmt="o-", ms=3, lw=1.2, color=palette.TRIAL,
                        ecolor=palette.SKY, capsize=2, label=label)
        else:
            ax.plot(x, y, "o-", ms=3, lw=1.4, color=palette.TRIAL, label="trial state")
    low, high = (min(span), max(span)) if span else (-1.0, 1.0)
    pad = 0.08 * (high - low) if high > low else 1e-3
    low, high = low - pad, high + pad
    hidden = [f"{name} {value:.4f}" for name, value in series.baselines.items() if not low <= value <= high]
    shown = {k: v for k, v in series.baselines.items() if low <= v <= high}
    for colour, (names, value) in zip(palette.BASELINES, _merge_close(shown, 0.04 * (high - low))):
        ax.axhline(value, color=colour, lw=1.1, ls=(0, (4, 3)))
        ax.annotate(", ".join(names), xy=(1.0, value), xycoords=("axes fraction", "data"), xytext=(3, 0),
                    textcoords="offset points", va="center", fontsize=8, color=palette.BLACK)
    if hidden:
        ax.text(0.01, 0.01, "outside view: " + ", ".join(hidden), transform=ax.transAxes, fontsize=7,
                color=palette.GREY, va="bottom")
    ax.set_ylim(low, high)
    ax.set_xlabel("iteration")
    ax.xaxis.set_major_locator(MaxNLocator(integer=True))
    ax.set_ylabel("energy / Ha")
    ax.set_title("Energy by iteration", fontsize=10, loc="left")
    ax.ticklabel_format(axis="y", useOffset=False)
    ax.grid(alpha=0.3)
    ax.legend(fontsize=7, loc="upper right")


def _merge_close(values: dict[str, float], tolerance: float) -> list[tuple[list[str], float]]:
    """Baselines closer than ``tolerance`` share one line and one label."""
    groups: list[tuple[list[str], float]] = []
    for name, value in sorted(values.items(), key=lambda item: item[1]):
        if groups and abs(value - groups[-1][1]) < tolerance:
            groups[-1][0].append(name)
        else:
            groups.append(([name], value))
    return groups


def draw_amplitudes(ax: Any, series: AmplitudeSeries) -> None:
    """|amplitude| of the leading determinants, trial state beside exact state, signed values written out."""
    n = len(series.labels)
    rows = np.arange(n)
    height = 0.38
    for offset, values, colour, hatch, name in (
        (-height / 2, series.trial, palette.TRIAL, "", "trial state"),
        (height / 2, series.exact, palette.EXACT, "///", "exact state"),
    ):
        sizes = np.maximum(np.abs(values), SMALLEST_SHOWN)
        ax.barh(rows + offset, sizes, height=height, color=colour, hatch=hatch, edgecolor="white", label=name)
        for row, size, value in zip(rows, sizes, values):
            ax.text(size * 1.15, row + offset, f"{value:+.4f}", va="center", fontsize=7)
    ax.set_xscale("log")
    ax.set_xlim(SMALLEST_SHOWN, 8.0)
    ax.xaxis.set_minor_locator(NullLocator())
    ax.set_yticks(rows, series.labels, fontfamily="monospace")
    ax.invert_yaxis()
    ax.set_xlabel("|amplitude| (signed value written beside each bar)")
    ax.set_title("Leading determinants (occupation per orbital: 2, a, b, 0)", fontsize=10, loc="left")
    ax.legend(fontsize=7, loc="lower right")
    ax.grid(axis="x", alpha=0.3)


def draw_scan(ax: Any, table: Any, label: str, baselines: tuple[str, ...] = ("hf",)) -> None:
    """Energy, exact reference and baselines against the scan value."""
    ax.plot(table["value"], table["reference"], "-", color=palette.EXACT, label="exact reference")
    for colour, name in zip(palette.BASELINES, baselines):
        if name in table:
            ax.plot(table["value"], table[name], ls=(0, (4, 3)), color=colour, label=name)
            flagged = _flagged(table, name)
            if flagged.any():  # points where the baseline failed a plausibility check
                ax.plot(table["value"][flagged], table[name][flagged], "x", ms=7, color=colour,
                        label=f"{name} (suspect)")
    ax.plot(table["value"], table["energy"], "o", color=palette.TRIAL, ms=5, label=label)
    ax.set_xlabel("scan value")
    ax.set_ylabel("energy / Ha")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8)


def _flagged(table: Any, name: str) -> Any:
    """Boolean column: the scan table's ``suspect`` entry of each point names ``name``."""
    if "suspect" not in table:
        return table["value"] != table["value"]
    return table["suspect"].fillna("").map(lambda text: name in [s.strip() for s in str(text).split(",")])


def run_figure(energy: EnergySeries, amplitudes: AmplitudeSeries | None) -> Any:
    """The two-panel picture of a run: energy by iteration and leading determinants."""
    figure, axes = new_figure(panels=2 if amplitudes is not None else 1,
                              width=11.0 if amplitudes is not None else 6.0)
    draw_energy(axes[0], energy)
    if amplitudes is not None:
        draw_amplitudes(axes[1], amplitudes)
    return figure
