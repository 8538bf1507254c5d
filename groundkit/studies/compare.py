"""Comparison grids: every combination of mappings, trial states, estimators and minimisers on one molecule."""

from __future__ import annotations

import itertools
from collections.abc import Sequence
from typing import TYPE_CHECKING, Any

from groundkit import components as _c
from groundkit.persistence import result_from_dict
from groundkit.sizing import check_study

from .errors import ScanInputError
from .executors import run_chains, runner_for
from .work import Task, components_of, run_task

if TYPE_CHECKING:  # pragma: no cover
    from groundkit.pipeline import Pipeline

RESOURCE_COLUMNS = ("qubits", "parameters", "pauli_terms", "measurement_groups", "two_qubit_gates", "depth")


def _options(name: str, given: Sequence[Any] | None, convert: Any, own: Any) -> list[Any]:
    if given is None:
        return [own]
    if isinstance(given, (str, bytes)) or not isinstance(given, Sequence):
        raise ScanInputError(f"{name}={given!r}; give a list of {name}, e.g. {name}=[...]")
    if not given:
        raise ScanInputError(f"{name} is empty; give at least one, or leave it out to keep the pipeline's own")
    return [convert(g) for g in given]


def _variant(pipeline: Pipeline, combination: tuple) -> Pipeline:
    """The pipeline with one grid combination's components (None keeps the pipeline's default)."""
    mapping, trial_state, estimator, minimiser = combination
    out = pipeline
    for method, component in ((out.mapping, mapping), (out.trial_state, trial_state), (out.estimator, estimator),
                              (out.minimiser, minimiser)):
        if component is not None:
            out = getattr(out, method.__name__)(component)
    return out


def compare(
    pipeline: Pipeline,
    *,
    mappings: Sequence[Any] | None = None,
    trial_states: Sequence[Any] | None = None,
    estimators: Sequence[Any] | None = None,
    minimisers: Sequence[Any] | None = None,
    executor: Any = None,
    progress: bool = False,
    noise_threshold: dict[str, Any] | bool | None = None,
    active_space_error: bool = False,
) -> Any:
    """Run every combination on the pipeline's molecule and active space; returns a pandas DataFrame.

    ``progress=True`` shows a tqdm bar, one step per finished combination.

    A list left out keeps the pipeline's own component. Columns: mapping, trial_state, estimator, minimiser,
    energy, reference, error (Ha), error_mha, standard_error (Ha), verdict ('within', 'outside' or 'uncertain':
    chemical accuracy, 1.6 mHa, judged at two standard errors; common practice, no single source),
    within_chemical_accuracy (True only when the verdict is 'within'), the resource counts, shot_budget (shots
    for a 1.6 mHa standard error where the estimator samples and the pipeline can tell, else None), converged,
    iterations, wall_time (s), failure. ``active_space_error=True`` adds ``active_space_error_mha`` and
    ``active_space_against``: what the shared active space loses against the full problem (computed once, here;
    see :mod:`groundkit.space_error`), so each row shows both the trial state's error inside the space and the
    space's own.

    ``noise_threshold=True`` (or a dict of :func:`groundkit.noise_threshold` options, e.g. ``{"mitigation":
    ["zne"], "errors": ErrorFigures(...)}``) adds, for each finished row, the noise threshold at the row's final
    parameters: columns threshold_two_qubit (largest two-qubit error rate within the target, every rate scaled
    together), threshold_factor, threshold_confidence and threshold_note (why there is none, or a refusal).

    A combination that groundkit refuses or cannot solve (a GroundkitError) becomes a row whose ``failure`` says
    why; any other exception is a programming error and is raised.
    """
    import pandas as pd

    molecule = pipeline.components["molecule"]
    if molecule is None:
        raise ScanInputError("compare needs a pipeline with a molecule; use Pipeline(molecule) or .molecule(spec)")
    own = components_of(pipeline)
    grid = list(itertools.product(
        _options("mappings", mappings, _c.as_mapping, own["mapping"]),
        _options("trial_states", trial_states, _c.as_trial_state, own["trial_state"]),
        _options("estimators", estimators, _c.as_estimator, own["estimator"]),
        _options("minimisers", minimisers, _c.as_minimiser, own["minimiser"]),
    ))
    check_study([_variant(pipeline, combination) for combination in grid], "this comparison grid")
    answers: dict[int, dict] = {}

    def make_task(index: int, _previous: dict | None) -> Task:
        mapping, trial_state, estimator, minimiser = grid[index]
        chosen = {**own, "mapping": mapping, "trial_state": trial_state, "estimator": estimator,
                  "minimiser": minimiser}
        return Task(molecule=molecule, components=chosen, extras=("shot_budget",))

    bar = None
    if progress:
        from tqdm.auto import tqdm

        bar = tqdm(total=len(grid), desc="combinations", unit="run", mininterval=0.5)

    def finished(k: int, answer: dict) -> None:
        answers[k] = answer
        if bar is not None:
            bar.update(1)

    try:
        with runner_for(executor) as runner:
            run_chains(runner, [[k] for k in range(len(grid))], make_task, finished, run_task)
    finally:
        if bar is not None:
            bar.close()
    defaults = pipeline.resolved_components()
    rows = []
    for k, combination in enumerate(grid):
        answer = answers[k]
        row: dict[str, Any] = {}
        for role, component in zip(("mapping", "trial_state", "estimator", "minimiser"), combination):
            row[role] = repr(component if component is not None else defaults[role])
        result = None if answer["result"] is None else result_from_dict(answer["result"], source=f"grid row {k}")
        row["energy"] = result.energy if result else None
        row["reference"] = result.reference.energy if result else None
        row["error"] = result.error if result else None
        row["error_mha"] = 1000 * result.error if result else None
        row["standard_error"] = result.standard_error if result else None
        row["verdict"] = result.verdict if result else None
        row["within_chemical_accuracy"] = result.within_chemical_accuracy if result else None
        for name in RESOURCE_COLUMNS:
            row[name] = getattr(result.resources, name) if result else None
        row["shot_budget"] = answer["extras"].get("shot_budget")
        row["converged"] = bool(result.converged) if result else False
        row["iterations"] = result.iterations if result else 0
        row["wall_time"] = float(answer["wall_time"])
        row["failure"] = answer["error"]
        if noise_threshold:
            row.update(_threshold_columns(_variant(pipeline, combination), result, noise_threshold))
        rows.append(row)
    if active_space_error:
        space = pipeline.problem().active_space_error
        for row in rows:
            row["active_space_error_mha"] = space.mha
            row["active_space_against"] = space.against
    return pd.DataFrame(rows)


def _threshold_columns(pipeline: Pipeline, result: Any, options: dict[str, Any] | bool) -> dict[str, Any]:
    """The noise-threshold columns of one grid row (None values and a note when it cannot be found)."""
    from groundkit.errors import GroundkitError
    from groundkit.noise.threshold import noise_threshold

    empty = {"threshold_two_qubit": None, "threshold_factor": None, "threshold_confidence": None}
    if result is None:
        return {**empty, "threshold_note": "no result"}
    try:
        found = noise_threshold(pipeline, result=result, **({} if options is True else dict(options)))
    except GroundkitError as err:
        return {**empty, "threshold_note": str(err)}
    return {"threshold_two_qubit": found.two_qubit, "threshold_factor": found.factor,
            "threshold_confidence": found.confidence, "threshold_note": found.reason}
