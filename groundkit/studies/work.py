"""One unit of work for an executor: a molecule, the pipeline's components, an optional warm start.

Tasks and their answers are plain data (frozen component dataclasses, a MoleculeSpec, lists and dicts), so the
same :func:`run_task` runs in this process, in a process pool or on a Dask worker. A task sees its trial state
only through the objective protocol (:class:`groundkit.energy_surface.EnergySurface`): warm starts go through its
``warm_start`` and ``handover``.

Failures: a :class:`~groundkit.errors.GroundkitError` (bad input, no convergence, a size limit) comes back as the
point's error message and the study goes on; any other exception is a programming error and is raised, so it
cannot hide as a row of data.

Ctrl-C: the minimisers turn a KeyboardInterrupt into a partial, not-converged result. A task does not pass such a
result on as a finished point: it raises KeyboardInterrupt again, so the study stops and the point is computed
again on a resume.
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field, replace
from typing import TYPE_CHECKING, Any

import numpy as np

from groundkit.adaptive import Adaptive, grown_sequence, grown_trial_state
from groundkit.energy_surface import WarmStart, handover_kind
from groundkit.errors import GroundkitError
from groundkit.molecule import MoleculeSpec
from groundkit.orbitals.continuity import active_overlap, casscf_guide, jump_message
from groundkit.persistence import result_to_dict
from groundkit.pipeline import Pipeline
from groundkit.result import CHEMICAL_ACCURACY

from .orbitals import Handover, OrbitalMatch, previous_match, warm_note

if TYPE_CHECKING:  # pragma: no cover
    from groundkit.pipeline import Pipeline
    from groundkit.result import RunResult

ROLES = ("active_space", "mapping", "trial_state", "estimator", "minimiser")
INTERRUPTED = "interrupted (KeyboardInterrupt)"  # how the minimisers and adaptive growth word a Ctrl-C stop


@dataclass(frozen=True)
class Task:
    """``components``: role -> component (None for the default); ``previous``: the molecule and handover of
    the point to warm-start from, or None for a cold start. ``extras``: names of extra figures to compute."""

    molecule: MoleculeSpec | None
    components: dict[str, Any]
    previous: tuple[MoleculeSpec, dict] | None = None
    extras: tuple[str, ...] = field(default=())
    builder_error: str | None = None


def pipeline_of(molecule: MoleculeSpec, components: dict[str, Any]) -> Pipeline:
    """A Pipeline for ``molecule`` with the given components (None keeps the default)."""

    pipeline = Pipeline(molecule)
    for role in (*ROLES, "device"):
        component = components.get(role)
        if component is not None:
            pipeline = getattr(pipeline, role)(component)
    return pipeline


def components_of(pipeline: Pipeline) -> dict[str, Any]:
    """The pipeline's chosen components by role, without the molecule (plain picklable data)."""
    chosen = pipeline.components
    return {role: chosen[role] for role in (*ROLES, "device")}


def _run_fixed(pipeline: Pipeline, task: Task, answer: dict) -> RunResult:
    """A fixed trial state: its objective warm-starts from the previous point's handover and hands over its own.
    CASSCF orbitals start from the previous point's, and a jump to another solution is reported."""
    data = task.previous[1] if task.previous is not None else None
    if data is None or data.get("casscf_orbitals") is None:
        return _run_fixed_in(pipeline, task, answer)
    previous, orbitals = task.previous[0], np.asarray(data["casscf_orbitals"], dtype=float)
    with casscf_guide(previous, orbitals):
        result = _run_fixed_in(pipeline, task, answer)
    space = pipeline.problem().active_orbitals
    if space.mo_coeff is not None and space.mo_coeff.shape == orbitals.shape:
        overlap = active_overlap(previous, orbitals, task.molecule, space.mo_coeff, len(space.core),
                                 len(space.active))
        answer["orbital_jump"] = jump_message(overlap)
    return result


def _run_fixed_in(pipeline: Pipeline, task: Task, answer: dict) -> RunResult:
    objective = pipeline.objective()
    start = WarmStart.cold() if task.previous is None else objective.warm_start(*task.previous)
    answer["start"], answer["orbital_match"] = start.note, start.orbital_match
    result = pipeline.run(initial_parameters=start.parameters)
    answer["handover"] = objective.handover(result.parameters)
    return result


def _run_adaptive(pipeline: Pipeline, task: Task, answer: dict) -> RunResult:
    """An adaptive state starts from the previous point's grown sequence, and hands over the one it grew."""
    start = WarmStart.cold()
    if task.previous is not None:
        pipeline, start = continued_growth(pipeline, *task.previous)
    answer["start"], answer["orbital_match"] = start.note, start.orbital_match
    result = pipeline.run(initial_parameters=start.parameters)
    answer["handover"] = growth_handover(pipeline, result)
    return result


