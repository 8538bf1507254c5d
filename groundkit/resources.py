"""Quantum cost of a pipeline's trial state: qubits, parameters, Pauli terms, measurement groups, gates, depth."""

from __future__ import annotations

from typing import Any

import numpy as np

from .result import Resources


def resources_for(pipeline: Any, objective: Any, theta: np.ndarray) -> Resources:
    """Counts under the pipeline's mapping (after tapering); gate counts and depth from the compiled circuit."""
    encoding = pipeline.encoding()
    stats = pipeline.pauli_statistics()
    from .circuits import circuit_resources

    gates = circuit_resources(pipeline.circuit(theta))
    measurement = _measurement(pipeline)
    return Resources(
        qubits=encoding.n_qubits,
        parameters=int(objective.n_parameters),
        pauli_terms=stats.pauli_terms,
        measurement_groups=stats.measurement_groups if measurement is None else measurement.groups,
        two_qubit_gates=gates["two_qubit_gates"],
        depth=gates["depth"],
        measurement_two_qubit_gates_worst=None if measurement is None else measurement.worst,
        measurement_two_qubit_gates_mean=None if measurement is None else measurement.mean,
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
