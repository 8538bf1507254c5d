"""``gk.plan``: every crossed configuration of a curve, costed on devices, with the cheapest that holds the target.

Work is shared (docs/plan.md): the chemistry and exact reference of a geometry are computed once (the problem
cache); one minimisation scan runs per *run key* (active space, trial state, minimiser, and the mapping only where
the energies depend on it: qubit trial states, qubit pools, and tapering, which keeps the symmetry-conserving
excitations); every mapping, grouping, device and mitigation of that key reuses its parameters. Scans warm-start
along the curve and run through the study executors with one checkpoint directory per run key.
"""

from __future__ import annotations

import hashlib
import itertools
import os
from dataclasses import dataclass
from typing import Any

import numpy as np

from groundkit.errors import GroundkitError
from groundkit.sizing import check_study

from .executors import run_chains, runner_for
from .plan_figures import FigureTask, figure_task, gradient_estimates
from .plan_input import (
    ROLES,
    PlanInputError,
    PlanLimits,
    plan_choices,
    plan_geometries,
    plan_limits,
    plan_target,
)
from .plan_result import PlanResult, RunCurve
from .work import pipeline_of

HOUR_US = 3.6e9  # microseconds per hour


@dataclass(frozen=True)
class Configuration:
    """One crossed choice: role → component (None: groundkit's default)."""

    active_space: Any
    mapping: Any
    trial_state: Any
    minimiser: Any
    grouping: str
    device: Any
    mitigation: Any

    def run_components(self) -> dict[str, Any]:
        return {"active_space": self.active_space, "mapping": self.mapping, "trial_state": self.trial_state,
                "minimiser": self.minimiser}


def plan(geometries: Any, choices: Any, target: float = 1.6e-3, limits: Any = None, *,
         noise_threshold: bool | None = None, executor: Any = None, checkpoint: str | os.PathLike | None = None,
         warm_start: bool | int = True, progress: bool = False) -> PlanResult:
    """Cross the ``choices`` over the ``geometries`` and cost every configuration; see docs/plan.md.

    ``geometries``: ``(geometry function, values)`` or a list of MoleculeSpec (one molecule, one curve).
    ``choices``: role → candidates for ``active_space``, ``mapping``, ``tapering`` (True/False applied to each
    mapping), ``trial_state``, ``minimiser``, ``grouping``, ``device`` (device profiles) and ``mitigation``.
    ``target``: the accuracy (Ha) to hold at every geometry (default chemical accuracy, 1.6 mHa; common practice,
    no single source); shot budgets are for a standard error of ``target``.
    ``limits``: caps (``qubits``, ``two_qubit_gates``, ``shots_per_energy``, ``device_hours``,
    ``noise_threshold``). ``noise_threshold=True`` adds the noise-threshold column (a noise-threshold limit asks
    for it too). ``executor``, ``checkpoint`` (a directory; rerunning resumes) and ``warm_start`` as for scans.

    Energies are exact-estimator minimisations of model energies in the chosen basis; shots, gates and device
    time are predictions for those states (device durations are illustrative)."""
    target = plan_target(target)
    limits_ = plan_limits(limits)
    if noise_threshold is not None and not isinstance(noise_threshold, bool):
        raise PlanInputError(f"noise_threshold={noise_threshold!r}; accepted: True, False or None")
    if noise_threshold is False and limits_.noise_threshold is not None:
        raise PlanInputError(f"limits contradict each other: noise_threshold=False, but limits ask for a noise "
                             f"threshold of at least {limits_.noise_threshold!r}; drop one of them")
    wants_noise = bool(noise_threshold) or limits_.noise_threshold is not None
    geometry, values = plan_geometries(geometries)
    options = plan_choices(choices)
    if not wants_noise and any(m is not None for m in options["mitigation"]):
        raise PlanInputError("choices give mitigations, which only change the noise threshold; ask for it with "
                             "noise_threshold=True (or a noise_threshold limit), or leave 'mitigation' out")
    molecules = [geometry(v) for v in values]
    configurations = cross(options)
    return _evaluate(configurations, options, molecules, values, target, limits_, wants_noise, executor,
                     checkpoint, warm_start, progress)


