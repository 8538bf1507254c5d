"""Scans: run a pipeline at every geometry of a user's function, optionally warm-started, checkpointed, in parallel.

Warm start and executors. A warm start passes each point's parameters to the next, so it makes the scan a chain
that must run in order. ``warm_start`` decides the chaining, never the executor, so every executor gives the
same table:

- ``True``: one chain along the whole scan (points run one after another, on any executor);
- an integer ``k``: ``k`` contiguous chains, each warm-started inside itself, which run in parallel;
- ``False``: every point cold and independent, as parallel as the executor allows.
"""

from __future__ import annotations

import math
import numbers
import warnings
from collections.abc import Callable, Iterable
from contextlib import ExitStack
from typing import Any

from groundkit.errors import OrbitalJumpWarning
from groundkit.molecule import MoleculeSpec
from groundkit.persistence import result_from_dict
from groundkit.sizing import check_study
from groundkit.upcalls import provides

from .checkpoint import CheckpointStore
from .errors import ScanInputError
from .executors import run_chains, runner_for
from .scan_persistence import molecule_to_dict
from .scan_result import ScanPoint, ScanResult
from .work import ROLES, Task, components_of, run_task


def scan_values(values: Iterable[Any]) -> list[float]:
    """The scan values as floats; ``ScanInputError`` for none, or for one that is not a finite real number."""
    try:
        items = list(values)
    except TypeError:
        raise ScanInputError(f"values {values!r} is not a sequence; give the scan values, e.g. [0.6, 0.7, 0.8]") \
            from None
    if not items:
        raise ScanInputError("values is empty; give at least one scan value, e.g. numpy.linspace(0.5, 2.0, 16)")
    out = []
    for k, v in enumerate(items):
        if isinstance(v, bool) or not isinstance(v, numbers.Real) or not math.isfinite(float(v)):
            raise ScanInputError(f"scan value {k} is {v!r}; every value must be a finite real number")
        out.append(float(v))
    return out


def build_molecules(geometry: Callable[[float], Any], values: list[float]) -> list[tuple[MoleculeSpec | None, str]]:
    """(molecule, failure) per value. A builder that raises records a failure; one that returns something other
    than a MoleculeSpec is a mistake in the scan and raises ``ScanInputError``."""
    if not callable(geometry):
        raise ScanInputError(f"geometry {geometry!r} is not callable; give a function value -> MoleculeSpec")
    out: list[tuple[MoleculeSpec | None, str]] = []
    for value in values:
        try:
            molecule = geometry(value)
        except Exception as err:  # recorded: the scan goes on without this point
            out.append((None, f"geometry({value!r}) raised {type(err).__name__}: {err}"))
            continue
        if not isinstance(molecule, MoleculeSpec):
            raise ScanInputError(
                f"geometry({value!r}) returned {type(molecule).__name__} {str(molecule)[:60]!r}; the geometry "
                "function must return a groundkit MoleculeSpec"
            )
        out.append((molecule, ""))
    return out


def chains_for(n_points: int, warm_start: bool | int) -> list[list[int]]:
    """Point indices of each chain (see the module docstring)."""
    if isinstance(warm_start, bool):
        count = 1 if warm_start else n_points
    elif isinstance(warm_start, numbers.Integral) and warm_start >= 1:
        count = min(int(warm_start), n_points)
    else:
        raise ScanInputError(f"warm_start={warm_start!r}; accepted: True, False, or a number of chains >= 1")
    bounds = [round(k * n_points / count) for k in range(count + 1)]
    return [list(range(bounds[k], bounds[k + 1])) for k in range(count)]


def warm_start_label(warm_start: bool | int) -> str:
    if warm_start is True:
        return "1 chain"
    if warm_start is False:
        return "off"
    return f"{int(warm_start)} chains"


