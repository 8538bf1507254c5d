"""ExactEstimator: noiseless expectation values, standard error zero."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from ..registry import register
from .base import Estimator, Measurement


class ExactMeasurement(Measurement):
    """Exact energies and analytic gradients straight from the objective."""

    exact = True
    provides_gradient = True

    def __init__(self, objective: Any) -> None:
        self.objective = objective

    def estimate(self, theta: np.ndarray) -> tuple[float, float]:
        return float(self.objective.energy(theta)), 0.0

    def energy_and_gradient(self, theta: np.ndarray) -> tuple[float, np.ndarray]:
        energy, gradient = self.objective.energy_and_gradient(theta)
        return float(energy), np.asarray(gradient, dtype=float)


@register("estimator", "exact", label="exact energies")
@dataclass(frozen=True)
class ExactEstimator(Estimator):
    """Exact energies and analytic (adjoint) gradients from the objective; the default estimator."""

    exact = True

    def measure(self, objective: Any, encoding: Any = None) -> ExactMeasurement:
        return ExactMeasurement(objective)

    def __repr__(self) -> str:
        return "ExactEstimator()"
