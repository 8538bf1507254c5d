"""Geometry optimisation: minimise a pipeline's converged energy over geometry parameters with SciPy.

``geometry(x)`` builds the molecule from the parameters ``x`` (a float when ``initial`` is a number, else a
1-D array): bond lengths in angstrom, angles in degrees, whatever the function takes. Every evaluation is a full
minimisation of the trial state; with ``warm_start`` each one starts from the previous evaluation's parameters,
after orbital matching. Methods: 'nelder-mead' (default) and 'powell' (no gradient), 'l-bfgs-b' (differences of
step ``10 * tolerance``).
"""

from __future__ import annotations

import numbers
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import numpy as np
from scipy.optimize import minimize

from groundkit.molecule import MoleculeSpec
from groundkit.persistence import result_from_dict
from groundkit.result import RunResult
from groundkit.upcalls import provides

from .errors import AnalysisError, ScanInputError
from .work import Task, components_of, run_task

METHODS = ("powell", "nelder-mead", "l-bfgs-b")


@dataclass(frozen=True, eq=False)
class GeometryOptimum:
    """The optimised geometry: ``parameters`` (the geometry function's units), its ``molecule``, ``energy`` (Ha)
    and the full ``result`` there; ``history`` holds (parameters, energy) of every evaluation."""

    parameters: np.ndarray
    molecule: MoleculeSpec
    energy: float
    result: RunResult
    evaluations: int
    converged: bool
    message: str
    history: tuple[tuple[np.ndarray, float], ...]

    def __repr__(self) -> str:
        shown = ", ".join(f"{x:.6g}" for x in self.parameters)
        return (f"GeometryOptimum(parameters=[{shown}], energy={self.energy:.10f} Ha, evaluations="
                f"{self.evaluations}, converged={self.converged})")


@provides("study:optimise_geometry")
def optimise_geometry(
    pipeline: Any, geometry: Callable[..., Any], initial: Any, *, bounds: Any = None,
    method: str = "nelder-mead", tolerance: float = 1e-4, max_evaluations: int = 200, warm_start: bool = True,
) -> GeometryOptimum:
    """See :meth:`groundkit.pipeline.Pipeline.optimise_geometry` and the module docstring."""
    scalar = isinstance(initial, numbers.Real)
    x0 = np.atleast_1d(np.asarray(initial, dtype=float))
    if x0.ndim != 1 or x0.size == 0 or not np.all(np.isfinite(x0)):
        raise ScanInputError(f"initial={initial!r}; give a finite number or a 1-D list of finite numbers")
    key = str(method).lower()
    if key not in METHODS:
        raise ScanInputError(f"method={method!r}; accepted: {', '.join(METHODS)}")
    if not (isinstance(tolerance, numbers.Real) and tolerance > 0):
        raise ScanInputError(f"tolerance={tolerance!r}; give a positive number (geometry-parameter units)")
    components = components_of(pipeline)
    history: list[tuple[np.ndarray, float]] = []
    answers: dict[bytes, tuple[MoleculeSpec, dict]] = {}
    last: list[tuple[MoleculeSpec, dict] | None] = [None]

    def energy(x: np.ndarray) -> float:
        x = np.array(x, dtype=float)
        molecule = geometry(float(x[0]) if scalar else x.copy())
        if not isinstance(molecule, MoleculeSpec):
            raise ScanInputError(f"geometry({x!r}) returned {type(molecule).__name__}; it must return a MoleculeSpec")
        previous = last[0] if warm_start else None
        answer = run_task(Task(molecule=molecule, components=components,
                               previous=None if previous is None else (previous[0], previous[1]["handover"])))
        if answer["result"] is None:
            history.append((x, float("inf")))
            return float("inf")
        answers[x.tobytes()] = (molecule, answer)
        if answer.get("handover") is not None:
            last[0] = (molecule, answer)
        value = float(answer["result"]["energy"])
        history.append((x, value))
        return value

    options: dict[str, Any] = {"maxfev": max_evaluations} if key != "l-bfgs-b" else {"maxfun": max_evaluations}
    if key == "powell":
        options.update(xtol=tolerance, ftol=1e-10)
    elif key == "nelder-mead":
        options.update(xatol=tolerance, fatol=1e-10)
    else:
        options.update(eps=10 * tolerance, gtol=1e-6)
    outcome = minimize(energy, x0, method=key, bounds=bounds, options=options)
    best = min(range(len(history)), key=lambda k: history[k][1])
    x_best, e_best = history[best]
    if not np.isfinite(e_best):
        raise AnalysisError(f"geometry optimisation found no geometry with a result; last failure at {x_best!r}")
    molecule, answer = answers[x_best.tobytes()]
    return GeometryOptimum(
        parameters=x_best, molecule=molecule, energy=e_best,
        result=result_from_dict(answer["result"], source="geometry optimisation"),
        evaluations=len(history), converged=bool(outcome.success), message=str(outcome.message),
        history=tuple(history),
    )
