"""The estimator protocol: an estimator (options only) binds to a pipeline and then gives energies.

``Estimator.bind(pipeline)`` returns a :class:`Measurement`, which holds what the estimator computed for that
pipeline (measurement groups, rotations, a seeded generator) and answers ``estimate(θ) -> (value, stderr)``,
``energy(θ)`` and, where it can, ``energy_and_gradient(θ)``. Energies in Hartree, parameters in radians.
"""

from __future__ import annotations

from abc import ABC, abstractmethod
from typing import Any

import numpy as np

from ..component import Component
from ..errors import ComponentError


class Measurement(ABC):
    """An estimator bound to one pipeline's objective."""

    exact: bool = True
    provides_gradient: bool = False

    @abstractmethod
    def estimate(self, theta: np.ndarray) -> tuple[float, float]:
        """(energy in Ha, standard error in Ha) at parameters ``theta``."""

    def energy(self, theta: np.ndarray) -> float:
        """The energy estimate (Ha) alone."""
        return self.estimate(theta)[0]

    def error_at(self, theta: np.ndarray) -> float | None:
        """Standard error (Ha) of the latest estimate at exactly ``theta``: 0 for exact energies, None when this
        measurement has not estimated there (or keeps no record)."""
        return 0.0 if self.exact else None

    def record(self) -> dict[str, Any] | None:
        """Plain data that results keep about the last estimate (noise model, mitigation, kept fraction), or None
        for measurements that have nothing to add."""
        return None

    def energy_and_gradient(self, theta: np.ndarray) -> tuple[float, np.ndarray]:
        """(energy, gradient in Ha/rad); only when ``provides_gradient``."""

        raise ComponentError(f"{type(self).__name__} gives no gradients; use a gradient-free minimiser (COBYLA, "
                             "Nelder-Mead, SPSA)")


def central_differences(energy: Any, theta: np.ndarray, step: float) -> np.ndarray:
    """Gradient (Ha/rad) by central differences of ``energy`` with ``step`` radians: 2P evaluations."""
    theta = np.asarray(theta, dtype=float)
    gradient = np.empty(theta.size)
    for k in range(theta.size):
        shift = np.zeros(theta.size)
        shift[k] = step
        gradient[k] = (energy(theta + shift) - energy(theta - shift)) / (2 * step)
    return gradient


class Estimator(Component, role="estimator"):
    """Configuration of how energies are obtained; subclasses are frozen dataclasses of options."""

    exact: bool = True

    @abstractmethod
    def measure(self, objective: Any, encoding: Any = None) -> Measurement:
        """The measurement of this estimator on ``objective``; ``encoding`` is the qubit register it is measured
        on (needed by every estimator that is not exact)."""

    def bind(self, pipeline: Any, objective: Any = None) -> Measurement:
        """The measurement on ``pipeline``'s objective (or on ``objective``, e.g. a grown adaptive state)."""
        objective = pipeline.objective() if objective is None else objective
        return self.measure(objective, None if self.exact else pipeline.encoding())
