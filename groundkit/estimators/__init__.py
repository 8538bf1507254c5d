"""Estimators: how an energy is obtained from a trial state (exact here; sampled and noisy ones build on it)."""

from .base import Estimator
from .exact import ExactEstimator

__all__ = ["Estimator", "ExactEstimator"]