def cross(options: dict[str, list[Any]]) -> list[Configuration]:
    """Every combination of the choices (tapering applied to each mapping), duplicates removed, in order."""
    from groundkit.mapping import QubitMapping

    mappings = []
    for mapping in options["mapping"]:
        base = mapping if mapping is not None else QubitMapping()
        tapers = options["tapering"] or [None]
        for taper in tapers:
            chosen = base if taper is None else type(base)(**{**base.options(), "taper": taper})
            if chosen not in mappings:
                mappings.append(chosen)
    out: list[Configuration] = []
    for a, m, t, mi, g, d, mit in itertools.product(options["active_space"], mappings, options["trial_state"],
                                                    options["minimiser"], options["grouping"], options["device"],
                                                    options["mitigation"]):
        configuration = Configuration(a, m, t, mi, g, d, mit)
        if configuration not in out:
            out.append(configuration)
    return out


def mapping_dependent(trial_state: Any) -> bool:
    """True when a trial state's energies depend on the mapping (qubit trial states, adaptive qubit pools)."""
    from groundkit.adaptive import Adaptive, PauliStringPool, QubitPool
    from groundkit.qubit_states import QubitTrialState
    from groundkit.trial_states import UCCSD

    state = trial_state if trial_state is not None else UCCSD()
    if isinstance(state, QubitTrialState):
        return True
    return isinstance(state, Adaptive) and isinstance(state.pool, (QubitPool, PauliStringPool))


def run_key(configuration: Configuration, kept: tuple[str, ...] = ()) -> tuple:
    """What a minimisation depends on (see the module docstring); ``kept``: the parameter labels a tapered
    register keeps (tapered mappings that keep the same excitations share a run)."""
    from groundkit.mapping import QubitMapping

    mapping = configuration.mapping if configuration.mapping is not None else QubitMapping()
    if mapping_dependent(configuration.trial_state):
        mapped: Any = repr(mapping)
    else:
        mapped = ("tapered", kept) if mapping.taper else "untapered"
    return (repr(configuration.active_space), repr(configuration.trial_state), repr(configuration.minimiser),
            repr(mapped))


def prepare(molecule: Any, configuration: Configuration) -> tuple[tuple, str]:
    """(run key, why the configuration cannot run or ''): its objective and register at the first geometry."""
    from groundkit.adaptive import Adaptive

    try:
        pipeline = pipeline_of(molecule, configuration.run_components())
        pipeline.check_size(("scf", "integrals", "engine"), "this configuration")
        growing = isinstance(pipeline.resolved_components()["trial_state"], Adaptive)
        pipeline.encoding()
        # an adaptive state has no objective before it grows; on a tapered register it runs per mapping
        kept = (repr(configuration.mapping),) if growing else tuple(pipeline.objective().parameter_labels)
    except GroundkitError as err:
        return run_key(configuration), f"{type(err).__name__}: {err}"
    tapered = pipeline.resolved_components()["mapping"].taper
    return run_key(configuration, kept if tapered else ()), ""


