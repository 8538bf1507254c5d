"""Adaptive: the trial state that grows one operator at a time (configuration only)."""

from __future__ import annotations

import math
from dataclasses import MISSING, dataclass, fields, replace
from numbers import Real
from typing import Any

from groundkit.adaptive.pools import OperatorPool, SinglesDoublesPool, as_pool
from groundkit.errors import ComponentError, ExcitationError
from groundkit.minimisers import Minimiser
from groundkit.qubit_states.pauli_rotations import pauli_label
from groundkit.sector.excitation import Excitation, as_excitation
from groundkit.trial_states.base import ExcitationPlan, TrialState


@dataclass(frozen=True, kw_only=True, repr=False)
class Adaptive(TrialState):
    """Grow the trial state from Hartree-Fock by the pool operator of largest energy gradient, re-minimising every
    parameter after each addition (Grimsley, Economou, Barnes, Mayhall, Nat. Commun. 10, 3007 (2019)).

    - ``pool``: an :class:`~groundkit.adaptive.pools.OperatorPool` or a name (``"singles-doubles"``, the
      default, ``"generalised"``, or ``"qubit"`` for :class:`~groundkit.adaptive.QubitPool`).
    - ``gradient_threshold`` (Hartree per radian): stop when the Euclidean norm of the pool gradients is below it.
    - ``max_operators``: cap on the length of the operator sequence (None: no cap).
    - ``minimiser``: minimises all parameters after each addition; None uses the pipeline's minimiser.
    - ``energy_tolerance`` (Hartree): stop when an addition lowers the energy by less than this. It must be
      positive, which guarantees that the growth ends.
    - ``repeats``: whether an operator may be chosen again (True, as in the paper); when False, the growth also
      stops once every operator is used ("pool exhausted").
    - ``start_from``: operators the sequence starts with, e.g. the sequence grown at a neighbouring geometry
      (:meth:`continued`); they are minimised first, then growth continues. Excitations for fermionic pools,
      Pauli-string labels such as ``"Y0 X2"`` for qubit pools.

    Only ``Pipeline.run()`` grows the state: ``Pipeline.objective()`` raises a ComponentError, since the
    sequence is known only after the run (use :func:`~groundkit.adaptive.grown_trial_state` for a fixed one).
    """

    pool: OperatorPool | str = SinglesDoublesPool()
    gradient_threshold: float = 1e-3
    max_operators: int | None = None
    minimiser: Minimiser | None = None
    energy_tolerance: float = 1e-8
    repeats: bool = True
    start_from: tuple[Excitation | str, ...] = ()

    def __post_init__(self) -> None:
        object.__setattr__(self, "pool", as_pool(self.pool))
        for name in ("gradient_threshold", "energy_tolerance"):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, Real) or not math.isfinite(value) or value <= 0:
                unit = "Hartree per radian" if name == "gradient_threshold" else "Hartree"
                raise ComponentError(f"Adaptive({name}={value!r}): {name} must be a finite number > 0 ({unit})")
        cap = self.max_operators
        if cap is not None and (isinstance(cap, bool) or not isinstance(cap, int) or cap < 1):
            raise ComponentError(f"Adaptive(max_operators={cap!r}): max_operators must be None or an integer >= 1")
        if self.minimiser is not None and not isinstance(self.minimiser, Minimiser):
            raise ComponentError(
                f"Adaptive(minimiser={self.minimiser!r}): give a Minimiser such as BFGS(), or None for the "
                f"pipeline's minimiser"
            )
        if not isinstance(self.repeats, bool):
            raise ComponentError(f"Adaptive(repeats={self.repeats!r}): repeats must be True or False")
        if isinstance(self.start_from, (str, bytes)) or not hasattr(self.start_from, "__iter__"):
            raise ExcitationError(f"Adaptive(start_from={self.start_from!r}): give a list of excitations")
        object.__setattr__(self, "start_from", tuple(pauli_label(e) if isinstance(e, str) else as_excitation(e)
                                                    for e in self.start_from))
        if cap is not None and len(self.start_from) > cap:
            raise ComponentError(
                f"Adaptive(max_operators={cap}) is below the {len(self.start_from)} operators of start_from"
            )

    def __repr__(self) -> str:
        changed = []
        for f in fields(self):
            value = getattr(self, f.name)
            if f.name == "start_from":
                if value:
                    shown = [e if isinstance(e, str) else (e.creators, e.annihilators) for e in value]
                    changed.append(f"start_from={shown!r}")
            elif f.default is MISSING or value != f.default:
                changed.append(f"{f.name}={value!r}")
        return f"Adaptive({', '.join(changed)})"

    def continued(self, result: Any) -> Adaptive:
        """The same options, starting from the sequence grown in ``result`` (a RunResult of an Adaptive run).

        For a neighbouring geometry: pass ``initial_parameters=result.parameters`` to ``run`` as well.
        """
        from groundkit.adaptive.records import grown_sequence

        return replace(self, start_from=grown_sequence(result))

    # the TrialState protocol: no fixed plan before the run ----------------------------------------------------
    def excitations(self, problem: Any) -> list[Excitation]:
        """The excitations the growth starts from (``start_from``, Pauli strings left out); the grown sequence is
        known after the run."""
        return [e for e in self.start_from if isinstance(e, Excitation)]

    def plan(self, problem: Any) -> ExcitationPlan:
        """Refused: an adaptive state has no fixed plan until it has grown."""
        raise ComponentError(
            f"{self!r} has no fixed operator sequence before it grows, so it has no objective; call "
            f"Pipeline.run() to grow it, then use groundkit.adaptive.grown_trial_state(result) for a fixed "
            f"ExcitationList of the grown sequence"
        )
