"""Gate counts of a compiled circuit: two-qubit gates and depth."""

from __future__ import annotations

import cirq


def circuit_resources(circuit: cirq.AbstractCircuit) -> dict[str, int]:
    """``{"two_qubit_gates": ..., "depth": ...}`` of a circuit.

    Two-qubit gates: operations on two or more qubits (the compiled circuits have no larger ones). Depth: the
    number of moments when every non-identity operation is placed as early as possible (identity gates, which
    only mark idle qubits, are left out).
    """
    operations = [op for op in circuit.all_operations() if not isinstance(op.gate, cirq.IdentityGate)]
    packed = cirq.Circuit(operations, strategy=cirq.InsertStrategy.EARLIEST)
    return {
        "two_qubit_gates": sum(1 for op in operations if len(op.qubits) >= 2),
        "depth": len(packed),
    }
