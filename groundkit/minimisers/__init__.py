"""Minimisers: configuration objects whose ``minimise(energy, x0, ...)`` returns a MinimiserOutcome.

Built in: FixedStepDescent, Adam, BFGS, LBFGSB, COBYLA, NelderMead, SPSA. ``minimiser_from_name("bfgs")``
gives one by name. Energies in Hartree, parameters in radians.
"""

from __future__ import annotations

from groundkit.errors import ComponentError

from .base import Ending, Minimiser, minimiser_options
from .gradient import Adam, FixedStepDescent
from .records import IterationRecord, MinimiserOutcome
from .scipy_methods import BFGS, COBYLA, LBFGSB, NelderMead
from .session import Session
from .spsa import SPSA

BUILT_IN: tuple[type[Minimiser], ...] = (FixedStepDescent, Adam, BFGS, LBFGSB, COBYLA, NelderMead, SPSA)
MINIMISER_NAMES: tuple[str, ...] = tuple(cls.name for cls in BUILT_IN)


def _fold(name: str) -> str:
    return "".join(ch for ch in name.lower() if ch.isalnum())


# class names used before a rename, still accepted by name (files and notebooks written earlier)
FORMER_CLASS_NAMES: dict[str, type[Minimiser]] = {"GradientDescent": FixedStepDescent}


def minimiser_from_name(name: str, **options: object) -> Minimiser:
    """The built-in minimiser called ``name`` (case, '-', '_' and spaces ignored), built with ``options``."""
    if isinstance(name, str):
        former = {_fold(old): cls for old, cls in FORMER_CLASS_NAMES.items()}
        for cls in BUILT_IN:
            if (_fold(cls.name) == _fold(name) or _fold(cls.__name__) == _fold(name)
                    or former.get(_fold(name)) is cls):
                try:
                    return cls(**options)
                except TypeError:
                    accepted = ", ".join(f.name for f in cls.__dataclass_fields__.values())
                    given = ", ".join(sorted(options))
                    raise ComponentError(
                        f"{cls.__name__} does not take option(s) {given}; accepted options: {accepted}"
                    ) from None
    raise ComponentError(f"unknown minimiser {name!r}; accepted names: {', '.join(MINIMISER_NAMES)}")


__all__ = [
    "BFGS", "BUILT_IN", "COBYLA", "LBFGSB", "MINIMISER_NAMES", "SPSA", "Adam", "Ending", "FixedStepDescent",
    "IterationRecord", "Minimiser", "MinimiserOutcome", "NelderMead", "Session", "minimiser_from_name",
    "minimiser_options",
]
