"""``Pipeline.run(live=..., progress=...)``: feed a live view and/or a progress bar from the run's callback."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any


def run_watched(pipeline: Any, callback: Callable[[Any], None] | None, *, live: bool, progress: bool,
                initial_parameters: Any = None) -> Any:
    """Run ``pipeline``, showing a :class:`RunView` (``live``) and a tqdm bar (``progress``) as it goes.

    The view is displayed before the first iteration and updated, throttled, from each iteration record; at the
    end it holds the final figure, and the notebook output is refreshed so the saved file keeps that picture.
    """
    from .progress import RunProgress

    listeners: list[Callable[[Any], None]] = []
    view = handle = None
    if live:
        from IPython.display import display

        from .live import RunView

        view = RunView.for_pipeline(pipeline)
        handle = display(view, display_id=True)
        listeners.append(view.update)
    bar = RunProgress(pipeline.problem().reference.energy) if progress else None
    if bar is not None:
        listeners.append(bar.update)
    if callback is not None:
        listeners.append(callback)

    def each(record: Any) -> None:
        for listener in listeners:
            listener(record)

    try:
        result = pipeline.run(each, initial_parameters=initial_parameters)
    finally:
        if bar is not None:
            bar.close()
    if view is not None:
        view.finish(result)
        if handle is not None:
            handle.update(view)
    return result
