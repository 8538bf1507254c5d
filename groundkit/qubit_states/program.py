"""A parametrised circuit prepared for repeated evaluation on a numpy statevector, with adjoint gradients.

Each operation becomes a step on the state tensor (shape (2,)*n, axis k = qubit k, qubit 0 most significant).
A fixed operation keeps its unitary. A parametrised one must be a Cirq ``EigenGate`` (Rx, Ry, Rz, XPowGate, CZPowGate,
XXPowGate, ...), or decompose into such gates, whose exponent t is a sympy expression of the parameters:
U(t) = Σ_k exp(iπ·t·μ_k)·P_k with eigenprojectors P_k, so dU/dt = U·K with K = iπ·Σ_k μ_k·P_k, exact and commuting
with U.

Adjoint gradient: for ψ = U_M…U_1|0⟩ and λ_m = U_{m+1}†…U_M† H ψ, dE/dθ_j = Σ_m 2·Re⟨λ_m|K_m|ψ_m⟩·∂t_m/∂θ_j, read in
one backward sweep that undoes each step on ψ and λ: about three state passes and one H·ψ per gradient, whatever
the number of parameters.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import cirq
import numpy as np
import sympy

from ..errors import ComponentError


def apply_matrix(state: np.ndarray, matrix: np.ndarray, axes: tuple[int, ...]) -> np.ndarray:
    """``matrix`` (2^k x 2^k, first listed qubit most significant) applied to the tensor axes ``axes``."""
    k = len(axes)
    tensor = matrix.reshape((2,) * (2 * k))
    out = np.tensordot(tensor, state, axes=(list(range(k, 2 * k)), list(axes)))
    return np.moveaxis(out, list(range(k)), list(axes))


@dataclass
class _Step:
    axes: tuple[int, ...]
    matrix: np.ndarray | None = None  # fixed unitary
    phases: np.ndarray | None = None  # μ_k (half turns) of a parametrised EigenGate
    projectors: np.ndarray | None = None  # P_k stacked, shape (K, 2^k, 2^k)
    exponent: Callable[..., float] | None = None  # t(θ)
    slopes: tuple[tuple[int, Callable[..., float]], ...] = ()  # (parameter index, ∂t/∂θ_j)

    def unitary(self, theta: np.ndarray) -> np.ndarray:
        if self.matrix is not None:
            return self.matrix
        t = float(self.exponent(*theta))
        return np.einsum("k,kij->ij", np.exp(1j * np.pi * t * self.phases), self.projectors)

    def generator(self) -> np.ndarray:
        """K with dU/dt = U K."""
        return np.einsum("k,kij->ij", 1j * np.pi * self.phases, self.projectors)


class StateProgram:
    """Steps of a circuit on ``n_qubits`` LineQubits with parameters ``symbols`` (in vector order)."""

    def __init__(self, circuit: cirq.AbstractCircuit, symbols: Sequence[sympy.Symbol], n_qubits: int) -> None:
        self.n_qubits = int(n_qubits)
        self.symbols = tuple(symbols)
        self.steps = [step for op in circuit.all_operations() for step in self._steps(op)]

    def _steps(self, op: cirq.Operation) -> list[_Step]:
        """One step per operation; a parametrised gate other than an EigenGate is decomposed (Cirq's
        decomposition) until every parametrised part is one, e.g. ``cirq.givens`` or ``PhasedXPowGate``."""
        axes = tuple(q.x for q in op.qubits)
        if not cirq.is_parameterized(op):
            if not cirq.has_unitary(op):
                raise ComponentError(f"operation {op} has no unitary (measurements and noise are not supported)")
            return [_Step(axes, matrix=np.asarray(cirq.unitary(op), dtype=complex))]
        gate = op.untagged.gate if hasattr(op.untagged, "gate") else None
        if isinstance(gate, cirq.EigenGate) and not cirq.is_parameterized(gate._global_shift):
            return [self._eigen_step(op, gate, axes)]
        parts = cirq.decompose_once(op, default=None)
        if not parts:
            raise ComponentError(
                f"parametrised operation {op} is neither a rotation or power gate with a symbolic exponent "
                "(cirq.rx/ry/rz, XPowGate, CZPowGate, ...) nor decomposable into such gates; its gradient cannot "
                "be taken exactly"
            )
        return [step for part in parts for step in self._steps(part)]

    def _eigen_step(self, op: cirq.Operation, gate: cirq.EigenGate, axes: tuple[int, ...]) -> _Step:
        expression = sympy.sympify(gate.exponent)
        unknown = expression.free_symbols - set(self.symbols)
        if unknown:
            raise ComponentError(f"operation {op} uses symbols {sorted(map(str, unknown))} that are not parameters")
        components = gate._eigen_components()
        phases = np.array([float(mu) + float(gate._global_shift) for mu, _ in components])
        projectors = np.array([np.asarray(p, dtype=complex) for _, p in components])
        slopes = tuple((self.symbols.index(s), sympy.lambdify(self.symbols, sympy.diff(expression, s), "numpy"))
                       for s in sorted(expression.free_symbols, key=lambda s: s.name))
        step = _Step(axes, phases=phases, projectors=projectors,
                     exponent=sympy.lambdify(self.symbols, expression, "numpy"), slopes=slopes)
        probe = np.linspace(0.3, 0.9, len(self.symbols)) if self.symbols else np.zeros(0)
        resolved = cirq.resolve_parameters(op, dict(zip(self.symbols, probe)))
        if not np.allclose(step.unitary(probe), cirq.unitary(resolved), atol=1e-10):
            raise ComponentError(f"operation {op}: its eigen-decomposition does not reproduce its unitary")
        return step

    def initial_state(self) -> np.ndarray:
        state = np.zeros((2,) * self.n_qubits, dtype=complex)
        state[(0,) * self.n_qubits] = 1.0
        return state

    def state(self, theta: np.ndarray) -> np.ndarray:
        """Statevector (length 2^n) at parameters ``theta`` (radians)."""
        psi = self.initial_state()
        for step in self.steps:
            psi = apply_matrix(psi, step.unitary(theta), step.axes)
        return psi.reshape(-1)

    def energy_and_gradient(self, theta: np.ndarray, apply_h: Callable[[np.ndarray], np.ndarray]
                            ) -> tuple[float, np.ndarray]:
        """(⟨ψ|H|ψ⟩, gradient by parameter) by the adjoint method; ``apply_h`` maps a vector to H·vector."""
        shape = (2,) * self.n_qubits
        unitaries = [step.unitary(theta) for step in self.steps]
        psi = self.initial_state()
        for step, u in zip(self.steps, unitaries):
            psi = apply_matrix(psi, u, step.axes)
        lam = apply_h(psi.reshape(-1)).reshape(shape)
        energy = float(np.vdot(psi, lam).real)
        gradient = np.zeros(len(self.symbols))
        for step, u in zip(reversed(self.steps), reversed(unitaries)):
            if step.slopes:
                k_psi = apply_matrix(psi, step.generator(), step.axes)
                derivative = 2.0 * float(np.vdot(lam, k_psi).real)
                for index, slope in step.slopes:
                    gradient[index] += derivative * float(slope(*theta))
            inverse = u.conj().T
            psi = apply_matrix(psi, inverse, step.axes)
            lam = apply_matrix(lam, inverse, step.axes)
        return energy, gradient
