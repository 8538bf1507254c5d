"""Gate lists: the compilers' plain description of a circuit, turned into Cirq operations only when asked.

A :class:`Step` is one gate on register qubits (integers, qubit k = index k of the qubit Hamiltonian). Counting
resources reads these lists directly (``groundkit.circuits.counting``), so no Cirq object is built for a count;
``operations`` turns a list into Cirq operations on ``cirq.LineQubit``\\ s for ``Pipeline.circuit``, OpenQASM export
and the noisy estimator.

Gates: ``"x"``, ``"h"``, ``"s"``, ``"sdg"`` (S†), ``"rx"``, ``"ry"``, ``"rz"`` (angle in radians, Cirq's convention
R_P(φ) = exp(−i·φ·P/2)), ``"cnot"`` (qubits = (control, target)) and ``"cz"``. ``variable`` marks an angle that
depends on the trial state's parameters (it may be a sympy expression); fixed gates carry their exact angle.
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from functools import cache
from typing import Any, NamedTuple

import cirq
import numpy as np

ONE_QUBIT = ("x", "h", "s", "sdg", "rx", "ry", "rz")
TWO_QUBIT = ("cnot", "cz")


class Step(NamedTuple):
    """One gate: name, register qubits, angle (radians; rotations only) and whether the angle is a parameter's."""

    gate: str
    qubits: tuple[int, ...]
    angle: Any = None
    variable: bool = False


def one(gate: str, qubit: int, angle: Any = None, variable: bool = False) -> Step:
    """A single-qubit step."""
    return Step(gate, (int(qubit),), angle, variable)


def cnot(control: int, target: int) -> Step:
    """A CNOT step."""
    return Step("cnot", (int(control), int(target)))


def cz(a: int, b: int) -> Step:
    """A CZ step (symmetric; stored with the smaller qubit first)."""
    return Step("cz", (min(int(a), int(b)), max(int(a), int(b))))


@cache
def _constant_matrix(gate: str) -> np.ndarray:
    """The 2x2 unitary of an angle-free gate (x, h, s, sdg); five entries at most, kept for the process."""
    if gate == "x":
        return np.array([[0, 1], [1, 0]], dtype=complex)
    if gate == "h":
        return np.array([[1, 1], [1, -1]], dtype=complex) / np.sqrt(2)
    if gate == "s":
        return np.diag([1, 1j])
    if gate == "sdg":
        return np.diag([1, -1j])
    raise KeyError(gate)


_PAULI = {"rx": np.array([[0, 1], [1, 0]]), "ry": np.array([[0, -1j], [1j, 0]]), "rz": np.diag([1, -1])}


def _fixed_matrix(gate: str, angle: float | None) -> np.ndarray:
    """The 2x2 unitary of a fixed step; rotations are computed each time (angles vary from run to run, so a cache
    keyed by angle would only grow)."""
    if gate in _PAULI:
        return np.cos(angle / 2) * np.eye(2) - 1j * np.sin(angle / 2) * _PAULI[gate]
    return _constant_matrix(gate)


def matrix(step: Step) -> np.ndarray | None:
    """The 2x2 unitary of a fixed single-qubit step; None for a parametrised one."""
    if step.variable:
        return None
    if step.gate == "op":
        return step.angle
    return _fixed_matrix(step.gate, None if step.angle is None else float(step.angle))


def _operation(step: Step, qubits: Sequence[cirq.Qid]) -> cirq.Operation:
    gate, angle = step.gate, step.angle
    targets = [qubits[q] for q in step.qubits]
    if gate == "cnot":
        return cirq.CNOT(*targets)
    if gate == "cz":
        return cirq.CZ(*targets)
    if gate == "rx":
        return cirq.rx(angle)(*targets)
    if gate == "ry":
        return cirq.ry(angle)(*targets)
    if gate == "rz":
        return cirq.rz(angle)(*targets)
    fixed = {"x": cirq.X, "h": cirq.H, "s": cirq.S, "sdg": cirq.S ** -1}
    return fixed[gate](*targets)


def operations(steps: Iterable[Step], qubits: Sequence[cirq.Qid]) -> list[cirq.Operation]:
    """Cirq operations (time order) of a gate list; ``qubits[k]`` is the circuit qubit of register qubit k."""
    return [_operation(step, qubits) for step in steps]


def steps_of_operations(ops: Iterable[cirq.Operation], qubits: Sequence[cirq.Qid]) -> list[Any]:
    """A Cirq operation list read as counting items: single-qubit operations as fixed or variable steps, the rest
    as two-qubit items (``("op", qubit indices)``); used to count a qubit trial state's own circuit."""
    index = {q: k for k, q in enumerate(qubits)}
    out: list[Any] = []
    for op in ops:
        if isinstance(op.gate, cirq.IdentityGate):
            continue
        if not cirq.is_parameterized(op) and (cirq.trace_distance_bound(op) or 0.0) <= 1e-8:
            continue  # what cirq.drop_negligible_operations removes
        where = tuple(index[q] for q in op.qubits)
        if len(where) == 1:
            if cirq.is_parameterized(op) or not cirq.has_unitary(op):
                out.append(Step("op", where, None, True))
            else:
                out.append(Step("op", where, cirq.unitary(op), False))
        else:
            out.append(Step("op", where, op, False))
    return out
