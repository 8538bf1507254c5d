"""Orbital-optimised runs: the trial-state parameters and an orbital rotation minimised together.

E(theta, kappa) = <psi(theta)| H(C exp(K(kappa))) |psi(theta)>, with C the problem's orbitals (core, active,
external) and K the non-redundant rotations between the three spaces (:mod:`groundkit.orbitals.rotation`). Both
are minimised simultaneously by the pipeline's minimiser: the theta gradient comes from the determinant engine
in the rotated orbitals, the kappa gradient from the trial state's 1- and 2-RDMs through the generalised Fock
matrix (the orbital-optimised variational schemes of Mizukami et al., Phys. Rev. Research 2, 033421 (2020) and
Sokolov et al., J. Chem. Phys. 152, 124107 (2020), here with simultaneous rather than alternating steps).

Such a run is exact when the trial state is exact in the active space and the orbitals are optimal: its exact
reference is the CASSCF energy of the same active space (PySCF's ``mcscf.CASSCF``), and the result's
``reference.method`` says so. Energies in Hartree, angles in radians.
"""

from __future__ import annotations

from dataclasses import replace
from typing import TYPE_CHECKING, Any

import numpy as np

from .. import sizing
from ..errors import ComponentError, SizeLimitError
from ..objective import Objective
from ..sector.hamiltonian import SectorHamiltonian
from . import rotation, solvers

if TYPE_CHECKING:  # pragma: no cover
    from ..pipeline import Pipeline
    from ..problem import Problem
    from ..result import RunResult

NOTE_GAP = 1e-4  # Ha: final orbitals whose exact energy lies this far above CASSCF get a note
CASSCF_REFERENCE = ("CASSCF in the same active space (PySCF mcscf.CASSCF): the exact answer of an orbital-optimised "
                    "run, whose orbitals and active-space state are both optimised")


