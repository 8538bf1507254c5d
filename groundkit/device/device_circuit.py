"""DeviceCircuit: a circuit as a device runs it, with where each logical qubit starts and ends.

``circuit`` acts on the device's qubits (``cirq.LineQubit(k)`` for node k of the device graph) in the device's
native gates; logical register index i starts on ``initial_placement[i]`` and ends on ``final_placement[i]`` (the
routing SWAPs move it). Without a device the circuit is the logical one and both placements are the identity.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import cirq
import numpy as np

from ..errors import DeviceError


@dataclass(frozen=True, eq=False)
class DeviceCircuit:
    """A compiled circuit with its placements and counts.

    ``swaps``: SWAPs the router inserted (before they were rewritten into native gates); ``two_qubit_gates`` and
    ``depth``: of ``circuit``; ``logical_two_qubit_gates`` and ``logical_depth``: of the logical circuit on an
    all-to-all register before routing and rewriting. ``device`` is the :class:`DeviceProfile` or None.
    """

    circuit: cirq.Circuit
    initial_placement: dict[int, cirq.Qid]
    final_placement: dict[int, cirq.Qid]
    swaps: int
    two_qubit_gates: int
    depth: int
    logical_two_qubit_gates: int
    logical_depth: int
    device: Any = None
    compile_seconds: float = field(default=0.0, compare=False)

    @property
    def n_qubits(self) -> int:
        """Number of logical qubits (the register of the mapping)."""
        return len(self.initial_placement)

    @property
    def device_name(self) -> str | None:
        """The device's name, or None for the logical all-to-all register."""
        return None if self.device is None else self.device.name

    def counts(self) -> dict[str, Any]:
        """The counts as a dict (device name, two-qubit gates, depth, SWAPs and the logical counts)."""
        return {"device": self.device_name, "two_qubit_gates": self.two_qubit_gates, "depth": self.depth,
                "swaps": self.swaps, "logical_two_qubit_gates": self.logical_two_qubit_gates,
                "logical_depth": self.logical_depth}

    def duration(self) -> float | None:
        """Duration (ns) of one run of ``circuit`` on the device (see :mod:`groundkit.device.timing`); None
        without a device."""
        if self.device is None:
            return None
        from .timing import circuit_duration

        return circuit_duration(self.circuit, self.device.durations)

    def logical_state(self) -> np.ndarray:
        """Statevector (qubit 0 most significant) over the logical register after the circuit, with the final
        permutation undone: device qubit ``final_placement[i]`` read as logical qubit i. Raises DeviceError if a
        device qubit outside the final placement ends away from |0⟩ (which a correct routing never does)."""
        touched = set(self.circuit.all_qubits())
        order = [self.final_placement[i] for i in range(self.n_qubits)]
        extra = sorted(q for q in touched if q not in set(order))
        result = cirq.Simulator(dtype=np.complex128).simulate(self.circuit, qubit_order=order + extra)
        state = np.asarray(result.final_state_vector).reshape(2 ** self.n_qubits, 2 ** len(extra))
        leftover = float(np.linalg.norm(state[:, 1:]))
        if leftover > 1e-8:
            raise DeviceError(f"device qubits {extra} outside the final placement end away from |0> "
                              f"(weight {leftover:.2e}); the routing is inconsistent")
        return state[:, 0].copy()

    def openqasm(self, version: str = "2.0", *, precision: int = 16) -> str:
        """OpenQASM text of the native circuit on the device register ``q`` (``q[k]`` is device qubit k);
        ``version`` "2.0" or "3.0" (Cirq's exporter). See :func:`groundkit.device.export.device_openqasm`."""
        from .export import device_openqasm

        return device_openqasm(self, version=version, precision=precision)

    def __repr__(self) -> str:
        where = "logical all-to-all" if self.device is None else repr(self.device_name)
        return (f"DeviceCircuit({where}, qubits={self.n_qubits}, two_qubit_gates={self.two_qubit_gates}, "
                f"depth={self.depth}, swaps={self.swaps}, logical_two_qubit_gates={self.logical_two_qubit_gates})")
