"""Gate counts of a compiled circuit: two-qubit gates and depth."""

from __future__ import annotations

from typing import Any

import cirq


def circuit_resources(circuit: Any) -> dict[str, int]:
    """``{"two_qubit_gates": ..., "depth": ...}`` of a circuit (a ``cirq`` circuit, or a
    :class:`~groundkit.device.DeviceCircuit`, whose native circuit is counted).

    Two-qubit gates: operations on two or more qubits (the compiled circuits have no larger ones). Depth: the
    number of moments when every non-identity operation is placed as early as possible (identity gates, which
    only mark idle qubits, are left out).
    """
    from ..device.device_circuit import DeviceCircuit  # the device layer builds on this module

    if isinstance(circuit, DeviceCircuit):
        circuit = circuit.circuit
    operations = [op for op in circuit.all_operations() if not isinstance(op.gate, cirq.IdentityGate)]
    packed = cirq.Circuit(operations, strategy=cirq.InsertStrategy.EARLIEST)
    return {
        "two_qubit_gates": sum(1 for op in operations if len(op.qubits) >= 2),
        "depth": len(packed),
    }