def growth_handover(pipeline: Pipeline, result: RunResult) -> dict[str, Any]:
    """The handover of an adaptive run: its grown sequence's objective's handover, plus the Pauli strings for a
    qubit pool (whose grown trial state is PauliRotations of them)."""

    grown = pipeline.trial_state(grown_trial_state(result)).objective()
    handover = grown.handover(result.parameters)
    strings = [op for op in grown_sequence(result) if isinstance(op, str)]
    return {**handover, "strings": strings} if strings else handover


def continued_growth(pipeline: Pipeline, previous: MoleculeSpec, data: dict[str, Any]) -> tuple[Pipeline, WarmStart]:
    """The pipeline whose Adaptive starts from the previous point's grown sequence, and the starting angles.

    Pauli strings act on qubits and are reused as they are; fermionic excitations are rewritten over the new
    active orbitals after matching them by overlap, their angles multiplied by the phases they touch."""
    adaptive = pipeline.resolved_components()["trial_state"]
    kind = handover_kind(data)
    if kind == "parameter-reuse" and "strings" in data:
        strings = list(data["strings"])
        start = WarmStart(np.asarray(data["parameters"], dtype=float),
                          f"warm ({len(strings)} Pauli-string operators reused, no orbital matching)")
        return pipeline.trial_state(replace(adaptive, start_from=strings)), start
    if kind != "orbital-matching":
        return pipeline, WarmStart.cold(f"previous point hands over by {kind}, an adaptive state cannot use it")
    found = previous_match(pipeline.problem(), previous, data)
    if isinstance(found, str):
        return pipeline, WarmStart.cold(found)
    handover, match = found
    sequence, angles = map_sequence(handover, match)
    start = WarmStart(angles, warm_note(match, len(sequence), len(sequence), "operators"), match.quality)
    return pipeline.trial_state(replace(adaptive, start_from=sequence)), start


def map_sequence(handover: Handover, match: OrbitalMatch) -> tuple[list, np.ndarray]:
    """The handover's excitations rewritten over the new orbitals (same order) and their angles times the
    product of the orbital phases they touch (radians)."""
    new_of_old = {old: new for new, old in enumerate(match.old_of_new)}
    sequence, angles = [], []
    for (creators, annihilators), angle in zip(handover.excitations, handover.angles()):
        indices = list(creators) + list(annihilators)
        mapped = [2 * new_of_old[p // 2] + p % 2 for p in indices]
        phase = int(np.prod([match.signs[p // 2] for p in mapped]))
        sequence.append((tuple(mapped[: len(creators)]), tuple(mapped[len(creators):])))
        angles.append(angle * phase)
    return sequence, np.array(angles, dtype=float)


def run_task(task: Task) -> dict[str, Any]:
    """Run one point; returns a plain dict: ``result`` (RunResult dict or None), ``error``, ``start``,
    ``orbital_match``, ``handover``, ``molecule``, ``wall_time`` (s) and any ``extras`` asked for.

    A GroundkitError becomes ``error`` (``"ClassName: message"``); any other exception propagates, and so does
    a Ctrl-C, also when the minimiser caught it and stopped early (see the module docstring)."""

    started = time.perf_counter()
    answer: dict[str, Any] = {"result": None, "error": task.builder_error, "start": "cold", "orbital_match": None,
                              "handover": None, "molecule": task.molecule, "wall_time": 0.0, "extras": {}}
    if task.molecule is None:
        return answer
    try:
        pipeline = pipeline_of(task.molecule, task.components)
        if isinstance(pipeline.resolved_components()["trial_state"], Adaptive):
            result = _run_adaptive(pipeline, task, answer)
        else:
            result = _run_fixed(pipeline, task, answer)
        if INTERRUPTED in result.stop_reason:  # a partial result of a Ctrl-C: not a finished point
            raise KeyboardInterrupt(f"Ctrl-C during the point {task.molecule!r}: {result.stop_reason}")
        answer["result"] = result_to_dict(result)
        for name in task.extras:
            answer["extras"][name] = _extra(pipeline, result, name)
    except GroundkitError as err:  # recorded: one point the library refuses or cannot solve must not end a scan
        answer["error"] = f"{type(err).__name__}: {err}"
    answer["wall_time"] = time.perf_counter() - started
    return answer


def _extra(pipeline: Pipeline, result: RunResult, name: str) -> int | None:
    """Optional figures for comparison grids; None where the pipeline cannot give them."""
    if name == "shot_budget":
        if pipeline.resolved_components()["estimator"].exact:
            return None

        try:
            return int(pipeline.shot_budget(precision=CHEMICAL_ACCURACY, parameters=result.parameters))
        except GroundkitError:  # e.g. a register above the statevector limit: the run stands, the figure is None
            return None
    raise ValueError(f"unknown extra figure {name!r}; accepted: 'shot_budget'")
