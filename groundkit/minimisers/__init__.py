"""Minimisers: configuration objects whose ``minimise(energy, x0, ...)`` returns a MinimiserOutcome.

Built in: FixedStepDescent, Adam, BFGS, LBFGSB, COBYLA, NelderMead, SPSA. ``minimiser_from_name("bfgs")``
gives one by name (any minimiser registered with ``groundkit.register("minimiser", ...)``). Energies in Hartree,
parameters in radians.
"""

from __future__ import annotations

from groundkit.registry import build, name_of

from .base import Ending, Minimiser, minimiser_options
from .gradient import Adam, FixedStepDescent
from .records import IterationRecord, MinimiserOutcome
from .scipy_methods import BFGS, COBYLA, LBFGSB, NelderMead
from .session import Session
from .spsa import SPSA

BUILT_IN: tuple[type[Minimiser], ...] = (FixedStepDescent, Adam, BFGS, LBFGSB, COBYLA, NelderMead, SPSA)
MINIMISER_NAMES: tuple[str, ...] = tuple(name_of(cls) for cls in BUILT_IN)


def minimiser_from_name(name: str, **options: object) -> Minimiser:
    """The minimiser registered as ``name`` (case, '-', '_' and spaces ignored; former class names such as
    'GradientDescent' accepted), built with ``options``."""
    return build("minimiser", name, **options)


__all__ = [
    "BFGS", "BUILT_IN", "COBYLA", "LBFGSB", "MINIMISER_NAMES", "SPSA", "Adam", "Ending", "FixedStepDescent",
    "IterationRecord", "Minimiser", "MinimiserOutcome", "NelderMead", "Session", "minimiser_from_name",
    "minimiser_options",
]
