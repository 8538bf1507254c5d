"""Methods run by ``scipy.optimize.minimize``: BFGS, L-BFGS-B, COBYLA and Nelder-Mead.

SciPy's per-iteration callback receives the current point; its energy (and gradient) come from the session's
cache of the evaluations SciPy already made there, so recording an iteration costs no extra evaluation. The
iteration cap is ours: the callback ends the run after ``max_iterations`` records. The outcome is SciPy's
final point, which for COBYLA can follow the last record by one trial step.
"""

from __future__ import annotations

import math

import numpy as np
from scipy.optimize import minimize

from groundkit.constraints import Bool, Integer, Interval, OrNone, Pair, Positive
from groundkit.errors import ParameterError
from groundkit.registry import register

from .base import Ending, Minimiser, minimiser_options
from .gradient import budget_spent, gradient_converged
from .session import Session


class _Budget(Exception):
    """Raised from SciPy's callback once ``max_iterations`` iterations are recorded."""


def _run_scipy(
    method: Minimiser, session: Session, x0: np.ndarray, scipy_method: str, options: dict, *,
    gradient: bool, bounds: list[tuple[float, float]] | None = None,
):
    """SciPy's result, or None when our iteration cap ended the run."""

    def on_iteration(xk: np.ndarray) -> None:
        x = np.array(xk, dtype=float)
        known = session.lookup(x)
        if known is None:
            value, slope = (session.energy_and_gradient(x) if gradient else (session.energy(x), None))
        else:
            value, slope = known
        session.record(x, value, None if slope is None else float(np.linalg.norm(slope)))
        if session.iteration >= method.max_iterations:
            raise _Budget

    fun = session.energy_and_gradient if gradient else session.energy
    try:
        return minimize(
            fun, x0, method=scipy_method, jac=True if gradient else None, bounds=bounds, callback=on_iteration,
            options=options,
        )
    except _Budget:
        return None


def _final_gradient(session: Session, x: np.ndarray) -> tuple[float, np.ndarray]:
    return session.energy_and_gradient(x)  # cached: SciPy evaluated its final point


@register("minimiser", "bfgs", label="BFGS")
@minimiser_options
class BFGS(Minimiser):
    """Quasi-Newton BFGS with SciPy's line search (Nocedal and Wright, Numerical Optimization, ch. 6).

    Converged when the Euclidean gradient norm is at or below ``tolerance`` (Hartree per radian). One or more
    energy-and-gradient evaluations per iteration (line search). ``difference_step`` (radians) enables central
    differences when no gradient is supplied.
    """

    name = "bfgs"
    uses_gradient = True

    max_iterations: int = 500
    tolerance: float = 1e-5
    difference_step: float | None = None

    def search(self, session: Session, x0: np.ndarray) -> Ending:
        options = {"gtol": self.tolerance, "norm": 2, "maxiter": self.max_iterations + 1}
        result = _run_scipy(self, session, x0, "BFGS", options, gradient=True)
        return _gradient_ending(self, session, result, lambda x, g: g)


@register("minimiser", "l-bfgs-b", label="L-BFGS-B")
@minimiser_options
class LBFGSB(Minimiser):
    """Limited-memory BFGS with optional box bounds, SciPy's L-BFGS-B (Byrd, Lu, Nocedal, Zhu, SIAM J. Sci.
    Comput. 16, 1190 (1995)).

    Converged when the Euclidean norm of the projected gradient is at or below ``tolerance`` (Hartree per
    radian), or when one iteration lowers the energy by less than ``energy_tolerance`` times max(|E|, 1)
    (SciPy's ``ftol`` test). ``memory`` is the number of correction pairs kept; ``bounds=(low, high)`` (radians)
    applies to every parameter. ``difference_step`` (radians) enables central differences.
    """

    name = "l-bfgs-b"
    uses_gradient = True

    max_iterations: int = 500
    tolerance: float = 1e-5
    energy_tolerance: float = 1e-12
    memory: int = 10
    bounds: tuple[float, float] | None = None
    difference_step: float | None = None

    constraints = {"energy_tolerance": Positive(unit="relative"), "memory": Integer(1),
                   "bounds": OrNone(Pair(Interval(float, allow_infinite=True), unit="radians"))}

    def search(self, session: Session, x0: np.ndarray) -> Ending:
        box = None
        if self.bounds is not None:
            low, high = (float(v) for v in self.bounds)
            outside = np.flatnonzero((x0 < low) | (x0 > high))
            if outside.size:
                raise ParameterError(
                    f"x0[{int(outside[0])}]={x0[outside[0]]!r} lies outside bounds={self.bounds!r}; start inside them"
                )
            box = [(low, high)] * x0.size
        options = {
            "gtol": self.tolerance / math.sqrt(x0.size),  # SciPy tests the largest component; this bounds the norm
            "ftol": self.energy_tolerance, "maxcor": self.memory, "maxiter": self.max_iterations + 1,
            "maxfun": 50 * (self.max_iterations + 1),
        }
        result = _run_scipy(self, session, x0, "L-BFGS-B", options, gradient=True, bounds=box)
        return _gradient_ending(self, session, result, self._projected)

    def _projected(self, x: np.ndarray, gradient: np.ndarray) -> np.ndarray:
        if self.bounds is None:
            return gradient
        low, high = self.bounds
        held = ((x <= low) & (gradient > 0)) | ((x >= high) & (gradient < 0))
        return np.where(held, 0.0, gradient)


