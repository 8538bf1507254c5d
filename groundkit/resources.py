"""The quantum cost of a pipeline's trial state: qubits, parameters, Pauli terms, measurement groups, gates, depth,
and on a device the routed counts, SWAPs and the time of one energy."""

from __future__ import annotations

from typing import Any

import numpy as np

from .result import Resources


def resources_for(pipeline: Any, objective: Any, theta: np.ndarray) -> Resources:
    """Counts under the pipeline's mapping (after tapering); gate counts and depth from the compiled circuit (on
    the pipeline's device after routing and rewriting, with the logical counts beside them)."""
    encoding = pipeline.encoding()
    stats = pipeline.pauli_statistics()
    compiled = pipeline.circuit(theta)
    device: dict[str, Any] = {}
    if compiled.device is not None:
        from .device.energy_cost import energy_cost

        cost = energy_cost(pipeline, theta, compiled)
        device = {"device": compiled.device_name, "logical_two_qubit_gates": compiled.logical_two_qubit_gates,
                  "logical_depth": compiled.logical_depth, "swaps": compiled.swaps, "device_shots": cost.shots,
                  "device_seconds": cost.seconds}
    return Resources(
        qubits=encoding.n_qubits,
        parameters=int(objective.n_parameters),
        pauli_terms=stats.pauli_terms,
        measurement_groups=stats.measurement_groups,
        two_qubit_gates=compiled.two_qubit_gates,
        depth=compiled.depth,
        **device,
    )