def _evaluate(configurations: list[Configuration], options: dict[str, list[Any]], molecules: list[Any],
              values: list[float], target: float, limits: PlanLimits, wants_noise: bool, executor: Any,
              checkpoint: str | os.PathLike | None, warm_start: bool | int, progress: bool) -> PlanResult:
    # invalid combinations: the first geometry must give the objective and register of each configuration
    keys: dict[tuple, int] = {}
    runs: list[Configuration] = []
    run_of: dict[int, int] = {}  # id(configuration) -> run
    skipped: dict[tuple[int, Any], str] = {}
    prepared: dict[tuple, tuple[tuple, str]] = {}
    for configuration in configurations:
        own = (run_key(configuration), repr(configuration.mapping))
        if own not in prepared:
            prepared[own] = prepare(molecules[0], configuration)
        key, why = prepared[own]
        if key not in keys:
            keys[key] = len(runs)
            runs.append(configuration)
        run_of[id(configuration)] = keys[key]
        skipped.setdefault((keys[key], configuration.mapping), why)
    key_of = {k: key for key, k in keys.items()}
    valid_runs = sorted({k for (k, _), why in skipped.items() if not why})
    pipelines = [pipeline_of(molecules[0], runs[k].run_components()) for k in valid_runs]
    check_study([p.molecule(m) for p in pipelines for m in molecules], "this plan")
    directories = None
    if checkpoint is not None:
        directories = [os.path.join(os.fspath(checkpoint), "runs", _directory_name(key_of[k], k)) for k in valid_runs]
    bar = _bar(progress, len(valid_runs) * len(molecules), "plan minimisations")
    try:
        scans = run_scans_for(pipelines, molecules, values, directories, executor, warm_start, bar)
    finally:
        if bar is not None:
            bar.close()
    scan_of = dict(zip(valid_runs, scans))
    figures = _figures(configurations, run_of, skipped, scan_of, molecules, options, target, wants_noise, executor)
    rows = []
    for configuration in configurations:
        k = run_of[id(configuration)]
        why = skipped[(k, configuration.mapping)]
        if why:
            continue
        rows.append(_row(configuration, k, scan_of[k], figures[(k, configuration.mapping)], options, target,
                         limits, wants_noise))
    _unique_labels(rows)
    skipped_rows = [{"configuration": label_of(c, options), "reason": skipped[(run_of[id(c)], c.mapping)]}
                    for c in configurations if skipped[(run_of[id(c)], c.mapping)]]
    curves = tuple(RunCurve(index=k, label=_run_label(runs[k]), scan=scan_of[k]) for k in valid_runs)
    shared = {"configurations": len(rows), "runs": len(valid_runs), "geometries": len(molecules),
              "minimisations": len(valid_runs) * len(molecules),
              "minimisations_unshared": len(rows) * len(molecules),
              "figure_tasks": sum(1 for pair, why in skipped.items() if not why) * len(molecules)}
    return PlanResult(rows=tuple(rows), curves=curves, skipped=tuple(skipped_rows), target=target,
                      limits=limits.as_dict(), noise_threshold=wants_noise, shared=shared)


def run_scans_for(pipelines: list[Any], molecules: list[Any], values: list[float], directories: Any,
                  executor: Any, warm_start: bool | int, bar: Any) -> list[Any]:
    from .plan_runs import run_scans

    def tick(_k: int, _point: Any) -> None:
        if bar is not None:
            bar.update(1)

    if not pipelines:
        return []
    return run_scans(pipelines, molecules, values, checkpoints=directories, executor=executor,
                     warm_start=warm_start, on_point=tick)


def _directory_name(key: tuple, k: int) -> str:
    digest = hashlib.sha256(repr(key).encode()).hexdigest()[:12]
    return f"run-{k:03d}-{digest}"


def _figures(configurations: list[Configuration], run_of: dict[int, int], skipped: dict, scan_of: dict,
             molecules: list[Any], options: dict[str, list[Any]], target: float, wants_noise: bool,
             executor: Any) -> dict[tuple[int, Any], list[dict | None]]:
    """(run, mapping) → per geometry the figure answer (None where the run failed), through the executor."""
    from groundkit.adaptive import Adaptive, grown_trial_state

    tasks: list[tuple[tuple[int, Any], int, FigureTask]] = []
    out: dict[tuple[int, Any], list[dict | None]] = {}
    mitigations = tuple(options["mitigation"]) if wants_noise else None
    for configuration in configurations:
        pair = (run_of[id(configuration)], configuration.mapping)
        if skipped[pair] or pair in out:
            continue
        out[pair] = [None] * len(molecules)
        scan = scan_of[pair[0]]
        for index, point in enumerate(scan.points):
            if point.result is None:
                continue
            components = configuration.run_components()
            if isinstance(components["trial_state"], Adaptive):
                components = {**components, "trial_state": grown_trial_state(point.result)}
            tasks.append((pair, index, FigureTask(
                molecule=molecules[index], components=components,
                parameters=tuple(float(x) for x in point.result.parameters), groupings=tuple(options["grouping"]),
                devices=tuple(options["device"]), target=target, mitigations=mitigations)))

    def done(item: int, answer: dict) -> None:
        pair, index, _ = tasks[item]
        out[pair][index] = answer

    if tasks:
        with runner_for(executor) as runner:
            run_chains(runner, [[k] for k in range(len(tasks))], lambda k, _p: tasks[k][2], done, figure_task)
    return out


