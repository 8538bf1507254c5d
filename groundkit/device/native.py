"""Native gate sets: the one two-qubit gate a device runs, with arbitrary single-qubit gates (PhasedXZ).

``"cz"`` and ``"sqrt-iswap"`` are Cirq's own target gatesets (``cirq.CZTargetGateset``,
``cirq.SqrtIswapTargetGateset``). Cirq has no CNOT target gateset, so :class:`CNOTTargetGateset` is one built the
same way: each merged one- or two-qubit block is decomposed by Cirq's KAK route into CZs
(``two_qubit_matrix_to_cz_operations``) and each CZ written as H·CNOT·H on its second qubit; Cirq's
post-processing then merges the single-qubit gates into PhasedXZ gates.
"""

from __future__ import annotations

from typing import Any

import cirq
from cirq.transformers.analytical_decompositions import two_qubit_to_cz

from ..errors import DeviceError
from .polish import polished

NATIVE_GATES = ("cnot", "cz", "sqrt-iswap")
"""Names of the accepted native two-qubit gates."""

ATOL = 1e-11
"""Largest error a rewriting step may introduce (Cirq's default is 1e-8; the energy checks need ~1e-9 Ha on
circuits of thousands of blocks)."""

_CNOT_COST = {cirq.CNOT: 1, cirq.CZ: 1, cirq.SWAP: 3}
_PAIR = cirq.LineQubit.range(2)


class _Economical:
    """Mixin for a two-qubit target gateset: a merged block is re-synthesised (Cirq's KAK route) only when that
    saves two-qubit gates (``cirq.num_cnots_required`` of its unitary is below the CNOTs of its gates); otherwise
    each gate is rewritten on its own, with the gateset's decomposition of each gate kind computed once. The
    result is the same as Cirq's for blocks that cannot shrink, and much faster on long circuits."""

    def decompose_to_target_gateset(self, op: cirq.Operation, moment_idx: int) -> Any:
        if cirq.num_qubits(op) != 2:
            return super().decompose_to_target_gateset(op, moment_idx)
        untagged = op.untagged
        block = (list(untagged.circuit.all_operations()) if isinstance(untagged, cirq.CircuitOperation)
                 and self._intermediate_result_tag in op.tags else [untagged])
        costs = [_CNOT_COST.get(o.gate) if len(o.qubits) == 2 else 0 for o in block]
        if any(c is None for c in costs) or len(block) == 1 and block[0] in self:
            return super().decompose_to_target_gateset(op, moment_idx)
        cost = sum(costs)
        if cost >= 2 and cirq.num_cnots_required(cirq.unitary(cirq.Circuit(block))) < cost:
            return super().decompose_to_target_gateset(op, moment_idx)
        out: list[Any] = []
        for gate_op in block:
            if len(gate_op.qubits) == 1:
                out.append(gate_op if gate_op in self else self._decompose_single_qubit_operation(gate_op, moment_idx))
            elif gate_op in self:
                out.append(gate_op)
            else:
                out.append(self._native_form(gate_op))
        return out

    @property
    def postprocess_transformers(self) -> list[Any]:
        """Cirq's post-processing (merge single-qubit moments, drop negligible operations and empty moments) at
        :data:`ATOL` instead of Cirq's 1e-8."""
        from cirq.transformers.target_gatesets.compilation_target_gateset import create_transformer_with_kwargs

        return [create_transformer_with_kwargs(cirq.merge_single_qubit_moments_to_phxz, atol=ATOL),
                create_transformer_with_kwargs(cirq.drop_negligible_operations, atol=ATOL),
                cirq.drop_empty_moments]

    def _native_form(self, op: cirq.Operation) -> list[cirq.Operation]:
        cache = self.__dict__.setdefault("_forms", {})
        if op.gate not in cache:
            cache[op.gate] = list(cirq.flatten_to_ops(self._decompose_two_qubit_operation(op.gate(*_PAIR), 0)))
        where = dict(zip(_PAIR, op.qubits))
        return [o.transform_qubits(where) for o in cache[op.gate]]


class CNOTTargetGateset(_Economical, cirq.TwoQubitCompilationTargetGateset):
    """Target gateset of CNOT, PhasedXZ single-qubit gates, measurements and global phases."""

    def __init__(self, *, atol: float = ATOL) -> None:
        super().__init__(cirq.CNOT, cirq.MeasurementGate, cirq.PhasedXZGate, cirq.GlobalPhaseGate,
                         name="CNOTTargetGateset", preserve_moment_structure=False)
        self.atol = atol

    def _decompose_two_qubit_operation(self, op: cirq.Operation, _: int) -> Any:
        if not cirq.has_unitary(op):
            return NotImplemented
        a, b = op.qubits
        out: list[cirq.Operation] = []
        for gate in two_qubit_to_cz.two_qubit_matrix_to_cz_operations(
                a, b, cirq.unitary(op), allow_partial_czs=False, atol=self.atol):
            if gate.gate == cirq.CZ:
                first, second = gate.qubits
                out += [cirq.H(second), cirq.CNOT(first, second), cirq.H(second)]
            else:
                out.append(gate)
        return out

    def _value_equality_values_(self) -> Any:
        return self.atol

    def __repr__(self) -> str:
        return f"CNOTTargetGateset(atol={self.atol})"


class _CZ(_Economical, cirq.CZTargetGateset):
    """Cirq's CZ target gateset with the economical block rewriting."""


class _SqrtIswap(_Economical, cirq.SqrtIswapTargetGateset):
    """Cirq's √iSWAP target gateset with the economical block rewriting; each block's decomposition is refined to
    machine precision (:mod:`groundkit.device.polish`), since Cirq's loses ~1.5e-8 per CNOT-like block."""

    def _decompose_two_qubit_operation(self, op: cirq.Operation, moment_idx: int) -> Any:
        decomposed = super()._decompose_two_qubit_operation(op, moment_idx)
        if decomposed is NotImplemented or decomposed is None:
            return decomposed
        return polished(cirq.unitary(op), list(cirq.flatten_to_ops(decomposed)), tuple(op.qubits))


def target_gateset(native_gate: str) -> cirq.CompilationTargetGateset:
    """Cirq's compilation target for a native two-qubit gate name; DeviceError for an unknown one."""
    if native_gate == "cnot":
        return CNOTTargetGateset()
    if native_gate == "cz":
        return _CZ(atol=ATOL, preserve_moment_structure=False)
    if native_gate == "sqrt-iswap":
        return _SqrtIswap(atol=ATOL)
    raise DeviceError(f"unknown native gate {native_gate!r}; accepted: {', '.join(NATIVE_GATES)}")


def two_qubit_gate(native_gate: str) -> cirq.Gate:
    """The Cirq gate of a native two-qubit gate name."""
    return {"cnot": cirq.CNOT, "cz": cirq.CZ, "sqrt-iswap": cirq.SQRT_ISWAP}[native_gate]
