"""NoisyEstimator: the compiled circuit under depolarising gate noise and readout error, on Cirq's density matrix.

After every one-qubit gate a one-qubit depolarising channel with probability ``one_qubit``, after every
two-qubit gate a two-qubit depolarising channel with probability ``two_qubit``; each measured bit flips with
probability ``readout``. Without ``shots`` the energy is the exact expectation under that noise (readout error
multiplies a Pauli term of weight w by (1 - 2 readout)^w); with ``shots`` it is sampled group by group from the
noisy outcome distribution.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import cirq
import numpy as np
from openfermion import QubitOperator, get_sparse_operator

from ..constraints import Integer, Interval, OrNone, Probability, Seed
from ..errors import ComponentError, SizeLimitError
from ..registry import register
from .base import Estimator, Measurement, central_differences
from .groups import measurement_groups, sample_group
from .sampled import allocate

NOISY_QUBIT_LIMIT = 10  # density matrices of 4^n entries: 10 qubits = 16 MB, and Cirq's simulation time grows fast


@register("estimator", "noisy", label="noisy circuit (gate and readout errors)")
@dataclass(frozen=True)
class NoisyEstimator(Estimator):
    """``NoisyEstimator(one_qubit=1e-3, two_qubit=1e-2, readout=1e-2, shots=None, seed=None)``; probabilities in
    [0, 1]. Refuses registers above ``NOISY_QUBIT_LIMIT`` qubits."""

    one_qubit: float = 1e-3
    two_qubit: float = 1e-2
    readout: float = 1e-2
    shots: int | None = None
    seed: int | None = None
    gradient_step: float = 0.1

    exact = False

    constraints = {
        "one_qubit": Probability(),
        "two_qubit": Probability(),
        "readout": Probability(),
        "shots": OrNone(Integer(1)),
        "seed": Seed(),
        "gradient_step": Interval(float, 0.0, np.pi, closed="neither", unit="radians"),
    }

    def measure(self, objective: Any, encoding: Any = None) -> NoisyMeasurement:
        if encoding is None:
            raise ComponentError("NoisyEstimator needs the qubit register: bind it through a pipeline")
        if encoding.n_qubits > NOISY_QUBIT_LIMIT:
            raise SizeLimitError(
                f"noisy simulation of {encoding.n_qubits} qubits is above the limit of {NOISY_QUBIT_LIMIT} qubits; "
                "use a smaller active space or tapering, or the SampledEstimator"
            )
        return NoisyMeasurement(self, objective, encoding)


class NoisyMeasurement(Measurement):
    """A NoisyEstimator bound to one objective and register."""

    exact = False
    provides_gradient = True

    def __init__(self, options: NoisyEstimator, objective: Any, encoding: Any) -> None:
        self.options = options
        self.objective = objective
        self.encoding = encoding
        self.n_qubits = encoding.n_qubits
        self.qubits = cirq.LineQubit.range(self.n_qubits)
        damped = QubitOperator()
        for term, c in encoding.hamiltonian.terms.items():
            damped += QubitOperator(term, c * (1.0 - 2.0 * options.readout) ** len(term))
        self._matrix = get_sparse_operator(damped, n_qubits=self.n_qubits).toarray()
        self.constant, self.groups = measurement_groups(encoding.hamiltonian, self.n_qubits, "qwc")
        self.rng = np.random.default_rng(options.seed)

    def noisy_circuit(self, theta: np.ndarray) -> cirq.Circuit:
        """The trial circuit with a depolarising channel after every gate."""
        from ..circuits import trial_circuit

        circuit = trial_circuit((self.encoding, self.objective.trial_state), theta)
        p1, p2 = self.options.one_qubit, self.options.two_qubit
        noisy = cirq.Circuit()
        for moment in circuit:
            noisy.append(moment)
            channels = []
            for op in moment.operations:
                if op.gate == cirq.I or cirq.num_qubits(op) > 2:
                    continue
                p = p1 if cirq.num_qubits(op) == 1 else p2
                if p > 0:
                    channels.append(cirq.depolarize(p, n_qubits=cirq.num_qubits(op)).on(*op.qubits))
            if channels:
                noisy.append(cirq.Moment(channels))
        return noisy

    def density_matrix(self, theta: np.ndarray) -> np.ndarray:
        """Final density matrix (2^n x 2^n, qubit 0 most significant) of the noisy circuit."""
        result = cirq.DensityMatrixSimulator(dtype=np.complex128).simulate(
            self.noisy_circuit(theta), qubit_order=self.qubits)
        return np.asarray(result.final_density_matrix)

    def estimate(self, theta: np.ndarray) -> tuple[float, float]:
        rho = self.density_matrix(theta)
        if self.options.shots is None:
            return float(np.real(np.trace(rho @ self._matrix))), 0.0
        return self._sampled(rho)

    def _sampled(self, rho: np.ndarray) -> tuple[float, float]:
        shots = allocate(int(self.options.shots), np.ones(len(self.groups)), "uniform")
        energy, variance = self.constant, 0.0
        for group, n in zip(self.groups, shots):
            mean, var = sample_group(self.rng, group, self._outcome_probabilities(rho, group.basis), n)
            energy += mean
            variance += var
        return float(energy), float(np.sqrt(variance))

    def _outcome_probabilities(self, rho: np.ndarray, basis: dict[int, str]) -> np.ndarray:
        """Measured-bit distribution in the group's basis, readout bit flips included."""
        from .groups import _ROTATION

        unitary = np.array([[1.0]], dtype=complex)
        for q in range(self.n_qubits):
            unitary = np.kron(unitary, _ROTATION[basis.get(q, "Z")])
        p = np.clip(np.real(np.diag(unitary @ rho @ unitary.conj().T)), 0.0, None).reshape((2,) * self.n_qubits)
        flip = np.array([[1 - self.options.readout, self.options.readout],
                         [self.options.readout, 1 - self.options.readout]])
        for q in range(self.n_qubits):
            p = np.moveaxis(np.tensordot(flip, p, axes=([1], [q])), 0, q)
        p = p.reshape(-1)
        return p / p.sum()

    def energy_and_gradient(self, theta: np.ndarray) -> tuple[float, np.ndarray]:
        """Noisy energy and central finite-difference gradient (2P + 1 noisy estimates)."""
        return self.energy(theta), central_differences(self.energy, theta, self.options.gradient_step)
