"""First-order methods written out here: plain gradient descent and Adam.

Both take ``tolerance`` as a bound on the Euclidean norm of the gradient (Hartree per radian): they stop,
converged, at the first point where the norm is at or below it (the starting point included).
"""

from __future__ import annotations

import numpy as np

from groundkit.constraints import Interval, Positive
from groundkit.registry import register

from .base import Ending, Minimiser, minimiser_options
from .session import Session


def gradient_converged(gradient_norm: float, tolerance: float) -> str:
    """Stop reason for the gradient test."""
    return f"gradient norm {gradient_norm:.2g} below tolerance {tolerance:g}"


def budget_spent(max_iterations: int, gradient_norm: float | None = None) -> str:
    """Stop reason for the iteration cap."""
    tail = "" if gradient_norm is None else f" (gradient norm {gradient_norm:.2g})"
    return f"max_iterations={max_iterations} reached{tail}"


@register("minimiser", "gradient-descent", aliases=("fixed-step-descent",), label="gradient descent (fixed step)")
@minimiser_options
class FixedStepDescent(Minimiser):
    """theta <- theta - step * gradient, with a fixed ``step`` (radians squared per Hartree).

    One energy-and-gradient evaluation per iteration. ``difference_step`` (radians) enables central
    differences when no gradient is supplied.
    """

    name = "gradient-descent"
    uses_gradient = True

    step: float = 0.1
    max_iterations: int = 1000
    tolerance: float = 1e-5
    difference_step: float | None = None

    constraints = {"step": Positive(unit="radians squared per Hartree")}

    def search(self, session: Session, x0: np.ndarray) -> Ending:
        return _descend(self, session, x0, lambda gradient, k: self.step * gradient)


@register("minimiser", "adam", label="Adam")
@minimiser_options
class Adam(Minimiser):
    """Adam (Kingma and Ba, ICLR 2015, arXiv:1412.6980): steps scaled by running moments of the gradient.

    ``step`` is the base step (radians), ``beta1`` and ``beta2`` the decay rates of the first and second moment,
    ``epsilon`` (Hartree per radian) keeps the division finite. One energy-and-gradient evaluation per iteration.
    """

    name = "adam"
    uses_gradient = True

    step: float = 0.05
    beta1: float = 0.9
    beta2: float = 0.999
    epsilon: float = 1e-8
    max_iterations: int = 1000
    tolerance: float = 1e-5
    difference_step: float | None = None

    constraints = {"step": Positive(unit="radians"), "beta1": Interval(float, 0.0, 1.0, closed="left"),
                   "beta2": Interval(float, 0.0, 1.0, closed="left"),
                   "epsilon": Positive(unit="Hartree per radian")}

    def search(self, session: Session, x0: np.ndarray) -> Ending:
        first = np.zeros_like(x0)
        second = np.zeros_like(x0)

        def move(gradient: np.ndarray, k: int) -> np.ndarray:
            first[:] = self.beta1 * first + (1.0 - self.beta1) * gradient
            second[:] = self.beta2 * second + (1.0 - self.beta2) * gradient**2
            first_hat = first / (1.0 - self.beta1**k)
            second_hat = second / (1.0 - self.beta2**k)
            return self.step * first_hat / (np.sqrt(second_hat) + self.epsilon)

        return _descend(self, session, x0, move)


def _descend(method: Minimiser, session: Session, x0: np.ndarray, move) -> Ending:
    """Shared loop: x_k = x_{k-1} - move(g_{k-1}, k); evaluate and record at x_k; stop on the gradient test."""
    x = x0.copy()
    energy, gradient = session.energy_and_gradient(x)
    norm = float(np.linalg.norm(gradient))
    if norm <= method.tolerance:
        return Ending(x, energy, True, gradient_converged(norm, method.tolerance) + " at the starting point")
    for k in range(1, method.max_iterations + 1):
        x = x - move(gradient, k)
        energy, gradient = session.energy_and_gradient(x)
        norm = float(np.linalg.norm(gradient))
        session.record(x, energy, norm)
        if norm <= method.tolerance:
            return Ending(x, energy, True, gradient_converged(norm, method.tolerance))
    return Ending(x, energy, False, budget_spent(method.max_iterations, norm))
