"""The one place the noisy estimator looks at a pipeline's device profile.

With ``pipeline.device_profile`` set (a profile with ``.errors: ErrorFigures`` and ``.durations: GateDurations``),
the noise comes from the profile and the circuit is the routed native one, ``pipeline.circuit(θ)`` (a device
circuit with ``.circuit`` and ``.final_placement``: logical qubit index → device qubit).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import cirq
import numpy as np

from ..device.figures import ErrorFigures, GateDurations


@dataclass(frozen=True)
class DeviceInputs:
    """What a device profile gives a noisy measurement: figures, durations, and θ → (circuit, logical qubits)."""

    errors: ErrorFigures
    durations: GateDurations
    circuit: Callable[[np.ndarray], tuple[cirq.Circuit, list[cirq.Qid]]]
    name: str


def device_inputs(pipeline: Any) -> DeviceInputs | None:
    """The device profile's noise inputs for ``pipeline``, or None when it has no profile."""
    profile = getattr(pipeline, "device_profile", None)
    if profile is None or not hasattr(pipeline, "circuit"):
        return None

    def routed(theta: np.ndarray) -> tuple[cirq.Circuit, list[cirq.Qid]]:
        device_circuit = pipeline.circuit(theta)
        placement = device_circuit.final_placement
        n = len(placement)
        qubits = [placement[k] for k in range(n)]
        circuit = device_circuit.circuit
        circuit = cirq.Circuit(circuit.all_operations()) if isinstance(circuit, cirq.FrozenCircuit) else circuit
        idle = [q for q in qubits if q not in circuit.all_qubits()]
        if idle:
            circuit = cirq.Circuit([cirq.Moment(cirq.I(q) for q in idle)]) + circuit
        return circuit, qubits

    return DeviceInputs(profile.errors, profile.durations, routed, str(getattr(profile, "name", repr(profile))))
