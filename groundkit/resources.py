"""The quantum cost of a pipeline's trial state: qubits, parameters, Pauli terms, measurement groups, gates, depth,
and on a device the routed counts, SWAPs and the time of one energy."""

from __future__ import annotations

from typing import Any

import numpy as np

from .result import Resources


def resources_for(pipeline: Any, objective: Any, theta: np.ndarray) -> Resources:
    """Counts under the pipeline's mapping (after tapering). Without a device, gate counts and depth of the compiled
    circuit (compact construction, Cirq-optimised) are read off its gate list without building the Cirq circuit; on
    a device they are those of the routed, rewritten circuit, with the logical counts beside them."""
    encoding = pipeline.encoding()
    stats = pipeline.pauli_statistics()
    device: dict[str, Any] = {}
    measurement = _measurement(pipeline)
    if pipeline.device_profile is None:
        from .circuits.counting import trial_resources

        gates = trial_resources(pipeline, theta)
        two_qubit_gates, depth = gates["two_qubit_gates"], gates["depth"]
    else:
        from .device.energy_cost import energy_cost

        compiled = pipeline.circuit(theta)
        cost = energy_cost(pipeline, theta, compiled)
        two_qubit_gates, depth = compiled.two_qubit_gates, compiled.depth
        device = {"device": compiled.device_name, "logical_two_qubit_gates": compiled.logical_two_qubit_gates,
                  "logical_depth": compiled.logical_depth, "swaps": compiled.swaps, "device_shots": cost.shots,
                  "device_seconds": cost.seconds}
    return Resources(
        qubits=encoding.n_qubits,
        parameters=int(objective.n_parameters),
        pauli_terms=stats.pauli_terms,
        measurement_groups=stats.measurement_groups if measurement is None else measurement.groups,
        two_qubit_gates=two_qubit_gates,
        depth=depth,
        measurement_two_qubit_gates_worst=None if measurement is None else measurement.worst,
        measurement_two_qubit_gates_mean=None if measurement is None else measurement.mean,
        **device,
    )


def _measurement(pipeline: Any) -> Any:
    """Groups and added two-qubit gates of the pipeline's grouping (qwc unless its estimator names one); None
    where that grouping cannot be measured on this register (a rotation leaving a tapered sector)."""
    from .errors import GroundkitError
    from .estimators.measurement_circuits import pipeline_measurement_cost

    try:
        return pipeline_measurement_cost(pipeline)
    except GroundkitError:
        return None
