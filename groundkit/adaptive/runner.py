"""An adaptive run from a pipeline to a RunResult: grow, then analyse the grown state like any fixed one."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import replace
from typing import TYPE_CHECKING, Any

from groundkit.adaptive.costs import gate_counter
from groundkit.adaptive.growth import grow
from groundkit.provenance import provenance

if TYPE_CHECKING:  # pragma: no cover
    from groundkit.pipeline import Pipeline
    from groundkit.result import RunResult


def run_adaptive(
    pipeline: Pipeline, callback: Callable[[Any], None] | None = None, initial_parameters: Any = None
) -> RunResult:
    """Grow the pipeline's :class:`~groundkit.adaptive.Adaptive` trial state and return a RunResult.

    The result's parameters, amplitudes and resources describe the grown state (they are built from the pipeline
    with the fixed grown sequence as trial state); ``result.growth`` holds one plain-data record per growth step
    (see :class:`~groundkit.adaptive.records.GrowthStep`) and ``history`` every minimiser iteration of every step,
    numbered consecutively. The provenance keeps the Adaptive configuration and adds the grown sequence under
    ``configuration["grown_trial_state"]``.
    """
    from groundkit.runner import build_result

    components = pipeline.resolved_components()
    growth = grow(pipeline, callback=callback, initial_parameters=initial_parameters,
                  gate_counter=gate_counter(pipeline))
    result = build_result(growth.pipeline, pipeline.problem(), growth.objective, growth.outcome, components,
                          growth.measurement)
    configuration = dict(pipeline.configuration(), grown_trial_state=repr(growth.pipeline.components["trial_state"]))
    return replace(result, growth=tuple(step.to_dict() for step in growth.steps),
                   provenance=provenance(configuration, {**components, "device": pipeline.device_profile}))
