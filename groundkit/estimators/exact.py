"""ExactEstimator: noiseless expectation values, standard error zero."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from .base import Estimator


@dataclass(frozen=True)
class ExactEstimator(Estimator):
    """Exact energies and analytic (adjoint) gradients from the objective; the default estimator."""

    exact = True
    provides_gradient = True

    def estimate(self, objective: Any, theta: np.ndarray) -> tuple[float, float]:
        return float(objective.energy(theta)), 0.0

    def energy_and_gradient(self, objective: Any, theta: np.ndarray) -> tuple[float, np.ndarray]:
        energy, gradient = objective.energy_and_gradient(theta)
        return float(energy), np.asarray(gradient, dtype=float)

    def __repr__(self) -> str:
        return "ExactEstimator()"
