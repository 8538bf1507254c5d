"""The fermionic trial-state protocol: an ordered product of excitation exponentials on a reference determinant.

A trial state is a component: its constructor only stores options, and it computes nothing until it is given a
problem. Given one, it declares

- :meth:`TrialState.excitations`: the ordered excitations; the first listed acts first on the reference, so the
  state is ``exp(theta_K G_K) ... exp(theta_1 G_1) |reference>``;
- :meth:`TrialState.reference`: the reference determinant as (alpha string, beta string), default Hartree-Fock;
- :meth:`TrialState.sharing`: optionally, which parameter drives each excitation and with which factor
  (``theta_k = factor_k * parameters[index_k]``), default one parameter per excitation;
- :meth:`TrialState.initial_parameters`: the starting parameters, default zeros.

The engine (:class:`groundkit.objective.Objective`) does everything else. A subclass overrides ``excitations`` and
whichever of the others it needs; :meth:`TrialState.plan` checks and assembles the answers.
"""

from __future__ import annotations

from abc import abstractmethod
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from groundkit.component import Component
from groundkit.errors import ComponentError, ParameterError
from groundkit.sector.excitation import Excitation, check_excitations
from groundkit.sector.space import lowest_strings
from groundkit.sector.strings import popcount


@dataclass(frozen=True)
class ExcitationPlan:
    """What a trial state declares for one problem, checked.

    ``excitations`` in order of application; excitation k turns by ``scale[k] * parameters[parameter_index[k]]``
    radians; ``reference`` is (alpha string, beta string); ``labels`` names each parameter.
    """

    excitations: tuple[Excitation, ...]
    parameter_index: tuple[int, ...]
    scale: tuple[float, ...]
    n_parameters: int
    reference: tuple[int, int]
    labels: tuple[str, ...]

    def angles(self, parameters: np.ndarray) -> np.ndarray:
        """Rotation angle of every excitation (radians) for a parameter vector."""
        return np.asarray(self.scale) * np.asarray(parameters, dtype=float)[list(self.parameter_index)]

    def restricted(self, keep: Sequence[bool]) -> ExcitationPlan:
        """The plan with only the excitations where ``keep`` is True; parameters that drive none are dropped and
        the rest renumbered in order."""
        kept = [k for k, flag in enumerate(keep) if flag]
        old_index = sorted({self.parameter_index[k] for k in kept})
        new_index = {old: new for new, old in enumerate(old_index)}
        return ExcitationPlan(
            excitations=tuple(self.excitations[k] for k in kept),
            parameter_index=tuple(new_index[self.parameter_index[k]] for k in kept),
            scale=tuple(self.scale[k] for k in kept),
            n_parameters=len(old_index),
            reference=self.reference,
            labels=tuple(self.labels[i] for i in old_index),
        )

    def parameter_gradient(self, angle_gradient: np.ndarray) -> np.ndarray:
        """Chain rule from derivatives by excitation angle to derivatives by parameter."""
        weights = np.asarray(self.scale) * np.asarray(angle_gradient, dtype=float)
        index = np.asarray(self.parameter_index, dtype=np.intp)
        return np.bincount(index, weights=weights, minlength=self.n_parameters)[: self.n_parameters]


class TrialState(Component, role="trial_state"):
    """Base class of fermionic trial states; see the module docstring for the subclass API."""

    @abstractmethod
    def excitations(self, problem: Any) -> Sequence[Excitation | tuple]:
        """Ordered excitations ``((creators...), (annihilators...))`` in interleaved spin orbitals."""

    def reference(self, problem: Any) -> tuple[int, int]:
        """Reference determinant (alpha string, beta string): the lowest orbitals, i.e. Hartree-Fock."""
        return lowest_strings(problem.n_alpha, problem.n_beta)

    def sharing(self, problem: Any, excitations: Sequence[Excitation]) -> Sequence[tuple[int, float]] | None:
        """(parameter index, factor) per excitation, or ``None`` for one parameter per excitation."""
        return None

    def initial_parameters(self, problem: Any, plan: ExcitationPlan) -> np.ndarray:
        """Starting parameters (radians), zeros unless a subclass says otherwise."""
        return np.zeros(plan.n_parameters)

    def plan(self, problem: Any) -> ExcitationPlan:
        """Check and assemble what this trial state declares for ``problem``."""
        n_spin_orbitals = 2 * int(problem.n_orbitals)
        excitations = tuple(check_excitations(self.excitations(problem), n_spin_orbitals))
        reference = _checked_reference(self.reference(problem), problem)
        shared = self.sharing(problem, excitations)
        if shared is None:
            index = tuple(range(len(excitations)))
            scale = (1.0,) * len(excitations)
        else:
            shared = list(shared)
            if len(shared) != len(excitations):
                raise ComponentError(
                    f"{type(self).__name__}.sharing gave {len(shared)} entries for {len(excitations)} excitations"
                )
            index = tuple(int(i) for i, _ in shared)
            scale = tuple(float(f) for _, f in shared)
            if sorted(set(index)) != list(range(len(set(index)))):
                raise ComponentError(
                    f"{type(self).__name__}.sharing uses parameter indices {sorted(set(index))}; they must be "
                    f"0, 1, ... without gaps"
                )
        n_parameters = len(set(index))
        labels = [""] * n_parameters
        for excitation, i in zip(excitations, index):
            if not labels[i]:
                labels[i] = excitation_label(excitation)
        return ExcitationPlan(excitations, index, scale, n_parameters, reference, tuple(labels))

    def checked_initial_parameters(self, problem: Any, plan: ExcitationPlan) -> np.ndarray:
        """:meth:`initial_parameters`, checked for length and finiteness."""
        values = np.asarray(self.initial_parameters(problem, plan), dtype=float)
        if values.shape != (plan.n_parameters,) or not np.all(np.isfinite(values)):
            raise ParameterError(
                f"{type(self).__name__}.initial_parameters gave shape {values.shape} "
                f"(finite: {bool(np.all(np.isfinite(values)))}); expected {plan.n_parameters} finite values"
            )
        return values


def excitation_label(excitation: Excitation) -> str:
    """Short readable label such as ``'0a,1b->2a,3b'`` (spatial orbital and spin of each index)."""

    def name(p: int) -> str:
        return f"{p // 2}{'a' if p % 2 == 0 else 'b'}"

    removed = ",".join(name(q) for q in sorted(excitation.annihilators))
    added = ",".join(name(p) for p in sorted(excitation.creators))
    return f"{removed}->{added}"


def _checked_reference(reference: tuple[int, int], problem: Any) -> tuple[int, int]:
    try:
        alpha, beta = (int(v) for v in reference)
    except (TypeError, ValueError):
        raise ComponentError(f"reference {reference!r} is not a pair of integers (alpha string, beta string)") from None
    n = int(problem.n_orbitals)
    for spin, string, count in (("alpha", alpha, problem.n_alpha), ("beta", beta, problem.n_beta)):
        if string < 0 or string >= 1 << n or int(popcount(np.array([string]))[0]) != int(count):
            raise ComponentError(
                f"reference {spin} string {string:#b} must have {count} electrons in {n} orbitals"
            )
    return alpha, beta
