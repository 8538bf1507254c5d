"""Unitary coupled cluster with singles and doubles, as a product of exact excitation exponentials."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from groundkit.constraints import Bool, OneOf
from groundkit.errors import ComponentError
from groundkit.registry import register
from groundkit.sector.excitation import Excitation
from groundkit.sector.hamiltonian import SectorHamiltonian
from groundkit.sector.perturbation import first_order_amplitudes, orbital_energies
from groundkit.sector.space import Sector
from groundkit.sector.tables import excitation_tables
from groundkit.trial_states.base import ExcitationPlan, TrialState
from groundkit.trial_states.excitation_sets import reference_doubles, reference_singles, spin_flip_sharing


@register("trial_state", "uccsd", label="UCCSD")
@dataclass(frozen=True, kw_only=True)
class UCCSD(TrialState):
    """All Sz-conserving singles and doubles from the reference, closed or open shell.

    Order of application: first every double, in spin blocks alpha-alpha, beta-beta, alpha-beta, then every single,
    alpha then beta (see :func:`~groundkit.trial_states.excitation_sets.reference_doubles` and
    :func:`~groundkit.trial_states.excitation_sets.reference_singles` for the order within a block). A double is
    ``((a, b), (j, i))`` with tau = a+_a a+_b a_j a_i, a single ``((a,), (i,))``.

    ``spin_adapted=True`` (closed shells only) lets each excitation share its parameter with its spin-flipped
    partner. ``init="mp2"`` starts the doubles at first-order Moller-Plesset amplitudes from the
    active-space integrals and the reference's Fock diagonal, singles at zero; ``init="zeros"`` starts at the
    reference.
    """

    spin_adapted: bool = False
    init: str = "zeros"

    constraints = {"spin_adapted": Bool(), "init": OneOf("zeros", "mp2")}

    def excitations(self, problem: Any) -> list[Excitation]:
        """Doubles, then singles, from the reference determinant."""
        alpha, beta = self.reference(problem)
        n = int(problem.n_orbitals)
        return reference_doubles(alpha, beta, n) + reference_singles(alpha, beta, n)

    def sharing(self, problem: Any, excitations: Sequence[Excitation]) -> list[tuple[int, float]] | None:
        """Spin-flip partners share one parameter when ``spin_adapted``."""
        if not self.spin_adapted:
            return None
        if problem.n_alpha != problem.n_beta:
            raise ComponentError(
                f"UCCSD(spin_adapted=True) needs a closed-shell problem; this one has {problem.n_alpha} alpha and "
                f"{problem.n_beta} beta electrons (multiplicity {getattr(problem, 'multiplicity', '?')}); "
                f"use spin_adapted=False"
            )
        return spin_flip_sharing(list(excitations))

    def initial_parameters(self, problem: Any, plan: ExcitationPlan) -> np.ndarray:
        """Zeros, or first-order amplitudes for the doubles when ``init="mp2"``."""
        if self.init == "zeros":
            return np.zeros(plan.n_parameters)
        return mp2_parameters(problem, plan)


def mp2_parameters(problem: Any, plan: ExcitationPlan) -> np.ndarray:
    """Parameters whose doubles angles are first-order amplitudes (see :mod:`groundkit.sector.perturbation`)."""
    sector = Sector(problem.n_orbitals, problem.n_alpha, problem.n_beta)
    hamiltonian = SectorHamiltonian(problem.h1, problem.h2, problem.n_alpha, problem.n_beta)
    reference = sector.determinant(*plan.reference)
    h_reference = hamiltonian.apply(reference)
    energies = orbital_energies(np.asarray(problem.h1), np.asarray(problem.h2), *plan.reference)
    tables = excitation_tables(plan.excitations, sector.alpha_strings, sector.beta_strings)
    angles = first_order_amplitudes(
        plan.excitations, tables, sector.index(*plan.reference), h_reference, energies
    )
    parameters = np.zeros(plan.n_parameters)
    seen = np.zeros(plan.n_parameters, dtype=bool)
    for angle, index, scale in zip(angles, plan.parameter_index, plan.scale):
        if not seen[index]:
            parameters[index] = angle / scale
            seen[index] = True
    return parameters