def _short(component: Any) -> str:
    """A component's class name when it has its default options, else its repr."""
    if component is None:
        return "default"
    name = getattr(component, "name", None)
    if isinstance(name, str) and name:
        return name
    try:
        if type(component)() == component:
            return type(component).__name__
    except (TypeError, ValueError):  # a class that needs options: its repr says them
        pass
    return repr(component)


def _mapping_short(mapping: Any) -> str:
    from groundkit.mapping import QubitMapping

    mapping = mapping if mapping is not None else QubitMapping()
    return mapping.name + (" (tapered)" if mapping.taper else "")


def role_texts(configuration: Configuration) -> dict[str, str]:
    """Readable text of every role of a configuration (the table's role columns)."""
    return {"active_space": repr(configuration.active_space) if configuration.active_space is not None
            else "full space", "mapping": _mapping_short(configuration.mapping),
            "trial_state": _short(configuration.trial_state) if configuration.trial_state is not None else "UCCSD",
            "minimiser": _short(configuration.minimiser) if configuration.minimiser is not None else "BFGS",
            "grouping": configuration.grouping,
            "device": _short(configuration.device) if configuration.device is not None else "logical circuit",
            "mitigation": "none" if configuration.mitigation is None else _short(configuration.mitigation)}


def label_of(configuration: Configuration, options: dict[str, list[Any]]) -> str:
    """The configuration's label: the texts of the roles that vary in this plan, joined by ' · '."""
    texts = role_texts(configuration)
    varied = [role for role in ROLES if role != "tapering" and (len(options[role]) > 1 or (
        role == "mapping" and len(options["tapering"]) > 1))]
    return " · ".join(texts[role] for role in varied if role in texts) or texts["trial_state"]


def _run_label(configuration: Configuration) -> str:
    texts = role_texts(configuration)
    return " · ".join(texts[r] for r in ("active_space", "trial_state", "minimiser", "mapping"))


