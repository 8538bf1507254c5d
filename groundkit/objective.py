"""Energy of a fermionic trial state as a function of its parameters, computed in the determinant space.

``Objective(problem, trial_state)`` builds, once, the sector of the problem's electron numbers, the excitation
tables of the trial state, the Hamiltonian contraction and the reference determinant, and reuses them in every
call. Energies are in Hartree and include ``problem.core_energy``; parameters are angles in radians. It implements
:class:`groundkit.energy_surface.EnergySurface`; warm starts across geometries match orbitals by overlap.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from groundkit.energy_surface import EnergySurface, WarmStart, handover_kind
from groundkit.errors import ComponentError, ParameterError, SymmetryError
from groundkit.orbital_matching import orbital_handover, orbital_warm_start
from groundkit.sector.adjoint import energy_and_angle_gradient
from groundkit.sector.exponential import apply_product
from groundkit.sector.hamiltonian import SectorHamiltonian
from groundkit.sector.space import MAX_DETERMINANTS, Sector
from groundkit.sector.spin import spin_square
from groundkit.sector.steps import Steps
from groundkit.sector.tables import excitation_tables
from groundkit.trial_states.base import ExcitationPlan, TrialState


class Objective(EnergySurface):
    """E(theta) = <psi(theta)|H|psi(theta)> for a fermionic trial state on a problem.

    Energies, gradients and amplitudes need only ``n_orbitals``, ``n_alpha``, ``n_beta``, ``h1``, ``h2``
    (chemists' notation, Hartree) and ``core_energy`` (Hartree) of the problem; :meth:`exact_state` needs its
    ``reference`` and the warm starts its SCF orbitals (a :class:`~groundkit.problem.Problem` has both).
    ``plan`` replaces the trial state's own plan (e.g. restricted to a symmetry sector by
    :func:`groundkit.qubits.sector_plan`).
    """

    def __init__(self, problem: Any, trial_state: TrialState, *, max_determinants: int = MAX_DETERMINANTS,
                 plan: ExcitationPlan | None = None):
        if not isinstance(trial_state, TrialState):
            raise ComponentError(
                f"trial state {trial_state!r} is not a fermionic TrialState; use UCCSD(), PairDoubles(), "
                "UpCCGSD(k=...), ExcitationList([...]), ReferenceDeterminant() or a TrialState subclass"
            )
        self.problem = problem
        self.trial_state = trial_state
        self.sector = Sector(problem.n_orbitals, problem.n_alpha, problem.n_beta, max_determinants)
        self.plan: ExcitationPlan = trial_state.plan(problem) if plan is None else plan
        self.tables = excitation_tables(self.plan.excitations, self.sector.alpha_strings, self.sector.beta_strings)
        self.steps = Steps(self.tables, self.sector.shape)
        self.hamiltonian = SectorHamiltonian(
            problem.h1, problem.h2, problem.n_alpha, problem.n_beta, float(problem.core_energy)
        )
        self.reference_state = self.sector.determinant(*self.plan.reference)
        self._initial: np.ndarray | None = None

    def __repr__(self) -> str:
        return (
            f"Objective({self.trial_state!r}, {self.n_parameters} parameters, {len(self.tables)} excitations, "
            f"{self.sector.size:,} determinants)"
        )

    @property
    def n_parameters(self) -> int:
        """Length of the parameter vector."""
        return self.plan.n_parameters

    @property
    def parameter_labels(self) -> tuple[str, ...]:
        """Readable name of each parameter (the first excitation it drives)."""
        return self.plan.labels

    def initial_parameters(self) -> np.ndarray:
        """The trial state's starting parameters (radians; a new array each call)."""
        if self._initial is None:
            self._initial = self.trial_state.checked_initial_parameters(self.problem, self.plan)
        return self._initial.copy()

    def check_parameters(self, theta: Any) -> np.ndarray:
        """``theta`` as a float array of length :attr:`n_parameters`, or :class:`ParameterError`."""
        try:
            values = np.asarray(theta, dtype=float)
        except (TypeError, ValueError):
            raise ParameterError(
                f"parameters {theta!r} are not numbers; expected {self.n_parameters} finite values"
            ) from None
        if values.ndim != 1 or values.size != self.n_parameters:
            raise ParameterError(
                f"parameter vector has shape {values.shape}; expected {self.n_parameters} values (one per "
                f"parameter of {self.trial_state!r})"
            )
        bad = np.flatnonzero(~np.isfinite(values))
        if bad.size:
            raise ParameterError(
                f"parameter {int(bad[0])} is {float(values[bad[0]])!r}; expected {self.n_parameters} finite values"
            )
        return values

    def state(self, theta: Any) -> np.ndarray:
        """CI array psi(theta), shape (alpha strings, beta strings), PySCF's determinant order and signs."""
        angles = self.plan.angles(self.check_parameters(theta))
        return apply_product(self.reference_state, self.steps, angles)

    def energy(self, theta: Any) -> float:
        """E(theta) in Hartree."""
        return self.hamiltonian.energy(self.state(theta))

    def energy_and_gradient(self, theta: Any) -> tuple[float, np.ndarray]:
        """(E(theta), dE/dtheta) in Hartree and Hartree per radian, by one adjoint sweep."""
        angles = self.plan.angles(self.check_parameters(theta))
        energy, angle_gradient = energy_and_angle_gradient(
            self.reference_state, self.steps, angles, self.hamiltonian.apply
        )
        return energy + self.hamiltonian.core_energy, self.plan.parameter_gradient(angle_gradient)

    def exact_state(self) -> np.ndarray:
        """The problem's exact reference as a CI array of this objective's sector."""
        return np.asarray(self.problem.reference.ci)

    def register_state(self, theta: Any, encoding: Any) -> np.ndarray:
        """psi(theta) embedded on ``encoding``'s register; SymmetryError if weight falls outside a tapered sector."""
        vector = encoding.embed(self.state(theta))
        lost = 1.0 - float(np.vdot(vector, vector).real)
        if lost > 1e-9:
            raise SymmetryError(
                f"the trial state has weight {lost:.3g} outside the tapered symmetry sector of {encoding.mapping!r}; "
                "build the objective through the pipeline (it keeps symmetry-conserving excitations only)"
            )
        return vector

    def particle_number(self, theta: Any) -> float:
        """<N> of psi(theta): every determinant of the sector holds the problem's electrons, so N times the norm."""
        psi = self.state(theta)
        return float(self.sector.n_alpha + self.sector.n_beta) * float(np.vdot(psi, psi).real)

    def handover(self, theta: Any) -> dict[str, Any]:
        """Active orbitals, excitations and parameters (radians) at ``theta``, for a warm start by orbital matching."""
        return orbital_handover(self.problem, self.plan, self.check_parameters(theta))

    def warm_start(self, previous: Any, handover: dict[str, Any]) -> WarmStart:
        """Parameters carried from ``handover`` (of the molecule ``previous``) after matching the active orbitals of
        both geometries by overlap (phases and order fixed); excitations with no counterpart start at zero."""
        kind = handover_kind(handover)
        if kind != "orbital-matching":
            return WarmStart.cold(f"previous point hands over by {kind}, this trial state needs orbital matching")
        return orbital_warm_start(self.problem, self.plan, previous, handover)

    def spin_square(self, theta: Any) -> float:
        """<S^2> of psi(theta)."""
        return spin_square(self.state(theta), self.sector.n_orbitals, self.sector.n_alpha, self.sector.n_beta)

    def amplitudes(self, theta: Any, threshold: float = 1e-8) -> dict[str, float]:
        """Determinant label -> amplitude, largest |amplitude| first, omitting |amplitude| < ``threshold``.

        Amplitudes carry OpenFermion's interleaved sign convention (basis state (a+_0)^n0 (a+_1)^n1 ... |vac>), so
        they agree with the Jordan-Wigner statevector entry of the same determinant.
        """
        ci = self.state(theta) * self.sector.interleaved_signs()
        flat = ci.ravel()
        keep = np.flatnonzero(np.abs(flat) >= threshold)
        keep = keep[np.argsort(-np.abs(flat[keep]), kind="stable")]
        n_beta_strings = self.sector.shape[1]
        return {self.sector.label(int(k) // n_beta_strings, int(k) % n_beta_strings): float(flat[k]) for k in keep}
