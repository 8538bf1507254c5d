"""Estimators: how an energy is obtained from a trial state (exact, sampled, noisy) and what it costs in shots."""

from .base import Estimator, Measurement
from .budget import compare_measurements, shot_budget
from .exact import ExactEstimator
from .noisy import NOISY_QUBIT_LIMIT, NoisyEstimator
from .sampled import SampledEstimator

__all__ = [
    "NOISY_QUBIT_LIMIT", "Estimator", "ExactEstimator", "Measurement", "NoisyEstimator", "SampledEstimator",
    "compare_measurements", "shot_budget",
]
