"""What a minimiser reports: one record per iteration and the outcome of the whole search.

Energies in Hartree, parameters in radians, times in seconds. Parameter arrays are read-only copies.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np


def _frozen_copy(values: Any) -> np.ndarray:
    array = np.array(values, dtype=float)
    array.setflags(write=False)
    return array


def _same(a: float | None, b: float | None) -> bool:
    if a is None or b is None:
        return a is b
    return a == b or (math.isnan(a) and math.isnan(b))


@dataclass(frozen=True, eq=False)
class IterationRecord:
    """One iteration: the energy (Hartree) at ``parameters`` (radians) after the iteration's step.

    ``gradient_norm`` is the Euclidean norm of the gradient (Hartree per radian) where the method knows it, else
    None; ``wall_time`` is the seconds spent in this iteration (the callback's own time excluded);
    ``evaluations`` counts the objective calls (energy, or energy and gradient) made since the search began.
    """

    iteration: int
    energy: float
    parameters: np.ndarray
    gradient_norm: float | None
    wall_time: float
    evaluations: int
    standard_error: float | None = None  # Ha, of a sampled energy (the runner fills it from the measurement)

    def __post_init__(self) -> None:
        object.__setattr__(self, "parameters", _frozen_copy(self.parameters))

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, IterationRecord):
            return NotImplemented
        return (
            self.iteration == other.iteration and _same(self.energy, other.energy)
            and _same(self.gradient_norm, other.gradient_norm) and _same(self.wall_time, other.wall_time)
            and self.evaluations == other.evaluations and _same(self.standard_error, other.standard_error)
            and np.array_equal(self.parameters, other.parameters, equal_nan=True)
        )

    __hash__ = None  # type: ignore[assignment]

    def to_dict(self) -> dict[str, Any]:
        """Plain JSON-ready values."""
        return {
            "iteration": self.iteration, "energy": self.energy, "parameters": self.parameters.tolist(),
            "gradient_norm": self.gradient_norm, "wall_time": self.wall_time, "evaluations": self.evaluations,
            "standard_error": self.standard_error,
        }


@dataclass(frozen=True, eq=False)
class MinimiserOutcome:
    """The end of a search: final (or, when interrupted, best) parameters, their energy and why it stopped.

    ``converged`` is True only when the method's own convergence test was met, never for a budget or an
    interruption; ``stop_reason`` says which in a sentence. ``iterations`` holds every record made.
    """

    parameters: np.ndarray
    energy: float
    converged: bool
    stop_reason: str
    iterations: tuple[IterationRecord, ...]
    evaluations: int

    def __post_init__(self) -> None:
        object.__setattr__(self, "parameters", _frozen_copy(self.parameters))
        object.__setattr__(self, "iterations", tuple(self.iterations))

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, MinimiserOutcome):
            return NotImplemented
        return (
            _same(self.energy, other.energy) and self.converged == other.converged
            and self.stop_reason == other.stop_reason and self.iterations == other.iterations
            and self.evaluations == other.evaluations
            and np.array_equal(self.parameters, other.parameters, equal_nan=True)
        )

    __hash__ = None  # type: ignore[assignment]

    def __repr__(self) -> str:
        return (
            f"MinimiserOutcome(energy={self.energy!r}, converged={self.converged}, stop_reason={self.stop_reason!r}, "
            f"{len(self.iterations)} iterations, {self.evaluations} evaluations)"
        )

    @property
    def energies(self) -> np.ndarray:
        """Energy of each iteration (Hartree)."""
        return np.array([record.energy for record in self.iterations], dtype=float)

    def to_dict(self) -> dict[str, Any]:
        """Plain JSON-ready values."""
        return {
            "parameters": self.parameters.tolist(), "energy": self.energy, "converged": self.converged,
            "stop_reason": self.stop_reason, "iterations": [record.to_dict() for record in self.iterations],
            "evaluations": self.evaluations,
        }
