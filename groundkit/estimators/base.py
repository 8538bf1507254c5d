"""The estimator protocol: energy, energy with gradient, and an estimate with its standard error."""

from __future__ import annotations

from abc import ABC, abstractmethod
from typing import Any

import numpy as np


class Estimator(ABC):
    """Turns an objective (exact E(θ) in the determinant space or on qubits) into the numbers a minimiser sees.

    Subclasses are frozen dataclasses of options. ``exact`` is True when values carry no statistical error;
    ``provides_gradient`` is True when :meth:`energy_and_gradient` returns gradients.
    """

    exact: bool = True
    provides_gradient: bool = False

    @abstractmethod
    def estimate(self, objective: Any, theta: np.ndarray) -> tuple[float, float]:
        """(energy in Ha, standard error in Ha) at parameters ``theta``."""

    def energy(self, objective: Any, theta: np.ndarray) -> float:
        """The energy estimate (Ha) alone."""
        return self.estimate(objective, theta)[0]

    def energy_and_gradient(self, objective: Any, theta: np.ndarray) -> tuple[float, np.ndarray] | None:
        """(energy, gradient) where this estimator provides gradients, else None."""
        return None
