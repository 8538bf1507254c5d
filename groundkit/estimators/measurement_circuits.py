"""Measurement circuits: each group's basis change as a compiled Cirq circuit, and what it adds in gates.

The circuit of a group is its basis change on ``cirq.LineQubit.range(n)`` (adjacent inverse pairs cancelled),
appended after the state preparation and before a Z measurement of every qubit. Its two-qubit gates are counted
on the logical all-to-all register, or, when the pipeline has a device profile, after placement and routing on
that device (``groundkit.device.compile_for_device``).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import cirq
import numpy as np

from ..circuits.resources import circuit_resources
from ..circuits.simplify import cancel_inverse_pairs
from .grouping import groups_for
from .groups import MeasurementGroup


def group_circuit(group: MeasurementGroup, n_qubits: int) -> cirq.Circuit:
    """The basis change of one group on ``cirq.LineQubit.range(n_qubits)`` (no measurement gates)."""
    qubits = cirq.LineQubit.range(n_qubits)
    return cirq.Circuit(cancel_inverse_pairs(group.change.operations(qubits)))


def _router(profile: Any) -> Any:
    """``compile_for_device`` when a device profile is set, else None (the logical all-to-all register)."""
    if profile is None:
        return None
    from ..device import compile_for_device

    return compile_for_device


def two_qubit_gates(circuit: cirq.Circuit, n_qubits: int, profile: Any = None) -> int:
    """Two-qubit gates of a measurement circuit, routed on ``profile`` when one is given."""
    route = _router(profile)
    if route is not None and len(circuit):
        circuit = route(circuit, profile, n_qubits=n_qubits).circuit
    return int(circuit_resources(circuit)["two_qubit_gates"])


@dataclass(frozen=True)
class MeasurementCost:
    """Groups of one grouping and the two-qubit gates their basis changes add: per group, worst, mean, total."""

    grouping: str
    groups: int
    per_group: tuple[int, ...]
    device: str | None = None

    @property
    def worst(self) -> int:
        return max(self.per_group, default=0)

    @property
    def mean(self) -> float:
        return float(np.mean(self.per_group)) if self.per_group else 0.0

    @property
    def total(self) -> int:
        return int(sum(self.per_group))


def measurement_cost(encoding: Any, grouping: Any = "qwc", profile: Any = None) -> MeasurementCost:
    """Two-qubit gates added by each group's measurement circuit on ``encoding``'s register."""
    from ..registry import name_of
    from .grouping import as_grouping

    _, groups = groups_for(encoding, grouping)
    counts = tuple(two_qubit_gates(group_circuit(g, encoding.n_qubits), encoding.n_qubits, profile) for g in groups)
    device = None if _router(profile) is None else str(getattr(profile, "name", profile))
    return MeasurementCost(name_of(as_grouping(grouping)), len(groups), counts, device)


def pipeline_measurement_cost(pipeline: Any, grouping: Any = None) -> MeasurementCost:
    """:func:`measurement_cost` of a pipeline: its estimator's grouping (default ``qwc``), its device profile."""
    if grouping is None:
        grouping = getattr(pipeline.components.get("estimator"), "grouping", None) or "qwc"
    return measurement_cost(pipeline.encoding(), grouping, getattr(pipeline, "device_profile", None))
