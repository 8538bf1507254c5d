"""The qubit trial-state protocol: a parametrised Cirq circuit acting on the qubit register directly.

A qubit trial state is a component (its constructor only stores options). Given a
:class:`~groundkit.qubits.QubitEncoding` it declares

- :meth:`QubitTrialState.parametrised_circuit`: a ``cirq.Circuit`` on ``cirq.LineQubit(k)`` (qubit k = index k of
  the qubit Hamiltonian) from |0…0⟩, whose angles are sympy symbols or expressions of them;
- :meth:`QubitTrialState.parameter_symbols`: the order of the parameters (default: sorted by name);
- :meth:`QubitTrialState.initial_parameters`: the starting values (default zeros);
- :meth:`QubitTrialState.state_program`: how the statevector and adjoint gradients are computed (default: gate by
  gate, :class:`~groundkit.qubit_states.program.StateProgram`; a subclass with a faster exact route may override).

:class:`~groundkit.qubit_states.QubitObjective` evaluates it on a numpy statevector with adjoint gradients.
"""

from __future__ import annotations

from abc import abstractmethod
from typing import Any

import cirq
import numpy as np
import sympy

from ..component import Component
from ..errors import ComponentError, ParameterError
from .program import StateProgram


class QubitTrialState(Component, role="trial_state"):
    """Base class of trial states that act on the qubit register directly; see the module docstring."""

    @abstractmethod
    def parametrised_circuit(self, encoding: Any) -> cirq.AbstractCircuit:
        """The circuit (sympy-parametrised) on ``cirq.LineQubit.range(encoding.n_qubits)``, from |0…0⟩."""

    def parameter_symbols(self, encoding: Any, circuit: cirq.AbstractCircuit) -> tuple[sympy.Symbol, ...]:
        """Parameters in vector order: every symbol of the circuit, sorted by name."""
        return tuple(sorted(cirq.parameter_symbols(circuit), key=lambda s: s.name))

    def initial_parameters(self, encoding: Any, n_parameters: int) -> np.ndarray:
        """Starting parameters (radians), zeros unless a subclass says otherwise."""
        return np.zeros(n_parameters)

    def state_program(self, encoding: Any, circuit: cirq.AbstractCircuit, symbols: tuple[sympy.Symbol, ...]) -> Any:
        """An object with ``state(theta)`` and ``energy_and_gradient(theta, apply_h)`` for this circuit (the
        :class:`~groundkit.qubit_states.program.StateProgram` interface); it must give the circuit's own state."""
        return StateProgram(circuit, symbols, encoding.n_qubits)

    def circuit_steps(self, encoding: Any, values: np.ndarray) -> list | None:
        """Optionally, the circuit at parameter ``values`` as a gate list (``groundkit.circuits.steps``), so that
        resources are counted without building Cirq objects; None (default) counts :meth:`parametrised_circuit`."""
        return None

    def checked_circuit(self, encoding: Any) -> tuple[cirq.AbstractCircuit, tuple[sympy.Symbol, ...]]:
        """:meth:`parametrised_circuit` and :meth:`parameter_symbols`, checked against the register."""
        circuit = self.parametrised_circuit(encoding)
        name = type(self).__name__
        if not isinstance(circuit, cirq.AbstractCircuit):
            raise ComponentError(f"{name}.parametrised_circuit gave {type(circuit).__name__}, not a cirq.Circuit")
        qubits = sorted(circuit.all_qubits())
        foreign = [q for q in qubits if not isinstance(q, cirq.LineQubit)]
        if foreign:
            raise ComponentError(f"{name}: the circuit uses {foreign[0]!r}; use cirq.LineQubit(k) for qubit k")
        n = int(encoding.n_qubits)
        needed = max((q.x for q in qubits), default=-1) + 1
        if needed > n or any(q.x < 0 for q in qubits):
            raise ComponentError(
                f"{name}: the circuit acts on {needed} qubits (up to {qubits[-1]!r}) but the qubit Hamiltonian "
                f"of {encoding.mapping!r} has {n} qubits (cirq.LineQubit(0) ... cirq.LineQubit({n - 1}))"
            )
        symbols = tuple(self.parameter_symbols(encoding, circuit))
        if any(not isinstance(s, sympy.Symbol) for s in symbols) or len(set(symbols)) != len(symbols):
            raise ComponentError(f"{name}.parameter_symbols gave {symbols}; expected distinct sympy symbols")
        missing = set(cirq.parameter_symbols(circuit)) - set(symbols)
        if missing:
            raise ComponentError(
                f"{name}: the circuit uses symbols {sorted(s.name for s in missing)} that are not parameters"
            )
        return circuit, symbols

    def checked_initial_parameters(self, encoding: Any, n_parameters: int) -> np.ndarray:
        """:meth:`initial_parameters`, checked for length and finiteness."""
        values = np.asarray(self.initial_parameters(encoding, n_parameters), dtype=float)
        if values.shape != (n_parameters,) or not np.all(np.isfinite(values)):
            raise ParameterError(
                f"{type(self).__name__}.initial_parameters gave shape {values.shape}; expected {n_parameters} "
                "finite values"
            )
        return values