class OrbitalOptimisedSurface:
    """E and its gradient over x = (theta, kappa) for a fermionic trial state on a problem (see module docstring).

    ``objective`` is a private :class:`~groundkit.objective.Objective` whose Hamiltonian is replaced at every new
    kappa; ``full`` holds the integrals over every orbital of the problem's orbitals, ordered core, active,
    external.
    """

    def __init__(self, problem: Problem, trial_state: Any) -> None:
        space = problem.active_orbitals
        n_mo = problem.scf.n_orbitals
        memory = 8.0 * n_mo**4 * 2
        limit = sizing.limits.memory_limit()
        if limit is not None and memory > limit:
            raise SizeLimitError(f"an orbital-optimised run keeps the integrals over all {n_mo} orbitals "
                                 f"({sizing.format_bytes(memory)}), above the memory limit "
                                 f"{sizing.format_bytes(limit)}; choose a smaller basis set")
        self.problem = problem
        self.order = list(space.core) + list(space.active) + list(space.external)
        base = problem.scf.mo_coeff if space.mo_coeff is None else space.mo_coeff
        self.base_orbitals = np.asarray(base, dtype=float)[:, self.order]
        nuclear, h1, h2 = solvers.full_integrals(problem.scf, self.base_orbitals)
        self.full = rotation.FullIntegrals(nuclear, h1, h2, len(space.core), len(space.active))
        self.pairs = rotation.rotation_pairs(len(space.core), len(space.active), n_mo)
        self.objective = Objective(problem, trial_state)
        self.n_theta = self.objective.n_parameters
        self._kappa: np.ndarray | None = None
        self._rotated: tuple[np.ndarray, np.ndarray] | None = None

    @property
    def n_parameters(self) -> int:
        return self.n_theta + len(self.pairs)

    def split(self, x: Any) -> tuple[np.ndarray, np.ndarray]:
        x = np.asarray(x, dtype=float)
        return x[:self.n_theta], x[self.n_theta:]

    def orbitals(self, kappa: Any) -> np.ndarray:
        """The rotated orbitals C exp(K) (n_ao, n_mo), ordered core, active, external."""
        return self.base_orbitals @ rotation.rotation(np.asarray(kappa, dtype=float), self.pairs,
                                                      self.full.n_orbitals)

    def _set_rotation(self, kappa: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        if self._kappa is None or not np.array_equal(kappa, self._kappa):
            u = rotation.rotation(kappa, self.pairs, self.full.n_orbitals)
            h1, g = rotation.rotated_integrals(self.full, u)
            core_energy, h1_act, h2_act = rotation.active_hamiltonian(self.full, h1, g)
            p = self.problem
            self.objective.hamiltonian = SectorHamiltonian(h1_act, h2_act, p.n_alpha, p.n_beta, core_energy)
            self._kappa, self._rotated = kappa.copy(), (h1, g)
        return self._rotated  # type: ignore[return-value]

    def energy(self, x: Any) -> float:
        theta, kappa = self.split(x)
        self._set_rotation(kappa)
        return float(self.objective.energy(theta))

    def energy_and_gradient(self, x: Any) -> tuple[float, np.ndarray]:
        theta, kappa = self.split(x)
        h1, g = self._set_rotation(kappa)
        energy, theta_gradient = self.objective.energy_and_gradient(theta)
        kappa_gradient = self.orbital_gradient(theta, kappa, (h1, g))
        return float(energy), np.concatenate([theta_gradient, kappa_gradient])

    def orbital_gradient(self, theta: Any, kappa: Any, rotated: tuple[np.ndarray, np.ndarray] | None = None
                         ) -> np.ndarray:
        """dE/dkappa (Ha/rad) from the 1- and 2-RDMs of psi(theta) in the orbitals C exp(K(kappa))."""
        kappa = np.asarray(kappa, dtype=float)
        h1, g = rotated if rotated is not None else self._set_rotation(kappa)
        p = self.problem
        ci = np.asarray(self.objective.state(theta)).reshape(self.objective.sector.shape)
        d_act, g_act = solvers.state_densities(ci, p.n_orbitals, p.n_alpha, p.n_beta)
        d, gamma = rotation.full_densities(d_act, g_act, self.full.n_core)
        fock = rotation.generalised_fock(h1, g, d, gamma)
        k = rotation.generator(kappa, self.pairs, self.full.n_orbitals)
        return rotation.pair_gradient(k, fock, self.pairs)


def orbital_optimised_run(pipeline: Pipeline, *, initial_parameters: Any = None) -> RunResult:
    """Minimise the pipeline's fermionic trial state and the orbital rotation of its active space together,
    with the pipeline's minimiser and exact energies; returns a RunResult measured against the CASSCF energy of
    the same active space (``reference.method`` says so), its baselines in the final orbitals, and
    ``orbital_optimisation`` (pairs rotated, the largest final orbital gradient, the largest rotation angle,
    the CASSCF attempts).

    ``initial_parameters`` (theta only, radians) replaces the trial state's start; kappa starts at zero (the
    problem's own orbitals, of its ``orbital_set``). Sampled and noisy estimators are refused: the orbital
    gradient here is exact.
    """
    from ..minimisers import MinimiserOutcome
    from ..problem import Problem, build_problem
    from ..result import ReferenceRecord
    from ..runner import build_result
    from ..trial_states.base import TrialState

    components = pipeline.resolved_components()
    trial_state, estimator, minimiser = components["trial_state"], components["estimator"], components["minimiser"]
    if not isinstance(trial_state, TrialState):
        raise ComponentError(f"an orbital-optimised run needs a fermionic trial state (UCCSD(), PairDoubles(), "
                             f"...); got {trial_state!r}")
    if type(estimator).__name__ != "ExactEstimator":
        raise ComponentError(f"an orbital-optimised run uses exact energies and RDMs; got estimator {estimator!r}, "
                             "use ExactEstimator()")
    pipeline.check_size(("scf", "integrals", "engine"), "this orbital-optimised run")
    problem = pipeline.problem()
    surface = OrbitalOptimisedSurface(problem, trial_state)
    theta0 = surface.objective.initial_parameters() if initial_parameters is None else \
        surface.objective.check_parameters(initial_parameters)
    if surface.n_theta:  # first the trial state in the starting orbitals: the joint search then starts near a
        # physical state, where the orbital gradient is small (from a bare determinant it can run off to another
        # stationary point of the orbitals)
        first = minimiser.minimise(surface.objective.energy, theta0,
                                   energy_and_gradient=surface.objective.energy_and_gradient)
        theta0 = np.asarray(first.parameters, dtype=float)
    x0 = np.concatenate([theta0, np.zeros(len(surface.pairs))])
    if surface.n_parameters == 0:
        outcome = MinimiserOutcome(parameters=x0, energy=surface.energy(x0), converged=True,
                                   stop_reason="nothing to optimise", iterations=(), evaluations=1)
    else:
        outcome = minimiser.minimise(surface.energy, x0, energy_and_gradient=surface.energy_and_gradient)
    theta, kappa = surface.split(outcome.parameters)
    final_gradient = surface.orbital_gradient(theta, kappa)
    # the run's problem in its final orbitals: integrals, baselines, exact state and amplitudes there
    final_orbitals = _in_scf_order(problem, surface.orbitals(kappa), surface.order)
    final = Problem(problem.molecule, problem.active_space, orbitals=final_orbitals)
    objective = Objective(final, trial_state)
    theta_outcome = replace(outcome, parameters=theta, energy=float(objective.energy(theta)))
    result = build_result(pipeline, final, objective, theta_outcome, components)
    casscf = build_problem(problem.molecule, replace(problem.active_space, orbital_set="casscf"))
    reference = casscf.reference
    record = ReferenceRecord(energy=reference.energy, multiplicity=reference.multiplicity,
                             spin_square=reference.spin_square, amplitudes=reference.amplitudes,
                             method=CASSCF_REFERENCE)
    details = {
        "rotations": len(surface.pairs),
        "largest_orbital_gradient": float(np.max(np.abs(final_gradient))) if final_gradient.size else 0.0,
        "largest_rotation": float(np.max(np.abs(kappa))) if kappa.size else 0.0,
        "starting_orbitals": problem.active_space.orbital_set,
        "casscf_attempts": list(casscf.active_orbitals.orbital_attempts),
        "exact_in_final_orbitals": float(final.reference.energy),
    }
    gap = float(final.reference.energy) - reference.energy
    if gap > NOTE_GAP:
        details["note"] = (f"the exact energy in the final orbitals lies {1000 * gap:.3f} mHa above CASSCF: the "
                           "orbitals reached another stationary point (orbital optimisation is local; a space cut "
                           "from canonical orbitals can keep the wrong orbitals by symmetry). Start from "
                           "orbital_set='mp2-natural'")
    space_error = None if problem.known_active_space_error is None else replace(
        problem.known_active_space_error, active_energy=reference.energy).to_dict()
    return replace(result, reference=record, orbital_optimisation=details, active_space_error=space_error)


def _in_scf_order(problem: Problem, orbitals: np.ndarray, order: list[int]) -> np.ndarray:
    """Rotated orbitals (core, active, external order) put back in the problem's own orbital order, so the
    problem's core and active index lists pick them."""
    out = np.empty_like(orbitals)
    out[:, order] = orbitals
    return out
