"""Notebook views of groundkit: live run view, amplitude chart, configuration explorer, rich HTML, PNG files
and progress bars. Submodules that need ipywidgets are imported only when used."""

from __future__ import annotations

from typing import Any

from . import providers  # noqa: F401  (registers the displays that lower layers call through groundkit.upcalls)

_LAZY = {
    "RunView": ("live", "RunView"),
    "Explorer": ("explorer", "Explorer"),
    "RunProgress": ("progress", "RunProgress"),
    "EnergySeries": ("series", "EnergySeries"),
    "AmplitudeSeries": ("series", "AmplitudeSeries"),
    "save_result_png": ("plotting", "save_result_png"),
    "save_scan_png": ("plotting", "save_scan_png"),
}

__all__ = sorted([*_LAZY, "explore"])


def explore(pipeline: Any) -> Any:
    """A configuration explorer widget for ``pipeline`` (which needs a molecule): selectors for every component,
    a run button, the live view and a table with one row per run. Needs the ``notebook`` extra."""
    from .explorer import Explorer

    return Explorer(pipeline)


def __getattr__(name: str) -> Any:
    if name not in _LAZY:
        raise AttributeError(f"module 'groundkit.widgets' has no attribute {name!r}")
    from importlib import import_module

    module, attribute = _LAZY[name]
    return getattr(import_module(f"{__name__}.{module}"), attribute)
