"""RunView: a widget that follows a minimisation (energy by iteration, leading determinants) and keeps the final
picture. Redraws are throttled so that drawing never takes more than a small share of a run's time."""

from __future__ import annotations

import base64
import html
import time
from collections.abc import Callable
from typing import Any

import ipywidgets as widgets

from ..result import CHEMICAL_ACCURACY, verdict_text
from .figures import png_bytes, run_figure
from .series import AmplitudeSeries, EnergySeries, known_baselines

MIN_INTERVAL = 0.25   # seconds between redraws, at least
DRAW_SHARE = 0.2      # and at most this share of the time is spent drawing


class RunView(widgets.VBox):
    """Live view of one run: a status line above a two-panel figure held as a PNG image widget.

    ``update(record)`` takes each ``IterationRecord`` (use it as the run's callback); ``finish(result)`` draws
    the final figure from the result. ``energy`` and ``amplitudes`` hold the plotted data.
    """

    def __init__(self, reference: float | None = None, baselines: dict | None = None,
                 exact_amplitudes: dict[str, float] | None = None,
                 amplitudes_of: Callable[[Any], dict[str, float]] | None = None, title: str = "",
                 suspect_baselines: Any = ()) -> None:
        self.energy = EnergySeries(reference=reference,
                                   baselines=known_baselines(baselines or {}, suspect_baselines))
        self.exact_amplitudes = dict(exact_amplitudes or {})
        self.amplitudes: AmplitudeSeries | None = (
            AmplitudeSeries.from_amplitudes({}, self.exact_amplitudes) if self.exact_amplitudes else None)
        self.amplitudes_of = amplitudes_of
        self.title = title
        self.redraws = 0
        self.drawing_time = 0.0
        self._last_draw = float("-inf")
        self._last_parameters: Any = None
        self.status = widgets.HTML(value=self._status_html("waiting for the first iteration"))
        self.picture = widgets.Image(format="png", layout=widgets.Layout(width="100%", max_width="1000px"))
        super().__init__(children=[self.status, self.picture])
        self.add_class("groundkit-run-view")

    @classmethod
    def from_result(cls, result: Any) -> RunView:
        """The final view of a finished run."""
        view = cls(reference=result.reference.energy, baselines=result.baselines,
                   exact_amplitudes=result.reference.amplitudes, suspect_baselines=result.suspect_baselines)
        view.finish(result)
        return view

    @classmethod
    def for_pipeline(cls, pipeline: Any) -> RunView:
        """A view primed with the pipeline's exact reference and baselines, following its trial state."""
        problem = pipeline.problem()
        reference = problem.reference
        from ..adaptive import Adaptive

        amplitudes_of = None
        if not isinstance(pipeline.resolved_components()["trial_state"], Adaptive):  # grown during the run
            amplitudes_of = pipeline.objective().amplitudes
        record = problem.baselines.result_fields()
        return cls(reference=reference.energy, baselines=record["baselines"],
                   exact_amplitudes=reference.amplitudes, amplitudes_of=amplitudes_of,
                   title=problem.molecule.name or problem.molecule.formula,
                   suspect_baselines=record["suspect_baselines"])

    # feeding ----------------------------------------------------------------------------------------------------
    def update(self, record: Any) -> None:
        """Record one iteration; redraw when the throttle allows."""
        self.energy.add(record)
        self._last_parameters = record.parameters
        now = time.perf_counter()
        interval = max(MIN_INTERVAL, self.drawing_time / max(self.redraws, 1) / DRAW_SHARE)
        if now - self._last_draw >= interval:
            self._follow_amplitudes()
            self.redraw(self._running_status())

    def finish(self, result: Any) -> None:
        """Replace the running series with the result's own history, amplitudes and standard error; redraw."""
        self.energy = EnergySeries.from_result(result)
        self.amplitudes = AmplitudeSeries.from_result(result)
        self.redraw(self._final_status(result))

    # drawing ----------------------------------------------------------------------------------------------------
    def redraw(self, status: str | None = None) -> None:
        """Draw the figure now (and the status line, if given)."""
        start = time.perf_counter()
        figure = run_figure(self.energy, self.amplitudes)
        self.picture.value = png_bytes(figure)
        if status is not None:
            self.status.value = self._status_html(status)
        self._last_draw = time.perf_counter()
        self.drawing_time += self._last_draw - start
        self.redraws += 1

    def png(self) -> bytes:
        """The current picture as PNG bytes."""
        return bytes(self.picture.value)

    def _repr_mimebundle_(self, **kwargs: Any) -> dict:
        bundle = super()._repr_mimebundle_(**kwargs) or {}
        data = bundle[0] if isinstance(bundle, tuple) else bundle
        # for readers without widget support: the same picture as a plain image
        if self.png():
            data["image/png"] = base64.b64encode(self.png()).decode("ascii")
        data["text/plain"] = f"RunView: {self.status.value and _strip(self.status.value)}"
        return bundle

    def _follow_amplitudes(self) -> None:
        if self.amplitudes_of is None or self._last_parameters is None or not self.exact_amplitudes:
            return
        try:
            trial = dict(self.amplitudes_of(self._last_parameters))
        except Exception:  # a trial state whose size changes during the run: keep the last picture
            self.amplitudes_of = None
            return
        exact = self.exact_amplitudes
        overlap = sum(complex(trial[k]).real * exact[k] for k in exact if k in trial)
        sign = -1.0 if overlap < 0 else 1.0
        self.amplitudes = AmplitudeSeries.from_amplitudes(
            {k: sign * complex(v).real for k, v in trial.items()}, exact)

    def _running_status(self) -> str:
        e = self.energy
        text = f"iteration {e.iterations[-1]}: energy {e.energies[-1]:.8f} Ha"
        if e.reference is not None:
            text += f", error {1000 * (e.energies[-1] - e.reference):+.3f} mHa"
        return text + " (running)"

    @staticmethod
    def _final_status(result: Any) -> str:
        verdict = verdict_text(result.verdict)
        stderr = f" ± {1000 * result.standard_error:.3f}" if result.standard_error else ""
        return (f"finished after {result.iterations} iterations: energy {result.energy:.8f} Ha, error "
                f"{1000 * result.error:+.3f}{stderr} mHa, {verdict} ({1000 * CHEMICAL_ACCURACY:.1f} mHa); "
                f"{'converged' if result.converged else 'not converged'}")

    def _status_html(self, text: str) -> str:
        title = f"<b>{html.escape(self.title)}</b> " if self.title else ""
        return f"<div style='font-family:sans-serif;font-size:13px'>{title}{html.escape(text)}</div>"


def _strip(markup: str) -> str:
    import re

    return html.unescape(re.sub(r"<[^>]+>", "", markup))
