"""One minimisation from a pipeline to a RunResult."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import replace
from typing import TYPE_CHECKING, Any

import numpy as np

from .provenance import provenance
from .resources import resources_for
from .result import History, ReferenceRecord, RunResult

if TYPE_CHECKING:  # pragma: no cover
    from .pipeline import Pipeline


def run_pipeline(
    pipeline: Pipeline, callback: Callable[[Any], None] | None = None, *, initial_parameters: Any = None
) -> RunResult:
    """Minimise the pipeline's objective with its minimiser and estimator; nothing computed is lost on Ctrl-C."""
    from .minimisers import MinimiserOutcome

    components = pipeline.resolved_components()
    problem = pipeline.problem()
    objective = pipeline.objective()
    estimator, minimiser = components["estimator"], components["minimiser"]
    x0 = objective.initial_parameters() if initial_parameters is None else objective.check_parameters(
        initial_parameters)

    def energy(theta: np.ndarray) -> float:
        return estimator.energy(objective, theta)

    def energy_and_gradient(theta: np.ndarray) -> tuple[float, np.ndarray]:
        return estimator.energy_and_gradient(objective, theta)

    gradient = energy_and_gradient if estimator.provides_gradient else None
    if objective.n_parameters == 0:
        outcome = MinimiserOutcome(parameters=x0, energy=energy(x0), converged=True,
                                   stop_reason="the trial state has no parameters", iterations=(), evaluations=1)
    else:
        outcome = minimiser.minimise(energy, x0, energy_and_gradient=gradient, callback=callback)
    if not np.isfinite(outcome.energy):  # interrupted before the first evaluation finished
        outcome = replace(outcome, energy=energy(outcome.parameters))
    return build_result(pipeline, problem, objective, outcome, components)


def build_result(pipeline: Pipeline, problem: Any, objective: Any, outcome: Any, components: dict) -> RunResult:
    """Assemble a RunResult from a minimiser outcome (final state analysed exactly)."""
    theta = np.asarray(outcome.parameters, dtype=float)
    state = objective.state(theta)
    reference = problem.reference
    norm = float(np.vdot(state, state).real)
    overlap = float(np.vdot(reference.ci, state).real)
    phase = -1.0 if overlap < 0 else 1.0  # global phase: overlap with the exact state non-negative
    records = outcome.iterations
    history = History(
        energies=tuple(float(r.energy) for r in records),
        gradient_norms=tuple(None if r.gradient_norm is None else float(r.gradient_norm) for r in records),
        wall_times=tuple(float(r.wall_time) for r in records),
        evaluations=tuple(int(r.evaluations) for r in records),
    )
    baselines = {name: problem.baselines[name] for name in problem.baselines}
    return RunResult(
        energy=float(outcome.energy),
        parameters=theta.copy(),
        parameter_labels=tuple(getattr(objective, "parameter_labels", ())),
        history=history,
        converged=bool(outcome.converged),
        stop_reason=str(outcome.stop_reason),
        reference=ReferenceRecord(energy=reference.energy, multiplicity=reference.multiplicity,
                                  spin_square=reference.spin_square, amplitudes=reference.amplitudes,
                                  method=reference.method),
        baselines=baselines,
        amplitudes={label: phase * a for label, a in objective.amplitudes(theta).items()},
        fidelity=overlap * overlap / norm,
        spin_square=float(objective.spin_square(theta)),
        particle_number=float(problem.n_electrons) * norm,
        resources=resources_for(pipeline, objective, theta),
        provenance=provenance(pipeline.configuration(), components),
    )
