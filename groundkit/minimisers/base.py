"""The Minimiser base class: options stored and checked at construction, one ``minimise`` for every method.

A subclass is a frozen dataclass of its options (decorate it with :data:`minimiser_options`), sets the class
attribute ``uses_gradient``, declares its options' ``constraints`` (checks across options go in
``check_options``), is registered by name (``@groundkit.register("minimiser", "my-method")``) and implements ``search``,
which drives a :class:`~groundkit.minimisers.session.Session` and returns an :class:`Ending`. The base class
handles the starting vector, zero-parameter problems, Ctrl-C and early halts, and builds the outcome.
"""

from __future__ import annotations

import abc
import math
from dataclasses import MISSING, dataclass, fields
from typing import ClassVar

import numpy as np

from groundkit.component import Component
from groundkit.constraints import Integer, OrNone, Positive
from groundkit.errors import ComponentError, ParameterError

from .records import MinimiserOutcome
from .session import Callback, EnergyFunction, GradientFunction, Halt, Session

minimiser_options = dataclass(frozen=True, kw_only=True, repr=False)
"""Decorator for Minimiser subclasses: frozen, keyword-only options, the base class's short ``repr``."""


@dataclass(frozen=True)
class Ending:
    """How a search ended: parameters (radians), their energy (Hartree), the verdict and its reason."""

    parameters: np.ndarray
    energy: float
    converged: bool
    reason: str


@minimiser_options
class Minimiser(Component, role="minimiser"):
    """Base of every minimiser. ``max_iterations`` caps the iterations; ``tolerance`` is the method's own test."""

    name: ClassVar[str] = "minimiser"
    uses_gradient: ClassVar[bool] = False

    max_iterations: int = 500
    tolerance: float = 1e-5

    constraints = {"max_iterations": Integer(1), "tolerance": Positive(),
                   "difference_step": OrNone(Positive(unit="radians"))}

    def __repr__(self) -> str:
        changed = []
        for f in fields(self):
            value = getattr(self, f.name)
            if f.default is MISSING or value != f.default:
                changed.append(f"{f.name}={value!r}")
        return f"{type(self).__name__}({', '.join(changed)})"

    def minimise(
        self, energy: EnergyFunction, x0: np.ndarray, *, energy_and_gradient: GradientFunction | None = None,
        callback: Callback | None = None,
    ) -> MinimiserOutcome:
        """Minimise ``energy`` (Hartree) from ``x0`` (radians); ``callback`` gets each IterationRecord.

        A KeyboardInterrupt from the energy, the gradient or the callback ends the search with a not-converged
        outcome holding every iteration recorded and the best point seen; so does a callback raising
        StopIteration, or a non-finite energy.
        """
        start = starting_vector(x0)
        difference_step = getattr(self, "difference_step", None)
        if self.uses_gradient and energy_and_gradient is None and difference_step is None:
            raise ComponentError(
                f"{self!r} needs energy_and_gradient and none was given; pass one, set difference_step=1e-5 "
                f"(radians) for central differences, or choose a gradient-free minimiser: COBYLA(), NelderMead(), "
                f"SPSA()"
            )
        session = Session(energy, energy_and_gradient, callback, difference_step)
        try:
            if start.size == 0:
                ending = Ending(start, session.energy(start), True, "no parameters to vary; the energy is fixed")
            else:
                ending = self.search(session, start)
        except KeyboardInterrupt:
            x, e = self.partial_point(session, start)
            ending = Ending(x, e, False, f"interrupted (KeyboardInterrupt) after {session.iteration} iterations")
        except Halt as halt:
            x, e = self.partial_point(session, start)
            ending = Ending(x, e, False, halt.reason)
        return MinimiserOutcome(
            parameters=ending.parameters, energy=float(ending.energy), converged=bool(ending.converged),
            stop_reason=ending.reason, iterations=tuple(session.records), evaluations=session.evaluations,
        )

    @abc.abstractmethod
    def search(self, session: Session, x0: np.ndarray) -> Ending:
        """The method itself: evaluate through ``session``, record each iteration, say how it ended."""

    def partial_point(self, session: Session, x0: np.ndarray) -> tuple[np.ndarray, float]:
        """Point returned after an interruption: the lowest energy evaluated so far (x0 and NaN if none)."""
        if session.best_parameters is None:
            return x0, math.nan
        return session.best_parameters, session.best_energy


def starting_vector(x0: object) -> np.ndarray:
    """``x0`` as a fresh 1-D float array; ParameterError when it is not a finite real vector."""
    try:
        x = np.array(x0, dtype=float)
    except (TypeError, ValueError):
        raise ParameterError(f"x0={x0!r} is not a vector of real numbers") from None
    if x.ndim != 1:
        raise ParameterError(f"x0 has shape {x.shape}; give a one-dimensional vector of parameters (radians)")
    if not np.all(np.isfinite(x)):
        bad = [int(i) for i in np.flatnonzero(~np.isfinite(x))[:5]]
        raise ParameterError(f"x0 has non-finite entries at positions {bad}; every parameter must be finite")
    return x
