"""OpenQASM 2.0 export and import of circuits on ``cirq.LineQubit`` registers (qubit k is ``q[k]``)."""

from __future__ import annotations

import re
from typing import Any

import cirq

from ..errors import ComponentError


def openqasm_text(circuit: Any, *, precision: int = 16) -> str:
    """OpenQASM 2.0 text of a circuit on LineQubits, register ``q`` ordered by qubit index; for a
    :class:`~groundkit.device.DeviceCircuit`, its routed native circuit on the device register (with the placements
    in the header; see :func:`groundkit.device.device_openqasm`, which also writes OpenQASM 3.0).

    ``precision`` is the number of digits of each angle; 16 keeps the prepared state to ~1e-15.
    """
    from ..device.device_circuit import DeviceCircuit  # the device layer builds on the circuits layer

    if isinstance(circuit, DeviceCircuit):
        return circuit.openqasm("2.0", precision=precision)
    qubits = sorted(circuit.all_qubits())
    if any(not isinstance(q, cirq.LineQubit) for q in qubits):
        raise ComponentError(f"OpenQASM export needs cirq.LineQubit qubits; got {qubits}")
    n = (max(q.x for q in qubits) + 1) if qubits else 0
    return circuit.to_qasm(header="groundkit trial-state circuit", precision=precision,
                           qubit_order=cirq.LineQubit.range(n))


def circuit_from_openqasm(text: str) -> cirq.Circuit:
    """Parse OpenQASM 2.0 text (Cirq's importer) into a circuit on LineQubits (``q[k]`` -> LineQubit(k))."""
    from cirq.contrib.qasm_import import circuit_from_qasm

    parsed = circuit_from_qasm(text)

    def line_qubit(qubit: cirq.Qid) -> cirq.Qid:
        match = re.fullmatch(r"q_(\d+)", str(qubit))
        return cirq.LineQubit(int(match.group(1))) if match else qubit

    return parsed.transform_qubits(line_qubit)
