"""One unit of work for an executor: a molecule, the pipeline's components, an optional warm start.

Tasks and their answers are plain data (frozen component dataclasses, a MoleculeSpec, lists and dicts), so the
same :func:`run_task` runs in this process, in a process pool or on a Dask worker. A task never raises: a
failure comes back as an error message and the scan goes on.
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from groundkit.molecule import MoleculeSpec

from .orbitals import Handover, match_orbitals, transfer_parameters

ROLES = ("active_space", "mapping", "trial_state", "estimator", "minimiser")


@dataclass(frozen=True)
class Task:
    """``components``: role -> component (None for the default); ``previous``: the molecule and handover of
    the point to warm-start from, or None for a cold start. ``extras``: names of extra figures to compute."""

    molecule: MoleculeSpec | None
    components: dict[str, Any]
    previous: tuple[MoleculeSpec, dict] | None = None
    extras: tuple[str, ...] = field(default=())
    builder_error: str | None = None


def pipeline_of(molecule: MoleculeSpec, components: dict[str, Any]) -> Any:
    """A Pipeline for ``molecule`` with the given components (None keeps the default)."""
    from groundkit.pipeline import Pipeline

    pipeline = Pipeline(molecule)
    for role in ROLES:
        component = components.get(role)
        if component is not None:
            pipeline = getattr(pipeline, role)(component)
    return pipeline


def components_of(pipeline: Any) -> dict[str, Any]:
    """The pipeline's chosen components by role, without the molecule (plain picklable data)."""
    chosen = pipeline.components
    return {role: chosen[role] for role in ROLES}


def active_orbitals(problem: Any) -> np.ndarray:
    """Active MO coefficients (n_ao, n_active) of a problem."""
    return np.array(problem.scf.mo_coeff[:, list(problem.active_orbitals.active)], dtype=float)


def handover_of(problem: Any, excitations: Any, parameter_index: Any, scale: Any, parameters: Any) -> Handover:
    """The handover of a finished point: its active orbitals, excitations and final parameters."""
    return Handover(
        orbitals=active_orbitals(problem),
        excitations=tuple((tuple(c), tuple(a)) for c, a in excitations),
        parameter_index=tuple(int(i) for i in parameter_index),
        scale=tuple(float(f) for f in scale),
        parameters=np.array(parameters, dtype=float),
    )


def _match(problem: Any, molecule: MoleculeSpec, previous: tuple[MoleculeSpec, dict]) -> tuple:
    """(handover, orbital match) with the previous point, or (None, reason) when they cannot be compared."""
    from groundkit.chemistry import cross_overlap

    old_molecule, data = previous
    handover = Handover.from_dict(data)
    new_orbitals = active_orbitals(problem)
    if (old_molecule.symbols != molecule.symbols or old_molecule.basis != molecule.basis
            or handover.orbitals.shape != new_orbitals.shape):
        return None, "cold (previous point has other atoms, basis or active space)"
    return handover, match_orbitals(handover.orbitals, new_orbitals, cross_overlap(old_molecule, molecule))


def _note(match: Any, carried: int, total: int) -> str:
    flips = sum(1 for s in match.signs if s < 0)
    moved = sum(1 for j, i in enumerate(match.old_of_new) if i != j)
    return f"warm ({carried}/{total} parameters carried, {flips} sign flips, {moved} orbitals moved)"


def _is_adaptive(trial_state: Any) -> bool:
    """An adaptive trial state grows its sequence during the run (it has ``start_from`` and ``continued``)."""
    return hasattr(trial_state, "start_from") and hasattr(trial_state, "continued")


