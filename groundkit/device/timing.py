"""Time on a device: the duration of a circuit from its moments, and of one energy estimate at a shot budget.

A circuit's duration is the sum over its moments (operations packed as early as possible) of the longest
operation in each: ``two_qubit`` for a moment with a two-qubit gate, else ``one_qubit`` (global phases and
identities take no time; every single-qubit gate, Z rotations included, is counted as one pulse). One shot of a
measurement group costs reset + circuit + (one one-qubit layer when the group measures any X or Y) + measurement
+ the per-shot overhead; one energy costs Σ_g N_g × that, with N_g the group's shots.
"""

from __future__ import annotations

from collections.abc import Sequence

import cirq

from .figures import GateDurations

NS_PER_S = 1e9
US_PER_S = 1e6


def circuit_duration(circuit: cirq.AbstractCircuit, durations: GateDurations) -> float:
    """Duration (ns) of a circuit of one- and two-qubit gates (measurements as ``measurement``)."""
    operations = [op for op in circuit.all_operations()
                  if not isinstance(op.gate, (cirq.IdentityGate, cirq.GlobalPhaseGate))]
    total = 0.0
    for moment in cirq.Circuit(operations, strategy=cirq.InsertStrategy.EARLIEST):
        longest = 0.0
        for op in moment.operations:
            if cirq.is_measurement(op):
                longest = max(longest, durations.measurement)
            elif len(op.qubits) >= 2:
                longest = max(longest, durations.two_qubit)
            else:
                longest = max(longest, durations.one_qubit)
        total += longest
    return total


def shot_seconds(circuit_ns: float, durations: GateDurations, rotated: bool) -> float:
    """Seconds of one shot: reset, the circuit, a basis-change layer if ``rotated``, measurement, overhead."""
    ns = durations.reset + circuit_ns + (durations.one_qubit if rotated else 0.0) + durations.measurement
    return ns / NS_PER_S + durations.shot_overhead / US_PER_S


def energy_seconds(circuit_ns: float, durations: GateDurations, group_shots: Sequence[int],
                   group_rotated: Sequence[bool]) -> float:
    """Seconds on the device for one energy estimate: Σ_g shots_g × (duration of one shot of group g)."""
    if len(group_shots) != len(group_rotated):
        raise ValueError(f"{len(group_shots)} shot counts for {len(group_rotated)} groups")
    return float(sum(int(n) * shot_seconds(circuit_ns, durations, bool(r))
                     for n, r in zip(group_shots, group_rotated)))
