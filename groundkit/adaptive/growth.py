"""The growth loop: choose the pool operator of largest gradient, append it at zero, re-minimise everything.

Each step appends exp(theta G_k) after the current product (it acts last), starts the new parameter at zero and
every earlier one at its minimised value (a warm start: the step begins at the previous energy), and minimises
all of them. A step whose minimiser ends above that starting energy keeps the starting point instead, so
energies along the growth never rise. Energies in Hartree, gradients in Hartree per radian.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import numpy as np

from groundkit.adaptive.costs import GateCounter
from groundkit.adaptive.records import GrowthStep, Operator, operator_label, operator_record
from groundkit.adaptive.watch import Watch
from groundkit.energy_surface import EnergySurface
from groundkit.errors import ComponentError
from groundkit.minimisers import IterationRecord, MinimiserOutcome
from groundkit.sector.space import lowest_strings


@dataclass(frozen=True, eq=False)
class Growth:
    """What a growth produced: the steps, the final sequence and the pipeline of its fixed trial state.

    ``outcome`` holds the final parameters (radians) and energy (Hartree), every minimiser iteration of every step
    numbered consecutively, and the growth's stop reason and verdict; ``objective`` is the final sequence's.
    """

    steps: tuple[GrowthStep, ...]
    sequence: tuple[Operator, ...]
    pipeline: Any
    objective: EnergySurface
    measurement: Any
    outcome: MinimiserOutcome


def grow(
    pipeline: Any, *, callback: Callable[[IterationRecord], None] | None = None, initial_parameters: Any = None,
    on_step: Callable[[GrowthStep], None] | None = None, gate_counter: GateCounter | None = None,
) -> Growth:
    """Grow the pipeline's :class:`~groundkit.adaptive.Adaptive` trial state.

    Each sequence is evaluated as the pipeline with the fixed sequence as trial state, through the pipeline's
    estimator; pool gradients come from the pool's engine (exact, determinant space, for fermionic pools). The
    Adaptive's ``minimiser``, or else the pipeline's, re-minimises after each addition. ``callback`` gets every
    minimiser iteration (numbered across steps), ``on_step`` every :class:`GrowthStep`; ``initial_parameters``
    (radians) start ``start_from``; ``gate_counter(sequence, parameters)`` counts each step's two-qubit gates.

    Ctrl-C, or a callback raising KeyboardInterrupt or StopIteration, ends the growth after the current step's
    minimisation returns its best point; the result is then marked not converged.
    """
    components = pipeline.resolved_components()
    adaptive, estimator = components["trial_state"], components["estimator"]
    minimiser = adaptive.minimiser or components["minimiser"]
    problem = pipeline.problem()
    engine = adaptive.pool.engine(problem, lowest_strings(problem.n_alpha, problem.n_beta), components["mapping"])
    exact_energy = float(problem.reference.energy)
    watch = Watch(callback)
    sequence = list(adaptive.start_from)
    current = _Current(pipeline, estimator, engine, watch, sequence)
    theta = (np.zeros(len(sequence)) if initial_parameters is None
             else current.objective.check_parameters(initial_parameters))

    def minimise(start: np.ndarray, start_energy: float) -> tuple[np.ndarray, float, int, bool]:
        if start.size == 0:
            return start, start_energy, 0, True
        gradient = current.energy_and_gradient if current.measurement.provides_gradient else None
        outcome = minimiser.minimise(current.energy, start, energy_and_gradient=gradient, callback=watch.record)
        watch.finish_minimisation(outcome)
        if not outcome.energy <= start_energy:  # never step back from the warm start (NaN included)
            return start, start_energy, len(outcome.iterations), False
        return np.array(outcome.parameters), float(outcome.energy), len(outcome.iterations), outcome.converged

    def record(added: list[Operator], gradient: float | None, norm: float | None, result: tuple,
               started: float) -> GrowthStep:
        _, energy, iterations, converged = result
        step = GrowthStep(
            step=len(steps), operators=tuple(operator_record(op) for op in added),
            label=", ".join(operator_label(op) for op in added) if added else "reference",
            gradient=gradient, gradient_norm=norm, energy=energy, error=energy - exact_energy,
            parameters=len(sequence), two_qubit_gates=None if gate_counter is None else gate_counter(sequence, theta),
            iterations=iterations, minimiser_converged=converged, wall_time=time.perf_counter() - started,
        )
        steps.append(step)
        if on_step is not None:
            on_step(step)
        return step

    steps: list[GrowthStep] = []
    started = time.perf_counter()
    result = minimise(theta, float(current.measurement.energy(theta)))
    theta, energy = result[0], result[1]
    record(list(sequence), None, None, result, started)
    used = set(sequence)
    stop, done = "", False
    while not watch.stopped:
        started = time.perf_counter()
        try:
            gradients = engine.gradients(current.objective, theta)
            k, norm, stop, done = _choose(adaptive, engine.operators, gradients, used, len(sequence))
            if k is None:
                break
            chosen = engine.operators[k]
            current.switch(sequence + [chosen])
        except KeyboardInterrupt:
            watch.stopped = "interrupted (KeyboardInterrupt)"
            break
        sequence.append(chosen)
        used.add(chosen)
        previous = energy
        result = minimise(np.append(theta, 0.0), previous)
        theta, energy = result[0], result[1]
        record([chosen], float(gradients[k]), norm, result, started)
        if previous - energy < adaptive.energy_tolerance and not watch.stopped:
            stop, done = (f"energy change {previous - energy:.3g} Ha below energy_tolerance "
                          f"{adaptive.energy_tolerance:g} after step {len(steps) - 1}"), True
            break
    if watch.stopped:
        stop, done = f"{watch.stopped} during growth step {len(steps) - 1}", False
    if len(current.sequence) != len(sequence):  # interrupted while switching: go back to the grown sequence
        current.switch(sequence)
    outcome = MinimiserOutcome(parameters=theta, energy=energy, converged=done, stop_reason=stop,
                               iterations=tuple(watch.records), evaluations=watch.evaluations)
    return Growth(steps=tuple(steps), sequence=tuple(sequence), pipeline=current.pipeline,
                  objective=current.objective, measurement=current.measurement, outcome=outcome)


class _Current:
    """The pipeline, objective and measurement of the current sequence; energies guarded for Ctrl-C."""

    def __init__(self, pipeline: Any, estimator: Any, engine: Any, watch: Watch, sequence: list[Operator]):
        self.base, self.estimator, self.engine, self.watch = pipeline, estimator, engine, watch
        self.switch(sequence)

    def switch(self, sequence: list[Operator]) -> None:
        """Evaluate ``sequence`` from now on."""
        pipeline = self.base.trial_state(self.engine.trial_state(sequence))
        measurement = self.estimator.bind(pipeline)
        self.sequence, self.pipeline, self.measurement = list(sequence), pipeline, measurement
        self.objective: EnergySurface = pipeline.objective()

    def energy(self, theta: np.ndarray) -> float:
        return self.watch.guard(self.measurement.energy, theta)

    def energy_and_gradient(self, theta: np.ndarray) -> tuple[float, np.ndarray]:
        return self.watch.guard(self.measurement.energy_and_gradient, theta)


def _choose(adaptive: Any, operators: tuple, gradients: np.ndarray, used: set,
            length: int) -> tuple[int | None, float, str, bool]:
    """(operator index to add, pool gradient norm, "", False), or (None, norm, stop reason, converged or not)."""
    if len(gradients) != len(operators):
        raise ComponentError(f"the pool engine gave {len(gradients)} gradients for {len(operators)} operators")
    eligible = np.array([adaptive.repeats or op not in used for op in operators], dtype=bool)
    if not eligible.any():
        return None, 0.0, f"pool exhausted: every one of its {len(operators)} operators is in the sequence", False
    norm = float(np.linalg.norm(gradients[eligible]))
    if norm < adaptive.gradient_threshold:
        reason = f"pool gradient norm {norm:.3g} Ha/rad below gradient_threshold {adaptive.gradient_threshold:g}"
        return None, norm, reason, True
    if adaptive.max_operators is not None and length >= adaptive.max_operators:
        reason = f"operator cap reached: max_operators={adaptive.max_operators} (pool gradient norm {norm:.3g} Ha/rad)"
        return None, norm, reason, False
    return int(np.argmax(np.where(eligible, np.abs(gradients), -1.0))), norm, "", False
