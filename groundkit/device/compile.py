"""compile_for_device: a logical circuit placed, routed and rewritten into a device's native gates.

1. **Placement**: Cirq's line placement (``cirq.LineInitialMapper``): logical qubits, ordered along the circuit's
   interactions, are laid on a long path of the device graph, the rest placed next to their partners. On an
   all-to-all device logical qubit i goes to device qubit i.
2. **Routing**: Cirq's ``cirq.RouteCQC`` inserts SWAPs so that every two-qubit operation acts on a coupled pair;
   its SWAP count and the final permutation are kept.
3. **Rewriting**: ``cirq.optimize_for_target_gateset`` with the device's gateset (Cirq's ``CZTargetGateset``,
   ``SqrtIswapTargetGateset``, or :class:`~groundkit.device.native.CNOTTargetGateset`): connected one- and
   two-qubit blocks are merged and re-synthesised (KAK) where that saves gates; then each run of single-qubit gates
   becomes one PhasedXZ gate, dropped when within 1e-11 of the identity.

The result prepares the same state as the logical circuit, up to a global phase, with logical qubit i read
from ``final_placement[i]``.
"""

from __future__ import annotations

import time
from typing import Any

import cirq
import numpy as np

from ..circuits.resources import circuit_resources
from ..errors import DeviceError
from .device_circuit import DeviceCircuit
from .native import ATOL

LOOKAHEAD_RADIUS = 8
"""Moments RouteCQC looks ahead when ranking candidate SWAPs (Cirq's default)."""


def register_index(circuit: cirq.AbstractCircuit, n_qubits: int | None = None) -> list[cirq.Qid]:
    """The logical register: ``LineQubit.range(n)`` for a circuit on LineQubits (n from the largest index, or
    ``n_qubits``), else the circuit's qubits in sorted order."""
    qubits = sorted(circuit.all_qubits())
    if all(isinstance(q, cirq.LineQubit) for q in qubits):
        n = max((q.x + 1 for q in qubits), default=0)
        if n_qubits is not None:
            if n_qubits < n:
                raise DeviceError(f"n_qubits={n_qubits} is fewer than the circuit's register ({n} LineQubits)")
            n = n_qubits
        return list(cirq.LineQubit.range(n))
    return qubits


def logical_wrapper(circuit: cirq.AbstractCircuit, n_qubits: int | None = None) -> DeviceCircuit:
    """The logical circuit in a DeviceCircuit: identity placement, no SWAPs, counts of the circuit itself."""
    register = register_index(circuit, n_qubits)
    counts = circuit_resources(circuit)
    placement = dict(enumerate(register))
    return DeviceCircuit(circuit=cirq.Circuit(circuit.all_operations()) if isinstance(circuit, cirq.FrozenCircuit)
                         else circuit, initial_placement=placement, final_placement=dict(placement), swaps=0,
                         two_qubit_gates=counts["two_qubit_gates"], depth=counts["depth"],
                         logical_two_qubit_gates=counts["two_qubit_gates"], logical_depth=counts["depth"])


def _checked_operations(circuit: cirq.AbstractCircuit) -> list[cirq.Operation]:
    operations = []
    for op in circuit.all_operations():
        if isinstance(op.gate, cirq.IdentityGate):
            continue
        if len(op.qubits) > 2 and not cirq.is_measurement(op):
            raise DeviceError(f"operation {op} acts on {len(op.qubits)} qubits; decompose the circuit into one- "
                              f"and two-qubit operations before compiling it for a device")
        operations.append(op)
    return operations


