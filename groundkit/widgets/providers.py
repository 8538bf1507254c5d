"""The notebook displays that lower layers reach through :mod:`groundkit.upcalls` (``_repr_html_``, ``show``,
``plot``, ``run(live=True)``); each imports its widget module only when called, so ipywidgets and matplotlib load
only when used."""

from __future__ import annotations

from typing import Any

from groundkit.upcalls import provides


@provides("html:molecule")
def molecule_html(molecule: Any) -> str:
    from .html import molecule_html as html

    return html(molecule)


@provides("html:problem")
def problem_html(problem: Any) -> str:
    from .html import problem_html as html

    return html(problem)


@provides("html:result")
def result_html(result: Any) -> str:
    from .html import result_html as html

    return html(result)


@provides("html:scan")
def scan_html(scan: Any) -> str:
    from .html import scan_html as html

    return html(scan)


@provides("show:result")
def show_result(result: Any) -> Any:
    from .live import RunView

    return RunView.from_result(result)


@provides("png:result")
def result_png(result: Any, path: Any) -> str:
    from .plotting import save_result_png

    return save_result_png(result, path)


@provides("png:scan")
def scan_png(scan: Any, path: Any, baselines: tuple[str, ...]) -> str:
    from .plotting import save_scan_png

    return save_scan_png(scan, path, baselines)


@provides("run:watched")
def run_watched(pipeline: Any, callback: Any, **options: Any) -> Any:
    from .running import run_watched as run

    return run(pipeline, callback, **options)


@provides("html:plan")
def plan_html(plan: Any) -> str:
    from .plan_view import plan_html as html

    return html(plan)


@provides("show:plan")
def show_plan(plan: Any) -> Any:
    from .plan_view import plan_widget

    return plan_widget(plan)


@provides("png:plan")
def plan_png(plan: Any, path: Any) -> str:
    from .plan_view import save_plan_png

    return save_plan_png(plan, path)
