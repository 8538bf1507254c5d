"""Peephole cancellation of adjacent inverse pairs of fixed gates (H, X, CNOT, CZ, Rx(±π/2)).

Only angle-independent gates are cancelled, so the gate counts of a compiled trial state do not depend on the
parameter values.
"""

from __future__ import annotations

from collections.abc import Iterable

import cirq
import numpy as np

_SELF_INVERSE = (cirq.H, cirq.X, cirq.CNOT, cirq.CZ)


def _fixed(op: cirq.Operation) -> bool:
    gate = op.gate
    if gate in _SELF_INVERSE:
        return True
    return isinstance(gate, cirq.Rx) and np.isclose(abs(float(gate._rads)), np.pi / 2)


def _cancel(first: cirq.Operation, second: cirq.Operation) -> bool:
    if first.qubits != second.qubits or not (_fixed(first) and _fixed(second)):
        return False
    if first.gate in _SELF_INVERSE:
        return first.gate == second.gate
    return isinstance(second.gate, cirq.Rx) and np.isclose(float(first.gate._rads) + float(second.gate._rads), 0.0)


def cancel_inverse_pairs(operations: Iterable[cirq.Operation]) -> list[cirq.Operation]:
    """The operations with every pair ``A, A⁻¹`` that meets on the same qubits (nothing between) removed,
    repeatedly (a removal can make the next pair adjacent)."""
    kept: list[cirq.Operation | None] = []
    stacks: dict[cirq.Qid, list[int]] = {}
    for op in operations:
        tops = {stacks[q][-1] if stacks.get(q) else None for q in op.qubits}
        if len(tops) == 1:
            j = tops.pop()
            if j is not None and _cancel(kept[j], op):
                kept[j] = None
                for q in op.qubits:
                    stacks[q].pop()
                continue
        kept.append(op)
        for q in op.qubits:
            stacks.setdefault(q, []).append(len(kept) - 1)
    return [op for op in kept if op is not None]
