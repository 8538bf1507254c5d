"""OpenQASM export of a routed native circuit (Cirq's exporter, OpenQASM 2.0 or 3.0).

The register ``q`` is the whole device: ``q[k]`` is device qubit k (node k of the device graph). The header
comment records the placements: which device qubit holds logical qubit i at the start and at the end.
"""

from __future__ import annotations

import cirq

from ..errors import DeviceError
from .device_circuit import DeviceCircuit

QASM_VERSIONS = ("2.0", "3.0")


def device_openqasm(compiled: DeviceCircuit, *, version: str = "2.0", precision: int = 16) -> str:
    """OpenQASM text of ``compiled.circuit`` on the device register (see the module docstring); ``precision``
    digits per angle (16 keeps the state to ~1e-15)."""
    if version not in QASM_VERSIONS:
        raise DeviceError(f"OpenQASM version {version!r} is not supported; accepted: {', '.join(QASM_VERSIONS)}")
    qubits = sorted(compiled.circuit.all_qubits() | set(compiled.final_placement.values())
                    | set(compiled.initial_placement.values()))
    if any(not isinstance(q, cirq.LineQubit) for q in qubits):
        raise DeviceError(f"OpenQASM export needs device qubits cirq.LineQubit(k); got {qubits}")
    size = compiled.device.n_qubits if compiled.device is not None else max((q.x + 1 for q in qubits), default=0)
    where = compiled.device_name or "logical all-to-all register"
    start = " ".join(f"{i}->q[{q.x}]" for i, q in sorted(compiled.initial_placement.items()))
    end = " ".join(f"{i}->q[{q.x}]" for i, q in sorted(compiled.final_placement.items()))
    header = (f"groundkit routed native circuit for {where}\n"
              f"logical qubit -> device qubit at start: {start}\n"
              f"logical qubit -> device qubit at end: {end}")
    return compiled.circuit.to_qasm(header=header, precision=precision, qubit_order=cirq.LineQubit.range(size),
                                    version=version)