def _run_fixed(pipeline: Any, task: Task, answer: dict) -> Any:
    objective = pipeline.objective()
    plan = objective.plan
    initial = None
    if task.previous is not None:
        handover, match = _match(objective.problem, task.molecule, task.previous)
        if handover is None:
            answer["start"] = match
        else:
            initial, carried = transfer_parameters(
                handover, match, [(e.creators, e.annihilators) for e in plan.excitations], plan.parameter_index,
                plan.scale, plan.n_parameters)
            answer["start"], answer["orbital_match"] = _note(match, carried, plan.n_parameters), match.quality
    result = pipeline.run(initial_parameters=initial)
    answer["handover"] = handover_of(objective.problem, [(e.creators, e.annihilators) for e in plan.excitations],
                                     plan.parameter_index, plan.scale, result.parameters).to_dict()
    return result


def _run_adaptive(pipeline: Any, task: Task, answer: dict) -> Any:
    """An adaptive state starts from the previous point's grown sequence, mapped onto the new orbitals."""
    from dataclasses import replace

    from groundkit.adaptive import grown_sequence

    trial_state = pipeline.resolved_components()["trial_state"]
    problem = pipeline.problem()
    initial = None
    if task.previous is not None and "strings" in task.previous[1]:
        # a qubit pool grew Pauli strings: orbital matching does not apply; reuse the strings and their angles
        data = task.previous[1]
        pipeline = pipeline.trial_state(replace(trial_state, start_from=list(data["strings"])))
        initial = np.asarray(data["parameters"], dtype=float)
        answer["start"] = f"warm ({len(data['strings'])} Pauli-string operators reused, no orbital matching)"
    elif task.previous is not None:
        handover, match = _match(problem, task.molecule, task.previous)
        if handover is None:
            answer["start"] = match
        else:
            sequence, initial = map_sequence(handover, match)
            pipeline = pipeline.trial_state(replace(trial_state, start_from=sequence))
            answer["start"] = _note(match, len(sequence), len(sequence)).replace("parameters", "operators")
            answer["orbital_match"] = match.quality
    result = pipeline.run(initial_parameters=initial)
    grown = list(grown_sequence(result))
    if grown and isinstance(grown[0], str):
        answer["handover"] = {"strings": grown, "parameters": [float(x) for x in result.parameters]}
        return result
    sequence = [(e.creators, e.annihilators) for e in grown]
    answer["handover"] = handover_of(problem, sequence, range(len(sequence)), [1.0] * len(sequence),
                                     result.parameters).to_dict()
    return result


def map_sequence(handover: Handover, match: Any) -> tuple[list, np.ndarray]:
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
    ``orbital_match``, ``handover``, ``molecule``, ``wall_time`` (s) and any ``extras`` asked for."""
    from groundkit.persistence import result_to_dict

    started = time.perf_counter()
    answer: dict[str, Any] = {"result": None, "error": task.builder_error, "start": "cold", "orbital_match": None,
                              "handover": None, "molecule": task.molecule, "wall_time": 0.0, "extras": {}}
    if task.molecule is None:
        return answer
    try:
        pipeline = pipeline_of(task.molecule, task.components)
        if _is_adaptive(pipeline.resolved_components()["trial_state"]):
            result = _run_adaptive(pipeline, task, answer)
        else:
            result = _run_fixed(pipeline, task, answer)
        answer["result"] = result_to_dict(result)
        for name in task.extras:
            answer["extras"][name] = _extra(pipeline, result, name)
    except Exception as err:  # recorded, never raised: one failed point must not end a scan
        answer["error"] = f"{type(err).__name__}: {err}"
    answer["wall_time"] = time.perf_counter() - started
    return answer


def _extra(pipeline: Any, result: Any, name: str) -> Any:
    """Optional figures for comparison grids; None where the pipeline cannot give them."""
    if name == "shot_budget":
        estimator = pipeline.resolved_components()["estimator"]
        budget = getattr(pipeline, "shot_budget", None)
        if getattr(estimator, "exact", True) or budget is None:
            return None
        from groundkit.result import CHEMICAL_ACCURACY

        try:
            return int(budget(precision=CHEMICAL_ACCURACY, parameters=result.parameters))
        except Exception:  # the qubit layer may not offer it for this configuration
            return None
    raise ValueError(f"unknown extra figure {name!r}; accepted: 'shot_budget'")
