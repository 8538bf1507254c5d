"""Quantum cost of a pipeline's trial state: qubits, parameters, Pauli terms, measurement groups, gates, depth."""

from __future__ import annotations

from typing import Any

import numpy as np

from .result import Resources


def resources_for(pipeline: Any, objective: Any, theta: np.ndarray) -> Resources:
    """Counts under the pipeline's mapping (after tapering); gate counts and depth of the compiled circuit
    (compact construction, Cirq-optimised), read off its gate list without building the Cirq circuit."""
    encoding = pipeline.encoding()
    stats = pipeline.pauli_statistics()
    from .circuits.counting import trial_resources

    gates = trial_resources(pipeline, theta)
    return Resources(
        qubits=encoding.n_qubits,
        parameters=int(objective.n_parameters),
        pauli_terms=stats.pauli_terms,
        measurement_groups=stats.measurement_groups,
        two_qubit_gates=gates["two_qubit_gates"],
        depth=gates["depth"],
    )
