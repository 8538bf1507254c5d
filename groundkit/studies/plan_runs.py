"""Several scans of one curve run together: the chains of every scan share one executor, so a plan's
minimisations run in parallel across configurations while each scan keeps its own warm starts and checkpoint.

This is :func:`groundkit.studies.scan.run_scan` for many pipelines at once: the same tasks (:func:`work.run_task`),
the same chaining and resume (:func:`scan.chains_for`, :func:`scan.resume_plan`), the same checkpoint directories
(one per scan), so each scan's table equals the one ``Pipeline.scan`` gives, on any executor.
"""

from __future__ import annotations

import os
from collections.abc import Callable, Sequence
from contextlib import ExitStack
from typing import Any

from groundkit.molecule import MoleculeSpec

from .checkpoint import CheckpointStore
from .executors import run_chains, runner_for
from .scan import _point, chains_for, resume_plan, warm_start_label
from .scan_persistence import molecule_to_dict
from .scan_result import ScanPoint, ScanResult
from .work import ROLES, Task, components_of, run_task


def run_scans(pipelines: Sequence[Any], molecules: list[MoleculeSpec], values: list[float], *,
              checkpoints: Sequence[str | os.PathLike | None] | None = None, executor: Any = None,
              warm_start: bool | int = True, on_point: Callable[[int, ScanPoint], None] | None = None,
              ) -> list[ScanResult]:
    """One ScanResult per pipeline over the same ``molecules`` (at ``values``); ``checkpoints[k]`` is scan k's
    checkpoint directory (None: none). ``on_point(k, point)`` is called as each point finishes."""
    n = len(values)
    chains = chains_for(n, warm_start)
    label = warm_start_label(warm_start)
    checkpoints = list(checkpoints) if checkpoints is not None else [None] * len(pipelines)
    components = [components_of(p) for p in pipelines]
    configurations = []
    for pipeline in pipelines:
        resolved = pipeline.resolved_components()
        configurations.append({role: repr(resolved[role]) for role in ROLES})
    with ExitStack() as stack:
        points: list[dict[int, ScanPoint]] = []
        earlier: list[dict[int, tuple[str, ...]]] = []
        todo: list[list[tuple[int, int]]] = []
        starts: dict[tuple[int, int], dict] = {}
        stores: list[CheckpointStore | None] = []
        for k, directory in enumerate(checkpoints):
            store = None
            if directory is not None:
                description = {**configurations[k], "warm_start": label,
                               "points": [[v, molecule_to_dict(m)] for v, m in zip(values, molecules)]}
                store = stack.enter_context(CheckpointStore(directory, description))
            stores.append(store)
            finished = store.finished() if store is not None else {}
            points.append(finished)
            earlier.append(store.earlier_failures if store is not None else {})
            runs, first = resume_plan(chains, finished, warm_start)
            todo += [[(k, i) for i in run] for run in runs]
            starts.update({(k, i): start for i, start in first.items()})

        def make_task(item: tuple[int, int], previous: dict | None) -> Task:
            k, index = item
            if previous is None:
                previous = starts.get(item)
            handover = None
            if warm_start is not False and previous is not None and previous.get("handover") is not None:
                handover = (previous["molecule"], previous["handover"])
            return Task(molecule=molecules[index], components=components[k], previous=handover)

        def on_answer(item: tuple[int, int], answer: dict) -> None:
            k, index = item
            point = _point(index, values[index], molecules[index], answer, earlier[k].get(index, ()))
            if stores[k] is not None:
                stores[k].write(point)
            points[k][index] = point
            if on_point is not None:
                on_point(k, point)

        if todo:
            with runner_for(executor) as runner:
                run_chains(runner, todo, make_task, on_answer, run_task)
    return [ScanResult(points=tuple(points[k][i] for i in range(n)), configuration=configurations[k],
                       warm_start=label) for k in range(len(pipelines))]
