"""One minimisation from a pipeline to a RunResult."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import replace
from typing import TYPE_CHECKING, Any

import numpy as np

from .baselines import DeferredFields
from .energy_surface import EnergySurface
from .estimators import ExactEstimator, Measurement
from .provenance import provenance
from .resources import resources_for
from .result import History, ReferenceRecord, RunResult
from .threads import problem_threads
from .workspace import workspace

if TYPE_CHECKING:  # pragma: no cover
    from .minimisers import MinimiserOutcome
    from .pipeline import Pipeline
    from .problem import Problem


def run_pipeline(
    pipeline: Pipeline, callback: Callable[[Any], None] | None = None, *, initial_parameters: Any = None
) -> RunResult:
    """Minimise the pipeline's objective with its minimiser and estimator; nothing computed is lost on Ctrl-C."""
    from .adaptive import Adaptive, run_adaptive

    components = pipeline.resolved_components()
    if isinstance(components["trial_state"], Adaptive):  # grown during the run: no fixed objective
        return run_adaptive(pipeline, callback, initial_parameters)
    problem = pipeline.problem()
    with problem_threads(problem):  # one BLAS/OpenMP thread for small problems (see groundkit.threads)
        return _run(pipeline, problem, components, callback, initial_parameters)


def _run(pipeline: Pipeline, problem: Problem, components: dict, callback: Callable[[Any], None] | None,
         initial_parameters: Any) -> RunResult:
    from .minimisers import MinimiserOutcome

    objective = pipeline.objective()
    measurement, minimiser = components["estimator"].bind(pipeline), components["minimiser"]
    x0 = objective.initial_parameters() if initial_parameters is None else objective.check_parameters(
        initial_parameters)
    gradient = measurement.energy_and_gradient if measurement.provides_gradient else None

    def minimise() -> MinimiserOutcome:
        if objective.n_parameters == 0:
            return MinimiserOutcome(parameters=x0, energy=measurement.energy(x0), converged=True,
                                    stop_reason="the trial state has no parameters", iterations=(), evaluations=1)
        notes = _ErrorNotes(callback, measurement)  # each record gets the standard error of its own estimate
        found = minimiser.minimise(measurement.energy, x0, energy_and_gradient=gradient, callback=notes)
        return replace(found, iterations=tuple(replace(r, standard_error=notes.errors.get(int(r.iteration)))
                                               if int(r.iteration) in notes.errors else r
                                               for r in found.iterations))

    if callback is None and type(components["estimator"]) is ExactEstimator:
        # exact energies do not depend on the mapping: another mapping's run reuses the same minimisation (only a
        # converged one: an interrupted or budget-limited search runs again)
        key = (id(objective), components["estimator"], minimiser, x0.tobytes())
        outcome = workspace().fetch("minimisation", key, minimise, owner=objective,
                                    valid=lambda found: found.converged and np.isfinite(found.energy))
    else:
        outcome = minimise()
    if not np.isfinite(outcome.energy):  # interrupted before the first evaluation finished
        outcome = replace(outcome, energy=measurement.energy(outcome.parameters))
    return build_result(pipeline, problem, objective, outcome, components, measurement)


def _error_at(measurement: Measurement | None, record: Any) -> float | None:
    """The standard error (Ha) of the energy recorded at an iteration: the record's own, else the measurement's
    estimate at those parameters (0 for exact energies), else None."""
    if getattr(record, "standard_error", None) is not None:
        return float(record.standard_error)
    if measurement is None:
        return None
    return measurement.error_at(record.parameters)


class _ErrorNotes:
    """Wraps the callback: each record gets the standard error of the estimate that gave its energy (the latest
    estimate at its parameters when the iteration closes), kept by iteration for the history."""

    def __init__(self, callback: Callable[[Any], None] | None, measurement: Measurement) -> None:
        self.callback, self.measurement = callback, measurement
        self.errors: dict[int, float | None] = {}

    def __call__(self, record: Any) -> None:
        error = _error_at(self.measurement, record)
        self.errors[int(record.iteration)] = error
        if self.callback is not None:
            self.callback(replace(record, standard_error=error))


def build_result(
    pipeline: Pipeline, problem: Problem, objective: EnergySurface, outcome: MinimiserOutcome, components: dict,
    measurement: Measurement | None = None,
) -> RunResult:
    """Assemble a RunResult from a minimiser outcome (final state analysed exactly).

    With a statistical ``measurement`` the reported energy is a fresh estimate at the final parameters, with its
    standard error; the exact energy of those parameters is kept beside it.
    """
    theta = np.asarray(outcome.parameters, dtype=float)
    errors = tuple(_error_at(measurement, r) for r in outcome.iterations)  # before the fresh final estimate
    if measurement is not None and not measurement.exact:
        final_energy, standard_error = measurement.estimate(theta)
    else:
        final_energy, standard_error = float(outcome.energy), 0.0
    state = objective.state(theta)
    reference = problem.reference
    norm = float(np.vdot(state, state).real)
    overlap_value = complex(np.vdot(objective.exact_state(), state))
    overlap = abs(overlap_value)
    # global phase: overlap with the exact state real and non-negative (real parts of amplitudes are reported)
    phase = overlap_value.conjugate() / overlap if overlap > 0 else 1.0
    records = outcome.iterations
    history = History(
        energies=tuple(float(r.energy) for r in records),
        gradient_norms=tuple(None if r.gradient_norm is None else float(r.gradient_norm) for r in records),
        wall_times=tuple(float(r.wall_time) for r in records),
        evaluations=tuple(int(r.evaluations) for r in records),
        standard_errors=errors,
    )
    return RunResult(
        energy=float(final_energy),
        standard_error=float(standard_error),
        exact_energy=float(objective.energy(theta)),
        noise=None if measurement is None else measurement.record(),
        parameters=theta.copy(),
        parameter_labels=tuple(objective.parameter_labels),
        history=history,
        converged=bool(outcome.converged),
        stop_reason=str(outcome.stop_reason),
        reference=ReferenceRecord(energy=reference.energy, multiplicity=reference.multiplicity,
                                  spin_square=reference.spin_square, amplitudes=reference.amplitudes,
                                  method=reference.method),
        **DeferredFields(problem.baselines).mappings(),  # values, suspect ones, notes: computed when first read
        amplitudes={label: float(np.real(phase * a)) for label, a in objective.amplitudes(theta).items()},
        fidelity=overlap * overlap / norm,
        spin_square=float(objective.spin_square(theta)),
        particle_number=float(objective.particle_number(theta)),
        resources=resources_for(pipeline, objective, theta),
        provenance=provenance(pipeline.configuration(), {**components, "device": pipeline.device_profile}),
        active_space_error=None if problem.known_active_space_error is None  # only when already computed
        else problem.known_active_space_error.to_dict(),
    )