def _row(configuration: Configuration, run: int, scan: Any, figures: list[dict | None],
         options: dict[str, list[Any]], target: float, limits: PlanLimits, wants_noise: bool) -> dict[str, Any]:
    """One table row (plain data; see :attr:`PlanResult.table`)."""
    row: dict[str, Any] = {"configuration": label_of(configuration, options), **role_texts(configuration),
                           "run": run}
    device_index = options["device"].index(configuration.device)
    mitigation_index = options["mitigation"].index(configuration.mitigation)
    failures = []
    errors, hours, notes = [], 0.0, []
    worst: dict[str, Any] = {"qubits": None, "two_qubit_gates": None, "depth": None, "swaps": None,
                             "shots_per_energy": None, "shot_time_us": None}
    evaluations = estimates = 0
    thresholds: list[float | None] = []
    space_errors: list[float] = []
    pipeline = pipeline_of(scan.points[0].molecule, configuration.run_components())
    per_gradient = gradient_estimates(pipeline)
    uses_gradient = bool(getattr(pipeline.resolved_components()["minimiser"], "uses_gradient", False))
    for point, answer in zip(scan.points, figures):
        if point.result is None:
            failures.append(f"no minimisation at value {point.value:g} ({point.failure})")
            continue
        result = point.result
        errors.append(result.error)
        if answer is None or answer["error"]:
            failures.append(f"no figures at value {point.value:g} ({None if answer is None else answer['error']})")
            continue
        device = answer["devices"][device_index]
        shots = answer["shots"].get(configuration.grouping)
        if shots is None:
            failures.append(f"no shot budget at value {point.value:g} "
                            f"({answer['shot_notes'].get(configuration.grouping, '')})")
        if device["two_qubit_gates"] is None:
            failures.append(f"no circuit on the device at value {point.value:g} ({device['note']})")
        for name, value in (("qubits", answer["qubits"]), ("two_qubit_gates", device["two_qubit_gates"]),
                            ("depth", device["depth"]), ("swaps", device["swaps"]), ("shots_per_energy", shots),
                            ("shot_time_us", device["shot_time_us"])):
            if value is not None and (worst[name] is None or value > worst[name]):
                worst[name] = value
        # at least one estimate per point: its final energy (a state without parameters is measured once)
        point_evaluations = max(1, int(result.history.evaluations[-1]) if result.history.evaluations else 0)
        per_evaluation = 1 + (per_gradient * len(result.parameters) if uses_gradient else 0)
        evaluations += point_evaluations
        estimates += point_evaluations * per_evaluation
        if shots is not None and device["shot_time_us"] is not None:
            hours += point_evaluations * per_evaluation * shots * device["shot_time_us"] / HOUR_US
        if device["note"] and device["note"] not in notes:
            notes.append(device["note"])
        if wants_noise:
            value, note = answer["noise"][device_index][mitigation_index]
            thresholds.append(value)
            if note and note not in notes:
                notes.append(note)
        if answer.get("active_space_error") is not None:
            space_errors.append(float(answer["active_space_error"]))
    if result_growth(scan):
        notes.append("adaptive: gradients costed at the final parameter count; pool-gradient measurements not "
                     "counted")
    complete = not failures
    abs_errors = np.abs(np.array(errors, dtype=float))
    worst_index = int(np.argmax(abs_errors)) if len(abs_errors) else None
    ok_values = [p.value for p in scan.points if p.result is not None]
    row.update({
        "worst_error_mha": float(1000 * abs_errors.max()) if len(abs_errors) else None,
        "worst_geometry": None if worst_index is None else float(ok_values[worst_index]),
        "non_parallelity_mha": float(1000 * (max(errors) - min(errors))) if errors else None,
        **worst,
        "evaluations": evaluations,
        "energy_estimates": estimates,
        "device_hours": float(hours) if complete else None,
    })
    if wants_noise:
        row["noise_threshold"] = None if not thresholds or any(t is None for t in thresholds) else min(thresholds)
    row["active_space_error_mha"] = 1000 * max(space_errors, key=abs) if space_errors else None
    meets_target = complete and bool(len(abs_errors)) and bool(np.all(abs_errors <= target))
    reasons = list(failures)
    if not failures:
        above = [f"{v:g}" for v, e in zip(ok_values, abs_errors) if e > target]
        if above:
            reasons.append(f"misses {1000 * target:.3g} mHa at {len(above)} of {len(ok_values)} geometries "
                           f"(values {', '.join(above)}; worst {row['worst_error_mha']:.3g} mHa)")
    broken = limit_breaches(row, limits)
    reasons += broken
    row.update({"meets_target": bool(meets_target), "within_limits": complete and not broken,
                "meets": bool(meets_target and complete and not broken), "reason": "; ".join(reasons),
                "notes": "; ".join(notes)})
    return row


def _unique_labels(rows: list[dict[str, Any]]) -> None:
    """Number repeated labels (two candidates that read alike, e.g. devices of one name): 'label #2', ..."""
    seen: dict[str, int] = {}
    for row in rows:
        label = row["configuration"]
        seen[label] = seen.get(label, 0) + 1
        if seen[label] > 1:
            row["configuration"] = f"{label} #{seen[label]}"


def result_growth(scan: Any) -> bool:
    return any(p.result is not None and p.result.growth for p in scan.points)


def limit_breaches(row: dict[str, Any], limits: PlanLimits) -> list[str]:
    """The limits a row breaks, in words."""
    out = []
    for name, words, unit in (("qubits", "qubits", ""), ("two_qubit_gates", "two-qubit gates", ""),
                              ("shots_per_energy", "shots per energy", ""), ("device_hours", "device time", " h")):
        cap = getattr(limits, name)
        value = row.get(name)
        if cap is not None and value is not None and value > cap:
            out.append(f"{words} {value:.4g}{unit} above the limit {cap:g}{unit}")
    if limits.noise_threshold is not None:
        value = row.get("noise_threshold")
        if value is None:
            out.append("noise threshold not available, so the noise-threshold limit cannot be checked")
        elif value < limits.noise_threshold:
            out.append(f"noise threshold {value:.3g} below the required {limits.noise_threshold:g}")
    return out


def _bar(progress: bool, total: int, what: str) -> Any:
    if not progress or total == 0:
        return None
    from tqdm.auto import tqdm

    return tqdm(total=total, desc=what, unit="point", mininterval=0.5)
