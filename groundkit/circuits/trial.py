"""The circuit of a pipeline's trial state at given parameters, on the qubit register of its mapping."""

from __future__ import annotations

from typing import Any

import cirq
import numpy as np

from ..errors import ComponentError
from ..qubit_states.base import QubitTrialState
from ..qubit_states.parameters import checked_parameters
from ..qubits.symmetry import sector_plan
from ..trial_states.base import TrialState
from .fermionic import checked_construction, fermionic_steps
from .optimise import optimise_circuit
from .simplify import flatten, reduce_steps
from .steps import operations


def source_parts(source: Any) -> tuple[Any, Any]:
    """``(encoding, trial_state)`` of a Pipeline or of such a pair."""
    if isinstance(source, tuple) and len(source) == 2:
        return source
    if hasattr(source, "encoding") and hasattr(source, "resolved_components"):
        return source.encoding(), source.resolved_components()["trial_state"]
    raise ComponentError(f"trial_circuit takes a Pipeline or (encoding, trial_state), got {source!r}")


def fermionic_parts(encoding: Any, trial_state: TrialState, theta: Any) -> tuple[Any, np.ndarray]:
    """The (sector-restricted) plan of a fermionic trial state and its excitation angles at ``theta``."""
    plan = sector_plan(trial_state, encoding)
    values = (trial_state.checked_initial_parameters(encoding.problem, plan) if theta is None else
              checked_parameters(theta, plan.n_parameters, trial_state))
    return plan, plan.angles(values)


def qubit_values(encoding: Any, trial_state: QubitTrialState, theta: Any) -> tuple[Any, tuple, np.ndarray]:
    """A qubit trial state's checked circuit, symbols and parameter values at ``theta``."""
    circuit, symbols = trial_state.checked_circuit(encoding)
    values = (trial_state.checked_initial_parameters(encoding, len(symbols)) if theta is None else
              checked_parameters(theta, len(symbols), trial_state))
    return circuit, symbols, values


def trial_circuit(source: Any, theta: Any = None, *, construction: str = "compact") -> cirq.Circuit:
    """A ``cirq.Circuit`` from |0…0⟩ on ``cirq.LineQubit.range(n)`` preparing the trial state at ``theta``.

    ``source`` is a Pipeline or a pair ``(encoding, trial_state)``; ``theta`` (radians) defaults to the trial
    state's initial parameters. Fermionic trial states are compiled exactly, on a tapered register with their
    symmetry-conserving excitations only, as in the pipeline's objective: ``construction="compact"`` (default) uses
    the compact excitation circuits, ``"ladder"`` Pauli-string exponentials with CNOT ladders (docs/circuits.md).
    Qubit trial states have their symbols resolved (``construction`` does not apply to them). Every circuit is
    optimised with Cirq's transformers (``groundkit.circuits.optimise``), and every qubit of the register appears
    (idle ones carry an identity).
    """
    checked_construction(construction)
    encoding, trial_state = source_parts(source)
    if isinstance(trial_state, QubitTrialState):
        circuit, symbols, values = qubit_values(encoding, trial_state, theta)
        steps = trial_state.circuit_steps(encoding, values)
        if steps is not None:
            circuit = cirq.Circuit(operations(flatten(reduce_steps(steps)), cirq.LineQubit.range(encoding.n_qubits)))
        else:
            circuit = cirq.resolve_parameters(circuit, dict(zip(symbols, values)))
    elif isinstance(trial_state, TrialState):
        plan, angles = fermionic_parts(encoding, trial_state, theta)
        steps = flatten(reduce_steps(fermionic_steps(encoding, plan, angles, construction)))
        circuit = cirq.Circuit(operations(steps, cirq.LineQubit.range(encoding.n_qubits)))
    else:
        raise ComponentError(f"trial state {trial_state!r} is neither a fermionic TrialState nor a QubitTrialState")
    return with_all_qubits(optimise_circuit(circuit), encoding.n_qubits)


def with_all_qubits(circuit: cirq.AbstractCircuit, n_qubits: int) -> cirq.Circuit:
    """The circuit with an identity gate on every qubit of ``LineQubit.range(n_qubits)`` it does not touch."""
    idle = [q for q in cirq.LineQubit.range(n_qubits) if q not in circuit.all_qubits()]
    out = cirq.Circuit(circuit.all_operations()) if isinstance(circuit, cirq.FrozenCircuit) else circuit.copy()
    if idle:
        out.insert(0, [cirq.I(q) for q in idle])
    return out


def state_of(circuit: Any, n_qubits: int) -> np.ndarray:
    """Final statevector (complex128, qubit 0 most significant) of a circuit from |0…0⟩ on n LineQubits; for a
    :class:`~groundkit.device.DeviceCircuit`, its logical state (the final placement undone)."""
    from ..device.device_circuit import DeviceCircuit  # the device layer builds on this module

    if isinstance(circuit, DeviceCircuit):
        if circuit.n_qubits != n_qubits:
            raise ComponentError(f"state_of: the compiled circuit has {circuit.n_qubits} logical qubits, not "
                                 f"{n_qubits}")
        return circuit.logical_state()
    result = cirq.Simulator(dtype=np.complex128).simulate(circuit, qubit_order=cirq.LineQubit.range(n_qubits))
    return np.asarray(result.final_state_vector)