def compile_for_device(circuit: cirq.AbstractCircuit, profile: Any, *, n_qubits: int | None = None,
                       lookahead_radius: int = LOOKAHEAD_RADIUS) -> DeviceCircuit:
    """Place, route and rewrite ``circuit`` for ``profile`` (a :class:`DeviceProfile`, a registered name, or
    None for the logical all-to-all register); see the module docstring.

    The logical register is ``LineQubit.range(n_qubits)`` (default: up to the circuit's largest LineQubit) or the
    circuit's sorted qubits. Measurements are kept (on the device qubit where their logical qubit is then).
    DeviceError: a device with fewer qubits than the register, operations on more than two qubits.
    """
    from .profile import as_device

    profile = as_device(profile)
    if profile is None:
        return logical_wrapper(circuit, n_qubits)
    started = time.perf_counter()
    register = register_index(circuit, n_qubits)
    if len(register) > profile.n_qubits:
        raise DeviceError(f"device {profile.name!r} has {profile.n_qubits} qubits, fewer than the register's "
                          f"{len(register)}; choose a larger device or a smaller active space / tapered mapping")
    logical = cirq.Circuit(_checked_operations(circuit))
    logical_counts = circuit_resources(circuit)
    index = {q: i for i, q in enumerate(register)}
    if profile.all_to_all:
        initial = {q: cirq.LineQubit(index[q]) for q in register}
        routed = logical.transform_qubits(lambda q: initial[q])
        swaps, moved = 0, {p: p for p in initial.values()}
    elif len(logical.all_qubits()) == 0:
        initial, routed, swaps, moved = {}, cirq.Circuit(), 0, {}
    else:
        router = cirq.RouteCQC(profile.qubit_graph)
        routed, initial, moved = router.route_circuit(
            logical, lookahead_radius=lookahead_radius, tag_inserted_swaps=True,
            initial_mapper=cirq.LineInitialMapper(profile.qubit_graph))
        swaps = sum(1 for op in routed.all_operations() if cirq.RoutingSwapTag() in op.tags)
        routed = routed.untagged if hasattr(routed, "untagged") else routed
    # logical qubits that the circuit never touches still need a home: the lowest free device qubits
    busy = set(initial.values()) | set(routed.all_qubits())
    free = iter(q for q in profile.qubits if q not in busy)
    initial = dict(initial)
    for q in register:
        if q not in initial:
            initial[q] = next(free)
            moved[initial[q]] = initial[q]
    native = _rewrite(cirq.Circuit(op.untagged for op in routed.all_operations()), profile)
    counts = circuit_resources(native)
    return DeviceCircuit(
        circuit=native,
        initial_placement={index[q]: initial[q] for q in register},
        final_placement={index[q]: moved.get(initial[q], initial[q]) for q in register},
        swaps=swaps, two_qubit_gates=counts["two_qubit_gates"], depth=counts["depth"],
        logical_two_qubit_gates=logical_counts["two_qubit_gates"], logical_depth=logical_counts["depth"],
        device=profile, compile_seconds=time.perf_counter() - started)


def _rewrite(circuit: cirq.Circuit, profile: Any) -> cirq.Circuit:
    """The routed circuit in the device's native gates, single-qubit runs merged, negligible operations dropped."""
    gateset = profile.gateset
    native = cirq.optimize_for_target_gateset(circuit, gateset=gateset, ignore_failures=False)
    return cirq.Circuit(merged_single_qubit_runs(native.all_operations()), strategy=cirq.InsertStrategy.EARLIEST)


def merged_single_qubit_runs(operations: Any) -> list[cirq.Operation]:
    """Each run of single-qubit gates between two-qubit gates (or measurements) as one PhasedXZ gate, dropped when
    it is the identity within :data:`ATOL` up to a phase. The same result as ``cirq.merge_single_qubit_gates_to_phxz``
    in one linear pass over the operations (Cirq's transformer took a quarter of the compile time)."""
    pending: dict[cirq.Qid, np.ndarray] = {}
    out: list[cirq.Operation] = []

    def flush(qubit: cirq.Qid) -> None:
        matrix = pending.pop(qubit, None)
        if matrix is not None and not cirq.equal_up_to_global_phase(matrix, np.eye(2), atol=ATOL):
            out.append(cirq.PhasedXZGate.from_matrix(matrix).on(qubit))

    for op in operations:
        if len(op.qubits) == 1 and not cirq.is_measurement(op) and cirq.has_unitary(op):
            qubit = op.qubits[0]
            pending[qubit] = cirq.unitary(op) @ pending.get(qubit, np.eye(2, dtype=complex))
            continue
        for qubit in op.qubits:
            flush(qubit)
        if not isinstance(op.gate, cirq.GlobalPhaseGate):
            out.append(op)
    for qubit in list(pending):
        flush(qubit)
    return out
