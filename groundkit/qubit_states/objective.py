"""QubitObjective: the energy of a qubit trial state on a qubit Hamiltonian, on a numpy statevector.

Implements :class:`groundkit.energy_surface.EnergySurface`, as :class:`groundkit.objective.Objective` does. Energies
in Hartree (core energy included, as in the qubit Hamiltonian); parameters in radians; gradients by the adjoint
method (see :mod:`.program`). Warm starts across geometries reuse the parameter vector as it is.
"""

from __future__ import annotations

from functools import cached_property
from typing import Any

import numpy as np

from ..energy_surface import EnergySurface, WarmStart, handover_kind
from ..errors import ComponentError
from ..sector.strings import determinant_label, make_strings
from ..workspace import workspace
from .base import QubitTrialState
from .parameters import checked_parameters


def shared_sparse_hamiltonian(encoding: Any) -> Any:
    """The encoding's sparse qubit Hamiltonian, built once per encoding (objectives of one register share it;
    kept in the workspace as long as the encoding lives)."""
    return workspace().fetch("sparse operator", ("hamiltonian", id(encoding)), encoding.sparse_hamiltonian,
                             owner=encoding)


class QubitObjective(EnergySurface):
    """E(θ) = ⟨ψ(θ)|H_qubit|ψ(θ)⟩ for a :class:`QubitTrialState` on a :class:`~groundkit.qubits.QubitEncoding`."""

    def __init__(self, encoding: Any, trial_state: QubitTrialState) -> None:
        if not isinstance(trial_state, QubitTrialState):
            raise ComponentError(
                f"trial state {trial_state!r} is not a QubitTrialState; use HardwareEfficient(...), "
                "CircuitTrialState(circuit) or a QubitTrialState subclass"
            )
        self.encoding = encoding
        self.problem = encoding.problem
        self.trial_state = trial_state
        self.circuit, self.symbols = trial_state.checked_circuit(encoding)
        self.program = trial_state.state_program(encoding, self.circuit, self.symbols)
        self.hamiltonian = shared_sparse_hamiltonian(encoding)
        self._initial: np.ndarray | None = None

    def __repr__(self) -> str:
        return (f"QubitObjective({self.trial_state!r}, {self.n_parameters} parameters, "
                f"{self.encoding.n_qubits} qubits, {self.encoding.mapping!r})")

    @property
    def n_parameters(self) -> int:
        """Length of the parameter vector."""
        return len(self.symbols)

    @property
    def parameter_labels(self) -> tuple[str, ...]:
        """The symbol name of each parameter."""
        return tuple(s.name for s in self.symbols)

    def initial_parameters(self) -> np.ndarray:
        """The trial state's starting parameters (radians; a new array each call)."""
        if self._initial is None:
            self._initial = self.trial_state.checked_initial_parameters(self.encoding, self.n_parameters)
        return self._initial.copy()

    def check_parameters(self, theta: Any) -> np.ndarray:
        """``theta`` as a float array of length :attr:`n_parameters`, or :class:`ParameterError`."""
        return checked_parameters(theta, self.n_parameters, self.trial_state)

    def state(self, theta: Any) -> np.ndarray:
        """Statevector ψ(θ), length 2^n, qubit 0 the most significant bit."""
        return self.program.state(self.check_parameters(theta))

    def _expectation(self, matrix: Any, theta: Any) -> float:
        psi = self.state(theta)
        return float(np.vdot(psi, matrix @ psi).real)

    def energy(self, theta: Any) -> float:
        """E(θ) in Hartree."""
        return self._expectation(self.hamiltonian, theta)

    def energy_and_gradient(self, theta: Any) -> tuple[float, np.ndarray]:
        """(E(θ), dE/dθ) in Hartree and Hartree per radian, by one adjoint sweep."""
        return self.program.energy_and_gradient(self.check_parameters(theta), self.hamiltonian.dot)

    def exact_state(self) -> np.ndarray:
        """The problem's exact reference embedded on this objective's register."""
        return self.encoding.embed(self.problem.reference.ci)

    def register_state(self, theta: Any, encoding: Any) -> np.ndarray:
        """ψ(θ); ``encoding`` must be this objective's own register (a qubit state is built for one register)."""
        if encoding is not self.encoding and (encoding.n_qubits != self.encoding.n_qubits
                                              or encoding.mapping != self.encoding.mapping):
            raise ComponentError(
                f"{self.trial_state!r} was built on {self.encoding.n_qubits} qubits under {self.encoding.mapping!r}; "
                f"it cannot be measured on {encoding.n_qubits} qubits under {encoding.mapping!r}"
            )
        return np.asarray(self.state(theta), dtype=complex)

    def handover(self, theta: Any) -> dict[str, Any]:
        """The parameters (radians) at ``theta`` with the register they act on, for reuse at the next geometry."""
        return {"kind": "parameter-reuse", "parameters": [float(x) for x in self.check_parameters(theta)],
                "n_qubits": int(self.encoding.n_qubits), "trial_state": repr(self.trial_state)}

    def warm_start(self, previous: Any, handover: dict[str, Any]) -> WarmStart:
        """The previous point's parameters, unchanged, when they fit this register and trial state; cold otherwise.

        A qubit trial state's parameters refer to qubits, so no orbital matching applies: an orbital whose phase
        flipped between the geometries changes the Hamiltonian the reused angles meet (the minimiser then corrects).
        """
        kind = handover_kind(handover)
        if kind != "parameter-reuse":
            return WarmStart.cold(f"previous point hands over by {kind}, this trial state reuses parameters")
        values = np.asarray(handover.get("parameters", ()), dtype=float)
        if int(handover.get("n_qubits", -1)) != self.encoding.n_qubits or values.shape != (self.n_parameters,):
            return WarmStart.cold(
                f"previous point has {values.size} parameters on {handover.get('n_qubits')} qubits, this one "
                f"{self.n_parameters} on {self.encoding.n_qubits}")
        if not np.all(np.isfinite(values)):
            return WarmStart.cold("previous point's parameters are not finite")
        return WarmStart(values, f"warm ({values.size}/{self.n_parameters} parameters reused, no orbital matching)")

    @cached_property
    def _spin_square(self) -> Any:
        from openfermion import get_sparse_operator

        return get_sparse_operator(self.encoding.spin_square_operator(), n_qubits=self.encoding.n_qubits).tocsr()

    @cached_property
    def _number(self) -> Any:
        from openfermion import get_sparse_operator

        return get_sparse_operator(self.encoding.number_operator(), n_qubits=self.encoding.n_qubits).tocsr()

    def spin_square(self, theta: Any) -> float:
        """⟨S²⟩ of ψ(θ)."""
        return self._expectation(self._spin_square, theta)

    def particle_number(self, theta: Any) -> float:
        """⟨N⟩ of ψ(θ) (electrons in the active space)."""
        return self._expectation(self._number, theta)

    @cached_property
    def _determinants(self) -> dict[int, tuple[str, float]]:
        """Basis index -> (determinant label, phase) for the images of the sector's determinants."""
        p = self.problem
        alpha, beta = make_strings(p.n_orbitals, p.n_alpha), make_strings(p.n_orbitals, p.n_beta)
        aa, bb = (grid.ravel() for grid in np.meshgrid(alpha, beta, indexing="ij"))
        index, phase, inside = self.encoding.basis_states(aa, bb)
        return {int(i): (determinant_label(int(a), int(b), p.n_orbitals), float(s))
                for i, s, ok, a, b in zip(index, phase, inside, aa, bb) if ok}

    def amplitudes(self, theta: Any, threshold: float = 1e-8) -> dict[str, complex]:
        """Label -> amplitude, largest |amplitude| first, omitting |amplitude| < ``threshold``.

        A basis state that is the image of a determinant of the problem's sector is labelled by its occupation
        string ('2', 'a', 'b', '0' per orbital) and its amplitude carries OpenFermion's sign convention, as in
        :meth:`Objective.amplitudes`; any other basis state is labelled by its bitstring (qubit 0 first).
        """
        psi = self.state(theta)
        n = self.encoding.n_qubits
        keep = np.flatnonzero(np.abs(psi) >= threshold)
        keep = keep[np.argsort(-np.abs(psi[keep]), kind="stable")]
        out: dict[str, complex] = {}
        for k in keep:
            label, phase = self._determinants.get(int(k), (format(int(k), f"0{n}b"), 1.0))
            out[label] = complex(psi[k] * phase)
        return out
