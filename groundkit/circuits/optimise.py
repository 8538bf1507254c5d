"""Circuit optimisation with Cirq's own transformers.

``optimise_circuit`` runs, in order: ``cirq.merge_single_qubit_gates_to_phxz`` (each run of single-qubit gates
between two-qubit gates becomes one ``PhasedXZGate``, or nothing if the run is the identity),
``cirq.drop_negligible_operations`` and ``cirq.drop_empty_moments``. Adjacent inverse pairs of CNOTs and CZs are
removed before, on the gate list (``groundkit.circuits.simplify.reduce_steps``: Cirq has no transformer for that
job that keeps two-qubit gates as they are).

Left out on purpose: ``cirq.eject_z`` and ``cirq.eject_phased_paulis`` push Z rotations and Pauli gates through
the circuit towards its end. A state-preparation circuit must keep its final phases (they are part of the state),
so the ejected gates stay as a last layer; with single-qubit runs already merged they save no two-qubit gate, and
they make the single-qubit count depend on the angles. Two-qubit blocks are not re-synthesised
(``cirq.optimize_for_target_gateset`` would): the number of CNOTs would then depend on the angles as well.
"""

from __future__ import annotations

import cirq


def optimise_circuit(circuit: cirq.AbstractCircuit) -> cirq.Circuit:
    """The circuit with single-qubit runs merged, negligible operations and empty moments dropped (Cirq's
    transformers); the unitary is unchanged up to a global phase."""
    merged = cirq.merge_single_qubit_gates_to_phxz(circuit)
    merged = cirq.drop_negligible_operations(merged)
    merged = cirq.drop_empty_moments(merged)
    return merged.unfreeze(copy=False) if isinstance(merged, cirq.FrozenCircuit) else merged
