"""Adaptive: the trial state that grows one operator at a time (configuration only)."""

from __future__ import annotations

from dataclasses import MISSING, dataclass, fields, replace
from typing import Any

from groundkit.adaptive.pools import OperatorPool, SinglesDoublesPool
from groundkit.constraints import Bool, ComponentOf, Constraint, Integer, ListOf, OrNone, Positive
from groundkit.errors import ComponentError
from groundkit.minimisers import Minimiser
from groundkit.qubit_states.pauli_rotations import pauli_label
from groundkit.registry import register
from groundkit.sector.excitation import Excitation, as_excitation
from groundkit.trial_states.base import ExcitationPlan, TrialState


class Operator(Constraint):
    """One operator of a growth sequence: an excitation ``((creators...), (annihilators...))`` or a Pauli-string
    label such as ``"Y0 X2"``."""

    def check(self, value: Any) -> Any:
        return pauli_label(value) if isinstance(value, str) else as_excitation(value)  # their own errors

    def describe(self) -> str:
        return "an excitation ((creators...), (annihilators...)) or a Pauli-string label such as 'Y0 X2'"


@register("trial_state", "adaptive", label="adaptive (grown operator by operator)")
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

    constraints = {
        "pool": ComponentOf("pool"),
        "gradient_threshold": Positive(unit="Hartree per radian"),
        "max_operators": OrNone(Integer(1)),
        "minimiser": OrNone(ComponentOf("minimiser")),
        "energy_tolerance": Positive(unit="Hartree"),
        "repeats": Bool(),
        "start_from": ListOf(Operator()),
    }

    def check_options(self) -> None:
        cap = self.max_operators
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