@provides("study:scan")
def run_scan(
    pipeline: Any,
    geometry: Callable[[float], Any],
    values: Iterable[Any],
    *,
    checkpoint: str | None = None,
    executor: Any = None,
    warm_start: bool | int = True,
    progress: bool = False,
    retry_failed: bool = False,
) -> ScanResult:
    """Run ``pipeline`` at ``geometry(v)`` for every ``v`` in ``values``; see :meth:`Pipeline.scan`.

    With a ``checkpoint`` directory the scan holds its lock while it runs, skips the points already there and
    computes the others, each warm-started exactly as in an uninterrupted run. ``retry_failed`` also computes the
    stored failed points again (their failures are kept in ``ScanPoint.earlier_failures``). Ctrl-C stops the scan
    with a KeyboardInterrupt; the point being computed is not stored, every finished one is."""
    if not isinstance(retry_failed, bool):
        raise ScanInputError(f"retry_failed={retry_failed!r}; accepted: True or False")
    numbers_ = scan_values(values)
    chains = chains_for(len(numbers_), warm_start)
    built = build_molecules(geometry, numbers_)
    check_study([pipeline.molecule(m) for m, _ in built if m is not None], "this scan")  # size cap, before any SCF
    components = components_of(pipeline)
    resolved = pipeline.resolved_components()
    configuration = {role: repr(resolved[role]) for role in ROLES}
    label = warm_start_label(warm_start)
    description = {**configuration, "warm_start": label,
                   "points": [[v, molecule_to_dict(m) if m is not None else failure]
                              for v, (m, failure) in zip(numbers_, built)]}
    with ExitStack() as stack:
        store = None
        if checkpoint is not None:
            store = stack.enter_context(CheckpointStore(checkpoint, description, retry_failed=retry_failed))
        points: dict[int, ScanPoint] = store.finished() if store is not None else {}
        earlier = store.earlier_failures if store is not None else {}
        todo, starts = resume_plan(chains, points, warm_start)
        bar = _progress(len(numbers_), len(points)) if progress else None
        if bar is not None:
            stack.callback(bar.close)

        def make_task(index: int, previous: dict | None) -> Task:
            molecule, failure = built[index]
            handover = None
            if previous is None:
                previous = starts.get(index)
            if warm_start is not False and previous is not None and previous.get("handover") is not None:
                handover = (previous["molecule"], previous["handover"])
            return Task(molecule=molecule, components=components, previous=handover, builder_error=failure or None)

        def on_answer(index: int, answer: dict) -> None:
            point = _point(index, numbers_[index], built[index][0], answer, earlier.get(index, ()))
            if point.orbital_jump:
                warnings.warn(f"scan point {point.value:g}: {point.orbital_jump}", OrbitalJumpWarning, stacklevel=3)
            if store is not None:
                store.write(point)
            points[index] = point
            if bar is not None:
                bar.update(1)

        if todo:
            with runner_for(executor) as runner:
                run_chains(runner, todo, make_task, on_answer, run_task)
    return ScanResult(points=tuple(points[i] for i in range(len(numbers_))), configuration=configuration,
                      warm_start=label)


def resume_plan(chains: list[list[int]], finished: dict[int, ScanPoint], warm_start: bool | int,
                ) -> tuple[list[list[int]], dict[int, dict]]:
    """The runs of missing points to compute, and the warm start of each run's first point.

    A chain with gaps (say points 3 and 6-11 missing) becomes one run per gap ([3], [6, ..., 11]); the first
    point of a run starts from its predecessor in the chain (2 and 5 here), which is finished. So every point
    starts from the same neighbour as in an uninterrupted scan, and the resumed table equals that scan's. A failed
    predecessor hands nothing over: the point starts cold, as it would have."""
    runs: list[list[int]] = []
    starts: dict[int, dict] = {}
    for chain in chains:
        run: list[int] = []
        for position, index in enumerate(chain):
            if index in finished:
                if run:
                    runs.append(run)
                    run = []
                continue
            if not run and position > 0 and warm_start is not False:
                before = finished[chain[position - 1]]
                if before.ok:
                    starts[index] = _answer_of(before)
            run.append(index)
        if run:
            runs.append(run)
    return runs, starts


def _point(index: int, value: float, molecule: MoleculeSpec | None, answer: dict,
           earlier_failures: tuple[str, ...] = ()) -> ScanPoint:
    result = answer.get("result")
    return ScanPoint(
        index=index, value=value, molecule=molecule,
        result=None if result is None else result_from_dict(result, source=f"scan point {index}"),
        failure=answer.get("error"), start=answer.get("start", "cold"), orbital_match=answer.get("orbital_match"),
        wall_time=float(answer.get("wall_time", 0.0)), handover=answer.get("handover"),
        earlier_failures=tuple(earlier_failures), orbital_jump=answer.get("orbital_jump"),
    )


def _answer_of(point: ScanPoint) -> dict:
    """The part of a worker's answer that a warm start needs, rebuilt from a stored point."""
    return {"handover": point.handover, "molecule": point.molecule}


def _progress(total: int, done: int) -> Any:
    from tqdm.auto import tqdm

    return tqdm(total=total, initial=done, desc="scan points", unit="point", mininterval=0.5)
