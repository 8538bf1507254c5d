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
from .fermionic import fermionic_circuit


def trial_circuit(source: Any, theta: Any = None) -> cirq.Circuit:
    """A ``cirq.Circuit`` from |0…0⟩ on ``cirq.LineQubit.range(n)`` preparing the trial state at ``theta``.

    ``source`` is a Pipeline or a pair ``(encoding, trial_state)``; ``theta`` (radians) defaults to the trial
    state's initial parameters. Fermionic trial states are compiled exactly (Pauli-string exponentials), on a
    tapered register with their symmetry-conserving excitations only, as in the pipeline's objective; qubit trial
    states have their symbols resolved. Every qubit of the register appears (idle ones carry an identity).
    """
    if isinstance(source, tuple) and len(source) == 2:
        encoding, trial_state = source
    elif hasattr(source, "encoding") and hasattr(source, "resolved_components"):
        encoding, trial_state = source.encoding(), source.resolved_components()["trial_state"]
    else:
        raise ComponentError(f"trial_circuit takes a Pipeline or (encoding, trial_state), got {source!r}")
    if isinstance(trial_state, QubitTrialState):
        circuit, symbols = trial_state.checked_circuit(encoding)
        values = (trial_state.checked_initial_parameters(encoding, len(symbols)) if theta is None else
                  checked_parameters(theta, len(symbols), trial_state))
        circuit = cirq.resolve_parameters(circuit, dict(zip(symbols, values)))
        circuit = cirq.Circuit(circuit.all_operations()) if isinstance(circuit, cirq.FrozenCircuit) else circuit
    elif isinstance(trial_state, TrialState):
        problem = encoding.problem
        plan = sector_plan(trial_state, encoding)
        values = (trial_state.checked_initial_parameters(problem, plan) if theta is None else
                  checked_parameters(theta, plan.n_parameters, trial_state))
        circuit = fermionic_circuit(encoding, plan, plan.angles(values))
    else:
        raise ComponentError(f"trial state {trial_state!r} is neither a fermionic TrialState nor a QubitTrialState")
    return with_all_qubits(circuit, encoding.n_qubits)


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