def _gradient_ending(method: Minimiser, session: Session, result, projected) -> Ending:
    if result is None:
        last = session.records[-1]
        x = np.array(last.parameters)
        _, gradient = _final_gradient(session, x)
        norm = float(np.linalg.norm(projected(x, gradient)))
        if norm <= method.tolerance:
            return Ending(x, last.energy, True, gradient_converged(norm, method.tolerance))
        return Ending(x, last.energy, False, budget_spent(method.max_iterations, norm))
    x = np.array(result.x, dtype=float)
    energy, gradient = _final_gradient(session, x)
    norm = float(np.linalg.norm(projected(x, gradient)))
    if norm <= method.tolerance:
        return Ending(x, energy, True, gradient_converged(norm, method.tolerance))
    if result.success and hasattr(method, "energy_tolerance"):  # L-BFGS-B's energy-decrease test
        return Ending(x, energy, True, (
            f"energy fell by less than energy_tolerance {method.energy_tolerance:g} x max(|E|, 1) in one "
            f"iteration (gradient norm {norm:.2g})"
        ))
    return Ending(x, energy, False, (
        f"{type(method).__name__} stopped with gradient norm {norm:.2g} above tolerance {method.tolerance:g}: "
        f"{result.message}"
    ))


@register("minimiser", "cobyla", label="COBYLA")
@minimiser_options
class COBYLA(Minimiser):
    """Powell's derivative-free COBYLA (Powell, Advances in Optimization and Numerical Analysis, 1994, p. 51).

    Linear models on a simplex inside a trust region that starts at radius ``initial_step`` (radians) and
    shrinks; converged when the radius reaches ``tolerance`` (radians). An iteration costs at most one energy
    evaluation, after n + 1 evaluations to build the first simplex.
    """

    name = "cobyla"
    uses_gradient = False

    max_iterations: int = 1000
    tolerance: float = 1e-6
    initial_step: float = 0.5

    constraints = {"initial_step": Positive(unit="radians")}

    def search(self, session: Session, x0: np.ndarray) -> Ending:
        options = {"rhobeg": self.initial_step, "tol": self.tolerance,
                   "maxiter": 2 * (self.max_iterations + x0.size + 2)}
        result = _run_scipy(self, session, x0, "COBYLA", options, gradient=False)
        if result is None:
            return _budget_ending(self, session)
        if result.success:
            reason = f"trust-region radius shrank to tolerance {self.tolerance:g} rad"
            return Ending(np.array(result.x, dtype=float), float(result.fun), True, reason)
        return Ending(np.array(result.x, dtype=float), float(result.fun), False, f"COBYLA stopped: {result.message}")


@register("minimiser", "nelder-mead", label="Nelder–Mead")
@minimiser_options
class NelderMead(Minimiser):
    """The Nelder-Mead simplex method (Nelder and Mead, Comput. J. 7, 308 (1965)), SciPy's implementation.

    The first simplex is x0 and x0 + ``initial_step`` (radians) along each axis. Converged when every vertex
    lies within ``parameter_tolerance`` (radians, largest component) of the best one AND every vertex energy
    within ``tolerance`` (Hartree) of the best energy. ``adaptive=True`` scales the coefficients with the
    dimension (Gao and Han, Comput. Optim. Appl. 51, 259 (2012)).
    """

    name = "nelder-mead"
    uses_gradient = False

    max_iterations: int = 2000
    tolerance: float = 1e-8
    parameter_tolerance: float = 1e-5
    initial_step: float = 0.1
    adaptive: bool = False

    constraints = {"parameter_tolerance": Positive(unit="radians"), "initial_step": Positive(unit="radians"),
                   "adaptive": Bool()}

    def search(self, session: Session, x0: np.ndarray) -> Ending:
        simplex = np.vstack([x0, x0 + self.initial_step * np.eye(x0.size)])
        options = {
            "fatol": self.tolerance, "xatol": self.parameter_tolerance, "adaptive": self.adaptive,
            "initial_simplex": simplex, "maxiter": self.max_iterations + 1,
            "maxfev": (self.max_iterations + 1) * (x0.size + 3) + x0.size + 1,
        }
        result = _run_scipy(self, session, x0, "Nelder-Mead", options, gradient=False)
        if result is None:
            return _budget_ending(self, session)
        x, energy = np.array(result.x, dtype=float), float(result.fun)
        if result.success:
            reason = (f"simplex energies within tolerance {self.tolerance:g} Ha and vertices within "
                      f"{self.parameter_tolerance:g} rad of the best")
            return Ending(x, energy, True, reason)
        return Ending(x, energy, False, f"Nelder-Mead stopped: {result.message}")


def _budget_ending(method: Minimiser, session: Session) -> Ending:
    last = session.records[-1]
    return Ending(np.array(last.parameters), last.energy, False, budget_spent(method.max_iterations))
