"""The one interface of every objective: :class:`EnergySurface`, E(θ) of a trial state on a problem.

Two classes implement it: :class:`groundkit.objective.Objective` (fermionic trial states, in the determinant
space) and :class:`groundkit.qubit_states.QubitObjective` (qubit trial states, on a statevector). The adaptive
trial state grows fixed sequences whose objectives are one of those two. The runner, results, studies, widgets
and estimators see only this interface, so any trial state runs through ``run``, ``scan``, ``compare`` and batch
files alike.

Energies are in Hartree (core energy included), parameters are angles in radians, gradients in Hartree per
radian. An objective gives EXACT energies; estimates with a standard error belong to the pipeline's estimator
(``pipeline.measurement().estimate(θ)``), so :meth:`EnergySurface.estimate` refuses (see docs/measurement.md).

Warm starts. A scan hands each finished point to the next: :meth:`EnergySurface.handover` turns the final
parameters into plain JSON-ready data, and :meth:`EnergySurface.warm_start` of the next geometry's objective turns
that data into starting parameters. Fermionic objectives match the active orbitals of the two geometries by
overlap and carry each excitation's angle over with its phases; qubit objectives reuse the parameter vector as it
is (a qubit trial state's parameters refer to qubits, not to orbitals). See docs/studies.md.
"""

from __future__ import annotations

from abc import ABC, abstractmethod
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from .errors import ComponentError

if TYPE_CHECKING:  # pragma: no cover
    from .molecule import MoleculeSpec
    from .problem import Problem
    from .qubits import QubitEncoding


@dataclass(frozen=True)
class WarmStart:
    """Where a scan point starts: ``parameters`` (radians; None for the trial state's own start), a readable
    ``note`` ('cold ...' or 'warm (...)') and ``orbital_match``, the smallest matched orbital overlap (None where
    orbitals were not matched)."""

    parameters: np.ndarray | None
    note: str
    orbital_match: float | None = None

    @classmethod
    def cold(cls, reason: str = "") -> WarmStart:
        """No warm start; ``reason`` says why (empty for a first point)."""
        return cls(None, f"cold ({reason})" if reason else "cold")


class EnergySurface(ABC):
    """E(θ) = ⟨ψ(θ)|H|ψ(θ)⟩ of one trial state on one problem, exact; see the module docstring.

    Attributes every implementation sets: ``problem`` (the :class:`~groundkit.problem.Problem`) and
    ``trial_state`` (the component it evaluates).
    """

    problem: Problem
    trial_state: Any

    # parameters ---------------------------------------------------------------------------------------------
    @property
    @abstractmethod
    def n_parameters(self) -> int:
        """Length of the parameter vector."""

    @property
    @abstractmethod
    def parameter_labels(self) -> tuple[str, ...]:
        """A readable name per parameter."""

    @abstractmethod
    def initial_parameters(self) -> np.ndarray:
        """The trial state's starting parameters (radians; a new array each call)."""

    @abstractmethod
    def check_parameters(self, theta: Any) -> np.ndarray:
        """``theta`` as a float array of length :attr:`n_parameters`, or a ParameterError."""

    # energies -----------------------------------------------------------------------------------------------
    @abstractmethod
    def energy(self, theta: Any) -> float:
        """E(θ) in Hartree, exact."""

    @abstractmethod
    def energy_and_gradient(self, theta: Any) -> tuple[float, np.ndarray]:
        """(E(θ), dE/dθ) in Hartree and Hartree per radian, exact."""

    def estimate(self, theta: Any) -> tuple[float, float]:
        """Refused: an objective is exact and shared by pipelines with any estimator, so it cannot give the
        pipeline's estimate. Use ``pipeline.measurement().estimate(θ)`` (value, standard error) or
        :meth:`energy` (the exact value)."""
        raise ComponentError(
            f"{type(self).__name__}.estimate is not available: an objective gives exact energies only and does not "
            "know the pipeline's estimator. Call pipeline.measurement().estimate(theta) for the estimator's "
            "(energy, standard error) in Ha, or objective.energy(theta) for the exact energy"
        )

    # the state and what is read from it ---------------------------------------------------------------------
    @abstractmethod
    def state(self, theta: Any) -> np.ndarray:
        """ψ(θ) in the objective's own representation (a CI array or a statevector), normalised."""

    @abstractmethod
    def exact_state(self) -> np.ndarray:
        """The problem's exact reference state in the same representation as :meth:`state`."""

    @abstractmethod
    def register_state(self, theta: Any, encoding: QubitEncoding) -> np.ndarray:
        """ψ(θ) as a statevector on ``encoding``'s qubit register (length 2^n, qubit 0 most significant); a
        SymmetryError when the state leaves a tapered register's symmetry sector."""

    @abstractmethod
    def spin_square(self, theta: Any) -> float:
        """⟨S²⟩ of ψ(θ)."""

    @abstractmethod
    def particle_number(self, theta: Any) -> float:
        """⟨N⟩ of ψ(θ), electrons in the active space."""

    @abstractmethod
    def amplitudes(self, theta: Any, threshold: float = 1e-8) -> dict[str, Any]:
        """Determinant label (or bitstring) -> amplitude, largest first, omitting |amplitude| < ``threshold``."""

    # warm starts ----------------------------------------------------------------------------------------------
    @abstractmethod
    def handover(self, theta: Any) -> dict[str, Any]:
        """Plain JSON-ready data from which :meth:`warm_start` at a neighbouring geometry starts; holds a
        ``"kind"`` key naming the transfer ('orbital-matching' or 'parameter-reuse')."""

    @abstractmethod
    def warm_start(self, previous: MoleculeSpec, handover: dict[str, Any]) -> WarmStart:
        """Starting parameters for this objective from the :meth:`handover` of the same trial state at the
        molecule ``previous``; a cold :class:`WarmStart` with the reason when the handover does not fit."""


def handover_kind(handover: dict[str, Any]) -> str:
    """The transfer a handover asks for. Handovers written before kinds were recorded hold either orbitals
    (orbital matching) or an adaptive qubit pool's Pauli strings (parameter reuse)."""
    kind = handover.get("kind")
    if kind is None and "orbitals" in handover:
        return "orbital-matching"
    if kind is None and "strings" in handover:
        return "parameter-reuse"
    return str(kind)
