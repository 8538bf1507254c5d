"""Pool gradients and sequence objectives in the determinant space.

Appending exp(theta G_k) to a state psi changes the energy at theta = 0 by

    dE/dtheta_k = <psi|[H, G_k]|psi> = 2 <H psi|G_k psi>     (real psi, G_k real antisymmetric),

so one H.psi serves every candidate; each G_k psi is then a gather over the pairs of its excitation table. The
whole pool costs one Hamiltonian pass and one cheap table pass, whatever its size.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from groundkit.errors import ComponentError
from groundkit.objective import Objective
from groundkit.sector.excitation import Excitation
from groundkit.sector.space import Sector, lowest_strings
from groundkit.sector.steps import Steps
from groundkit.sector.tables import excitation_tables
from groundkit.trial_states.base import excitation_label
from groundkit.trial_states.custom import ExcitationList


def pool_gradients(psi: np.ndarray, h_psi: np.ndarray, steps: Steps) -> np.ndarray:
    """2 <h_psi|G_k psi> for every step k (Hartree per radian when h_psi = H psi in Hartree).

    ``psi`` and ``h_psi`` are real CI arrays of the sector ``steps`` was built for.
    """
    psi = np.ascontiguousarray(psi, dtype=float)
    h_psi = np.ascontiguousarray(h_psi, dtype=float).reshape(psi.shape)
    views: dict[str, tuple[np.ndarray, np.ndarray]] = {"rows": (psi, h_psi), "flat": (psi.ravel(), h_psi.ravel())}
    if any(step.kind == "columns" for step in steps.steps):
        views["columns"] = (np.ascontiguousarray(psi.T), np.ascontiguousarray(h_psi.T))
    out = np.empty(len(steps))
    for k, step in enumerate(steps.steps):
        source, target = step.index()
        x, h = views[step.kind]
        out[k] = 2.0 * float(np.sum(step.signs() * (h[target] * x[source] - h[source] * x[target])))
    return out


class DeterminantPoolEngine:
    """A fermionic pool on one problem: its excitation tables, built once, and objectives of grown sequences.

    Grown states start from the Hartree-Fock determinant (the lowest orbitals), the reference of
    :class:`~groundkit.trial_states.ExcitationList`.
    """

    def __init__(self, problem: Any, operators: Sequence[Excitation], reference: tuple[int, int]):
        if tuple(reference) != lowest_strings(problem.n_alpha, problem.n_beta):
            raise ComponentError(
                f"reference {tuple(reference)!r}: the determinant pool engine grows from the Hartree-Fock "
                f"determinant {lowest_strings(problem.n_alpha, problem.n_beta)!r} only"
            )
        self.problem = problem
        self.operators: tuple[Excitation, ...] = tuple(operators)
        self.labels: tuple[str, ...] = tuple(excitation_label(e) for e in self.operators)
        sector = Sector(problem.n_orbitals, problem.n_alpha, problem.n_beta)
        tables = excitation_tables(self.operators, sector.alpha_strings, sector.beta_strings)
        self.steps = Steps(tables, sector.shape)

    def __len__(self) -> int:
        return len(self.operators)

    def trial_state(self, sequence: Sequence[Excitation]) -> ExcitationList:
        """The fixed trial state exp(theta_K G_K) ... exp(theta_1 G_1)|HF> of ``sequence`` (first acts first)."""
        return ExcitationList(list(sequence))

    def gradients(self, objective: Objective, parameters: np.ndarray) -> np.ndarray:
        """dE/dtheta (Hartree per radian) of each pool operator appended at zero to ``objective``'s state.

        ``objective`` is the determinant-space objective of :meth:`trial_state` of the current sequence.
        """
        psi = objective.state(parameters)
        return pool_gradients(psi, objective.hamiltonian.apply(psi), self.steps)
