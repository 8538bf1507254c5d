"""CircuitTrialState: a user's own parametrised Cirq circuit as a trial state."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import cirq
import numpy as np
import sympy

from ..errors import ComponentError, ParameterError
from ..registry import register
from .base import QubitTrialState


@register("trial_state", "circuit", aliases=("cirq-circuit",), label="your Cirq circuit", listed=False)
@dataclass(frozen=True, init=False)
class CircuitTrialState(QubitTrialState):
    """``CircuitTrialState(circuit, symbols=None, initial=None)``.

    ``circuit`` acts on ``cirq.LineQubit(k)`` = qubit k of the qubit Hamiltonian, from |0…0⟩ (prepare a reference
    yourself with X gates); its angles are sympy symbols or expressions, in rotation or power gates. ``symbols``
    fixes the parameter order (default: sorted by name); ``initial`` the starting values (default zeros, radians).
    A subclass may instead override :meth:`parametrised_circuit` (and the others) and pass no circuit.
    """

    circuit: cirq.FrozenCircuit | None
    symbols: tuple[sympy.Symbol, ...] | None
    initial: tuple[float, ...] | None

    def __init__(self, circuit: cirq.AbstractCircuit | None = None, symbols: Sequence[Any] | None = None,
                 initial: Sequence[float] | None = None) -> None:
        if circuit is not None and not isinstance(circuit, cirq.AbstractCircuit):
            raise ComponentError(f"CircuitTrialState(circuit={circuit!r}): give a cirq.Circuit")
        frozen = None if circuit is None else cirq.FrozenCircuit(circuit.all_operations())
        names = None
        if symbols is not None:
            names = tuple(s if isinstance(s, sympy.Symbol) else sympy.Symbol(str(s)) for s in symbols)
        if initial is not None:
            values = np.asarray(initial, dtype=float)
            expected = len(names) if names is not None else (
                len(cirq.parameter_symbols(frozen)) if frozen is not None else values.size)
            if values.ndim != 1 or values.size != expected or not np.all(np.isfinite(values)):
                raise ParameterError(
                    f"CircuitTrialState(initial=...) has shape {values.shape}; expected {expected} finite values"
                )
            initial = tuple(float(v) for v in values)
        object.__setattr__(self, "circuit", frozen)
        object.__setattr__(self, "symbols", names)
        object.__setattr__(self, "initial", initial)

    def __repr__(self) -> str:
        if self.circuit is None:
            return f"{type(self).__name__}()"
        n = len(self.circuit.all_qubits())
        return (f"{type(self).__name__}({n} qubits, {len(list(self.circuit.all_operations()))} operations, "
                f"{len(cirq.parameter_symbols(self.circuit))} symbols)")

    def parametrised_circuit(self, encoding: Any) -> cirq.AbstractCircuit:
        if self.circuit is None:
            raise ComponentError(f"{type(self).__name__}: give a circuit or override parametrised_circuit")
        return self.circuit

    def parameter_symbols(self, encoding: Any, circuit: cirq.AbstractCircuit) -> tuple[sympy.Symbol, ...]:
        if self.symbols is not None:
            return self.symbols
        return super().parameter_symbols(encoding, circuit)

    def initial_parameters(self, encoding: Any, n_parameters: int) -> np.ndarray:
        if self.initial is not None:
            return np.array(self.initial)
        return np.zeros(n_parameters)
