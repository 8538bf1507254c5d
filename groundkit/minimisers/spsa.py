"""Simultaneous perturbation stochastic approximation, for energies that are noisy (sampled) as well as exact.

J. C. Spall, "Implementation of the simultaneous perturbation algorithm for stochastic optimization", IEEE
Transactions on Aerospace and Electronic Systems 34(3), 817-823 (1998) (from memory).
"""

from __future__ import annotations

import math

import numpy as np

from groundkit.constraints import Integer, Interval, OrNone, Positive, Seed
from groundkit.registry import register

from .base import Ending, Minimiser, minimiser_options
from .gradient import budget_spent
from .session import Session


@register("minimiser", "spsa", label="SPSA")
@minimiser_options
class SPSA(Minimiser):
    """SPSA with Spall's gain sequences a_k = a / (k + 1 + A)^alpha and c_k = c / (k + 1)^gamma, k = 0, 1, ...

    Iteration k draws a random sign vector Delta (each entry +1 or -1, from ``numpy.random.default_rng(seed)``),
    evaluates y+- = E(theta +- c_k Delta), steps theta <- theta - a_k (y+ - y-) / (2 c_k) Delta, then evaluates
    E at the new theta for the record: three energy evaluations per iteration, whatever the parameter count.
    ``a`` is in radians squared per Hartree, ``c`` in radians; ``A`` defaults to a tenth of ``max_iterations``
    (Spall's guideline). The same seed gives the same perturbations, so with an exact (or identically seeded)
    energy the same trajectory.

    Convergence: every ``window`` iterations, the mean recorded energy of the window just finished is compared
    with the mean of the window before; converged when they differ by less than ``tolerance`` (Hartree). With
    sampled energies, choose ``tolerance`` well above the noise of a window mean (sigma / sqrt(window)) or below
    it, not near it: near the noise level, chance agreement of two means can end the run early.
    """

    name = "spsa"
    uses_gradient = False

    seed: int | None = None
    a: float = 0.1
    c: float = 0.1
    alpha: float = 0.602
    gamma: float = 0.101
    A: float | None = None
    window: int = 20
    max_iterations: int = 500
    tolerance: float = 1e-5

    constraints = {
        "seed": Seed(),
        "a": Positive(unit="radians squared per Hartree"),
        "c": Positive(unit="radians"),
        "alpha": Interval(float, 0.0, 1.0, closed="right"),
        "gamma": Interval(float, 0.0, 0.5, closed="right"),
        "A": OrNone(Interval(float, 0.0, None)),
        "window": Integer(1),
    }

    @property
    def stability(self) -> float:
        """The constant A in a_k: as given, or a tenth of max_iterations."""
        return float(self.A) if self.A is not None else 0.1 * self.max_iterations

    def gains(self, k: int) -> tuple[float, float]:
        """(a_k, c_k) for iteration k = 0, 1, ..."""
        a_k = self.a / (k + 1 + self.stability) ** self.alpha
        c_k = self.c / (k + 1) ** self.gamma
        return a_k, c_k

    def search(self, session: Session, x0: np.ndarray) -> Ending:
        rng = np.random.default_rng(self.seed)
        x = x0.copy()
        energies: list[float] = []
        for k in range(self.max_iterations):
            a_k, c_k = self.gains(k)
            delta = rng.choice((-1.0, 1.0), size=x.size)
            plus = session.energy(x + c_k * delta)
            minus = session.energy(x - c_k * delta)
            x = x - a_k * (plus - minus) / (2.0 * c_k) * delta
            energy = session.energy(x)
            energies.append(energy)
            session.record(x, energy)
            done = len(energies)
            if done % self.window == 0 and done >= 2 * self.window:
                change = np.mean(energies[-self.window:]) - np.mean(energies[-2 * self.window:-self.window])
                if abs(change) < self.tolerance:
                    reason = (f"mean energy of the last {self.window} iterations changed by {abs(change):.2g} Ha, "
                              f"below tolerance {self.tolerance:g}")
                    return Ending(x, energy, True, reason)
        return Ending(x, energies[-1], False, budget_spent(self.max_iterations))

    def partial_point(self, session: Session, x0: np.ndarray) -> tuple[np.ndarray, float]:
        """After an interruption: the last iterate recorded (the lowest noisy value would be biased low)."""
        if not session.records:
            return x0, math.nan
        last = session.records[-1]
        return np.array(last.parameters), last.energy
