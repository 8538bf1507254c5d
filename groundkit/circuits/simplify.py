"""Peephole cancellation of adjacent inverse pairs of fixed gates, on Cirq operations and on gate lists.

Cirq has transformers that merge single-qubit gates and drop negligible ones (``groundkit.circuits.optimise``
uses them) but none that removes a CNOT meeting its inverse without rewriting the two-qubit blocks into
angle-dependent gates; this pass does that one job. Only angle-independent gates are cancelled, so the gate counts
of a compiled trial state do not depend on the parameter values.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

import cirq
import numpy as np

from .steps import Step
from .steps import matrix as step_matrix

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


Item = Any  # a two-qubit Step, or a tuple of single-qubit Steps (one run on one qubit)


def _inverse_pair(first: Step, second: Step) -> bool:
    return first.gate in ("cnot", "cz") and first == second


def _identity(product: np.ndarray) -> bool:
    return abs(abs(product[0, 0]) - 1.0) < 1e-9 and abs(product[0, 1]) < 1e-9 and abs(
        product[0, 0] - product[1, 1]) < 1e-9


def reduce_steps(steps: Iterable[Step]) -> list[Item]:
    """A gate list with inverse pairs removed, as counting items: two-qubit steps and single-qubit runs.

    Consecutive single-qubit steps on a qubit form one run; a run of fixed gates whose product is the identity
    (up to phase) is removed, and two equal CNOTs or CZs that then meet on the same qubits, nothing between, are
    removed, repeatedly. What is left has no such pair, and every run becomes one gate when Cirq merges
    single-qubit gates (``groundkit.circuits.optimise``). Only fixed gates are removed, so the result does not
    depend on the parameter values.
    """
    kept: list[Any] = []  # Step (two-qubit) | [steps, product or None] (a run) | None (removed)
    stacks: dict[int, list[int]] = {}
    for step in steps:
        qubits = step.qubits
        if len(qubits) == 1:
            q = qubits[0]
            top = stacks.get(q, [])
            j = top[-1] if top else None
            u = step_matrix(step)
            if j is not None and isinstance(kept[j], list):
                run = kept[j]
                run[0].append(step)
                run[1] = None if (run[1] is None or u is None) else u @ run[1]
                if run[1] is not None and _identity(run[1]):
                    kept[j] = None
                    top.pop()
                continue
            if u is not None and _identity(u):
                continue
            kept.append([[step], u])
            stacks.setdefault(q, []).append(len(kept) - 1)
            continue
        tops = {stacks[q][-1] if stacks.get(q) else None for q in qubits}
        if len(tops) == 1:
            j = tops.pop()
            if j is not None and isinstance(kept[j], Step) and _inverse_pair(kept[j], step):
                kept[j] = None
                for q in qubits:
                    stacks[q].pop()
                continue
        kept.append(step)
        for q in qubits:
            stacks.setdefault(q, []).append(len(kept) - 1)
    return [tuple(item[0]) if isinstance(item, list) else item for item in kept if item is not None]


def flatten(items: Iterable[Item]) -> list[Step]:
    """The steps of counting items, in time order."""
    out: list[Step] = []
    for item in items:
        if isinstance(item, Step):
            out.append(item)
        else:
            out.extend(item)
    return out
