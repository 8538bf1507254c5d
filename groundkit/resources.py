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
    return Resources(
        qubits=encoding.n_qubits,
        parameters=int(objective.n_parameters),
        pauli_terms=stats.pauli_terms,
        measurement_groups=stats.measurement_groups,
        two_qubit_gates=gates["two_qubit_gates"],
        depth=gates["depth"],
    )
