"""Estimators: how an energy is obtained from a trial state (exact, sampled, noisy) and what it costs in shots."""

from . import basis_rotation, overlapped, pauli_groupings  # noqa: F401  (register the built-in groupings)
from .base import Estimator, Measurement
from .budget import compare_measurements, shot_budget
from .exact import ExactEstimator
from .grouping import Grouping, grouping_names, groups_for
from .noisy import NOISY_QUBIT_LIMIT, NoisyEstimator
from .sampled import SampledEstimator

__all__ = [
    "NOISY_QUBIT_LIMIT", "Estimator", "ExactEstimator", "Grouping", "Measurement", "NoisyEstimator",
    "SampledEstimator", "compare_measurements", "grouping_names", "groups_for", "shot_budget",
]
