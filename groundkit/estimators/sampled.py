"""SampledEstimator: energies from finite shots, drawn from the exact state, with honest standard errors.

For each measurement group the state is rotated so every Pauli of the group is measured as Z, outcomes are drawn
with numpy's seeded generator (a multinomial over the 2^n outcome probabilities: the same statistics as one
shot at a time), and the group's value is evaluated per shot. Terms of one group come from the same shots, so
their correlations are in the per-shot values; groups are independent. The standard error is
sqrt(sum_g s_g^2 / N_g) with s_g^2 the sample variance of group g over its N_g shots.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from ..constraints import Integer, Interval, NameOf, OneOf, Seed
from ..energy_surface import EnergySurface
from ..errors import ComponentError
from ..registry import register
from .base import Estimator, Measurement
from .grouping import groups_for
from .groups import moments_from, sample_group
from .shift_rules import shift_gradient

ALLOCATIONS = ("uniform", "variance")


def statevector(objective: EnergySurface, encoding: Any, theta: np.ndarray) -> np.ndarray:
    """The trial state on the qubit register (determinant-space states embedded, qubit states as they are)."""
    return objective.register_state(theta, encoding)


def allocate(shots: int, sigmas: np.ndarray, allocation: str, minimum: int = 2) -> np.ndarray:
    """Shots per group summing to ``shots``: equal, or proportional to the group standard deviations sigma_g,
    with at least ``minimum`` shots per group."""
    n_groups = len(sigmas)
    spare = shots - minimum * n_groups
    if allocation == "uniform" or not np.any(sigmas > 0):
        weights = np.ones(n_groups)
    else:
        weights = np.asarray(sigmas, dtype=float)
    share = spare * weights / weights.sum()
    counts = np.floor(share).astype(np.int64)
    remainder = spare - int(counts.sum())
    counts[np.argsort(-(share - counts), kind="stable")[:remainder]] += 1
    return counts + minimum


@register("estimator", "sampled", label="sampled (shots)")
@dataclass(frozen=True)
class SampledEstimator(Estimator):
    """``SampledEstimator(shots=10_000, grouping="qwc", allocation="variance", seed=7)``.

    ``shots`` is the total for one energy estimate, split across measurement groups by ``allocation``
    ('uniform', or 'variance': N_g proportional to the group's standard deviation in the current state, taken
    from the exact state as an idealisation of a pilot measurement). ``grouping``: a registered grouping
    name (``groundkit.estimators.grouping_names()``: 'qwc', 'qwc-term-order', 'commuting', 'basis-rotation',
    'none'). ``gradient``: 'shift' (parameter-shift rules where the
    generator allows: four-term for fermionic excitations, two-term for Pauli rotations, see
    :mod:`groundkit.estimators.shift_rules`; central differences elsewhere) or 'differences' (central finite
    differences with step ``gradient_step`` radians); every shifted energy is estimated with ``shots`` shots.
    """

    shots: int = 10_000
    grouping: str = "qwc"
    allocation: str = "variance"
    seed: int | None = None
    gradient_step: float = 0.1
    gradient: str = "shift"

    exact = False

    constraints = {
        "shots": Integer(1),
        "grouping": NameOf("grouping"),
        "allocation": OneOf(*ALLOCATIONS),
        "seed": Seed(),
        "gradient_step": Interval(float, 0.0, np.pi, closed="neither", unit="radians"),
        "gradient": OneOf("shift", "differences"),
    }

    def measure(self, objective: Any, encoding: Any = None) -> SampledMeasurement:
        if encoding is None:
            raise ComponentError("SampledEstimator needs the qubit register: bind it through a pipeline")
        return SampledMeasurement(self, objective, encoding)


class SampledMeasurement(Measurement):
    """A SampledEstimator bound to one objective and qubit register; holds the seeded generator."""

    exact = False
    provides_gradient = True

    def __init__(self, options: SampledEstimator, objective: Any, encoding: Any) -> None:
        self.options = options
        self.objective = objective
        self.encoding = encoding
        self.n_qubits = encoding.n_qubits
        self.constant, self.groups = groups_for(encoding, options.grouping)
        if options.shots < 2 * len(self.groups):
            raise ComponentError(
                f"shots={options.shots} are too few for {len(self.groups)} measurement groups; give at least "
                f"{2 * len(self.groups)} (two per group)"
            )
        self.rng = np.random.default_rng(options.seed)
        self._errors: dict[bytes, float] = {}  # parameters -> standard error of the latest estimate there
        self.last_gradient_error: np.ndarray | None = None

    def estimate(self, theta: np.ndarray) -> tuple[float, float]:
        value, error = self.estimate_state(statevector(self.objective, self.encoding, theta))
        key = np.asarray(theta, dtype=float).tobytes()
        self._errors.pop(key, None)
        self._errors[key] = error
        while len(self._errors) > 100_000:
            self._errors.pop(next(iter(self._errors)))
        return value, error

    def error_at(self, theta: np.ndarray) -> float | None:
        return self._errors.get(np.asarray(theta, dtype=float).tobytes())

    def estimate_state(self, state: np.ndarray) -> tuple[float, float]:
        """(energy, standard error) in Ha from ``shots`` shots of a statevector."""
        probabilities = [g.probabilities(state, self.n_qubits) for g in self.groups]
        if self.options.allocation == "variance":
            sigmas = np.sqrt([moments_from(p, g)[1] for p, g in zip(probabilities, self.groups)])
        else:
            sigmas = np.ones(len(self.groups))
        shots = allocate(self.options.shots, sigmas, self.options.allocation)
        energy, variance = self.constant, 0.0
        for group, p, n in zip(self.groups, probabilities, shots):
            mean, var = sample_group(self.rng, group, p, n)
            energy += mean
            variance += var
        return float(energy), float(np.sqrt(variance))

    def gradient(self, theta: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(gradient in Ha/rad, its standard error) from sampled energies at shifted parameters."""
        theta = np.asarray(theta, dtype=float)
        if self.options.gradient == "shift":
            gradient, error, _ = shift_gradient(self.objective, self.encoding, theta, self.estimate_state,
                                                self.options.gradient_step)
            return gradient, error
        step = self.options.gradient_step
        gradient, error = np.zeros(theta.size), np.zeros(theta.size)
        for k in range(theta.size):
            shift = np.zeros(theta.size)
            shift[k] = step
            (up, s_up), (down, s_down) = self.estimate(theta + shift), self.estimate(theta - shift)
            gradient[k], error[k] = (up - down) / (2 * step), np.hypot(s_up, s_down) / (2 * step)
        return gradient, error

    def energy_and_gradient(self, theta: np.ndarray) -> tuple[float, np.ndarray]:
        """Sampled energy and gradient (see :meth:`gradient`); the gradient's standard error is kept in
        ``last_gradient_error``."""
        energy, self.last_error = self.estimate(theta)
        gradient, self.last_gradient_error = self.gradient(theta)
        return energy, gradient

    def __repr__(self) -> str:
        return f"SampledMeasurement({self.options!r}, {len(self.groups)} groups, {self.n_qubits} qubits)"
